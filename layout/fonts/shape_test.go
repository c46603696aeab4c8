package fonts

import (
	"bufio"
	"os"
	"strings"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// demoLabels is every term of the demo's counts table with the peak
// years labels carry, the demo's German spec's words and a few strings
// that make shapers work (kerning pairs, a ligature, combining marks,
// right-to-left text).
func demoLabels(t testing.TB) []string {
	t.Helper()
	f, err := os.Open("../../examples/quillmere/data/counts.csv")
	require.NoError(t, err)
	defer f.Close()
	seen := map[string]bool{}
	var out []string
	add := func(s string) {
		if !seen[s] {
			seen[s] = true
			out = append(out, s)
		}
	}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		term, _, _ := strings.Cut(sc.Text(), ",")
		add(term)
		add(term + " 1861")
	}
	require.NoError(t, sc.Err())
	require.Greater(t, len(out), 700)
	for _, s := range []string{"1868", "2025", "1914–1918: war years", "Zeitungswörter, 1868–2025", "Ölförderung", "AVA Wa To LT",
		"ﬁnance ﬂow fi fl ffi", "e\u0301te\u0301", "coöperation", "naïve façade", "שלום עולם", "مرحبا", "Ελληνικά", "Кириллица", "…", "12 345,6 %"} {
		add(s)
	}
	return out
}

// Measuring shapes with its own buffer (shape plans kept); every width
// must still be the very float64 canvas's own FontFace.TextWidth gives
// (the reference: tdewolff/canvas shaping the same face), for every style
// of the built-in faces and of a CFF face, on every label of the demo.
func TestShaperIsCanvasShaping(t *testing.T) {
	sets := map[string]*Set{}
	var err error
	sets["built-in"], err = Default()
	require.NoError(t, err)
	spec, o := specIn(t, specHead+"    fonts: {regular: lm.otf, bold: lmb.otf}\n",
		map[string][]byte{"lm.otf": lmsans10regular.TTF, "lmb.otf": lmsans10bold.TTF})
	sets["Latin Modern (CFF)"], err = Load(spec, o)
	require.NoError(t, err)
	labels := demoLabels(t)
	for name, s := range sets {
		for _, st := range []Style{Regular, Bold, Italic, Figures} {
			for _, text := range labels {
				want := s.Face(st, 6.5).TextWidth(text) / mmPerPt // canvas's TextWidth: the reference
				require.Equal(t, want, s.Width(st, 6.5, text), "%s %v %q", name, st, text)
			}
			require.NotNil(t, s.adv.shapers[st], "%s %v: measured without canvas's shaper", name, st)
		}
	}
}

// A Set loaded like another in the same faces takes its parsed fonts
// (and keeps its own widths); a face in other bytes is parsed anew.
// Widths stay canvas's (the reference, as above).
func TestLoadSharesParsedFaces(t *testing.T) {
	a, err := Default()
	require.NoError(t, err)
	b, err := Load(&specs.Spec{}, &specs.Output{}, a)
	require.NoError(t, err)
	for _, st := range []Style{Regular, Bold, Italic, Figures} {
		require.Same(t, a.Font(st), b.Font(st), "%v", st)
		require.Equal(t, a.Embedding(st), b.Embedding(st))
	}
	b.Width(Figures, 6.5, "1861")
	require.Empty(t, a.widths, "widths are each Set's own")
	require.Equal(t, b.Face(Figures, 6.5).TextWidth("1861")/mmPerPt, b.Width(Figures, 6.5, "1861"))

	spec, o := specIn(t, specHead+"    fonts: {regular: lm.otf}\n", map[string][]byte{"lm.otf": lmsans10regular.TTF})
	c, err := Load(spec, o, a)
	require.NoError(t, err)
	require.NotSame(t, a.Font(Regular), c.Font(Regular))
	require.NotSame(t, a.Font(Figures), c.Font(Figures))
	require.Same(t, a.Font(Bold), c.Font(Bold), "the built-in bold is shared")
	require.Equal(t, c.Face(Figures, 6.5).TextWidth("1861")/mmPerPt, c.Width(Figures, 6.5, "1861"))
}

// BenchmarkMeasureLabels measures every demo label once in a fresh Set
// (no widths known): "canvas" shapes with canvas's FontFace.Glyphs (a new
// harfbuzz buffer, so a new shape plan, a string), "kept" with the Set's
// shaper, which keeps its buffer.
func BenchmarkMeasureLabels(b *testing.B) {
	labels := demoLabels(b)
	s, err := Default()
	require.NoError(b, err)
	face := s.Face(Bold, 6.5)
	b.Run("canvas", func(b *testing.B) {
		for b.Loop() {
			for _, l := range labels {
				face.Glyphs(l)
			}
		}
	})
	b.Run("kept", func(b *testing.B) {
		sh := newShaper(s.raw[Bold], features)
		for b.Loop() {
			for _, l := range labels {
				sh.advance(l)
			}
		}
	})
}
