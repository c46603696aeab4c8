package count

import (
	"bufio"
	"bytes"
	"os"
	"strconv"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/text/unicode/norm"
)

// wordBreakCase is one line of Unicode's WordBreakTest.txt.
type wordBreakCase struct {
	line     int
	text     []byte
	segments [][]byte
}

func readWordBreakTest(t *testing.T) []wordBreakCase {
	t.Helper()
	f, err := os.Open("testdata/WordBreakTest-17.0.0.txt")
	require.NoError(t, err)
	defer f.Close()
	var cases []wordBreakCase
	sc := bufio.NewScanner(f)
	for n := 1; sc.Scan(); n++ {
		line, _, _ := strings.Cut(sc.Text(), "#")
		fields := strings.Fields(line)
		if len(fields) == 0 {
			continue
		}
		c := wordBreakCase{line: n}
		var seg []byte
		for _, f := range fields {
			switch f {
			case "÷":
				if seg != nil {
					c.segments = append(c.segments, seg)
					seg = nil
				}
			case "×":
			default:
				r, err := strconv.ParseUint(f, 16, 32)
				require.NoError(t, err, "line %d", n)
				seg = utf8.AppendRune(seg, rune(r))
				c.text = utf8.AppendRune(c.text, rune(r))
			}
		}
		cases = append(cases, c)
	}
	require.NoError(t, sc.Err())
	return cases
}

// segmentsOf splits text as the tokenizer does before it classifies:
// lines end after each LF, and each line is split at word boundaries with
// our hyphen joiners.
func segmentsOf(tk *Tokenizer, text []byte) [][]byte {
	tk.init()
	var out [][]byte
	for len(text) > 0 {
		n := bytes.IndexByte(text, '\n') + 1
		if n == 0 {
			n = len(text)
		}
		tk.seg.SetText(text[:n])
		for tk.seg.Next() {
			out = append(out, tk.seg.Value())
		}
		text = text[n:]
	}
	return out
}

// TestWordBreakTest runs every line of Unicode's WordBreakTest.txt
// (UCD 17.0.0, testdata/WordBreakTest-17.0.0.txt) through our segmenter:
// uax29 with the hyphen joiners, text split into lines at LF first. No
// line is excluded: none has U+002D or U+2010, the joiners, and splitting
// at LF agrees with UAX #29 (WB3a, WB3b break before and after LF, WB3
// keeps CR LF whole and the CR ends our line).
func TestWordBreakTest(t *testing.T) {
	cases := readWordBreakTest(t)
	require.Len(t, cases, 1944, "WordBreakTest-17.0.0.txt has 1944 test lines")
	tk := &Tokenizer{}
	for _, c := range cases {
		got := segmentsOf(tk, c.text)
		assert.Equal(t, c.segments, got, "WordBreakTest-17.0.0.txt line %d", c.line)
	}
}

// TestWordBreakTestTokens runs the WordBreakTest lines through the whole
// tokenizer (case kept): its tokens must be the file's segments minus the
// skipped ones (whitespace, format characters), in order. Excluded by our
// settings, each for its reason:
//   - a NUL (U+0000): we refuse it as a binary file;
//   - CR, LF, VT, FF, NEL, LS, PS: line ends, which the hyphen rule reads;
//   - text NFKC changes (we normalise before splitting, so the segments
//     differ from the raw text's);
//   - U+00AD, U+2019, U+02BC: removed or made "'" in words (rule 5).
func TestWordBreakTestTokens(t *testing.T) {
	run, excluded := 0, 0
	tk := &Tokenizer{}
	for _, c := range readWordBreakTest(t) {
		if bytes.ContainsAny(c.text, "\x00\r\n\v\f\u0085\u2028\u2029\u00ad\u2019\u02bc") || !norm.NFKC.IsNormal(c.text) {
			excluded++
			continue
		}
		run++
		var want []string
		for _, s := range c.segments {
			if classify(s) != kindSkip {
				want = append(want, string(s))
			}
		}
		var got []string
		require.NoError(t, tk.Tokens(bytes.NewReader(c.text), func(b []byte, _ bool) { got = append(got, string(b)) }))
		assert.Equal(t, want, got, "WordBreakTest-17.0.0.txt line %d", c.line)
	}
	t.Logf("%d lines run through the tokenizer, %d excluded by its settings", run, excluded)
	assert.Greater(t, run, 900)
}

func tokens(t *testing.T, tk *Tokenizer, text string) []string {
	t.Helper()
	var out []string
	require.NoError(t, tk.Tokens(strings.NewReader(text), func(b []byte, word bool) {
		if word {
			out = append(out, string(b))
		} else {
			out = append(out, "["+string(b)+"]")
		}
	}))
	return out
}

// TestTokenizerRules: hand-worked cases of each rule (marks shown in
// brackets). Expected values are worked by hand from UAX #29 (Unicode 17)
// and the Unicode NFKC and case-folding tables; where a rule is our own
// the row says so.
func TestTokenizerRules(t *testing.T) {
	keep := map[string]bool{"über-gear": true}
	for _, tc := range []struct {
		name, in string
		fold     bool
		want     []string
	}{
		// Line-end hyphens (our rule 7).
		{"hyphen at a line end joins a broken word", "the locomo-\ntive ran", true, []string{"the", "locomotive", "ran"}},
		{"CRLF and spaces around the break", "locomo-  \r\n   tive", true, []string{"locomotive"}},
		{"U+2010 HYPHEN at a line end", "locomo\u2010\ntive", true, []string{"locomotive"}},
		{"capital after the break keeps the hyphen", "Anglo-\nNorse", false, []string{"Anglo-Norse"}},
		{"digit after the break keeps the hyphen", "pre-\n1900", true, []string{"pre-1900"}},
		{"listed compound keeps its hyphen", "über-\ngear", true, []string{"über-gear"}},
		{"unlisted compound broken at its hyphen is joined (documented)", "non-\ndestructive", true, []string{"nondestructive"}},
		{"compound in a line stays", "steam-engine", true, []string{"steam-engine"}},
		{"soft hyphen at a line end always joins", "Tele\u00ad\nGraph", false, []string{"TeleGraph"}},
		{"soft hyphen inside a word is removed", "loco\u00admotive", true, []string{"locomotive"}},
		{"a word broken twice", "elec-\ntro-\nmagnet", true, []string{"electromagnet"}},
		{"a dash with a space before is no break", "word -\nnext", true, []string{"word", "[-]", "next"}},
		{"a blank line ends the paragraph", "end-\n\nnew", true, []string{"end", "[-]", "new"}},
		{"punctuation after the break", "end-\n(new", true, []string{"end", "[-]", "[(]", "new"}},
		{"end of text after the hyphen", "end-", true, []string{"end", "[-]"}},
		// NFKC (Unicode Standard Annex #15; mappings from UnicodeData.txt).
		{"fi ligature U+FB01", "\ufb01sh", true, []string{"fish"}},
		{"fl ligature U+FB02", "\ufb02ue", true, []string{"flue"}},
		{"ffi ligature U+FB03", "o\ufb03ce", true, []string{"office"}},
		{"long s U+017F", "\u017fteam", false, []string{"steam"}},
		{"long s t ligature U+FB05", "\ufb05eam", false, []string{"steam"}},
		{"full-width letters", "\uff33\uff54\uff45\uff41\uff4d", false, []string{"Steam"}},
		{"decomposed é composes", "cafe\u0301", false, []string{"café"}},
		// Apostrophes (UAX #29 WB6/WB7 keep ' between letters; our rule 5).
		{"apostrophe in a word", "don't", true, []string{"don't"}},
		{"typographic apostrophe", "don\u2019t", true, []string{"don't"}},
		{"possessive is one word", "engine's", true, []string{"engine's"}},
		{"quotes around a word are marks", "'tis", true, []string{"[']", "tis"}},
		// Digits (WB8, WB11, WB12; WB9/WB10 join letters and digits).
		{"decimal number", "3.5 tons", true, []string{"3.5", "tons"}},
		{"thousands", "1,000", true, []string{"1,000"}},
		{"digits and letters", "3D printing", false, []string{"3D", "printing"}},
		{"year then full stop", "in 1868.", true, []string{"in", "1868", "[.]"}},
		// Case (Unicode full case folding, CaseFolding.txt status C+F).
		{"fold", "Telegraph TELEGRAPH", true, []string{"telegraph", "telegraph"}},
		{"keep", "Telegraph", false, []string{"Telegraph"}},
		{"sharp s folds to ss", "Maßstab", true, []string{"massstab"}},
		{"capital sharp s folds to ss", "MAẞSTAB", true, []string{"massstab"}},
		// Bytes.
		{"BOM skipped", "\ufeffword", true, []string{"word"}},
		{"marks", "A.C. motor, steam.", true, []string{"a.c", "[.]", "motor", "[,]", "steam", "[.]"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tk := &Tokenizer{Fold: tc.fold, Keep: keep}
			assert.Equal(t, tc.want, tokens(t, tk, tc.in))
		})
	}
}

// TestNFKCAgainstXText checks the tokenizer's normalisation against
// golang.org/x/text/unicode/norm for every letter and number with a
// compatibility mapping: the tokens of the character, put together, are
// its NFKC form with spaces taken out.
func TestNFKCAgainstXText(t *testing.T) {
	tk := &Tokenizer{}
	checked := 0
	for r := rune(0x80); r <= 0x2ffff; r++ {
		if !(unicode.IsLetter(r) || unicode.IsNumber(r)) || unicode.Is(unicode.Han, r) {
			continue
		}
		s := string(r)
		want := norm.NFKC.String(s)
		if want == s || strings.ContainsAny(want, "\u00ad\u2019\u02bc") {
			continue
		}
		if first, _ := utf8.DecodeRuneInString(want); !unicode.IsLetter(first) && !unicode.IsNumber(first) {
			// A space or lone mark first (U+037A → " ͅ"): a segment of
			// whitespace and marks only, which rule 4 skips.
			continue
		}
		var got []byte
		require.NoError(t, tk.Tokens(strings.NewReader(s), func(b []byte, _ bool) { got = append(got, b...) }))
		wantNoSpace := strings.Join(strings.Fields(want), "")
		if !assert.Equal(t, wantNoSpace, string(got), "U+%04X", r) {
			break
		}
		checked++
	}
	t.Logf("%d characters with a compatibility mapping checked", checked)
	assert.Greater(t, checked, 1000)
}

// TestBadText: invalid UTF-8 and NUL bytes are refused at their byte.
func TestBadText(t *testing.T) {
	for _, tc := range []struct {
		name, in   string
		off        int64
		line       int
		msgContain string
	}{
		{"Latin-1 é", "caf\xe9 au lait", 3, 1, "not valid UTF-8"},
		{"on line 3", "one\ntwo\nthree \xff", 14, 3, "not valid UTF-8"},
		{"UTF-16", "\xff\xfeh\x00i\x00", 0, 1, "not valid UTF-8"},
		{"NUL", "ab\x00cd", 2, 1, "NUL"},
		{"truncated sequence", "ab\xe2\x82", 2, 1, "not valid UTF-8"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := (&Tokenizer{}).Tokens(strings.NewReader(tc.in), func([]byte, bool) {})
			var se *SyntaxError
			require.ErrorAs(t, err, &se)
			assert.Equal(t, tc.off, se.Offset)
			assert.Equal(t, tc.line, se.Line)
			assert.Contains(t, se.Msg, tc.msgContain)
		})
	}
}

// TestLongLine: a line past maxLine is cut at a space, between words, and
// one with no space is refused.
func TestLongLine(t *testing.T) {
	text := strings.Repeat("steam engine ", maxLine/6)
	n := 0
	require.NoError(t, (&Tokenizer{}).Tokens(strings.NewReader(text), func(b []byte, _ bool) {
		require.Contains(t, []string{"steam", "engine"}, string(b))
		n++
	}))
	assert.Equal(t, 2*(maxLine/6), n)
	err := (&Tokenizer{}).Tokens(strings.NewReader(strings.Repeat("x", 2*maxLine)), func([]byte, bool) {})
	var se *SyntaxError
	require.ErrorAs(t, err, &se)
}

func FuzzTokens(f *testing.F) {
	for _, s := range []string{"the locomo-\ntive", "ﬁsh ſteam", "don’t 3.5", "a\u00ad\nb", "x-\n\ny", "MAẞ-\nstab"} {
		f.Add(s, true)
	}
	f.Fuzz(func(t *testing.T, s string, fold bool) {
		tk := &Tokenizer{Fold: fold}
		var first []string
		err := tk.Tokens(strings.NewReader(s), func(b []byte, word bool) {
			require.NotEmpty(t, b, "empty token from %q", s)
			if !bytes.ContainsAny(b, "-\u2010") {
				require.Equal(t, classify(b) == kindWord, word, "token %q of %q: word", b, s)
			}
			first = append(first, string(b))
		})
		if !utf8.ValidString(s) || strings.ContainsRune(s, 0) {
			require.Error(t, err, "no error for %q", s)
			return
		}
		require.NoError(t, err, "%q", s)
		var again []string
		require.NoError(t, tk.Tokens(strings.NewReader(s), func(b []byte, _ bool) { again = append(again, string(b)) }))
		require.Equal(t, first, again, "%q: tokens differ on a second run", s)
	})
}
