package feature

import (
	"sheaf/palette/press"

	"errors"
	"fmt"

	"sheaf/layout/fonts"
	"sheaf/render/insert"
	"sheaf/specs"
	"sheaf/specs/series"
)

// Insert is an insert of the spec laid out and ready to draw.
type Insert struct {
	Spec    *specs.Insert
	Output  *specs.Output // the output whose kind, fonts and type it borrows
	Graphic *insert.Graphic
	// Press is the borrowed print output's printing condition (nil: RGB):
	// a print insert is converted as the feature's pages are.
	Press *press.Condition
}

// Name is the insert's name.
func (in *Insert) Name() string { return in.Spec.Name }

// PrepareInsert loads an insert's terms (whether or not the feature
// selects them), its output's fonts and the palette, and lays it out.
func (j *Job) PrepareInsert(in *specs.Insert) (*Insert, error) {
	out := j.Spec.Output(in.Output)
	if out == nil {
		return nil, specs.BadInput(fmt.Errorf("%s: inserts.%s.output: no output named %q", j.Spec.Where("inserts."+in.Name+".output"), in.Name, in.Output))
	}
	// The insert's own terms, in its order, scaled as the feature is.
	data, err := series.Load(j.Spec.ForInsert(in))
	if err != nil {
		return nil, specs.BadInput(err)
	}
	fs, err := fonts.Load(j.Spec, out)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	sc, err := Scale(j.Spec, data.Span)
	if err != nil {
		return nil, err
	}
	g, err := insert.New(j.Spec, in, out, data, sc, fs)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	cond, err := press.ForOutput(j.Spec, out)
	if err != nil {
		return nil, specs.BadInput(err)
	}
	return &Insert{Spec: in, Output: out, Graphic: g, Press: cond}, nil
}

// PrepareInserts lays out every insert of the spec, in the spec's order.
// It reports every insert's problems at once (a term missing from the
// data, a graphic too small), joined.
func (j *Job) PrepareInserts() ([]*Insert, error) {
	var ins []*Insert
	var errs []error
	for i := range j.Spec.Inserts {
		in, err := j.PrepareInsert(&j.Spec.Inserts[i])
		if err != nil {
			errs = append(errs, err)
			continue
		}
		ins = append(ins, in)
	}
	if err := errors.Join(errs...); err != nil {
		return nil, specs.BadInput(err)
	}
	return ins, nil
}

// BorrowsOutput reports whether an insert of the spec borrows the output
// named name.
func BorrowsOutput(s *specs.Spec, name string) bool {
	for _, in := range s.Inserts {
		if in.Output == name {
			return true
		}
	}
	return false
}
