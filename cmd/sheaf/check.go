package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strings"

	"sheaf/render/feature"
	"sheaf/render/preflight"
	"sheaf/specs"
)

func runCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "SPEC [--json] [--strict]", "Validate the spec and its data, print a summary, and run the preflight checks\n(the findings table goes to stderr). Exit status 1 when preflight finds errors, and with\n--strict when it finds warnings.", stderr)
	asJSON := fs.Bool("json", false, "print the summary and the findings as a JSON object on stdout")
	strict := fs.Bool("strict", false, "exit with status 1 when preflight finds warnings too")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	job, err := feature.Load(path)
	if err != nil {
		return report(stderr, err)
	}
	rep, err := job.Summarize()
	if err != nil {
		return report(stderr, err)
	}
	// The date build will write: a bad SOURCE_DATE_EPOCH is bad input here too.
	if _, err := feature.DocumentDate(job.Spec, os.Getenv("SOURCE_DATE_EPOCH")); err != nil {
		return report(stderr, err)
	}
	code = exitOK
	if preflight.Errs(rep.Preflight) || (*strict || job.Spec.Preflight.Strict) && preflight.Stops(rep.Preflight) {
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

func writeSummary(w io.Writer, r feature.Report) {
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
	smoothing := ""
	if r.Scale.Smoothing != "" {
		smoothing = ", " + r.Scale.Smoothing
	}
	fmt.Fprintf(w, "  values:  %s (%s)%s, %s y-range\n", r.Scale.Values, r.Scale.Unit, smoothing, r.Scale.YRange)
	for _, o := range r.Outputs {
		switch {
		case o.Kind == string(specs.Screen) && o.Layout != nil && o.Layout.Flow == specs.FlowScrollGroups:
			fmt.Fprintf(w, "  output %s (%s): %.0f px wide, scrolling, a page per group", o.Name, o.Kind, o.TrimPt[0]*specs.PxPerPt)
		case o.Kind == string(specs.Screen) && (o.TrimPt[1] == 0 || o.Layout != nil && o.Layout.Flow.Scrolls()):
			fmt.Fprintf(w, "  output %s (%s): %.0f px wide, scrolling", o.Name, o.Kind, o.TrimPt[0]*specs.PxPerPt)
		case o.Kind == string(specs.Screen):
			fmt.Fprintf(w, "  output %s (%s): %.0f × %.0f px pages", o.Name, o.Kind, o.TrimPt[0]*specs.PxPerPt, o.TrimPt[1]*specs.PxPerPt)
		default:
			fmt.Fprintf(w, "  output %s (%s): %.1f × %.1f mm", o.Name, o.Kind, o.TrimPt[0]*specs.MmPerPt, o.TrimPt[1]*specs.MmPerPt)
		}
		if o.Bleed > 0 {
			fmt.Fprintf(w, " + %.1f mm bleed", o.Bleed*specs.MmPerPt)
		}
		fmt.Fprintln(w)
		// Labels, layout warnings and the palette's findings come in the
		// preflight table below.
		fmt.Fprintf(w, "    %s\n", o.Summary)
		switch {
		case o.Press != nil:
			fmt.Fprintf(w, "    %s PDF/X-4 for %q (%s, ink limit %.0f%%)\n", o.Press.Space, o.Press.Condition, o.Press.Intent, o.Press.InkLimit)
		case o.Kind == string(specs.Print):
			fmt.Fprintln(w, "    RGB PDF (no printing condition)")
		}
	}
}

// plural writes a count with its noun, "1 row", "2 rows".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
