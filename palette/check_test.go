package palette

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestDefaultPassesEveryCheck(t *testing.T) {
	white := mustHex(t, "#ffffff")
	for _, tc := range []struct {
		from, to float64
		eras     []float64
		width    float64
		m        Medium
	}{
		{1868, 2025, nil, 0.75, Print},
		{1900, 2000, nil, 0.75, Print},
		{1868, 2025, nil, 1, Screen},
		{1900, 2000, nil, 0.5, Screen},
		{1868, 2025, []float64{1868, 1900, 1930, 1960, 1990, 2025}, 0.75, Print},
		{1900, 2000, []float64{1900, 1914, 1939, 1945, 1970, 1989, 2000}, 1, Print},
	} {
		s, err := NewScale(DefaultName, DefaultAnchors(tc.from, tc.to), tc.eras)
		require.NoError(t, err)
		r, err := Check(s, white, tc.width, tc.m, DefaultThresholds())
		require.NoError(t, err)
		for _, f := range r.Findings {
			assert.False(t, f.Severity == Fail, "%v–%v eras %v: %v", tc.from, tc.to, tc.eras, f)
		}
		assert.False(t, r.Failed(), "%v–%v: report failed", tc.from, tc.to)
	}
}

// Each bad palette breaks one check; the finding must name the year or
// era and carry the numbers.
func TestBadPalettesFail(t *testing.T) {
	white := mustHex(t, "#ffffff")
	lab := func(l, a, b float64) Color { return FromLab(Lab{l, a, b}) }
	th := DefaultThresholds()
	for _, tc := range []struct {
		name     string
		anchors  []Anchor
		eras     []float64
		th       func(*Thresholds)
		check    string
		severity Severity
		label    string
		want     []string // substrings of the message
	}{
		{
			name:    "lightness turns back",
			anchors: []Anchor{{1900, lab(55, 50, 20)}, {1950, lab(30, 20, -50)}, {2000, lab(50, -40, 30)}},
			eras:    []float64{1900, 1925, 1950, 1975, 2000},
			check:   CheckLightness, severity: Fail, label: "1975–2000",
			want: []string{"L* runs decreasing", "1950–1974 to 1975–2000", "35.4 → 45.3"},
		},
		{
			name:    "declared direction",
			anchors: []Anchor{{1900, lab(30, 40, -40)}, {2000, lab(58, 50, 30)}},
			th:      func(th *Thresholds) { th.Lightness = LightnessDecreasing },
			check:   CheckLightness, severity: Fail, label: "1910",
			want: []string{"L* runs decreasing", "1900 to 1910"},
		},
		{
			name:    "steps too close",
			anchors: []Anchor{{1900, lab(50, 40, -30)}, {1950, lab(49, 41, -30)}, {2000, lab(30, -30, 20)}},
			eras:    []float64{1900, 1930, 1960, 2000},
			check:   CheckStep, severity: Fail, label: "1930–1959",
			want: []string{"adjacent eras 1900–1929 and 1930–1959", "< 5.00", "heuristic"},
		},
		{
			name:    "span too short",
			anchors: []Anchor{{1900, lab(40, 30, -40)}, {2000, lab(35, 30, -50)}},
			check:   CheckSpan, severity: Fail, label: "",
			want: []string{"first (1900", "last (2000", "< 30.00"},
		},
		{
			name:    "yellow vanishes on white",
			anchors: []Anchor{{1900, mustHex(t, "#2a3f9d")}, {1950, mustHex(t, "#3f8f4f")}, {2000, mustHex(t, "#ffe14d")}},
			check:   CheckContrast, severity: Fail, label: "2000",
			want: []string{"#ffe14d", ":1 against paper #ffffff < 3.00:1", "WCAG 2.1 SC 1.4.11"},
		},
		{
			name:    "outside sRGB",
			anchors: []Anchor{{1900, FromOKLCh(OKLCh{0.62, 0.3, 150})}, {2000, lab(25, 10, -40)}},
			check:   CheckGamut, severity: Warn, label: "1900",
			want: []string{"outside sRGB", "clipped", "ΔE00"},
		},
		{
			name:    "red and green at one lightness",
			anchors: deuteranConfusion(t, []float64{0.16, 0.20, 0.195, 0.21, 0.24}),
			eras:    []float64{1890, 1910, 1930, 1950, 1970, 1990},
			th:      func(th *Thresholds) { th.Lightness = LightnessAny },
			check:   CheckCVD + "/deuteranopia", severity: Fail, label: "",
			want: []string{"order unreadable under simulated deuteranopia", "< 2.00", "simulated L* stops running"},
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := NewScale(tc.name, tc.anchors, tc.eras)
			require.NoError(t, err)
			th := th
			if tc.th != nil {
				tc.th(&th)
			}
			r, err := Check(s, white, 0.75, Print, th)
			require.NoError(t, err)
			var found *Finding
			for i, f := range r.Findings {
				if f.Check == tc.check && f.Severity == tc.severity && (tc.label == "" || f.Label == tc.label) {
					found = &r.Findings[i]
					break
				}
			}
			if found == nil {
				var buf bytes.Buffer
				r.WriteTable(&buf)
				require.FailNow(t, "finding missing", "no %v %s finding at %q:\n%s", tc.severity, tc.check, tc.label, buf.String())
			}
			for _, w := range tc.want {
				assert.True(t, strings.Contains(found.Message, w), "message %q lacks %q", found.Message, w)
			}
			assert.True(t, strings.ContainsAny(found.Message, "0123456789"), "message %q has no numbers", found.Message)
			assert.False(t, tc.severity == Fail && !r.Failed(), "report not failed")
		})
	}
}

// deuteranConfusion makes one colour per grey level, pushed alternately
// either way along the null direction of the deuteranopia matrix (Machado
// et al. 2009): normal vision sees reds against greens, the simulation
// sees only the greys, which here zig-zag in lightness.
func deuteranConfusion(t *testing.T, greys []float64) []Anchor {
	m := machado[Deuteranopia]
	r0, r1 := m[0], m[1]
	n := [3]float64{r0[1]*r1[2] - r0[2]*r1[1], r0[2]*r1[0] - r0[0]*r1[2], r0[0]*r1[1] - r0[1]*r1[0]}
	require.LessOrEqual(t, math.Abs(m[2][0]*n[0]+m[2][1]*n[1]+m[2][2]*n[2]), 1e-3*math.Hypot(n[0], math.Hypot(n[1], n[2])), "deuteranopia matrix is not of rank 2")
	k := 0.12 / math.Max(math.Abs(n[0]), math.Max(math.Abs(n[1]), math.Abs(n[2])))
	var out []Anchor
	for i, g := range greys {
		sign := float64(1 - 2*(i%2))
		c := FromRGB(LinearRGB{g + sign*k*n[0], g + sign*k*n[1], g + sign*k*n[2]}.RGB())
		require.True(t, c.InGamut(), "confusion colour %d outside sRGB", i)
		out = append(out, Anchor{1900 + 20*float64(i), c})
	}
	return out
}

func TestSizeGuidance(t *testing.T) {
	white := mustHex(t, "#ffffff")
	// Two colours 3 L* apart: noticeable for nobody at any line width.
	s, _ := NewScale("faint", []Anchor{{1900, FromLab(Lab{40, 0, -30})}, {2000, FromLab(Lab{37, 0, -30})}}, nil)
	th := DefaultThresholds()
	th.MinSpan, th.MinStep = 1, 0.1
	for _, tc := range []struct {
		width float64
		sev   Severity
	}{
		// 0.043°: outside the fitted range, but the span holds 1 class
		// against the 6 eras a 20-year key would label: a warning anyway.
		{0.75, Warn},
		{20, Warn}, // 1.16°: inside 1/3°–6°, ND50 L* ≈ 5.7 > 3
	} {
		r, err := Check(s, white, tc.width, Print, th)
		require.NoError(t, err)
		var got []Finding
		for _, f := range r.Findings {
			if f.Check == CheckSize {
				got = append(got, f)
			}
		}
		if assert.Len(t, got, 1, "%v pt: size findings", tc.width) {
			assert.Equal(t, tc.sev, got[0].Severity, "%v pt: size finding", tc.width)
			assert.Contains(t, got[0].Message, "does not", "%v pt: size finding", tc.width)
		}
	}
}

func TestCheckErrors(t *testing.T) {
	white := mustHex(t, "#ffffff")
	s, _ := Default(1900, 2000)
	bad := DefaultThresholds()
	bad.MinStep = -1
	nanTh := DefaultThresholds()
	nanTh.MinSpan = math.NaN()
	for _, tc := range []struct {
		name  string
		s     Scale
		paper Color
		width float64
		m     Medium
		th    Thresholds
		want  string
	}{
		{"empty scale", Scale{}, white, 1, Print, DefaultThresholds(), "no anchors"},
		{"zero width", s, white, 0, Print, DefaultThresholds(), "line width 0 pt"},
		{"NaN width", s, white, math.NaN(), Print, DefaultThresholds(), "line width NaN pt"},
		{"medium", s, white, 1, Medium(7), DefaultThresholds(), "unknown medium"},
		{"negative threshold", s, white, 1, Print, bad, "MinStep = -1"},
		{"NaN threshold", s, white, 1, Print, nanTh, "MinSpan = NaN"},
		{"zero thresholds", s, white, 1, Print, Thresholds{}, "SampleYears = 0"},
		{"too many samples", s, white, 1, Print, func() Thresholds { th := DefaultThresholds(); th.SampleYears = 1e-3; return th }(), "raise SampleYears"},
		{"paper", s, FromOKLCh(OKLCh{0.9, 0.4, 120}), 1, Print, DefaultThresholds(), "paper colour"},
	} {
		_, err := Check(tc.s, tc.paper, tc.width, tc.m, tc.th)
		assert.ErrorContains(t, err, tc.want, tc.name)
	}
}

func TestWriteTable(t *testing.T) {
	white := mustHex(t, "#ffffff")
	s, _ := Default(1868, 2025)
	r, err := Check(s, white, 0.75, Print, DefaultThresholds())
	require.NoError(t, err)
	var a, b bytes.Buffer
	require.NoError(t, r.WriteTable(&a))
	r2, _ := Check(s, white, 0.75, Print, DefaultThresholds())
	r2.WriteTable(&b)
	assert.True(t, bytes.Equal(a.Bytes(), b.Bytes()), "table not deterministic")
	out := a.String()
	first, last := s.At(1868).Clip().Hex(), s.At(2025).Clip().Hex()
	for _, w := range []string{"palette " + DefaultName + ", 1868–2025, paper #ffffff, print, line 0.75 pt", "ΔE00", "contrast", "1868", first, "2025", last,
		"distinguishable classes at 0.75 pt: 2 (", "the key labels 8 eras", "WARN size", "\nWARN (no check fails, but 1 warning: see above)\n"} {
		assert.True(t, strings.Contains(out, w), "table lacks %q:\n%s", w, out)
	}
	assert.Len(t, r.Rows, 17, "rows") // 157 years → 16 steps of 9.8 years
}

func TestParseDirection(t *testing.T) {
	for s, want := range map[string]Direction{"": LightnessAuto, "auto": LightnessAuto, "increasing": LightnessIncreasing, "decreasing": LightnessDecreasing, "any": LightnessAny} {
		got, err := ParseDirection(s)
		if assert.NoError(t, err, "ParseDirection(%q)", s) {
			assert.Equal(t, want, got, "ParseDirection(%q)", s)
		}
	}
	_, err := ParseDirection("up")
	assert.ErrorContains(t, err, `"up"`, "ParseDirection(up) names the value")
}

func BenchmarkCheck(b *testing.B) {
	s, _ := Default(1868, 2025)
	white := FromRGB(RGB{1, 1, 1})
	for b.Loop() {
		Check(s, white, 0.75, Print, DefaultThresholds())
	}
}

// TestSweepFindsColoursBetweenSamples: a yellow anchor three years wide
// sits between the table's decade samples (1898 and 1908 for 1868–2025).
// It is drawn on every line, so the check must find it. Yellow #ffff00 on
// white has contrast 1.07:1, computed from the WCAG 2.1 definition of
// relative luminance (Y = 0.2126 R + 0.7152 G + 0.0722 B for linear sRGB).
func TestSweepFindsColoursBetweenSamples(t *testing.T) {
	white := mustHex(t, "#ffffff")
	mid := mustHex(t, "#b04ca6")
	s, err := NewScale("bright insert", []Anchor{
		{1868, mustHex(t, "#b84ca2")}, {1899, mid}, {1901, mustHex(t, "#ffff00")}, {1903, mid}, {2025, mustHex(t, "#105564")},
	}, nil)
	require.NoError(t, err)
	r, err := Check(s, white, 0.75, Print, DefaultThresholds())
	require.NoError(t, err)
	var found *Finding
	for i, f := range r.Findings {
		if f.Check == CheckContrast {
			found = &r.Findings[i]
		}
	}
	require.NotNil(t, found, "no contrast finding; findings: %v", r.Findings)
	assert.Equal(t, Fail, found.Severity, "contrast finding %v", found)
	assert.EqualValues(t, 1901, found.Year, "contrast finding %v", found)
	assert.Contains(t, found.Message, "1.07:1", "contrast finding")
	for _, row := range r.Rows {
		require.False(t, row.Year > 1899 && row.Year < 1903, "a table row at %v: the test must put the anchor between samples", row.Year)
	}
}

// Classes counts by a greedy walk from the first year. On a grey ramp
// L* 30 → 80 with ND L* = 9.9 (a and b never noticeable) the classes
// start at L* 30, 39.9, 49.8, 59.7, 69.6 and 79.5: six. Worked by hand.
func TestClassesGreyRamp(t *testing.T) {
	s, err := NewScale("grey", []Anchor{{1900, FromLab(Lab{30, 0, 0})}, {2000, FromLab(Lab{80, 0, 0})}}, nil)
	require.NoError(t, err)
	nd := Lab{9.9, 1000, 1000}
	assert.Equal(t, 6, Classes(s, nd))
	assert.Equal(t, 1, Classes(s, Lab{51, 1000, 1000}), "no step reaches the ND: one class")
	assert.Equal(t, 2, Classes(s, Lab{49.9, 1000, 1000}), "first vs last just over the ND: two")
	// A stepped scale is walked era by era: five eras, each the colour at
	// its mid-year (L* 35, 45, 55, 65, 75), with ND 19.9 → the 1st, 3rd
	// and 5th start classes: three.
	st, err := NewScale("grey", []Anchor{{1900, FromLab(Lab{30, 0, 0})}, {2000, FromLab(Lab{80, 0, 0})}}, []float64{1900, 1920, 1940, 1960, 1980, 2000})
	require.NoError(t, err)
	assert.Equal(t, 3, Classes(st, Lab{19.9, 1000, 1000}))
	assert.Equal(t, 0, Classes(Scale{}, nd))
}

// The size check warns exactly when the span holds fewer classes than
// the key labels eras, and the table and verdict say so.
func TestSizeClassesAgainstKey(t *testing.T) {
	white := mustHex(t, "#ffffff")
	s, err := Default(1868, 2025)
	require.NoError(t, err)
	for _, tc := range []struct {
		widthPt float64
		keyEras int
		warn    bool
	}{
		{0.75, 0, true},  // default key: 8 labels (1880 … 2020); 2 classes at 0.043°
		{0.75, 2, false}, // a key of 2 eras asks no more than the lines carry
		{40, 0, false},   // 2.3°: inside the fitted range, enough classes for 8 eras
		{40, 40, true},   // but not for 40
	} {
		th := DefaultThresholds()
		th.KeyEras = tc.keyEras
		r, err := Check(s, white, tc.widthPt, Print, th)
		require.NoError(t, err)
		if tc.keyEras == 0 {
			assert.Equal(t, 8, r.KeyEras, "default key eras for 1868–2025")
		} else {
			assert.Equal(t, tc.keyEras, r.KeyEras)
		}
		assert.Equal(t, Classes(s, r.ND), r.Classes)
		var size []Finding
		for _, f := range r.Findings {
			if f.Check == CheckSize {
				size = append(size, f)
			}
		}
		require.Len(t, size, 1)
		assert.Equal(t, tc.warn, size[0].Severity == Warn, "%v pt, key %d eras, %d classes: %v", tc.widthPt, r.KeyEras, r.Classes, size[0])
		assert.Equal(t, tc.warn, r.Classes < r.KeyEras)
		var b bytes.Buffer
		require.NoError(t, r.WriteTable(&b))
		assert.Contains(t, b.String(), fmt.Sprintf("distinguishable classes at %.2f pt: %d (", tc.widthPt, r.Classes))
		if tc.warn {
			assert.Contains(t, b.String(), "\nWARN (")
			assert.NotContains(t, b.String(), "\nPASS\n")
		}
	}
	bad := DefaultThresholds()
	bad.KeyEras = -1
	_, err = Check(s, white, 1, Print, bad)
	assert.ErrorContains(t, err, "KeyEras = -1")
}
