package fonts

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/dejavu/dejavusanscondensedbold"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"

	"sheaf/specs"
)

func mustDefault(t testing.TB) *Set {
	t.Helper()
	s, err := Default()
	require.NoError(t, err)
	return s
}

// refWidth measures text with golang.org/x/image/font/sfnt, a
// general-purpose font reader independent of canvas and its HarfBuzz port:
// advances from hmtx plus pair kerning from the kern table, in points.
func refWidth(t *testing.T, ttf []byte, size float64, text string) float64 {
	t.Helper()
	f, err := sfnt.Parse(ttf)
	require.NoError(t, err)
	var b sfnt.Buffer
	upem := f.UnitsPerEm()
	ppem := fixed.I(int(upem)) // one unit per font unit: exact integers
	var sum fixed.Int26_6
	prev := sfnt.GlyphIndex(0)
	for i, r := range text {
		g, err := f.GlyphIndex(&b, r)
		require.NoError(t, err)
		if i > 0 {
			k, err := f.Kern(&b, prev, g, ppem, font.HintingNone)
			require.False(t, err != nil && !errors.Is(err, sfnt.ErrNotFound), err)
			sum += k
		}
		a, err := f.GlyphAdvance(&b, g, ppem, font.HintingNone)
		require.NoError(t, err)
		sum += a
		prev = g
	}
	return float64(sum) / 64 / float64(upem) * size
}

// goSet loads the Go fonts from files, as a spec naming them would: the
// reference widths below were checked on them.
func goSet(t *testing.T) *Set {
	t.Helper()
	dir := t.TempDir()
	for name, b := range map[string][]byte{"Go-Regular.ttf": goregular.TTF, "Go-Bold.ttf": gobold.TTF} {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	spec := &specs.Spec{File: filepath.Join(dir, "feature.yaml"), Dir: dir}
	s, err := Load(spec, &specs.Output{Name: "print", Fonts: specs.Fonts{Regular: "Go-Regular.ttf", Bold: "Go-Bold.ttf"}})
	require.NoError(t, err)
	return s
}

func TestWidthAgainstSfnt(t *testing.T) {
	s := goSet(t)
	// Reference: golang.org/x/image/font/sfnt (general-purpose library),
	// Go fonts v2.008 as embedded in golang.org/x/image/font/gofont.
	tests := []struct {
		style Style
		ttf   []byte
		size  float64
		text  string
	}{
		{Regular, goregular.TTF, 7, "dictionary"},
		{Regular, goregular.TTF, 6.5, "AVA To Wa 1850–1900"},
		{Regular, goregular.TTF, 12, "steam engine"},
		{Bold, gobold.TTF, 18, "Words that rose and fell"},
		{Bold, gobold.TTF, 9, "(continued)"},
	}
	for _, tc := range tests {
		got := s.Width(tc.style, tc.size, tc.text)
		want := refWidth(t, tc.ttf, tc.size, tc.text)
		// HarfBuzz rounds positions to font units; allow 0.5 unit a glyph.
		tol := 0.5 / 2048 * tc.size * float64(len([]rune(tc.text)))
		assert.False(t, math.Abs(got-want) > tol || got <= 0, "%v %g pt %q: width %.4f pt, sfnt says %.4f pt", tc.style, tc.size, tc.text, got, want)
	}
}

func TestWidthScalesWithSize(t *testing.T) {
	// A font's advances are in font units per em, so width is proportional
	// to size (OpenType spec, 'hmtx' table; common practice).
	s := mustDefault(t)
	w7 := s.Width(Regular, 7, "proportional")
	w14 := s.Width(Regular, 14, "proportional")
	assert.InDelta(t, 2*w7, w14, 1e-9, "width at 14 pt %.6f, want twice %.6f", w14, w7)
}

func TestMetricsGoRegular(t *testing.T) {
	// Go Regular: unitsPerEm 2048, hhea ascender 1854, descender -434,
	// lineGap 67 — read with golang.org/x/image/font/sfnt below rather than
	// taken from memory.
	f, err := sfnt.Parse(goregular.TTF)
	require.NoError(t, err)
	var b sfnt.Buffer
	fm, err := f.Metrics(&b, fixed.I(int(f.UnitsPerEm())), font.HintingNone)
	require.NoError(t, err)
	upem := float64(f.UnitsPerEm())
	size := 10.0
	wantAsc := float64(fm.Ascent) / 64 / upem * size
	wantDesc := float64(fm.Descent) / 64 / upem * size
	m := goSet(t).Metrics(Regular, size)
	assert.False(t, math.Abs(m.Ascent-wantAsc) > 1e-6 || math.Abs(m.Descent-wantDesc) > 1e-6, "metrics %+v, sfnt ascent %.6f descent %.6f", m, wantAsc, wantDesc)
}

func TestMetricsDefaultFace(t *testing.T) {
	// The default face's vertical metrics, read with
	// golang.org/x/image/font/sfnt (an independent reader).
	f, err := sfnt.Parse(dejavusanscondensed.TTF)
	require.NoError(t, err)
	var b sfnt.Buffer
	fm, err := f.Metrics(&b, fixed.I(int(f.UnitsPerEm())), font.HintingNone)
	require.NoError(t, err)
	upem := float64(f.UnitsPerEm())
	size := 7.0
	m := mustDefault(t).Metrics(Regular, size)
	if want := float64(fm.Ascent) / 64 / upem * size; math.Abs(m.Ascent-want) > 1e-6 {
		t.Errorf("ascent %.6f, sfnt says %.6f", m.Ascent, want)
	}
	if want := float64(fm.Descent) / 64 / upem * size; math.Abs(m.Descent-want) > 1e-6 {
		t.Errorf("descent %.6f, sfnt says %.6f", m.Descent, want)
	}
}

func TestBaselineCentresGlyphsInLineBox(t *testing.T) {
	// CSS 2.1 §10.8.1: half the leading above the ascent, half below the
	// descent.
	s := mustDefault(t)
	size, leading, top := 10.0, 1.4, 500.0
	m := s.Metrics(Regular, size)
	base := s.Baseline(Regular, size, leading, top)
	above := top - (base + m.Ascent)
	below := (base - m.Descent) - (top - size*leading)
	assert.False(t, math.Abs(above-below) > 1e-9 || above < 0, "space above %.6f, below %.6f", above, below)
}

func TestWrap(t *testing.T) {
	s := mustDefault(t)
	text := "An invented dek: how forty words of the trade rose and fell across two centuries of printed pages, drawn one small chart at a time."
	for _, width := range []float64{60, 120, 200, 400, 2000} {
		lines := s.Wrap(Regular, 9, text, width)
		if got := strings.Join(lines, " "); got != text {
			t.Fatalf("width %g: words changed: %q", width, got)
		}
		for i, l := range lines {
			if w := s.Width(Regular, 9, l); w > width && strings.Contains(l, " ") {
				t.Errorf("width %g: line %d %q is %.2f pt wide", width, i, l, w)
			}
			// Greedy: the next line's first word would not have fitted.
			if i+1 < len(lines) {
				next := strings.Fields(lines[i+1])[0]
				if w := s.Width(Regular, 9, l+" "+next); w <= width {
					t.Errorf("width %g: %q fits on line %d (%.2f pt)", width, next, i, w)
				}
			}
		}
	}
	if got := s.Wrap(Regular, 9, "one\ntwo  three", 1000); len(got) != 2 || got[1] != "two three" {
		t.Errorf("hard break: %q", got)
	}
	if got := s.Wrap(Regular, 9, "  ", 100); len(got) != 0 {
		t.Errorf("blank text gave %q", got)
	}
	if got := s.Wrap(Regular, 9, "unbreakablewordthatiswide", 10); len(got) != 1 {
		t.Errorf("overlong word: %q", got)
	}
}

func TestLoadFiles(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "Face-Bold.ttf"), gobold.TTF, 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "notafont.ttf"), []byte("plain text, not a font"), 0o644))
	spec := &specs.Spec{File: filepath.Join(dir, "feature.yaml"), Dir: dir}

	out := &specs.Output{Name: "print", Fonts: specs.Fonts{Regular: "Face-Bold.ttf"}}
	s, err := Load(spec, out)
	require.NoError(t, err)
	assert.False(t, &s.Regular()[0] == &goregular.TTF[0] || len(s.Regular()) != len(gobold.TTF), "regular face not read from the file")
	assert.False(t, s.Path(Regular) != filepath.Join(dir, "Face-Bold.ttf") || s.Path(Bold) != "", "paths %q %q", s.Path(Regular), s.Path(Bold))
	assert.False(t, len(s.Italic()) != len(s.Regular()), "italic should fall back to the custom regular face")

	for _, tc := range []struct{ file, want string }{
		{"missing.ttf", "cannot read font \"missing.ttf\""},
		{"notafont.ttf", "\"notafont.ttf\" (resolved to \"" + filepath.Join(dir, "notafont.ttf") + "\") is not a usable"},
	} {
		out := &specs.Output{Name: "print", Fonts: specs.Fonts{Bold: tc.file}}
		_, err := Load(spec, out)
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "fonts.bold") {
			t.Errorf("%s: error %v, want it to contain %q", tc.file, err, tc.want)
		}
	}
}

func TestDefaultBytesAreDejaVuSansCondensed(t *testing.T) {
	s := mustDefault(t)
	assert.False(t, !bytes.Equal(s.Regular(), dejavusanscondensed.TTF) || !bytes.Equal(s.Bold(), dejavusanscondensedbold.TTF) || len(s.Italic()) == 0, "default set does not hold DejaVu Sans Condensed")
	// Full names (name ID 4) as the DejaVu 2.37 files in
	// github.com/go-fonts/dejavu v0.3.2 carry them.
	assert.Equal(t, "DejaVuSansCondensed", s.Name(Regular))
	assert.Equal(t, "DejaVuSansCondensed-Bold", s.Name(Bold))
	assert.False(t, s.Name(Bold) == s.Name(Regular), "bold and regular share the name %q", s.Name(Bold))
}

func TestConcurrentMeasuring(t *testing.T) {
	s := mustDefault(t)
	want := s.Width(Regular, 8, "concurrent")
	var wg sync.WaitGroup
	for range 8 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 50 {
				if got := s.Width(Regular, 8, "concurrent"); got != want {
					t.Errorf("width %v, want %v", got, want)
					return
				}
			}
		}()
	}
	wg.Wait()
}

// BenchmarkWidthCached is a repeated measurement, answered by the Set's cache.
func BenchmarkWidthCached(b *testing.B) {
	s := mustDefault(b)
	for b.Loop() {
		s.Width(Regular, 7, "dictionary")
	}
}

// BenchmarkWidthShaping measures shaping a string not seen before.
func BenchmarkWidthShaping(b *testing.B) {
	s := mustDefault(b)
	i := 0.0
	for b.Loop() {
		i++
		s.Width(Regular, 7+i/1e6, "dictionary") // a new size defeats the cache
	}
}
