// Package pdfcpucheck reads documents of sheaf/render/pdf back with
// pdfcpu v0.15.0, a general-purpose PDF library, in strict validation
// mode. It is a package of its own so that pdfcpu's dependencies are
// needed only here.
package pdfcpucheck

import (
	"bytes"
	"os"
	"testing"
	"time"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/model"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/types"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/pdf"
	"sheaf/render/tooltest"
)

var testDate = time.Date(2024, 5, 17, 9, 30, 0, 0, time.UTC)

// boxes: A5 trim (ISO 216: 419.528 × 595.276 pt), 3 mm bleed, 12 mm of
// mark area (print-facts.md).
func boxes() pdf.PageBoxes {
	const mm = 72 / 25.4
	bleed, marks := 3*mm, 12*mm
	tw, th := 419.528, 595.276
	return pdf.PageBoxes{
		Media: canvas.Rect{X1: tw + 2*(bleed+marks), Y1: th + 2*(bleed+marks)},
		Bleed: canvas.Rect{X0: marks, Y0: marks, X1: marks + tw + 2*bleed, Y1: marks + th + 2*bleed},
		Trim:  canvas.Rect{X0: marks + bleed, Y0: marks + bleed, X1: marks + bleed + tw, Y1: marks + bleed + th},
	}
}

func font(t *testing.T, b []byte) *canvas.Font {
	f, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err)
	return f
}

// drawing is an invented test picture: a gradient-stroked curve, a
// translucent fill, a dashed line and text in two fonts.
func drawing(reg, bold *canvas.Font) func(c *canvas.Canvas) error {
	return func(c *canvas.Canvas) error {
		ctx := canvas.NewContext(c)
		g := canvas.NewLinearGradient(canvas.Point{X: 20, Y: 0}, canvas.Point{X: 130, Y: 0})
		g.Add(0, canvas.Hex("#1a365d"))
		g.Add(0.5, canvas.Hex("#38a169"))
		g.Add(1, canvas.Hex("#ecc94b"))
		p := &canvas.Path{}
		p.MoveTo(20, 100)
		p.CubeTo(40, 140, 60, 80, 130, 110)
		ctx.SetFillColor(canvas.Transparent)
		ctx.SetStrokeGradient(g)
		ctx.SetStrokeWidth(1.5)
		ctx.DrawPath(0, 0, p)
		ctx.SetStrokeColor(canvas.Hex("#22543d"))
		ctx.SetDashes(0, 2, 1)
		ctx.DrawPath(0, -30, p)
		ctx.SetStrokeColor(canvas.Transparent)
		ctx.SetFillColor(canvas.RGBA(200, 30, 30, 0.5))
		ctx.DrawPath(100, 20, canvas.Rectangle(20, 40))
		ctx.DrawText(20, 180, canvas.NewTextLine(reg.Face(14, canvas.Black), "Sheaf of words", canvas.Left))
		ctx.DrawText(20, 165, canvas.NewTextLine(bold.Face(10, canvas.Black), "office affine", canvas.Left))
		return nil
	}
}

func document(t *testing.T, pages int) []byte { return documentFor(t, pages, nil) }

// documentFor is document drawn for a printing condition (nil: RGB).
func documentFor(t *testing.T, pages int, cond *press.Condition) []byte {
	reg, bold := font(t, goregular.TTF), font(t, gobold.TTF)
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: "Read back", Version: "0.0.1", Date: testDate, Press: cond})
	for i := 0; i < pages; i++ {
		require.NoError(t, w.AddPage(pdf.PageSetup{Boxes: boxes(), Marks: &pdf.MarkOptions{}, Slug: "read-back test", Press: cond}, drawing(reg, bold)))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}

// readStrict reads and validates a document with pdfcpu v0.15.0 (a
// general-purpose PDF library) in strict mode.
func readStrict(t *testing.T, b []byte) *model.Context {
	t.Helper()
	conf := model.NewDefaultConfiguration()
	conf.ValidationMode = model.ValidationStrict
	ctx, err := api.ReadContext(bytes.NewReader(b), conf)
	require.NoError(t, err, "pdfcpu read")
	require.NoError(t, api.ValidateContext(ctx), "pdfcpu strict validation")
	return ctx
}

func dict(t *testing.T, ctx *model.Context, o types.Object) types.Dict {
	t.Helper()
	d, err := ctx.DereferenceDict(o)
	require.NoError(t, err, "dereference %v", o)
	require.NotNil(t, d, "dereference %v", o)
	return d
}

func TestPDFCPUReadBack(t *testing.T) {
	t.Run("RGB", func(t *testing.T) { readBack(t, nil) })
	t.Run("CMYK", func(t *testing.T) {
		b, err := os.ReadFile(tooltest.ICCProfile(t, "default_cmyk.icc"))
		require.NoError(t, err)
		cond, err := press.New(b, press.Settings{Registry: "http://www.color.org", InkLimit: 300, Intent: icc.RelativeColorimetric})
		require.NoError(t, err)
		readBack(t, cond)
	})
}

func readBack(t *testing.T, cond *press.Condition) {
	const pages = 3
	doc := documentFor(t, pages, cond)
	ctx := readStrict(t, doc)

	assert.Equal(t, pages, ctx.PageCount, "page count %d, want %d", ctx.PageCount, pages)
	want := boxes()
	pbs, err := ctx.PageBoundaries(nil)
	require.NoError(t, err)
	// val reads a name or string entry; "" when it is missing.
	val := func(p *string) string {
		if p == nil {
			return ""
		}
		return *p
	}
	for i, pb := range pbs {
		// ISO 32000-1 §14.11.2: boxes as asked, CropBox = MediaBox here.
		for _, c := range []struct {
			name string
			box  *model.Box
			want canvas.Rect
		}{{"MediaBox", pb.Media, want.Media}, {"CropBox", pb.Crop, want.Media}, {"BleedBox", pb.Bleed, want.Bleed}, {"TrimBox", pb.Trim, want.Trim}} {
			if !assert.True(t, c.box != nil && c.box.Rect != nil, "page %d has no %s", i+1, c.name) {
				continue
			}
			r := c.box.Rect
			assert.InDeltaSlice(t, []float64{c.want.X0, c.want.Y0, c.want.X1, c.want.Y1}, []float64{r.LL.X, r.LL.Y, r.UR.X, r.UR.Y}, 0.01, "page %d %s (pt)", i+1, c.name)
		}
		// PDF/X: TrimBox or ArtBox, not both (print-facts.md, PDF/X-4).
		d, _, _, err := ctx.PageDict(i+1, false)
		require.NoError(t, err)
		_, ok := d.Find("ArtBox")
		assert.False(t, ok, "page %d has an ArtBox besides its TrimBox", i+1)
		// every font embedded (PDF/X-4, print-facts.md)
		res := dict(t, ctx, d["Resources"])
		fonts := dict(t, ctx, res["Font"])
		assert.GreaterOrEqual(t, len(fonts), 2, "page %d has %d fonts, want the two test fonts", i+1, len(fonts))
		for name, f := range fonts {
			fd := dict(t, ctx, f)
			assert.Equal(t, "Type0", val(fd.NameEntry("Subtype")), "font %s subtype", name)
			_, ok := fd.Find("ToUnicode")
			assert.True(t, ok, "font %s has no ToUnicode", name)
			arr, err := ctx.DereferenceArray(fd["DescendantFonts"])
			require.NoError(t, err, "font %s descendants", name)
			require.Len(t, arr, 1, "font %s descendants", name)
			cid := dict(t, ctx, arr[0])
			assert.Equal(t, "CIDFontType2", val(cid.NameEntry("Subtype")), "font %s descendant subtype", name)
			desc := dict(t, ctx, cid["FontDescriptor"])
			_, ok = desc.Find("FontFile2")
			assert.True(t, ok, "font %s is not embedded (no FontFile2)", name)
		}
	}

	root, err := ctx.Catalog()
	require.NoError(t, err)
	if cond == nil {
		// An RGB file makes no PDF/X claim: no output intent.
		_, ok := root.Find("OutputIntents")
		assert.False(t, ok, "an RGB document has OutputIntents")
	} else {
		ois, err := ctx.DereferenceArray(root["OutputIntents"])
		require.NoError(t, err, "OutputIntents")
		require.Len(t, ois, 1, "OutputIntents: PDF/X-4 wants exactly one")
		oi := dict(t, ctx, ois[0])
		assert.Equal(t, "GTS_PDFX", val(oi.NameEntry("S")), "output intent S")
		_, ok := oi.Find("DestOutputProfile")
		assert.True(t, ok, "output intent has no DestOutputProfile")
		assert.NotEmpty(t, val(oi.StringEntry("OutputConditionIdentifier")), "output intent has no OutputConditionIdentifier")
	}
	_, ok := root.Find("Metadata")
	assert.True(t, ok, "catalog has no Metadata (XMP)")
	info := dict(t, ctx, *ctx.Info)
	assert.Equal(t, "False", val(info.NameEntry("Trapped")), "Info /Trapped (PDF/X-4 wants True or False)")
	for _, k := range []string{"Title", "CreationDate", "ModDate", "Producer"} {
		_, ok := info.Find(k)
		assert.True(t, ok, "Info has no %s", k)
	}
	assert.Len(t, ctx.ID, 2, "trailer /ID = %v, want two strings (required by PDF/X)", ctx.ID)
}

// TestCachedPageValidates: a page that went through encoding/gob and
// AddEncoded still makes a strictly valid document.
func TestCachedPageValidates(t *testing.T) {
	bold := font(t, gobold.TTF)
	page, err := pdf.EncodePage(pdf.PageSetup{Boxes: boxes()}, drawing(font(t, goregular.TTF), bold))
	require.NoError(t, err)
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Date: testDate})
	require.NoError(t, w.AddEncoded(page))
	require.NoError(t, w.Close())
	readStrict(t, buf.Bytes())
}
