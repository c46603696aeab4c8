package draw_test

import (
	"math/rand/v2"
	"slices"
	"sort"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font"
	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"

	"sheaf/layout/fonts"
	"sheaf/render/draw"
	"sheaf/specs"
)

// roundSteps are the year steps a reader counts in without effort: 1, 2,
// 2.5 and 5 times a power of ten (common practice for axis ticks).
var roundSteps = []int{5, 10, 20, 25, 50, 100, 200, 250, 500, 1000}

// labelRoom is what one label needs along the axis: the width of a year
// set in tabular figures plus an em of clear space to the next one (an em
// between labels: common practice for axis labels).
func labelRoom(fs *fonts.Set, size float64) float64 {
	return fs.Width(fonts.Figures, size, "0000") + size
}

// tickSeries is the ticks of step over span: every multiple of step in
// it.
func tickSeries(span specs.Span, step int) []int {
	var ys []int
	for y := span.From; y <= span.To; y++ {
		if y%step == 0 {
			ys = append(ys, y)
		}
	}
	return ys
}

// TestTickYearsWorked: rows worked by hand. The default figures are
// DejaVu Sans Condensed's digits, 0.572 em wide (1172 of 2048 units; read
// below with golang.org/x/image/font/sfnt), so a label's room is
// 4 × 0.572 + 1 = 3.29 em;
// each row says for what range of that room its answer holds, so a
// change of default font that moves the answer shows.
func TestTickYearsWorked(t *testing.T) {
	fs := defaultFonts(t)
	tests := []struct {
		span        specs.Span
		width, size float64
		want        []int
		why         string
	}{
		{specs.Span{From: 1900, To: 2000}, 1000, 8, tickSeries(specs.Span{From: 1900, To: 2000}, 5),
			"10 pt a year: 5 years are 50 pt, room 26.3 pt (holds up to 50)"},
		{specs.Span{From: 1868, To: 2025}, 400, 7, []int{1870, 1880, 1890, 1900, 1910, 1920, 1930, 1940, 1950, 1960, 1970, 1980, 1990, 2000, 2010, 2020},
			"2.548 pt a year: 5 years 12.7 pt, 10 years 25.5 pt, room 23.0 pt (holds for 12.7 < room ≤ 25.5)"},
		{specs.Span{From: 1868, To: 2025}, 100, 6, []int{1900, 1950, 2000},
			"0.637 pt a year: 25 years 15.9 pt, 50 years 31.8 pt, room 19.7 pt (holds for 15.9 < room ≤ 31.8)"},
		{specs.Span{From: 1000, To: 2025}, 120, 6, []int{1000, 1200, 1400, 1600, 1800, 2000},
			"0.117 pt a year: 100 years 11.7 pt, 200 years 23.4 pt, room 19.7 pt (holds for 11.7 < room ≤ 23.4)"},
		{specs.Span{From: 1868, To: 1899}, 200, 6, []int{1870, 1875, 1880, 1885, 1890, 1895},
			"6.45 pt a year: 5 years 32.3 pt ≥ room 19.7 pt; the first tick is the first multiple of 5 in the span"},
		{specs.Span{From: 2000, To: 2010}, 300, 9, []int{2000, 2005, 2010},
			"30 pt a year: 5 years 150 pt, room 29.6 pt; both ends are multiples"},
		{specs.Span{From: 1900, To: 2000}, 600, 10, tickSeries(specs.Span{From: 1900, To: 2000}, 10),
			"6 pt a year: 5 years are 30 pt, under the room of 32.9 pt by less than the em in it; 10 years 60 pt"},
		{specs.Span{From: 1900, To: 2000}, 1, 6, nil,
			"0.01 pt a year: even 1000 years are 10 pt, under the room of 19.7 pt: no ticks rather than colliding ones"},
	}
	for _, tc := range tests {
		got := draw.TickYears(fs, tc.span, tc.width, tc.size)
		assert.Equal(t, tc.want, got, "%v over %v pt at %v pt: %s", tc.span, tc.width, tc.size, tc.why)
	}
	// The rows above rest on this width; if the default font changes,
	// rework them. x/image's sfnt reads the advance from the font file.
	f, err := sfnt.Parse(fs.Bytes(fonts.Figures))
	require.NoError(t, err)
	var buf sfnt.Buffer
	upem := f.UnitsPerEm()
	var adv fixed.Int26_6
	for _, d := range "0123456789" {
		g, err := f.GlyphIndex(&buf, d)
		require.NoError(t, err)
		a, err := f.GlyphAdvance(&buf, g, fixed.I(int(upem)), font.HintingNone)
		require.NoError(t, err)
		if d == '0' {
			adv = a
		}
		assert.Equal(t, adv, a, "digit %c: tabular (every digit one advance)", d)
	}
	assert.Equal(t, 1172.0/2048, float64(adv)/64/float64(upem), "advance of 0 in em")
	assert.InDelta(t, 4*float64(adv)/64/float64(upem)*8, fs.Width(fonts.Figures, 8, "0000"), 0.01, "four figures at 8 pt: fonts.Set against sfnt")
}

// TestTickYearsRule checks the rule on random spans, widths and sizes:
// the ticks are every multiple of one round step in the span, neighbours
// are at least a label's room apart, and the next smaller round step
// would not be (so no sparser ticks than needed).
func TestTickYearsRule(t *testing.T) {
	fs := defaultFonts(t)
	r := rand.New(rand.NewPCG(18, 4))
	for trial := range 2000 {
		from := 1000 + r.IntN(1000)
		span := specs.Span{From: from, To: from + 1 + r.IntN(400)}
		width := 5 + 600*r.Float64()
		size := 4 + 8*r.Float64()
		ys := draw.TickYears(fs, span, width, size)
		perYear := width / float64(span.To-span.From)
		room := labelRoom(fs, size)
		where := []any{"trial %d: %v over %.2f pt at %.2f pt: %v", trial, span, width, size, ys}
		// The step: the smallest round step that leaves room.
		i := slices.IndexFunc(roundSteps, func(s int) bool { return float64(s)*perYear >= room })
		if i < 0 {
			require.Nil(t, ys, where...)
			continue
		}
		step := roundSteps[i]
		require.Equal(t, tickSeries(span, step), ys, where...)
		for k := 1; k < len(ys); k++ {
			require.GreaterOrEqual(t, float64(ys[k]-ys[k-1])*perYear, room, where...)
		}
		if i > 0 {
			require.Less(t, float64(roundSteps[i-1])*perYear, room, where...)
		}
	}
}

// TestTickLabelsOnPaper sets the labels centred on their ticks with the
// Pen, as panels and the key do, and asks poppler where the words are:
// neighbouring labels never touch and keep an em between them.
func TestTickLabelsOnPaper(t *testing.T) {
	fs := defaultFonts(t)
	const margin = 30
	for _, tc := range []struct {
		span        specs.Span
		width, size float64
	}{
		{specs.Span{From: 1868, To: 2025}, 400, 7},
		{specs.Span{From: 1868, To: 2025}, 100, 6},
		{specs.Span{From: 1000, To: 2025}, 120, 6},
		{specs.Span{From: 1868, To: 1899}, 200, 6},
		{specs.Span{From: 1900, To: 1960}, 137, 9},
		{specs.Span{From: 1800, To: 2020}, 533, 12},
		{specs.Span{From: 1900, To: 2000}, 600, 10}, // 5-year steps would leave 7 pt between labels
	} {
		ys := draw.TickYears(fs, tc.span, tc.width, tc.size)
		require.GreaterOrEqual(t, len(ys), 2, "%v over %v pt: want a row of labels to check", tc.span, tc.width)
		perYear := tc.width / float64(tc.span.To-tc.span.From)
		path := pdfOf(t, fs, tc.width+2*margin, 40, func(p draw.Pen) {
			for _, y := range ys {
				x := margin + float64(y-tc.span.From)*perYear
				p.Text(fonts.Figures, tc.size, black, x, 20, canvas.Center, strconv.Itoa(y))
			}
		})
		words := popplerWords(t, path)
		require.Len(t, words, len(ys), "%v: poppler's words %v", tc.span, words)
		sort.Slice(words, func(i, j int) bool { return words[i].x0 < words[j].x0 })
		for k := range words {
			assert.Equal(t, strconv.Itoa(ys[k]), words[k].text, "%v: label %d", tc.span, k)
			if k > 0 {
				// 0.05 pt: poppler's widths are the PDF's, rounded to 1/1000 em.
				assert.GreaterOrEqual(t, words[k].x0-words[k-1].x1, tc.size-0.05,
					"%v over %v pt at %v pt: clear space between %s and %s (an em: common practice)", tc.span, tc.width, tc.size, words[k-1].text, words[k].text)
			}
		}
	}
}
