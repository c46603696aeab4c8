package insert

import (
	"fmt"
	"image/color"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
	"sheaf/render/draw"
	"sheaf/render/raster"
	"sheaf/specs"
	"sheaf/specs/series"
)

const demoSpec = "../../examples/quillmere/feature.yaml"

// demoInsert lays out an insert of the demo's data (the real spec, its
// scale and smoothing) with the spec edited first.
func demoInsert(t testing.TB, output string, size specs.Size, compare specs.Compare, terms []string, edit func(s *specs.Spec)) *Graphic {
	t.Helper()
	s, err := specs.Load(demoSpec)
	require.NoError(t, err)
	if edit != nil {
		edit(s)
	}
	out := s.Output(output)
	require.NotNil(t, out)
	in := &specs.Insert{Name: "probe", Output: output, Size: size, Terms: terms, Compare: compare}
	d, err := series.Load(s.ForInsert(in))
	require.NoError(t, err)
	fs, err := fonts.Load(s, out)
	require.NoError(t, err)
	pal, err := palette.NewScale("test", palette.DefaultAnchors(float64(d.Span.From), float64(d.Span.To)), nil)
	require.NoError(t, err)
	g, err := New(s, in, out, d, pal, fs)
	require.NoError(t, err)
	return g
}

// drawnLines are points along every line drawn on the plot a note of
// item lands on (16 on each Bézier, as drawn: Build is what stroke uses).
func drawnLines(t testing.TB, g *Graphic, item int) []curve.Point {
	var pts []curve.Point
	add := func(vals []float64, m curve.Map) {
		runs, err := curve.Build(g.Data.Years, vals, m, nil)
		require.NoError(t, err)
		for _, r := range runs {
			pts = append(pts, r.Start)
			for _, z := range r.Beziers {
				for k := 1; k <= 16; k++ {
					pts = append(pts, z.At(float64(k)/16))
				}
			}
		}
	}
	if g.Rowed() {
		add(g.Data.Series[item].Values, g.Rows()[item].Map)
		return pts
	}
	for i := range g.Data.Series {
		add(g.Data.Series[i].Values, g.m)
	}
	return pts
}

func distToRect(p curve.Point, r layout.Rect) float64 {
	dx := math.Max(math.Max(r.X0-p.X, 0), p.X-r.X1)
	dy := math.Max(math.Max(r.Y0-p.Y, 0), p.Y-r.Y1)
	return math.Hypot(dx, dy)
}

// textBoxes are the boxes of the insert's own words: the title lines,
// the key caption, the scale note, the line-end labels (overlaid) or the
// row labels and peak lines (rows), ascent to descent.
func textBoxes(g *Graphic) map[string]layout.Rect {
	fs, t := g.Fonts, g.Output.Type
	box := func(st fonts.Style, size, x, base, w float64) layout.Rect {
		m := fs.Metrics(st, size)
		return layout.Rect{X0: x, Y0: base - m.Descent, X1: x + w, Y1: base + m.Ascent}
	}
	out := map[string]layout.Rect{}
	y := g.h - g.pad
	for i, l := range g.title {
		base := fs.Baseline(fonts.Bold, g.titleS, g.leading(), y)
		out[fmt.Sprintf("title line %d", i)] = box(fonts.Bold, g.titleS, g.pad, base, fs.Width(fonts.Bold, g.titleS, l))
		y -= g.titleS * g.leading()
	}
	ks, ts, ls := t.Key.Pt(), t.Ticks.Pt(), t.Label.Pt()
	out["key"] = box(fonts.Bold, ks, g.pad, g.keyY, fs.Width(fonts.Bold, ks, g.Spec.Phrase(specs.PhraseKeyTitle)))
	out["scale note"] = box(fonts.Regular, ts, g.pad, g.plot.Y1+ts*1.1, fs.Width(fonts.Regular, ts, g.scaleNote))
	for _, l := range g.Labels() {
		out["label "+l.Term] = layout.Rect{X0: l.X, Y0: l.Y - l.Height/2, X1: l.X + l.Width, Y1: l.Y + l.Height/2}
	}
	for _, r := range g.Rows() {
		w := fs.Width(fonts.Bold, ls, r.Term)
		x1 := r.Plot.X0 - ls*0.8
		out["row label "+r.Term] = box(fonts.Bold, ls, x1-w, r.Baseline, w)
		if r.PeakLine != 0 {
			pw := fs.Width(fonts.Regular, ts, g.peakText(0))
			out["peak line "+r.Term] = box(fonts.Regular, ts, x1-pw, r.PeakLine, pw)
		}
	}
	return out
}

// TestInsertNotesPlacedClear is a property test on the demo's data:
// random notes (years, spans, one to three on a term) on inserts of every
// form — one term, aligned rows, overlaid — in print and on screen. Every
// placed note lies inside its plot (in rows, inside its term's strip); its
// text keeps clear of every line drawn on that plot (half the line width
// at least, sampled along every Bézier), of the row's peak dot, of every
// mark and of the other notes' texts, and of the insert's own words
// (title, key, scale note, labels); its leader runs from its mark to its
// text. The rules are the ("collides with nothing"), the same as
// the pages' (render/page TestNotesPlacedClear). At least half must find
// a place, or the test would pass by placing none (random years often
// fall where the lines are busiest).
func TestInsertNotesPlacedClear(t *testing.T) {
	words := []string{"strike", "war orders", "new works open", "patent lapses", "price falls", "ban", "first sold", "tariff"}
	cases := []struct {
		name    string
		output  string
		size    specs.Size
		compare specs.Compare
		terms   []string
	}{
		{"print single", "print", specs.Size{W: 60 * specs.PtPerMm, H: 45 * specs.PtPerMm}, specs.CompareRows, []string{"telegraph"}},
		{"print rows", "print", specs.Size{W: 90 * specs.PtPerMm, H: 70 * specs.PtPerMm}, specs.CompareRows, []string{"rivetting", "welding"}},
		{"print overlay", "print", specs.Size{W: 90 * specs.PtPerMm, H: 60 * specs.PtPerMm}, specs.CompareOverlay, []string{"slide rule", "pocket calculator"}},
		{"screen rows", "web", specs.Size{W: 540, H: 330}, specs.CompareRows, []string{"telegraph", "telephone", "wireless", "email"}},
		{"screen overlay", "web", specs.Size{W: 540, H: 330}, specs.CompareOverlay, []string{"telegraph", "telephone", "wireless", "email"}},
	}
	for ci, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(16, uint64(ci)))
			g := demoInsert(t, c.output, c.size, c.compare, c.terms, func(s *specs.Spec) {
				s.Annotations = nil
				for i := 0; i < 12; i++ {
					term := c.terms[i%len(c.terms)]
					from := 1870 + r.IntN(150)
					to := from
					if i%3 == 0 {
						to = from + 1 + r.IntN(5)
					}
					s.Annotations = append(s.Annotations, specs.Annotation{Term: term, From: from, To: to,
						Text: words[r.IntN(len(words))], Path: fmt.Sprintf("annotations.%d", i)})
				}
			})
			notes := g.Notes()
			require.Len(t, notes, 12, "one note per annotation: every annotated term is shown")
			lw := g.Output.Line.Pt()
			words := textBoxes(g)
			placed := 0
			for i, n := range notes {
				if !n.Placed {
					assert.NotEmpty(t, n.Why)
					continue
				}
				placed++
				where := fmt.Sprintf("%q on %q", n.Text, n.Term)
				require.Equal(t, n.Term, g.Data.Series[n.Item].Term, "%s: item is the term's place in the insert", where)
				plot := g.plot.layout()
				if g.Rowed() {
					plot = g.Rows()[n.Item].Plot.layout()
				}
				b := n.Box
				assert.True(t, plot.Contains(b), "%s: box %v leaves its plot %v", where, b, plot)
				for _, p := range drawnLines(t, g, n.Item) {
					if !assert.GreaterOrEqual(t, distToRect(p, b), lw/2, "%s: text %v is too close to a line at %.1f,%.1f (half the line is %.2f pt)", where, b, p.X, p.Y, lw/2) {
						break
					}
				}
				if g.Rowed() {
					sr := g.Data.Series[n.Item]
					pk := g.Rows()[n.Item].Map.Apply(float64(sr.PeakYear), sr.Peak)
					assert.GreaterOrEqual(t, distToRect(pk, b), g.dotRadius(), "%s: text over the peak dot", where)
				}
				for j, o := range notes {
					if o.Item != n.Item && g.Rowed() {
						continue // another strip
					}
					assert.False(t, draw.Overlaps(b, o.Mark), "%s: text over the mark of note %d", where, j)
					if j != i && o.Placed {
						assert.False(t, draw.Overlaps(b, o.Box), "%s: text over note %q", where, o.Text)
					}
				}
				for what, wb := range words {
					assert.False(t, draw.Overlaps(b, wb), "%s: text over the %s %v", where, what, wb)
				}
				end := curve.Point{X: n.Leader[1].X, Y: n.Leader[1].Y}
				assert.InDelta(t, 0, distToRect(end, b), 1e-9, "%s: the leader ends on the text", where)
				assert.InDelta(t, 0, distToRect(curve.Point{X: n.Leader[0].X, Y: n.Leader[0].Y}, n.Mark), 1e-9, "%s: the leader starts at the mark", where)
			}
			assert.GreaterOrEqual(t, placed, len(notes)/2, "only %d of %d notes placed", placed, len(notes))
			t.Logf("%d of %d notes placed", placed, len(notes))
		})
	}
}

// TestInsertNoteCrowded: notes that cannot all find room on a small
// insert are reported unplaced with the reason, their marks kept.
func TestInsertNoteCrowded(t *testing.T) {
	g := demoInsert(t, "print", specs.Size{W: 50 * specs.PtPerMm, H: 45 * specs.PtPerMm}, specs.CompareRows, []string{"telegraph"}, func(s *specs.Spec) {
		s.Annotations = nil
		for y := 1900; y < 1960; y += 4 {
			s.Annotations = append(s.Annotations, specs.Annotation{Term: "telegraph", From: y, To: y, Text: "a note of some length", Path: "annotations.0"})
		}
	})
	unplaced := 0
	for _, n := range g.Notes() {
		assert.False(t, n.Mark.IsZero(), "every note has its mark")
		if !n.Placed {
			unplaced++
			assert.Contains(t, n.Why, "no free spot")
		}
	}
	assert.Positive(t, unplaced, "fifteen notes on one small plot cannot all be placed")
}

// TestInsertHighlights: a highlighted term is emphasised on an insert as
// on its panel (the design in README, "Annotations, highlights, periods"):
// alone, the tint (9 % ink, draw.HighlightTint) behind the plot and an ink
// rule over the title; in rows, the tint behind its strip (not behind the
// others) and a rule over its name; overlaid, its end label on the tint.
// Checked on the rasterized drawing, away from lines and text; the paper
// is white.
func TestInsertHighlights(t *testing.T) {
	const dpi = 144
	tint := draw.HighlightTint
	white := color.RGBA{0xff, 0xff, 0xff, 0xff}
	cases := []struct {
		name    string
		compare specs.Compare
		terms   []string
	}{
		{"single", specs.CompareRows, []string{"welding"}},
		{"rows", specs.CompareRows, []string{"rivetting", "welding"}},
		{"overlay", specs.CompareOverlay, []string{"rivetting", "welding"}},
	}
	for _, c := range cases {
		for _, on := range []bool{true, false} {
			t.Run(fmt.Sprintf("%s highlighted %v", c.name, on), func(t *testing.T) {
				g := demoInsert(t, "web", specs.Size{W: 540, H: 330}, c.compare, c.terms, func(s *specs.Spec) {
					s.Annotations = nil
					s.Highlights = nil
					if on {
						s.Highlights = []string{"welding"}
					}
				})
				w, h := g.Size()
				img, err := raster.Draw(w, h, dpi, g.Paper(), func(ctx *canvas.Context) error { return g.Draw(ctx) })
				require.NoError(t, err)
				k := dpi / 72.0
				at := func(x, y float64) color.RGBA { return img.RGBAAt(int(x*k), int((h-y)*k)) }
				want := white
				if on {
					want = tint
				}
				switch c.name {
				case "single":
					// Just inside the plot's top-right corner (the line
					// never reaches there: welding ends low) and the rule
					// over the title, at the insert's middle.
					p := g.plot
					assert.Equal(t, want, at(p.X1-2, p.Y1-2), "plot corner")
					ry := g.titleRule()
					ink := at(w/2, ry)
					assert.Equal(t, on, ink.R < 0x60, "rule over the title: pixel %v", ink)
				case "rows":
					for i, r := range g.Rows() {
						wantRow := white
						if on && r.Term == "welding" {
							wantRow = tint
						}
						assert.Equal(t, wantRow, at(r.Plot.X1-2, r.Plot.Y1-3), "strip %d (%s) corner", i, r.Term)
						rr := g.rowRule(r)
						ink := at((rr.X0+rr.X1)/2, rr.Y0)
						assert.Equal(t, on && r.Term == "welding", ink.R < 0x60, "rule over %s: pixel %v", r.Term, ink)
					}
				case "overlay":
					for _, l := range g.Labels() {
						wantLabel := white
						if on && l.Term == "welding" {
							wantLabel = tint
						}
						b := g.labelTint(l)
						assert.Equal(t, wantLabel, at(b.X1-1, b.Y1-1), "label %s: corner of its box", l.Term)
					}
					// The plot itself has no tint: the emphasis is the label's.
					assert.Equal(t, white, at(g.plot.X1-2, g.plot.Y1-2))
				}
				if dir := os.Getenv("SHEAF_KEEP"); dir != "" && on {
					f, err := os.Create(filepath.Join(dir, "insert-highlight-"+c.name+".png"))
					require.NoError(t, err)
					require.NoError(t, raster.WritePNG(f, img))
					require.NoError(t, f.Close())
				}
			})
		}
	}
}
