package production

import (
	"sheaf/render/slug"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestSlug names panel files safely. The folding follows Unicode NFKD
// (UAX #15: "é" = "e" + U+0301, "ﬁ" → "fi"); the spelled-out letters are
// common practice for ASCII file names.
func TestSlug(t *testing.T) {
	for _, c := range []struct{ term, want string }{
		{"boiler", "boiler"},
		{"Café au lait", "cafe-au-lait"},        // NFKD drops the accent
		{"Maßstab", "massstab"},                 // ß has no decomposition: spelled ss
		{"Ærø", "aero"},                         // Æ, ø spelled out
		{"ﬁre-engine", "fire-engine"},           // compatibility ligature (NFKD)
		{"3D printing", "3d-printing"},          // digits kept
		{"gas–lit bridge", "gas-lit-bridge"},    // en dash separates
		{"../../etc/passwd", "etc-passwd"},      // no path characters survive
		{`a\b:c*d?"e<f>g|h`, "a-b-c-d-e-f-g-h"}, // Windows' forbidden characters
		{"  spaced   out  ", "spaced-out"},      // no leading, trailing or double hyphens
		{"R&D", "randd"},                        // & spelled out
		{"αβ", "u3b1-u3b2"},                     // no Latin letter: code points, no percent sign
		{"電報", "u96fb-u5831"},                   // CJK likewise
		{"   ", "term"},                         // nothing at all
		{strings.Repeat("word ", 30), strings.TrimRight(strings.Repeat("word-", 13), "-")}, // 64-byte cap
	} {
		got := Slug(c.term)
		assert.Equal(t, c.want, got, "Slug(%q)", c.term)
		assert.Regexp(t, `^[a-z0-9]+(-[a-z0-9]+)*$`, got, "Slug(%q) is a safe file name stem", c.term)
		assert.LessOrEqual(t, len(got), slug.Max, "Slug(%q)", c.term)
	}
	used := map[string]bool{}
	var got []string
	for _, s := range []string{"cafe", "cafe", "cafe-2", "cafe"} {
		got = append(got, slug.Unique(s, used))
	}
	assert.Equal(t, []string{"cafe", "cafe-2", "cafe-2-2", "cafe-3"}, got, "collisions named in panel order")
}
