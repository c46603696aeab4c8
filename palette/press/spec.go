package press

import (
	"os"

	"sheaf/palette/icc"
	"sheaf/specs"
)

// ForOutput loads the printing condition of a print output: nil, nil when
// it has none. A profile that cannot be read or used is a specs.Errors at
// the spec line that names it (file:line:col).
func ForOutput(s *specs.Spec, out *specs.Output) (*Condition, error) {
	p := out.Press
	if p == nil {
		return nil, nil
	}
	key := "outputs." + out.Name + ".press.profile"
	fail := func(format string, args ...any) error {
		var es specs.Errors
		es.Add(s.Where(key), key+": "+format, args...)
		return es
	}
	b, err := os.ReadFile(s.Resolve(p.Profile))
	if err != nil {
		return nil, fail("cannot read %s: %v", p.Profile, err)
	}
	intent := icc.RelativeColorimetric
	if p.Intent == specs.IntentPerceptual {
		intent = icc.Perceptual
	}
	c, err := New(b, Settings{Condition: p.Condition, Registry: p.Registry, InkLimit: p.InkLimit, Intent: intent})
	if err != nil {
		return nil, fail("%s: %v", p.Profile, err)
	}
	return c, nil
}
