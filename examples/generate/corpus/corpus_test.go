package corpus

// These tests check our own invented demo data against the promises made in
// its brief and README (determinism, missing war years, plausible counts,
// unique NFC names, a few one-year spikes). The data is fiction, so there is
// no outside source to cite: every expected property below is ours.

import (
	"bytes"
	"cmp"
	"encoding/csv"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"unicode/utf8"

	"golang.org/x/text/unicode/norm"
)

// demo generates the committed demo once for all tests.
var demo = sync.OnceValues(func() (Corpus, error) { return Generate(DefaultConfig()) })

func mustDemo(t testing.TB) Corpus {
	t.Helper()
	c, err := demo()
	if err != nil {
		t.Fatalf("Generate(DefaultConfig()): %v", err)
	}
	return c
}

func render(t testing.TB, c Corpus) (counts, totals []byte) {
	t.Helper()
	var cb, tb bytes.Buffer
	if err := c.WriteCounts(&cb); err != nil {
		t.Fatal(err)
	}
	if err := c.WriteTotals(&tb); err != nil {
		t.Fatal(err)
	}
	return cb.Bytes(), tb.Bytes()
}

func TestDeterministic(t *testing.T) {
	a := mustDemo(t)
	b, err := Generate(DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	ac, at := render(t, a)
	bc, bt := render(t, b)
	if !bytes.Equal(ac, bc) || !bytes.Equal(at, bt) {
		t.Fatal("same Config gave different bytes")
	}
	cfg := DefaultConfig()
	cfg.Seed++
	d, err := Generate(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if dc, _ := render(t, d); bytes.Equal(ac, dc) {
		t.Fatal("a different seed gave the same counts")
	}
}

func TestMissingYears(t *testing.T) {
	c := mustDemo(t)
	counts, totals := render(t, c)
	for _, y := range WarYears() {
		if slices.Contains(c.Years, y) {
			t.Errorf("war year %d is in Years", y)
		}
		for _, r := range parse(t, counts)[1:] {
			if r[1] == strconv.Itoa(y) {
				t.Fatalf("war year %d appears in counts: %v", y, r)
			}
		}
		for _, r := range parse(t, totals)[1:] {
			if r[0] == strconv.Itoa(y) {
				t.Fatalf("war year %d appears in totals", y)
			}
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
		if len(term.Counts) != len(c.Years) {
			t.Fatalf("%q: %d counts for %d years", term.Name, len(term.Counts), len(c.Years))
		}
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
	if first < 900_000 || first > 1_350_000 {
		t.Errorf("1868 total %v, want about 1.1 million", first)
	}
	if last < 12_000_000 || last > 18_000_000 {
		t.Errorf("2025 total %v, want about 15 million", last)
	}
	// The war dips: the year before the gap is lower than a few years earlier.
	at := func(y int) int { return c.Totals[slices.Index(c.Years, y)] }
	if at(1916) >= at(1912) || at(1942) >= at(1938) {
		t.Errorf("no wartime dip: 1912 %d, 1916 %d, 1938 %d, 1942 %d", at(1912), at(1916), at(1938), at(1942))
	}
}

func TestTermNames(t *testing.T) {
	c := mustDemo(t)
	if len(c.Terms) != 1500 {
		t.Fatalf("%d terms, want 1500", len(c.Terms))
	}
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
	if nonASCII < 5 || hyphen < 10 || compound < 100 {
		t.Errorf("%d non-ASCII, %d hyphenated, %d two-word names; want at least 5, 10, 100", nonASCII, hyphen, compound)
	}
	for _, want := range []string{"Maßstab", "café", "naïve", "rôle", "über-gear"} {
		if _, ok := slices.BinarySearchFunc(c.Terms, want, func(t Term, s string) int { return cmp.Compare(t.Name, s) }); !ok {
			t.Errorf("missing the Unicode test term %q", want)
		}
	}
}

// spikeLike reports the years j where a count is at least 5 times both
// neighbouring counts, with neighbours large enough (≥ 5) that Poisson noise
// alone would hardly do it.
func spikeLike(counts []int) []int {
	var out []int
	for j := 1; j+1 < len(counts); j++ {
		a, b := counts[j-1], counts[j+1]
		if a >= 5 && b >= 5 && counts[j] >= 5*max(a, b) {
			out = append(out, j)
		}
	}
	return out
}

func TestSpikes(t *testing.T) {
	c := mustDemo(t)
	var marked, seen int
	for _, term := range c.Terms {
		found := spikeLike(term.Counts)
		if len(found) > 0 {
			seen++
		}
		if term.SpikeYear == 0 {
			continue
		}
		marked++
		j := slices.Index(c.Years, term.SpikeYear)
		if j < 0 || !slices.Contains(found, j) {
			t.Errorf("%q: SpikeYear %d is not 5–20× its neighbours: %v", term.Name, term.SpikeYear, term.Counts[max(0, j-1):min(len(term.Counts), j+2)])
		}
		if j >= 0 && term.Counts[j] > 21*max(term.Counts[j-1], term.Counts[j+1]) {
			t.Errorf("%q: spike %d is more than 20× its neighbours", term.Name, term.Counts[j])
		}
	}
	lo, hi := len(c.Terms)/100, len(c.Terms)*4/100
	if marked < lo || marked > hi {
		t.Errorf("%d terms have a spike, want %d–%d (1–4%%)", marked, lo, hi)
	}
	t.Logf("%d terms given a spike, %d look spiked", marked, seen)
	if seen < lo || seen > hi {
		t.Errorf("%d terms look spiked in the data, want %d–%d (1–4%%)", seen, lo, hi)
	}
}

// TestEras checks that words keep to their era: computing words are never
// printed before 1946, modern ones never before 1980.
func TestEras(t *testing.T) {
	c := mustDemo(t)
	for _, tc := range []struct {
		name  string
		floor int
	}{
		{"software", 1946}, {"transistor", 1946}, {"microprocessor", 1946},
		{"smartphone", 1980}, {"heat pump", 1980}, {"digital twin", 1980},
	} {
		i, ok := slices.BinarySearchFunc(c.Terms, tc.name, func(t Term, s string) int { return cmp.Compare(t.Name, s) })
		if !ok {
			t.Errorf("term %q missing", tc.name)
			continue
		}
		for j, y := range c.Years {
			if y < tc.floor && c.Terms[i].Counts[j] > 0 {
				t.Errorf("%q printed %d times in %d, before %d", tc.name, c.Terms[i].Counts[j], y, tc.floor)
			}
		}
	}
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
	if len(decades) < 14 || len(shapes) < 7 {
		t.Errorf("top 384 peak in %d decades with %d shapes; want ≥ 14 of 16 decades and ≥ 7 of 8 shapes", len(decades), len(shapes))
	}
}

func parse(t testing.TB, b []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestCSV checks the file format and that the files hold the corpus exactly.
func TestCSV(t *testing.T) {
	c := mustDemo(t)
	counts, totals := render(t, c)
	for name, b := range map[string][]byte{"counts": counts, "totals": totals} {
		if bytes.Contains(b, []byte("\r")) || !utf8.Valid(b) || !bytes.HasSuffix(b, []byte("\n")) {
			t.Errorf("%s: want UTF-8 with LF line ends", name)
		}
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
		if err1 != nil || err2 != nil || n <= 0 {
			t.Fatalf("bad row %v", r)
		}
		if r[0] < prevTerm || r[0] == prevTerm && year <= prevYear {
			t.Fatalf("row %v out of order after %s,%d", r, prevTerm, prevYear)
		}
		prevTerm, prevYear = r[0], year
		j := slices.Index(c.Years, year)
		if j < 0 {
			t.Fatalf("row %v: year not in totals", r)
		}
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
		if err != nil {
			t.Fatalf("%+v: %v", cfg, err)
		}
		if len(c.Terms) != cfg.Terms || len(c.Years) != cfg.To-cfg.From+1-countIn(cfg.Missing, cfg.From, cfg.To) {
			t.Errorf("%+v: %d terms over %d years", cfg, len(c.Terms), len(c.Years))
		}
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
	if err := WriteDir(filepath.Join(dir, "sub"), cfg); err != nil {
		t.Fatal(err)
	}
	c, err := Generate(cfg)
	if err != nil {
		t.Fatal(err)
	}
	counts, totals := render(t, c)
	for name, want := range map[string][]byte{CountsFile: counts, TotalsFile: totals} {
		got, err := os.ReadFile(filepath.Join(dir, "sub", name))
		if err != nil || !bytes.Equal(got, want) {
			t.Errorf("%s: file differs from the Write method's output (err %v)", name, err)
		}
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
		if err := WriteDir(dir, cfg); err != nil {
			b.Fatal(err)
		}
	}
}
