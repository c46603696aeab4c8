package pdf

import (
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"errors"
	"math"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
)

func TestAppendNum(t *testing.T) {
	// PDF numbers (ISO 32000-1 §7.3.3): no exponent; here 0.001 precision,
	// no trailing zeros (brief, common practice for compact content).
	cases := []struct {
		in   float64
		want string
	}{
		{0, "0"}, {math.Copysign(0, -1), "0"}, {1, "1"}, {-1, "-1"}, {0.5, "0.5"}, {0.1 + 0.2, "0.3"},
		{1.23456, "1.235"}, {-1.23449, "-1.234"}, {0.0004, "0"}, {-0.0004, "0"}, {0.0005, "0.001"},
		{595.2756, "595.276"}, {841.8898, "841.89"}, {1e-9, "0"}, {123456.7891, "123456.789"}, {10.01, "10.01"},
	}
	for _, c := range cases {
		assert.Equal(t, c.want, string(appendNum(nil, c.in)), "appendNum(%v)", c.in)
	}
	assert.LessOrEqual(t, testing.AllocsPerRun(100, func() { _ = appendNum(make([]byte, 0, 32), 123.456) }), 1.0, "appendNum allocations")
}

func TestDeterministic(t *testing.T) {
	opts := Options{Title: "Same", Version: "1.0", Date: testDate}
	a := writeDoc(t, opts, 3)
	b := writeDoc(t, opts, 3)
	require.True(t, bytes.Equal(a, b), "two writes of the same drawing differ")
	// A different date changes only the dates and the /ID (and the XMP
	// document ID derived from the date).
	opts.Date = testDate.Add(36*time.Hour + 17*time.Minute)
	c := writeDoc(t, opts, 3)
	require.False(t, bytes.Equal(a, c), "the date does not reach the file")
	mask := regexp.MustCompile(`D:\d{14}Z00'00'|\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ|uuid:[0-9a-f-]+|/ID \[<[0-9A-F]+> <[0-9A-F]+>\]`)
	ma, mc := mask.ReplaceAll(a, []byte("X")), mask.ReplaceAll(c, []byte("X"))
	assert.True(t, bytes.Equal(ma, mc), "a different date changed more than dates and /ID")
	ida := regexp.MustCompile(`/ID \[<([0-9A-F]+)>`).FindSubmatch(a)
	idc := regexp.MustCompile(`/ID \[<([0-9A-F]+)>`).FindSubmatch(c)
	assert.False(t, ida == nil || idc == nil || bytes.Equal(ida[1], idc[1]), "/ID does not depend on the content")
}

func TestBadInput(t *testing.T) {
	good := a5Boxes()
	swap := good
	swap.Trim, swap.Bleed = good.Bleed, good.Trim
	zero := good
	zero.Media = canvas.Rect{}
	nan := good
	nan.Trim.X1 = math.NaN()
	outside := good
	outside.Bleed.X1 = good.Media.X1 + 1

	nanPath := func(c *canvas.Canvas) error {
		ctx := canvas.NewContext(c)
		p := &canvas.Path{}
		p.MoveTo(0, 0)
		p.LineTo(math.NaN(), 3)
		ctx.DrawPath(0, 0, p)
		return nil
	}
	infMatrix := func(c *canvas.Canvas) error {
		ctx := canvas.NewContext(c)
		ctx.SetView(canvas.Identity.Scale(math.Inf(1), 1))
		ctx.DrawPath(0, 0, canvas.Rectangle(2, 2))
		return nil
	}
	failing := func(c *canvas.Canvas) error { return errors.New("no data for this page") }
	panicking := func(c *canvas.Canvas) error { panic("boom") }

	cases := []struct {
		name  string
		setup PageSetup
		draw  func(*canvas.Canvas) error
		want  string
	}{
		{"boxes out of order (§14.11.2)", PageSetup{Boxes: swap}, nil, "TrimBox"},
		{"zero-size page", PageSetup{Boxes: zero}, nil, "MediaBox"},
		{"NaN box", PageSetup{Boxes: nan}, nil, "not finite"},
		{"bleed outside media", PageSetup{Boxes: outside}, nil, "BleedBox"},
		{"NaN coordinate", PageSetup{Boxes: good}, nanPath, "NaN"},
		{"infinite transform", PageSetup{Boxes: good}, infMatrix, "not finite"},
		{"draw error", PageSetup{Boxes: good}, failing, "no data for this page"},
		{"draw panic", PageSetup{Boxes: good}, panicking, "boom"},
		{"marks do not fit", PageSetup{Boxes: PageBoxes{Media: canvas.Rect{X1: 110, Y1: 110}, Bleed: canvas.Rect{X0: 5, Y0: 5, X1: 105, Y1: 105}, Trim: canvas.Rect{X0: 10, Y0: 10, X1: 100, Y1: 100}}, Marks: &MarkOptions{}}, nil, "crop marks need"},
		{"slug too long", PageSetup{Boxes: good, Marks: &MarkOptions{}, Slug: strings.Repeat("long slug ", 40)}, nil, "slug"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := EncodePage(c.setup, c.draw)
			assert.ErrorContains(t, err, c.want, "EncodePage")
			// through the Writer: the error surfaces and no trailer is
			// written, so the output is visibly not a finished PDF.
			var buf bytes.Buffer
			w := NewWriter(&buf, Options{Date: testDate})
			err = w.AddPage(c.setup, c.draw)
			if cerr := w.Close(); err == nil {
				err = cerr
			}
			assert.ErrorContains(t, err, c.want, "Writer")
			assert.ErrorContains(t, err, "page 1", "Writer error names the page")
			assert.False(t, bytes.Contains(buf.Bytes(), []byte("%%EOF")), "a failed document was finished anyway")
		})
	}
}

func TestNotAFont(t *testing.T) {
	_, err := canvas.LoadFont([]byte("this is not a font file"), 0, canvas.FontRegular)
	require.Error(t, err, "canvas accepted a non-font")
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{})
	_, err = w.RegisterFont(nil)
	assert.Error(t, err, "RegisterFont(nil) succeeded")
}

func TestEmptyDocument(t *testing.T) {
	var buf bytes.Buffer
	assert.Error(t, NewWriter(&buf, Options{}).Close(), "a document without pages closed without error")
}

// TestEncodedPageRoundTrip: a page encoded once, stored with
// encoding/gob and added to a later document gives the same bytes as
// drawing it there, once its fonts are registered.
func TestEncodedPageRoundTrip(t *testing.T) {
	// Go Bold: Go Regular is the slug font, which every writer knows.
	reg := loadFont(t, gobold.TTF)
	draw := func(c *canvas.Canvas) error {
		ctx := canvas.NewContext(c)
		g := canvas.NewLinearGradient(canvas.Point{X: 10, Y: 0}, canvas.Point{X: 100, Y: 0})
		g.Add(0, canvas.Hex("#3b0f70"))
		g.Add(1, canvas.Hex("#fcfdbf"))
		ctx.SetStrokeGradient(g)
		ctx.SetFillColor(canvas.Transparent)
		ctx.SetStrokeWidth(0.6)
		p := &canvas.Path{}
		p.MoveTo(10, 50)
		p.CubeTo(40, 90, 70, 10, 100, 50)
		ctx.DrawPath(0, 0, p)
		ctx.DrawText(10, 120, canvas.NewTextLine(reg.Face(9, canvas.Black), "cached page", canvas.Left))
		return nil
	}
	setup := PageSetup{Boxes: a5Boxes(), Marks: &MarkOptions{}, Slug: "cache test"}
	opts := Options{Title: "cache", Date: testDate}

	var direct bytes.Buffer
	w := NewWriter(&direct, opts)
	require.NoError(t, w.AddPage(setup, draw))
	require.NoError(t, w.Close())

	page, err := EncodePage(setup, draw)
	require.NoError(t, err)
	var store bytes.Buffer
	require.NoError(t, gob.NewEncoder(&store).Encode(page))
	var back EncodedPage
	require.NoError(t, gob.NewDecoder(&store).Decode(&back))

	var cached bytes.Buffer
	w = NewWriter(&cached, opts)
	require.ErrorContains(t, w.AddEncoded(&back), "not registered", "AddEncoded without the font")
	_, err = w.RegisterFont(reg)
	require.NoError(t, err)
	require.NoError(t, w.AddEncoded(&back))
	require.NoError(t, w.Close())
	assert.True(t, bytes.Equal(direct.Bytes(), cached.Bytes()), "a cached page gives other bytes than drawing it")
}

func TestStitchingFunction(t *testing.T) {
	// ISO 32000-1 §7.10.4: k functions, k-1 increasing Bounds, 2k Encode
	// values; constant pieces outside the first/last stop.
	cases := []struct {
		stops []Stop
		want  string
	}{
		{[]Stop{{0, 0, 0, 0, nil}, {1, 1, 1, 1, nil}}, "/Functions [ << /FunctionType 2 /Domain [0 1] /C0 [0 0 0] /C1 [1 1 1] /N 1 >> ] /Bounds [] /Encode [0 1]"},
		{[]Stop{{0.25, 1, 0, 0, nil}, {0.75, 0, 0, 1, nil}}, "/Bounds [0.25 0.75] /Encode [0 1 0 1 0 1]"},
		{[]Stop{{0, 1, 0, 0, nil}, {0.5, 0, 1, 0, nil}, {0.5, 0, 0, 1, nil}, {1, 1, 1, 1, nil}}, "/Bounds [0.5] /Encode [0 1 0 1]"},
		{[]Stop{{0.4, 0.2, 0.2, 0.2, nil}}, "/Bounds [0.4] /Encode [0 1 0 1]"},
	}
	for _, c := range cases {
		b, err := stitching(c.stops)
		if assert.NoError(t, err, "stitching(%v)", c.stops) {
			assert.Contains(t, string(b), c.want, "stitching(%v)", c.stops)
		}
	}
	_, err := stitching([]Stop{{0.5, 0, 0, 0, nil}, {0.2, 0, 0, 0, nil}})
	assert.Error(t, err, "stops out of order accepted")
}

// TestDigest: the writer's digest is the SHA-256 (FIPS 180-4, here
// crypto/sha256 over the bytes written) and the length of the whole file,
// trailer included, and it is given only after a successful Close.
func TestDigest(t *testing.T) {
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "Digest", Date: testDate})
	require.NoError(t, w.AddPage(PageSetup{Boxes: a5Boxes()}, testDrawing(reg, bold)))
	_, _, err := w.Digest()
	require.Error(t, err, "a digest before Close")
	require.NoError(t, w.Close())
	sum, size, err := w.Digest()
	require.NoError(t, err)
	assert.Equal(t, sha256.Sum256(buf.Bytes()), sum, "the digest, and SHA-256 of the bytes written")
	assert.Equal(t, int64(buf.Len()), size, "the size, and the bytes written")
	assert.True(t, bytes.HasSuffix(buf.Bytes(), []byte("%%EOF\n")), "the file ends with its trailer")

	empty := NewWriter(&bytes.Buffer{}, Options{})
	require.Error(t, empty.Close())
	_, _, err = empty.Digest()
	assert.Error(t, err, "a digest after a failed Close")
}

// TestBlockHasher: blocks hashed on their own goroutines give the
// SHA-256 (FIPS 180-4, here crypto/sha256 in one pass) of all the bytes
// in the order written, though the caller reuses its buffer at once
// (as bufio does) and more blocks are written than may wait at once.
func TestBlockHasher(t *testing.T) {
	var out bytes.Buffer
	b := &blockHasher{w: &out, h: sha256.New(), inFlight: make(chan struct{}, 2), free: make(chan []byte, 2)}
	buf := make([]byte, 0, 70000)
	for i := range 200 {
		buf = buf[:1+(i*7919)%70000]
		for k := range buf {
			buf[k] = byte(i*31 + k)
		}
		n, err := b.Write(buf)
		require.NoError(t, err)
		require.Equal(t, len(buf), n)
		clear(buf) // the writer must have copied what it hashes
	}
	want := sha256.Sum256(out.Bytes())
	assert.Equal(t, want[:], b.sum(nil), "blocks hashed in order, as written")
	assert.Equal(t, want[:], b.sum(nil), "a second sum is the same")
}
