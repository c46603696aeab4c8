package svg

import (
	"encoding/base64"
	"regexp"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/font"

	"sheaf/layout/fonts/cff"
)

// TestEmbeddedCFFSubset: with CFF fonts (Latin Modern Sans, github.com/
// go-fonts/latin-modern) the @font-face rules carry OpenType CFF subsets
// as font/otf (RFC 8081 §4.4.3) in format("opentype") (CSS Fonts 4
// §4.3.1); each reads back with tdewolff/font, holds the characters
// drawn, and its CFF table reads with our CFF reader. The fonts drawn with
// are left as they were (tdewolff/font's subsetter writes into the font it
// subsets, hence the subset is made from a parse of its own).
func TestEmbeddedCFFSubset(t *testing.T) {
	reg, err := canvas.LoadFont(lmsans10regular.TTF, 0, canvas.FontRegular)
	require.NoError(t, err)
	bold, err := canvas.LoadFont(lmsans10bold.TTF, 0, canvas.FontRegular)
	require.NoError(t, err)
	glyphs, hmetrics := reg.NumGlyphs(), reg.Hhea.NumberOfHMetrics
	s := string(sampleWith(t, Options{EmbedFonts: true}, reg, bold))
	assert.Equal(t, glyphs, reg.NumGlyphs(), "the font drawn with is unchanged")
	assert.Equal(t, hmetrics, reg.Hhea.NumberOfHMetrics, "the font drawn with is unchanged")

	assert.NotContains(t, s, "font/ttf")
	m := regexp.MustCompile(`font-weight:(\w+);font-style:normal;src:url\(data:font/otf;base64,([A-Za-z0-9+/=]+)\) format\("opentype"\)`).FindAllStringSubmatch(s, -1)
	require.Len(t, m, 2, "regular and bold @font-face")
	used := map[string]string{"bold": "Maßstab & <co>", "normal": "18681900"}
	for _, mm := range m {
		raw, err := base64.StdEncoding.DecodeString(mm[2])
		require.NoError(t, err)
		f, err := font.ParseSFNT(raw, 0)
		require.NoError(t, err, mm[1])
		assert.True(t, f.IsCFF)
		for _, r := range used[mm[1]] {
			assert.NotZero(t, f.GlyphIndex(r), "%s subset lacks %q", mm[1], r)
		}
		assert.LessOrEqual(t, int(f.NumGlyphs()), 20, "only the glyphs drawn")
		c, err := cff.Parse(f.Tables["CFF "])
		require.NoError(t, err)
		require.NoError(t, c.Check())
		assert.Equal(t, uint32(0xB1B0AFBA), checksum(raw), "OpenType head checkSumAdjustment")
	}
}
