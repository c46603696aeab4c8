package draw

import (
	"bufio"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	canvastext "github.com/tdewolff/canvas/text"

	"sheaf/layout/fonts"
	"sheaf/specs"
)

// glyphLabels is every term of the demo's counts table, alone and with a
// year, and strings that take canvas's other ways: several script items
// (Latin beside Hebrew, Greek or Cyrillic), right-to-left text, line
// breaks, a replacement character, invalid UTF-8, combining marks,
// ligatures, kerning pairs.
func glyphLabels(t testing.TB) []string {
	t.Helper()
	f, err := os.Open("../../examples/quillmere/data/counts.csv")
	require.NoError(t, err)
	defer f.Close()
	seen := map[string]bool{}
	var out []string
	add := func(s string) {
		if !seen[s] {
			seen[s] = true
			out = append(out, s)
		}
	}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		term, _, _ := strings.Cut(sc.Text(), ",")
		add(term)
		add(term + " 1861")
	}
	require.NoError(t, sc.Err())
	require.Greater(t, len(out), 700)
	for _, s := range []string{"1868", "2025", " ", "1914–1918: war years", "Zeitungswörter, 1868–2025", "Ölförderung",
		"AVA Wa To LT", "ﬁnance ﬂow fi fl ffi", "e\u0301te\u0301", "naïve façade", "שלום עולם", "مرحبا", "Ελληνικά",
		"Кириллица", "word שלום", "Ελληνικά and Latin", "…", "12 345,6 %", "two\nlines", "cr\r\nlf", "a\u2028b",
		"bad \xff byte", "rep\ufffdlacement", "\u202bembedded\u202c", "(1861)", "x = 3 + 4"} {
		add(s)
	}
	return out
}

// lmFonts is a Set in Latin Modern Sans, whose outlines are CFF.
func lmFonts(t testing.TB) *fonts.Set {
	t.Helper()
	dir := t.TempDir()
	for name, b := range map[string][]byte{"lm.otf": lmsans10regular.TTF, "lmb.otf": lmsans10bold.TTF} {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	spec := &specs.Spec{Dir: dir}
	out := &specs.Output{Kind: specs.Print}
	out.Fonts.Regular, out.Fonts.Bold = "lm.otf", "lmb.otf"
	fs, err := fonts.Load(spec, out)
	require.NoError(t, err)
	return fs
}

// The span the Pen draws a line from is, field for field, the only span
// of canvas.NewTextLine's text for the same face, string and alignment
// (the reference: canvas itself, itemizing and shaping the line), for
// every demo label and style (alignments taken in turn), in a TrueType
// and a CFF set; lines canvas sets otherwise are left to canvas, and
// every ASCII label takes the span.
func TestLineSpanIsNewTextLine(t *testing.T) {
	def, err := fonts.Default()
	require.NoError(t, err)
	labels := glyphLabels(t)
	took, left := 0, 0
	for name, fs := range map[string]*fonts.Set{"built-in": def, "Latin Modern (CFF)": lmFonts(t)} {
		for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic, fonts.Figures} {
			aligns := []canvas.TextAlign{canvas.Left, canvas.Center, canvas.Right, canvas.Middle, canvas.Justify}
			for i, s := range labels {
				align := aligns[(i+int(st))%len(aligns)] // each label in several alignments across the styles
				face := fs.Font(st).Face(6.5, canvas.Black)
				span, ok := lineSpan(fs, st, face, align, s)
				text := canvas.NewTextLine(face, s, align)
				var lines [][]canvas.TextSpan
				text.WalkLines(func(_ float64, spans []canvas.TextSpan) { lines = append(lines, spans) })
				if !ok {
					left++
					require.False(t, isPrintableASCII(s), "%s %v %q: an ASCII line left to canvas", name, st, s)
					continue
				}
				took++
				require.Len(t, lines, 1, "%s %v %q", name, st, s)
				require.Len(t, lines[0], 1, "%s %v %q", name, st, s)
				require.Equal(t, lines[0][0], span, "%s %v align %d %q", name, st, align, s)
			}
		}
	}
	require.Greater(t, took, left, "most labels take the span")
	require.Positive(t, left, "some strings are left to canvas")
}

func isPrintableASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < 0x20 || s[i] > 0x7e {
			return false
		}
	}
	return true
}

// oneItem's shortcut for printable ASCII agrees with canvas's itemizer
// (text.ScriptItemizer over text.EmbeddingLevels, as canvas's
// itemizeString calls them, the reference): every printable ASCII
// character alone and among letters, digits and spaces is one item of
// the whole string at level 0.
func TestOneItemASCII(t *testing.T) {
	for c := byte(0x20); c <= 0x7e; c++ {
		ch := string(c)
		for _, s := range []string{ch, ch + ch, "a" + ch, ch + "a", "1" + ch + "2", ch + "1", "x " + ch + " 1", "(" + ch + ")", ch + " 1861"} {
			level, ok := oneItem(s)
			require.True(t, ok, "%q", s)
			runes := []rune(s)
			items := canvastext.ScriptItemizer(runes, canvastext.EmbeddingLevels(runes))
			require.Len(t, items, 1, "%q: %v", s, items)
			require.Equal(t, s, items[0].Text, "%q", s)
			require.Equal(t, items[0].Level, level, "%q", s)
		}
	}
	for _, s := range []string{"", "two\nlines", "a\u2029b", "word שלום", "bad \xff", "rep\ufffd"} {
		_, ok := oneItem(s)
		require.False(t, ok, "%q", s)
	}
}

// GlyphLabels is glyphLabels for the package's external tests.
var GlyphLabels = glyphLabels
