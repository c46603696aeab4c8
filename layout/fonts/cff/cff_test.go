package cff

import (
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/font"
)

// recorder collects a glyph's outline as tdewolff/font draws it.
type recorder struct{ ops []float64 }

func (r *recorder) MoveTo(x, y float64)             { r.ops = append(r.ops, 1, x, y) }
func (r *recorder) LineTo(x, y float64)             { r.ops = append(r.ops, 2, x, y) }
func (r *recorder) QuadTo(a, b, x, y float64)       { r.ops = append(r.ops, 3, a, b, x, y) }
func (r *recorder) CubeTo(a, b, c, d, x, y float64) { r.ops = append(r.ops, 4, a, b, c, d, x, y) }
func (r *recorder) Close()                          { r.ops = append(r.ops, 5) }
func outline(t *testing.T, s *font.SFNT, g uint16) []float64 {
	t.Helper()
	var r recorder
	require.NoError(t, s.GlyphPath(&r, g, 0, 0, 0, 1, font.NoHinting))
	return r.ops
}

// withCFF parses an OpenType font whose CFF table is replaced.
func withCFF(t *testing.T, base []byte, table []byte) *font.SFNT {
	t.Helper()
	s, err := font.ParseSFNT(base, 0)
	require.NoError(t, err)
	s.Tables["CFF "] = table
	b := s.Write()
	out, err := font.ParseSFNT(b, 0)
	require.NoError(t, err)
	return out
}

func TestSubsetKeepsOutlines(t *testing.T) {
	// tdewolff/font, a general-purpose font reader, draws every kept glyph
	// of the subset (a CID-keyed CFF) as it draws the original glyph.
	src, err := font.ParseSFNT(lmsans10regular.TTF, 0)
	require.NoError(t, err)
	f, err := Parse(src.Tables["CFF "])
	require.NoError(t, err)
	assert.False(t, f.CIDKeyed, "Latin Modern's CFF is name-keyed")
	var keep []uint16
	for _, r := range "Sheaf 1868–2025 gas-lit bridge" {
		keep = append(keep, src.GlyphIndex(r))
	}
	table, err := f.Subset("LMSans10-Regular", keep)
	require.NoError(t, err)
	assert.Less(t, len(table), len(src.Tables["CFF "])/4, "a subset of 20 glyphs is much smaller")

	sub, err := Parse(table)
	require.NoError(t, err)
	assert.True(t, sub.CIDKeyed)
	s := withCFF(t, lmsans10regular.TTF, table)
	for _, g := range keep {
		assert.Equal(t, outline(t, src, g), outline(t, s, g), "glyph %d", g)
	}
	// a glyph not kept is empty
	other := src.GlyphIndex('Q')
	assert.NotEmpty(t, outline(t, src, other))
	assert.LessOrEqual(t, len(outline(t, s, other)), 1, "at most a close, no contour")
}

func TestCIDKeyedWithTwoFontDicts(t *testing.T) {
	// A CID-keyed font whose odd glyphs use a second Font DICT (a copy of
	// the first with its own subroutines): read back, subset again, every
	// glyph draws as in the original.
	src, err := font.ParseSFNT(lmsans10regular.TTF, 0)
	require.NoError(t, err)
	f, err := Parse(src.Tables["CFF "])
	require.NoError(t, err)
	f.fds = append(f.fds, f.fds[0])
	f.fdSelect = make([]uint8, f.NumGlyphs())
	for g := range f.fdSelect {
		f.fdSelect[g] = uint8(g % 2)
	}
	all := make([]uint16, f.NumGlyphs())
	for i := range all {
		all[i] = uint16(i)
	}
	two, err := f.Subset("Two", all)
	require.NoError(t, err)
	g, err := Parse(two)
	require.NoError(t, err)
	require.True(t, g.CIDKeyed)
	require.Len(t, g.fds, 2)
	assert.Equal(t, uint8(1), g.fdSelect[3])
	assert.Equal(t, uint8(0), g.fdSelect[4])

	keep := []uint16{src.GlyphIndex('a'), src.GlyphIndex('b'), src.GlyphIndex('7')}
	table, err := g.Subset("Two", keep)
	require.NoError(t, err)
	s := withCFF(t, lmsans10regular.TTF, table)
	for _, id := range keep {
		assert.Equal(t, outline(t, src, id), outline(t, s, id), "glyph %d", id)
	}
}

func TestUnusedSubroutinesBlanked(t *testing.T) {
	src, err := font.ParseSFNT(lmsans10regular.TTF, 0)
	require.NoError(t, err)
	f, err := Parse(src.Tables["CFF "])
	require.NoError(t, err)
	require.Greater(t, f.fds[0].subrs.count(), 100, "Latin Modern has local subroutines")
	_, local, err := f.usedSubrs([]uint16{src.GlyphIndex('o')})
	require.NoError(t, err)
	assert.Less(t, len(local[0]), 10, "one glyph calls a few subroutines")
	table, err := f.Subset("x", []uint16{src.GlyphIndex('o')})
	require.NoError(t, err)
	sub, err := Parse(table)
	require.NoError(t, err)
	// the count (hence the bias, TN #5177 §4.7) is kept
	assert.Equal(t, f.fds[0].subrs.count(), sub.fds[0].subrs.count())
	blank := 0
	for i := 0; i < sub.fds[0].subrs.count(); i++ {
		if string(sub.fds[0].subrs.get(i)) == "\x0b" {
			blank++
		}
	}
	assert.Equal(t, f.fds[0].subrs.count()-len(local[0]), blank)
}

func TestParseRefusesBadTables(t *testing.T) {
	src, err := font.ParseSFNT(lmsans10regular.TTF, 0)
	require.NoError(t, err)
	good := src.Tables["CFF "]
	mut := func(f func(b []byte) []byte) []byte { return f(append([]byte(nil), good...)) }
	tests := []struct {
		name string
		b    []byte
		want string
	}{
		{"empty", nil, "too short"},
		{"CFF2", mut(func(b []byte) []byte { b[0] = 2; return b }), "CFF2"},
		{"header size past the end", mut(func(b []byte) []byte { b[2] = 255; return b[:200] }), "header size"},
		{"truncated", good[:len(good)/3], "out of range"},
		{"offset size 0", mut(func(b []byte) []byte { b[int(b[2])+2] = 0; return b }), "offset size"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f, err := Parse(tc.b)
			if err == nil {
				err = f.Check()
			}
			require.Error(t, err)
			assert.Contains(t, err.Error(), tc.want)
		})
	}
}

// FuzzCFF parses, checks and subsets arbitrary tables: errors only, no
// panic, no hang.
func FuzzCFF(f *testing.F) {
	src, err := font.ParseSFNT(lmsans10regular.TTF, 0)
	require.NoError(f, err)
	f.Add(src.Tables["CFF "])
	f.Fuzz(func(t *testing.T, b []byte) {
		c, err := Parse(b)
		if err != nil {
			return
		}
		if c.Check() != nil {
			return
		}
		_, _ = c.Subset("x", []uint16{0, uint16(c.NumGlyphs() - 1)})
	})
}
