package feature

import (
	"fmt"

	"sheaf/layout"
	"sheaf/render/draw"
	"sheaf/render/page"
	"sheaf/render/preflight"
)

// Report is what `sheaf check --json` prints: the job summarized, every
// output's layout, and preflight's findings. README documents it.
type Report struct {
	Spec    string         `json:"spec"`
	Title   string         `json:"title"`
	Terms   TermsReport    `json:"terms"`
	Years   YearsReport    `json:"years"`
	Scale   ScaleReport    `json:"scale"`
	Outputs []OutputReport `json:"outputs"`
	// Inserts are the spec's inserts as laid out, in the spec's order.
	Inserts []InsertReport `json:"inserts,omitempty"`
	// Preflight lists what the preflight checks found, worst first
	// (see package preflight).
	Preflight []preflight.Finding `json:"preflight"`
}

// InsertReport is one insert: its name, the output it borrows, its size
// and where its annotations landed.
type InsertReport struct {
	Name    string     `json:"name"`
	Output  string     `json:"output"`
	SizePt  [2]float64 `json:"size_pt"`
	Terms   []string   `json:"terms"`
	Compare string     `json:"compare,omitempty"` // rows or overlay, for two terms or more
	// Notes is where every annotation of the insert's terms landed
	// (placed or not, with why); item is the term's place in terms.
	Notes []draw.Note `json:"annotations,omitempty"`
}

// TermsReport is the terms the data has and the spec selects.
type TermsReport struct {
	InData   int      `json:"in_data"`
	Rows     int      `json:"rows"`
	Selected int      `json:"selected"`
	Order    string   `json:"order"`
	Groups   []string `json:"groups,omitempty"`
	List     []string `json:"list"`
}

// YearsReport is the span of the data and the years it lacks.
type YearsReport struct {
	From int   `json:"from"`
	To   int   `json:"to"`
	Gaps []int `json:"gaps"`
}

// ScaleReport is how values are scaled.
type ScaleReport struct {
	Values string  `json:"values"`
	Unit   string  `json:"unit"`
	YRange string  `json:"y_range"`
	YMax   float64 `json:"y_max"`
	// RollingYears is the centred window the counts are pooled over
	// (scale.rolling), and Smoothing says it as the key does ("5-year
	// rolling share"); both absent without smoothing.
	RollingYears int    `json:"rolling_years,omitempty"`
	Smoothing    string `json:"smoothing,omitempty"`
}

// OutputReport is one output: its size, its plan, the labels that had to
// be shortened or wrapped and the palette's verdict.
type OutputReport struct {
	Name    string       `json:"name"`
	Kind    string       `json:"kind"`
	TrimPt  [2]float64   `json:"trim_pt"`
	Bleed   float64      `json:"bleed_pt"`
	Summary string       `json:"summary"`
	Pages   int          `json:"pages"`
	Band    float64      `json:"band,omitempty"` // the uncertainty band's level (0.95); absent: none
	Labels  []page.Label `json:"labels_shortened,omitempty"`
	// Wrapped are the labels set on more than one line (with their lines).
	Wrapped []page.Label `json:"labels_wrapped,omitempty"`
	// Notes is where every annotation landed on every panel showing its
	// term (placed or not, with why).
	Notes    []page.Note    `json:"annotations,omitempty"`
	Warnings []string       `json:"warnings,omitempty"`
	Palette  PaletteSummary `json:"palette"`
	// Press is the printing condition of a print output (the PDF is a
	// CMYK PDF/X-4 for it); absent: the PDF is RGB.
	Press  *PressReport `json:"press,omitempty"`
	Layout *layout.Plan `json:"layout"`
}

// PressReport is an output's printing condition in brief.
type PressReport struct {
	Condition string  `json:"condition"` // OutputConditionIdentifier
	Registry  string  `json:"registry"`
	Profile   string  `json:"profile"`     // the path as the spec gives it
	Describes string  `json:"description"` // the profile's own description
	Space     string  `json:"space"`       // CMYK, GRAY or RGB
	Intent    string  `json:"intent"`
	InkLimit  float64 `json:"ink_limit"` // percent
}

// PaletteSummary is the palette check of one output in brief.
type PaletteSummary struct {
	Name     string   `json:"name"`
	Failed   bool     `json:"failed"`
	Findings []string `json:"findings"`
}

// Summarize prepares every output and insert of the job (bad input in
// any of them is an error, as it is for a build) and runs preflight.
func (j *Job) Summarize() (Report, error) {
	s, d := j.Spec, j.Data
	r := Report{Spec: s.File, Title: s.Title}
	r.Terms = TermsReport{InData: d.Terms, Rows: d.Rows, Selected: len(d.Series), Order: string(s.Order)}
	for _, g := range d.Groups {
		if g.Heading != "" {
			r.Terms.Groups = append(r.Terms.Groups, fmt.Sprintf("%s (%d)", g.Heading, g.Count))
		}
	}
	for _, sr := range d.Series {
		r.Terms.List = append(r.Terms.List, sr.Term)
	}
	r.Years = YearsReport{From: d.Span.From, To: d.Span.To, Gaps: append([]int{}, d.Gaps...)}
	r.Scale = ScaleReport{Values: string(s.Scale.Mode), Unit: d.Unit, YRange: string(s.Scale.YRange), YMax: d.YMax,
		RollingYears: d.Rolling, Smoothing: d.Note()}
	// The palette checks, the outputs and the inserts are prepared
	// side by side; errors are reported in the order doing them one
	// after another would meet them.
	var (
		pal             []PaletteCheck
		outs            []*Output
		ins             []*Insert
		palErr, prepErr error
		insErr          error
	)
	each(3, func(step int) {
		switch step {
		case 0:
			pal, palErr = j.CheckPalette()
		case 1:
			outs, prepErr = j.PrepareAll()
		case 2:
			ins, insErr = j.PrepareInserts()
		}
	})
	for _, err := range []error{palErr, prepErr, insErr} {
		if err != nil {
			return r, err
		}
	}
	for i := range s.Outputs {
		o := &s.Outputs[i]
		p := outs[i]
		or := OutputReport{Name: o.Name, Kind: string(o.Kind),
			TrimPt: [2]float64{o.Trim.W.Pt(), o.Trim.H.Pt()}, Bleed: o.Bleed.Pt(),
			Summary: p.Plan.Summary(), Pages: len(p.Plan.Pages), Layout: p.Plan, Band: o.Band}
		for _, l := range p.Feature.Labels() {
			if l.Shrunk || l.Truncated || l.NoPeak {
				or.Labels = append(or.Labels, l)
			}
			if l.Wrapped() {
				or.Wrapped = append(or.Wrapped, l)
			}
		}
		or.Notes = p.Feature.Notes()
		for _, w := range p.Plan.Warnings {
			or.Warnings = append(or.Warnings, w.String())
		}
		pc := pal[i].Report
		or.Palette = PaletteSummary{Name: pal[i].Scale.Name(), Failed: pc.Failed(), Findings: []string{}}
		for _, f := range pc.Findings {
			or.Palette.Findings = append(or.Palette.Findings, f.String())
		}
		if c := p.Press; c != nil {
			or.Press = &PressReport{Condition: c.Identifier, Registry: c.Registry, Profile: o.Press.Profile,
				Describes: c.Profile.Description, Space: c.Profile.Space.String(), Intent: string(o.Press.Intent), InkLimit: c.InkLimit}
		}
		r.Outputs = append(r.Outputs, or)
	}
	// Inserts are laid out too (above): a missing term or a graphic too
	// small for its plot is bad input here, as it is for build.
	for _, in := range ins {
		g := in.Graphic
		w, h := g.Size()
		ir := InsertReport{Name: in.Name(), Output: in.Output.Name, SizePt: [2]float64{w, h}, Notes: g.Notes()}
		for _, sr := range g.Data.Series {
			ir.Terms = append(ir.Terms, sr.Term)
		}
		if len(ir.Terms) > 1 {
			ir.Compare = "overlay"
			if g.Rowed() {
				ir.Compare = "rows"
			}
		}
		r.Inserts = append(r.Inserts, ir)
	}
	var err error
	r.Preflight, err = j.Preflight(outs, ins...)
	if r.Preflight == nil {
		r.Preflight = []preflight.Finding{}
	}
	return r, err
}
