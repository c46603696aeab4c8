package fonts

import (
	"github.com/go-text/typesetting/harfbuzz"
	"github.com/go-text/typesetting/language"
	canvastext "github.com/tdewolff/canvas/text"
)

// Glyphs returns text shaped in st with direction dir (canvas's
// LeftToRight or RightToLeft; 0 lets harfbuzz guess it), glyph for
// glyph what canvas's text.Shaper.Shape returns for a face of the Set
// (no script or language set, canvas's FontFace defaults): the same
// go-text harfbuzz calls, buffer settings and features, with clusters as
// byte offsets into text. It shapes with the Set's kept buffer, so the
// shape plan is compiled once per style and direction rather than once
// a string. ok is false when go-text cannot read the face; canvas
// shapes it then. The glyphs are the caller's.
func (s *Set) Glyphs(st Style, text string, dir canvastext.Direction) (glyphs []canvastext.Glyph, ok bool) {
	if text == "" {
		return nil, true
	}
	st = s.valid(st)
	defer s.lockAdvances()()
	sh := s.shaper(st)
	if sh == nil {
		return nil, false
	}
	// Shaped when measured, with the direction harfbuzz guessed: the
	// same buffer settings once that direction is asked for explicitly
	// (GuessSegmentProperties keeps a set direction and guesses the
	// script from the text either way), so the same glyphs.
	if run, ok := s.adv.glyphs[advanceKey{st, text}]; ok && run.dir == harfbuzz.Direction(dir) {
		return append([]canvastext.Glyph(nil), run.glyphs...), true
	}
	return sh.glyphs(text, dir), true
}

// glyphs is canvas's Shaper.Shape (tdewolff/canvas text/harfbuzz.go,
// the pure-Go shaper) on s's buffer, for a face with no script or
// language.
func (s *shaper) glyphs(text string, dir canvastext.Direction) []canvastext.Glyph {
	rtext := s.shape(text, harfbuzz.Direction(dir))
	return s.fromBuffer(text, rtext)
}

// advanceAndGlyphs is advance, and the glyphs of text with the direction
// harfbuzz guessed for it.
func (s *shaper) advanceAndGlyphs(text string) (int32, shapedRun) {
	rtext := s.shape(text, 0)
	var units int32
	for _, p := range s.buf.Pos {
		units += int32(p.XAdvance)
	}
	return units, shapedRun{dir: s.buf.Props.Direction, glyphs: s.fromBuffer(text, rtext)}
}

// shape shapes text into s's buffer as canvas's Shaper.Shape does, with
// direction dir (0: harfbuzz guesses it), and returns text's runes.
func (s *shaper) shape(text string, dir harfbuzz.Direction) []rune {
	b := s.buf
	b.Clear()
	rtext := []rune(text)
	b.AddRunes(rtext, 0, -1)
	b.ClusterLevel = harfbuzz.MonotoneCharacters
	b.Props.Direction = dir
	b.Props.Script = language.Script(0)
	b.Props.Language = language.NewLanguage("")
	b.GuessSegmentProperties()
	b.Shape(s.font, s.features)
	return rtext
}

// fromBuffer is the buffer's glyphs as canvas's Glyph values.
func (s *shaper) fromBuffer(text string, rtext []rune) []canvastext.Glyph {
	b := s.buf

	// harfbuzz's clusters index runes; canvas's index bytes.
	runeMap := make([]int, len(rtext)+1)
	j := 0
	for i := range text {
		runeMap[j] = i
		j++
	}
	runeMap[len(rtext)] = len(text)

	glyphs := make([]canvastext.Glyph, len(b.Info))
	for i, info := range b.Info {
		pos := b.Pos[i]
		glyphs[i] = canvastext.Glyph{
			ID:       uint16(info.Glyph),
			Cluster:  uint32(runeMap[info.Cluster]),
			XAdvance: int32(pos.XAdvance),
			YAdvance: int32(pos.YAdvance),
			XOffset:  int32(pos.XOffset),
			YOffset:  int32(pos.YOffset),
			Text:     rtext[info.Cluster],
		}
	}
	return glyphs
}
