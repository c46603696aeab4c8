package production

import (
	"bytes"
	"hash/adler32"
	"image"
	"image/color"
	"image/png"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestAdler32Combine: the Adler-32 of two strings one after the other,
// from theirs (RFC 1950 §8.2 defines the sum; Go's hash/adler32 computes
// it over the whole as the reference).
func TestAdler32Combine(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for _, n := range [][2]int{{0, 0}, {0, 7}, {7, 0}, {1, 1}, {65520, 3}, {65521, 65521}, {100000, 200003}, {3, 5_000_000}} {
		a, b := make([]byte, n[0]), make([]byte, n[1])
		for i := range a {
			a[i] = byte(r.IntN(256))
		}
		for i := range b {
			b[i] = 255 - byte(r.IntN(3)) // near the top: sums wrap often
		}
		want := adler32.Checksum(append(append([]byte{}, a...), b...))
		got := adler32Combine(adler32.Checksum(a), adler32.Checksum(b), int64(len(b)))
		assert.Equal(t, want, got, "lengths %v", n)
	}
}

// TestBandedPNG: a PNG put together from bands decodes (Go's image/png,
// which checks every chunk's CRC and the zlib stream's Adler-32) to
// exactly the pixels of the image the bands were cut from.
func TestBandedPNG(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for _, size := range [][3]int{{1, 1, 1}, {7, 1300, 512}, {300, 1100, 512}, {33, 40, 7}} {
		w, h, rows := size[0], size[1], size[2]
		img := image.NewRGBA(image.Rect(0, 0, w, h))
		for y := range h {
			for x := range w {
				// Flat runs and noise, as a chart has.
				v := uint8(255)
				if r.IntN(5) == 0 {
					v = uint8(r.IntN(256))
				}
				img.SetRGBA(x, y, color.RGBA{v, uint8(x), uint8(y), 255})
			}
		}
		var bands []*encodedBand
		for y := 0; y < h; y += rows {
			sub := img.SubImage(image.Rect(0, y, w, min(y+rows, h))).(*image.RGBA)
			b, err := encodeBand(sub)
			require.NoError(t, err)
			bands = append(bands, b)
		}
		var buf bytes.Buffer
		require.NoError(t, writeBandedPNG(&buf, w, h, bands))
		got, err := png.Decode(&buf)
		require.NoError(t, err, "size %v", size)
		require.Equal(t, img.Bounds(), got.Bounds())
		diffs, first := 0, image.Point{}
		for y := range h {
			for x := range w {
				if img.RGBAAt(x, y) != color.RGBAModel.Convert(got.At(x, y)) {
					if diffs == 0 {
						first = image.Pt(x, y)
					}
					diffs++
				}
			}
		}
		require.Zero(t, diffs, "size %v: pixels differ, the first at %v is %v, want %v", size, first, got.At(first.X, first.Y), img.RGBAAt(first.X, first.Y))
	}
}
