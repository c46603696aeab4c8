// Package slug names things after terms: file name stems and SVG ids
// that are safe everywhere and stay the same wherever the term's panel
// lands, so a change elsewhere leaves a term's files byte-identical.
package slug

import (
	"strconv"
	"strings"
	"unicode"

	"golang.org/x/text/unicode/norm"
)

// translit spells letters that Unicode decomposition does not split into
// a base letter and marks.
var translit = map[rune]string{
	'ß': "ss", 'æ': "ae", 'Æ': "ae", 'œ': "oe", 'Œ': "oe", 'ø': "o", 'Ø': "o",
	'ł': "l", 'Ł': "l", 'đ': "d", 'Đ': "d", 'ð': "d", 'Ð': "d", 'þ': "th", 'Þ': "th",
	'ı': "i", 'ħ': "h", 'Ħ': "h", '&': "and",
}

// Max bounds a slug's length in bytes, well under every file system's
// name limit.
const Max = 64

// Of turns a term into a name that is safe everywhere: lower case ASCII
// letters and digits joined by single hyphens. Accents are dropped after
// Unicode compatibility decomposition (NFKD: "Café" → "cafe"), a few
// letters are spelled out ("ß" → "ss"), and everything else separates
// words. A term with no Latin letter or digit at all (say, Greek or CJK)
// is named by its code points instead ("u3b1-u3b2"), so two such terms
// never share a name and no percent sign appears.
func Of(term string) string {
	var b strings.Builder
	dash := false
	put := func(s string) {
		if dash && b.Len() > 0 {
			b.WriteByte('-')
		}
		dash = false
		b.WriteString(s)
	}
	for _, r := range norm.NFKD.String(term) {
		switch {
		case unicode.Is(unicode.Mn, r):
			// a combining mark: drop it, keep the base letter
		case r < 0x80 && (unicode.IsLetter(r) || unicode.IsDigit(r)):
			put(string(unicode.ToLower(r)))
		case translit[r] != "":
			put(translit[r])
		default:
			dash = true
		}
	}
	s := b.String()
	if s == "" {
		var parts []string
		for _, r := range term {
			if !unicode.IsSpace(r) {
				parts = append(parts, "u"+strconv.FormatInt(int64(r), 16))
			}
		}
		s = strings.Join(parts, "-")
		if s == "" {
			s = "term"
		}
	}
	if len(s) > Max {
		s = strings.TrimRight(s[:Max], "-")
	}
	return s
}

// Unique returns s, or s-2, s-3, … the first not yet used, and marks it
// used. Called in the terms' order, it names colliding terms
// deterministically.
func Unique(s string, used map[string]bool) string {
	name := s
	for k := 2; used[name]; k++ {
		name = s + "-" + strconv.Itoa(k)
	}
	used[name] = true
	return name
}

// All names every term, in order, by Of made Unique: the i-th name is
// terms[i]'s.
func All(terms []string) []string {
	used := make(map[string]bool, len(terms))
	out := make([]string, len(terms))
	for i, t := range terms {
		out[i] = Unique(Of(t), used)
	}
	return out
}
