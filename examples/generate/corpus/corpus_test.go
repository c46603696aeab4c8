package corpus

// These tests check our own invented demo data against the promises made in
// its brief and README (determinism, missing war years, plausible counts,
// unique NFC names, eras that fit the words, hand-overs, a few planted
// one-year spikes). The data is fiction, so there is no outside source to
// cite: every expected property below is ours — except the check that the
// invented words are not English, which reads Debian's wamerican word list.

import (
	"bytes"
	"cmp"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/text/unicode/norm"

	"sheaf/render/tooltest"
)

// demo generates the committed demo once for all tests.
var demo = sync.OnceValues(func() (Corpus, error) { return Generate(DefaultConfig()) })

func mustDemo(t testing.TB) Corpus {
	t.Helper()
	c, err := demo()
	require.NoError(t, err, "Generate(DefaultConfig())")
	return c
}

func render(t testing.TB, c Corpus) (counts, totals []byte) {
	t.Helper()
	var cb, tb bytes.Buffer
	require.NoError(t, c.WriteCounts(&cb))
	require.NoError(t, c.WriteTotals(&tb))
	return cb.Bytes(), tb.Bytes()
}

func TestDeterministic(t *testing.T) {
	a := mustDemo(t)
	b, err := Generate(DefaultConfig())
	require.NoError(t, err)
	ac, at := render(t, a)
	bc, bt := render(t, b)
	require.True(t, bytes.Equal(ac, bc), "same Config gave different counts bytes")
	require.True(t, bytes.Equal(at, bt), "same Config gave different totals bytes")
	cfg := DefaultConfig()
	cfg.Seed++
	d, err := Generate(cfg)
	require.NoError(t, err)
	dc, _ := render(t, d)
	require.False(t, bytes.Equal(ac, dc), "a different seed gave the same counts")
}

func TestMissingYears(t *testing.T) {
	c := mustDemo(t)
	counts, totals := render(t, c)
	for _, y := range WarYears() {
		assert.NotContains(t, c.Years, y, "war year %d is in Years", y)
		for _, r := range parse(t, counts)[1:] {
			require.NotEqual(t, strconv.Itoa(y), r[1], "war year %d appears in counts: %v", y, r)
		}
		for _, r := range parse(t, totals)[1:] {
			require.NotEqual(t, strconv.Itoa(y), r[0], "war year %d appears in totals", y)
		}
	}
	// Every other year of the span is present, in order.
	assert.Len(t, c.Years, 2025-1868+1-len(WarYears()), "Years: 1868–2025 less the war years")
	assert.Equal(t, 1868, c.Years[0], "first year")
	assert.Equal(t, 2025, c.Years[len(c.Years)-1], "last year")
	assert.IsNonDecreasing(t, c.Years, "Years ascending")
}

func TestCountsWithinTotals(t *testing.T) {
	c := mustDemo(t)
	sum := make([]int, len(c.Years))
	for _, term := range c.Terms {
		require.Len(t, term.Counts, len(c.Years), "%q: one count a year", term.Name)
		for j, n := range term.Counts {
			require.GreaterOrEqual(t, n, 0, "%q in %d: count", term.Name, c.Years[j])
			require.LessOrEqual(t, n, c.Totals[j], "%q in %d: count, over the year's total", term.Name, c.Years[j])
			sum[j] += n
		}
	}
	// The terms are a small part of all the words printed.
	for j, s := range sum {
		assert.LessOrEqual(t, s, c.Totals[j]/10, "%d: words the terms use, of %d", c.Years[j], c.Totals[j])
	}
}

func TestTotalsGrow(t *testing.T) {
	c := mustDemo(t)
	first, last := float64(c.Totals[0]), float64(c.Totals[len(c.Totals)-1])
	assert.GreaterOrEqual(t, first, 1_600_000.0, "1868 total, want about 2 million")
	assert.LessOrEqual(t, first, 2_500_000.0, "1868 total, want about 2 million")
	assert.GreaterOrEqual(t, last, 12_000_000.0, "2025 total, want about 15 million")
	assert.LessOrEqual(t, last, 18_000_000.0, "2025 total, want about 15 million")
	// The war dips: the year before the gap is lower than a few years earlier.
	at := func(y int) int { return c.Totals[slices.Index(c.Years, y)] }
	assert.Less(t, at(1916), at(1912), "no wartime dip: total 1916 vs 1912")
	assert.Less(t, at(1942), at(1938), "no wartime dip: total 1942 vs 1938")
}

func TestTermNames(t *testing.T) {
	c := mustDemo(t)
	require.Len(t, c.Terms, DefaultConfig().Terms, "terms")
	var nonASCII, hyphen, compound int
	for i, term := range c.Terms {
		n := term.Name
		assert.True(t, utf8.ValidString(n), "%q is not UTF-8", n)
		assert.True(t, norm.NFC.IsNormalString(n), "%q is not NFC", n)
		assert.NotEmpty(t, n, "a blank name")
		assert.Equal(t, strings.TrimSpace(n), n, "%q has blank ends", n)
		assert.False(t, strings.ContainsAny(n, ",\"\n\r\t"), "%q has CSV-special characters", n)
		if i > 0 {
			assert.Less(t, c.Terms[i-1].Name, n, "names unique and sorted")
		}
		if strings.IndexFunc(n, func(r rune) bool { return r >= utf8.RuneSelf }) >= 0 {
			nonASCII++
		}
		if strings.Contains(n, "-") {
			hyphen++
		}
		if strings.Contains(n, " ") {
			compound++
		}
	}
	assert.GreaterOrEqual(t, nonASCII, 5, "non-ASCII names")
	assert.GreaterOrEqual(t, hyphen, 10, "hyphenated names")
	assert.GreaterOrEqual(t, compound, 100, "two-word names")
	for _, want := range []string{"Maßstab", "café", "naïve", "rôle", "über-gear"} {
		_, ok := slices.BinarySearchFunc(c.Terms, want, func(t Term, s string) int { return cmp.Compare(t.Name, s) })
		assert.True(t, ok, "missing the Unicode test term %q", want)
	}
}

// shares returns a term's yearly counts as shares of the words printed.
func shares(c Corpus, term Term) []float64 {
	out := make([]float64, len(term.Counts))
	for j, n := range term.Counts {
		out[j] = float64(n) / float64(c.Totals[j])
	}
	return out
}

// standsAlone reports the index of a year whose share is more than ratio
// times every other year's (what preflight's spike check lists with
// own-peak or per-million values), or -1.
func standsAlone(s []float64, ratio float64) int {
	top, next := -1, 0.0
	for j, v := range s {
		if top < 0 || v > s[top] {
			if top >= 0 {
				next = max(next, s[top])
			}
			top = j
		} else {
			next = max(next, v)
		}
	}
	if top >= 0 && s[top] > ratio*next {
		return top
	}
	return -1
}

// selectTop returns the n terms with the highest overall share (words
// used ÷ words printed) among those used at least minTotal times: the
// demo spec's "terms: {top: 384, min-total: 200}".
func selectTop(c Corpus, n, minTotal int) []Term {
	var printed float64
	for _, v := range c.Totals {
		printed += float64(v)
	}
	type ranked struct {
		term  Term
		share float64
	}
	var all []ranked
	for _, term := range c.Terms {
		used := 0
		for _, v := range term.Counts {
			used += v
		}
		if used >= minTotal {
			all = append(all, ranked{term, float64(used) / printed})
		}
	}
	slices.SortStableFunc(all, func(a, b ranked) int { return cmp.Compare(b.share, a.share) })
	out := make([]Term, 0, n)
	for _, r := range all[:min(n, len(all))] {
		out = append(out, r.term)
	}
	return out
}

// TestSpikes: the demo plants a handful of one-year spikes, each in a term
// the feature shows, each standing more than 4× (preflight's default
// spike-ratio) above every other year, in different eras; no other shown
// term has such a year, so preflight lists exactly the planted ones.
func TestSpikes(t *testing.T) {
	c := mustDemo(t)
	shown := selectTop(c, 384, 200)
	var planted []string
	var years []int
	for _, term := range c.Terms {
		if term.SpikeYear == 0 {
			continue
		}
		planted = append(planted, term.Name)
		years = append(years, term.SpikeYear)
		j := standsAlone(shares(c, term), 4)
		if assert.GreaterOrEqual(t, j, 0, "%q: planted spike does not stand alone", term.Name) {
			assert.Equal(t, term.SpikeYear, c.Years[j], "%q: the year that stands alone", term.Name)
		}
	}
	require.Len(t, planted, DefaultConfig().Spikes)
	slices.Sort(years)
	for i := 1; i < len(years); i++ {
		assert.GreaterOrEqual(t, years[i]-years[i-1], 15, "spikes %v: one an era", years)
	}
	var listed []string
	for _, term := range shown {
		if standsAlone(shares(c, term), 4) >= 0 {
			listed = append(listed, term.Name)
		}
	}
	slices.Sort(planted)
	slices.Sort(listed)
	assert.Equal(t, planted, listed, "terms of the top 384 with a year over 4× the rest")
}

// TestErasFitMeaning: words peak in the years their meaning puts them in,
// and new words are not printed before they could be. The years are the
// broad order of technical history, from memory (steam and the telegraph
// before 1900, computing after the war, the web after 1990).
func TestErasFitMeaning(t *testing.T) {
	c := mustDemo(t)
	tests := []struct {
		term             string
		peakFrom, peakTo int // the year of the highest share lies here
		notBefore        int // no count before this year (0: any)
	}{
		{"telegraph", 1868, 1900, 0},
		{"steam", 1868, 1905, 0},
		{"wrought iron", 1868, 1895, 0},
		{"arc lamp", 1875, 1900, 1865},
		{"dynamo", 1880, 1915, 0},
		{"coherer", 1895, 1915, 0},
		{"aeroplane", 1905, 1935, 1895},
		{"vacuum tube", 1925, 1955, 0},
		{"transistor", 1950, 1980, 1946},
		{"core memory", 1955, 1980, 1946},
		{"mainframe", 1960, 1995, 1946},
		{"floppy disk", 1975, 1995, 1960},
		{"slide rule", 1950, 1975, 0},
		{"pocket calculator", 1970, 1990, 1960},
		{"email", 1990, 2025, 1980},
		{"smartphone", 2005, 2025, 1995},
		{"net zero", 2010, 2025, 2000},
		{"software", 1960, 2025, 1946},
	}
	for _, tc := range tests {
		i, ok := slices.BinarySearchFunc(c.Terms, tc.term, func(t Term, s string) int { return cmp.Compare(t.Name, s) })
		if !assert.True(t, ok, "term %q missing", tc.term) {
			continue
		}
		s := shares(c, c.Terms[i])
		peak := c.Years[slices.Index(s, slices.Max(s))]
		assert.GreaterOrEqual(t, peak, tc.peakFrom, "%q peaks in %d, want %d–%d", tc.term, peak, tc.peakFrom, tc.peakTo)
		assert.LessOrEqual(t, peak, tc.peakTo, "%q peaks in %d, want %d–%d", tc.term, peak, tc.peakFrom, tc.peakTo)
		for j, y := range c.Years {
			if y < tc.notBefore && !assert.Zero(t, c.Terms[i].Counts[j], "%q printed in %d, before %d", tc.term, y, tc.notBefore) {
				break
			}
		}
	}
}

// TestHandOvers: the pairs the inserts show hand over: the older word
// peaks first, and there is a year between the two peaks where the newer
// word's line (own-peak, 5-year mean) climbs past the older's while both
// are still clearly drawn (each above a tenth of its peak) — a hand-over,
// not a relay with a gap.
func TestHandOvers(t *testing.T) {
	c := mustDemo(t)
	ownPeak := func(name string) []float64 {
		i, ok := slices.BinarySearchFunc(c.Terms, name, func(t Term, s string) int { return cmp.Compare(t.Name, s) })
		require.True(t, ok, "term %q missing", name)
		s := shares(c, c.Terms[i])
		m := make([]float64, len(s))
		for j := range s {
			lo, hi := max(0, j-2), min(len(s), j+3)
			var sum float64
			for _, v := range s[lo:hi] {
				sum += v
			}
			m[j] = sum / float64(hi-lo)
		}
		top := slices.Max(m)
		for j := range m {
			m[j] /= top
		}
		return m
	}
	for _, pair := range [][2]string{
		{"telegraph", "telephone"}, {"rivetting", "welding"}, {"slide rule", "pocket calculator"},
		{"aeroplane", "aircraft"}, {"vacuum tube", "transistor"}, {"transistor", "microchip"},
		{"draughtsman", "computer-aided design"},
	} {
		old, young := ownPeak(pair[0]), ownPeak(pair[1])
		po, py := slices.Index(old, 1.0), slices.Index(young, 1.0)
		if !assert.Less(t, po, py, "%s should peak before %s", pair[0], pair[1]) {
			continue
		}
		crossed := false
		for j := po; j < py; j++ {
			if young[j] >= old[j] && old[j] > 0.1 && young[j] > 0.1 {
				crossed = true
				break
			}
		}
		assert.True(t, crossed, "%s does not hand over to %s", pair[0], pair[1])
	}
}

// TestCountsAroundPeak: every term the feature shows is printed at least
// 20 times in every year of its active life (share at least a third of its
// highest), so around its peak too; Poisson scatter there is under about
// ±22 % (1/√20) and the shape, not the noise, reads. (The spike check's
// false-alarm test in render/preflight runs at this level.)
func TestCountsAroundPeak(t *testing.T) {
	c := mustDemo(t)
	var leanest, around []float64
	for _, term := range selectTop(c, 384, 200) {
		s := shares(c, term)
		if term.SpikeYear != 0 { // the line's shape is the rest of the years
			s[slices.Index(c.Years, term.SpikeYear)] = 0
		}
		top := slices.Max(s)
		lean := math.Inf(1)
		for j, v := range s {
			if 3*v >= top {
				lean = math.Min(lean, float64(term.Counts[j]))
			}
		}
		p := slices.Index(s, top)
		lo, hi := max(0, p-2), min(len(s), p+3)
		var sum float64
		for _, n := range term.Counts[lo:hi] {
			sum += float64(n)
		}
		leanest = append(leanest, lean)
		around = append(around, sum/float64(hi-lo))
		assert.GreaterOrEqual(t, lean, 20.0, "%q: %.0f in the leanest year of its active life", term.Name, lean)
	}
	slices.Sort(leanest)
	slices.Sort(around)
	t.Logf("top 384: leanest active year min %.0f, median %.0f; mean of the 5 years around the peak min %.0f, median %.0f",
		leanest[0], leanest[len(leanest)/2], around[0], around[len(around)/2])
}

// TestCommittedData: the committed demo data is what the generator makes
// with its defaults (regenerate with go run ./examples/generate -out
// examples/quillmere/data), and every file stays under 5 MB for git.
func TestCommittedData(t *testing.T) {
	counts, totals := render(t, mustDemo(t))
	for name, want := range map[string][]byte{CountsFile: counts, TotalsFile: totals} {
		got, err := os.ReadFile(filepath.Join("..", "..", "quillmere", "data", name))
		require.NoError(t, err)
		assert.True(t, bytes.Equal(got, want), "%s differs from the generator's output: run go run ./examples/generate -out examples/quillmere/data", name)
		assert.Less(t, len(got), 5_000_000, "%s is %d bytes", name, len(got))
	}
}

// TestMadeUpWordsAreNotEnglish checks every word the generator invents —
// the jargon it can make and the town's name — and every single-word term
// of the demo that is not one of our hand-written real words, against a
// general word list with proper names: Debian's wamerican
// (/usr/share/dict/words, from SCOWL). Invented words must not be real
// words or names passed off as invented.
func TestMadeUpWordsAreNotEnglish(t *testing.T) {
	path := tooltest.RequireFile(t, "/usr/share/dict/words", "wamerican")
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	dict := map[string]bool{}
	for _, w := range strings.Fields(string(b)) {
		dict[strings.ToLower(w)] = true
	}
	// The list is the real thing: common words of our vocabulary are in it
	// (else every check below would pass for nothing).
	for _, w := range []string{"engine", "boiler", "telegraph", "quill", "wending", "marlin"} {
		require.True(t, dict[w], "%q not in %s: the word list looks wrong", w, path)
	}
	english := func(w string) bool {
		w = strings.ToLower(w)
		return dict[w] || dict[w+"s"] || dict[w+"'s"] || dict[strings.TrimSuffix(w, "s")]
	}
	made := MadeUpWords()
	for _, w := range made {
		assert.False(t, english(w), "invented word %q is in %s", w, path)
	}
	real := map[string]bool{}
	for _, list := range [][]word{headlines, fillers, modifiers, heads} {
		for _, w := range list {
			real[w.text] = true
		}
	}
	var jargonSeen int
	for _, term := range mustDemo(t).Terms {
		if real[term.Name] || strings.ContainsAny(term.Name, " ") {
			continue
		}
		jargonSeen++
		assert.Contains(t, made, term.Name, "%q is neither hand-written nor invented jargon", term.Name)
		assert.False(t, english(term.Name), "invented term %q is in %s", term.Name, path)
	}
	assert.Positive(t, jargonSeen, "the demo has no invented jargon to check")
}

// TestTopTermsVaried checks that an 8-page feature of the top 384 terms by
// overall share (words used / words printed) is varied: its terms peak in
// most decades and take most of the shape families.
func TestTopTermsVaried(t *testing.T) {
	c := mustDemo(t)
	var printed int
	for _, n := range c.Totals {
		printed += n
	}
	type ranked struct {
		term  Term
		share float64
	}
	all := make([]ranked, len(c.Terms))
	for i, term := range c.Terms {
		var used int
		for _, n := range term.Counts {
			used += n
		}
		all[i] = ranked{term, float64(used) / float64(printed)}
	}
	slices.SortFunc(all, func(a, b ranked) int { return cmp.Compare(b.share, a.share) })
	decades := map[int]bool{}
	shapes := map[Shape]bool{}
	for _, r := range all[:384] {
		shapes[r.term.Shape] = true
		best, bestShare := 0, -1.0
		for j, n := range r.term.Counts {
			if s := float64(n) / float64(c.Totals[j]); s > bestShare {
				best, bestShare = c.Years[j]/10*10, s
			}
		}
		decades[best] = true
	}
	assert.GreaterOrEqual(t, len(decades), 14, "decades the top 384 peak in, of 16")
	assert.GreaterOrEqual(t, len(shapes), 7, "shapes among the top 384, of 8")
}

func parse(t testing.TB, b []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	require.NoError(t, err)
	return rows
}

// TestCSV checks the file format and that the files hold the corpus exactly.
func TestCSV(t *testing.T) {
	c := mustDemo(t)
	counts, totals := render(t, c)
	for name, b := range map[string][]byte{"counts": counts, "totals": totals} {
		assert.False(t, bytes.Contains(b, []byte("\r")), "%s: want LF line ends, found CR", name)
		assert.True(t, utf8.Valid(b), "%s: want UTF-8", name)
		assert.True(t, bytes.HasSuffix(b, []byte("\n")), "%s: want a line end at the end", name)
	}
	tr := parse(t, totals)
	require.Equal(t, []string{"year", "total"}, tr[0], "totals header")
	require.Len(t, tr, len(c.Years)+1, "totals rows: a header and one a year")
	for j, r := range tr[1:] {
		require.Equal(t, []string{strconv.Itoa(c.Years[j]), strconv.Itoa(c.Totals[j])}, r, "totals row %d", j+1)
	}

	cr := parse(t, counts)
	require.Equal(t, []string{"term", "year", "count"}, cr[0], "counts header")
	// Rebuild the corpus from the rows: sorted by term then year, no zeros,
	// and every nonzero count present.
	got := map[string][]int{}
	prevTerm, prevYear := "", 0
	for _, r := range cr[1:] {
		year, err1 := strconv.Atoi(r[1])
		n, err2 := strconv.Atoi(r[2])
		require.NoError(t, err1, "bad row %v", r)
		require.NoError(t, err2, "bad row %v", r)
		require.Positive(t, n, "bad row %v: counts of zero are left out", r)
		require.True(t, r[0] > prevTerm || r[0] == prevTerm && year > prevYear, "row %v out of order after %s,%d", r, prevTerm, prevYear)
		prevTerm, prevYear = r[0], year
		j := slices.Index(c.Years, year)
		require.GreaterOrEqual(t, j, 0, "row %v: year not in totals", r)
		if got[r[0]] == nil {
			got[r[0]] = make([]int, len(c.Years))
		}
		got[r[0]][j] = n
	}
	for _, term := range c.Terms {
		g := got[term.Name]
		if g == nil { // a term never printed has no rows
			g = make([]int, len(c.Years))
		}
		assert.Equal(t, term.Counts, g, "%q: counts in CSV differ from the corpus", term.Name)
	}
}

func TestConfigErrors(t *testing.T) {
	base := DefaultConfig()
	for _, tc := range []struct {
		name string
		edit func(*Config)
		want string
	}{
		{"no terms", func(c *Config) { c.Terms = 0 }, "Terms"},
		{"reversed span", func(c *Config) { c.From, c.To = 2000, 1990 }, "published years"},
		{"too short", func(c *Config) { c.From, c.To = 2000, 2005 }, "published years"},
		{"all missing", func(c *Config) { c.From, c.To, c.Missing = 1940, 1950, []int{1941, 1942, 1943} }, "published years"},
		{"year zero", func(c *Config) { c.From = 0 }, "outside"},
		{"too many terms", func(c *Config) { c.Terms = 1_000_000 }, "distinct terms"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			cfg := base
			cfg.Missing = slices.Clone(base.Missing)
			tc.edit(&cfg)
			_, err := Generate(cfg)
			assert.ErrorContains(t, err, tc.want, "Generate(%+v)", cfg)
		})
	}
}

// TestOtherSizes checks the benchmark size (4,000 terms), a small corpus and
// a span that misses the war years.
func TestOtherSizes(t *testing.T) {
	for _, cfg := range []Config{
		{Terms: 4000, Seed: 7, From: 1868, To: 2025, Missing: WarYears()},
		{Terms: 12, Seed: 1, From: 1950, To: 2025},
		{Terms: 300, Seed: 2, From: 1800, To: 1900, Missing: WarYears()},
	} {
		c, err := Generate(cfg)
		require.NoError(t, err, "%+v", cfg)
		assert.Len(t, c.Terms, cfg.Terms, "%+v: terms", cfg)
		assert.Len(t, c.Years, cfg.To-cfg.From+1-countIn(cfg.Missing, cfg.From, cfg.To), "%+v: years", cfg)
		assert.True(t, slices.IsSortedFunc(c.Terms, func(a, b Term) int { return cmp.Compare(a.Name, b.Name) }), "%+v: terms not sorted", cfg)
	}
}

func countIn(ys []int, from, to int) int {
	n := 0
	for _, y := range ys {
		if y >= from && y <= to {
			n++
		}
	}
	return n
}

func TestWriteDir(t *testing.T) {
	dir := t.TempDir()
	cfg := Config{Terms: 50, Seed: 3, From: 1900, To: 1960, Missing: WarYears()}
	require.NoError(t, WriteDir(filepath.Join(dir, "sub"), cfg))
	c, err := Generate(cfg)
	require.NoError(t, err)
	counts, totals := render(t, c)
	for name, want := range map[string][]byte{CountsFile: counts, TotalsFile: totals} {
		got, err := os.ReadFile(filepath.Join(dir, "sub", name))
		if assert.NoError(t, err, name) {
			assert.True(t, bytes.Equal(got, want), "%s: file differs from the Write method's output", name)
		}
	}
	assert.Error(t, WriteDir(dir+"/sub", Config{}), "WriteDir with zero Config")
}

func BenchmarkGenerate(b *testing.B) {
	for _, n := range []int{1500, 4000} {
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			cfg := DefaultConfig()
			cfg.Terms = n
			for b.Loop() {
				_, err := Generate(cfg)
				require.NoError(b, err)
			}
		})
	}
}

func BenchmarkWriteDir4000(b *testing.B) {
	cfg := DefaultConfig()
	cfg.Terms = 4000
	dir := b.TempDir()
	for b.Loop() {
		require.NoError(b, WriteDir(dir, cfg))
	}
}

// TestSample: clean series of each shape, as the spike check's false-alarm
// test uses them: the asked shape and number, no spike, the leanest active
// year's expected count equal to the asked level, the same bytes for the
// same arguments.
func TestSample(t *testing.T) {
	cfg := DefaultConfig()
	for _, shape := range Shapes {
		c, err := Sample(cfg, shape, 50, 20)
		require.NoError(t, err)
		require.Len(t, c.Terms, 50)
		for _, term := range c.Terms {
			assert.Equal(t, shape, term.Shape)
			assert.Zero(t, term.SpikeYear)
			var top float64
			for j, e := range term.Expected {
				top = math.Max(top, e/float64(c.Totals[j]))
			}
			lean := math.Inf(1)
			for j, e := range term.Expected {
				if 3*e/float64(c.Totals[j]) >= top {
					lean = math.Min(lean, e)
				}
			}
			assert.InDelta(t, 20, lean, 1e-9, "%s %s: leanest active year", shape, term.Name)
		}
		again, err := Sample(cfg, shape, 50, 20)
		require.NoError(t, err)
		assert.Equal(t, c, again, "%s: same arguments, same series", shape)
	}
	_, err := Sample(Config{}, Flat, 1, 20)
	assert.Error(t, err)
}
