package icc_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"sheaf/palette/icc"
)

// BenchmarkConvert: sRGB → the invented v4 CMYK profile (mBA with a 17×15×13
// CLUT), every call a new colour (no cache hit), and the same colour again
// (cache hit).
func BenchmarkConvert(b *testing.B) {
	dst, err := icc.Parse(inventedCMYK())
	require.NoError(b, err)
	xf, err := icc.NewTransform(icc.SRGB(), dst, icc.RelativeColorimetric, true)
	require.NoError(b, err)
	b.Run("new", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			v := float64(i%1000003) / 1000003
			xf.Convert([]float64{v, 1 - v, v * v})
		}
	})
	b.Run("cached", func(b *testing.B) {
		for b.Loop() {
			xf.Convert([]float64{0.2, 0.4, 0.6})
		}
	})
}

// BenchmarkNewTransform includes black-point detection (256 round trips).
func BenchmarkNewTransform(b *testing.B) {
	dst, err := icc.Parse(inventedCMYK())
	require.NoError(b, err)
	src := icc.SRGB()
	for b.Loop() {
		_, err := icc.NewTransform(src, dst, icc.RelativeColorimetric, true)
		require.NoError(b, err)
	}
}
