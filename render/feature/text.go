package feature

import (
	"fmt"
	"io"
	"strings"

	"sheaf/specs"
)

// WriteText prints the report for a person, as `sheaf check` does: the
// spec, its terms, years and values, and each output's size, plan and
// colour; the preflight findings are not in it (preflight.WriteTable).
func (r Report) WriteText(w io.Writer) {
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
