package production

import (
	"bytes"
	"encoding/gob"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/pdf"
)

// TestPageCacheCoversEncodedPage pins the fields writeCachedPage carries.
// A field added to pdf.EncodedPage (or a type inside it) fails here until
// the cache layout carries it too; otherwise a reused page would lose it.
// PageFont.font is left out on purpose: a cached page names its fonts by
// key (see pdf.EncodedPage).
func TestPageCacheCoversEncodedPage(t *testing.T) {
	want := map[string]string{
		"pdf.EncodedPage": "Boxes pdf.PageBoxes; Content []uint8; Compressed bool; Fonts []pdf.PageFont; Patterns []pdf.Shading; GStates []pdf.Alpha; Transparent bool; Device int; Load func() ([]uint8, error)",
		"pdf.PageBoxes":   "Media canvas.Rect; Bleed canvas.Rect; Trim canvas.Rect",
		"canvas.Rect":     "X0 float64; Y0 float64; X1 float64; Y1 float64",
		"pdf.PageFont":    "Key pdf.FontKey; Glyphs []pdf.GlyphUse; font *pdf.fontData",
		"pdf.FontKey":     "[32]uint8",
		"pdf.GlyphUse":    "ID uint16; Text string",
		"pdf.Shading":     "Radial bool; Device int; Coords []float64; Stops []pdf.Stop",
		"pdf.Stop":        "Offset float64; R float64; G float64; B float64; Ink []float64",
		"pdf.Alpha":       "Fill float64; Stroke float64; Overprint bool",
	}
	for _, v := range []any{pdf.EncodedPage{}, pdf.PageBoxes{}, canvas.Rect{}, pdf.PageFont{}, pdf.FontKey{}, pdf.GlyphUse{}, pdf.Shading{}, pdf.Stop{}, pdf.Alpha{}} {
		typ := reflect.TypeOf(v)
		var got []string
		if typ.Kind() == reflect.Struct {
			for i := range typ.NumField() {
				f := typ.Field(i)
				got = append(got, f.Name+" "+f.Type.String())
			}
		} else {
			got = append(got, fmt.Sprintf("[%d]%s", typ.Len(), typ.Elem()))
		}
		assert.Equal(t, want[typ.String()], strings.Join(got, "; "), "%s: fields the page cache carries (expected) against the type's (actual); update writeCachedPage and decodeCachedPage", typ)
	}
}

// cachePages are a page of the demo as drawn, and a made-up page with
// every field set (radial shading, opacity, glyph texts beyond ASCII and
// empty) so that each part of the layout is exercised.
func cachePages(t *testing.T) []*pdf.EncodedPage {
	t.Helper()
	j := demoJob(t, "")
	p, err := j.Prepare(j.Spec.Output("print"))
	require.NoError(t, err)
	drawn, err := pdf.EncodePage(pdf.PageSetup{Boxes: PageBoxes(&p.Plan.Pages[0]), Marks: &pdf.MarkOptions{}},
		func(c *canvas.Canvas) error { return p.Feature.Draw(canvas.NewContext(c), 0) })
	require.NoError(t, err)
	full := &pdf.EncodedPage{
		Boxes:      pdf.PageBoxes{Media: canvas.Rect{X1: 300, Y1: 400}, Bleed: canvas.Rect{X0: 10, Y0: 10, X1: 290, Y1: 390}, Trim: canvas.Rect{X0: 19.5, Y0: 19.25, X1: 280.125, Y1: 380}},
		Content:    []byte("q 1 0 0 1 0 0 cm /P0 sh Q\n"),
		Compressed: false,
		Fonts: []pdf.PageFont{{Key: pdf.FontKey{1, 2, 3, 31: 9}, Glyphs: []pdf.GlyphUse{{ID: 0, Text: ""}, {ID: 3, Text: "ß"}, {ID: 65535, Text: "ﬁ"}}},
			{Key: pdf.FontKey{7}}},
		Patterns: []pdf.Shading{
			{Radial: true, Coords: []float64{1, 2, 0, 3, 4, 5.5}, Stops: []pdf.Stop{{Offset: 0, R: 1}, {Offset: 1, G: 0.5, B: 1}}},
			{Coords: []float64{0, 0, 100, math.Copysign(0, -1)}},
			{Device: 4, Coords: []float64{0, 0, 10, 0}, Stops: []pdf.Stop{{Offset: 0, Ink: []float64{0.1, 0.2, 0.3, 0.4}}, {Offset: 1, Ink: []float64{1, 0, 0.5, 0}}}},
		},
		GStates:     []pdf.Alpha{{Fill: 0.5, Stroke: 1}, {}, {Fill: 1, Stroke: 1, Overprint: true}},
		Transparent: true,
		Device:      4,
	}
	return []*pdf.EncodedPage{drawn, full}
}

// TestPageCacheRoundTrip: a page read back from the cache is the page gob
// gives back (the encoding the cache used before), field for field, and
// a PDF made of it is byte for byte the PDF made of the original.
func TestPageCacheRoundTrip(t *testing.T) {
	for i, e := range cachePages(t) {
		var b bytes.Buffer
		require.NoError(t, writeCachedPage(&b, e))
		got, err := decodeCachedPage(bytes.Clone(b.Bytes()))
		require.NoError(t, err, "page %d", i)
		var g bytes.Buffer
		require.NoError(t, gob.NewEncoder(&g).Encode(e))
		var viaGob pdf.EncodedPage
		require.NoError(t, gob.NewDecoder(&g).Decode(&viaGob))
		assert.Equal(t, &viaGob, got, "page %d: read back, want the gob round trip", i)
		if i == 1 { // DeepEqual takes -0 for 0: the bits must survive (IEEE 754 sign bit)
			assert.True(t, math.Signbit(got.Patterns[1].Coords[3]), "negative zero read back as +0")
		}
		if i == 0 {
			assert.Equal(t, pdfOf(t, e), pdfOf(t, got), "page %d: the PDF of the page read back is the original's", i)
		}
	}
}

func pdfOf(t *testing.T, e *pdf.EncodedPage) []byte {
	t.Helper()
	fs, err := fonts.Default()
	require.NoError(t, err)
	var out bytes.Buffer
	w := pdf.NewWriter(&out, pdf.Options{Title: "cache", Version: Version, Date: time.Unix(0, 0).UTC()})
	for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
		_, err := w.RegisterFont(fs.Font(st))
		require.NoError(t, err)
	}
	require.NoError(t, w.AddEncoded(e))
	require.NoError(t, w.Close())
	return out.Bytes()
}

// TestPageCacheDamage: a flipped bit or a file cut anywhere is refused
// (and never panics), so the page is drawn again.
func TestPageCacheDamage(t *testing.T) {
	var b bytes.Buffer
	require.NoError(t, writeCachedPage(&b, cachePages(t)[1]))
	data := b.Bytes()
	for i := range data {
		d := bytes.Clone(data)
		d[i] ^= 0x10
		_, err := decodeCachedPage(d)
		assert.Error(t, err, "byte %d flipped", i)
		_, err = decodeCachedPage(bytes.Clone(data[:i]))
		assert.Error(t, err, "cut after %d bytes", i)
	}
	_, err := decodeCachedPage(append(bytes.Clone(data), 0))
	assert.Error(t, err, "a byte appended: read without error")
}

// TestPageLoader: a page checked from its file and written later through
// its Load makes the same PDF as the page held in memory; the loader's
// one buffer serves page after page; a damaged file is refused at the
// check (the page is drawn again), and a file changed between the check
// and the writing fails the build instead of going into the PDF.
func TestPageLoader(t *testing.T) {
	dir := t.TempDir()
	pages := cachePages(t)
	paths := make([]string, len(pages))
	for i, e := range pages {
		paths[i] = filepath.Join(dir, fmt.Sprintf("p%d.page", i))
		require.NoError(t, WriteAtomic(paths[i], func(w io.Writer) error { return writeCachedPage(w, e) }))
	}
	l := &pageLoader{}
	var buf []byte
	for i, e := range pages {
		var got *pdf.EncodedPage
		got, buf = l.check(paths[i], buf)
		require.NotNil(t, got, "page %d", i)
		assert.Nil(t, got.Content, "page %d: content left in the file", i)
		c, err := got.Load()
		require.NoError(t, err, "page %d", i)
		assert.Equal(t, e.Content, c, "page %d: the content read again", i)
		if i == 0 {
			assert.Equal(t, pdfOf(t, e), pdfOf(t, got), "the PDF of the page loaded is the original's")
		}
	}

	got, _ := l.check(paths[1], nil)
	require.NotNil(t, got)
	data, err := os.ReadFile(paths[1])
	require.NoError(t, err)
	data[len(data)/2] ^= 0x10
	require.NoError(t, os.WriteFile(paths[1], data, 0o644))
	_, err = got.Load()
	assert.ErrorContains(t, err, "changed during the build", "a file changed after its check")
	bad, _ := l.check(paths[1], nil)
	assert.Nil(t, bad, "a damaged file passed the check")

	got, _ = l.check(paths[0], nil)
	require.NotNil(t, got)
	require.NoError(t, os.Remove(paths[0]))
	_, err = got.Load()
	assert.Error(t, err, "a file removed after its check")
	bad, _ = l.check(paths[0], nil)
	assert.Nil(t, bad, "a missing file passed the check")
}
