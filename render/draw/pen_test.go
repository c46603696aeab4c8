package draw_test

import (
	"image/color"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/draw"
)

// Reference lengths, each from the unit definitions alone (ISO 32000-1
// §8.3.2.3: 1 pt = 1/72 in; 1 in = 25.4 mm exactly):
// 72 pt = 25.4 mm, 36 pt = 12.7 mm, 9 pt = 3.175 mm, 1 pt = 0.352777… mm.
// ISO 32000-1 section numbers in this file are from memory.

// TestPenMillimetres reads what the Pen hands canvas, in canvas's unit
// (mm), through a recording renderer: every coordinate, width and size is
// the point value × 25.4/72.
func TestPenMillimetres(t *testing.T) {
	fs := defaultFonts(t)
	grad := canvas.NewLinearGradient(canvas.Point{X: 0, Y: 0}, canvas.Point{X: 10, Y: 0})
	tests := []struct {
		name   string
		draw   func(draw.Pen)
		bounds canvas.Rect // path bounds in mm, without the stroke
		stroke float64     // stroke width in mm; 0: not stroked
		capper canvas.Capper
		source string
	}{
		{"A4 sheet", func(p draw.Pen) { p.FillRect(0, 0, 595.2756, 841.8898, black, nil) },
			canvas.Rect{X0: 0, Y0: 0, X1: 210, Y1: 297}, 0, nil,
			"ISO 216: A4 is 210 × 297 mm; 210 mm = 595.2756 pt, 297 mm = 841.8898 pt"},
		{"inch-long rule", func(p draw.Pen) { p.Line(72, 72, 144, 72, 1, black) },
			canvas.Rect{X0: 25.4, Y0: 25.4, X1: 50.8, Y1: 25.4}, 25.4 / 72, canvas.ButtCap,
			"72 pt = 1 in = 25.4 mm; a 1 pt rule is 25.4/72 mm wide"},
		{"vertical styled line", func(p draw.Pen) { p.StyledLine(36, 36, 36, 108, 2, black, 3, 1) },
			canvas.Rect{X0: 12.7, Y0: 12.7, X1: 12.7, Y1: 38.1}, 2 * 25.4 / 72, canvas.RoundCap,
			"36 pt = 12.7 mm, 108 pt = 38.1 mm, 2 pt = 0.7056 mm"},
		{"ringed dot", func(p draw.Pen) { p.Dot(36, 36, 9, black, black, 2) },
			canvas.Rect{X0: 9.525, Y0: 9.525, X1: 15.875, Y1: 15.875}, 2 * 25.4 / 72, nil,
			"centre ½ in = 12.7 mm, radius ⅛ in = 3.175 mm"},
		{"plain dot", func(p draw.Pen) { p.Dot(72, 0, 1, black, nil, 0) },
			canvas.Rect{X0: 25.4 - 25.4/72, Y0: -25.4 / 72, X1: 25.4 + 25.4/72, Y1: 25.4 / 72}, 0, nil,
			"radius 1 pt = 25.4/72 mm; no ring: no stroke"},
		{"gradient stroke", func(p draw.Pen) {
			p.StrokeGradient(canvas.Line(10, 0).Translate(5, 5), grad, 3)
		}, canvas.Rect{X0: 5, Y0: 5, X1: 15, Y1: 5}, 3 * 25.4 / 72, canvas.RoundCap,
			"the path is already in mm (package doc); 3 pt = 1.0583 mm"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := &recorder{w: 300, h: 300}
			tc.draw(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs})
			require.Len(t, r.calls, 1, "one path drawn")
			c := r.calls[0]
			got := []float64{c.bounds.X0, c.bounds.Y0, c.bounds.X1, c.bounds.Y1}
			want := []float64{tc.bounds.X0, tc.bounds.Y0, tc.bounds.X1, tc.bounds.Y1}
			assert.InDeltaSlice(t, want, got, 1e-4, "bounds in mm (%s)", tc.source)
			if tc.stroke == 0 {
				assert.Zero(t, c.style.Stroke.Color.A, "not stroked (%s)", tc.source)
				return
			}
			assert.InDelta(t, tc.stroke, c.style.StrokeWidth, 1e-12, "stroke width in mm (%s)", tc.source)
			if tc.capper != nil {
				assert.Equal(t, tc.capper, c.style.StrokeCapper, "cap (%s)", tc.source)
			}
		})
	}
}

// TestPenStyles: the style each drawing call sets, and that a call
// leaves nothing of the last call's style behind.
func TestPenStyles(t *testing.T) {
	r := &recorder{w: 100, h: 100}
	p := draw.Pen{Ctx: canvas.NewContext(r)}
	red := color.RGBA{0xff, 0, 0, 0xff}
	p.StyledLine(0, 0, 10, 0, 1, red, 2, 1)
	p.Line(0, 0, 10, 0, 1, red)
	g := p.Gradient(0, 72, 0)
	p.FillRect(0, 0, 72, 72, red, g)
	p.FillRect(0, 0, 72, 72, red, nil)
	require.Len(t, r.calls, 4)
	// Dashes go to canvas as given (the documented contract), and a plain
	// line after a dashed one is solid again.
	assert.Equal(t, []float64{2, 1}, r.calls[0].style.Dashes, "StyledLine dashes")
	assert.Empty(t, r.calls[1].style.Dashes, "Line after StyledLine is solid")
	assert.Equal(t, red, r.calls[1].style.Stroke.Color, "line colour")
	assert.Zero(t, r.calls[1].style.Fill.Color.A, "a line is not filled")
	// A rectangle with a gradient is filled with it, else with the colour;
	// neither is stroked (a stroke would grow it by half its width).
	assert.True(t, r.calls[2].style.Fill.IsGradient(), "FillRect with a gradient")
	assert.Equal(t, red, r.calls[3].style.Fill.Color, "FillRect without one")
	for i := 2; i < 4; i++ {
		assert.Zero(t, r.calls[i].style.Stroke.Color.A, "rectangle %d not stroked", i)
	}
}

// TestPenGradientEnds: Gradient's ends are the point values in mm.
func TestPenGradientEnds(t *testing.T) {
	p := draw.Pen{}
	g := p.Gradient(72, 144, 36)
	// 72 pt = 25.4 mm, 144 pt = 50.8 mm, 36 pt = 12.7 mm (1 pt = 1/72 in).
	assert.InDeltaSlice(t, []float64{25.4, 12.7, 50.8, 12.7}, []float64{g.Start.X, g.Start.Y, g.End.X, g.End.Y}, 1e-12, "gradient ends in mm")
}

// TestPenText: a line of text starts at the point position in mm, and its
// face is set at the size in points (canvas's Face takes points and keeps
// the size in mm: 12 pt = 4.2333 mm).
func TestPenText(t *testing.T) {
	fs := defaultFonts(t)
	for _, tc := range []struct {
		size, x, y float64
		wantX      float64 // origin in mm
		wantY      float64
		wantSize   float64 // face size in mm
		source     string
	}{
		{12, 72, 36, 25.4, 12.7, 12 * 25.4 / 72, "72 pt = 25.4 mm, 36 pt = 12.7 mm; 12 pt = 4.2333 mm"},
		{6, 0, 720, 0, 254, 6 * 25.4 / 72, "720 pt = 10 in = 254 mm; 6 pt = 2.1167 mm"},
	} {
		r := &recorder{w: 300, h: 300}
		p := draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}
		p.Text(fonts.Regular, tc.size, black, tc.x, tc.y, canvas.Left, "Hg")
		p.Text(fonts.Regular, tc.size, black, tc.x, tc.y, canvas.Left, "") // draws nothing
		require.Len(t, r.calls, 1, "%s: one text drawn, the empty one left out", tc.source)
		c := r.calls[0]
		require.NotNil(t, c.text)
		assert.InDeltaSlice(t, []float64{tc.wantX, tc.wantY}, []float64{c.origin.X, c.origin.Y}, 1e-9, "origin in mm (%s)", tc.source)
		assert.InDelta(t, tc.wantSize, c.text.MostCommonFontFace().Size, 1e-9, "face size in mm (%s)", tc.source)
	}
}

// TestPenOnPaper draws with the Pen through canvas's own PDF renderer and
// reads the marks back from poppler's rendering (pdftoppm, 720 dpi,
// anti-aliasing off), in PDF points: what a printer's RIP would place.
// The expected boxes are worked from the point values and the PDF rules
// for strokes alone.
func TestPenOnPaper(t *testing.T) {
	fs := defaultFonts(t)
	const dpi = 720
	const tol = 1.5 * 72 / dpi // pixel edges: 0.1 pt, and a half pixel of rounding
	tests := []struct {
		name   string
		draw   func(draw.Pen)
		want   [4]float64 // x0, y0, x1, y1 in pt from the lower-left corner
		source string
	}{
		{"butt-capped rule", func(p draw.Pen) { p.Line(20, 100, 180, 100, 4, black) }, [4]float64{20, 98, 180, 102},
			"ISO 32000-1 §8.4.3.3: butt caps end square at the end points; the stroke reaches half its width either side"},
		{"round-capped rule", func(p draw.Pen) { p.StyledLine(40, 50, 160, 50, 6, black) }, [4]float64{37, 47, 163, 53},
			"ISO 32000-1 §8.4.3.3: a round cap is a half disc of the line width's diameter beyond the end point"},
		{"rectangle", func(p draw.Pen) { p.FillRect(30, 40, 130, 90, black, nil) }, [4]float64{30, 40, 130, 90},
			"a fill covers exactly its path (ISO 32000-1 §8.5.3.1)"},
		{"plain dot", func(p draw.Pen) { p.Dot(100, 100, 10, black, nil, 0) }, [4]float64{90, 90, 110, 110},
			"a circle of radius 10 pt about (100, 100)"},
		{"ringed dot", func(p draw.Pen) { p.Dot(100, 100, 10, black, black, 2) }, [4]float64{89, 89, 111, 111},
			"the ring's stroke adds half its width, 1 pt, outside the circle (ISO 32000-1 §8.5.3.2)"},
		// The rule README states for peak and end dots: set inside the
		// plot by the dot's radius (and half its ring), a dot never leaves
		// the plot. Dots at the four corners of the plot [20, 30, 180, 150]
		// fill it out to its edges and no further.
		{"dots inset in a plot", func(p draw.Pen) {
			const r, ring = 4, 1.5
			in := r + ring/2
			for _, c := range [][2]float64{{20 + in, 30 + in}, {180 - in, 30 + in}, {20 + in, 150 - in}, {180 - in, 150 - in}} {
				p.Dot(c[0], c[1], r, black, black, ring)
			}
		}, [4]float64{20, 30, 180, 150}, "README (panels): end and peak dots sit inside the plot by their radius"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := inkBox(t, pdfOf(t, fs, 200, 200, tc.draw), dpi)
			assert.InDeltaSlice(t, tc.want[:], got[:], tol, "inked box in pt (%s)", tc.source)
		})
	}
}

// TestTextOnPaper: where poppler finds the words the Pen sets. Left,
// centred and right alignment put the word's start, middle and end at x;
// its advance width is what fonts.Set measured; the box's height scales
// with the size, so the size reached the PDF in points.
func TestTextOnPaper(t *testing.T) {
	fs := defaultFonts(t)
	const h = 200
	path := pdfOf(t, fs, 300, h, func(p draw.Pen) {
		p.Text(fonts.Figures, 12, black, 40, 150, canvas.Left, "1868")
		p.Text(fonts.Figures, 12, black, 150, 150, canvas.Center, "1900")
		p.Text(fonts.Figures, 12, black, 260, 150, canvas.Right, "2025")
		p.Text(fonts.Figures, 6, black, 150, 50, canvas.Center, "1950")
	})
	words := popplerWords(t, path)
	require.Len(t, words, 4, "words poppler finds: %v", words)
	byText := map[string]word{}
	for _, w := range words {
		byText[w.text] = w
	}
	for _, tc := range []struct {
		text  string
		size  float64
		align canvas.TextAlign
		x     float64
	}{
		{"1868", 12, canvas.Left, 40},
		{"1900", 12, canvas.Center, 150},
		{"2025", 12, canvas.Right, 260},
		{"1950", 6, canvas.Center, 150},
	} {
		w, ok := byText[tc.text]
		require.True(t, ok, "poppler lacks %q: %v", tc.text, words)
		at := map[canvas.TextAlign]float64{canvas.Left: w.x0, canvas.Center: (w.x0 + w.x1) / 2, canvas.Right: w.x1}[tc.align]
		// 0.05 pt: poppler sums the PDF's glyph widths (1/1000 em each).
		assert.InDelta(t, tc.x, at, 0.05, "%s: aligned point in pt", tc.text)
		assert.InDelta(t, fs.Width(fonts.Figures, tc.size, tc.text), w.x1-w.x0, 0.05, "%s: advance width in pt", tc.text)
	}
	// Same face, half the size: half the height (poppler's box is the
	// font's ascent to descent at the size).
	big, small := byText["1900"], byText["1950"]
	assert.InDelta(t, (big.y1-big.y0)/2, small.y1-small.y0, 0.02, "box height at 6 pt against 12 pt")
}
