package svg

import (
	"encoding/base64"
	"regexp"
	"strings"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/font"

	"sheaf/layout/fonts/cff"
	"sheaf/render/tooltest"

	otf "sheaf/render/internal/sfnt"
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
		assert.Equal(t, uint32(0xB1B0AFBA), otf.Checksum(raw), "OpenType head checkSumAdjustment")
	}
}

type pathRec struct{ ops []float64 }

func (r *pathRec) MoveTo(x, y float64)             { r.ops = append(r.ops, 1, x, y) }
func (r *pathRec) LineTo(x, y float64)             { r.ops = append(r.ops, 2, x, y) }
func (r *pathRec) QuadTo(a, b, x, y float64)       { r.ops = append(r.ops, 3, a, b, x, y) }
func (r *pathRec) CubeTo(a, b, c, d, x, y float64) { r.ops = append(r.ops, 4, a, b, c, d, x, y) }
func (r *pathRec) Close()                          { r.ops = append(r.ops, 5) }

func glyphOps(t *testing.T, s *font.SFNT, g uint16) []float64 {
	var r pathRec
	require.NoError(t, s.GlyphPath(&r, g, 0, 0, 0, 1, font.NoHinting))
	return r.ops
}

// TestEmbeddedSubsetLiningFigures: EB Garamond's default figures are
// old-style; shaped with lnum (as sheaf shapes every face) the digits are
// its lining figures, and a browser, which shapes again from the
// embedded subset's cmap, must find those: the subset maps '1', '6', '8'
// to glyphs drawn as the lining ones.
func TestEmbeddedSubsetLiningFigures(t *testing.T) {
	b := tooltest.ModuleFile(t, "github.com/tdewolff/font", "resources/EBGaramond12-Regular.otf")
	reg, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err)
	reg.SetFeatures("lnum")
	lining := map[rune]uint16{}
	txt := canvas.NewTextLine(reg.Face(10, canvas.Black), "1868", canvas.Left)
	txt.WalkSpans(func(_, _ float64, sp canvas.TextSpan) {
		for i, g := range sp.Glyphs {
			lining[rune(sp.Text[i])] = g.ID
		}
	})
	require.NotEqual(t, reg.GlyphIndex('1'), lining['1'], "lnum changes EB Garamond's figures")

	s := string(sampleWith(t, Options{EmbedFonts: true}, reg, reg))
	m := regexp.MustCompile(`src:url\(data:font/otf;base64,([A-Za-z0-9+/=]+)\)`).FindAllStringSubmatch(s, -1)
	require.NotEmpty(t, m)
	raw, err := base64.StdEncoding.DecodeString(m[0][1])
	require.NoError(t, err)
	sub, err := font.ParseSFNT(raw, 0)
	require.NoError(t, err)
	for _, r := range "168" {
		assert.Equal(t, glyphOps(t, reg.SFNT, lining[r]), glyphOps(t, sub, sub.GlyphIndex(r)), "%q is the lining figure", r)
	}
	assert.NotZero(t, sub.GlyphIndex('M'), "other characters still map")
}

// TestVariantFontGetsItsOwnFamily: the same face shaped two ways (text
// with lnum, tick labels with lnum and tnum, as sheaf's fonts.Set gives
// them) are two fonts of one weight and slant; CSS picks one @font-face
// per family, weight and slant, so the second gets a family of its own
// (named through a class on its text), and each subset maps the digits to
// the glyphs drawn with it.
func TestVariantFontGetsItsOwnFamily(t *testing.T) {
	b := tooltest.ModuleFile(t, "github.com/tdewolff/font", "resources/EBGaramond12-Regular.otf")
	text, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err)
	text.SetFeatures("lnum")
	figs, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err)
	figs.SetFeatures("lnum,tnum")

	d, err := New(200, 50, Options{EmbedFonts: true, FontFamily: "serif"})
	require.NoError(t, err)
	ctx := canvas.NewContext(d)
	ctx.DrawText(10*mm, 30*mm, canvas.NewTextLine(text.Face(10, canvas.Black), "Words 1868", canvas.Left))
	ctx.DrawText(10*mm, 10*mm, canvas.NewTextLine(figs.Face(8, canvas.Black), "1868", canvas.Center))
	var buf strings.Builder
	_, err = d.WriteTo(&buf)
	require.NoError(t, err)
	s := buf.String()

	fams := regexp.MustCompile(`@font-face\{font-family:"([^"]+)";font-weight:normal;font-style:normal;src:url\(data:font/otf;base64,([A-Za-z0-9+/=]+)\)`).FindAllStringSubmatch(s, -1)
	require.Len(t, fams, 2)
	assert.Equal(t, fams[0][1]+"-v1", fams[1][1])
	assert.Contains(t, s, `.sheaf-v1{font-family:"`+fams[1][1]+`", serif}`)
	assert.Regexp(t, `<text [^>]*font-size="10.7"[^>]*class="sheaf-v1"[^>]*>1868</text>`, s)
	assert.Regexp(t, `<text [^>]*font-size="13.3"[^>]*>Words 1868</text>`, s)
	assert.NotRegexp(t, `class="sheaf-v1"[^>]*>Words`, s)

	// each subset's '1' draws as the glyph its font was shaped with
	for i, f := range []*canvas.Font{text, figs} {
		var want uint16
		canvas.NewTextLine(f.Face(10, canvas.Black), "1", canvas.Left).WalkSpans(func(_, _ float64, sp canvas.TextSpan) { want = sp.Glyphs[0].ID })
		raw, err := base64.StdEncoding.DecodeString(fams[i][2])
		require.NoError(t, err)
		sub, err := font.ParseSFNT(raw, 0)
		require.NoError(t, err)
		assert.Equal(t, glyphOps(t, f.SFNT, want), glyphOps(t, sub, sub.GlyphIndex('1')), "font %d", i)
	}
}
