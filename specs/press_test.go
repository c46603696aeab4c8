package specs

import (
	"encoding/binary"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// iccHeader is a 132-byte profile header and empty tag table with the
// given class and colour space (ICC.1:2010 §7.2: size at 0, class at 12,
// colour space at 16, PCS at 20, 'acsp' at 36).
func iccHeader(class, space string) []byte {
	b := make([]byte, 132)
	binary.BigEndian.PutUint32(b, 132)
	binary.BigEndian.PutUint32(b[8:], 0x02100000)
	copy(b[12:], class+space+"Lab ")
	copy(b[36:], "acsp")
	return b
}

func TestPress(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, b []byte) {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	write("press.icc", iccHeader("prtr", "CMYK"))
	write("gray.icc", iccHeader("prtr", "GRAY"))
	write("screen.icc", iccHeader("mntr", "RGB "))
	write("hexachrome.icc", iccHeader("prtr", "6CLR"))
	write("notes.txt", []byte("not a profile at all, just some words that run past 128 bytes......................................................................."))
	require.NoError(t, os.Mkdir(filepath.Join(dir, "folder.icc"), 0o755))
	spec := filepath.Join(dir, "feature.yaml")

	t.Run("defaults", func(t *testing.T) {
		s, err := Parse(spec, []byte(printOut+"    press: {profile: press.icc}\n"))
		require.NoError(t, err)
		p := s.Outputs[0].Press
		require.NotNil(t, p)
		assert.Equal(t, "press.icc", p.Profile)
		assert.Equal(t, "", p.Condition, "empty: taken from the profile's description")
		assert.Equal(t, "http://www.color.org", p.Registry)
		assert.Equal(t, 300.0, p.InkLimit)
		assert.Equal(t, IntentRelative, p.Intent)
		assert.Equal(t, 3.0, p.MaxShift)
	})
	t.Run("all keys", func(t *testing.T) {
		s, err := Parse(spec, []byte(printOut+"    press:\n      profile: gray.icc\n      condition: Our newsprint\n      registry: ''\n      ink-limit: 240%\n      intent: perceptual\n      max-shift: 4\n"))
		require.NoError(t, err)
		p := s.Outputs[0].Press
		assert.Equal(t, Press{Profile: "gray.icc", Condition: "Our newsprint", Registry: "", InkLimit: 240, Intent: IntentPerceptual, MaxShift: 4}, *p)
	})
	t.Run("no press: RGB", func(t *testing.T) {
		s, err := Parse(spec, []byte(printOut))
		require.NoError(t, err)
		assert.Nil(t, s.Outputs[0].Press)
	})

	// Positions counted by hand: printOut ends at line 6; "    press:" is
	// line 7, its keys from line 8, values at column 16 for "profile: ".
	errs := []struct {
		name, text, at, want string
	}{
		{"missing file", "    press:\n      profile: nowhere.icc\n", "8:7", "nowhere.icc does not exist"},
		{"folder", "    press:\n      profile: folder.icc\n", "8:7", "is a folder"},
		{"not ICC", "    press:\n      profile: notes.txt\n", "8:7", "is not an ICC profile"},
		{"display profile", "    press:\n      profile: screen.icc\n", "8:7", "is a display profile ('mntr'); press needs the printer's output profile (class 'prtr')"},
		{"six inks", "    press:\n      profile: hexachrome.icc\n", "8:7", `output profile for "6CLR"`},
		{"no profile", "    press: {intent: perceptual}\n", "7:12", "outputs.print.press.profile is missing"},
		{"ink limit bare", "    press: {profile: press.icc, ink-limit: 300}\n", "7:44", "like 300%"},
		{"ink limit high", "    press: {profile: press.icc, ink-limit: 420%}\n", "7:44", "outside 100%–400%"},
		{"intent", "    press: {profile: press.icc, intent: saturation}\n", "7:41", "must be one of relative-colorimetric, perceptual"},
		{"unknown key", "    press: {profile: press.icc, inklimit: 3}\n", "7:33", `did you mean "ink-limit"?`},
	}
	for _, c := range errs {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse(spec, []byte(printOut+c.text))
			var es Errors
			require.True(t, errors.As(err, &es), "want Errors, got %v", err)
			require.NotEmpty(t, es)
			assert.Equal(t, spec+":"+c.at, es[0].Pos.String())
			assert.Contains(t, es[0].Msg, c.want)
		})
	}
	t.Run("screen", func(t *testing.T) {
		_, err := Parse(spec, []byte(head+"outputs:\n  web:\n    kind: screen\n    press: {profile: press.icc}\n"))
		require.Error(t, err)
		assert.Contains(t, err.Error(), "a printing condition is for print outputs")
	})
}
