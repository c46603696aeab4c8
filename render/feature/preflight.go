package feature

import (
	"fmt"
	"sort"

	"sheaf/render/preflight"
	"sheaf/specs"
)

// Preflight checks every prepared output (see package preflight), each
// with its palette report, and the inserts given (their annotations). A
// finding about the data itself (a spike, an empty panel) is listed once
// however many outputs show the term.
func (j *Job) Preflight(outs []*Output, inserts ...*Insert) ([]preflight.Finding, error) {
	pal, err := j.CheckPalette()
	if err != nil {
		return nil, err
	}
	// Each output is checked on a goroutine of its own (the checks only
	// read), and the findings are joined in the outputs' order.
	found := make([][]preflight.Finding, len(outs))
	errs := make([]error, len(outs))
	each(len(outs), func(i int) {
		found[i], errs[i] = preflight.Check(j.PreflightInput(outs[i], pal))
		found[i] = append(found[i], noteFindings(j.Spec, outs[i])...)
	})
	var all []preflight.Finding
	for i := range outs {
		if errs[i] != nil {
			return nil, specs.BadInput(errs[i])
		}
		all = append(all, found[i]...)
	}
	for _, in := range inserts {
		all = append(all, insertNoteFindings(j.Spec, in)...)
	}
	// Worst first, as preflight.Check orders its own.
	sort.SliceStable(all, func(a, b int) bool { return all[a].Severity > all[b].Severity })
	return dedupeData(all), nil
}

// PreflightInput is what preflight checks for one prepared output, with
// its palette report from pal (CheckPalette).
func (j *Job) PreflightInput(o *Output, pal []PaletteCheck) preflight.Input {
	j.factsOnce.Do(func() { j.facts = preflight.DataFacts(j.Spec, j.Data) }) // the same for every output
	in := preflight.Input{Spec: j.Spec, Output: o.Spec, Plan: o.Plan, Data: j.Data, Fonts: o.Fonts, Labels: o.Feature.Labels(),
		Scale: &o.Feature.Palette, Press: o.Press, Facts: j.facts}
	for i := range pal {
		if pal[i].Output == o.Spec.Name {
			in.Palette = &pal[i].Report
		}
	}
	return in
}

// dedupeData keeps one finding about the data itself (a spike, an empty
// panel, a sparse term) however many outputs show the term, and says
// where else it sits.
func dedupeData(fs []preflight.Finding) []preflight.Finding {
	type key struct {
		id, term string
		year     int
	}
	first := map[key]int{}
	var out []preflight.Finding
	for _, f := range fs {
		if f.ID != preflight.IDSpike && f.ID != preflight.IDNoData && f.ID != preflight.IDSparse {
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
