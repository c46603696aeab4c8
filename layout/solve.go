package layout

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"sheaf/layout/fonts"
	"sheaf/specs"
)

const (
	mm = specs.PtPerMm

	// defaultLeading is the line height when the spec gives none: 120 % of
	// the type size, the usual setting for text type (common practice).
	defaultLeading = 1.2

	// keyStripFactor sets the colour strip's height from the key type size:
	// tall enough that colour reads as colour, not as a rule.
	keyStripFactor = 1.6

	// Legibility floors when the output sets none: a plot 12 mm wide in
	// print or 80 px on screen, and 3 label heights tall — below these a
	// 100–200 year line stops showing its shape (Heer, Kong & Agrawala
	// 2009 find accuracy falling as charts shrink; the numbers themselves
	// are common practice).
	floorWidthPrint  = 12 * mm
	floorWidthScreen = 80 * 0.75
	floorHeightLabel = 3

	// slugGap separates the slug line from the bleed edge.
	slugGap = 2.0

	// minPrintType is the smallest figure text print guides accept (5 pt,
	// print-facts.md, common practice); minPrintLine the thinnest rule that
	// prints reliably (0.25 pt, same source).
	minPrintType = 5.0
	minPrintLine = 0.25
)

// Solve lays out groups of panels (in order) for one output of spec, with
// text measured in fs. It returns an *InfeasibleError when the request
// cannot fit and a plain error for malformed input.
func Solve(spec *specs.Spec, out *specs.Output, fs *fonts.Set, groups []Group) (*Plan, error) {
	p, err := solve(spec, out, fs, groups, false)
	var inf *InfeasibleError
	if errors.As(err, &inf) {
		// Keep only the remedies that really work: each is tried by
		// solving again with the change applied.
		kept := inf.Remedies[:0]
		for _, r := range inf.Remedies {
			try := *out
			if r.Apply(&try) != nil {
				continue
			}
			if _, e := solve(spec, &try, fs, groups, true); e == nil {
				kept = append(kept, r)
			}
		}
		inf.Remedies = kept
	}
	return p, err
}

// solver holds the measurements of one output while it is laid out.
type solver struct {
	spec   *specs.Spec
	out    *specs.Output
	fs     *fonts.Set
	groups []Group
	u      units
	// probe is set while a remedy is tried: the solve only needs to say
	// whether it works, so it looks for no remedies of its own.
	probe  bool
	screen bool
	scroll bool // pages as tall as their content
	// perGroup cuts a scrolling output into one page per group, each of
	// which may be shown alone: later pages repeat the source line.
	perGroup bool

	lead                       float64
	trimW, trimH, bleed, slug  float64
	top, bottom, inner, outer  float64
	liveW, liveH               float64
	label, ticks, key, folio   float64
	title, dek, notes, heading float64
	la, ta, gap, hh            float64
	// labelLines and lb: the label lines reserved above every plot
	// (out.LabelBand, at least one) and their height, lines × la.
	labelLines int
	lb         float64

	titleLines, dekLines, runLines, sourceLines  []string
	noteLines                                    [][]string
	gapLines                                     []string // the gap note on every page (text.gap-note-on)
	headerH1, headerHn, keyH, footerH1, footerHn float64
	gridH1, gridHn                               float64

	n                    int
	colW, gutter, rowGap float64
	plotH, rowH, tb      float64
	every                bool
	floorW, floorH       float64
	markOff, markLen     float64
	headings             bool    // some group has a heading
	keyEvery             float64 // repeat the key this far down a scrolling page; 0: never
	warnings             []Warning
}

func (s *solver) where(key string) specs.Pos {
	return s.spec.Where("outputs." + s.out.Name + "." + key)
}

func (s *solver) errorf(key, format string, args ...any) error {
	return fmt.Errorf("%s: output %q: %s", s.where(key), s.out.Name, fmt.Sprintf(format, args...))
}

func (s *solver) infeasible(key, constraint string, need, have float64, msg string, rem ...Remedy) error {
	return &InfeasibleError{Pos: s.where(key), Output: s.out.Name, Constraint: constraint,
		Need: need, Have: have, Message: msg, Remedies: rem}
}

func (s *solver) warn(key, format string, args ...any) {
	pos := s.where(key)
	s.warnings = append(s.warnings, Warning{Pos: pos, Key: key, Where: pos.String(), Output: s.out.Name, Message: fmt.Sprintf(format, args...)})
}

func solve(spec *specs.Spec, out *specs.Output, fs *fonts.Set, groups []Group, probe bool) (*Plan, error) {
	if spec == nil || out == nil || fs == nil {
		return nil, errors.New("layout: Solve needs a spec, an output and a font set")
	}
	s := &solver{spec: spec, out: out, fs: fs, groups: groups, probe: probe}
	for i, g := range groups {
		if g.Count < 0 {
			return nil, fmt.Errorf("layout: group %d (%q) has %d panels", i, g.Heading, g.Count)
		}
		s.headings = s.headings || (g.Heading != "" && g.Count > 0)
	}
	steps := []func() error{s.readOutput, s.pageBoxes, s.bands, s.columns, s.rows}
	for _, step := range steps {
		if err := step(); err != nil {
			return nil, err
		}
	}
	pages, balanced, err := s.paginate(groups)
	if err != nil {
		return nil, err
	}
	if s.keyEvery > 0 {
		s.warnKeyEvery()
		for i := range pages {
			pages[i] = s.repeatKeys(pages[i])
		}
	}
	return s.place(groups, pages, balanced), nil
}

// readOutput checks the output's kind, sizes and type and takes their
// values in points.
func (s *solver) readOutput() error {
	o := s.out
	switch o.Kind {
	case specs.Print:
	case specs.Screen:
		s.screen = true
		s.scroll = o.Flow.Scrolls()
		s.perGroup = o.Flow == specs.FlowScrollGroups
	default:
		return s.errorf("kind", "kind %q is neither %q nor %q", o.Kind, specs.Print, specs.Screen)
	}
	s.u = units{screen: s.screen}
	s.trimW, s.trimH = o.Trim.W.Pt(), o.Trim.H.Pt()
	if !(s.trimW > 0) || (!s.scroll && !(s.trimH > 0)) {
		return s.errorf("trim", "trim %s × %s is not a page size", s.u.len(s.trimW), s.u.len(s.trimH))
	}
	if !s.screen {
		s.bleed, s.slug = o.Bleed.Pt(), o.Slug.Pt()
	}
	s.top, s.bottom = o.Margins.Top.Pt(), o.Margins.Bottom.Pt()
	s.inner, s.outer = o.Margins.Inside.Pt(), o.Margins.Outside.Pt()
	for _, l := range []struct {
		key string
		v   float64
	}{{"bleed", s.bleed}, {"slug", s.slug}, {"margins", s.top}, {"margins", s.bottom},
		{"margins", s.inner}, {"margins", s.outer}, {"gutter", o.Gutter.Pt()}, {"row-gap", o.RowGap.Pt()},
		{"panel.height", o.PanelHeight.Pt()}, {"min-panel-width", o.MinPanelWidth.Pt()},
		{"panel.aspect", o.PanelAspect}, {"key-every", o.KeyEvery.Pt()}} {
		if l.v < 0 || math.IsNaN(l.v) || math.IsInf(l.v, 0) {
			return s.errorf(l.key, "%s must be a finite length of 0 or more", l.key)
		}
	}
	if o.Columns < 0 {
		return s.errorf("columns", "columns must be 0 (derive from min-panel-width) or more, not %d", o.Columns)
	}

	t := o.Type
	s.lead = t.Leading
	if s.lead <= 0 {
		s.lead = defaultLeading
	}
	s.label, s.ticks, s.key, s.folio = t.Label.Pt(), t.Ticks.Pt(), t.Key.Pt(), t.Folio.Pt()
	s.title, s.dek, s.notes = t.Title.Pt(), t.Dek.Pt(), t.Notes.Pt()
	s.heading = t.Heading.Pt()
	if s.heading <= 0 {
		s.heading = s.dek
	}
	need := []struct {
		name string
		v    float64
		used bool
	}{
		{"label", s.label, true}, {"ticks", s.ticks, true}, {"key", s.key, true},
		{"folio", s.folio, !s.scroll},
		{"title", s.title, s.spec.Title != ""},
		{"dek", s.dek, s.spec.Dek != ""},
		{"notes", s.notes, s.spec.Source != "" || len(s.spec.Notes) > 0 || s.spec.GapNoteText() != ""},
		{"heading", s.heading, true},
	}
	for _, n := range need {
		if n.used && !(n.v > 0) {
			return s.errorf("type."+n.name, "type size %s is %g pt; it must be more than 0", n.name, n.v)
		}
	}
	s.la, s.ta = s.label*s.lead, s.ticks*s.lead
	s.gap = s.la // bands are a blank label line apart
	s.labelLines = max(1, o.LabelBand)
	s.lb = float64(s.labelLines) * s.la
	s.hh = s.heading * s.lead
	s.every = o.Ticks == specs.TicksEveryPanel
	if s.scroll {
		s.keyEvery = o.KeyEvery.Pt() // pages carry their own key
	}

	s.floorW = o.FloorWidth.Pt()
	if s.floorW <= 0 {
		s.floorW = floorWidthPrint
		if s.screen {
			s.floorW = floorWidthScreen
		}
	}
	s.floorH = o.FloorHeight.Pt()
	if s.floorH <= 0 {
		s.floorH = floorHeightLabel * s.label
	}

	if !s.screen {
		if s.bleed == 0 {
			s.warn("bleed", "no bleed: colour that reaches the trim will leave white slivers, since trimming drifts 0.5–1 mm; use 3 mm (0.125 in in North America)")
		}
		for _, n := range need[:4] {
			if n.used && n.v < minPrintType {
				s.warn("type."+n.name, "%s type at %g pt is below the %g pt print guides accept", n.name, n.v, minPrintType)
			}
		}
		if l := o.Line.Pt(); l > 0 && l < minPrintLine {
			s.warn("line", "chart lines of %g pt are hairlines that may break up in print; use at least %g pt, 0.5 pt preferred", l, minPrintLine)
		}
	}
	return nil
}

// pageBoxes sets the mark geometry, checks the slug holds it, and the
// live area.
func (s *solver) pageBoxes() error {
	o := s.out
	if !s.screen && (o.Marks || o.SlugLine) {
		var need float64
		what := ""
		if o.Marks {
			s.markOff, s.markLen = CropMarks(s.bleed)
			need = s.markOff - s.bleed + s.markLen
			what = "crop marks"
		}
		if o.SlugLine {
			if l := slugGap + s.folio*s.lead; l > need {
				need = l
			}
			if what != "" {
				what += " and "
			}
			what += "the slug line"
		}
		if s.slug < need-eps {
			v := s.u.up(need)
			return s.infeasible("slug", "slug", need, s.slug,
				fmt.Sprintf("%s need a slug of %s outside the bleed; it is %s", what, s.u.len(need), s.u.len(s.slug)),
				Remedy{Text: withArticle(s.u.len(v)) + " slug", Set: []Setting{{"slug", v}}})
		}
	}
	s.liveW = s.trimW - s.inner - s.outer
	if s.liveW <= 0 {
		return s.infeasible("margins", "live area", s.inner+s.outer, s.trimW,
			fmt.Sprintf("inside and outside margins of %s leave no live area on a trim %s wide",
				s.u.len(s.inner+s.outer), s.u.len(s.trimW)),
			s.sideMargins(s.inner+s.outer-s.trimW+s.minLiveW()))
	}
	if !s.scroll {
		s.liveH = s.trimH - s.top - s.bottom
		if s.liveH <= 0 {
			return s.infeasible("margins", "live area", s.top+s.bottom, s.trimH,
				fmt.Sprintf("top and bottom margins of %s leave no live area on a trim %s tall",
					s.u.len(s.top+s.bottom), s.u.len(s.trimH)),
				s.headFootMargins(s.top+s.bottom-s.trimH/2))
		}
	}
	return nil
}

// minLiveW is the narrowest live area the output's columns can use.
func (s *solver) minLiveW() float64 {
	n := max(s.out.Columns, 1)
	w := max(s.floorW, s.out.MinPanelWidth.Pt())
	return float64(n)*w + float64(n-1)*s.out.Gutter.Pt()
}

// sideMargins narrows the inside and outside margins by deficit in all.
func (s *solver) sideMargins(deficit float64) Remedy {
	in := s.u.down(s.inner - deficit/2)
	outer := s.u.down(s.outer - deficit/2)
	if in < 0 || outer < 0 {
		return Remedy{}
	}
	return Remedy{Text: "inside and outside margins of " + s.u.len(in) + " and " + s.u.len(outer),
		Set: []Setting{{"margins.inside", in}, {"margins.outside", outer}}}
}

// headFootMargins narrows the top and bottom margins by deficit in all.
func (s *solver) headFootMargins(deficit float64) Remedy {
	t := s.u.down(s.top - deficit/2)
	b := s.u.down(s.bottom - deficit/2)
	if t < 0 || b < 0 {
		return Remedy{}
	}
	return Remedy{Text: "top and bottom margins of " + s.u.len(t) + " and " + s.u.len(b),
		Set: []Setting{{"margins.top", t}, {"margins.bottom", b}}}
}

// bands measures the header, running head, key band and footer.
func (s *solver) bands() error {
	sp, o := s.spec, s.out
	wrap := func(st fonts.Style, size float64, text, key string, measure ...float64) []string {
		width := s.liveW
		if len(measure) > 0 {
			width = measure[0]
		}
		lines := s.fs.Wrap(st, size, text, width)
		for _, l := range lines {
			if s.fs.Width(st, size, l) > s.liveW+eps {
				s.warn(key, "%q is wider than the live area (%s) and will run past it", l, s.u.len(s.liveW))
			}
		}
		return lines
	}
	s.titleLines = wrap(fonts.Bold, s.title, sp.Title, "title")
	s.dekLines = s.wrapDek(wrap)
	s.headerH1 = float64(len(s.titleLines))*s.title*s.lead + float64(len(s.dekLines))*s.dek*s.lead
	run := o.Running
	if run == "" {
		run = sp.Title
	}
	s.runLines = wrap(fonts.Regular, s.heading, run, "running")
	s.headerHn = float64(len(s.runLines)) * s.heading * s.lead

	s.keyH = keyStripFactor*s.key + s.key*s.lead
	if len(sp.Periods) > 0 {
		s.keyH += PeriodRow(s.ticks, s.lead) // a row for the labelled periods
	}

	s.sourceLines = wrap(fonts.Regular, s.notes, sp.Source, "source")
	nl := len(s.sourceLines)
	s.noteLines = nil
	for _, n := range sp.Notes {
		ls := wrap(fonts.Regular, s.notes, n, "notes")
		s.noteLines = append(s.noteLines, ls)
		nl += len(ls)
	}
	s.gapLines = nil
	if g := sp.GapNoteText(); g != "" {
		ls := wrap(fonts.Regular, s.notes, g, "text.gap-note")
		if sp.Text.GapNoteOn == specs.GapNoteFirstPage {
			s.noteLines = append(s.noteLines, ls)
			nl += len(ls)
		} else {
			s.gapLines = ls
		}
	}
	folioH := s.folio * s.lead
	if s.scroll {
		folioH = 0 // a scrolling page is read alone: no folio
	}
	s.footerH1 = float64(nl)*s.notes*s.lead + folioH
	s.footerHn = folioH
	gapH := float64(len(s.gapLines)) * s.notes * s.lead
	s.footerH1 += gapH
	s.footerHn += gapH
	if s.perGroup {
		// A group's page may be shown alone in an article, so it says
		// where its data comes from; the notes stay with the first page.
		s.footerHn += float64(len(s.sourceLines)) * s.notes * s.lead
	}

	s.gridH1 = s.liveH - s.bandsH(true)
	s.gridHn = s.liveH - s.bandsH(false)
	return nil
}

// keyBandH is the height a key band takes with the gap under it.
func (s *solver) keyBandH() float64 { return s.keyH + s.gap }

// warnKeyEvery warns when key-every is shorter than a key band and a row:
// then a key stands before every row, which is rarely what was meant.
func (s *solver) warnKeyEvery() {
	if least := s.keyBandH() + s.rowH + s.tb + s.rowGap; s.keyEvery < least-eps {
		s.warn("key-every", "key-every of %s is less than a key band and a row of panels (%s): a key stands above every row; use 0 for a key at the top only, or %s or more",
			s.u.len(s.keyEvery), s.u.len(least), s.u.len(s.u.up(least)))
	}
}

// bandsH is the height the bands take from the live area of the first or a
// later page, with their gaps.
func (s *solver) bandsH(first bool) float64 {
	h, f := s.headerHn, s.footerHn
	if first {
		h, f = s.headerH1, s.footerH1
	}
	total := s.keyH + s.gap
	if h > 0 {
		total += h + s.gap
	}
	if f > 0 {
		total += f + s.gap
	}
	return total
}

// colWidth is the column width for n columns.
func (s *solver) colWidth(n int) float64 {
	return (s.liveW - float64(n-1)*s.gutter) / float64(n)
}

// columns sets the number and width of columns and checks the width floor.
func (s *solver) columns() error {
	o, u := s.out, s.u
	s.gutter, s.rowGap = o.Gutter.Pt(), o.RowGap.Pt()
	g := s.gutter
	fit := func(w float64) int { return int(math.Floor((s.liveW + g) / (w + g) * (1 + 1e-12))) }
	switch {
	case o.Columns > 0:
		s.n = o.Columns
	case o.MinPanelWidth > 0:
		minW := o.MinPanelWidth.Pt()
		s.n = fit(minW)
		if s.n < 1 {
			r := []Remedy{s.sideMargins(minW - s.liveW)}
			if v := u.down(s.liveW); v >= s.floorW {
				r = append([]Remedy{{Text: "a minimum panel width of " + u.len(v), Set: []Setting{{"min-panel-width", v}}}}, r...)
			}
			return s.infeasible("min-panel-width", "panel width", minW, s.liveW,
				fmt.Sprintf("panels at least %s wide do not fit the live area, %s wide", u.len(minW), u.len(s.liveW)), r...)
		}
	default:
		return s.errorf("columns", "set columns or min-panel-width")
	}
	s.colW = s.colWidth(s.n)
	if s.colW < s.floorW-eps {
		need := float64(s.n)*s.floorW + float64(s.n-1)*g
		var r []Remedy
		if m := fit(s.floorW); m >= 1 {
			fix := s.widerMinimum
			if o.Columns > 0 {
				fix = func() (Remedy, bool) { return s.fewerColumns(m) }
			}
			if rem, ok := fix(); ok {
				r = append(r, rem)
			}
		}
		if s.n > 1 {
			if v := u.down((s.liveW - float64(s.n)*s.floorW) / float64(s.n-1)); v >= 0 {
				r = append(r, Remedy{Text: withArticle(u.len(v)) + " gutter", Set: []Setting{{"gutter", v}}})
			}
		}
		if len(r) == 0 {
			r = append(r, s.sideMargins(need-s.liveW))
		}
		return s.infeasible(s.columnsKey(), "panel width", need, s.liveW,
			fmt.Sprintf("%d columns of panels at least %s wide (the legibility floor) with %s gutters need %s; the live area is %s",
				s.n, u.len(s.floorW), u.len(g), u.len(need), u.len(s.liveW)), r...)
	}
	return nil
}

func (s *solver) columnsKey() string {
	if s.out.Columns > 0 {
		return "columns"
	}
	return "min-panel-width"
}

// floorText says where the plot-height floor comes from.
func (s *solver) floorText() string {
	if s.out.FloorHeight > 0 {
		return "floor.height " + s.u.len(s.floorH)
	}
	return fmt.Sprintf("%d × the %g pt label size", floorHeightLabel, s.label)
}

// rows sets the panel height and checks the height floor and that a row
// fits on every page.
func (s *solver) rows() error {
	o, u := s.out, s.u
	g := s.gutter
	switch {
	case o.PanelHeight > 0:
		s.plotH = o.PanelHeight.Pt() - s.lb
		if s.plotH < s.floorH-eps {
			v := u.up(s.lb + s.floorH)
			return s.infeasible("panel.height", "plot height", s.floorH, s.plotH,
				fmt.Sprintf("panels %s tall leave %s for the plot under a %s label; the legibility floor is %s (%s)",
					u.len(o.PanelHeight.Pt()), u.len(s.plotH), u.len(s.lb), u.len(s.floorH), s.floorText()),
				Remedy{Text: "a panel height of " + u.len(v), Set: []Setting{{"panel.height", v}}})
		}
	case o.PanelAspect > 0:
		a := o.PanelAspect
		s.plotH = s.colW / a
		if s.plotH < s.floorH-eps {
			var r []Remedy
			if v := math.Floor(s.colW/s.floorH*100) / 100; v > 0 {
				r = append(r, Remedy{Text: "a panel aspect of " + trimNum(v, 2), Set: []Setting{{"panel.aspect", v}}})
			}
			if o.Columns > 0 {
				if m := int(math.Floor((s.liveW + g) / (s.floorH*a + g))); m >= 1 && m < s.n {
					r = append(r, columnsRemedy(m))
				}
			} else if v := u.up(s.floorH * a); v > o.MinPanelWidth.Pt() {
				r = append(r, Remedy{Text: "a minimum panel width of " + u.len(v), Set: []Setting{{"min-panel-width", v}}})
			}
			return s.infeasible("panel.aspect", "plot height", s.floorH, s.plotH,
				fmt.Sprintf("panels %s wide at aspect %g have plots %s tall; the legibility floor is %s (%s)",
					u.len(s.colW), a, u.len(s.plotH), u.len(s.floorH), s.floorText()), r...)
		}
	case o.PanelBank:
		return s.errorf("panel.aspect", "panel.aspect: bank is chosen from the data: lay the output out with bank.Solve")
	default:
		return s.errorf("panel", "set panel.aspect or panel.height")
	}
	s.setRowH()
	if s.scroll {
		return nil
	}

	// One row, with a group heading when there are headings, must fit on
	// the first page and on later pages.
	need, with := s.rowH+s.tb, ""
	if s.headings {
		need += s.hh
		with = ", with a group heading"
	}
	page, have := "first", s.gridH1
	if s.gridHn < have {
		page, have = "later", s.gridHn
	}
	if need <= have+eps {
		return nil
	}
	d := need - have
	if have <= 0 {
		bands := s.bandsH(page == "first")
		r := []Remedy{s.headFootMargins(d)}
		if t, ok := s.smallerType(); ok {
			r = append([]Remedy{t}, r...)
		}
		return s.infeasible("margins", "page height", bands, s.liveH,
			fmt.Sprintf("the header, key band and footer of the %s page need %s; the live area is %s tall%s",
				page, u.len(bands), u.len(s.liveH), s.tallestBand(page == "first")), r...)
	}
	var r []Remedy
	switch {
	case o.PanelHeight > 0:
		if v := u.down(o.PanelHeight.Pt() - d); v-s.lb >= s.floorH-eps {
			r = append(r, Remedy{Text: "a panel height of " + u.len(v), Set: []Setting{{"panel.height", v}}})
		}
	default:
		a := o.PanelAspect
		if ph := s.plotH - d; ph >= s.floorH-eps && ph > 0 {
			v := math.Ceil(s.colW/ph*100) / 100
			r = append(r, Remedy{Text: "a panel aspect of " + trimNum(v, 2), Set: []Setting{{"panel.aspect", v}}})
			if o.Columns > 0 {
				for m := s.n + 1; m <= s.n+64; m++ {
					w := s.colWidth(m)
					if w < s.floorW-eps {
						break
					}
					if w/a <= ph {
						r = append(r, columnsRemedy(m))
						break
					}
				}
			}
		}
	}
	r = append(r, s.headFootMargins(d))
	// When the text bands take most of the page, or nothing about the
	// panels or margins helps, the cure is in the text: say which band to
	// shorten, and offer smaller type first.
	bands, hint := s.bandsH(page == "first"), ""
	if !s.probe && (bands > s.liveH/2 || !slices.ContainsFunc(r, s.works)) {
		hint = s.tallestBand(page == "first")
		if t, ok := s.smallerType(); ok {
			r = append([]Remedy{t}, r...)
		}
	}
	return s.infeasible(s.heightKey(), "page height", need, have,
		fmt.Sprintf("a row of panels needs %s (label, plot and tick labels%s); the %s page has %s left under its header, key band and footer%s",
			u.len(need), with, page, u.len(have), hint), r...)
}

func (s *solver) heightKey() string {
	if s.out.PanelHeight > 0 {
		return "panel.height"
	}
	return "panel.aspect"
}

// setRowH derives the row heights from the plot height. With ticks on
// every panel each row carries its tick area, so all rows are alike; with
// ticks on the bottom row only, the tick area is reserved once under the
// last row of each block (a page's run of one group), which is the only
// row that needs it — the panels stay the same size either way.
func (s *solver) setRowH() {
	s.rowH = s.lb + s.plotH
	s.tb = 0
	if s.every {
		s.rowH += s.ta
	} else {
		s.tb = s.ta
	}
}
