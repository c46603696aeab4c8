package palette

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func anchorsHex(t testing.TB, pairs ...any) []Anchor {
	t.Helper()
	var out []Anchor
	for i := 0; i < len(pairs); i += 2 {
		out = append(out, Anchor{Year: float64(pairs[i].(int)), Color: mustHex(t, pairs[i+1].(string))})
	}
	return out
}

func TestNewScaleErrors(t *testing.T) {
	ok := anchorsHex(t, 1900, "#e96163", 2000, "#073b0f")
	nan := Color{OKLab{math.NaN(), 0, 0}}
	for _, tc := range []struct {
		name    string
		anchors []Anchor
		eras    []float64
		want    string
	}{
		{"one anchor", ok[:1], nil, "need at least 2 anchors, have 1"},
		{"NaN year", []Anchor{ok[0], {math.NaN(), ok[1].Color}}, nil, "anchor 2: year NaN"},
		{"Inf year", []Anchor{{math.Inf(-1), ok[0].Color}, ok[1]}, nil, "anchor 1: year -Inf"},
		{"unordered", []Anchor{ok[1], ok[0]}, nil, "anchor 2 (year 1900) must come after anchor 1 (year 2000)"},
		{"repeated", []Anchor{ok[0], ok[0]}, nil, "anchor 2 (year 1900) must come after"},
		{"NaN colour", []Anchor{ok[0], {1950, nan}}, nil, "anchor 2 (year 1950): colour is not finite"},
		{"one bound", ok, []float64{1900}, "at least 2 boundary years, have 1"},
		{"unordered bounds", ok, []float64{1900, 1950, 1940}, "era boundary 3 (year 1940) must come after boundary 2 (year 1950)"},
		{"NaN bound", ok, []float64{1900, math.NaN()}, "era boundary 2: year NaN"},
	} {
		_, err := NewScale("test", tc.anchors, tc.eras)
		assert.ErrorContains(t, err, tc.want, tc.name)
		assert.ErrorContains(t, err, `"test"`, "%s: the error names the palette", tc.name)
	}
}

func TestAtInterpolatesInOKLab(t *testing.T) {
	a := anchorsHex(t, 1900, "#e96163", 1950, "#4752bb", 2000, "#073b0f")
	s, err := NewScale("t", a, nil)
	require.NoError(t, err)
	for _, x := range a {
		assert.Equal(t, x.Color, s.At(x.Year), "At(%v) is the anchor", x.Year)
	}
	// Linear in OKLab: a quarter of the way is a quarter of each coordinate.
	p, q := a[1].Color.OKLab(), a[2].Color.OKLab()
	want := OKLab{p.L + 0.25*(q.L-p.L), p.A + 0.25*(q.A-p.A), p.B + 0.25*(q.B-p.B)}
	got := s.At(1962.5).OKLab()
	assert.InDeltaSlice(t, []float64{want.L, want.A, want.B}, []float64{got.L, got.A, got.B}, 1e-12, "At(1962.5) in OKLab")
	// Outside the span: the nearer end.
	for y, want := range map[float64]Color{1800: a[0].Color, 2100: a[2].Color, math.NaN(): a[0].Color, math.Inf(1): a[2].Color} {
		assert.Equal(t, want, s.At(y), "At(%v)", y)
	}
	from, to := s.Span()
	assert.Equal(t, [2]float64{1900, 2000}, [2]float64{from, to}, "Span")
	var zero Scale
	assert.Equal(t, Color{}, zero.At(1950), "zero Scale maps to black")
	assert.Nil(t, zero.Stops(0, 1, 0), "zero Scale has no stops")
}

func TestEras(t *testing.T) {
	a := anchorsHex(t, 1900, "#e96163", 2000, "#073b0f")
	cont, _ := NewScale("c", a, nil)
	s, err := NewScale("e", a, []float64{1900, 1925, 1960, 2000})
	require.NoError(t, err)
	eras := s.Eras()
	require.Len(t, eras, 3, "eras = %v", eras)
	require.True(t, s.Discrete(), "a scale with eras is discrete")
	require.False(t, cont.Discrete(), "a scale without eras is continuous")
	for _, e := range eras {
		assert.Equal(t, cont.At((e.From+e.To)/2), e.Color, "era %s colour is the mid-year colour", e.Label())
	}
	for y, era := range map[float64]int{1800: 0, 1900: 0, 1924.9: 0, 1925: 1, 1959: 1, 1960: 2, 2000: 2, 2100: 2} {
		assert.Equal(t, eras[era].Color, s.At(y), "At(%v) is era %d", y, era)
	}
	// Whole years: 1960 belongs to the next era; the last era holds 2000.
	assert.Equal(t, "1925–1959", eras[1].Label(), "label")
	assert.Equal(t, "1960–2000", eras[len(eras)-1].Label(), "last label")
	from, to := s.Span()
	assert.Equal(t, [2]float64{1900, 2000}, [2]float64{from, to}, "Span")
}

// stopsError samples the sRGB-linear gradient made from stops densely and
// returns the worst ΔE00 against the scale (clipped, as drawn).
func stopsError(t *testing.T, s Scale, stops []Stop, from, to float64) (worst, at float64) {
	t.Helper()
	const n = 4000
	j := 0
	for i := 0; i <= n; i++ {
		y := from + (to-from)*float64(i)/n
		for j+2 < len(stops) && stops[j+1].Year < y {
			j++
		}
		a, b := stops[j], stops[j+1]
		u := 0.0
		if b.Year > a.Year {
			u = (y - a.Year) / (b.Year - a.Year)
		}
		got := RGB{a.Color.R + u*(b.Color.R-a.Color.R), a.Color.G + u*(b.Color.G-a.Color.G), a.Color.B + u*(b.Color.B-a.Color.B)}
		if d := DeltaE00(FromRGB(got).Lab(), s.At(y).Clip().Lab()); d > worst {
			worst, at = d, y
		}
	}
	return worst, at
}

func TestStopsStayWithinTolerance(t *testing.T) {
	def, _ := Default(1868, 2025)
	// A harsh scale: complementary hues (a straight OKLab line through
	// grey) and an anchor outside sRGB.
	harsh, err := NewScale("harsh", []Anchor{
		{1900, mustHex(t, "#ff0000")},
		{1930, mustHex(t, "#00ffff")},
		{1960, FromOKLCh(OKLCh{0.7, 0.3, 140})},
		{2000, mustHex(t, "#0000ff")},
	}, nil)
	require.NoError(t, err)
	for _, tc := range []struct {
		s        Scale
		from, to float64
		maxErr   float64
	}{
		{def, 1868, 2025, 0.5},
		{def, 1868, 2025, 0.2},
		{def, 1900, 1950, 1},
		{harsh, 1900, 2000, 0.5},
		{harsh, 1890, 2010, 0.3},
	} {
		stops := tc.s.Stops(tc.from, tc.to, tc.maxErr)
		require.GreaterOrEqual(t, len(stops), 2, "%s %v–%v: stops %v", tc.s.Name(), tc.from, tc.to, stops)
		require.Equal(t, tc.from, stops[0].Year, "%s: first stop year", tc.s.Name())
		require.Equal(t, tc.to, stops[len(stops)-1].Year, "%s: last stop year", tc.s.Name())
		for i := 1; i < len(stops); i++ {
			require.True(t, (stops[i].Year > stops[i-1].Year), "%s: stop years not increasing at %d", tc.s.Name(), i)
		}
		for _, a := range tc.s.Anchors() {
			assert.False(t, a.Year > tc.from && a.Year < tc.to && !hasStop(stops, a.Year), "%s: no stop at anchor year %v", tc.s.Name(), a.Year)
		}
		worst, at := stopsError(t, tc.s, stops, tc.from, tc.to)
		assert.LessOrEqual(t, worst, tc.maxErr, "%s %v–%v maxErr %v: %d stops, worst ΔE00 %.3f at %.2f", tc.s.Name(), tc.from, tc.to, tc.maxErr, len(stops), worst, at)
		t.Logf("%s %v–%v maxErr %v: %d stops, worst ΔE00 %.3f", tc.s.Name(), tc.from, tc.to, tc.maxErr, len(stops), worst)
	}
}

func hasStop(stops []Stop, y float64) bool {
	for _, s := range stops {
		if s.Year == y {
			return true
		}
	}
	return false
}

func TestStopsDiscrete(t *testing.T) {
	s, err := NewScale("e", DefaultAnchors(1900, 2000), []float64{1900, 1930, 1960, 2000})
	require.NoError(t, err)
	eras := s.Eras()
	stops := s.Stops(1910, 2000, 0)
	want := []Stop{
		{1910, eras[0].Color.RGB().Clip()},
		{1930, eras[0].Color.RGB().Clip()}, {1930, eras[1].Color.RGB().Clip()},
		{1960, eras[1].Color.RGB().Clip()}, {1960, eras[2].Color.RGB().Clip()},
		{2000, eras[2].Color.RGB().Clip()},
	}
	// Ending on a boundary keeps the colour of the era before it.
	end := s.Stops(1900, 1960, 0)
	require.NotEmpty(t, end, "stops ending at a boundary")
	assert.Equal(t, Stop{1960, eras[1].Color.RGB().Clip()}, end[len(end)-1], "stops ending at a boundary: %v", end)
	require.Len(t, stops, len(want), "stops %v, want %v", stops, want)
	for i := range want {
		assert.Equal(t, want[i], stops[i], "stop %d = %v, want %v", i, stops[i], want[i])
	}
}

func TestStopsBadRange(t *testing.T) {
	s, _ := Default(1900, 2000)
	for _, r := range [][2]float64{{2000, 1900}, {1950, 1950}, {math.NaN(), 2000}, {1900, math.Inf(1)}} {
		assert.Nil(t, s.Stops(r[0], r[1], 0.5), "Stops(%v, %v)", r[0], r[1])
	}
	// A tiny tolerance is bounded, not a hang.
	assert.LessOrEqual(t, len(s.Stops(1900, 2000, 1e-9)), len(s.Anchors())<<maxStopDepth+1, "stops for a tolerance of 1e-9")
}

func BenchmarkStops(b *testing.B) {
	s, _ := Default(1868, 2025)
	for b.Loop() {
		s.Stops(1868, 2025, DefaultStopError)
	}
}

func BenchmarkAt(b *testing.B) {
	s, _ := Default(1868, 2025)
	y := 1868.0
	for b.Loop() {
		s.At(y)
		y += 0.1
		if y > 2025 {
			y = 1868
		}
	}
}
