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
	require.False(t, !bytes.Equal(ac, bc) || !bytes.Equal(at, bt), "same Config gave different bytes")
	cfg := DefaultConfig()
	cfg.Seed++
	d, err := Generate(cfg)
	require.NoError(t, err)
	if dc, _ := render(t, d); bytes.Equal(ac, dc) {
		t.Fatal("a different seed gave the same counts")
	}
}

func TestMissingYears(t *testing.T) {
	c := mustDemo(t)
	counts, totals := render(t, c)
	for _, y := range WarYears() {
		assert.False(t, slices.Contains(c.Years, y), "war year %d is in Years", y)
		for _, r := range parse(t, counts)[1:] {
			require.False(t, r[1] == strconv.Itoa(y), "war year %d appears in counts: %v", y, r)
		}
		for _, r := range parse(t, totals)[1:] {
			require.False(t, r[0] == strconv.Itoa(y), "war year %d appears in totals", y)
		}
	}
	// Every other year of the span is present, in order.
	want := 2025 - 1868 + 1 - len(WarYears())
	if len(c.Years) != want || c.Years[0] != 1868 || c.Years[len(c.Years)-1] != 2025 || !slices.IsSorted(c.Years) {
		t.Errorf("Years: %d years %d–%d, want %d over 1868–2025 ascending", len(c.Years), c.Years[0], c.Years[len(c.Years)-1], want)
	}
}

func TestCountsWithinTotals(t *testing.T) {
	c := mustDemo(t)
	sum := make([]int, len(c.Years))
	for _, term := range c.Terms {
		require.False(t, len(term.Counts) != len(c.Years), "%q: %d counts for %d years", term.Name, len(term.Counts), len(c.Years))
		for j, n := range term.Counts {
			if n < 0 || n > c.Totals[j] {
				t.Fatalf("%q in %d: count %d outside 0..%d", term.Name, c.Years[j], n, c.Totals[j])
			}
			sum[j] += n
		}
	}
	// The terms are a small part of all the words printed.
	for j, s := range sum {
		if s > c.Totals[j]/10 {
			t.Errorf("%d: terms use %d of %d words", c.Years[j], s, c.Totals[j])
		}
	}
}

func TestTotalsGrow(t *testing.T) {
	c := mustDemo(t)
	first, last := float64(c.Totals[0]), float64(c.Totals[len(c.Totals)-1])
	assert.False(t, first < 1_600_000 || first > 2_500_000, "1868 total %v, want about 2 million", first)
	assert.False(t, last < 12_000_000 || last > 18_000_000, "2025 total %v, want about 15 million", last)
	// The war dips: the year before the gap is lower than a few years earlier.
	at := func(y int) int { return c.Totals[slices.Index(c.Years, y)] }
	assert.False(t, at(1916) >= at(1912) || at(1942) >= at(1938), "no wartime dip: 1912 %d, 1916 %d, 1938 %d, 1942 %d", at(1912), at(1916), at(1938), at(1942))
}

func TestTermNames(t *testing.T) {
	c := mustDemo(t)
	require.False(t, len(c.Terms) != DefaultConfig().Terms, "%d terms, want %d", len(c.Terms), DefaultConfig().Terms)
	var nonASCII, hyphen, compound int
	for i, term := range c.Terms {
		n := term.Name
		switch {
		case !utf8.ValidString(n):
			t.Errorf("%q is not UTF-8", n)
		case !norm.NFC.IsNormalString(n):
			t.Errorf("%q is not NFC", n)
		case n != strings.TrimSpace(n) || n == "" || strings.ContainsAny(n, ",\"\n\r\t"):
			t.Errorf("%q has blank ends or CSV-special characters", n)
		}
		if i > 0 && c.Terms[i-1].Name >= n {
			t.Errorf("names not unique and sorted: %q then %q", c.Terms[i-1].Name, n)
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
	assert.False(t, nonASCII < 5 || hyphen < 10 || compound < 100, "%d non-ASCII, %d hyphenated, %d two-word names; want at least 5, 10, 100", nonASCII, hyphen, compound)
	for _, want := range []string{"Maßstab", "café", "naïve", "rôle", "über-gear"} {
		if _, ok := slices.BinarySearchFunc(c.Terms, want, func(t Term, s string) int { return cmp.Compare(t.Name, s) }); !ok {
			t.Errorf("missing the Unicode test term %q", want)
		}
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
		assert.True(t, peak >= tc.peakFrom && peak <= tc.peakTo, "%q peaks in %d, want %d–%d", tc.term, peak, tc.peakFrom, tc.peakTo)
		for j, y := range c.Years {
			if y < tc.notBefore && c.Terms[i].Counts[j] > 0 {
				t.Errorf("%q printed %d times in %d, before %d", tc.term, c.Terms[i].Counts[j], y, tc.notBefore)
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
	assert.False(t, len(decades) < 14 || len(shapes) < 7, "top 384 peak in %d decades with %d shapes; want ≥ 14 of 16 decades and ≥ 7 of 8 shapes", len(decades), len(shapes))
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
		assert.False(t, bytes.Contains(b, []byte("\r")) || !utf8.Valid(b) || !bytes.HasSuffix(b, []byte("\n")), "%s: want UTF-8 with LF line ends", name)
	}
	tr := parse(t, totals)
	if !slices.Equal(tr[0], []string{"year", "total"}) || len(tr)-1 != len(c.Years) {
		t.Fatalf("totals: header %v, %d rows", tr[0], len(tr)-1)
	}
	for j, r := range tr[1:] {
		if r[0] != strconv.Itoa(c.Years[j]) || r[1] != strconv.Itoa(c.Totals[j]) {
			t.Fatalf("totals row %d = %v, want %d,%d", j+1, r, c.Years[j], c.Totals[j])
		}
	}

	cr := parse(t, counts)
	if !slices.Equal(cr[0], []string{"term", "year", "count"}) {
		t.Fatalf("counts header %v", cr[0])
	}
	// Rebuild the corpus from the rows: sorted by term then year, no zeros,
	// and every nonzero count present.
	got := map[string][]int{}
	prevTerm, prevYear := "", 0
	for _, r := range cr[1:] {
		year, err1 := strconv.Atoi(r[1])
		n, err2 := strconv.Atoi(r[2])
		require.False(t, err1 != nil || err2 != nil || n <= 0, "bad row %v", r)
		require.False(t, r[0] < prevTerm || r[0] == prevTerm && year <= prevYear, "row %v out of order after %s,%d", r, prevTerm, prevYear)
		prevTerm, prevYear = r[0], year
		j := slices.Index(c.Years, year)
		require.False(t, j < 0, "row %v: year not in totals", r)
		if got[r[0]] == nil {
			got[r[0]] = make([]int, len(c.Years))
		}
		got[r[0]][j] = n
	}
	for _, term := range c.Terms {
		want := term.Counts
		if g := got[term.Name]; g == nil && slices.ContainsFunc(want, func(n int) bool { return n > 0 }) || g != nil && !slices.Equal(g, want) {
			t.Errorf("%q: counts in CSV differ from the corpus", term.Name)
		}
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
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("Generate(%+v) error = %v, want one mentioning %q", cfg, err, tc.want)
			}
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
		assert.False(t, len(c.Terms) != cfg.Terms || len(c.Years) != cfg.To-cfg.From+1-countIn(cfg.Missing, cfg.From, cfg.To), "%+v: %d terms over %d years", cfg, len(c.Terms), len(c.Years))
		if !slices.IsSortedFunc(c.Terms, func(a, b Term) int { return cmp.Compare(a.Name, b.Name) }) {
			t.Errorf("%+v: terms not sorted", cfg)
		}
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
		assert.False(t, err != nil || !bytes.Equal(got, want), "%s: file differs from the Write method's output (err %v)", name, err)
	}
	if err := WriteDir(dir+"/sub", Config{}); err == nil {
		t.Error("WriteDir with zero Config: no error")
	}
}

func BenchmarkGenerate(b *testing.B) {
	for _, n := range []int{1500, 4000} {
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			cfg := DefaultConfig()
			cfg.Terms = n
			for b.Loop() {
				if _, err := Generate(cfg); err != nil {
					b.Fatal(err)
				}
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
