package fonts

import (
	"bytes"
	"encoding/binary"
	"sync"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/specs"
)

// canvasParsed reports whether st's canvas font has been parsed.
func canvasParsed(s *Set, st Style) bool {
	c := s.fonts[st]
	return c.f != nil || c.err != nil
}

// lazySets are Sets in the faces the tests compare with canvas: the
// built-in DejaVu (TrueType), Latin Modern and TeX Gyre Heros (CFF), and
// the second face of a collection.
func lazySets(t *testing.T) map[string]*Set {
	sets := map[string]*Set{"built-in": mustDefault(t)}
	heros := requireFile(t, texGyreHeros, "fonts-texgyre")
	files := map[string][]byte{
		"lm.otf":     lmsans10regular.TTF,
		"heros.otf":  heros,
		"both.otc":   makeCollection(t, goregular.TTF, lmsans10bold.TTF),
		"lmbold.otf": lmsans10bold.TTF,
	}
	for name, yaml := range map[string]string{
		"latin-modern": "    fonts: {regular: lm.otf, bold: lmbold.otf}\n",
		"tex-gyre":     "    fonts: {regular: heros.otf}\n",
		"collection":   "    fonts: {regular: {path: both.otc, face: 1}}\n",
	} {
		spec, out := specIn(t, specHead+yaml, files)
		s, err := Load(spec, out)
		require.NoError(t, err, name)
		sets[name] = s
	}
	return sets
}

// Load, measuring, metrics, names and glyph coverage leave canvas's
// fonts unparsed; what they give is what canvas's parse gives (the
// reference: canvas.Font.Name, FontFace.Metrics, SFNT.GlyphIndex).
func TestCanvasFontsParsedOnlyForDrawing(t *testing.T) {
	for name, s := range lazySets(t) {
		t.Run(name, func(t *testing.T) {
			for st := range numStyles {
				for _, size := range []float64{6.5, 7, 9.25, 24} {
					_ = s.Metrics(st, size)
				}
				_ = s.Width(st, 7, "Ag 1868–1925")
				_ = s.Name(st)
				_ = s.HasGlyph(st, 'A')
			}
			for st := range numStyles {
				require.False(t, canvasParsed(s, st), "%v: parsed before anything drew", st)
			}
			for st := range numStyles {
				f := s.Font(st)
				require.NotNil(t, f)
				assert.Equal(t, f.Name(), s.Name(st), "%v: name", st)
				for _, size := range []float64{6.5, 7, 9.25, 24} {
					m := f.Face(size, canvas.Black).Metrics()
					want := Metrics{Ascent: m.Ascent / mmPerPt, Descent: m.Descent / mmPerPt, LineGap: m.LineGap / mmPerPt,
						CapHeight: m.CapHeight / mmPerPt, XHeight: m.XHeight / mmPerPt}
					assert.Equal(t, want, s.metricsOf(st, size), "%v at %v pt: the very float64s", st, size)
				}
				for _, r := range []rune{'A', 'g', '1', '–', 'ß', '⸻', 'Ω', '\u00a0'} {
					assert.Equal(t, f.SFNT.GlyphIndex(r) != 0, s.HasGlyph(st, r), "%v: %U", st, r)
				}
				assert.Equal(t, f.Face(7, canvas.Black).TextWidth("Ag 1868–1925")/mmPerPt, s.Width(st, 7, "Ag 1868–1925"), "%v", st)
			}
			require.NoError(t, s.Ready())
		})
	}
}

// Pages draw on two goroutines: the first uses of a style parse it once.
func TestCanvasFontOnceUnderConcurrency(t *testing.T) {
	s := mustDefault(t)
	var wg sync.WaitGroup
	got := make([][numStyles]*canvas.Font, 4)
	for i := range got {
		wg.Go(func() {
			for st := range numStyles {
				got[i][st] = s.Font(st)
			}
		})
	}
	wg.Wait()
	for i := range got {
		for st := range numStyles {
			require.NotNil(t, got[i][st])
			require.Same(t, got[0][st], got[i][st], "%v", st)
		}
	}
	require.NotSame(t, s.Font(Regular), s.Font(Figures), "features are per canvas font")
}

// zeroCmap is DejaVu Sans Condensed with the start of its cmap table
// zeroed (version 0, no encoding records): tdewolff/font accepts it,
// go-text refuses it ("unsupported cmap table"), so only canvas's second
// parse and the shaper's find out. Found by zeroing each table of the
// face in turn.
func zeroCmap(t *testing.T) []byte {
	b := append([]byte(nil), dejavusanscondensed.TTF...)
	be := binary.BigEndian
	for r := range int(be.Uint16(b[4:])) {
		rec := 12 + 16*r
		if string(b[rec:rec+4]) == "cmap" {
			off := int(be.Uint32(b[rec+8:]))
			clear(b[off : off+64])
			return b
		}
	}
	require.FailNow(t, "DejaVu Sans Condensed has a cmap table")
	return nil
}

// A face Load accepts but canvas and the shaper cannot read is bad input
// with the spec's place when measured or drawn: never a panic, a nil
// font drawn with, or a width of 0 kept.
func TestDeferredParseFailure(t *testing.T) {
	bad := zeroCmap(t)
	spec, out := specIn(t, specHead+"    fonts: {bold: odd.ttf}\n", map[string][]byte{"odd.ttf": bad})
	s, err := Load(spec, out)
	require.NoError(t, err, "tdewolff/font reads it, as Load checks")
	require.NoError(t, s.Err())
	assert.Greater(t, s.Width(Regular, 7, "Ag"), 0.0, "the regular face is fine")
	assert.Zero(t, s.Width(Bold, 7, "Ag"))
	err = s.Err()
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	want := spec.Where("outputs.print.fonts.bold").String()
	assert.Contains(t, err.Error(), want)
	assert.Contains(t, err.Error(), "odd.ttf")
	assert.Contains(t, err.Error(), "unsupported cmap table")
	for k := range s.widths {
		assert.NotEqual(t, Bold, k.st, "no width of an unreadable face is kept (nor saved)")
	}
	assert.Nil(t, s.Font(Bold))
	assert.Nil(t, s.Face(Bold, 7))
	assert.NotNil(t, s.Font(Regular))
	require.Error(t, s.Ready(Bold))
	assert.Equal(t, err.Error(), s.Ready().Error())

	// Drawing first, measuring never: Ready still says so.
	s, err = Load(spec, out)
	require.NoError(t, err)
	err = s.Ready(Regular, Bold)
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), want)
	require.NoError(t, s.Ready(Regular, Italic, Figures))
}

// noNames is DejaVu Sans Condensed with name IDs 1, 4 and 6 renumbered
// (to 256, 257, 258): canvas then names the face "f" and a count of such
// faces it has loaded.
func noNames(t *testing.T) []byte {
	b := append([]byte(nil), dejavusanscondensed.TTF...)
	be := binary.BigEndian
	for r := range int(be.Uint16(b[4:])) {
		rec := 12 + 16*r
		if string(b[rec:rec+4]) != "name" {
			continue
		}
		off := int(be.Uint32(b[rec+8:]))
		n := int(be.Uint16(b[off+2:]))
		for i := range n {
			id := off + 6 + 12*i + 6 // nameID of record i (OpenType 'name')
			switch be.Uint16(b[id:]) {
			case 1, 4, 6:
				be.PutUint16(b[id:], 256+be.Uint16(b[id:]))
			}
		}
		return b
	}
	require.FailNow(t, "DejaVu Sans Condensed has a name table")
	return nil
}

// A face without a name is parsed by canvas at Load, in Load's order, so
// canvas numbers it as before and Name is canvas's name.
func TestNamelessFaceParsedAtLoad(t *testing.T) {
	spec, out := specIn(t, specHead+"    fonts: {regular: x.ttf}\n", map[string][]byte{"x.ttf": noNames(t)})
	s, err := Load(spec, out)
	require.NoError(t, err)
	for _, st := range []Style{Regular, Italic, Figures} {
		require.True(t, canvasParsed(s, st), "%v", st)
		assert.Equal(t, s.Font(st).Name(), s.Name(st))
		assert.Regexp(t, `^f[0-9]+$`, s.Name(st))
	}
	assert.NotEqual(t, s.Name(Regular), s.Name(Figures), "two canvas fonts, two numbers")
	assert.False(t, canvasParsed(s, Bold), "the built-in bold has names")
	assert.True(t, bytes.Equal(s.Bytes(Regular), s.Bytes(Figures)))
}

// A TrueType face without an OS/2 table (its tag renamed) is refused:
// tdewolff/font reads it, but canvas.FontFace.Metrics dereferences the
// table, so measuring or drawing would panic (the OpenType spec lists
// OS/2 among the required tables, "Required Tables").
func TestFaceWithoutOS2Refused(t *testing.T) {
	b := append([]byte(nil), dejavusanscondensed.TTF...)
	i := bytes.Index(b[:12+16*int(binary.BigEndian.Uint16(b[4:]))], []byte("OS/2"))
	require.Greater(t, i, 0)
	copy(b[i:], "OS/3")
	f, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err, "canvas loads it")
	require.Nil(t, f.OS2)
	require.Panics(t, func() { f.Face(7, canvas.Black).Metrics() }, "and panics on its metrics")
	spec, out := specIn(t, specHead+"    fonts: {regular: x.ttf}\n", map[string][]byte{"x.ttf": b})
	_, err = Load(spec, out)
	require.Error(t, err)
	assert.Contains(t, err.Error(), spec.Where("outputs.print.fonts.regular").String())
	assert.Contains(t, err.Error(), "no OS/2")
}
