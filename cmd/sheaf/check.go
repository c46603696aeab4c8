package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"sheaf/layout"
	"sheaf/render/page"
	"sheaf/render/preflight"
	"sheaf/specs"
	"sheaf/specs/series"
)

// checkReport is what `sheaf check --json` prints. README documents it.
type checkReport struct {
	Spec    string         `json:"spec"`
	Title   string         `json:"title"`
	Terms   termsReport    `json:"terms"`
	Years   yearsReport    `json:"years"`
	Scale   scaleReport    `json:"scale"`
	Outputs []outputReport `json:"outputs"`
	// Preflight lists what the preflight checks found, worst first
	// (see package preflight).
	Preflight []preflight.Finding `json:"preflight"`
}

type termsReport struct {
	InData   int      `json:"in_data"`
	Rows     int      `json:"rows"`
	Selected int      `json:"selected"`
	Order    string   `json:"order"`
	Groups   []string `json:"groups,omitempty"`
	List     []string `json:"list"`
}

type yearsReport struct {
	From int   `json:"from"`
	To   int   `json:"to"`
	Gaps []int `json:"gaps"`
}

type scaleReport struct {
	Values string  `json:"values"`
	Unit   string  `json:"unit"`
	YRange string  `json:"y_range"`
	YMax   float64 `json:"y_max"`
}

type outputReport struct {
	Name     string       `json:"name"`
	Kind     string       `json:"kind"`
	TrimPt   [2]float64   `json:"trim_pt"`
	Bleed    float64      `json:"bleed_pt"`
	Summary  string       `json:"summary"`
	Pages    int          `json:"pages"`
	Labels   []page.Label `json:"labels_shortened,omitempty"`
	Warnings []string     `json:"warnings,omitempty"`
	Palette  paletteSum   `json:"palette"`
	Layout   *layout.Plan `json:"layout"`
}

type paletteSum struct {
	Name     string   `json:"name"`
	Failed   bool     `json:"failed"`
	Findings []string `json:"findings"`
}

func runCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "SPEC [--json] [--strict]", "Validate the spec and its data, print a summary, and run the preflight checks\n(the findings table goes to stderr). Exit status 1 when preflight finds errors, and with\n--strict when it finds warnings.", stderr)
	asJSON := fs.Bool("json", false, "print the summary and the findings as a JSON object on stdout")
	strict := fs.Bool("strict", false, "exit with status 1 when preflight finds warnings too")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	job, err := loadJob(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	rep, err := summarize(job)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	// The date build will write: a bad SOURCE_DATE_EPOCH is bad input here too.
	if _, err := documentDate(job.spec); err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	code = exitOK
	if preflight.Errs(rep.Preflight) || (*strict || job.spec.Preflight.Strict) && preflight.Stops(rep.Preflight) {
		code = exitFindings
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(rep); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		return code
	}
	writeSummary(stdout, rep)
	writeFindings(stderr, rep.Preflight, 0)
	return code
}

// job is a loaded spec with its data.
type job struct {
	spec *specs.Spec
	data *series.Set
}

func loadJob(path string) (*job, error) {
	s, err := specs.Load(path)
	if err != nil {
		return nil, err
	}
	d, err := series.Load(s)
	if err != nil {
		return nil, err
	}
	return &job{spec: s, data: d}, nil
}

func summarize(j *job) (checkReport, error) {
	s, d := j.spec, j.data
	r := checkReport{Spec: s.File, Title: s.Title}
	r.Terms = termsReport{InData: d.Terms, Rows: d.Rows, Selected: len(d.Series), Order: string(s.Order)}
	for _, g := range d.Groups {
		if g.Heading != "" {
			r.Terms.Groups = append(r.Terms.Groups, fmt.Sprintf("%s (%d)", g.Heading, g.Count))
		}
	}
	for _, sr := range d.Series {
		r.Terms.List = append(r.Terms.List, sr.Term)
	}
	r.Years = yearsReport{From: d.Span.From, To: d.Span.To, Gaps: append([]int{}, d.Gaps...)}
	r.Scale = scaleReport{Values: string(s.Scale.Mode), Unit: d.Unit, YRange: string(s.Scale.YRange), YMax: d.YMax}
	pal, err := checkPalette(j)
	if err != nil {
		return r, err
	}
	var preps []*prepared
	for i := range s.Outputs {
		o := &s.Outputs[i]
		p, err := prepare(j, o)
		if err != nil {
			return r, err
		}
		preps = append(preps, p)
		or := outputReport{Name: o.Name, Kind: string(o.Kind),
			TrimPt: [2]float64{o.Trim.W.Pt(), o.Trim.H.Pt()}, Bleed: o.Bleed.Pt(),
			Summary: p.plan.Summary(), Pages: len(p.plan.Pages), Layout: p.plan}
		for _, l := range p.feat.Labels() {
			if l.Shrunk || l.Truncated || l.NoPeak {
				or.Labels = append(or.Labels, l)
			}
		}
		for _, w := range p.plan.Warnings {
			or.Warnings = append(or.Warnings, w.String())
		}
		pc := pal[i].report
		or.Palette = paletteSum{Name: pal[i].scale.Name(), Failed: pc.Failed(), Findings: []string{}}
		for _, f := range pc.Findings {
			or.Palette.Findings = append(or.Palette.Findings, f.String())
		}
		r.Outputs = append(r.Outputs, or)
	}
	// Inserts are laid out too: a missing term or a graphic too small for
	// its plot is bad input here, as it is for build.
	if _, err := prepareInserts(j); err != nil {
		return r, err
	}
	r.Preflight, err = runPreflight(j, preps)
	if r.Preflight == nil {
		r.Preflight = []preflight.Finding{}
	}
	return r, err
}

func writeSummary(w io.Writer, r checkReport) {
	fmt.Fprintf(w, "%s: %q\n", r.Spec, r.Title)
	fmt.Fprintf(w, "  terms:   %d selected of %d in the data (%s), order %s\n", r.Terms.Selected, r.Terms.InData, plural(r.Terms.Rows, "row"), r.Terms.Order)
	if len(r.Terms.Groups) > 0 {
		fmt.Fprintf(w, "  groups:  %s\n", strings.Join(r.Terms.Groups, ", "))
	}
	gaps := "none"
	if len(r.Years.Gaps) > 0 {
		gaps = strings.Trim(fmt.Sprint(r.Years.Gaps), "[]")
	}
	fmt.Fprintf(w, "  years:   %d–%d (%d years; gaps: %s)\n", r.Years.From, r.Years.To, r.Years.To-r.Years.From+1, gaps)
	fmt.Fprintf(w, "  values:  %s (%s), %s y-range\n", r.Scale.Values, r.Scale.Unit, r.Scale.YRange)
	for _, o := range r.Outputs {
		switch {
		case o.Kind == string(specs.Screen) && o.Layout != nil && o.Layout.Flow == specs.FlowScrollGroups:
			fmt.Fprintf(w, "  output %s (%s): %.0f px wide, scrolling, a page per group", o.Name, o.Kind, o.TrimPt[0]*96/72)
		case o.Kind == string(specs.Screen) && (o.TrimPt[1] == 0 || o.Layout != nil && o.Layout.Flow.Scrolls()):
			fmt.Fprintf(w, "  output %s (%s): %.0f px wide, scrolling", o.Name, o.Kind, o.TrimPt[0]*96/72)
		case o.Kind == string(specs.Screen):
			fmt.Fprintf(w, "  output %s (%s): %.0f × %.0f px pages", o.Name, o.Kind, o.TrimPt[0]*96/72, o.TrimPt[1]*96/72)
		default:
			fmt.Fprintf(w, "  output %s (%s): %.1f × %.1f mm", o.Name, o.Kind, o.TrimPt[0]*25.4/72, o.TrimPt[1]*25.4/72)
		}
		if o.Bleed > 0 {
			fmt.Fprintf(w, " + %.1f mm bleed", o.Bleed*25.4/72)
		}
		fmt.Fprintln(w)
		// Labels, layout warnings and the palette's findings come in the
		// preflight table below.
		fmt.Fprintf(w, "    %s\n", o.Summary)
	}
}

// plural writes a count with its noun, "1 row", "2 rows".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
