package feature

import (
	"fmt"
	"strings"

	"sheaf/render/draw"
	"sheaf/render/preflight"
	"sheaf/specs"
	"sheaf/specs/series"
)

// IDNoteUnplaced is preflight's finding for an annotation with no free
// spot on a panel that shows its term.
const IDNoteUnplaced = "note-unplaced"

// checkEditorialTerms checks that every annotated and highlighted term is
// one of the feature's panels: a note on a term no page shows would be
// silently lost.
func checkEditorialTerms(s *specs.Spec, d *series.Set) error {
	shown := make(map[string]bool, len(d.Series))
	var terms []string
	for _, sr := range d.Series {
		shown[sr.Term] = true
		terms = append(terms, sr.Term)
	}
	var errs specs.Errors
	miss := func(path, term string) {
		hint := ""
		if c := specs.Closest(term, terms, 3); len(c) > 0 {
			hint = fmt.Sprintf(" (closest: %s)", strings.Join(c, ", "))
		}
		errs.Add(s.Where(path), "%s: %q is not among the feature's %d terms, so no panel shows it%s", path, term, len(terms), hint)
	}
	for _, a := range s.Annotations {
		if !shown[a.Term] {
			miss(a.Path+".term", a.Term)
		}
	}
	for i, h := range s.Highlights {
		if !shown[h] {
			miss(fmt.Sprintf("highlights.%d", i), h)
		}
	}
	return errs.Err()
}

// checkNoteRoom refuses an annotation too long for the output's panels,
// saying how much room there is.
func checkNoteRoom(s *specs.Spec, o *Output) error {
	f := o.Feature
	room := f.NoteRoom()
	var errs specs.Errors
	for _, a := range s.Annotations {
		w := f.NoteWidth(a.Text)
		if w <= room {
			continue
		}
		per := w / float64(max(1, len([]rune(a.Text))))
		errs.Add(s.Where(a.Path+".text"), "%s.text: %q is %.1f pt wide in output %s's %g pt type; its panels leave %.1f pt (about %d characters): shorten it",
			a.Path, a.Text, w, o.Spec.Name, o.Spec.Type.Ticks.Pt(), room, int(room/per))
	}
	return errs.Err()
}

// noteFindings lists the annotations that could not be placed on an
// output's pages.
func noteFindings(s *specs.Spec, o *Output) []preflight.Finding {
	return unplaced(s, o.Spec.Name, "", o.Feature.Notes())
}

// insertNoteFindings lists the annotations that could not be placed on
// an insert.
func insertNoteFindings(s *specs.Spec, in *Insert) []preflight.Finding {
	return unplaced(s, in.Output.Name, in.Name(), in.Graphic.Notes())
}

func unplaced(s *specs.Spec, output, insert string, notes []draw.Note) []preflight.Finding {
	var fs []preflight.Finding
	for _, n := range notes {
		if n.Placed {
			continue
		}
		a := s.Annotations[n.Index]
		on := ""
		if insert != "" {
			on = fmt.Sprintf(" on insert %q", insert)
		}
		fs = append(fs, preflight.Finding{ID: IDNoteUnplaced, Severity: preflight.Warning, Output: output, Insert: insert,
			Page: n.Page, Term: n.Term, Year: n.From, At: s.Where(a.Path).String(),
			Message: fmt.Sprintf("annotation %q could not be placed%s: %s; shorten it or move its year", n.Text, on, n.Why)})
	}
	return fs
}
