package fonts

import (
	"bytes"
	"errors"
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
			if !errors.Is(err, sfnt.ErrNotFound) { // no kerning for the pair: none added
				require.NoError(t, err, "kern %q", text)
			}
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
		assert.InDelta(t, want, got, tol, "%v %g pt %q: width in pt against sfnt's", tc.style, tc.size, tc.text)
		assert.Positive(t, got, "%v %g pt %q: width in pt", tc.style, tc.size, tc.text)
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
	assert.InDelta(t, wantAsc, m.Ascent, 1e-6, "ascent in pt, against sfnt's")
	assert.InDelta(t, wantDesc, m.Descent, 1e-6, "descent in pt, against sfnt's")
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
	assert.InDelta(t, float64(fm.Ascent)/64/upem*size, m.Ascent, 1e-6, "ascent in pt, against sfnt's")
	assert.InDelta(t, float64(fm.Descent)/64/upem*size, m.Descent, 1e-6, "descent in pt, against sfnt's")
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
	assert.InDelta(t, above, below, 1e-9, "space below the descent vs above the ascent (pt)")
	assert.GreaterOrEqual(t, above, 0.0, "space above the ascent (pt)")
}

func TestWrap(t *testing.T) {
	s := mustDefault(t)
	text := "An invented dek: how forty words of the trade rose and fell across two centuries of printed pages, drawn one small chart at a time."
	for _, width := range []float64{60, 120, 200, 400, 2000} {
		lines := s.Wrap(Regular, 9, text, width)
		require.Equal(t, text, strings.Join(lines, " "), "width %g: words changed", width)
		for i, l := range lines {
			if strings.Contains(l, " ") { // a single word may overhang
				assert.LessOrEqual(t, s.Width(Regular, 9, l), width, "width %g: line %d %q in pt", width, i, l)
			}
			// Greedy: the next line's first word would not have fitted.
			if i+1 < len(lines) {
				next := strings.Fields(lines[i+1])[0]
				assert.Greater(t, s.Width(Regular, 9, l+" "+next), width, "width %g: %q fits on line %d (pt)", width, next, i)
			}
		}
	}
	got := s.Wrap(Regular, 9, "one\ntwo  three", 1000)
	if assert.Len(t, got, 2, "hard break: %q", got) {
		assert.Equal(t, "two three", got[1], "hard break")
	}
	assert.Empty(t, s.Wrap(Regular, 9, "  ", 100), "blank text")
	assert.Len(t, s.Wrap(Regular, 9, "unbreakablewordthatiswide", 10), 1, "overlong word")
}

func TestLoadFiles(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "Face-Bold.ttf"), gobold.TTF, 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "notafont.ttf"), []byte("plain text, not a font"), 0o644))
	spec := &specs.Spec{File: filepath.Join(dir, "feature.yaml"), Dir: dir}

	out := &specs.Output{Name: "print", Fonts: specs.Fonts{Regular: "Face-Bold.ttf"}}
	s, err := Load(spec, out)
	require.NoError(t, err)
	assert.NotSame(t, &goregular.TTF[0], &s.Regular()[0], "regular face not read from the file")
	assert.Len(t, s.Regular(), len(gobold.TTF), "regular face not read from the file")
	assert.Equal(t, filepath.Join(dir, "Face-Bold.ttf"), s.Path(Regular), "regular face's path")
	assert.Empty(t, s.Path(Bold), "bold face's path (built in)")
	assert.Len(t, s.Italic(), len(s.Regular()), "italic should fall back to the custom regular face")

	for _, tc := range []struct{ file, want string }{
		{"missing.ttf", "cannot read font \"missing.ttf\""},
		{"notafont.ttf", "\"notafont.ttf\" (resolved to \"" + filepath.Join(dir, "notafont.ttf") + "\") is not a usable"},
	} {
		out := &specs.Output{Name: "print", Fonts: specs.Fonts{Bold: tc.file}}
		_, err := Load(spec, out)
		if assert.ErrorContains(t, err, tc.want, tc.file) {
			assert.ErrorContains(t, err, "fonts.bold", tc.file)
		}
	}
}

func TestDefaultBytesAreDejaVuSansCondensed(t *testing.T) {
	s := mustDefault(t)
	assert.True(t, bytes.Equal(s.Regular(), dejavusanscondensed.TTF), "default regular face is not DejaVu Sans Condensed")
	assert.True(t, bytes.Equal(s.Bold(), dejavusanscondensedbold.TTF), "default bold face is not DejaVu Sans Condensed Bold")
	assert.NotEmpty(t, s.Italic(), "default italic face")
	// Full names (name ID 4) as the DejaVu 2.37 files in
	// github.com/go-fonts/dejavu v0.3.2 carry them.
	assert.Equal(t, "DejaVuSansCondensed", s.Name(Regular))
	assert.Equal(t, "DejaVuSansCondensed-Bold", s.Name(Bold))
	assert.NotEqual(t, s.Name(Regular), s.Name(Bold), "bold and regular share a name")
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
				if !assert.Equal(t, want, s.Width(Regular, 8, "concurrent"), "width measured concurrently") {
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
