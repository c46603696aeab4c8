package count

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestMatcherAgainstBruteForce: the automaton finds exactly the
// occurrences a direct comparison at every position finds (random terms
// and streams over a small alphabet, so terms overlap and nest).
func TestMatcherAgainstBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	alphabet := []string{"a", "b", "c", "d", "x"}
	for round := range 200 {
		seen := map[string]bool{}
		var terms [][]string
		for len(terms) < 1+rng.IntN(8) {
			n := 1 + rng.IntN(4)
			var term []string
			for range n {
				term = append(term, alphabet[rng.IntN(4)])
			}
			if k := strings.Join(term, " "); !seen[k] {
				seen[k] = true
				terms = append(terms, term)
			}
		}
		stream := make([]string, 300)
		for i := range stream {
			stream[i] = alphabet[rng.IntN(len(alphabet))]
		}
		m := newMatcher(terms)
		got := make([]int, len(terms))
		s := int32(0)
		for _, tk := range stream {
			s = m.step(s, []byte(tk))
			for _, ti := range m.out[s] {
				got[ti]++
			}
		}
		want := make([]int, len(terms))
		for i := range stream {
			for ti, term := range terms {
				if i+len(term) <= len(stream) && slices.Equal(stream[i:i+len(term)], term) {
					want[ti]++
				}
			}
		}
		require.Equal(t, want, got, "round %d terms %v", round, terms)
	}
}

func writeArchive(t *testing.T, files map[string]string) string {
	t.Helper()
	root := t.TempDir()
	for name, text := range files {
		p := filepath.Join(root, filepath.FromSlash(name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, []byte(text), 0o644))
	}
	return root
}

func tables(t *testing.T, res *Result) (string, string) {
	t.Helper()
	var c, tot bytes.Buffer
	require.NoError(t, res.WriteCounts(&c))
	require.NoError(t, res.WriteTotals(&tot))
	return c.String(), tot.String()
}

var defaultYear = regexp.MustCompile(DefaultYearPattern)

// TestCountList: hand-counted tables for a small archive (every value
// below counted by hand from the text in the table).
func TestCountList(t *testing.T) {
	root := writeArchive(t, map[string]string{
		"1880/spring.txt":           "The Steam engine, and the steam\nengine; a locomo-\ntive.\n",
		"1880/autumn.txt":           "One steam engine. Steam-engine is a compound.\n",
		"issues/quarterly-1881.txt": "\ufb01re and \u017fteam engine\nTelegraph 1,000 times\n",
		"1881/notes.md":             "not read: wrong extension",
		".hidden/1882.txt":          "not read: hidden",
	})
	files, err := Folder(root, ".txt", defaultYear)
	require.NoError(t, err)
	require.Len(t, files, 3)
	res, err := Count(files, Options{Fold: true, Terms: []string{"steam engine", "steam", "locomotive", "fire", "telegraph", "Steam-engine", "wireless"}, Workers: 2})
	require.NoError(t, err)
	counts, totals := tables(t, res)
	assert.Equal(t, `term,year,count
Steam-engine,1880,1
fire,1881,1
locomotive,1880,1
steam,1880,3
steam,1881,1
steam engine,1880,3
steam engine,1881,1
telegraph,1881,1
`, counts)
	// 1880: "The Steam engine and the steam engine a locomotive" (9) +
	// "One steam engine Steam-engine is a compound" (7) = 16 words;
	// 1881: "fire and steam engine Telegraph 1,000 times" = 7.
	assert.Equal(t, "year,total\n1880,16\n1881,7\n", totals)
	assert.Equal(t, []string{"wireless"}, res.Missing)
}

// TestCountDeterministic: one worker or several, the same bytes.
func TestCountDeterministic(t *testing.T) {
	files := map[string]string{}
	rng := rand.New(rand.NewPCG(7, 7))
	vocab := []string{"boiler", "steam", "engine", "rivet", "valve", "gauge", "piston", "crank"}
	for y := 1900; y < 1910; y++ {
		for part := range 3 {
			var b strings.Builder
			for range 2000 {
				b.WriteString(vocab[rng.IntN(len(vocab))])
				b.WriteByte(" \n"[rng.IntN(2)])
			}
			files[fmt.Sprintf("%d/part-%d.txt", y, part)] = b.String()
		}
	}
	fs, err := Folder(writeArchive(t, files), ".txt", defaultYear)
	require.NoError(t, err)
	run := func(workers int) string {
		var out string
		for _, opt := range []Options{{Terms: vocab[:4], Workers: workers}, {NGrams: 3, MinCount: 2, Workers: workers}} {
			res, err := Count(fs, opt)
			require.NoError(t, err)
			c, tot := tables(t, res)
			out += c + tot
		}
		return out
	}
	one := run(1)
	for _, workers := range []int{2, 5} {
		assert.Equal(t, one, run(workers), "%d workers", workers)
	}
}

// TestCountNGrams: hand-counted phrases; a phrase is counted only when
// both its halves pass the minimum, and never across a mark.
func TestCountNGrams(t *testing.T) {
	root := writeArchive(t, map[string]string{
		"1900.txt": "steam engine steam engine. Steam boiler, engine room 1900 steam engine\n",
		"1901.txt": "steam engine room\n",
	})
	files, err := Folder(root, ".txt", defaultYear)
	require.NoError(t, err)
	res, err := Count(files, Options{Fold: true, NGrams: 3, MinCount: 2, Workers: 2})
	require.NoError(t, err)
	counts, totals := tables(t, res)
	// 1900: steam ×4, engine ×4, room ×1, boiler ×1 (below 2 over both
	// years); "steam engine" ×3 ("Steam boiler" and "boiler, engine" are
	// no pairs: boiler fails, the comma breaks); "engine steam" ×1 and
	// "engine room" ×1; 1901: steam, engine, room, "steam engine",
	// "engine room" once each. Over both years "engine steam" (1) fails;
	// no 3-word phrase reaches 2 ("steam engine room" 1, "steam engine
	// steam" 1, "engine steam engine" 1). "1900" is a word, but no term.
	assert.Equal(t, `term,year,count
engine,1900,4
engine,1901,1
engine room,1900,1
engine room,1901,1
room,1900,1
room,1901,1
steam,1900,4
steam,1901,1
steam engine,1900,3
steam engine,1901,1
`, counts)
	assert.Equal(t, "year,total\n1900,11\n1901,3\n", totals) // 11 words in 1900 with the number, 3 in 1901

	_, err = Count(files, Options{NGrams: 1, MaxTerms: 3})
	var le *LimitError
	require.ErrorAs(t, err, &le)
	assert.Equal(t, 1, le.Words)
}

// TestBadArchive: each kind of bad input is an error naming the file (and
// the place in it where there is one).
func TestBadArchive(t *testing.T) {
	t.Run("not UTF-8", func(t *testing.T) {
		root := writeArchive(t, map[string]string{"1900/a.txt": "fine\n", "1900/b.txt": "one\ncaf\xe9\n"})
		files, err := Folder(root, ".txt", defaultYear)
		require.NoError(t, err)
		_, err = Count(files, Options{Terms: []string{"fine"}, Workers: 2})
		require.Error(t, err)
		assert.Equal(t, filepath.Join(root, "1900/b.txt")+":2: byte 7: not valid UTF-8 (byte 0xE9): save the text as UTF-8", err.Error())
	})
	t.Run("binary", func(t *testing.T) {
		root := writeArchive(t, map[string]string{"1900/scan.txt": "\x89PNG\r\n\x1a\n\x00\x00"})
		files, err := Folder(root, ".txt", defaultYear)
		require.NoError(t, err)
		_, err = Count(files, Options{NGrams: 1})
		require.ErrorContains(t, err, "scan.txt")
	})
	t.Run("first bad file in order, whatever the workers", func(t *testing.T) {
		m := map[string]string{}
		for i := range 20 {
			m[fmt.Sprintf("19%02d.txt", i)] = strings.Repeat("word ", 1000)
		}
		m["1907.txt"] = "bad \xff"
		m["1913.txt"] = "bad \x00"
		files, err := Folder(writeArchive(t, m), ".txt", defaultYear)
		require.NoError(t, err)
		for range 5 {
			_, err = Count(files, Options{NGrams: 1, Workers: 4})
			require.ErrorContains(t, err, "1907.txt")
		}
	})
	t.Run("no year in path", func(t *testing.T) {
		_, err := Folder(writeArchive(t, map[string]string{"1900/a.txt": "x", "misc/notes.txt": "y"}), ".txt", defaultYear)
		require.ErrorContains(t, err, "notes.txt: no year in its path")
	})
	t.Run("empty archive", func(t *testing.T) {
		_, err := Folder(writeArchive(t, map[string]string{"readme.md": "x"}), ".txt", defaultYear)
		require.ErrorContains(t, err, "the archive is empty")
	})
	t.Run("a year with no words", func(t *testing.T) {
		files, err := Folder(writeArchive(t, map[string]string{"1900.txt": "word", "1901.txt": " \n. ,"}), ".txt", defaultYear)
		require.NoError(t, err)
		_, err = Count(files, Options{NGrams: 1})
		require.ErrorContains(t, err, "1901.txt: year 1901 has no words")
	})
	t.Run("unreadable", func(t *testing.T) {
		root := writeArchive(t, map[string]string{"1900.txt": "word"})
		require.NoError(t, os.Symlink(filepath.Join(root, "gone"), filepath.Join(root, "1901.txt")))
		_, err := Folder(root, ".txt", defaultYear)
		require.ErrorContains(t, err, "1901.txt: cannot read")
	})
	t.Run("manifest", func(t *testing.T) {
		root := writeArchive(t, map[string]string{"a.txt": "word", "m.csv": "year,path\n1900,a.txt\nnineteen,a.txt\n"})
		_, err := Manifest(filepath.Join(root, "m.csv"))
		require.ErrorContains(t, err, "m.csv:3: year \"nineteen\"")
		require.NoError(t, os.WriteFile(filepath.Join(root, "m.csv"), []byte("year,path\n1900,missing.txt\n"), 0o644))
		_, err = Manifest(filepath.Join(root, "m.csv"))
		require.ErrorContains(t, err, "m.csv:2: ")
		require.NoError(t, os.WriteFile(filepath.Join(root, "m.csv"), []byte("path,year\na.txt,1901\n"), 0o644))
		files, err := Manifest(filepath.Join(root, "m.csv"))
		require.NoError(t, err)
		assert.Equal(t, 1901, files[0].Year)
	})
	t.Run("term with no word", func(t *testing.T) {
		files, err := Folder(writeArchive(t, map[string]string{"1900.txt": "word"}), ".txt", defaultYear)
		require.NoError(t, err)
		_, err = Count(files, Options{Terms: []string{"—"}})
		require.ErrorContains(t, err, "has no word")
		_, err = Count(files, Options{Fold: true, Terms: []string{"Word", "word"}})
		require.ErrorContains(t, err, "reads as the same words")
	})
}

// readTable reads a demo table into records (header dropped).
func readTable(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	require.NoError(t, err)
	return recs[1:]
}

// TestRoundTripDemo writes text whose counts are the demo's own
// (examples/quillmere/data) for a sample of terms in the demo's two
// smallest years — every word of those years, so the totals match too —
// set the way an archive is: sentences, capitals, commas, lines wrapped at
// 72 columns with long words hyphenated at the line end, ligatures and
// long s, several files a year; then counts it back and compares.
func TestRoundTripDemo(t *testing.T) {
	dir := "../../examples/quillmere/data"
	totals := map[int]int64{}
	for _, r := range readTable(t, filepath.Join(dir, "totals.csv")) {
		y, _ := strconv.Atoi(r[0])
		n, _ := strconv.ParseInt(r[1], 10, 64)
		totals[y] = n
	}
	years := make([]int, 0, len(totals))
	for y := range totals {
		years = append(years, y)
	}
	slices.SortFunc(years, func(a, b int) int { return int(totals[a] - totals[b]) })
	years = years[:2]
	if testing.Short() {
		years = years[:1]
	}
	slices.Sort(years)

	type cell struct {
		term string
		year int
	}
	want := map[cell]int64{}
	byTerm := map[string]bool{}
	for _, r := range readTable(t, filepath.Join(dir, "counts.csv")) {
		y, _ := strconv.Atoi(r[1])
		if slices.Contains(years, y) {
			n, _ := strconv.ParseInt(r[2], 10, 64)
			want[cell{r[0], y}] = n
			byTerm[r[0]] = true
		}
	}
	// A sample of terms whose words no other sampled term shares, so each
	// occurrence counts for one term only.
	tk := &Tokenizer{Fold: true}
	all := make([]string, 0, len(byTerm))
	for term := range byTerm {
		all = append(all, term)
	}
	slices.Sort(all)
	rng := rand.New(rand.NewPCG(19, 1868))
	rng.Shuffle(len(all), func(i, j int) { all[i], all[j] = all[j], all[i] })
	used := map[string]bool{}
	var sample []string
	tokensOf := map[string][]string{}
	for _, term := range all {
		toks := Tokenize(tk, term)
		ok := true
		for _, w := range toks {
			if used[w] || classify([]byte(w)) != kindWord {
				ok = false
			}
		}
		if !ok {
			continue
		}
		for _, w := range toks {
			used[w] = true
		}
		sample = append(sample, term)
		tokensOf[term] = toks
		if len(sample) == 60 {
			break
		}
	}
	require.Len(t, sample, 60)

	// Filler: invented syllable words, none a sampled term's word.
	syll := []string{"ka", "lo", "mi", "re", "tu", "va", "sen", "dor", "pim", "qua"}
	var filler []string
	for len(filler) < 400 {
		w := syll[rng.IntN(10)] + syll[rng.IntN(10)] + syll[rng.IntN(10)]
		if rng.IntN(3) == 0 {
			w += "fi" + syll[rng.IntN(10)]
		}
		if !used[w] {
			filler = append(filler, w)
		}
	}

	files := map[string]string{}
	for _, y := range years {
		var units []string // each a term or a filler word, as printed
		var termWords int64
		for _, term := range sample {
			n := want[cell{term, y}]
			for range n {
				units = append(units, term)
			}
			termWords += n * int64(len(tokensOf[term]))
		}
		for range totals[y] - termWords {
			units = append(units, filler[rng.IntN(len(filler))])
		}
		rng.Shuffle(len(units), func(i, j int) { units[i], units[j] = units[j], units[i] })
		parts := 3
		per := (len(units) + parts - 1) / parts
		for p := range parts {
			chunk := units[p*per : min((p+1)*per, len(units))]
			files[fmt.Sprintf("%d/part-%d.txt", y, p)] = setText(chunk, rng)
		}
	}
	root := writeArchive(t, files)
	fs, err := Folder(root, ".txt", defaultYear)
	require.NoError(t, err)
	res, err := Count(fs, Options{Fold: true, Terms: sample, Workers: 2})
	require.NoError(t, err)

	require.Equal(t, years, res.Years)
	for i, y := range years {
		assert.Equal(t, totals[y], res.Totals[i], "total of %d (examples/quillmere/data/totals.csv)", y)
	}
	got := map[cell]int64{}
	for _, r := range res.Rows {
		got[cell{r.Term, r.Year}] = r.Count
	}
	for _, term := range sample {
		for _, y := range years {
			assert.Equal(t, want[cell{term, y}], got[cell{term, y}], "%q in %d (examples/quillmere/data/counts.csv)", term, y)
		}
	}
}

// setText prints units as an archive would: sentences of 6–20 units with a
// capital first and a full stop or comma, wrapped at 72 columns; a long
// lower-case word that does not fit is hyphenated at the line end; "fi"
// sometimes set as the ligature U+FB01 and an "s" starting a word as long
// s U+017F.
func setText(units []string, rng *rand.Rand) string {
	var b strings.Builder
	col := 0
	inSentence := 0
	put := func(word string) {
		if rng.IntN(10) == 0 {
			word = strings.Replace(word, "fi", "\ufb01", 1)
		}
		if strings.HasPrefix(word, "s") && rng.IntN(8) == 0 {
			word = "\u017f" + word[1:]
		}
		n := utf8.RuneCountInString(word)
		if col > 0 && col+1+n > 72 {
			if n >= 8 && isLowerASCII(word) && col+6 < 72 {
				cut := 3 + rng.IntN(n-5)
				b.WriteString(" " + word[:cut] + "-\n" + word[cut:])
				col = n - cut
				return
			}
			b.WriteString("\n")
			col = 0
		} else if col > 0 {
			b.WriteString(" ")
			col++
		}
		b.WriteString(word)
		col += n
	}
	for _, u := range units {
		words := strings.Fields(u)
		if inSentence == 0 {
			r, size := utf8.DecodeRuneInString(words[0])
			words[0] = string(unicode.ToUpper(r)) + words[0][size:]
		}
		for _, w := range words {
			put(w)
		}
		inSentence++
		switch {
		case inSentence > 6 && rng.IntN(12) == 0:
			b.WriteString(".")
			inSentence = 0
		case rng.IntN(15) == 0:
			b.WriteString(",")
		}
	}
	b.WriteString(".\n")
	return b.String()
}

func isLowerASCII(s string) bool {
	for _, c := range []byte(s) {
		if c < 'a' || c > 'z' {
			return false
		}
	}
	return true
}
