package page

import (
	"bytes"
	"fmt"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/tiff"

	"sheaf/layout"
	"sheaf/palette"
	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/render/tooltest"
)

// coatedProfile is Ghostscript's generic coated CMYK profile.
func coatedProfile(t testing.TB) []byte {
	b, err := os.ReadFile(tooltest.ICCProfile(t, "default_cmyk.icc"))
	require.NoError(t, err)
	return b
}

// cmykPDF draws every page of f into a PDF/X-4 for the condition.
func cmykPDF(t testing.TB, f *Feature, cond *press.Condition) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: f.Spec.Title, Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC), Press: cond})
	for i, pg := range f.Plan.Pages {
		r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
		setup := pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}, Marks: &pdf.MarkOptions{}, Press: cond}
		require.NoError(t, w.AddPage(setup, func(c *canvas.Canvas) error { return f.Draw(canvas.NewContext(c), i) }))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}

// plates renders page 1 of a PDF with Ghostscript's tiffsep device (one
// 8-bit plate per process ink) at dpi and returns the plates by name.
func plates(t testing.TB, pdfPath string, dpi int) map[string]*image.Gray {
	t.Helper()
	gs := tooltest.Require(t, "gs", "ghostscript")
	dir := t.TempDir()
	out := filepath.Join(dir, "sep.tif")
	cmd := exec.Command(gs, "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=tiffsep", fmt.Sprintf("-r%d", dpi),
		"-dFirstPage=1", "-dLastPage=1", "-o", out, pdfPath)
	b, err := cmd.CombinedOutput()
	require.NoError(t, err, "gs: %s", b)
	got := map[string]*image.Gray{}
	for _, ink := range []string{"Cyan", "Magenta", "Yellow", "Black"} {
		f, err := os.Open(filepath.Join(dir, "sep("+ink+").tif"))
		require.NoError(t, err)
		img, err := tiff.Decode(f)
		f.Close()
		require.NoError(t, err, ink)
		g, ok := img.(*image.Gray)
		require.True(t, ok, "%s plate is %T", ink, img)
		got[ink] = g
	}
	return got
}

// inkIn is the most ink any pixel of the plate has inside r (page points,
// y up, media origin), 0–255. tiffsep writes 0 for full ink, 255 for none.
func inkIn(g *image.Gray, pageH float64, dpi int, r layout.Rect) int {
	k := float64(dpi) / 72
	x0, x1 := int(r.X0*k+0.5), int(r.X1*k+0.5)
	y0, y1 := int((pageH-r.Y1)*k+0.5), int((pageH-r.Y0)*k+0.5)
	most := 0
	for y := y0; y < y1; y++ {
		for x := x0; x < x1; x++ {
			if v := 255 - int(g.GrayAt(x, y).Y); v > most {
				most = v
			}
		}
	}
	return most
}

// TestSeparations is the separation test: the small feature as a
// CMYK PDF through Ghostscript's coated profile, separated by Ghostscript
// (tiffsep): inside every text box of page 1 (title, dek, labels, tick
// labels, key labels, folio, source) and on every baseline rule the cyan,
// magenta and yellow plates carry no ink at all and the black plate does
// (black-only type and rules: common practice, so misregistration cannot
// blur them).
func TestSeparations(t *testing.T) {
	f := smallFeature(t, nil)
	cond, err := press.New(coatedProfile(t), press.Settings{Registry: "http://www.color.org", InkLimit: 300, Intent: icc.RelativeColorimetric})
	require.NoError(t, err)
	path := filepath.Join(t.TempDir(), "cmyk.pdf")
	require.NoError(t, os.WriteFile(path, cmykPDF(t, f, cond), 0o644))
	const dpi = 720
	pl := plates(t, path, dpi)
	pg := f.Plan.Pages[0]
	H := pg.Media.H()
	type box struct {
		what string
		r    layout.Rect
	}
	var boxes []box
	rules := 0
	for _, tl := range pg.Text {
		boxes = append(boxes, box{string(tl.Role) + " " + tl.Text, tl.Box})
	}
	for _, h := range pg.Headings {
		boxes = append(boxes, box{"heading " + h.Text, h.Box})
	}
	for _, k := range pg.Keys() {
		boxes = append(boxes, box{"key labels", k.Ticks})
	}
	for _, pn := range pg.Panels {
		boxes = append(boxes, box{fmt.Sprintf("label of panel %d", pn.Item), pn.Label})
		if pn.ShowTicks {
			// Its top edge is the plot's bottom, where the curve's stroke
			// ends: keep a pixel off it.
			r := pn.Ticks
			r.Y1 -= 0.15
			boxes = append(boxes, box{fmt.Sprintf("ticks of panel %d", pn.Item), r})
		}
		// The 0.25 pt baseline, where the curve runs well above it
		// (between two years both over a tenth of the panel's top), so
		// only the rule's ink is there.
		sr := &f.Data.Series[pn.Item]
		m, err := f.PlotMap(pn)
		require.NoError(t, err)
		for i := 0; i+1 < len(f.Data.Years); i++ {
			a, b := sr.Values[i], sr.Values[i+1]
			if !(a > 0.1*sr.YMax && b > 0.1*sr.YMax) {
				continue
			}
			xa, xb := m.X(f.Data.Years[i]), m.X(f.Data.Years[i+1])
			y := pn.Plot.Y0
			boxes = append(boxes, box{fmt.Sprintf("baseline of panel %d", pn.Item), layout.Rect{X0: xa + (xb-xa)/4, Y0: y - 0.1, X1: xb - (xb-xa)/4, Y1: y + 0.1}})
			rules++
		}
	}
	require.Positive(t, rules, "no baseline stretch to check")
	require.NotEmpty(t, boxes)
	for _, b := range boxes {
		for _, ink := range []string{"Cyan", "Magenta", "Yellow"} {
			require.Zero(t, inkIn(pl[ink], H, dpi, b.r), "%s: the %s plate has ink", b.what, ink)
		}
		require.Greater(t, inkIn(pl["Black"], H, dpi, b.r), 40, "%s: nothing on the black plate", b.what)
	}
	// And the chart itself is in colour: the key strip is on C, M and Y.
	strip := pg.KeyStrip
	for _, ink := range []string{"Cyan", "Magenta", "Yellow"} {
		require.Greater(t, inkIn(pl[ink], H, dpi, strip), 40, "key strip: no %s", ink)
	}
}

// TestSoftProofMatchesGhostscript: the soft proof of page 1 (our engine:
// device → PCS → sRGB) against Ghostscript's own rendering of our CMYK PDF
// through the same profile (gs png16m; DeviceCMYK is taken through
// default_cmyk.icc, its default CMYK profile, relative colorimetric). Over
// the key strip — a gradient across the whole palette — the colours agree
// within ΔE00 1.5 on average (two CMMs and two rasterizers; LittleCMS in
// Ghostscript rounds through 16-bit tables), and the black type (solid K)
// within ΔE00 3 at its darkest pixel.
func TestSoftProofMatchesGhostscript(t *testing.T) {
	gs := tooltest.Require(t, "gs", "ghostscript")
	f := smallFeature(t, nil)
	cond, err := press.New(coatedProfile(t), press.Settings{Registry: "http://www.color.org", InkLimit: 300, Intent: icc.RelativeColorimetric})
	require.NoError(t, err)
	dir := t.TempDir()
	path := filepath.Join(dir, "cmyk.pdf")
	require.NoError(t, os.WriteFile(path, cmykPDF(t, f, cond), 0o644))
	const dpi = 150
	pg := f.Plan.Pages[0]
	H := pg.Media.H()
	region := raster.RegionOf(H, dpi, pg.Media.X0, pg.Media.Y0, pg.Media.X1, pg.Media.Y1)
	ours, err := raster.ProofRegion(H, dpi, region, f.PaperColor(), cond, func(ctx *canvas.Context) error { return f.Draw(ctx, 0) })
	require.NoError(t, err)
	out := filepath.Join(dir, "gs.png")
	b, err := exec.Command(gs, "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=png16m", fmt.Sprintf("-r%d", dpi),
		"-dRenderIntent=1", "-dTextAlphaBits=4", "-dGraphicsAlphaBits=4", "-dFirstPage=1", "-dLastPage=1", "-o", out, path).CombinedOutput()
	require.NoError(t, err, "gs: %s", b)
	theirs := readPNG(t, out)
	require.Equal(t, ours.Bounds().Size(), theirs.Bounds().Size())

	k := float64(dpi) / 72
	s := pg.KeyStrip
	x0, x1 := int(s.X0*k)+3, int(s.X1*k)-3
	y0, y1 := int((H-s.Y1)*k)+3, int((H-s.Y0)*k)-3
	sum, n := 0.0, 0
	for y := y0; y < y1; y++ {
		for x := x0; x < x1; x++ {
			// the band also holds the key's caption: compare the gradient
			// (coloured in both renderings), not the type's antialiasing
			a, b := labAt(ours, x, y), labAt(theirs, x, y)
			if a.LCh().C < 10 || b.LCh().C < 10 {
				continue
			}
			sum += palette.DeltaE00(a, b)
			n++
		}
	}
	require.Greater(t, n, 1000, "too little of the strip compared")
	t.Logf("key strip: mean ΔE00 %.2f over %d pixels", sum/float64(n), n)
	require.LessOrEqual(t, sum/float64(n), 1.5)

	title := pg.Text[0].Box
	dark := func(img image.Image) palette.Lab {
		best := palette.Lab{L: 101}
		for y := int((H - title.Y1) * k); y < int((H-title.Y0)*k); y++ {
			for x := int(title.X0 * k); x < int(title.X1*k); x++ {
				if l := labAt(img, x, y); l.L < best.L {
					best = l
				}
			}
		}
		return best
	}
	d := palette.DeltaE00(dark(ours), dark(theirs))
	t.Logf("title: darkest pixel ΔE00 %.2f (ours L* %.1f, Ghostscript's %.1f)", d, dark(ours).L, dark(theirs).L)
	require.LessOrEqual(t, d, 3.0)
}

func readPNG(t testing.TB, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	img, err := png.Decode(f)
	require.NoError(t, err)
	return img
}

func labAt(img image.Image, x, y int) palette.Lab {
	r, g, b, _ := img.At(img.Bounds().Min.X+x, img.Bounds().Min.Y+y).RGBA()
	return palette.FromRGB(palette.RGB{R: float64(r) / 65535, G: float64(g) / 65535, B: float64(b) / 65535}).Lab()
}
