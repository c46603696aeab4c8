package svg

import (
	"bytes"
	"encoding/base64"
	"encoding/xml"
	"image/color"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/render/tooltest"

	otf "sheaf/render/internal/sfnt"
)

const mm = 25.4 / 72 // millimetres per point

func goFonts(t testing.TB) (*canvas.Font, *canvas.Font) {
	t.Helper()
	r, err := canvas.LoadFont(goregular.TTF, 0, canvas.FontRegular)
	require.NoError(t, err)
	b, err := canvas.LoadFont(gobold.TTF, 0, canvas.FontRegular)
	require.NoError(t, err)
	return r, b
}

// sample draws a bit of everything the page composer uses, in points.
func sample(t testing.TB, opts Options) []byte {
	t.Helper()
	reg, bold := goFonts(t)
	return sampleWith(t, opts, reg, bold)
}

func sampleWith(t testing.TB, opts Options, reg, bold *canvas.Font) []byte {
	t.Helper()
	d, err := New(300, 150, opts)
	require.NoError(t, err)
	ctx := canvas.NewContext(d)
	d.BeginGroup("panel-1", "boiler", `How often "boiler" was used & when`)
	g := canvas.NewLinearGradient(canvas.Point{X: 10 * mm, Y: 20 * mm}, canvas.Point{X: 140 * mm, Y: 20 * mm})
	g.Add(0, color.RGBA{0xe0, 0x60, 0x60, 0xff})
	g.Add(1, color.RGBA{0x10, 0x40, 0x30, 0xff})
	p := &canvas.Path{}
	p.MoveTo(10*mm, 20*mm)
	p.CubeTo(40*mm, 60*mm, 80*mm, 60*mm, 110*mm, 20*mm)
	p.CubeTo(120*mm, 7*mm, 130*mm, 7*mm, 140*mm, 30*mm)
	ctx.SetFillColor(canvas.Transparent)
	ctx.SetStrokeGradient(g)
	ctx.SetStrokeWidth(0.75 * mm)
	ctx.SetStrokeCapper(canvas.RoundCap)
	ctx.SetStrokeJoiner(canvas.RoundJoin)
	ctx.DrawPath(0, 0, p)
	// The same gradient at another height: written once.
	ctx.DrawPath(0, 0, p.Copy().Translate(0, 30*mm))
	d.EndGroup()
	ctx.ResetStyle()
	ctx.SetFillColor(color.RGBA{0x9a, 0x9a, 0x9a, 0xff})
	ctx.DrawPath(150*mm, 10*mm, canvas.Rectangle(100*mm, 0.75*mm))
	ctx.DrawPath(200*mm, 100*mm, canvas.Circle(3*mm))
	ctx.ResetStyle()
	ctx.SetFillColor(canvas.Transparent)
	ctx.SetStrokeColor(canvas.Black)
	ctx.SetStrokeWidth(1 * mm)
	ctx.SetDashes(0, 5, 3)
	ctx.DrawPath(0, 0, canvas.Line(100*mm, 0).Translate(150*mm, 40*mm))
	ctx.DrawText(10*mm, 130*mm, canvas.NewTextLine(bold.Face(12, canvas.Black), "Maßstab & <co>", canvas.Left))
	ctx.DrawText(290*mm, 130*mm, canvas.NewTextLine(reg.Face(9, color.RGBA{0x5c, 0x5c, 0x5c, 0xff}), "1868", canvas.Right))
	ctx.DrawText(150*mm, 110*mm, canvas.NewTextLine(reg.Face(9, canvas.Black), "1900", canvas.Center))
	var buf bytes.Buffer
	_, err = d.WriteTo(&buf)
	require.NoError(t, err)
	return buf.Bytes()
}

// TestWellFormed parses the document with encoding/xml (Go's reference
// XML parser) and checks the root: width and height in px with a viewBox
// of the same numbers, so one user unit is one CSS px; 300 × 150 pt is
// 400 × 200 px at 1 px = 0.75 pt (CSS Values and Units Level 3 §5.2).
func TestWellFormed(t *testing.T) {
	for _, embed := range []bool{false, true} {
		b := sample(t, Options{Title: "A & B", Desc: "d", FontFamily: `"DejaVu Sans Condensed", sans-serif`, EmbedFonts: embed, Background: color.White})
		dec := xml.NewDecoder(bytes.NewReader(b))
		var root struct {
			XMLName xml.Name
			Width   string `xml:"width,attr"`
			Height  string `xml:"height,attr"`
			ViewBox string `xml:"viewBox,attr"`
			Role    string `xml:"role,attr"`
			Title   string `xml:"title"`
			Desc    string `xml:"desc"`
		}
		require.NoError(t, dec.Decode(&root), "embed=%v: not well-formed XML", embed)
		assert.False(t, root.XMLName.Space != "http://www.w3.org/2000/svg" || root.XMLName.Local != "svg", "root is %v", root.XMLName)
		assert.False(t, root.Width != "400" || root.Height != "200" || root.ViewBox != "0 0 400 200", "width %q height %q viewBox %q; want 400, 200, \"0 0 400 200\"", root.Width, root.Height, root.ViewBox)
		assert.False(t, root.Role != "img" || root.Title != "A & B" || root.Desc != "d", "role %q title %q desc %q", root.Role, root.Title, root.Desc)
	}
}

// TestUnits checks the mapping from canvas millimetres to px against CSS
// Values and Units Level 3 §5.2 (1 in = 96 px = 25.4 mm = 72 pt) with y
// flipped: a 1 in square drawn 1 in from the left and bottom of a 4 in ×
// 3 in page is 96 px wide, its top edge 3 × 96 − 2 × 96 = 96 px from the
// top.
func TestUnits(t *testing.T) {
	d, err := New(4*72, 3*72, Options{})
	require.NoError(t, err)
	ctx := canvas.NewContext(d)
	ctx.SetFillColor(canvas.Black)
	ctx.DrawPath(25.4, 25.4, canvas.Rectangle(25.4, 25.4))
	var buf bytes.Buffer
	_, err = d.WriteTo(&buf)
	require.NoError(t, err)
	s := buf.String()
	assert.True(t, strings.Contains(s, `width="384" height="288"`), "4 × 3 in should be 384 × 288 px:\n%s", s)
	pts := pathPoints(t, regexp.MustCompile(`d="([^"]*)"`).FindStringSubmatch(s)[1])
	want := [][2]float64{{96, 192}, {192, 192}, {192, 96}, {96, 96}}
	for _, w := range want {
		found := false
		for _, p := range pts {
			if math.Abs(p[0]-w[0]) < 1e-9 && math.Abs(p[1]-w[1]) < 1e-9 {
				found = true
			}
		}
		assert.True(t, found, "corner %v missing from %v", w, pts)
	}
}

// pathPoints parses SVG path data (SVG 1.1 §8.3, the grammar: commands
// M h v l c s z, absolute and relative, packed numbers) into the absolute
// end and control points, for the tests.
func pathPoints(t testing.TB, d string) [][2]float64 {
	t.Helper()
	tok := regexp.MustCompile(`[MmLlHhVvCcSsZz]|-?(?:\d+\.?\d*|\.\d+)`)
	var out [][2]float64
	var cur, start [2]float64
	var cmd string
	toks := tok.FindAllString(d, -1)
	num := func(i *int) float64 {
		v, err := strconv.ParseFloat(toks[*i], 64)
		require.NoError(t, err, "path data %q", d)
		*i++
		return v
	}
	for i := 0; i < len(toks); {
		if strings.ContainsAny(toks[i], "MmLlHhVvCcSsZz") {
			cmd = toks[i]
			i++
			if cmd == "z" || cmd == "Z" {
				cur = start
				continue
			}
		}
		switch cmd {
		case "M":
			cur = [2]float64{num(&i), num(&i)}
			start = cur
			out = append(out, cur)
		case "h":
			cur[0] += num(&i)
			out = append(out, cur)
		case "v":
			cur[1] += num(&i)
			out = append(out, cur)
		case "l":
			cur = [2]float64{cur[0] + num(&i), cur[1] + num(&i)}
			out = append(out, cur)
		case "c":
			for k := 0; k < 2; k++ {
				out = append(out, [2]float64{cur[0] + num(&i), cur[1] + num(&i)})
			}
			cur = [2]float64{cur[0] + num(&i), cur[1] + num(&i)}
			out = append(out, cur)
		case "s":
			out = append(out, [2]float64{cur[0] + num(&i), cur[1] + num(&i)})
			cur = [2]float64{cur[0] + num(&i), cur[1] + num(&i)}
			out = append(out, cur)
		default:
			require.FailNow(t, "unexpected path command", "path data %q: unexpected command %q", d, cmd)
		}
	}
	return out
}

// TestPathDataRoundTrip draws a long random-walk cubic spline and checks
// that every end point read back from the compact path data lies within
// 0.05 px of where it was drawn (rounding to the 0.1 px grid, never
// accumulating along the line).
func TestPathDataRoundTrip(t *testing.T) {
	d, err := New(900, 200, Options{})
	require.NoError(t, err)
	p := &canvas.Path{}
	var ends [][2]float64 // in px, y down
	y := 100.0
	x := 5.0
	p.MoveTo(x*mm, y*mm)
	ends = append(ends, [2]float64{x * 4 / 3, (200 - y) * 4 / 3})
	seed := uint32(7)
	rnd := func() float64 { seed = seed*1664525 + 1013904223; return float64(seed>>8) / (1 << 24) }
	for range 400 {
		nx, ny := x+2.2, math.Max(2, math.Min(198, y+(rnd()-0.5)*20))
		p.CubeTo((x+0.73)*mm, y*mm, (nx-0.73)*mm, ny*mm, nx*mm, ny*mm)
		x, y = nx, ny
		ends = append(ends, [2]float64{x * 4 / 3, (200 - y) * 4 / 3})
	}
	ctx := canvas.NewContext(d)
	ctx.SetFillColor(canvas.Transparent)
	ctx.SetStrokeColor(canvas.Black)
	ctx.SetStrokeWidth(0.5)
	ctx.DrawPath(0, 0, p)
	var buf bytes.Buffer
	_, err = d.WriteTo(&buf)
	require.NoError(t, err)
	data := regexp.MustCompile(`d="([^"]*)"`).FindStringSubmatch(buf.String())[1]
	// The first M, then every segment's end point.
	got := append([][2]float64{pathPoints(t, data)[0]}, segmentEnds(t, data)...)
	require.Len(t, got, len(ends), "read back %d points, drew %d", len(got), len(ends))
	worst := 0.0
	for k := range ends {
		worst = math.Max(worst, math.Hypot(got[k][0]-ends[k][0], got[k][1]-ends[k][1]))
	}
	assert.LessOrEqual(t, worst, 0.05*math.Sqrt2+1e-9, "an end point moved %.3f px; rounding to 0.1 px allows %.3f", worst, 0.05*math.Sqrt2)
	assert.Positive(t, strings.Count(data, "s"), "a C¹ spline should use the s shorthand; path data: %.200s", data)
}

// segmentEnds returns the end point of every segment after the first M.
func segmentEnds(t testing.TB, d string) [][2]float64 {
	t.Helper()
	tok := regexp.MustCompile(`[MmLlHhVvCcSsZz]|-?(?:\d+\.?\d*|\.\d+)`)
	toks := tok.FindAllString(d, -1)
	var cur [2]float64
	var out [][2]float64
	cmd := ""
	num := func(i *int) float64 { v, _ := strconv.ParseFloat(toks[*i], 64); *i++; return v }
	for i := 0; i < len(toks); {
		if strings.ContainsAny(toks[i], "MmLlHhVvCcSsZz") {
			cmd = toks[i]
			i++
		}
		switch cmd {
		case "M":
			cur = [2]float64{num(&i), num(&i)}
		case "c":
			i += 4
			cur = [2]float64{cur[0] + num(&i), cur[1] + num(&i)}
			out = append(out, cur)
		case "s":
			i += 2
			cur = [2]float64{cur[0] + num(&i), cur[1] + num(&i)}
			out = append(out, cur)
		default:
			require.FailNow(t, "unexpected path command", "unexpected %q", cmd)
		}
	}
	return out
}

// TestGradientsAndText checks the structure the web team relies on.
func TestGradientsAndText(t *testing.T) {
	s := string(sample(t, Options{FontFamily: `"Go", sans-serif`}))
	checks := []struct {
		what, re string
		n        int
	}{
		// Two curves with the same horizontal gradient at different
		// heights share one definition (y does not change a horizontal
		// gradient).
		{"one gradient, in user space", `<linearGradient id="g1" gradientUnits="userSpaceOnUse"`, 1},
		{"no second gradient", `id="g2"`, 0},
		{"both curves use it", `stroke="url\(#g1\)"`, 2},
		{"bold text as real text", `<text [^>]*font-weight="bold"[^>]*>Maßstab &amp; &lt;co&gt;</text>`, 1},
		{"right-aligned text anchored at its end", `<text x="386.7" [^>]*text-anchor="end"[^>]*>1868</text>`, 1},
		{"centred text anchored at its middle", `<text x="200" [^>]*text-anchor="middle"[^>]*>1900</text>`, 1},
		{"12 pt is 16 px", `font-size="16"`, 1},
		{"panel group with title and desc", `<g id="panel-1" role="img"><title>boiler</title><desc>How often &#34;boiler&#34; was used &amp; when</desc>`, 1},
		{"font family on the root", `font-family="&#34;Go&#34;, sans-serif"`, 1},
		// canvas dashes are in stroke widths (canvas.ScaleDash): 5 and 3 ×
		// a 1 pt stroke × 4/3 px/pt.
		{"dashes scaled by the stroke width", `stroke-width="1.3" stroke-dasharray="6.7 4"`, 1},
		{"round caps", `stroke-linecap="round"`, 2},
	}
	for _, c := range checks {
		assert.Equal(t, c.n, len(regexp.MustCompile(c.re).FindAllString(s, -1)), "%s: times %q is found", c.what, c.re)
	}
}

// TestEmbeddedSubset reads the embedded font back with tdewolff/font (a
// general-purpose SFNT parser): it must parse, hold every character drawn
// and far fewer glyphs than Go Regular's 600-odd.
func TestEmbeddedSubset(t *testing.T) {
	s := string(sample(t, Options{EmbedFonts: true}))
	m := regexp.MustCompile(`font-weight:(\w+);font-style:normal;src:url\(data:font/ttf;base64,([A-Za-z0-9+/=]+)\)`).FindAllStringSubmatch(s, -1)
	require.Len(t, m, 2, "want 2 @font-face rules (regular and bold), found %d", len(m))
	used := map[string]string{"bold": "Maßstab & <co>", "normal": "18681900"}
	for _, mm := range m {
		raw, err := base64.StdEncoding.DecodeString(mm[2])
		require.NoError(t, err)
		f, err := font.ParseSFNT(raw, 0)
		require.NoError(t, err, "%s subset does not parse", mm[1])
		for _, r := range used[mm[1]] {
			assert.False(t, f.GlyphIndex(r) == 0, "%s subset lacks %q", mm[1], r)
		}
		// OpenType "head" table: the whole file sums to 0xB1B0AFBA once
		// checksumAdjustment is in, and the modified date is the font's
		// own (not the clock: builds must not differ).
		assert.Equal(t, uint32(0xB1B0AFBA), otf.Checksum(raw), "%s subset: file checksum (0xB1B0AFBA = 2981146554)", mm[1])
		orig := goregular.TTF
		if mm[1] == "bold" {
			orig = gobold.TTF
		}
		of, _ := font.ParseSFNT(orig, 0)
		assert.Equal(t, of.Head.Modified, f.Head.Modified, "%s subset: modified %v, the font says %v", mm[1], f.Head.Modified, of.Head.Modified)
		assert.LessOrEqual(t, int(f.NumGlyphs()), 20, "%s subset: glyphs; want only those drawn", mm[1])
	}
	fam := regexp.MustCompile(`font-family="(` + EmbeddedFamily + `-[0-9a-f]{8}), sans-serif"`).FindStringSubmatch(s)
	require.False(t, fam == nil, "embedded family (%s-HASH) should lead the font-family list", EmbeddedFamily)
	assert.Equal(t, len(m), strings.Count(s, `font-family:"`+fam[1]+`"`), "every @font-face should be named %s", fam[1])
}

// TestDeterministic draws the same thing twice: byte-identical.
func TestDeterministic(t *testing.T) {
	a := sample(t, Options{EmbedFonts: true, Title: "t"})
	b := sample(t, Options{EmbedFonts: true, Title: "t"})
	assert.True(t, bytes.Equal(a, b), "two renderings differ")
}

// TestRsvgRenders has librsvg (rsvg-convert, Debian librsvg2-bin), an
// independent SVG implementation, render the sample to PNG at its own
// size without complaint.
func TestRsvgRenders(t *testing.T) {
	rsvg := tooltest.Require(t, "rsvg-convert", "librsvg2-bin")
	dir := t.TempDir()
	in := filepath.Join(dir, "s.svg")
	require.NoError(t, os.WriteFile(in, sample(t, Options{EmbedFonts: true}), 0o644))
	out, err := exec.Command(rsvg, "-o", filepath.Join(dir, "s.png"), in).CombinedOutput()
	require.NoError(t, err, "rsvg-convert: %s", out)
	require.Empty(t, out, "rsvg-convert says something")
}

// TestBadInput: errors, never panics.
func TestBadInput(t *testing.T) {
	for _, wh := range [][2]float64{{0, 10}, {10, -1}, {math.NaN(), 10}, {math.Inf(1), 10}} {
		_, err := New(wh[0], wh[1], Options{})
		assert.Error(t, err, "New(%v, %v)", wh[0], wh[1])
	}
	d, _ := New(10, 10, Options{})
	d.EndGroup()
	_, err := d.WriteTo(&bytes.Buffer{})
	assert.Error(t, err, "EndGroup without BeginGroup should be reported")
	d, _ = New(10, 10, Options{})
	d.BeginGroup("a", "t", "")
	_, err = d.WriteTo(&bytes.Buffer{})
	assert.Error(t, err, "an open group should be reported")
	d, _ = New(10, 10, Options{})
	d.BeginGroup("a", "t", "")
	d.EndGroup()
	d.BeginGroup("a", "t", "")
	d.EndGroup()
	_, err = d.WriteTo(&bytes.Buffer{})
	assert.Error(t, err, "a repeated id should be reported")
}

// TestNumbers checks the number formats against the SVG path grammar
// (SVG 1.1 §8.3.9: a number may start with "." or "-", and a sign or a
// second decimal point ends the previous number).
func TestNumbers(t *testing.T) {
	for _, c := range []struct {
		tenths  int64
		compact bool
		want    string
	}{
		{0, false, "0"}, {0, true, "0"}, {5, false, "0.5"}, {5, true, ".5"}, {-5, true, "-.5"},
		{123, true, "12.3"}, {-120, false, "-12"}, {10, true, "1"},
	} {
		assert.Equal(t, c.want, string(appendTenths(nil, c.tenths, c.compact)), "appendTenths(%d, %v)", c.tenths, c.compact)
	}
	var b bytes.Buffer
	w := pathWriter{b: &b}
	w.cmd('M', true)
	for _, n := range []int64{15, -20, 5, 5, 30, 2} {
		w.num(n)
	}
	assert.Equal(t, "M1.5-2 .5.5 3 .2", b.String(), "packed path data")
}
