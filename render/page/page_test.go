package page

import (
	"bytes"
	"fmt"
	"image"
	"image/color"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/specs"
	"sheaf/specs/series"
)

const smallSpec = "../../testdata/small/spec.yaml"

// smallFeature prepares testdata/small's print output as a build does
// (package feature, through PrepareForTest): spec, data, fonts, layout,
// the spec's palette. edit, when not nil, changes the spec before
// anything is computed from it.
func smallFeature(t testing.TB, edit func(s *specs.Spec, out *specs.Output)) *Feature {
	t.Helper()
	s, err := specs.Load(smallSpec)
	require.NoError(t, err)
	d, err := series.Load(s)
	require.NoError(t, err)
	out := s.Output("print")
	require.NotNil(t, out, "testdata/small's print output")
	if edit != nil {
		edit(s, out)
	}
	f, err := PrepareForTest(s, d, out)
	require.NoError(t, err)
	return f
}

// PrepareForTest prepares an output as package feature does. Package
// feature imports this one, so only an external test package can call
// it: feature_test.go sets it.
var PrepareForTest func(s *specs.Spec, d *series.Set, out *specs.Output) (*Feature, error)

// proof rasterizes page i of f whole (media box) at dpi on white.
func proof(t testing.TB, f *Feature, i int, dpi float64) *image.RGBA {
	t.Helper()
	m := f.Plan.Pages[i].Media
	img, err := raster.Draw(m.W(), m.H(), dpi, color.White, func(ctx *canvas.Context) error { return f.Draw(ctx, i) })
	require.NoError(t, err)
	return img
}

// TestTickYearsNeverCollide is a property test over plot widths from 20
// to 1000 pt, spans from 20 to 300 years and tick sizes from 5 to 9 pt:
// adjacent year labels, centred on their ticks, are at least one em apart
// (the em as the space between labels: common practice for axis labels),
// ticks are round years (multiples of a step from 5, 10, 20, 25, 50, 100,
// …) inside the span, evenly spaced, and the step is the smallest round
// one that leaves that room.
func TestTickYearsNeverCollide(t *testing.T) {
	fs, err := fonts.Default()
	require.NoError(t, err)
	round := []int{5, 10, 20, 25, 50, 100, 200, 250, 500, 1000}
	r := rand.New(rand.NewPCG(7, 11))
	checked := 0
	for _, size := range []float64{5, 5.5, 6.5, 9} {
		four := fs.Width(fonts.Regular, size, "0000")
		for span := 20; span <= 300; span += 7 + r.IntN(5) {
			from := 1500 + r.IntN(400)
			f := &Feature{Data: &series.Set{Span: specs.Span{From: from, To: from + span}}, Fonts: fs}
			for width := 20.0; width <= 1000; width += 3 + 10*r.Float64() {
				ys := f.tickYears(width, size)
				x := func(y int) float64 { return (float64(y-from) / float64(span)) * width }
				step := 0
				for i, y := range ys {
					require.True(t, y >= from && y <= from+span, "size %g, span %d–%d, width %.1f: tick %d outside the span", size, from, from+span, width, y)
					if i == 0 {
						continue
					}
					d := y - ys[i-1]
					if step == 0 {
						step = d
					} else {
						require.Equal(t, step, d, "size %g, span %d–%d, width %.1f: tick steps of %v", size, from, from+span, width, ys)
					}
					wa := fs.Width(fonts.Regular, size, strconv.Itoa(ys[i-1]))
					wb := fs.Width(fonts.Regular, size, strconv.Itoa(y))
					require.GreaterOrEqual(t, x(y)-x(ys[i-1])-(wa+wb)/2, size-1e-9,
						"size %g, span %d–%d, width %.1f: space between labels %d and %d, want one em", size, from, from+span, width, ys[i-1], y)
				}
				// Round years: multiples of a round step (one tick alone:
				// of 5 at least).
				if len(ys) >= 2 {
					require.Contains(t, round, step, "size %g, span %d–%d, width %.1f: the step is not round", size, from, from+span, width)
				}
				for _, y := range ys {
					require.Zero(t, y%max(step, 5), "size %g, span %d–%d, width %.1f: tick %d is not a multiple of %d", size, from, from+span, width, y, max(step, 5))
				}
				// Minimal: the round step below the chosen one would not
				// leave a four-digit label and an em.
				if len(ys) >= 2 {
					for i, s := range round {
						if s == step && i > 0 {
							require.Less(t, float64(round[i-1])*width/float64(span), four+size,
								"size %g, span %d, width %.1f: step %d chosen, but the room %d leaves", size, span, width, step, round[i-1])
						}
					}
				}
				checked++
			}
		}
	}
	assert.GreaterOrEqual(t, checked, 5000, "cases checked")
}

// TestLabelsFit checks how terms are set beside the peak year
// (project rule, issue 7 quality: shrink to 85 % of the label size, never
// under the type floor of 5 pt print or 7.5 pt screen — common practice
// for figure text — then cut with an ellipsis), and that Labels reports
// it. Terms and widths are invented for the test.
func TestLabelsFit(t *testing.T) {
	// Rooms are invented for the test. roomFor sets the panel so that
	// text fits the whole label line at the floor size less 0.01 pt (no
	// peak beside it); panelW 0 leaves room beside the peak for the term
	// at 92 % of its size; noPeakFit leaves room for the term at full size
	// on the whole line but not beside the peak even at the floor.
	tests := []struct {
		name          string
		kind          specs.Kind
		label         float64 // output's label size, pt
		term          string
		panelW        float64
		roomFor       string
		noPeakFit     bool
		wantShrunk    bool
		wantTruncated bool
		wantNoPeak    bool
		wantText      string // "": the term, or any cut of it when truncated
	}{
		{"fits", specs.Print, 7, "boiler", 80, "", false, false, false, false, ""},
		{"a little long shrinks", specs.Print, 7, "steamboatmanship", 0, "", false, true, false, false, ""},
		{"the peak year makes room before a cut", specs.Print, 7, "steamboatmanship", 0, "", true, false, false, true, ""},
		{"far too long is cut", specs.Print, 7, "electrophotographically", 55, "", false, true, true, true, ""},
		{"cut drops a trailing hyphen", specs.Print, 7, "semi-conductor", 0, "semi-c…", false, true, true, true, "semi…"},
		{"runes cut whole", specs.Print, 7, "Maßstabsänderungen", 0, "Maßstabsä…", false, true, true, true, "Maßstabs…"},
		{"no room at all", specs.Print, 7, "boiler", 0, "b…", false, true, true, true, "…"},
		{"type at the floor has no room to shrink", specs.Print, 5, "electrophotographically", 50, "", false, false, true, true, ""},
		{"screen floor is 7.5 pt", specs.Screen, 8, "electrophotographically", 60, "", false, true, true, true, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f := smallFeature(t, func(s *specs.Spec, out *specs.Output) {
				out.Type.Label = specs.Length(tc.label)
			})
			f.Output.Kind = tc.kind
			f.Data.Series[0].Term = tc.term
			tsize := f.Output.Type.Ticks.Pt()
			peakW := f.Fonts.Width(fonts.Regular, tsize, f.peakText(&f.Data.Series[0])) + tsize*0.8
			floor := 5.0
			if tc.kind == specs.Screen {
				floor = 7.5
			}
			floor = min(tc.label, max(0.85*tc.label, floor))
			f.Plan.PanelW = tc.panelW
			switch {
			case tc.roomFor != "":
				f.Plan.PanelW = f.Fonts.Width(fonts.Bold, floor, tc.roomFor) - 0.01
			case tc.noPeakFit:
				f.Plan.PanelW = f.Fonts.Width(fonts.Bold, tc.label, tc.term) + 0.01
				require.Less(t, f.Plan.PanelW-peakW, f.Fonts.Width(fonts.Bold, floor, tc.term), "test setup: the term fits beside the peak at the floor")
			case tc.panelW == 0: // room for the term at 92 % of its size
				f.Plan.PanelW = peakW + f.Fonts.Width(fonts.Bold, 0.92*tc.label, tc.term)
			}
			room := f.Plan.PanelW - peakW
			f.fitLabels()
			ls := f.Labels()
			require.Len(t, ls, len(f.Data.Series), "Labels() entries")
			l := ls[0]
			assert.Equal(t, tc.wantNoPeak, l.NoPeak, "peak left out")
			if l.NoPeak {
				room = f.Plan.PanelW
			}
			t.Logf("%q in %.1f pt: %q at %.2f pt", tc.term, room, l.Text, l.Size)
			assert.Equal(t, 0, l.Item, "label item")
			assert.Equal(t, tc.term, l.Term, "label term")
			assert.Equal(t, tc.wantShrunk, l.Shrunk, "label shrunk")
			assert.Equal(t, tc.wantTruncated, l.Truncated, "label truncated")
			assert.GreaterOrEqual(t, l.Size, floor-1e-9, "label size against the floor")
			assert.LessOrEqual(t, l.Size, tc.label, "label size against the label type size")
			assert.Equal(t, l.Size < tc.label, l.Shrunk, "Shrunk at size %.3f of %g", l.Size, tc.label)
			assert.LessOrEqual(t, f.Fonts.Width(fonts.Bold, l.Size, l.Text), room+1e-9, "width of %q at %.2f pt against the room", l.Text, l.Size)
			if tc.wantText != "" {
				assert.Equal(t, tc.wantText, l.Text, "label text")
			}
			if !l.Truncated {
				assert.Equal(t, tc.term, l.Text, "label text, want the term")
				return
			}
			assert.Equal(t, floor, l.Size, "size of a cut label (cut before shrinking to the floor?)")
			head, ok := strings.CutSuffix(l.Text, "…")
			require.True(t, ok && strings.HasPrefix(tc.term, head) && utf8.ValidString(head), "cut text %q is not a prefix of %q and an ellipsis", l.Text, tc.term)
			assert.False(t, strings.HasSuffix(head, "-") || strings.HasSuffix(head, " "), "cut text %q ends in a hyphen or space before the ellipsis", l.Text)
			// As long as fits: one more rune would not.
			n := utf8.RuneCountInString(head)
			longer := strings.TrimRight(string([]rune(tc.term)[:n+1]), " -") + "…"
			assert.False(t, f.Fonts.Width(fonts.Bold, l.Size, longer) <= room && longer != l.Text, "cut to %q, but %q fits too", l.Text, longer)
		})
	}
}

// TestPlotMapKeepsInkInside builds every panel's curve through PlotMap,
// for the small feature's data and for random walks, at several line
// widths, and checks that the stroke (centre ± half the width) and the
// peak dot (radius plus half its hairline ring) stay within the plot
// rectangle's height, and the centre line within its width, so nothing
// touches the label row above or the baseline's neighbours (the layout
// contract in PlotMap's doc). Line widths are common practice for small
// multiples (0.25 pt hairline to 2 pt).
func TestPlotMapKeepsInkInside(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 9))
	for _, lw := range []float64{0.25, 0.75, 1.2, 2} {
		for _, dot := range []bool{true, false} {
			for _, random := range []bool{false, true} {
				f := smallFeature(t, func(_ *specs.Spec, out *specs.Output) {
					out.Line = specs.Length(lw)
					out.PeakDot = dot
				})
				if random {
					for i := range f.Data.Series {
						sr := &f.Data.Series[i]
						v := 10 * r.Float64()
						sr.Peak = 0
						for j := range sr.Values {
							v = math.Abs(v + 4*r.NormFloat64())
							sr.Values[j] = v
							if v > sr.Peak {
								sr.Peak, sr.PeakYear = v, f.Data.Span.From+j
							}
						}
						sr.YMax = sr.Peak
					}
				}
				for _, pg := range f.Plan.Pages {
					for _, pn := range pg.Panels {
						checkInside(t, f, pn, lw, dot)
					}
				}
			}
		}
	}
}

func checkInside(t *testing.T, f *Feature, pn layout.Panel, lw float64, dot bool) {
	t.Helper()
	sr := &f.Data.Series[pn.Item]
	m, err := f.PlotMap(pn)
	require.NoError(t, err)
	runs, err := curve.Build(f.Data.Years, sr.Values, m, nil)
	require.NoError(t, err)
	pr := pn.Plot
	const eps = 1e-9
	for _, run := range runs {
		pts := []curve.Point{run.Start}
		for _, z := range run.Beziers {
			for k := 1; k <= 32; k++ {
				pts = append(pts, z.At(float64(k)/32))
			}
		}
		for _, p := range pts {
			require.False(t, p.Y-lw/2 < pr.Y0-eps || p.Y+lw/2 > pr.Y1+eps || p.X < pr.X0-eps || p.X > pr.X1+eps,
				"%q, line %g pt: curve point %.3f,%.3f (± %.3f) leaves the plot %v", sr.Term, lw, p.X, p.Y, lw/2, pr)
		}
	}
	if dot && sr.Peak > 0 {
		pk := m.Apply(float64(sr.PeakYear), sr.Peak)
		reach := f.peakRadius() + Hairline/2
		require.False(t, pk.Y+reach > pr.Y1+eps || pk.Y-reach < pr.Y0-eps,
			"%q, line %g pt: peak dot at y %.3f reaches %.3f–%.3f, the plot is %.3f–%.3f", sr.Term, lw, pk.Y, pk.Y-reach, pk.Y+reach, pr.Y0, pr.Y1)
	}
}

// TestDrawSmall draws every page of the small feature into canvas's
// rasterizer (through sheaf/render/raster) and into sheaf/render/pdf,
// without error.
func TestDrawSmall(t *testing.T) {
	f := smallFeature(t, nil)
	require.NotEmpty(t, f.Plan.Pages, "pages of the plan")
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: f.Spec.Title, Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)})
	for i, pg := range f.Plan.Pages {
		img := proof(t, f, i, 100)
		// Something was drawn: the page is not blank white.
		assert.False(t, blank(img), "page %d: the proof is blank", i+1)
		r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
		setup := pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}, Marks: &pdf.MarkOptions{}}
		require.NoError(t, w.AddPage(setup, func(c *canvas.Canvas) error { return f.Draw(canvas.NewContext(c), i) }), "page %d to PDF", i+1)
	}
	require.NoError(t, w.Close())
	assert.True(t, bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")), "the PDF writer wrote no PDF header")
}

func blank(img *image.RGBA) bool {
	for _, v := range img.Pix {
		if v != 0xff {
			return false
		}
	}
	return true
}

// TestBadPageIndex checks that a page or panel that does not exist is an
// error (project rule: bad input returns an error, never a panic).
func TestBadPageIndex(t *testing.T) {
	f := smallFeature(t, nil)
	n := len(f.Plan.Pages)
	draw := func(fn func(ctx *canvas.Context) error) error {
		_, err := raster.Draw(100, 100, 72, color.White, fn)
		return err
	}
	for _, i := range []int{-1, n, n + 5} {
		err := draw(func(ctx *canvas.Context) error { return f.Draw(ctx, i) })
		if assert.Error(t, err, "Draw(page index %d)", i) {
			assert.Contains(t, err.Error(), "page "+strconv.Itoa(i+1), "Draw(page index %d)'s error names the page", i)
		}
	}
	pn := f.Plan.Pages[0].Panels[0]
	for _, item := range []int{-1, len(f.Data.Series)} {
		pn.Item = item
		assert.Error(t, draw(func(ctx *canvas.Context) error { return f.DrawPanel(ctx, pn) }), "DrawPanel(item %d)", item)
	}
}

// TestKeyStripCoversPalette samples the colour key on a proof at 200 dpi:
// the strip's left end has the palette's first colour and its right end
// the last, within ΔE00 2 (CIEDE2000, Sharma, Wu & Dalal 2005; 2 is about
// one just-noticeable difference, CSS Color 4 §"color-difference"), colours
// read as sRGB (IEC 61966-2-1) and converted to CIELAB. On a scrolling
// screen page every repeated key is checked the same way.
func TestKeyStripCoversPalette(t *testing.T) {
	const dpi = 200
	for _, c := range []struct {
		name string
		edit func(s *specs.Spec, out *specs.Output)
		keys int // key bands on page 1
	}{
		{"print page", nil, 1},
		// Three terms in one column, a key before every row: the top
		// key and two repeats.
		{"scrolling page, repeated", func(s *specs.Spec, out *specs.Output) {
			*out = specs.DefaultOutput("web", specs.Screen)
			out.Trim.W = 400 * specs.PtPerPx
			out.Columns = 1
			out.KeyEvery = 10 * specs.PtPerPx
		}, 3},
	} {
		t.Run(c.name, func(t *testing.T) {
			f := smallFeature(t, c.edit)
			pg := f.Plan.Pages[0]
			keys := pg.Keys()
			require.Len(t, keys, c.keys, "key bands")
			img := proof(t, f, 0, dpi)
			for i, k := range keys {
				checkStrip(t, f, img, pg.Media.H(), dpi, k.Strip, fmt.Sprintf("key %d", i))
			}
		})
	}
}

// checkStrip samples a key strip's two ends on a whole-page proof.
func checkStrip(t *testing.T, f *Feature, img *image.RGBA, pageH, dpi float64, strip layout.Rect, what string) {
	t.Helper()
	require.Positive(t, strip.W(), "%s: key strip width", what)
	k := dpi / 72.0
	row := int((pageH - (strip.Y0+strip.Y1)/2) * k)
	right := int(strip.X1*k) - 3 // three pixels in from the strip's right end
	// Walk left along the strip to the paper between it and its caption.
	left := right
	for left > 0 && img.RGBAAt(left-1, row) != (color.RGBA{0xff, 0xff, 0xff, 0xff}) {
		left--
	}
	require.GreaterOrEqual(t, float64(right-left), strip.W()*k/3, "%s: strip found from pixel %d to %d, want a third of the key band at least", what, left, right)
	left += 3
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	pxAt := func(x int) palette.Color {
		c := img.RGBAAt(x, row)
		return palette.FromRGB(palette.RGB{R: float64(c.R) / 255, G: float64(c.G) / 255, B: float64(c.B) / 255})
	}
	for _, c := range []struct {
		name string
		x    int
		want palette.Color
	}{
		{"left end, first year", left, f.Palette.At(from).Clip()},
		{"right end, last year", right, f.Palette.At(to).Clip()},
	} {
		got := pxAt(c.x)
		assert.LessOrEqual(t, palette.DeltaE00(got.Lab(), c.want.Lab()), 2.0, "%s: %s: ΔE00 of pixel %d (%s) from the palette's %s", what, c.name, c.x, got.Hex(), c.want.Hex())
	}
	// And the two ends differ as the palette's ends do: the strip is not
	// one colour.
	assert.GreaterOrEqual(t, palette.DeltaE00(pxAt(left).Lab(), pxAt(right).Lab()), 20.0, "%s: ΔE00 between the strip's ends", what)
}

func TestDescribe(t *testing.T) {
	f := smallFeature(t, nil)
	for i, sr := range f.Data.Series {
		title, desc := f.Describe(i)
		assert.Equal(t, sr.Term, title, "item %d: title", i)
		// The term in British single quotes (the en-GB default, New Hart's Rules; from memory).
		for _, want := range []string{"‘" + sr.Term + "’", "1900–1905", "highest in " + strconv.Itoa(sr.PeakYear)} {
			assert.Contains(t, desc, want, "item %d: description", i)
		}
	}
}

// TestPaperFillsBleed checks that a paper colour other than white fills
// the bleed box, so the colour runs past the trim (print-facts: bleed is
// the area beyond the trim that printed colour must reach, ISO 32000-1
// §14.11.2 BleedBox), and not the slug beyond it; white paper is left
// unprinted.
func TestPaperFillsBleed(t *testing.T) {
	const dpi = 100
	tests := []struct {
		name  string
		paper specs.Color
		want  color.RGBA // in the bleed
	}{
		{"cream sRGB", specs.Color{Space: specs.SpaceSRGB, V: [3]float64{0.96, 0.93, 0.86}},
			color.RGBA{245, 237, 219, 255}}, // 0.96·255 = 244.8 → 245 …
		// CIELAB L 95, a 0, b 10 (D65): #f8f1e0 by the palette package's
		// conversion (checked against LittleCMS in its tests).
		{"warm Lab", specs.Color{Space: specs.SpaceLab, V: [3]float64{95, 0, 10}},
			rgba(palette.FromLab(palette.Lab{L: 95, A: 0, B: 10}).RGB())},
		{"white is not printed", specs.Color{Space: specs.SpaceSRGB, V: [3]float64{1, 1, 1}},
			color.RGBA{255, 255, 255, 255}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f := smallFeature(t, func(s *specs.Spec, _ *specs.Output) { s.Palette.Paper = tc.paper })
			pg := f.Plan.Pages[0]
			require.True(t, pg.Bleed.X0 < pg.Trim.X0 && pg.Media.X0 < pg.Bleed.X0, "the small feature needs bleed and slug: media %v bleed %v trim %v", pg.Media, pg.Bleed, pg.Trim)
			// Our background is a colour no page draws, to tell unprinted
			// from printed white.
			bg := color.RGBA{0, 0xff, 0, 0xff}
			m := pg.Media
			img, err := raster.Draw(m.W(), m.H(), dpi, bg, func(ctx *canvas.Context) error { return f.Draw(ctx, 0) })
			require.NoError(t, err)
			k := dpi / 72.0
			px := func(x, y float64) color.RGBA { return img.RGBAAt(int(x*k), int((m.H()-y)*k)) }
			midY := (pg.Trim.Y0 + pg.Trim.Y1) / 2
			bleed := px((pg.Bleed.X0+pg.Trim.X0)/2, midY)
			slug := px((m.X0+pg.Bleed.X0)/2, midY)
			wantBleed := tc.want
			if tc.paper.V == [3]float64{1, 1, 1} {
				wantBleed = bg // white paper: nothing printed
			}
			assert.Equal(t, wantBleed, bleed, "bleed pixel")
			assert.Equal(t, bg, slug, "slug pixel: the paper colour ran past the bleed box?")
			assert.Equal(t, tc.want, f.PaperColor(), "PaperColor()")
		})
	}
}
