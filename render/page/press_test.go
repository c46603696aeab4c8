package page

import (
	"bytes"
	"fmt"
	"image"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/tiff"

	"sheaf/layout"
	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/pdf"
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
