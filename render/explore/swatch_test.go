package explore

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette/press"
	"sheaf/render/feature"
	"sheaf/render/swatch"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// The swatch sheet: a PNG and a one-page PDF of swatch.SizeFor's size
// (read back with poppler's pdfinfo; 1 mm = 72/25.4 pt), the title
// after the feature's; a cancelled context writes nothing.
func TestWriteSwatches(t *testing.T) {
	j, err := feature.Load(smallSpec)
	require.NoError(t, err)
	checks, err := j.CheckPalette()
	require.NoError(t, err)
	c := SwatchCheck(checks)
	dir := filepath.Join(t.TempDir(), "palette")

	_, err = WriteSwatches(canceled(), c, j.Spec.Title, dir, feature.FallbackDate)
	require.ErrorIs(t, err, context.Canceled)
	_, err = os.Stat(dir)
	assert.True(t, os.IsNotExist(err), "cancelled: nothing written")

	files, err := WriteSwatches(context.Background(), c, j.Spec.Title, dir, feature.FallbackDate)
	require.NoError(t, err)
	require.Equal(t, []string{filepath.Join(dir, "swatch.png"), filepath.Join(dir, "swatch.pdf")}, files)
	png, err := os.ReadFile(files[0])
	require.NoError(t, err)
	assert.True(t, bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")), "PNG signature (ISO/IEC 15948 §5.2)")
	pdfinfo := tooltest.Require(t, "pdfinfo", "poppler-utils")
	info, err := exec.Command(pdfinfo, files[1]).Output()
	require.NoError(t, err)
	wmm, hmm := swatch.SizeFor(nil)
	assert.Regexp(t, `Pages:\s+1\n`, string(info))
	var w, h float64
	_, err = fmt.Sscanf(string(info[bytes.Index(info, []byte("Page size:")):]), "Page size: %g x %g pts", &w, &h)
	require.NoError(t, err)
	assert.InDelta(t, wmm*specs.PtPerMm, w, 1e-3)
	assert.InDelta(t, hmm*specs.PtPerMm, h, 1e-3)
	assert.Contains(t, string(info), "A small test feature — era palette")
}

// SwatchCheck shows the first output printed on a press, else the first.
func TestSwatchCheck(t *testing.T) {
	cond := &press.Condition{}
	for _, tc := range []struct {
		checks []feature.PaletteCheck
		want   string
	}{
		{[]feature.PaletteCheck{{Output: "web"}, {Output: "print"}}, "web"},
		{[]feature.PaletteCheck{{Output: "web"}, {Output: "press", Press: cond}, {Output: "press2", Press: cond}}, "press"},
	} {
		assert.Equal(t, tc.want, SwatchCheck(tc.checks).Output)
	}
}
