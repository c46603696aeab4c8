// Package corpus invents the demo data for sheaf: yearly word counts of the
// vocabulary of The Quillmere Engineer, a fictional engineering journal
// published 1868–2025.
//
// Every name, count and event here is made up. The counts are meant to look
// like real archive data to a chart (slow rises, falls, bursts, late
// arrivals, dying words, Poisson noise, one-year spikes from a single long
// article, war years in which the journal did not appear) and are fully
// determined by Config: the same Config always yields the same bytes.
package corpus

import (
	"bufio"
	"cmp"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
)

// Config says what to generate.
type Config struct {
	Terms int    // number of distinct terms
	Seed  uint64 // seed of every random choice
	From  int    // first year of the span, inclusive
	To    int    // last year of the span, inclusive
	// Missing lists years in which the journal did not appear; they are
	// absent from the output. Years outside [From, To] are ignored.
	Missing []int
}

// DefaultConfig is the committed demo: 1,500 terms over 1868–2025, with
// 1917, 1918, 1943 and 1944 missing.
func DefaultConfig() Config {
	return Config{Terms: 1500, Seed: 1868, From: 1868, To: 2025, Missing: WarYears()}
}

// WarYears returns the years in which the fictional journal did not appear.
func WarYears() []int { return []int{1917, 1918, 1943, 1944} }

// Corpus is the generated archive.
type Corpus struct {
	Years  []int  // published years, ascending; missing years are absent
	Totals []int  // Totals[i] is the number of words printed in Years[i]
	Terms  []Term // sorted by Name in byte order
}

// Term is one term's yearly counts.
type Term struct {
	Name      string
	Shape     Shape // the family of its underlying curve
	Counts    []int // Counts[i] is the count in Corpus.Years[i]
	SpikeYear int   // year of a one-off spike from a single long article, or 0
}

// Share tuning. A term of share rank r has an overall share near
// topShare·r^-zipf words per million, so the top terms are common enough to
// chart well even in the thin early years.
const (
	topShare = 600.0  // per million words, rank 1
	zipf     = 0.75   // fall-off of share with rank
	maxPeak  = 3000.0 // per million: no year may exceed this before noise
	// spikeRate is the fraction of terms given a one-year spike.
	spikeRate = 0.02
)

// Random streams are split by purpose so that, for example, adding a shape
// family does not reshuffle the names.
const (
	streamNames = iota + 1
	streamTotals
	streamRanks
	streamSpikes
	streamTerm = 1 << 32 // + term index
)

// Generate builds the corpus described by cfg.
func Generate(cfg Config) (Corpus, error) {
	if err := cfg.check(); err != nil {
		return Corpus{}, err
	}
	stream := func(s uint64) *rand.Rand { return rand.New(rand.NewPCG(cfg.Seed, s)) }

	var c Corpus
	for y := cfg.From; y <= cfg.To; y++ {
		if !slices.Contains(cfg.Missing, y) {
			c.Years = append(c.Years, y)
		}
	}
	c.Totals = makeTotals(c.Years, stream(streamTotals))
	// Each term's share is set as a mean over years weighted by the square
	// root of the volume: halfway between the plain mean of yearly shares
	// (which favours the thin early years) and words-used over
	// words-printed (which favours the thick late ones). Either way a
	// reader ranks the terms, the top spans the whole period.
	weight := make([]float64, len(c.Years))
	var sumWeight float64
	for j, t := range c.Totals {
		weight[j] = float64(t)
		sumWeight += weight[j]
	}

	picked, err := pickTerms(cfg.Terms, stream(streamNames))
	if err != nil {
		return Corpus{}, err
	}
	ranks := shareRanks(picked, stream(streamRanks))
	c.Terms = make([]Term, len(picked))
	level := make([]float64, len(c.Years))
	for i, w := range picked {
		rng := stream(streamTerm + uint64(i))
		k := drawCurve(w.era, cfg.From, cfg.To, rng)
		// Scale the curve so its share matches the term's rank, then cap
		// implausible peaks.
		var weighted, peak float64
		for j, y := range c.Years {
			level[j] = k.at(float64(y))
			weighted += level[j] * weight[j]
			peak = math.Max(peak, level[j])
		}
		share := topShare * math.Pow(float64(ranks[i]+1), -zipf) * math.Exp(0.25*rng.NormFloat64())
		scale := share * sumWeight / weighted
		if peak*scale > maxPeak {
			scale = maxPeak / peak
		}
		// Year-to-year editorial noise (AR(1) on the log scale) and then
		// Poisson sampling of the words actually printed.
		rho, sigma := 0.3+0.5*rng.Float64(), 0.04+0.10*rng.Float64()
		e := sigma * rng.NormFloat64()
		counts := make([]int, len(c.Years))
		for j := range c.Years {
			e = rho*e + sigma*math.Sqrt(1-rho*rho)*rng.NormFloat64()
			lambda := level[j] * scale * math.Exp(e) * float64(c.Totals[j]) / 1e6
			counts[j] = min(poisson(rng, lambda), c.Totals[j])
		}
		c.Terms[i] = Term{Name: w.text, Shape: k.shape, Counts: counts}
	}
	addSpikes(&c, stream(streamSpikes))
	slices.SortFunc(c.Terms, func(a, b Term) int { return cmp.Compare(a.Name, b.Name) })
	return c, nil
}

// shareRanks orders the terms by intended share, 0 being the most common.
// Hand-written words are favoured for the top, where a demo's headline terms
// should read naturally; random compounds mostly fill the long tail.
func shareRanks(terms []word, rng *rand.Rand) []int {
	offset := [...]float64{handWritten: 0, jargon: 0.3, compound: 0.5}
	key := make([]float64, len(terms))
	order := make([]int, len(terms))
	for i, w := range terms {
		key[i] = offset[w.kind] + rng.Float64()
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(key[a], key[b]) })
	ranks := make([]int, len(terms))
	for r, i := range order {
		ranks[i] = r
	}
	return ranks
}

func (cfg Config) check() error {
	switch {
	case cfg.Terms < 1:
		return fmt.Errorf("corpus: Terms is %d; need at least 1", cfg.Terms)
	case cfg.From < 1 || cfg.To > 9999:
		return fmt.Errorf("corpus: span %d–%d is outside years 1–9999", cfg.From, cfg.To)
	}
	published := cfg.To - cfg.From + 1
	for _, y := range cfg.Missing {
		if y >= cfg.From && y <= cfg.To {
			published--
		}
	}
	if published < 10 {
		return fmt.Errorf("corpus: span %d–%d has %d published years; need at least 10", cfg.From, cfg.To, published)
	}
	return nil
}

// addSpikes gives about spikeRate of the terms a year in which one long
// article used the word 5–20 times as often as in either neighbouring year.
func addSpikes(c *Corpus, rng *rand.Rand) {
	want := max(1, int(math.Round(spikeRate*float64(len(c.Terms)))))
	var years []int
	for _, i := range rng.Perm(len(c.Terms)) {
		if want == 0 {
			return
		}
		t := &c.Terms[i]
		// Only where the neighbours are common enough for 5× to stand out
		// from Poisson noise.
		years = years[:0]
		for j := 1; j+1 < len(t.Counts); j++ {
			if t.Counts[j-1] >= 5 && t.Counts[j+1] >= 5 {
				years = append(years, j)
			}
		}
		if len(years) == 0 {
			continue
		}
		j := years[rng.IntN(len(years))]
		factor := 5 + 15*rng.Float64()
		v := int(math.Ceil(factor * float64(max(t.Counts[j-1], t.Counts[j+1]))))
		if v > c.Totals[j]/20 { // one article cannot fill the year's journal
			continue
		}
		t.Counts[j], t.SpikeYear = v, c.Years[j]
		want--
	}
}

// poisson draws from a Poisson distribution with mean lambda: by inversion
// for small means and by the normal approximation for large ones, where the
// two are indistinguishable in a chart.
func poisson(rng *rand.Rand, lambda float64) int {
	switch {
	case lambda <= 0:
		return 0
	case lambda >= 30:
		return max(0, int(math.Round(lambda+math.Sqrt(lambda)*rng.NormFloat64())))
	}
	u := rng.Float64()
	p := math.Exp(-lambda)
	cdf, k := p, 0
	for u > cdf && k < 200 {
		k++
		p *= lambda / float64(k)
		cdf += p
	}
	return k
}

// WriteCounts writes "term,year,count" rows for every nonzero count, sorted
// by term then year, as UTF-8 CSV with LF line ends. A year present in the
// totals but absent here for a term means a count of 0.
func (c Corpus) WriteCounts(w io.Writer) error {
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"term", "year", "count"}); err != nil {
		return fmt.Errorf("corpus: writing counts: %w", err)
	}
	row := make([]string, 3)
	for _, t := range c.Terms {
		for j, n := range t.Counts {
			if n == 0 {
				continue
			}
			row[0], row[1], row[2] = t.Name, strconv.Itoa(c.Years[j]), strconv.Itoa(n)
			if err := cw.Write(row); err != nil {
				return fmt.Errorf("corpus: writing counts for %q: %w", t.Name, err)
			}
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("corpus: writing counts: %w", err)
	}
	return nil
}

// WriteTotals writes "year,total" rows, one per published year.
func (c Corpus) WriteTotals(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"year", "total"})
	for j, y := range c.Years {
		cw.Write([]string{strconv.Itoa(y), strconv.Itoa(c.Totals[j])})
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("corpus: writing totals: %w", err)
	}
	return nil
}

// Names of the files WriteDir writes.
const (
	CountsFile = "counts.csv"
	TotalsFile = "totals.csv"
)

// WriteDir generates the corpus for cfg and writes CountsFile and
// TotalsFile into dir, creating dir if needed.
func WriteDir(dir string, cfg Config) error {
	c, err := Generate(cfg)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("corpus: %w", err)
	}
	if err := writeFile(filepath.Join(dir, CountsFile), c.WriteCounts); err != nil {
		return err
	}
	return writeFile(filepath.Join(dir, TotalsFile), c.WriteTotals)
}

func writeFile(path string, write func(io.Writer) error) error {
	f, err := os.Create(path)
	if err != nil {
		return fmt.Errorf("corpus: %w", err)
	}
	bw := bufio.NewWriter(f)
	if err := write(bw); err != nil {
		f.Close()
		return fmt.Errorf("%w (file %s)", err, path)
	}
	if err := bw.Flush(); err != nil {
		f.Close()
		return fmt.Errorf("corpus: writing %s: %w", path, err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("corpus: closing %s: %w", path, err)
	}
	return nil
}
