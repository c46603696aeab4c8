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
	require.NotEmpty(t, s.advances, "the advances were shared")
}
