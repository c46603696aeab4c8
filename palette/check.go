package palette

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"
)

// Direction is the way CIELAB L* must run across the years.
type Direction int

const (
	// LightnessAuto requires L* to be monotone in whichever direction it
	// runs from the first year to the last.
	LightnessAuto Direction = iota
	LightnessIncreasing
	LightnessDecreasing
	// LightnessAny skips the lightness check: a declared exception.
	LightnessAny
)

func (d Direction) String() string {
	switch d {
	case LightnessAuto:
		return "auto"
	case LightnessIncreasing:
		return "increasing"
	case LightnessDecreasing:
		return "decreasing"
	case LightnessAny:
		return "any"
	}
	return fmt.Sprintf("Direction(%d)", int(d))
}

// ParseDirection reads "auto", "increasing", "decreasing" or "any"; the
// empty string means auto.
func ParseDirection(s string) (Direction, error) {
	for _, d := range []Direction{LightnessAuto, LightnessIncreasing, LightnessDecreasing, LightnessAny} {
		if s == d.String() {
			return d, nil
		}
	}
	if s == "" {
		return LightnessAuto, nil
	}
	return 0, fmt.Errorf("palette: lightness %q: want auto, increasing, decreasing or any", s)
}

// Thresholds holds the limits Check applies. Start from DefaultThresholds.
type Thresholds struct {
	Lightness   Direction // how L* must run; default auto
	SampleYears float64   // continuous scales are checked at about this step; default 10
	MinStep     float64   // ΔE00 between adjacent eras or samples; default 5 (a heuristic)
	MinSpan     float64   // ΔE00 between the first and last colour; default 30
	MinContrast float64   // WCAG 2.1 contrast against the paper; default 3 (SC 1.4.11)
	MinCVDStep  float64   // simulated ΔE00 between adjacent steps; default 2 (one JND, CSS Color 4)
	NoticeableP float64   // fraction of viewers for the size guidance; default 0.5
	// KeyEras is how many eras the colour key labels, i.e. how many
	// bands of years a reader is asked to tell apart by colour. 0 means:
	// the eras of a stepped scale, else the years a key labelled every 20
	// years would show (the multiples of 20 inside the span, at least 2).
	// A renderer that knows its key's labels should set it.
	KeyEras int
}

// DefaultThresholds returns the documented defaults:
//   - MinStep 5: a common-practice heuristic for line colours (CIELAB
//     steps of 5–6 become visibly different for large marks, Stone et al.
//     2014), not a standard;
//   - MinSpan 30: the whole span must read as a clear change;
//   - MinContrast 3: WCAG 2.1 SC 1.4.11 (non-text contrast);
//   - MinCVDStep 2: CSS Color 4 takes one JND as ΔE2000 = 2.
func DefaultThresholds() Thresholds {
	return Thresholds{
		Lightness:   LightnessAuto,
		SampleYears: 10,
		MinStep:     5,
		MinSpan:     30,
		MinContrast: 3,
		MinCVDStep:  2,
		NoticeableP: 0.5,
	}
}

func (th Thresholds) validate() error {
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"SampleYears", th.SampleYears}, {"MinStep", th.MinStep}, {"MinSpan", th.MinSpan},
		{"MinContrast", th.MinContrast}, {"MinCVDStep", th.MinCVDStep}, {"NoticeableP", th.NoticeableP},
	} {
		if !finite(f.v) || f.v <= 0 {
			return fmt.Errorf("palette: threshold %s = %v: must be a positive number", f.name, f.v)
		}
	}
	if th.NoticeableP > 1 {
		return fmt.Errorf("palette: threshold NoticeableP = %v: must be at most 1", th.NoticeableP)
	}
	if th.KeyEras < 0 {
		return fmt.Errorf("palette: threshold KeyEras = %d: must not be negative", th.KeyEras)
	}
	if th.Lightness < LightnessAuto || th.Lightness > LightnessAny {
		return fmt.Errorf("palette: threshold Lightness = %v: unknown direction", th.Lightness)
	}
	return nil
}

// Severity grades a finding.
type Severity int

const (
	Info Severity = iota // guidance only
	Warn                 // may hurt the print or the reading; look at it
	Fail                 // breaks a requirement
)

func (s Severity) String() string {
	switch s {
	case Info:
		return "INFO"
	case Warn:
		return "WARN"
	case Fail:
		return "FAIL"
	}
	return fmt.Sprintf("Severity(%d)", int(s))
}

// Names of the checks, as they appear in Finding.Check. CVD findings use
// CheckCVD + "/" + the deficiency, e.g. "cvd/deuteranopia".
const (
	CheckLightness = "lightness"
	CheckStep      = "step"
	CheckSpan      = "span"
	CheckContrast  = "contrast"
	CheckGamut     = "gamut"
	CheckCVD       = "cvd"
	CheckSize      = "size"
)

// Finding is one result of a check.
type Finding struct {
	Check    string
	Label    string  // the year or era it concerns ("" for the whole scale)
	Year     float64 // that year (an era's first year); NaN for the whole scale
	Severity Severity
	Message  string // says what, where and the numbers
}

func (f Finding) String() string {
	where := f.Label
	if where == "" {
		where = "all"
	}
	return fmt.Sprintf("%s %s %s: %s", f.Severity, f.Check, where, f.Message)
}

// Row is one sampled year or one era of a checked scale. Colour figures
// are of the colour as drawn, i.e. clipped to sRGB.
type Row struct {
	Label      string
	Year       float64 // sample year, or an era's first year
	Color      Color   // clipped
	InGamut    bool    // the scale's colour needed no clipping
	LCh        LCh     // CIELAB D65
	Step       float64 // ΔE00 to the previous row; NaN for the first
	Simulated  [3]Color
	SimStep    [3]float64 // ΔE00 to the previous row under each Deficiency; NaN for the first
	Contrast   float64    // WCAG 2.1 ratio against the paper
	Noticeable bool       // step exceeds the size-aware ND on some axis (false for the first)
}

// Report is the outcome of Check.
type Report struct {
	Scale       string
	From, To    float64
	Discrete    bool // rows are eras, not samples
	Paper       Color
	Medium      Medium
	LineWidthPt float64
	AngleDeg    float64 // visual angle of the line
	ND          Lab     // noticeable difference per CIELAB axis at that angle
	// Classes is how many bands of years the span holds that readers can
	// tell apart at this line width: see Classes.
	Classes int
	// KeyEras is how many eras the key labels (Thresholds.KeyEras, or
	// its default); fewer Classes than KeyEras is a warning.
	KeyEras    int
	Thresholds Thresholds
	Rows       []Row
	Findings   []Finding
}

// Failed reports whether any finding has severity Fail.
func (r Report) Failed() bool {
	for _, f := range r.Findings {
		if f.Severity == Fail {
			return true
		}
	}
	return false
}

// Warnings counts the findings of severity Warn.
func (r Report) Warnings() int {
	n := 0
	for _, f := range r.Findings {
		if f.Severity == Warn {
			n++
		}
	}
	return n
}

// Check measures scale s drawn as lines lineWidthPt wide on paper in
// medium m: one row per era (discrete) or per sample about SampleYears
// apart (continuous, evenly spaced, ends included), and findings for
// lightness order, adjacent steps, overall span, contrast against the
// paper, sRGB gamut, colour-vision deficiencies and, as guidance, the
// size-dependent noticeable difference. It returns an error only for
// unusable input.
func Check(s Scale, paper Color, lineWidthPt float64, m Medium, th Thresholds) (Report, error) {
	if len(s.anchors) == 0 {
		return Report{}, fmt.Errorf("palette: check: scale %q has no anchors", s.name)
	}
	if !finite(lineWidthPt) || lineWidthPt <= 0 {
		return Report{}, fmt.Errorf("palette %q: check: line width %v pt: must be a positive number", s.name, lineWidthPt)
	}
	if m != Print && m != Screen {
		return Report{}, fmt.Errorf("palette %q: check: unknown medium %v", s.name, m)
	}
	if err := th.validate(); err != nil {
		return Report{}, err
	}
	if !paper.InGamut() {
		return Report{}, fmt.Errorf("palette %q: check: paper colour %s is outside sRGB", s.name, paper.Hex())
	}
	from, to := s.Span()
	if n := (to - from) / th.SampleYears; !s.Discrete() && n > maxSamples {
		return Report{}, fmt.Errorf("palette %q: check: %s–%s every %v years is %.0f samples, over %d; raise SampleYears",
			s.name, yearLabel(from), yearLabel(to), th.SampleYears, n, maxSamples)
	}
	r := Report{
		Scale: s.name, From: from, To: to, Discrete: s.Discrete(), Paper: paper, Medium: m,
		LineWidthPt: lineWidthPt, AngleDeg: VisualAngle(lineWidthPt, m), Thresholds: th,
	}
	r.ND = NoticeableDifference(th.NoticeableP, r.AngleDeg)
	r.Classes = Classes(s, r.ND)
	r.KeyEras = th.KeyEras
	if r.KeyEras == 0 {
		r.KeyEras = defaultKeyEras(s)
	}
	r.Rows = s.rows(th.SampleYears)
	for i := range r.Rows {
		row := &r.Rows[i]
		row.LCh = row.Color.LCh()
		row.Contrast = ContrastRatio(row.Color, paper)
		row.Step = math.NaN()
		for _, d := range Deficiencies() {
			row.Simulated[d] = Simulate(row.Color, d)
			row.SimStep[d] = math.NaN()
		}
		if i == 0 {
			continue
		}
		prev := r.Rows[i-1]
		row.Step = prev.Color.DeltaE00(row.Color)
		row.Noticeable = Noticeable(prev.Color.Lab(), row.Color.Lab(), r.ND)
		for _, d := range Deficiencies() {
			row.SimStep[d] = prev.Simulated[d].DeltaE00(row.Simulated[d])
		}
	}
	r.checkLightness()
	r.checkSteps()
	r.checkSpan()
	r.checkContrast()
	r.checkGamut(s)
	r.checkCVD()
	r.checkSize()
	if !r.Discrete {
		r.checkSweep(s)
	}
	return r, nil
}

// checkSweep looks between the table's samples: a continuous scale is
// drawn at every year, so a colour that fades on the paper, leaves sRGB or
// turns lightness back between two samples (say a bright anchor three
// years wide) must be found too. Every whole year of the span and every
// anchor year is checked; a run of failing years the rows did not already
// report becomes one finding at its worst year.
func (r *Report) checkSweep(s Scale) {
	from, to := s.Span()
	years := []float64{from}
	for y := math.Floor(from) + 1; y < to; y++ {
		years = append(years, y)
	}
	for _, a := range s.anchors {
		if a.Year > from && a.Year < to {
			years = append(years, a.Year)
		}
	}
	years = append(years, to)
	sort.Float64s(years)
	reported := func(check string, y0, y1 float64) bool {
		for _, f := range r.Findings {
			if f.Check == check && f.Year >= y0-r.Thresholds.SampleYears && f.Year <= y1+r.Thresholds.SampleYears {
				return true
			}
		}
		return false
	}
	// runs calls bad for each year and reports each maximal run of failing
	// years once, at the year where score is worst (lowest).
	runs := func(check string, sev Severity, bad func(y float64, c Color) (bool, float64), msg func(y0, y1, worst float64, c Color) string) {
		fail := make([]bool, len(years))
		score := make([]float64, len(years))
		for i, y := range years {
			fail[i], score[i] = bad(y, s.At(y))
		}
		for i := 0; i < len(years); {
			if !fail[i] {
				i++
				continue
			}
			j, worst := i, i
			for ; j < len(years) && fail[j]; j++ {
				if score[j] < score[worst] {
					worst = j
				}
			}
			if y0, y1 := years[i], years[j-1]; !reported(check, y0, y1) {
				row := &Row{Label: yearLabel(years[worst]), Year: years[worst]}
				r.add(check, row, sev, "%s", msg(y0, y1, score[worst], s.At(years[worst])))
			}
			i = j
		}
	}
	span := func(y0, y1 float64) string {
		if y0 == y1 {
			return yearLabel(y0)
		}
		return yearLabel(y0) + "–" + yearLabel(y1)
	}
	runs(CheckContrast, Fail, func(y float64, c Color) (bool, float64) {
		k := ContrastRatio(c.Clip(), r.Paper)
		return k < r.Thresholds.MinContrast, k
	}, func(y0, y1, worst float64, c Color) string {
		return fmt.Sprintf("between the table's samples, %s fall to contrast %.2f:1 against paper %s (%s) < %.2f:1 (WCAG 2.1 SC 1.4.11); a thin line will fade",
			span(y0, y1), worst, r.Paper.Hex(), c.Clip().Hex(), r.Thresholds.MinContrast)
	})
	runs(CheckGamut, Warn, func(y float64, c Color) (bool, float64) {
		return !c.InGamut(), -c.DeltaE00(c.Clip())
	}, func(y0, y1, worst float64, c Color) string {
		return fmt.Sprintf("between the table's samples, %s are outside sRGB; drawn clipped, up to ΔE00 %.2f away", span(y0, y1), -worst)
	})
	dir := r.direction()
	if dir == 0 {
		return
	}
	prevL := math.NaN()
	runs(CheckLightness, Fail, func(y float64, c Color) (bool, float64) {
		l := c.Clip().LCh().L
		back := !math.IsNaN(prevL) && float64(dir)*(l-prevL) < -lightnessSlack
		d := float64(dir) * (l - prevL)
		prevL = l
		return back, d
	}, func(y0, y1, worst float64, c Color) string {
		return fmt.Sprintf("between the table's samples, L* runs %s but turns back in %s (by %.1f)", dirWord(dir), span(y0, y1), -worst)
	})
}

// maxSamples bounds the rows of a continuous check.
const maxSamples = 10000

// rows samples the scale: one row per era, or evenly spaced years about
// step apart from the first year to the last.
func (s Scale) rows(step float64) []Row {
	var rows []Row
	add := func(label string, year float64, c Color) {
		rows = append(rows, Row{Label: label, Year: year, Color: c.Clip(), InGamut: c.InGamut()})
	}
	if len(s.eras) > 0 {
		for _, e := range s.eras {
			add(e.Label(), e.From, e.Color)
		}
		return rows
	}
	from, to := s.Span()
	n := max(1, int(math.Round((to-from)/step)))
	for k := 0; k <= n; k++ {
		y := from + (to-from)*float64(k)/float64(n)
		if k == n {
			y = to
		}
		add(fmt.Sprintf("%.0f", y), y, s.At(y))
	}
	return rows
}

func (r *Report) add(check string, row *Row, sev Severity, format string, args ...any) {
	f := Finding{Check: check, Year: math.NaN(), Severity: sev, Message: fmt.Sprintf(format, args...)}
	if row != nil {
		f.Label, f.Year = row.Label, row.Year
	}
	r.Findings = append(r.Findings, f)
}

// direction resolves the lightness direction: +1 increasing, -1
// decreasing, 0 for any.
func (r *Report) direction() int {
	switch r.Thresholds.Lightness {
	case LightnessIncreasing:
		return 1
	case LightnessDecreasing:
		return -1
	case LightnessAny:
		return 0
	}
	if r.Rows[len(r.Rows)-1].LCh.L < r.Rows[0].LCh.L {
		return -1
	}
	return 1
}

func dirWord(dir int) string {
	if dir < 0 {
		return "decreasing"
	}
	return "increasing"
}

// lightnessSlack is the smallest reversal of L* that counts: a twentieth
// of the about 1 ΔE a reader can just notice (common practice), far below
// anything visible, and above the ripple a press round trip leaves — a
// profile's interpolated tables turned a steadily rising palette back by
// 0.01 L* in places, which would otherwise be reported as "by 0.0".
const lightnessSlack = 0.05

func (r *Report) checkLightness() {
	dir := r.direction()
	if dir == 0 {
		return
	}
	for i := 1; i < len(r.Rows); i++ {
		p, q := r.Rows[i-1], &r.Rows[i]
		if float64(dir)*(q.LCh.L-p.LCh.L) < -lightnessSlack {
			r.add(CheckLightness, q, Fail, "L* runs %s but turns back from %s to %s: %.1f → %.1f",
				dirWord(dir), p.Label, q.Label, p.LCh.L, q.LCh.L)
		}
	}
}

func (r *Report) checkSteps() {
	what := "adjacent samples"
	if r.Discrete {
		what = "adjacent eras"
	}
	for i := 1; i < len(r.Rows); i++ {
		p, q := r.Rows[i-1], &r.Rows[i]
		if q.Step < r.Thresholds.MinStep {
			r.add(CheckStep, q, Fail, "%s %s and %s differ by ΔE00 %.2f < %.2f (heuristic threshold)",
				what, p.Label, q.Label, q.Step, r.Thresholds.MinStep)
		}
	}
}

func (r *Report) checkSpan() {
	first, last := r.Rows[0], r.Rows[len(r.Rows)-1]
	if d := first.Color.DeltaE00(last.Color); d < r.Thresholds.MinSpan {
		r.add(CheckSpan, nil, Fail, "first (%s %s) and last (%s %s) colours differ by ΔE00 %.2f < %.2f",
			first.Label, first.Color.Hex(), last.Label, last.Color.Hex(), d, r.Thresholds.MinSpan)
	}
}

func (r *Report) checkContrast() {
	for i := range r.Rows {
		q := &r.Rows[i]
		if q.Contrast < r.Thresholds.MinContrast {
			r.add(CheckContrast, q, Fail, "%s has contrast %.2f:1 against paper %s < %.2f:1 (WCAG 2.1 SC 1.4.11); a thin line will fade",
				q.Color.Hex(), q.Contrast, r.Paper.Hex(), r.Thresholds.MinContrast)
		}
	}
}

func (r *Report) checkGamut(s Scale) {
	for i, a := range s.anchors {
		if !a.Color.InGamut() {
			row := &Row{Label: yearLabel(a.Year), Year: a.Year}
			r.add(CheckGamut, row, Warn, "anchor %d is outside sRGB (%s); drawn clipped as %s, ΔE00 %.2f away",
				i+1, fmtRGB(a.Color.RGB()), a.Color.Hex(), a.Color.DeltaE00(a.Color.Clip()))
		}
	}
	for i := range r.Rows {
		if q := &r.Rows[i]; !q.InGamut {
			c := s.At(q.Year)
			r.add(CheckGamut, q, Warn, "colour is outside sRGB (%s); drawn clipped as %s, ΔE00 %.2f away",
				fmtRGB(c.RGB()), q.Color.Hex(), c.DeltaE00(q.Color))
		}
	}
}

func fmtRGB(c RGB) string { return fmt.Sprintf("rgb %.3f %.3f %.3f", c.R, c.G, c.B) }

// checkCVD passes a deficiency when every simulated adjacent step stays at
// least MinCVDStep apart, or else when simulated L* runs strictly in the
// palette's direction at every step (a reader can still rank the years by
// darkness).
func (r *Report) checkCVD() {
	dir := r.direction()
	if dir == 0 {
		dir = 1
		if r.Rows[len(r.Rows)-1].LCh.L < r.Rows[0].LCh.L {
			dir = -1
		}
	}
	for _, d := range Deficiencies() {
		worst, broken := -1, -1
		for i := 1; i < len(r.Rows); i++ {
			if r.Rows[i].SimStep[d] < r.Thresholds.MinCVDStep && (worst < 0 || r.Rows[i].SimStep[d] < r.Rows[worst].SimStep[d]) {
				worst = i
			}
			pl, ql := r.Rows[i-1].Simulated[d].Lab().L, r.Rows[i].Simulated[d].Lab().L
			if broken < 0 && float64(dir)*(ql-pl) <= lightnessSlack {
				broken = i
			}
		}
		if worst < 0 {
			continue
		}
		p, q := r.Rows[worst-1], &r.Rows[worst]
		check := CheckCVD + "/" + d.String()
		if broken < 0 {
			r.add(check, q, Info, "%s and %s look alike under simulated %s (ΔE00 %.2f < %.2f) but lightness keeps the order",
				p.Label, q.Label, d, q.SimStep[d], r.Thresholds.MinCVDStep)
			continue
		}
		bp, bq := r.Rows[broken-1], r.Rows[broken]
		r.add(check, q, Fail, "order unreadable under simulated %s: %s and %s differ by ΔE00 %.2f < %.2f, and simulated L* stops running %s from %s to %s (%.1f → %.1f)",
			d, p.Label, q.Label, q.SimStep[d], r.Thresholds.MinCVDStep, dirWord(dir),
			bp.Label, bq.Label, bp.Simulated[d].Lab().L, bq.Simulated[d].Lab().L)
	}
}

func (r *Report) checkSize() {
	n := 0
	for _, q := range r.Rows[1:] {
		if q.Noticeable {
			n++
		}
	}
	first, last := r.Rows[0], r.Rows[len(r.Rows)-1]
	whole := Noticeable(first.Color.Lab(), last.Color.Lab(), r.ND)
	note := ""
	if r.AngleDeg < StoneMinAngle || r.AngleDeg > StoneMaxAngle {
		note = fmt.Sprintf(", outside the model's fitted %.2f°–%.0f°, so extrapolated", StoneMinAngle, StoneMaxAngle)
	}
	msg := fmt.Sprintf("a %.2f pt line seen in %s at %.0f mm subtends %.4f°%s; ND(%.0f%%) = ΔL* %.1f, Δa* %.1f, Δb* %.1f; %d of %d adjacent steps exceed it; first vs last %s; the span holds %d distinguishable %s, the key labels %d eras (guidance: Stone, Szafir & Setlur 2014, numbers from secondary sources)",
		r.LineWidthPt, r.Medium, ViewingDistanceMM(r.Medium), r.AngleDeg, note, 100*r.Thresholds.NoticeableP,
		r.ND.L, r.ND.A, r.ND.B, n, len(r.Rows)-1, map[bool]string{true: "does", false: "does not"}[whole],
		r.Classes, plural(r.Classes, "class", "classes"), r.KeyEras)
	// The guidance must not be overruled by a PASS: when readers can tell
	// apart fewer bands of years than the key labels, that is a warning,
	// even where the model is extrapolated (it is the only size model we
	// have; a thin line is, if anything, harder than the model's squares).
	sev := Info
	switch {
	case r.Classes < r.KeyEras:
		sev = Warn
		msg += fmt.Sprintf("; at this width readers can tell apart only %d of the key's %d eras by colour: use thicker lines, fewer eras (a stepped palette), or a key with fewer labels", r.Classes, r.KeyEras)
	case !whole:
		msg += "; at this width readers may not see the time encoding at all: consider thicker lines or a wider palette"
		if note == "" {
			sev = Warn
		}
	}
	r.add(CheckSize, nil, sev, "%s", msg)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// Classes counts how many bands of years along scale s readers can tell
// apart when each CIELAB axis needs a difference of nd (Stone, Szafir &
// Setlur 2014, per-axis reading, see Noticeable). The count walks the
// span from its first year: a new class starts at the first year whose
// colour is noticeably different from the colour that started the
// current class; a stepped scale is walked era by era. Walking greedily
// from the start gives the longest such chain when difference grows with
// distance along the scale, so the count is what the colours could carry
// at best: a key that labels more eras than this asks readers for
// distinctions the lines cannot show. Continuous scales are walked at
// 1/1000 of the span or one year, whichever is finer.
func Classes(s Scale, nd Lab) int {
	if len(s.anchors) == 0 {
		return 0
	}
	var cols []Lab
	if len(s.eras) > 0 {
		for _, e := range s.eras {
			cols = append(cols, e.Color.Clip().Lab())
		}
	} else {
		from, to := s.Span()
		n := max(1000, int(math.Ceil(to-from)))
		if n > 100000 {
			n = 100000
		}
		for k := 0; k <= n; k++ {
			cols = append(cols, s.At(from+(to-from)*float64(k)/float64(n)).Clip().Lab())
		}
	}
	classes, start := 1, cols[0]
	for _, c := range cols[1:] {
		if Noticeable(start, c, nd) {
			classes++
			start = c
		}
	}
	return classes
}

// defaultKeyEras is Thresholds.KeyEras's default for s.
func defaultKeyEras(s Scale) int {
	if len(s.eras) > 0 {
		return len(s.eras)
	}
	from, to := s.Span()
	n := int(math.Floor(to/20) - math.Ceil(from/20) + 1)
	return max(2, n)
}

// WriteTable prints the rows as an aligned table, then the findings.
func (r Report) WriteTable(w io.Writer) error {
	var b strings.Builder
	fmt.Fprintf(&b, "palette %s, %s–%s, paper %s, %s, line %.2f pt\n",
		r.Scale, yearLabel(r.From), yearLabel(r.To), r.Paper.Hex(), r.Medium, r.LineWidthPt)
	tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "year\tcolour\tL*\tC*\th\tΔE00\tprot ΔE\tdeut ΔE\ttrit ΔE\tcontrast\tsRGB\tND\t\n")
	for _, q := range r.Rows {
		gamut := "in"
		if !q.InGamut {
			gamut = "clipped"
		}
		nd := ""
		if !math.IsNaN(q.Step) {
			nd = map[bool]string{true: "yes", false: "no"}[q.Noticeable]
		}
		fmt.Fprintf(tw, "%s\t%s\t%.1f\t%.1f\t%.0f\t%s\t%s\t%s\t%s\t%.2f:1\t%s\t%s\t\n",
			q.Label, q.Color.Hex(), q.LCh.L, q.LCh.C, q.LCh.H, fmtStep(q.Step),
			fmtStep(q.SimStep[Protanopia]), fmtStep(q.SimStep[Deuteranopia]), fmtStep(q.SimStep[Tritanopia]),
			q.Contrast, gamut, nd)
	}
	tw.Flush()
	fmt.Fprintf(&b, "\ndistinguishable classes at %.2f pt: %d (Stone, Szafir & Setlur 2014 at %.0f%% of viewers); the key labels %d eras\n",
		r.LineWidthPt, r.Classes, 100*r.Thresholds.NoticeableP, r.KeyEras)
	if len(r.Findings) == 0 {
		b.WriteString("\nno findings\n")
	} else {
		b.WriteString("\n")
		for _, f := range r.Findings {
			b.WriteString(f.String())
			b.WriteString("\n")
		}
	}
	verdict := "PASS"
	if n := r.Warnings(); n > 0 {
		verdict = fmt.Sprintf("WARN (no check fails, but %d %s: see above)", n, plural(n, "warning", "warnings"))
	}
	if r.Failed() {
		verdict = "FAIL"
	}
	fmt.Fprintf(&b, "\n%s\n", verdict)
	_, err := io.WriteString(w, b.String())
	return err
}

func fmtStep(v float64) string {
	if math.IsNaN(v) {
		return "–"
	}
	return fmt.Sprintf("%.2f", v)
}
