package bank

import (
	"fmt"
	"math"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/specs"
	"sheaf/specs/series"
)

// Feature banks all the panels of a feature together. Every panel of an
// output has one plot aspect, so one aspect must serve them all: the
// yearly segments of every line, each measured in its own panel's
// ranges (the span across, 0 to the panel's y-range top up), are pooled
// and banked by ArcLength, which then minimises the total length of all
// the lines at a fixed plot area. Every panel has the same number of
// years, so each weighs alike, and a panel with steep lines pulls no
// harder than its length says. (The alternative, the median of each
// panel's own banked aspect, ignores how much of each panel is steep.)
// The values are the plotted ones, so a smoothed scale banks the smooth
// lines. It fails when the lines are all flat.
func Feature(set *series.Set) (*layout.Banking, error) {
	segs := usable(Lines(values(set)))
	alpha, ok := ArcLength(segs)
	if !ok {
		return nil, fmt.Errorf("the %d panels' lines are flat (or all upright): no aspect banks them; give the panel aspect as a number", len(set.Series))
	}
	return &layout.Banking{Method: "arc-length", Aspect: 1 / alpha,
		MedianOrientation: MedianOrientation(segs, alpha), Segments: len(segs)}, nil
}

// Solve is layout.Solve for an output whose panel aspect may be banked:
// with panel: {aspect: bank} it lays the output out at Feature's aspect
// and records the banking in the plan; otherwise it is layout.Solve.
// An aspect the page cannot fit is the layout's infeasibility error,
// which says the aspect came from banking and offers its remedies. With
// slack: grow the leftover height is spread instead, with a warning:
// growing the plots would undo the banking.
func Solve(spec *specs.Spec, out *specs.Output, fs *fonts.Set, groups []layout.Group, set *series.Set) (*layout.Plan, error) {
	if !out.PanelBank || out.PanelHeight > 0 {
		return layout.Solve(spec, out, fs, groups)
	}
	b, err := Feature(set)
	if err != nil {
		return nil, fmt.Errorf("%s: outputs.%s.panel.aspect: bank: %v", spec.Where("outputs."+out.Name+".panel.aspect"), out.Name, err)
	}
	// The aspect is laid out and reported to two decimals, as a spec
	// would give it; the orientation is the one drawn at that aspect.
	b.Aspect = math.Round(b.Aspect*100) / 100
	segs := usable(Lines(values(set)))
	b.MedianOrientation = MedianOrientation(segs, 1/b.Aspect)
	o := *out
	o.PanelAspect = b.Aspect
	// slack: grow would make the plots taller than the banked aspect:
	// the leftover height is spread between the rows instead.
	grow := o.Slack == specs.SlackGrow
	if grow {
		o.Slack = specs.SlackSpread
	}
	plan, err := layout.Solve(spec, &o, fs, groups)
	if err != nil {
		return nil, fmt.Errorf("%w (the banked aspect is %s: the lines' slopes read best there)", err, trim2(b.Aspect))
	}
	plan.Banking = b
	if grow {
		pos := spec.Where("outputs." + out.Name + ".slack")
		plan.Warnings = append(plan.Warnings, layout.Warning{Pos: pos, Key: "slack", Where: pos.String(), Output: out.Name,
			Message: "slack: grow would make the panels taller than the banked aspect; the leftover height is spread between the rows instead"})
	}
	return plan, nil
}

// values are the plotted values of each panel and its y-range's top.
func values(set *series.Set) ([][]float64, []float64) {
	ys := make([][]float64, len(set.Series))
	tops := make([]float64, len(set.Series))
	for i := range set.Series {
		ys[i], tops[i] = set.Series[i].Values, set.Series[i].YMax
	}
	return ys, tops
}

func trim2(v float64) string {
	return fmt.Sprint(math.Round(v*100) / 100)
}
