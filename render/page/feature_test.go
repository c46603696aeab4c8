package page_test

import (
	"sheaf/render/feature"
	"sheaf/render/page"
	"sheaf/specs"
	"sheaf/specs/series"
)

// The page tests prepare their feature as a build does; package feature
// imports package page, so the bridge is set from this external test
// package.
func init() {
	page.PrepareForTest = func(s *specs.Spec, d *series.Set, out *specs.Output) (*page.Feature, error) {
		o, err := (&feature.Job{Spec: s, Data: d}).Prepare(out)
		if err != nil {
			return nil, err
		}
		return o.Feature, nil
	}
}
