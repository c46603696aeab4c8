package production

import (
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
)

// ChangeReport is what changed between the previous build's manifest and
// this one: DIR/changes.json, DIR/changes.txt and the summary on stderr.
// README documents it.
type ChangeReport struct {
	// Summary is the one line to read first: what changed in the data,
	// what moved because of it, which pages to send again.
	Summary      string         `json:"summary"`
	FirstBuild   bool           `json:"first_build"`
	SheafChanged bool           `json:"sheaf_changed"` // another sheaf version
	SpecChanged  bool           `json:"spec_changed"`
	DataChanged  []string       `json:"data_changed"`  // data files whose bytes changed
	FontsChanged []string       `json:"fonts_changed"` // "OUTPUT STYLE (NAME)"
	Files        FileChanges    `json:"files"`
	Pages        []PagesChanged `json:"pages"`    // per changed PDF of pages
	Graphics     []GraphicDrawn `json:"graphics"` // per changed file of an insert
	Terms        []TermChange   `json:"terms"`    // terms whose data changed, came or went
	Moves        []PanelMove    `json:"moves"`    // panels that moved, came or went, per output with pages
	PageReasons  []PageReason   `json:"page_reasons"`
	// Stale lists the proofs and contact sheets of a --no-proofs build
	// that no longer showed their pages and were removed (proofs of
	// unchanged pages are kept).
	Stale []string      `json:"stale"`
	Work  []OutputStats `json:"work"` // what was drawn and reused, per output and insert built
}

// GraphicDrawn is a changed file of an insert, a single graphic: it has
// no pages to list, so the report says why it was drawn again.
type GraphicDrawn struct {
	File   string `json:"file"`
	Insert string `json:"insert"`
	Why    string `json:"why"`
}

// FileChanges sorts the files of a build by what happened to them.
type FileChanges struct {
	Added     []string `json:"added"`
	Removed   []string `json:"removed"`
	Changed   []string `json:"changed"`
	Unchanged []string `json:"unchanged"`
}

// PagesChanged lists the pages of one PDF that differ from the last
// build (pages past the shorter of the two count as changed).
type PagesChanged struct {
	File  string `json:"file"`
	Pages []int  `json:"pages"`
	Of    int    `json:"of"` // pages in the new PDF
}

// TermChange is one term whose data changed ("changed"), is new
// ("added") or left the selection ("removed"), and where it sits:
// "OUTPUT p. N" and "insert NAME" in this build (last build for removed
// terms).
type TermChange struct {
	Term   string   `json:"term"`
	Change string   `json:"change"`
	Pages  []string `json:"pages"`
	// PeakFrom and PeakTo are a changed term's peak year before and
	// after, when it moved.
	PeakFrom int `json:"peak_from,omitempty"`
	PeakTo   int `json:"peak_to,omitempty"`
}

// compareManifests builds the report. prev is nil on a first build.
func compareManifests(prev, cur *Manifest, work []OutputStats) *ChangeReport {
	r := &ChangeReport{Work: work, DataChanged: []string{}, FontsChanged: []string{}, Pages: []PagesChanged{}, Graphics: []GraphicDrawn{}, Terms: []TermChange{},
		Moves: []PanelMove{}, PageReasons: []PageReason{}, Stale: []string{}}
	r.Files = FileChanges{Added: []string{}, Removed: []string{}, Changed: []string{}, Unchanged: []string{}}
	if prev == nil {
		r.FirstBuild = true
		for _, f := range cur.Files {
			r.Files.Added = append(r.Files.Added, f.Path)
		}
		r.Summary = fmt.Sprintf("first build: %s written", plural(len(r.Files.Added), "file"))
		return r
	}
	r.SheafChanged = prev.Sheaf != cur.Sheaf
	r.SpecChanged = prev.Spec.SHA256 != cur.Spec.SHA256
	for i, d := range cur.Data {
		if i >= len(prev.Data) || prev.Data[i].SHA256 != d.SHA256 || prev.Data[i].Path != d.Path {
			r.DataChanged = append(r.DataChanged, d.Path)
		}
	}
	oldFonts := map[string]string{}
	for _, f := range prev.Fonts {
		oldFonts[f.Output+" "+f.Style] = f.SHA256
	}
	for _, f := range cur.Fonts {
		if sum, ok := oldFonts[f.Output+" "+f.Style]; ok && sum != f.SHA256 {
			r.FontsChanged = append(r.FontsChanged, fmt.Sprintf("%s %s (%s)", f.Output, f.Style, f.Name))
		}
	}

	seen := map[string]bool{}
	for _, f := range cur.Files {
		seen[f.Path] = true
		old := prev.File(f.Path)
		switch {
		case old == nil:
			r.Files.Added = append(r.Files.Added, f.Path)
		case old.SHA256 != f.SHA256:
			r.Files.Changed = append(r.Files.Changed, f.Path)
			switch {
			case f.Insert != "":
				r.Graphics = append(r.Graphics, GraphicDrawn{File: f.Path, Insert: f.Insert, Why: insertWhy(r, prev, cur, f.Insert)})
			case strings.HasSuffix(f.Path, ".pdf"):
				r.Pages = append(r.Pages, PagesChanged{File: f.Path, Pages: changedPages(old.Pages, f.Pages), Of: len(f.Pages)})
			}
		default:
			r.Files.Unchanged = append(r.Files.Unchanged, f.Path)
		}
	}
	for _, f := range prev.Files {
		if !seen[f.Path] {
			r.Files.Removed = append(r.Files.Removed, f.Path)
		}
	}

	oldTerms := map[string]string{}
	for _, t := range prev.Terms {
		oldTerms[t.Term] = t.SHA256
	}
	for _, t := range cur.Terms {
		sum, ok := oldTerms[t.Term]
		switch {
		case !ok:
			r.Terms = append(r.Terms, TermChange{Term: t.Term, Change: "added"})
		case sum != t.SHA256:
			r.Terms = append(r.Terms, TermChange{Term: t.Term, Change: "changed"})
		}
		delete(oldTerms, t.Term)
	}
	var gone []string
	for t := range oldTerms {
		gone = append(gone, t)
	}
	sort.Strings(gone)
	for _, t := range gone {
		r.Terms = append(r.Terms, TermChange{Term: t, Change: "removed"})
	}
	// An insert's terms need not be among the feature's: one that is not,
	// and whose data changed, is listed with its inserts.
	selected := map[string]bool{}
	for _, t := range cur.Terms {
		selected[t.Term] = true
	}
	oldInsertTerms := map[string]string{}
	for _, in := range prev.Inserts {
		for _, t := range in.Terms {
			oldInsertTerms[t.Term] = t.SHA256
		}
	}
	var insertOnly []string
	for _, in := range cur.Inserts {
		for _, t := range in.Terms {
			if sum, ok := oldInsertTerms[t.Term]; ok && !selected[t.Term] && sum != t.SHA256 {
				insertOnly = append(insertOnly, t.Term)
				selected[t.Term] = true // once
			}
		}
	}
	sort.Strings(insertOnly)
	for _, t := range insertOnly {
		r.Terms = append(r.Terms, TermChange{Term: t, Change: "changed"})
	}
	// Where each listed term is: only theirs are looked up, a rebuild
	// lists a few of thousands.
	newWanted, oldWanted := map[string]bool{}, map[string]bool{}
	for _, t := range r.Terms {
		if t.Change == "removed" {
			oldWanted[t.Term] = true
		} else {
			newWanted[t.Term] = true
		}
	}
	newPlaces, oldPlaces := places(cur, newWanted), places(prev, oldWanted)
	for i, t := range r.Terms {
		if t.Change == "removed" {
			r.Terms[i].Pages = oldPlaces[t.Term]
		} else {
			r.Terms[i].Pages = newPlaces[t.Term]
		}
	}
	for i := range r.Terms {
		if r.Terms[i].Pages == nil {
			r.Terms[i].Pages = []string{}
		}
		if r.Terms[i].Change == "changed" {
			if a, b := peakOf(prev, r.Terms[i].Term), peakOf(cur, r.Terms[i].Term); a != b {
				r.Terms[i].PeakFrom, r.Terms[i].PeakTo = a, b
			}
		}
	}
	r.reflow(prev, cur)
	if r.Nothing() {
		r.Summary = fmt.Sprintf("nothing changed since the last build (%s unchanged)", plural(len(r.Files.Unchanged), "file"))
	}
	return r
}

// changedPages compares two PDFs' page lists by their inputs hashes.
func changedPages(old, cur []PageEntry) []int {
	out := []int{}
	for i, p := range cur {
		if i >= len(old) || old[i].Inputs != p.Inputs {
			out = append(out, p.Page)
		}
	}
	return out
}

// places maps each wanted term to "OUTPUT p. N" for each page it is on,
// then "insert NAME" for each insert that shows it.
func places(m *Manifest, wanted map[string]bool) map[string][]string {
	out := map[string][]string{}
	if len(wanted) == 0 {
		return out
	}
	for _, o := range m.Outputs {
		for _, p := range o.Pages {
			for _, t := range p.Terms {
				if wanted[t] {
					out[t] = append(out[t], o.Name+" p. "+strconv.Itoa(p.Page))
				}
			}
		}
	}
	for _, in := range m.Inserts {
		for _, t := range in.Terms {
			if wanted[t.Term] {
				out[t.Term] = append(out[t.Term], "insert "+in.Name)
			}
		}
	}
	return out
}

// insertWhy says why an insert was drawn again, from the two manifests
// and the inputs already compared in r.
func insertWhy(r *ChangeReport, prev, cur *Manifest, name string) string {
	a, b := prev.Insert(name), cur.Insert(name)
	if a == nil || b == nil {
		return "its inputs changed"
	}
	var why []string
	switch {
	case !sameTerms(a.Terms, b.Terms, true):
		why = append(why, "its terms changed")
	case !sameTerms(a.Terms, b.Terms, false):
		why = append(why, "its terms' data changed")
	}
	if r.SheafChanged {
		why = append(why, "a new sheaf version")
	}
	if r.SpecChanged {
		why = append(why, "the spec changed")
	}
	for _, f := range r.FontsChanged {
		if strings.HasPrefix(f, b.Output+" ") {
			why = append(why, "its fonts changed")
			break
		}
	}
	if len(why) == 0 {
		return "its inputs changed" // say, the date a PDF carries
	}
	return strings.Join(why, ", ")
}

// sameTerms reports whether two lists name the same terms in the same
// order, and, unless namesOnly, with the same data.
func sameTerms(a, b []TermHash, namesOnly bool) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Term != b[i].Term || !namesOnly && a[i].SHA256 != b[i].SHA256 {
			return false
		}
	}
	return true
}

// Nothing reports whether the build changed no file.
func (r *ChangeReport) Nothing() bool {
	return !r.FirstBuild && len(r.Files.Added)+len(r.Files.Removed)+len(r.Files.Changed) == 0
}

// writeText writes the report for people: changes.txt.
func (r *ChangeReport) WriteText(w io.Writer) error {
	var b strings.Builder
	r.text(&b, false)
	_, err := io.WriteString(w, b.String())
	return err
}

// writeSummary prints the report on stderr: the same, with long lists of
// unchanged files left out.
func (r *ChangeReport) WriteSummary(w io.Writer) {
	var b strings.Builder
	r.text(&b, true)
	io.WriteString(w, b.String())
}

// WriteBrief writes the few lines a person at a terminal reads after a
// build: the summary line, what was drawn and reused per output and
// insert, the count of files by change, and where the full report is
// (changesPath). A build that changed nothing is one line.
func (r *ChangeReport) WriteBrief(w io.Writer, changesPath string) error {
	var b strings.Builder
	if r.Nothing() {
		fmt.Fprintf(&b, "nothing changed since the last build (%s unchanged)\n", plural(len(r.Files.Unchanged), "file"))
		_, err := io.WriteString(w, b.String())
		return err
	}
	fmt.Fprintf(&b, "%s\n", r.Summary)
	var inserts []string
	for _, s := range r.Work {
		switch {
		case s.Kind == "insert":
			inserts = append(inserts, s.Insert+" "+strings.Fields(s.Whole)[0])
		case s.Whole != "":
			fmt.Fprintf(&b, "  %s: %s, %s\n", s.Output, plural(s.Pages, "page"), s.Whole)
		default:
			fmt.Fprintf(&b, "  %s: %s, %d drawn, %d reused", s.Output, plural(s.Pages, "page"), s.Encoded, s.Reused)
			if s.ProofsDrawn+s.ProofsReused > 0 {
				fmt.Fprintf(&b, "; proofs %d drawn, %d kept", s.ProofsDrawn, s.ProofsReused)
			}
			b.WriteString("\n")
		}
	}
	if len(inserts) > 0 {
		fmt.Fprintf(&b, "  inserts: %s\n", strings.Join(inserts, ", "))
	}
	fmt.Fprintf(&b, "  files: %d changed, %d added, %d removed, %d unchanged", len(r.Files.Changed), len(r.Files.Added), len(r.Files.Removed), len(r.Files.Unchanged))
	if len(r.Stale) > 0 {
		fmt.Fprintf(&b, " (%d stale proofs among the removed)", len(r.Stale))
	}
	fmt.Fprintf(&b, "; the full report: %s\n", changesPath)
	_, err := io.WriteString(w, b.String())
	return err
}

func (r *ChangeReport) text(b *strings.Builder, short bool) {
	list := func(title string, xs []string) {
		if len(xs) == 0 {
			return
		}
		fmt.Fprintf(b, "%s (%d):\n", title, len(xs))
		for k, x := range xs {
			if short && k == 20 {
				fmt.Fprintf(b, "  … and %d more (see changes.txt)\n", len(xs)-k)
				break
			}
			fmt.Fprintf(b, "  %s\n", x)
		}
	}
	work := func() {
		for _, s := range r.Work {
			switch {
			case s.Kind == "insert":
				fmt.Fprintf(b, "insert %s: %s\n", s.Insert, s.Whole)
			case s.Whole != "":
				fmt.Fprintf(b, "%s: %s, %s\n", s.Output, plural(s.Pages, "page"), s.Whole)
			default:
				fmt.Fprintf(b, "%s: %s, %d encoded, %d reused", s.Output, plural(s.Pages, "page"), s.Encoded, s.Reused)
				if s.ProofsDrawn+s.ProofsReused > 0 {
					fmt.Fprintf(b, "; proofs %d drawn, %d kept", s.ProofsDrawn, s.ProofsReused)
				}
				b.WriteString("\n")
			}
		}
	}
	switch {
	case r.FirstBuild:
		fmt.Fprintf(b, "first build: no earlier manifest to compare with; %d files written\n", len(r.Files.Added))
		if len(r.Stale) > 0 {
			list("stale proofs removed (--no-proofs)", r.Stale)
		}
		if !short {
			list("added", r.Files.Added)
		}
		work()
		return
	case r.Nothing():
		fmt.Fprintf(b, "nothing changed since the last build (%d files unchanged)\n", len(r.Files.Unchanged))
		work()
		return
	}
	fmt.Fprintf(b, "summary: %s\n", r.Summary)
	var why []string
	if r.SheafChanged {
		why = append(why, "sheaf version")
	}
	if r.SpecChanged {
		why = append(why, "spec")
	}
	for _, d := range r.DataChanged {
		why = append(why, "data "+d)
	}
	for _, f := range r.FontsChanged {
		why = append(why, "font "+f)
	}
	if len(why) > 0 {
		fmt.Fprintf(b, "changed inputs: %s\n", strings.Join(why, ", "))
	}
	var terms []string
	for _, t := range r.Terms {
		where := "not on any page"
		if len(t.Pages) > 0 {
			where = strings.Join(t.Pages, ", ")
		}
		peak := ""
		if t.PeakFrom != 0 && t.PeakTo != 0 {
			peak = fmt.Sprintf(" (peak %d → %d)", t.PeakFrom, t.PeakTo)
		}
		terms = append(terms, fmt.Sprintf("%s %q%s: %s", t.Change, t.Term, peak, where))
	}
	list("terms", terms)
	var reasons []string
	for _, p := range r.PageReasons {
		line := fmt.Sprintf("%s p. %d: %s", p.Output, p.Page, strings.Join(p.Why, " and "))
		if len(p.Terms) > 0 {
			line += " (" + quoteAll(p.Terms) + ")"
		}
		reasons = append(reasons, line)
	}
	list("pages changed, and why (data: a term on the page changed; reflow: panels moved onto, off or within it)", reasons)
	var moves []string
	for _, m := range r.Moves {
		switch {
		case m.From == nil:
			moves = append(moves, fmt.Sprintf("%q: new at %s", m.Term, m.To))
		case m.To == nil:
			moves = append(moves, fmt.Sprintf("%q: gone from %s", m.Term, m.From))
		default:
			moves = append(moves, fmt.Sprintf("%q: %s → p. %d slot %d", m.Term, m.From, m.To.Page, m.To.Slot))
		}
	}
	list("panels moved", moves)
	var pages []string
	for _, p := range r.Pages {
		ps := make([]string, len(p.Pages))
		for i, n := range p.Pages {
			ps[i] = strconv.Itoa(n)
		}
		line := fmt.Sprintf("%s: pages %s of %d", p.File, strings.Join(ps, ", "), p.Of)
		if len(ps) == 0 {
			line = fmt.Sprintf("%s: every page as before; the document around them changed", p.File)
		}
		pages = append(pages, line)
	}
	list("PDFs with changed pages", pages)
	var graphics []string
	for _, g := range r.Graphics {
		graphics = append(graphics, fmt.Sprintf("%s: redrawn (%s)", g.File, g.Why))
	}
	list("redrawn inserts", graphics)
	list("changed files", r.Files.Changed)
	list("added files", r.Files.Added)
	list("removed files", r.Files.Removed)
	list("stale proofs removed (--no-proofs; proofs of unchanged pages kept)", r.Stale)
	if short {
		fmt.Fprintf(b, "unchanged files: %d\n", len(r.Files.Unchanged))
	} else {
		list("unchanged files", r.Files.Unchanged)
	}
	work()
}

// quoteAll writes terms quoted, comma-separated.
func quoteAll(ts []string) string {
	q := make([]string, len(ts))
	for i, t := range ts {
		q[i] = strconv.Quote(t)
	}
	return strings.Join(q, ", ")
}

// plural writes a count with its noun, "1 page", "2 pages".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
