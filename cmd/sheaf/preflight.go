package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"sheaf/render/preflight"
)

// maxFindingsShown bounds the preflight table on stderr; `sheaf check
// --json` lists every finding.
const maxFindingsShown = 40

// runPreflight checks every prepared output (see package preflight),
// with its palette report.
func runPreflight(j *job, preps []*prepared) ([]preflight.Finding, error) {
	pal, err := checkPalette(j)
	if err != nil {
		return nil, err
	}
	var all []preflight.Finding
	for _, p := range preps {
		in := preflight.Input{Spec: j.spec, Output: p.out, Plan: p.plan, Data: j.data, Fonts: p.fonts, Labels: p.feat.Labels()}
		for i := range pal {
			if pal[i].output == p.out.Name {
				in.Palette = &pal[i].report
			}
		}
		fs, err := preflight.Check(in)
		if err != nil {
			return nil, err
		}
		all = append(all, fs...)
	}
	return dedupeData(all), nil
}

// dedupeData keeps one finding about the data itself (a spike, an empty
// panel) however many outputs show the term, and says where else it sits.
func dedupeData(fs []preflight.Finding) []preflight.Finding {
	type key struct {
		id, term string
		year     int
	}
	first := map[key]int{}
	var out []preflight.Finding
	for _, f := range fs {
		if f.ID != preflight.IDSpike && f.ID != preflight.IDNoData {
			out = append(out, f)
			continue
		}
		k := key{f.ID, f.Term, f.Year}
		if i, ok := first[k]; ok {
			out[i].Message += fmt.Sprintf("; also %s p. %d", f.Output, f.Page)
			continue
		}
		first[k] = len(out)
		out = append(out, f)
	}
	return out
}

// writeFindings prints findings as a table, worst first, at most limit
// rows (0: all).
func writeFindings(w io.Writer, fs []preflight.Finding, limit int) {
	if len(fs) == 0 {
		return
	}
	counts := map[preflight.Severity]int{}
	for _, f := range fs {
		counts[f.Severity]++
	}
	fmt.Fprintf(w, "preflight: %d errors, %d warnings, %d for review, %d notes\n",
		counts[preflight.Error], counts[preflight.Warning], counts[preflight.Review], counts[preflight.Info])
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for k, f := range fs {
		if limit > 0 && k == limit {
			fmt.Fprintf(tw, "  …\t%d more: sheaf check --json lists them all\t\t\n", len(fs)-k)
			break
		}
		msg := f.Message
		if f.At != "" {
			msg += " (" + f.At + ")"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", f.Severity, f.ID, f.Where(), msg)
	}
	tw.Flush()
}
