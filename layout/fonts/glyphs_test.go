package fonts

import (
	"bytes"
	"sync"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	canvastext "github.com/tdewolff/canvas/text"
)

// glyphSets are the Sets the glyph tests shape with: the built-in
// DejaVu faces (TrueType outlines), Latin Modern Sans and EB Garamond
// (CFF outlines).
func glyphSets(t *testing.T) map[string]*Set {
	t.Helper()
	def, err := Default()
	require.NoError(t, err)
	spec, o := specIn(t, specHead+"    fonts: {regular: lm.otf, bold: lmb.otf}\n",
		map[string][]byte{"lm.otf": lmsans10regular.TTF, "lmb.otf": lmsans10bold.TTF})
	lm, err := Load(spec, o)
	require.NoError(t, err)
	// EB Garamond's default figures are old-style: lnum and tnum change
	// its glyphs.
	spec, o = specIn(t, specHead+"    fonts: {regular: eb.otf}\n", map[string][]byte{"eb.otf": ebGaramond(t)})
	eb, err := Load(spec, o)
	require.NoError(t, err)
	return map[string]*Set{"built-in": def, "Latin Modern (CFF)": lm, "EB Garamond (CFF, old-style figures)": eb}
}

// Every demo label shaped with the kept buffer is, glyph for glyph and
// field for field (ID, byte cluster, advances, offsets, rune), what
// canvas's own FontFace.Glyphs gives for a face of the same style with
// the same direction (the reference: tdewolff/canvas's text.Shaper.Shape,
// a new go-text harfbuzz buffer a string), in every style of a TrueType
// and two CFF sets, left to right and right to left.
func TestGlyphsAreCanvasGlyphs(t *testing.T) {
	labels := demoLabels(t)
	for name, s := range glyphSets(t) {
		for _, st := range []Style{Regular, Bold, Italic, Figures} {
			for _, dir := range []canvastext.Direction{canvastext.LeftToRight, canvastext.RightToLeft} {
				face := s.Face(st, 6.5)
				face.Direction = dir
				for _, text := range labels {
					got, ok := s.Glyphs(st, text, dir)
					require.True(t, ok, "%s %v: no go-text shaper", name, st)
					require.Equal(t, face.Glyphs(text), got, "%s %v dir %d %q", name, st, dir, text)
				}
			}
		}
	}
}

// TestGlyphsKeptFromMeasuring: a label measured first is drawn from the
// glyphs measuring shaped (harfbuzz's guessed direction kept with them);
// they are still canvas's glyphs for the direction drawing asks
// (canvas's FontFace.Glyphs, the reference), the kept copy is the
// caller's, and a drawing in the other direction shapes afresh.
func TestGlyphsKeptFromMeasuring(t *testing.T) {
	labels := demoLabels(t)
	for name, s := range glyphSets(t) {
		s.KeepGlyphs()
		for _, st := range []Style{Regular, Bold, Figures} {
			for _, text := range labels {
				s.Width(st, 6.5, text) // measuring keeps the glyphs
			}
			for _, dir := range []canvastext.Direction{canvastext.LeftToRight, canvastext.RightToLeft} {
				face := s.Face(st, 6.5)
				face.Direction = dir
				for _, text := range labels {
					got, ok := s.Glyphs(st, text, dir)
					require.True(t, ok)
					require.Equal(t, face.Glyphs(text), got, "%s %v dir %d %q", name, st, dir, text)
				}
			}
		}
		// The caller's own copy: changing it changes nothing kept.
		text := labels[0]
		s.Width(Regular, 6.5, text)
		a, _ := s.Glyphs(Regular, text, canvastext.LeftToRight)
		require.NotEmpty(t, a)
		a[0].ID++
		b, _ := s.Glyphs(Regular, text, canvastext.LeftToRight)
		assert.NotEqual(t, a[0].ID, b[0].ID, name)
	}
	// The kept glyphs are used: a Set that will draw and measured has
	// them; one that only measures (check) keeps advances only.
	s := mustDefault(t)
	s.Width(Bold, 7, "telegraph")
	s.adv.mu.Lock()
	assert.Empty(t, s.adv.glyphs, "no glyphs kept unless asked")
	s.adv.mu.Unlock()
	s.KeepGlyphs()
	s.Width(Bold, 7, "telegram")
	s.adv.mu.Lock()
	run, ok := s.adv.glyphs[advanceKey{Bold, "telegram"}]
	s.adv.mu.Unlock()
	require.True(t, ok, "measuring keeps the glyphs")
	assert.Len(t, run.glyphs, len("telegram"), "one glyph a letter in DejaVu (no ligature here)")
}

// Pages are drawn on several goroutines: shaping through one Set from
// many at once gives each caller canvas's glyphs (run with -race).
func TestGlyphsConcurrent(t *testing.T) {
	s := mustDefault(t)
	labels := demoLabels(t)[:200]
	want := make([][]canvastext.Glyph, len(labels))
	for i, l := range labels {
		face := s.Face(Bold, 6.5)
		face.Direction = canvastext.LeftToRight
		want[i] = face.Glyphs(l) // canvas: the reference
	}
	var wg sync.WaitGroup
	got := make([][][]canvastext.Glyph, 4)
	for g := range got {
		wg.Go(func() {
			for _, l := range labels {
				gl, _ := s.Glyphs(Bold, l, canvastext.LeftToRight)
				got[g] = append(got[g], gl)
				s.Width(Regular, 7, l) // measuring shares the buffer's lock
			}
		})
	}
	wg.Wait()
	for g := range got {
		require.Equal(t, want, got[g], "goroutine %d", g)
	}
}

// BenchmarkShapeLabels shapes every demo label into glyphs: "canvas"
// with canvas's FontFace.Glyphs (a new buffer and shape plan a string),
// "kept" with Set.Glyphs.
func BenchmarkShapeLabels(b *testing.B) {
	labels := demoLabels(b)
	s, err := Default()
	require.NoError(b, err)
	face := s.Face(Regular, 6.5)
	face.Direction = canvastext.LeftToRight
	b.Run("canvas", func(b *testing.B) {
		for b.Loop() {
			for _, l := range labels {
				face.Glyphs(l)
			}
		}
	})
	b.Run("kept", func(b *testing.B) {
		for b.Loop() {
			for _, l := range labels {
				s.Glyphs(Regular, l, canvastext.LeftToRight)
			}
		}
	})
}

// TestPrepareShapingMeasuresNothing: parsing faces for shaping ahead of
// time (PrepareShaping) leaves what measuring gives, and what SaveWidths
// keeps, exactly as without it: it asks for no width.
func TestPrepareShapingMeasuresNothing(t *testing.T) {
	labels := demoLabels(t)[:300]
	run := func(prepare bool) ([]float64, []byte) {
		s := mustDefault(t)
		if prepare {
			s.PrepareShaping(Bold, Regular, Figures)
			s.adv.mu.Lock()
			for _, st := range []Style{Bold, Regular, Figures} {
				assert.True(t, s.adv.tried[st], "parsed for shaping: %v", st)
			}
			assert.Empty(t, s.adv.m, "nothing shaped")
			s.adv.mu.Unlock()
		}
		var ws []float64
		for _, l := range labels {
			ws = append(ws, s.Width(Bold, 6.5, l), s.Width(Figures, 5.5, l))
		}
		var buf bytes.Buffer
		require.NoError(t, s.SaveWidths(&buf))
		return ws, buf.Bytes()
	}
	w0, saved0 := run(false)
	w1, saved1 := run(true)
	assert.Equal(t, w0, w1)
	assert.Equal(t, saved0, saved1)
}
