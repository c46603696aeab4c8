package feature

import (
	"fmt"

	"sheaf/palette"
	"sheaf/palette/press"
	"sheaf/render/page"
	"sheaf/specs"
)

// PaletteCheck is the era palette checked for one output: its line width
// and medium decide the size-aware check.
type PaletteCheck struct {
	Output string
	Scale  palette.Scale
	Report palette.Report
	// Press is the output's printing condition (nil: none) and PressRows
	// the report's rows as that press prints them.
	Press     *press.Condition
	PressRows []press.Row
	MaxShift  float64 // ΔE00 above which a press row moves visibly
}

// Thresholds turns the spec's palette checks into the palette package's.
func Thresholds(s *specs.Spec) (palette.Thresholds, error) {
	th := palette.DefaultThresholds()
	c := s.Palette.Checks
	dir := c.Lightness
	if dir == "monotone" {
		dir = "auto"
	}
	d, err := palette.ParseDirection(dir)
	if err != nil {
		return th, specs.BadInput(fmt.Errorf("%s: %v", s.Where("palette.checks.lightness"), err))
	}
	th.Lightness = d
	th.MinStep, th.MinSpan, th.MinContrast, th.MinCVDStep = c.MinStep, c.MinSpan, c.MinContrast, c.MinCVDStep
	return th, nil
}

// CheckPalette runs the palette checks for every output of the spec, in
// the spec's order. They depend on the spec and the data's years only,
// so a job runs them once (check and build ask twice: for the report
// and for preflight); callers get the same slice and must not change it.
func (j *Job) CheckPalette() ([]PaletteCheck, error) {
	j.palOnce.Do(func() { j.pal, j.palErr = j.checkPalette() })
	return j.pal, j.palErr
}

func (j *Job) checkPalette() ([]PaletteCheck, error) {
	sc, err := Scale(j.Spec, j.Data.Span)
	if err != nil {
		return nil, err
	}
	th, err := Thresholds(j.Spec)
	if err != nil {
		return nil, err
	}
	paper := page.ColorOf(j.Spec.Palette.Paper)
	var out []PaletteCheck
	for _, o := range j.Spec.Outputs {
		m := palette.Print
		if o.Kind == specs.Screen {
			m = palette.Screen
		}
		r, err := palette.Check(sc, paper, o.Line.Pt(), m, th)
		if err != nil {
			return nil, specs.BadInput(fmt.Errorf("%s: %v", j.Spec.Where("palette"), err))
		}
		pc := PaletteCheck{Output: o.Name, Scale: sc, Report: r}
		if o.Kind == specs.Print && o.Press != nil {
			cond, err := press.ForOutput(j.Spec, &o)
			if err != nil {
				return nil, specs.BadInput(err)
			}
			pc.Press, pc.MaxShift = cond, o.Press.MaxShift
			pc.PressRows = cond.Rows(r, o.Press.MaxShift)
		}
		out = append(out, pc)
	}
	return out, nil
}
