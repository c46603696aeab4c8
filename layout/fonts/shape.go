package fonts

import (
	"bytes"
	"strings"

	gotext "github.com/go-text/typesetting/font"
	"github.com/go-text/typesetting/font/opentype"
	"github.com/go-text/typesetting/harfbuzz"
	"github.com/go-text/typesetting/language"
)

// shaper measures text as canvas's pure-Go shaper shapes it (text.Shaper
// in tdewolff/canvas: the same go-text harfbuzz calls, buffer settings and
// features), but keeps its buffer between strings. harfbuzz caches its
// shape plans (the compiled lookups of a font, script and features) per
// buffer, and canvas makes a new buffer for every string, so half of its
// shaping time went into compiling the same plan again. A shaper is not
// safe for concurrent use: the Set's advances lock guards it.
type shaper struct {
	font     *harfbuzz.Font
	buf      *harfbuzz.Buffer
	features []harfbuzz.Feature
}

// newShaper parses b for shaping with features (canvas's syntax, as
// Font.SetFeatures takes it); nil when go-text cannot read it, and the
// caller shapes with canvas instead. The parser runs on font files from
// users: a panic in it means no shaper, not a crash.
func newShaper(b []byte, features string) (s *shaper) {
	defer func() {
		if recover() != nil {
			s = nil
		}
	}()
	loader, err := opentype.NewLoader(bytes.NewReader(b))
	if err != nil {
		return nil
	}
	f, err := gotext.NewFont(loader)
	if err != nil {
		return nil
	}
	s = &shaper{font: harfbuzz.NewFont(&gotext.Face{Font: f}), buf: harfbuzz.NewBuffer()}
	for _, part := range strings.Split(features, ",") {
		if part == "" {
			continue
		}
		ft, err := harfbuzz.ParseFeature(part)
		if err != nil {
			return nil // canvas would skip it with a message; do as canvas does by letting it shape
		}
		s.features = append(s.features, ft)
	}
	return s
}

// withFeatures is s shaping the same parsed font with other features
// (its own buffer: plans are per buffer and per features).
func (s *shaper) withFeatures(features string) *shaper {
	if s == nil {
		return nil
	}
	o := &shaper{font: s.font, buf: harfbuzz.NewBuffer()}
	for _, part := range strings.Split(features, ",") {
		if part == "" {
			continue
		}
		ft, err := harfbuzz.ParseFeature(part)
		if err != nil {
			return nil
		}
		o.features = append(o.features, ft)
	}
	return o
}

// advance is the sum of the horizontal advances of text's glyphs, in font
// units, as canvas's FontFace.Glyphs would give them for a face with no
// direction, script or language set (canvas's default; harfbuzz guesses
// them from the text).
func (s *shaper) advance(text string) int32 {
	b := s.buf
	b.Clear()
	b.AddRunes([]rune(text), 0, -1)
	b.ClusterLevel = harfbuzz.MonotoneCharacters
	b.Props.Direction = harfbuzz.Direction(0)
	b.Props.Script = language.Script(0)
	b.Props.Language = language.NewLanguage("")
	b.GuessSegmentProperties()
	b.Shape(s.font, s.features)
	var units int32
	for _, p := range b.Pos {
		units += int32(p.XAdvance)
	}
	return units
}
