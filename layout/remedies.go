package layout

import (
	"math"
	"slices"
	"strconv"
	"strings"
)

// minScreenType is the smallest text size suggested for a screen: 12 CSS
// px (common practice for captions on the web; no standard sets one).
const minScreenType = 12 * 0.75

// works reports whether the output solves with r applied. It is how the
// remedies that are searched for, rather than computed, are checked.
func (s *solver) works(r Remedy) bool {
	try := *s.out
	if len(r.Set) == 0 || r.Apply(&try) != nil {
		return false
	}
	_, err := solve(s.spec, &try, s.fs, s.groups, true)
	return err == nil
}

// columnsText is "1 column", "5 columns".
func columnsText(n int) string {
	if n == 1 {
		return "1 column"
	}
	return strconv.Itoa(n) + " columns"
}

func columnsRemedy(n int) Remedy {
	return Remedy{Text: columnsText(n), Set: []Setting{{"columns", float64(n)}}}
}

// fewerColumns finds a column count for an output whose columns are
// narrower than the floor: the most columns, at most m (the most that
// are wide enough), that work. Fewer columns are wider, so with a panel
// aspect they are taller too and may no longer fit the page; then m
// columns with the nearest aspect whose row fits is tried.
func (s *solver) fewerColumns(m int) (Remedy, bool) {
	if s.probe {
		return Remedy{}, false
	}
	for n := m; n >= 1; n-- {
		if r := columnsRemedy(n); s.works(r) {
			return r, true
		}
	}
	if s.out.PanelHeight > 0 || !(s.out.PanelAspect > 0) || s.scroll {
		return Remedy{}, false
	}
	// The tallest plot a page holds: its grid less a row's label and tick
	// areas and a group heading.
	maxPlot := min(s.gridH1, s.gridHn) - s.lb - s.ta
	if s.headings {
		maxPlot -= s.hh
	}
	w := s.colWidth(m)
	if maxPlot < s.floorH {
		return Remedy{}, false
	}
	a := math.Ceil(w/maxPlot*100) / 100
	if w/a < s.floorH-eps || a <= s.out.PanelAspect {
		return Remedy{}, false
	}
	r := Remedy{Text: columnsText(m) + " and a panel aspect of " + trimNum(a, 2),
		Set: []Setting{{"columns", float64(m)}, {"panel.aspect", a}}}
	if s.works(r) {
		return r, true
	}
	return Remedy{}, false
}

// widerMinimum finds a minimum panel width, for an output that derives
// its columns from one, that meets the width floor and, with a panel
// aspect, the height floor too.
func (s *solver) widerMinimum() (Remedy, bool) {
	if s.probe {
		return Remedy{}, false
	}
	cands := []float64{s.u.up(s.floorW)}
	if s.out.PanelHeight == 0 && s.out.PanelAspect > 0 {
		if v := s.u.up(s.floorH * s.out.PanelAspect); v > cands[0] {
			cands = append(cands, v)
		}
	}
	for _, v := range cands {
		r := Remedy{Text: "a minimum panel width of " + s.u.len(v), Set: []Setting{{"min-panel-width", v}}}
		if s.works(r) {
			return r, true
		}
	}
	return Remedy{}, false
}

// typeSize is one text size a remedy may make smaller.
type typeSize struct {
	key  string // the Setting key
	noun string // "title", "notes": what the text reads as
	v    float64
}

// smallerType finds smaller type for the text bands that lets the output
// solve, when the bands leave too little room for a row. It tries the
// fewest sizes first: the first page's title and dek, the later pages'
// running head (set in the heading size), both, then those with the
// notes. The sizes of a set shrink by one factor, largest first, so they
// keep their proportions; they step by 0.5 pt in print and 1 px on
// screen and never go below the smallest text the medium reads:
// minPrintType in print, minScreenType on screen (a size already below
// it is kept).
func (s *solver) smallerType() (Remedy, bool) {
	if s.probe {
		return Remedy{}, false
	}
	var head []typeSize
	if s.spec.Title != "" {
		head = append(head, typeSize{"type.title", "title", s.title})
	}
	if s.spec.Dek != "" {
		head = append(head, typeSize{"type.dek", "dek", s.dek})
	}
	heading := typeSize{"type.heading", "headings", s.heading}
	both := append(slices.Clip(head), heading)
	sets := [][]typeSize{head, {heading}, both}
	if s.spec.Source != "" || len(s.spec.Notes) > 0 {
		all := append(slices.Clone(head), typeSize{"type.notes", "notes", s.notes}, heading)
		sets = append(sets, all)
	}

	step, floor := 0.5, minPrintType
	down := func(v float64) float64 { return math.Floor(v*2+1e-9) / 2 }
	if s.screen {
		step, floor = 0.75, minScreenType
		down = func(v float64) float64 { return math.Floor(v/0.75+1e-9) * 0.75 }
	}
	for _, set := range sets {
		if len(set) == 0 {
			continue
		}
		big := 0.0
		for _, t := range set {
			big = max(big, t.v)
		}
		prev := ""
		for top := down(big - step); top >= floor-1e-9; top -= step {
			k := top / big
			var r Remedy
			var parts []string
			for _, t := range set {
				v := min(t.v, max(down(t.v*k), floor))
				r.Set = append(r.Set, Setting{t.key, v})
				parts = append(parts, s.typeText(v, t.noun))
			}
			r.Text = joinAnd(parts)
			if r.Text == prev {
				continue // rounding gave the sizes already tried
			}
			prev = r.Text
			if s.works(r) {
				return r, true
			}
		}
	}
	return Remedy{}, false
}

// typeText is "a 12 pt title", "6 pt notes", "18 px headings".
func (s *solver) typeText(pt float64, noun string) string {
	size := trimNum(pt, 1) + " pt"
	if s.screen {
		size = trimNum(pt/0.75, 0) + " px"
	}
	if strings.HasSuffix(noun, "s") {
		return size + " " + noun
	}
	return withArticle(size) + " " + noun
}

// withArticle puts "a" or "an" before a measure as it is read aloud: "an
// 8 mm gutter", "an 11.5 pt title", "an 18 px dek", "a 6 mm slug".
func withArticle(measure string) string {
	whole, _, _ := strings.Cut(strings.Fields(measure + " ")[0], ".")
	if strings.HasPrefix(whole, "8") || whole == "11" || whole == "18" ||
		len(whole) == 5 && (strings.HasPrefix(whole, "11") || strings.HasPrefix(whole, "18")) {
		return "an " + measure
	}
	return "a " + measure
}

// joinAnd joins "a", "b", "c" as "a, b and c".
func joinAnd(parts []string) string {
	if len(parts) <= 1 {
		return strings.Join(parts, "")
	}
	return strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
}

// tallestBand names the text band that takes most of a page's height,
// so that the message can say what to shorten: " (the title and dek take
// 480 mm: shorten them)". It is empty when the key band is the tallest.
func (s *solver) tallestBand(first bool) string {
	type band struct {
		name string
		one  bool // a single thing: "takes", "it"
		h    float64
	}
	var bands []band
	if first {
		switch {
		case len(s.titleLines) > 0 && len(s.dekLines) > 0:
			bands = append(bands, band{"the title and dek", false, s.headerH1})
		case len(s.titleLines) > 0:
			bands = append(bands, band{"the title", true, s.headerH1})
		case len(s.dekLines) > 0:
			bands = append(bands, band{"the dek", true, s.headerH1})
		}
		notes := 0
		for _, n := range s.noteLines {
			notes += len(n)
		}
		h := float64(len(s.sourceLines)+notes) * s.notes * s.lead
		switch {
		case len(s.sourceLines) > 0 && notes > 0:
			bands = append(bands, band{"the source and notes", false, h})
		case len(s.sourceLines) > 0:
			bands = append(bands, band{"the source line", true, h})
		case notes > 0:
			bands = append(bands, band{"the notes", false, h})
		}
	} else if len(s.runLines) > 0 {
		bands = append(bands, band{"the running head", true, s.headerHn})
	}
	best := band{h: s.keyH}
	for _, b := range bands {
		if b.h > best.h {
			best = b
		}
	}
	if best.name == "" {
		return ""
	}
	if best.one {
		return " (" + best.name + " takes " + s.u.len(best.h) + ": shorten it)"
	}
	return " (" + best.name + " take " + s.u.len(best.h) + ": shorten them)"
}
