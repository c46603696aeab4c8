package fonts

import (
	"testing"

	"github.com/stretchr/testify/require"
)

// Width shapes a text once and scales its advances for every size; the
// result must be the very float64 canvas's own FontFace.TextWidth gives
// (the reference: tdewolff/canvas shaping at that size), so that layouts
// and files stay byte-identical.
func TestWidthSharedAcrossSizesIsCanvasWidth(t *testing.T) {
	s, err := Default()
	require.NoError(t, err)
	texts := []string{"telegraph", "programmable chronometer", "AVA Wa To", "1861", "é–ﬁ", "low-voltage panel saw…"}
	sizes := []float64{6.5, 6.25, 6, 5.75, 5.525, 14 * 0.75, 13.67 * 0.75, 100}
	for _, st := range []Style{Regular, Bold, Italic, Figures} {
		for _, text := range texts {
			for _, size := range sizes {
				want := s.Face(st, size).TextWidth(text) / mmPerPt // canvas's TextWidth: the reference
				require.Equal(t, want, s.Width(st, size, text), "%v %q at %g pt", st, text, size)
			}
		}
	}
	require.NotEmpty(t, s.adv.m, "the advances were kept")
}

// Two outputs in the same faces share their shaping; their widths are
// still canvas's (the reference), and a Set in other faces shares nothing.
func TestShareShaping(t *testing.T) {
	a, err := Default()
	require.NoError(t, err)
	b, err := Default()
	require.NoError(t, err)
	require.True(t, b.ShareShaping(a), "the same built-in faces")
	a.Width(Bold, 6.5, "hydraulic condenser")
	require.Same(t, a.adv, b.adv)
	for _, size := range []float64{6.5, 5.525, 10.5} {
		want := b.Face(Bold, size).TextWidth("hydraulic condenser") / mmPerPt // canvas's TextWidth: the reference
		require.Equal(t, want, b.Width(Bold, size, "hydraulic condenser"))
	}

	c, err := Default()
	require.NoError(t, err)
	c.raw[Bold] = c.raw[Regular] // other bytes for one style
	require.False(t, c.ShareShaping(a))
	require.NotSame(t, a.adv, c.adv)
}
