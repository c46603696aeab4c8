package tooltest

import (
	"image"
	"image/png"
	"math"
	"os"
	"testing"

	"github.com/stretchr/testify/require"
)

// ReadPNG decodes the PNG at path or fails the test.
func ReadPNG(t testing.TB, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	img, err := png.Decode(f)
	require.NoError(t, err, path)
	return img
}

// SubImage returns the part r of img, r counted from img's top-left
// corner.
func SubImage(img image.Image, r image.Rectangle) image.Image {
	return img.(interface {
		SubImage(image.Rectangle) image.Image
	}).SubImage(r.Add(img.Bounds().Min))
}

// CompareImages compares two images of one size, each from its own
// top-left corner: it returns the mean absolute channel difference (0–255)
// and the share of pixels with some channel off by more than limit.
func CompareImages(a, b image.Image, limit float64) (mean, share float64) {
	ab, bb := a.Bounds(), b.Bounds()
	var sum float64
	var off int
	for y := 0; y < ab.Dy(); y++ {
		for x := 0; x < ab.Dx(); x++ {
			r1, g1, b1, _ := a.At(ab.Min.X+x, ab.Min.Y+y).RGBA()
			r2, g2, b2, _ := b.At(bb.Min.X+x, bb.Min.Y+y).RGBA()
			d := [3]float64{channel(r1, r2), channel(g1, g2), channel(b1, b2)}
			sum += d[0] + d[1] + d[2]
			if max(d[0], d[1], d[2]) > limit {
				off++
			}
		}
	}
	n := float64(ab.Dx() * ab.Dy())
	if n == 0 {
		return 0, 0
	}
	return sum / (3 * n), float64(off) / n
}

func channel(a, b uint32) float64 { return math.Abs(float64(a>>8) - float64(b>>8)) }
