package preflight

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/tooltest"
)

// TestPressFindings: the press checks through Ghostscript's coated CMYK
// profile (default_cmyk.icc, Debian ghostscript). Thresholds are set so
// each finding must and must not appear: no colour of a four-ink press
// needs more than 400 % ink; at 150 % the saturated
// years of any palette are over, at 400 % none can be.
func TestPressFindings(t *testing.T) {
	profile := tooltest.ICCProfile(t, "default_cmyk.icc")
	press := func(keys string) string {
		return specText("    press: {profile: "+profile+keys+"}\n", "")
	}
	t.Run("RGB", func(t *testing.T) {
		fs := prepare(t, specText("", ""))
		f, ok := has(fs, IDRGB, "", 0)
		require.True(t, ok, list(fs))
		assert.Equal(t, Info, f.Severity)
		assert.Equal(t, "RGB file with no printing condition; the printer converts it; give press.profile for a CMYK PDF/X-4", f.Message)
		_, ok = has(fs, IDInkLimit, "", 0)
		assert.False(t, ok)
	})
	t.Run("ink limit 150%", func(t *testing.T) {
		fs := prepare(t, press(", ink-limit: 150%"))
		f, ok := has(fs, IDInkLimit, "", 0)
		require.True(t, ok, list(fs))
		assert.Equal(t, Warning, f.Severity)
		assert.Contains(t, f.Message, "more than the 150% ink limit")
		assert.True(t, f.Year >= 1900 && f.Year <= 2025, "the worst year is named: %d", f.Year)
		_, ok = has(fs, IDRGB, "", 0)
		assert.False(t, ok, "a press output is not RGB")
	})
	t.Run("ink limit 400%", func(t *testing.T) {
		fs := prepare(t, press(", ink-limit: 400%"))
		_, ok := has(fs, IDInkLimit, "", 0)
		assert.False(t, ok, "nothing passes 400 %%:\n%s", list(fs))
	})
	t.Run("gamut", func(t *testing.T) {
		fs := prepare(t, press(", max-shift: 1"))
		f, ok := has(fs, IDPressGamut, "", 0)
		require.True(t, ok, list(fs))
		assert.Contains(t, f.Message, "move more than ΔE00 1 on press")
		fs = prepare(t, press(", max-shift: 60"))
		_, ok = has(fs, IDPressGamut, "", 0)
		assert.False(t, ok, "no colour moves ΔE00 60:\n%s", list(fs))
	})
}
