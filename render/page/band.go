package page

import (
	"math"

	"github.com/tdewolff/canvas"

	"sheaf/palette"
	"sheaf/render/curve"
)

// BandStrength is how much of the era colour the uncertainty band takes
// over the paper: a light tint, so the line stays the figure and the band
// the ground. It is mixed into an opaque colour (no transparency), which
// prints as a screen tint of the same inks as the line.
const BandStrength = 0.2

// TintStops returns the palette's stops mixed toward the paper:
// strength of the colour and 1 − strength of the paper, in linear light
// (the proportion in which halftone dots and bare paper mix — common
// practice as a first approximation).
func TintStops(stops []palette.Stop, paper palette.RGB, strength float64) []palette.Stop {
	p := paper.Linear()
	out := make([]palette.Stop, len(stops))
	for i, s := range stops {
		c := s.Color.Linear()
		c.R = p.R + strength*(c.R-p.R)
		c.G = p.G + strength*(c.G-p.G)
		c.B = p.B + strength*(c.B-p.B)
		out[i] = palette.Stop{Year: s.Year, Color: c.RGB()}
	}
	return out
}

// BandPath returns, in canvas millimetres, the outline of the band
// between lo and hi (values, NaN in gaps) through years, mapped by m:
// each edge a monotone cubic through the yearly limits, as the line is, so
// the band follows the line's shape; one closed piece per run of years.
// Limits are kept within 0 and top (the panel's y-range top): the band
// never leaves the plot. An isolated year gets a bar bar points wide.
func BandPath(b *curve.Builder, years, lo, hi []float64, top float64, m curve.Map, bar float64) (*canvas.Path, error) {
	clip := func(v []float64) []float64 {
		out := make([]float64, len(v))
		for i, x := range v {
			out[i] = x
			if !math.IsNaN(x) {
				out[i] = math.Min(math.Max(x, 0), top)
			}
		}
		return out
	}
	upper, err := b.Build(years, clip(hi), m, nil)
	if err != nil {
		return nil, err
	}
	lower, err := b.Build(years, clip(lo), m, nil)
	if err != nil {
		return nil, err
	}
	path := &canvas.Path{}
	for i := range upper {
		if i >= len(lower) {
			break
		}
		u, l := upper[i], lower[i]
		if u.IsDot() || l.IsDot() {
			x := u.Start.X
			path.MoveTo((x-bar/2)*mm, l.Start.Y*mm)
			path.LineTo((x+bar/2)*mm, l.Start.Y*mm)
			path.LineTo((x+bar/2)*mm, u.Start.Y*mm)
			path.LineTo((x-bar/2)*mm, u.Start.Y*mm)
			path.Close()
			continue
		}
		path.MoveTo(u.Start.X*mm, u.Start.Y*mm)
		for _, z := range u.Beziers {
			path.CubeTo(z.P1.X*mm, z.P1.Y*mm, z.P2.X*mm, z.P2.Y*mm, z.P3.X*mm, z.P3.Y*mm)
		}
		end := l.End()
		path.LineTo(end.X*mm, end.Y*mm)
		for k := len(l.Beziers) - 1; k >= 0; k-- {
			z := l.Beziers[k]
			path.CubeTo(z.P2.X*mm, z.P2.Y*mm, z.P1.X*mm, z.P1.Y*mm, z.P0.X*mm, z.P0.Y*mm)
		}
		path.Close()
	}
	return path, nil
}
