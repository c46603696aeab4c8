package pdf

import (
	"bytes"
	"compress/zlib"
	"io"
	"math"
	"regexp"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
)

func pageContent(t *testing.T, p *EncodedPage) string {
	t.Helper()
	if !p.Compressed {
		return string(p.Content)
	}
	r, err := zlib.NewReader(bytes.NewReader(p.Content))
	require.NoError(t, err)
	b, err := io.ReadAll(r)
	require.NoError(t, err)
	return string(b)
}

// TestCropMarks: marks at the four trim corners, 0.25 pt, starting 1 mm
// beyond the bleed edge and 6 mm long (common practice, print-facts.md
// "Crop marks"; no standard fixes these), all outside the BleedBox and
// inside the MediaBox, in the registration colour Separation /All at
// tint 1 (ISO 32000-1 §8.6.6.4).
func TestCropMarks(t *testing.T) {
	b := a5Boxes()
	p, err := EncodePage(PageSetup{Boxes: b, Marks: &MarkOptions{}, Slug: "job 7 · page 1/1"}, nil)
	require.NoError(t, err)
	c := pageContent(t, p)
	assert.False(t, !regexp.MustCompile(`/CS1 CS 1 SC`).MatchString(c) || !regexp.MustCompile(`/CS1 cs 1 sc`).MatchString(c), "marks are not in the registration colour /CS1 at tint 1")
	assert.True(t, regexp.MustCompile(`(?m)^0\.25 w 0 J`).MatchString(c), "marks are not 0.25 pt with butt caps")
	seg := regexp.MustCompile(`([-\d.]+) ([-\d.]+) m ([-\d.]+) ([-\d.]+) l S`)
	ms := seg.FindAllStringSubmatch(c, -1)
	require.Len(t, ms, 8, "%d mark segments, want 8 (two per trim corner)", len(ms))
	const mm = 72 / 25.4
	onTrimLine := map[float64]bool{}
	for _, m := range ms {
		var v [4]float64
		for i := range v {
			v[i], _ = strconv.ParseFloat(m[i+1], 64)
		}
		x0, y0, x1, y1 := v[0], v[1], v[2], v[3]
		length := math.Hypot(x1-x0, y1-y0)
		assert.InDelta(t, 6*mm, length, 0.002, "mark %v is %.3f pt long, want 6 mm = %.3f pt", v, length, 6*mm)
		// a mark lies on a trim line and wholly outside the bleed
		outside := func(x, y float64) bool {
			return x < b.Bleed.X0 || x > b.Bleed.X1 || y < b.Bleed.Y0 || y > b.Bleed.Y1
		}
		inside := func(x, y float64) bool {
			return x >= b.Media.X0 && x <= b.Media.X1 && y >= b.Media.Y0 && y <= b.Media.Y1
		}
		assert.False(t, !outside(x0, y0) || !outside(x1, y1) || !inside(x0, y0) || !inside(x1, y1), "mark %v is not between BleedBox and MediaBox", v)
		near := math.Min(dist(x0, y0, b.Bleed), dist(x1, y1, b.Bleed))
		assert.InDelta(t, 1*mm, near, 0.002, "mark %v starts %.3f pt from the bleed, want 1 mm", v, near)
		if x0 == x1 {
			onTrimLine[x0] = true
		} else {
			onTrimLine[y0] = true
		}
	}
	for _, v := range []float64{b.Trim.X0, b.Trim.X1, b.Trim.Y0, b.Trim.Y1} {
		assert.True(t, onTrimLine[round3(v)], "no mark on the trim line at %.3f", v)
	}
	assert.True(t, regexp.MustCompile(`> Tj`).MatchString(c), "no slug text")
}

// dist is the distance from a point outside r to r.
func dist(x, y float64, r canvas.Rect) float64 {
	dx := math.Max(math.Max(r.X0-x, 0), x-r.X1)
	dy := math.Max(math.Max(r.Y0-y, 0), y-r.Y1)
	return math.Hypot(dx, dy)
}

// TestRegistrationColourSpace: the document defines /CS1 as Separation
// /All over the ICC space (ISO 32000-1 §8.6.6.4).
func TestRegistrationColourSpace(t *testing.T) {
	doc := writeDoc(t, Options{Date: testDate}, 1)
	assert.True(t, regexp.MustCompile(`\[/Separation /All \d+ 0 R << /FunctionType 2 /Domain \[0 1\] /C0 \[1 1 1\] /C1 \[0 0 0\] /N 1 >>\]`).Match(doc), "no registration colour space Separation /All")
	assert.True(t, regexp.MustCompile(`\[/ICCBased \d+ 0 R\]`).Match(doc), "no ICCBased colour space")
	assert.False(t, bytes.Contains(doc, []byte("DeviceRGB cs")) || bytes.Contains(doc, []byte(" rg\n")), "device colour used")
}
