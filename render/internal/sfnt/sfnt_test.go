package sfnt

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	tdfont "github.com/tdewolff/font"
	"golang.org/x/image/font/gofont/goregular"
	xsfnt "golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"
)

// TestWriteRoundTrip: Go Regular's tables, taken apart with
// github.com/tdewolff/font and written again, make a file that
// golang.org/x/image/font/sfnt (an independent reader) parses with the
// same glyphs and advances, and that sums to 0xB1B0AFBA as the OpenType
// spec's head table section requires of a whole font file.
func TestWriteRoundTrip(t *testing.T) {
	src, err := tdfont.ParseSFNT(goregular.TTF, 0)
	require.NoError(t, err)
	out := Write(src.Tables)
	assert.Equal(t, uint32(0xB1B0AFBA), Checksum(out), "OpenType spec, head: checkSumAdjustment")
	assert.Equal(t, []byte{0, 1, 0, 0}, out[:4], "TrueType outlines: sfntVersion 0x00010000 (OpenType spec, table directory)")

	want, err := xsfnt.Parse(goregular.TTF)
	require.NoError(t, err)
	got, err := xsfnt.Parse(out)
	require.NoError(t, err, "x/image/font/sfnt reads the written file")
	require.Equal(t, want.NumGlyphs(), got.NumGlyphs())
	var b xsfnt.Buffer
	for _, r := range "Hamburgefonstiv 0123456789" {
		gw, err := want.GlyphIndex(&b, r)
		require.NoError(t, err)
		gg, err := got.GlyphIndex(&b, r)
		require.NoError(t, err)
		assert.Equal(t, gw, gg, "cmap of %q", r)
		aw, err := want.GlyphAdvance(&b, gw, fixed.I(2048), 0)
		require.NoError(t, err)
		ag, err := got.GlyphAdvance(&b, gg, fixed.I(2048), 0)
		require.NoError(t, err)
		assert.Equal(t, aw, ag, "advance of %q", r)
	}
}

// TestWriteCFFVersion: with CFF data the file says "OTTO" (OpenType
// spec, table directory: sfntVersion).
func TestWriteCFFVersion(t *testing.T) {
	out := Write(map[string][]byte{"CFF ": {1, 0, 4, 1}})
	assert.Equal(t, "OTTO", string(out[:4]))
}

// TestChecksum: the sum of big-endian uint32s, the tail padded with
// zeros (OpenType spec, "Calculating checksums"), worked by hand.
func TestChecksum(t *testing.T) {
	tests := []struct {
		in   []byte
		want uint32
	}{
		{nil, 0},
		{[]byte{0, 0, 0, 1, 0, 0, 0, 2}, 3},
		{[]byte{0xff, 0xff, 0xff, 0xff, 0, 0, 0, 2}, 1}, // wraps modulo 2^32
		{[]byte{1, 2}, 0x01020000},                      // padded tail
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, Checksum(tt.in), "% x", tt.in)
	}
}
