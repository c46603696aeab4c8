package preflight_test

import (
	"sheaf/render/feature"
	"sheaf/render/preflight"
)

// The preflight tests prepare their input as a build does; package
// feature imports package preflight, so the bridge is set from this
// external test package.
func init() {
	preflight.PrepareForTest = func(path string) (preflight.Input, error) {
		j, err := feature.Load(path)
		if err != nil {
			return preflight.Input{}, err
		}
		out := &j.Spec.Outputs[0]
		o, err := j.Prepare(out)
		if err != nil {
			return preflight.Input{}, err
		}
		pal, err := j.CheckPalette()
		if err != nil {
			return preflight.Input{}, err
		}
		return j.PreflightInput(o, pal), nil
	}
}
