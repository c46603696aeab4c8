// Package feature loads and prepares a feature for drawing: the spec and
// its data, the era palette the spec asks for, and for every output its
// fonts, layout plan and fitted labels; every insert laid out; the
// palette's checks and preflight over all outputs; and the summary that
// `sheaf check` prints. It writes no files: package production does.
//
// Every error a function here returns for something the user must fix
// is a *specs.InputError (choose it with errors.As or specs.IsBadInput).
package feature

import (
	"fmt"
	"strconv"
	"sync"
	"time"

	"sheaf/layout"
	"sheaf/layout/bank"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/palette/press"
	"sheaf/render/page"
	"sheaf/render/preflight"
	"sheaf/specs"
	"sheaf/specs/series"
)

// Job is a loaded spec with its data.
type Job struct {
	Spec *specs.Spec
	Data *series.Set

	// table is the counts table Data was selected from, kept for the
	// inserts' terms (nil: they read the table again).
	table *series.Table
	// fonts are the outputs' fonts by output name, parsed once for the
	// output and the inserts that borrow it.
	mu    sync.Mutex
	fonts map[string]*fonts.Set
	// early holds what loading fonts ahead found (LoadData starts it
	// while the table is read); fontsFor waits for it. nil: nothing was
	// started, fonts load when first asked for.
	early *earlyFonts

	palOnce sync.Once
	pal     []PaletteCheck
	palErr  error

	// facts are preflight's checks of the data alone, worked out once
	// for every output.
	factsOnce sync.Once
	facts     *preflight.Facts
}

// earlyFonts is the fonts of every output, loaded on a goroutine of
// their own while the data tables are read: the two do not depend on
// each other, and each is a good part of what `check` and a rebuild
// wait for before laying anything out.
type earlyFonts struct {
	done chan struct{}
	errs map[string]error // an output's fonts.Load error, given when asked
}

// Load reads the spec at path and its data tables.
func Load(path string) (*Job, error) {
	s, err := specs.Load(path)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	return LoadData(s)
}

// LoadData reads the data tables of a loaded spec.
//
// Every output's fonts are loaded meanwhile, on a goroutine of their
// own; an output's font error is returned when the output is prepared,
// as it would be without the head start, and a data error still comes
// first.
func LoadData(s *specs.Spec) (*Job, error) {
	j := &Job{Spec: s}
	j.loadFontsAhead()
	if err := j.readData(); err != nil {
		<-j.early.done // nothing left running after return
		return nil, err
	}
	return j, nil
}

// loadFontsAhead starts loading every output's fonts, in the spec's
// order (so faces the outputs share are parsed once, as fontsFor
// shares them). It reads only the spec, which nothing changes while it
// runs (DataGaps, set meanwhile, is not read by fonts.Load).
func (j *Job) loadFontsAhead() {
	e := &earlyFonts{done: make(chan struct{}), errs: map[string]error{}}
	j.early = e
	outs := j.Spec.Outputs
	go func() {
		defer close(e.done)
		var loaded []*fonts.Set
		for i := range outs {
			fs, err := j.loadFonts(&outs[i])
			if err != nil {
				e.errs[outs[i].Name] = err
				continue
			}
			loaded = append(loaded, fs)
		}
		// The faces labels and figures are measured in, parsed for
		// shaping here too, while the table is still being read.
		for _, fs := range loaded {
			fs.PrepareShaping(fonts.Bold, fonts.Regular, fonts.Figures)
		}
	}()
}

// ReadData reads the data tables into j, whose Data is nil, as LoadData
// does, and keeps the fonts j has loaded: a caller may load them
// (Fonts) on another goroutine while the table is read, since neither
// reads what the other writes. It starts no loading of its own.
func (j *Job) ReadData() error { return j.readData() }

func (j *Job) readData() error {
	s := j.Spec
	t, err := series.ReadTable(s)
	if err != nil {
		return specs.BadInput(err)
	}
	d, err := t.Select(s)
	if err != nil {
		return specs.BadInput(err)
	}
	s.DataGaps = append([]int(nil), d.Gaps...)
	if err := checkEditorialTerms(s, d); err != nil {
		return specs.BadInput(err)
	}
	j.Data, j.table = d, t
	return nil
}

// Fonts gives out's fonts, loaded once for the job: Prepare and the
// inserts that borrow out get the same Set, so a caller can first give
// it what an earlier run knew (fonts.Set.LoadWidths) and the layout
// measures with that.
func (j *Job) Fonts(out *specs.Output) (*fonts.Set, error) {
	fs, err := j.fontsFor(out)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	return fs, nil
}

// fontsFor loads out's fonts once for the job: the output and every
// insert that borrows it measure and draw with the same Set.
func (j *Job) fontsFor(out *specs.Output) (*fonts.Set, error) {
	if e := j.early; e != nil {
		<-e.done
		if err := e.errs[out.Name]; err != nil {
			return nil, err
		}
	}
	return j.loadFonts(out)
}

// loadFonts is fontsFor without waiting for the fonts loaded ahead.
func (j *Job) loadFonts(out *specs.Output) (*fonts.Set, error) {
	j.mu.Lock()
	defer j.mu.Unlock()
	if fs, ok := j.fonts[out.Name]; ok {
		return fs, nil
	}
	var loaded []*fonts.Set
	for _, o := range j.Spec.Outputs {
		if other := j.fonts[o.Name]; other != nil {
			loaded = append(loaded, other)
		}
	}
	fs, err := fonts.Load(j.Spec, out, loaded...) // faces another output parsed are shared
	if err != nil {
		return nil, err
	}
	for _, o := range j.Spec.Outputs {
		if other := j.fonts[o.Name]; other != nil && fs.ShareShaping(other) {
			break // outputs in the same faces shape each label once
		}
	}
	if j.fonts == nil {
		j.fonts = map[string]*fonts.Set{}
	}
	j.fonts[out.Name] = fs
	return fs, nil
}

// Scale builds the era palette the spec asks for over span.
func Scale(s *specs.Spec, span specs.Span) (palette.Scale, error) {
	from, to := float64(span.From), float64(span.To)
	var bounds []float64
	if len(s.Palette.Eras) > 0 {
		bounds = append(bounds, from)
		for _, e := range s.Palette.Eras {
			if float64(e) <= from || float64(e) >= to {
				return palette.Scale{}, specs.BadInput(fmt.Errorf("%s: palette.eras: boundary %d must lie inside the span %d–%d", s.Where("palette.eras"), e, span.From, span.To))
			}
			bounds = append(bounds, float64(e))
		}
		bounds = append(bounds, to)
	}
	anchors := palette.DefaultAnchors(from, to)
	name := palette.DefaultName
	if len(s.Palette.Anchors) > 0 {
		name = "custom"
		anchors = anchors[:0:0]
		for _, a := range s.Palette.Anchors {
			anchors = append(anchors, palette.Anchor{Year: a.Year, Color: page.ColorOf(a.Color)})
		}
	}
	sc, err := palette.NewScale(name, anchors, bounds)
	if err != nil {
		return palette.Scale{}, specs.BadInput(fmt.Errorf("%s: %v", s.Where("palette"), err))
	}
	return sc, nil
}

// Groups turns the data's groups into the layout's.
func (j *Job) Groups() []layout.Group {
	var gs []layout.Group
	for _, g := range j.Data.Groups {
		gs = append(gs, layout.Group{Heading: g.Heading, Count: g.Count})
	}
	return gs
}

// Output is one output ready to draw: its fonts, its layout plan and the
// feature as its pages draw it (palette, stops, fitted labels).
type Output struct {
	Spec    *specs.Output
	Fonts   *fonts.Set
	Plan    *layout.Plan
	Feature *page.Feature
	// Press is the printing condition of a print output with a press
	// profile (spec press); nil: RGB.
	Press *press.Condition
}

// Name is the output's name.
func (o *Output) Name() string { return o.Spec.Name }

// Prepare loads the fonts, solves the layout and builds the palette of
// one output of the job's spec.
func (j *Job) Prepare(out *specs.Output) (*Output, error) {
	fs, err := j.fontsFor(out)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	plan, err := bank.Solve(j.Spec, out, fs, j.Groups(), j.Data) // layout.Solve, banking the aspect when asked
	// A face Load accepted that shaping cannot read: no width is right.
	if ferr := fs.Err(); ferr != nil {
		return nil, specs.BadInput(ferr)
	}
	if err != nil {
		return nil, specs.BadInput(err)
	}
	sc, err := Scale(j.Spec, j.Data.Span)
	if err != nil {
		return nil, err
	}
	cond, err := press.ForOutput(j.Spec, out)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	feat := page.NewFeature(j.Spec, out, plan, j.Data, sc, fs)
	if n := feat.LabelLinesWanted(); n > 1 {
		plan, feat = j.wrapLabels(out, fs, plan, feat, n, sc)
	}
	o := &Output{Spec: out, Fonts: fs, Plan: plan, Press: cond, Feature: feat}
	if err := checkNoteRoom(j.Spec, o); err != nil {
		return nil, specs.BadInput(err)
	}
	if err := fs.Err(); err != nil {
		return nil, specs.BadInput(err)
	}
	return o, nil
}

// wrapLabels lays out again an output some of whose labels wrap, with a
// label band of n lines above every plot: every panel of the output gets
// it, so all plots keep one height and small multiples still compare.
// Panel widths do not depend on the band, so the labels wrap the same in
// the new plan. When a row with the taller band no longer fits the page,
// the one-line plan stays (its labels shrink instead) with a warning.
func (j *Job) wrapLabels(out *specs.Output, fs *fonts.Set, plan *layout.Plan, feat *page.Feature, n int, sc palette.Scale) (*layout.Plan, *page.Feature) {
	o := *out
	o.LabelBand = n
	wide, err := bank.Solve(j.Spec, &o, fs, j.Groups(), j.Data)
	if err != nil {
		pos := j.Spec.Where("outputs." + out.Name + ".label-lines")
		plan.Warnings = append(plan.Warnings, layout.Warning{Pos: pos, Key: "label-lines", Where: pos.String(), Output: out.Name,
			Message: fmt.Sprintf("labels that would wrap onto %d lines are shrunk on one instead: a label band of %d lines does not fit (%v)", n, n, err)})
		return plan, feat
	}
	return wide, page.NewFeature(j.Spec, out, wide, j.Data, sc, fs)
}

// PrepareAll prepares every output of the spec, in the spec's order.
func (j *Job) PrepareAll() ([]*Output, error) {
	outs := make([]*specs.Output, len(j.Spec.Outputs))
	for i := range j.Spec.Outputs {
		outs[i] = &j.Spec.Outputs[i]
	}
	return j.PrepareEach(outs)
}

// PrepareEach prepares the outputs given, each on a goroutine of its own
// (their fonts are shared and locked; their layouts are independent),
// and returns them in the order given. The error is the first output's
// in that order, as preparing them one after another would return.
func (j *Job) PrepareEach(outs []*specs.Output) ([]*Output, error) {
	preps := make([]*Output, len(outs))
	errs := make([]error, len(outs))
	each(len(outs), func(i int) { preps[i], errs[i] = j.Prepare(outs[i]) })
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return preps, nil
}

// each calls f(0), …, f(n-1), each on a goroutine of its own, and
// waits for all of them. The n here are a spec's outputs or steps: few.
func each(n int, f func(i int)) {
	var wg sync.WaitGroup
	for i := range n {
		wg.Go(func() { f(i) })
	}
	wg.Wait()
}

// FallbackDate stands in when neither SOURCE_DATE_EPOCH nor the spec's
// date is set: a fixed day, so files never depend on the clock.
var FallbackDate = time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)

// DocumentDate is the date written into file metadata: sourceDateEpoch
// (the value of SOURCE_DATE_EPOCH, seconds since 1970 — the
// reproducible-builds.org convention; "" when unset) first, then the
// spec's date, then FallbackDate. The caller reads the environment.
func DocumentDate(s *specs.Spec, sourceDateEpoch string) (time.Time, error) {
	d := FallbackDate
	if s.Date != "" {
		t, err := time.Parse("2006-01-02", s.Date)
		if err != nil {
			return time.Time{}, specs.BadInput(fmt.Errorf("%s: date %q: %v", s.Where("date"), s.Date, err))
		}
		d = t
	}
	if sourceDateEpoch == "" {
		return d, nil
	}
	n, err := strconv.ParseInt(sourceDateEpoch, 10, 64)
	if err != nil {
		return time.Time{}, specs.BadInput(fmt.Errorf("SOURCE_DATE_EPOCH=%q is not an integer number of seconds", sourceDateEpoch))
	}
	// PDF dates have four-digit years (ISO 32000-1 §7.9.4): 0000–9999.
	if n < 0 || n > 253402300799 {
		return time.Time{}, specs.BadInput(fmt.Errorf("SOURCE_DATE_EPOCH=%q is outside 0 (1970-01-01) … 253402300799 (9999-12-31), the years a PDF date can hold", sourceDateEpoch))
	}
	return time.Unix(n, 0).UTC(), nil
}
