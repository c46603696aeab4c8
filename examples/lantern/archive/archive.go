// Package archive invents the text of The Fennock Lantern, the quarterly
// bulletin of the Fennock Lightkeepers' Guild (a fictional island and a
// fictional guild), 1880–1999: four issues a year, a few MB in all, for
// sheaf's second example, which goes from text to pages with `sheaf count`
// and `sheaf build`.
//
// Every name and number here is made up. The text is set the way an old
// archive's text comes out of a scanner: lines wrapped at 64 columns with
// long words hyphenated at the line end, a long s in the early years,
// ligatures in the letterpress years, typographic apostrophes later. The
// same seed gives the same bytes.
package archive

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"unicode/utf8"
)

// From and To are the bulletin's years.
const (
	From = 1880
	To   = 1999
)

// A term of the example and how its use moves over the years: a rate per
// 10,000 words at its height, and a shape.
type term struct {
	name   string
	rate   float64
	shape  string  // rise, fall, bump, flat
	center float64 // year of the middle of a rise or fall, or of a bump's top
	width  float64 // years
}

// Terms lists the example's terms, as the spec lists them.
func Terms() []string {
	names := make([]string, len(terms))
	for i, t := range terms {
		names[i] = t.name
	}
	return names
}

var terms = []term{
	{"colza oil", 9, "fall", 1895, 6},
	{"oil lamp", 8, "fall", 1915, 10},
	{"wick", 10, "fall", 1925, 12},
	{"clockwork", 7, "fall", 1935, 12},
	{"fog bell", 6, "fall", 1910, 8},
	{"paraffin", 9, "bump", 1912, 14},
	{"incandescent mantle", 6, "bump", 1920, 9},
	{"acetylene", 7, "bump", 1922, 8},
	{"diaphone", 6, "bump", 1935, 10},
	{"fog signal", 6, "bump", 1940, 22},
	{"wireless", 8, "bump", 1930, 11},
	{"telephone", 7, "rise", 1935, 8},
	{"electric lamp", 8, "rise", 1948, 7},
	{"generator", 7, "rise", 1950, 8},
	{"radio beacon", 6, "bump", 1960, 12},
	{"radar", 6, "rise", 1958, 6},
	{"helicopter", 5, "rise", 1972, 6},
	{"automation", 9, "rise", 1980, 5},
	{"solar panel", 6, "rise", 1988, 4},
	{"relief boat", 7, "fall", 1978, 8},
	{"keeper", 16, "fall", 1990, 6},
	{"logbook", 8, "flat", 0, 0},
	{"lens", 9, "flat", 0, 0},
	{"storm", 12, "flat", 0, 0},
}

// filler is the rest of the text: plain words, none of them a term's.
var filler = strings.Fields(`the the the of of of and and and a a to to in in was was were on at by
for with from this that which it its we our their week month weather wind sea north south east west
harbour island tide rock crew work report guild members season night day hours station tower gallery
stair rail paint glass brass coal water stores supply inspection visit inspector committee annual
meeting notice letter secretary treasurer accounts new old usual second third first good heavy fair
calm gale rain snow ice frost mist shore reef channel ships passing vessel schooner steamer trawler
landing jetty cottage garden family wife children school winter summer spring autumn repairs made
found kept sent held given noted lit burned cleaned trimmed wound checked fitted replaced ordered
received delivered duty watch hour signal service light beam flash range miles visible clear`)

// Tally is what the generator wrote: each term's uses and the words of
// each year, as sheaf count should find them.
type Tally struct {
	Counts map[string]map[int]int64 // term → year → uses
	Totals map[int]int64            // year → words
}

func shapeAt(t term, year float64) float64 {
	switch t.shape {
	case "rise":
		return 1 / (1 + math.Exp(-(year-t.center)/t.width))
	case "fall":
		return 1 / (1 + math.Exp((year-t.center)/t.width))
	case "bump":
		d := (year - t.center) / t.width
		return math.Exp(-d * d / 2)
	}
	return 0.7
}

// Write writes the archive into dir as YYYY/issue-N.txt and returns its
// tally. dir is made if missing; files in it are overwritten.
func Write(dir string, seed uint64) (*Tally, error) {
	rng := rand.New(rand.NewPCG(seed, 0x4c616e7465726e))
	tally := &Tally{Counts: map[string]map[int]int64{}, Totals: map[int]int64{}}
	for _, t := range terms {
		tally.Counts[t.name] = map[int]int64{}
	}
	for year := From; year <= To; year++ {
		for issue := 1; issue <= 4; issue++ {
			words := 1400 + rng.IntN(500) + (year-From)*4
			text, uses, n := issueText(rng, year, words)
			for name, k := range uses {
				tally.Counts[name][year] += k
			}
			tally.Totals[year] += n
			p := filepath.Join(dir, fmt.Sprint(year), fmt.Sprintf("issue-%d.txt", issue))
			if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
				return nil, err
			}
			if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
				return nil, err
			}
		}
	}
	return tally, nil
}

// issueText makes one issue of about words words. It returns the text,
// each term's uses and the number of words.
func issueText(rng *rand.Rand, year, words int) (string, map[string]int64, int64) {
	// Units: filler words and terms in a random order.
	var units []string
	uses := map[string]int64{}
	var n int64
	for _, t := range terms {
		mean := t.rate * shapeAt(t, float64(year)) * float64(words) / 10000
		k := poisson(rng, mean)
		for range k {
			units = append(units, t.name)
		}
		uses[t.name] += int64(k)
		n += int64(k * len(strings.Fields(t.name)))
	}
	for n < int64(words) {
		units = append(units, filler[rng.IntN(len(filler))])
		n++
	}
	rng.Shuffle(len(units), func(i, j int) { units[i], units[j] = units[j], units[i] })

	var b strings.Builder
	fmt.Fprintf(&b, "THE FENNOCK LANTERN\n\n")
	n++ // FENNOCK, THE and LANTERN are words too
	n += 2
	col, sentence := 0, 0
	put := func(w string) {
		w = setWord(rng, year, w)
		wn := utf8.RuneCountInString(w)
		switch {
		case col > 0 && col+1+wn > 64:
			if wn >= 7 && isLower(w) && col+5 < 64 {
				cut := 3 + rng.IntN(wn-5)
				r := []rune(w)
				b.WriteString(" " + string(r[:cut]) + "-\n" + string(r[cut:]))
				col = wn - cut
				return
			}
			b.WriteString("\n")
			col = 0
		case col > 0:
			b.WriteString(" ")
			col++
		}
		b.WriteString(w)
		col += wn
	}
	for _, u := range units {
		ws := strings.Fields(u)
		if sentence == 0 {
			ws[0] = strings.ToUpper(ws[0][:1]) + ws[0][1:]
		}
		for _, w := range ws {
			put(w)
		}
		sentence++
		switch {
		case sentence > 5 && rng.IntN(10) == 0:
			b.WriteString(".")
			col++
			sentence = 0
			if rng.IntN(8) == 0 {
				b.WriteString("\n\n")
				col = 0
			}
		case rng.IntN(14) == 0:
			b.WriteString(",")
			col++
		}
	}
	b.WriteString(".\n")
	return b.String(), uses, n
}

// setWord sets a word in the type of its year: a long s for an s inside
// a word before 1900, the fi and fl ligatures in the letterpress years
// 1900–1959.
func setWord(rng *rand.Rand, year int, w string) string {
	switch {
	case year < 1900 && rng.IntN(3) == 0:
		if i := strings.IndexByte(w[:max(len(w)-1, 0)], 's'); i >= 0 {
			w = w[:i] + "\u017f" + w[i+1:]
		}
	case year >= 1900 && year < 1960 && rng.IntN(2) == 0:
		w = strings.Replace(strings.Replace(w, "fi", "\ufb01", 1), "fl", "\ufb02", 1)
	}
	return w
}

func isLower(w string) bool {
	for _, r := range w {
		if r < 'a' || r > 'z' {
			return false
		}
	}
	return true
}

// poisson draws from a Poisson distribution (Knuth's method; means here
// are small).
func poisson(rng *rand.Rand, mean float64) int {
	if mean <= 0 {
		return 0
	}
	l, k, p := math.Exp(-mean), 0, 1.0
	for {
		p *= rng.Float64()
		if p <= l {
			return k
		}
		k++
	}
}

// Years returns the bulletin's years in order.
func Years() []int {
	var ys []int
	for y := From; y <= To; y++ {
		ys = append(ys, y)
	}
	return slices.Clip(ys)
}
