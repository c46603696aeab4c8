package series

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/stat/distuv"

	"sheaf/specs"
)

var nan = math.NaN()

func ones(n int) []float64 {
	e := make([]float64, n)
	for i := range e {
		e[i] = 1
	}
	return e
}

func ratio(c, e []float64) []float64 {
	v := make([]float64, len(c))
	for i := range c {
		v[i] = c[i] / e[i]
	}
	return v
}

// TestPoolMovingAverage checks the centred moving average (exposure one a
// year, so pooled ÷ exposure is the plain mean) against published worked
// examples. Interior years have a whole window and must match the source;
// end years are this project's rule (the window is cut at the end), worked
// by hand beside each row.
func TestPoolMovingAverage(t *testing.T) {
	tests := []struct {
		name   string
		source string
		x      []float64
		years  int
		want   []float64
	}{
		{
			name: "NIST supplier data, 3-term centred MA",
			// NIST/SEMATECH e-Handbook of Statistical Methods, §6.4.2.1
			// "Single Moving Average", the centred moving-average table
			// (periods 1–7: 9, 8, 9, 12, 9, 12, 11; MA of 3 at periods 2–6:
			// 8.667, 9.667, 10.000, 11.000, 10.667). FROM MEMORY: the page
			// was not in this project's search store; each value agrees
			// with the handbook's stated rule (mean of the period and its
			// two neighbours).
			source: "NIST/SEMATECH §6.4.2.1 [from memory]",
			x:      []float64{9, 8, 9, 12, 9, 12, 11},
			years:  3,
			// ends: (9+8)/2 = 8.5 and (12+11)/2 = 11.5 (window cut).
			want: []float64{8.5, 26.0 / 3, 29.0 / 3, 10, 11, 32.0 / 3, 11.5},
		},
		{
			name: "three-term moving average of 1, 7, 4, 10, 4",
			// Colman, A Dictionary of Psychology, 4th ed. (Oxford), entry
			// "moving average": 1, 7, 4, 10, 4 → 4, 7, 6.
			source: "Oxford Dictionary of Psychology 4th ed., 'moving average'",
			x:      []float64{1, 7, 4, 10, 4},
			years:  3,
			// ends: (1+7)/2 = 4, (10+4)/2 = 7.
			want: []float64{4, 4, 7, 6, 7},
		},
		{
			name: "two-sided 3MA of 4, 5, 3, 4, 5",
			// planetcalc.com "Centered Moving Average" (ciphers.planetcalc.com/7899):
			// two-sided 3MA of 4, 5, 3, 4, 5 is N/A, 4, 4, 4, N/A.
			source: "planetcalc 7899 two-sided 3MA table",
			x:      []float64{4, 5, 3, 4, 5},
			years:  3,
			// ends: (4+5)/2 = 4.5, (4+5)/2 = 4.5.
			want: []float64{4.5, 4, 4, 4, 4.5},
		},
		{
			name: "5-year window shrinking at both ends",
			// hand-worked: 1..7; year 1 pools 1–3 (2), year 2 pools 1–4
			// (2.5), years 3–5 whole windows (3, 4, 5), year 6 pools 4–7
			// (5.5), year 7 pools 5–7 (6).
			source: "hand-worked",
			x:      []float64{1, 2, 3, 4, 5, 6, 7},
			years:  5,
			want:   []float64{2, 2.5, 3, 4, 5, 5.5, 6},
		},
		{
			name: "a gap year is never reached across",
			// hand-worked: the run 1, 2 and the run 4, 5, 6 are pooled
			// apart: (1+2)/2, (1+2)/2, gap, (4+5)/2, 5, (5+6)/2.
			source: "hand-worked",
			x:      []float64{1, 2, nan, 4, 5, 6},
			years:  3,
			want:   []float64{1.5, 1.5, nan, 4.5, 5, 5.5},
		},
		{
			name:   "one year alone at a gap",
			source: "hand-worked: 3 has gaps on both sides, so it stays 3",
			x:      []float64{nan, 3, nan, 8, 2},
			years:  5,
			want:   []float64{nan, 3, nan, 5, 5},
		},
		{
			name:   "no smoothing",
			source: "definition: years 0 is each year alone",
			x:      []float64{3, 0, 7},
			years:  0,
			want:   []float64{3, 0, 7},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c, e := Pool(tt.x, ones(len(tt.x)), tt.years)
			got := ratio(c, e)
			require.Len(t, got, len(tt.want))
			for i, w := range tt.want {
				if math.IsNaN(w) {
					assert.True(t, math.IsNaN(got[i]), "year %d: want a gap (%s)", i, tt.source)
					continue
				}
				assert.InDelta(t, w, got[i], 1e-12, "year %d (%s)", i, tt.source)
			}
		})
	}
}

// TestPoolShares checks that shares are pooled — window counts summed
// over window totals — and not averaged year by year. Hand-worked: counts
// 9, 1, 2 of totals 1000, 100, 100 are yearly shares .009, .01, .02
// (mean .013), but the middle year's pooled share is 12/1200 = .01; the
// ends pool two years: 10/1100 and 3/200.
func TestPoolShares(t *testing.T) {
	c, e := Pool([]float64{9, 1, 2}, []float64{1000, 100, 100}, 3)
	assert.Equal(t, []float64{10, 12, 3}, c, "pooled counts (hand-worked)")
	assert.Equal(t, []float64{1100, 1200, 200}, e, "pooled totals (hand-worked)")
	got := ratio(c, e)
	assert.InDelta(t, 10.0/1100, got[0], 1e-15)
	assert.InDelta(t, 0.01, got[1], 1e-15, "pooled, not the mean of shares (.013)")
	assert.InDelta(t, 0.015, got[2], 1e-15)
}

// TestRollingSmall loads testdata/small with a 3-year window and checks
// every plotted value, hand-worked from counts.csv and totals.csv
// (1903 is a gap: no total):
//
//	boiler 1900: (50+40)/(100000+120000)×1e6 = 409.0909…
//	       1901: (50+40+20)/330000×1e6 = 333.333…
//	       1902: (40+20)/230000×1e6 = 260.8696…  (1903 is not reached)
//	       1904, 1905: 0
//	telegraph 1900: 5/220000×1e6; 1901: 5/330000×1e6; 1902: 5/230000×1e6;
//	       1904 and 1905: (30+60)/280000×1e6 = 321.4286… (peak: 1904, first)
func TestRollingSmall(t *testing.T) {
	s, err := specs.Load(small)
	require.NoError(t, err)
	s.Scale = specs.Scale{Mode: specs.ScaleShare, YRange: specs.YOwn, Rolling: 3}
	set, err := Load(s)
	require.NoError(t, err)
	assert.Equal(t, 3, set.Rolling)
	assert.Equal(t, "3-year rolling share", set.Note())
	byTerm := map[string]*Series{}
	for i := range set.Series {
		byTerm[set.Series[i].Term] = &set.Series[i]
	}
	sameValues(t, "boiler", byTerm["boiler"].Values, []float64{90e6 / 220000, 110e6 / 330000, 60e6 / 230000, gap, 0, 0})
	tg := byTerm["telegraph"]
	sameValues(t, "telegraph", tg.Values, []float64{5e6 / 220000, 5e6 / 330000, 5e6 / 230000, gap, 90e6 / 280000, 90e6 / 280000})
	assert.Equal(t, 1904, tg.PeakYear)
	assert.InDelta(t, 90e6/280000, tg.Peak, 1e-9)
	// The raw counts and the unsmoothed yearly shares are kept: spikes
	// are found on them (1905: 60/150000×1e6 = 400).
	sameValues(t, "telegraph counts", tg.Counts, []float64{0, 5, 0, gap, 30, 60})
	sameValues(t, "telegraph yearly", set.Yearly(tg), []float64{0, 5e6 / 120000, 0, gap, 30e6 / 130000, 400})

	// Own-peak scales the smoothed line to its own peak; the factor
	// carries the same scaling for the band.
	s.Scale = specs.Scale{Mode: specs.ScaleOwnPeak, YRange: specs.YShared, Rolling: 3}
	set, err = Load(s)
	require.NoError(t, err)
	for i := range set.Series {
		if set.Series[i].Term == "telegraph" {
			tg = &set.Series[i]
		}
	}
	sameValues(t, "telegraph own-peak", tg.Values, []float64{28.0 / 220 * 5 / 9 * 1, 28.0 / 330 * 5 / 9, 28.0 / 230 * 5 / 9, gap, 1, 1})
	assert.InDelta(t, 1e6/(90e6/280000), tg.Factor, 1e-12, "factor = 10⁶ ÷ peak share")

	// Raw counts pool to a mean per year: telegraph 1904–1905 (30+60)/2.
	s.Scale = specs.Scale{Mode: specs.ScaleRaw, YRange: specs.YOwn, Rolling: 3}
	set, err = Load(s)
	require.NoError(t, err)
	assert.Equal(t, "3-year rolling mean", set.Note())
	for i := range set.Series {
		if set.Series[i].Term == "telegraph" {
			sameValues(t, "telegraph raw", set.Series[i].Values, []float64{2.5, 5.0 / 3, 2.5, gap, 45, 45})
		}
	}
}

// Published exact (Garwood) 95 % Poisson limits for a count k. Sources:
//
//	[calc]  calculatorhub.com Poisson confidence interval calculator (Garwood
//	        method): k = 0 upper 3.689; k = 10: 4.80 to 18.39.
//	[epi]   R epitools, pois.exact documentation: x = 0 upper limit 3.689.
//	[gp]    GraphPad FAQ "How QuickCalcs computes the confidence interval of
//	        a count" (Garwood): 25 → 90 % 17.38–34.92, 95 % 16.18–36.90,
//	        99 % 14.00–41.00.
//	[mem]   the usual printed table of exact Poisson limits (e.g. in
//	        Documenta Geigy / Sahai & Khurshid 1993), FROM MEMORY:
//	        k = 1: 0.0253–5.572; 2: 0.2422–7.225; 5: 1.623–11.668.
var poissonTable = []struct {
	k, level, lower, upper, tol float64
	source                      string
}{
	{0, 0.95, 0, 3.689, 0.0005, "[calc], [epi]"},
	{1, 0.95, 0.0253, 5.572, 0.0005, "[mem]"},
	{2, 0.95, 0.2422, 7.225, 0.0005, "[mem]"},
	{5, 0.95, 1.623, 11.668, 0.0005, "[mem]"},
	{10, 0.95, 4.80, 18.39, 0.005, "[calc]"},
	{25, 0.90, 17.38, 34.92, 0.005, "[gp]"},
	{25, 0.95, 16.18, 36.90, 0.005, "[gp]"},
	{25, 0.99, 14.00, 41.00, 0.005, "[gp]"},
}

func TestPoissonIntervalPublished(t *testing.T) {
	for _, r := range poissonTable {
		lo, hi := PoissonInterval(r.k, r.level)
		assert.InDelta(t, r.lower, lo, r.tol, "k=%g at %g lower (%s)", r.k, r.level, r.source)
		assert.InDelta(t, r.upper, hi, r.tol, "k=%g at %g upper (%s)", r.k, r.level, r.source)
	}
}

// TestPoissonIntervalGonum checks the interval against Garwood's formula
// evaluated with gonum's χ² quantiles (gonum.org/v1/gonum/stat/distuv
// ChiSquared.Quantile, v0.17.0): lower χ²(α/2; 2k)/2, upper
// χ²(1−α/2; 2k+2)/2, for whole and fractional counts and three levels.
func TestPoissonIntervalGonum(t *testing.T) {
	for _, level := range []float64{0.8, 0.9, 0.95, 0.99, 0.999} {
		alpha := 1 - level
		for _, k := range []float64{0, 0.5, 1, 2, 3, 4.25, 5, 7, 10, 20, 37.5, 100, 250, 1000, 12345} {
			lo, hi := PoissonInterval(k, level)
			wantLo := 0.0
			if k > 0 {
				wantLo = distuv.ChiSquared{K: 2 * k}.Quantile(alpha/2) / 2
			}
			wantHi := distuv.ChiSquared{K: 2*k + 2}.Quantile(1-alpha/2) / 2
			assert.InDelta(t, wantLo, lo, 1e-9*math.Max(1, wantLo), "k=%g level %g lower (gonum)", k, level)
			assert.InDelta(t, wantHi, hi, 1e-9*math.Max(1, wantHi), "k=%g level %g upper (gonum)", k, level)
			assert.LessOrEqual(t, lo, k)
			assert.Greater(t, hi, k)
		}
	}
}

// TestBandSmall: the band of a loaded set is the interval of each year's
// pooled count ÷ its pooled total, scaled like the line. telegraph with a
// 3-year window, 1904: pooled count 90 over 280000 words; its 95 %
// interval is gonum's χ² quantiles halved (Garwood 1936).
func TestBandSmall(t *testing.T) {
	s, err := specs.Load(small)
	require.NoError(t, err)
	s.Scale = specs.Scale{Mode: specs.ScaleShare, YRange: specs.YOwn, Rolling: 3}
	set, err := Load(s)
	require.NoError(t, err)
	var tg *Series
	for i := range set.Series {
		if set.Series[i].Term == "telegraph" {
			tg = &set.Series[i]
		}
	}
	lo, hi := set.Band(tg, NewIntervals(0.95))
	wantLo := distuv.ChiSquared{K: 180}.Quantile(0.025) / 2 / 280000 * 1e6
	wantHi := distuv.ChiSquared{K: 182}.Quantile(0.975) / 2 / 280000 * 1e6
	assert.InDelta(t, wantLo, lo[4], 1e-7)
	assert.InDelta(t, wantHi, hi[4], 1e-7)
	assert.True(t, math.IsNaN(lo[3]), "gap year has no band: low %v", lo[3])
	assert.True(t, math.IsNaN(hi[3]), "gap year has no band: high %v", hi[3])
	for j, v := range tg.Values {
		if !math.IsNaN(v) {
			assert.LessOrEqual(t, lo[j], v, "year %d: the line lies inside its band", j)
			assert.GreaterOrEqual(t, hi[j], v, "year %d", j)
		}
	}
	// 1900: pooled count 5 (0 + 5) over 220000 words; k = 5 → the table's
	// 1.623–11.668 [mem], scaled.
	assert.InDelta(t, 1.623/220000*1e6, lo[0], 0.0005/220000*1e6)
	assert.InDelta(t, 11.668/220000*1e6, hi[0], 0.0005/220000*1e6)
}

// TestYearlyHandBuilt: a Set built by hand, without counts, gives its
// values as the yearly values (nothing to pool).
func TestYearlyHandBuilt(t *testing.T) {
	set := &Set{}
	sr := &Series{Values: []float64{1, 4, nan}}
	got := set.Yearly(sr)
	assert.Equal(t, 4.0, got[1])
	raw := &Series{Counts: []float64{2, 3}}
	assert.Equal(t, []float64{2, 3}, set.Yearly(raw), "no totals, no factor: the counts")
}
