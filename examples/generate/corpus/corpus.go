// Package corpus invents the demo data for sheaf: yearly word counts of the
// vocabulary of Plumb & Pinion, a fictional engineering weekly of the
// invented town of Quillmere, published 1868–2025.
//
// Every name, count and event here is made up. The headline words each live
// a life that fits their meaning (old trades fade, the steam age peaks early,
// computing arrives after the war, some words are steady, some come in two
// waves, some hand over to others); the long tail takes a generic life of its
// era. Editorial noise and Poisson sampling make the counts look like real
// archive data to a chart, war years are missing, and a few one-year spikes
// from a single long article are planted. The data is fully determined by
// Config: the same Config always yields the same bytes.
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
	// Spikes is how many of the most common terms get a one-year spike
	// (see Term.SpikeYear).
	Spikes int
}

// DefaultConfig is the committed demo: 1,200 terms over 1868–2025, with
// 1917, 1918, 1943 and 1944 missing and six planted spikes.
func DefaultConfig() Config {
	return Config{Terms: 1200, Seed: 1868, From: 1868, To: 2025, Missing: WarYears(), Spikes: 6}
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
	Name   string
	Shape  Shape // the family of its underlying curve
	Counts []int // Counts[i] is the count in Corpus.Years[i]
	// Expected is each year's mean count before editorial noise and
	// Poisson sampling; only Sample sets it.
	Expected []float64
	// SpikeYear is the year of a one-off spike planted by the generator (a
	// single long article: 5–9 times the term's busiest other year), or 0.
	SpikeYear int
}

// Share tuning. A term of share rank r (0 the most common) has an overall
// share (words used ÷ words printed over the span) near
// topShare·(r+1)^-zipf words per million. The headline words hold the top
// ranks; the long tail is set a further tailDrop lower, so a feature of the
// top few hundred terms shows the headline words only. With these numbers
// the 384th term is near 20 per million, about 30 a year even in the thin
// 1870s, and a word's busiest years have far more.
const (
	topShare = 500.0  // per million words, rank 1
	zipf     = 0.5    // fall-off of share with rank
	tailDrop = 0.4    // the long tail's share, relative to the rank law
	maxPeak  = 1500.0 // per million: no year may exceed this before noise
)

// Random streams are split by purpose so that, for example, adding a shape
// family does not reshuffle the names.
const (
	streamNames = iota + 1
	streamTotals
	streamRanks
	streamSpikes
	streamSample
	streamTerm = 1 << 32 // + term index
)

// Generate builds the corpus described by cfg.
func Generate(cfg Config) (Corpus, error) {
	if err := cfg.check(); err != nil {
		return Corpus{}, err
	}
	stream := func(s uint64) *rand.Rand { return rand.New(rand.NewPCG(cfg.Seed, s)) }
	c := frame(cfg, stream(streamTotals))

	picked, err := pickTerms(cfg.Terms, stream(streamNames))
	if err != nil {
		return Corpus{}, err
	}
	ranks := shareRanks(picked, stream(streamRanks))
	c.Terms = make([]Term, len(picked))
	rank := make([]int, len(picked))
	for i, w := range picked {
		rng := stream(streamTerm + uint64(i))
		var l life
		if w.life != nil {
			l = *w.life
		} else {
			l = pick(generic[w.era], rng)
		}
		k := l.draw(w.pin, w.pin2, cfg.From, cfg.To, rng)
		if w.coined > 0 {
			// Rise from nothing at the coinage, not from a cliff.
			k.start = math.Max(k.start, w.coined)
			k.rise = math.Max(1, math.Min(k.rise, (k.c-w.coined)/2.5))
		}
		share := topShare * math.Pow(float64(ranks[i]+1), -zipf) * math.Exp(0.15*rng.NormFloat64())
		if w.kind != headline {
			share *= tailDrop
		}
		if l.weight > 0 {
			share *= l.weight
		}
		c.Terms[i] = Term{Name: w.text, Shape: k.shape, Counts: c.sample(k, share, rng)}
		rank[i] = ranks[i]
	}
	plantSpikes(&c, rank, cfg.Spikes, stream(streamSpikes))
	slices.SortFunc(c.Terms, func(a, b Term) int { return cmp.Compare(a.Name, b.Name) })
	return c, nil
}

// frame returns the corpus's years and totals, with no terms.
func frame(cfg Config, rng *rand.Rand) Corpus {
	var c Corpus
	for y := cfg.From; y <= cfg.To; y++ {
		if !slices.Contains(cfg.Missing, y) {
			c.Years = append(c.Years, y)
		}
	}
	c.Totals = makeTotals(c.Years, rng)
	return c
}

// sample turns a curve into yearly counts: scaled so the term's overall
// share is share per million (but no year above maxPeak), with
// year-to-year editorial noise (AR(1) on the log scale) and Poisson
// sampling of the words actually printed.
func (c Corpus) sample(k curve, share float64, rng *rand.Rand) []int {
	level := make([]float64, len(c.Years))
	var used, printed, peak float64
	for j, y := range c.Years {
		level[j] = k.at(float64(y))
		used += level[j] * float64(c.Totals[j])
		printed += float64(c.Totals[j])
		peak = math.Max(peak, level[j])
	}
	counts := make([]int, len(c.Years))
	if used == 0 {
		return counts
	}
	scale := share * printed / used
	if peak*scale > maxPeak {
		scale = maxPeak / peak
	}
	c.noise(level, scale, counts, rng)
	return counts
}

// noise fills counts with Poisson draws around level·scale per million
// words, under a slow editorial wander.
func (c Corpus) noise(level []float64, scale float64, counts []int, rng *rand.Rand) {
	rho, sigma := 0.3+0.5*rng.Float64(), 0.015+0.025*rng.Float64()
	e := sigma * rng.NormFloat64()
	for j := range c.Years {
		e = rho*e + sigma*math.Sqrt(1-rho*rho)*rng.NormFloat64()
		lambda := level[j] * scale * math.Exp(e) * float64(c.Totals[j]) / 1e6
		counts[j] = min(poisson(rng, lambda), c.Totals[j])
	}
}

// Sample returns n series of the given shape, as Generate would make them
// (a life of that shape drawn from those of the headline words and the long
// tail, editorial noise, Poisson sampling) but with no spike, each scaled
// so that the expected count is at least peak in every year of its active
// life (expected share at least a third of its highest) and exactly peak
// in the leanest of them. It is for measuring a spike detector's false
// alarms on clean series. Terms are named s0001, s0002, …; each has
// Expected set.
func Sample(cfg Config, shape Shape, n int, peak float64) (Corpus, error) {
	if err := cfg.check(); err != nil {
		return Corpus{}, err
	}
	var lives []life
	for _, w := range headlines {
		if w.life.shape == shape {
			lives = append(lives, *w.life)
		}
	}
	for _, e := range []era{eraAny, eraSteam, eraElectric, eraMachine, eraComputing, eraModern} {
		for _, o := range generic[e] {
			if o.life.shape == shape {
				lives = append(lives, o.life)
			}
		}
	}
	if len(lives) == 0 {
		return Corpus{}, fmt.Errorf("corpus: no life has shape %v", shape)
	}
	rng := rand.New(rand.NewPCG(cfg.Seed, streamSample+uint64(shape)<<8))
	c := frame(cfg, rand.New(rand.NewPCG(cfg.Seed, streamTotals)))
	for i := range n {
		k := lives[rng.IntN(len(lives))].draw(math.NaN(), math.NaN(), cfg.From, cfg.To, rng)
		level := make([]float64, len(c.Years))
		top := 0
		for j, y := range c.Years {
			level[j] = k.at(float64(y))
			if level[j] > level[top] {
				top = j
			}
		}
		counts := make([]int, len(c.Years))
		expected := make([]float64, len(c.Years))
		if level[top] > 0 {
			// level·scale is per million words: put peak words in the
			// leanest active year.
			lean := math.Inf(1)
			for j, v := range level {
				if 3*v >= level[top] {
					lean = math.Min(lean, v*float64(c.Totals[j])/1e6)
				}
			}
			scale := peak / lean
			for j := range level {
				expected[j] = level[j] * scale * float64(c.Totals[j]) / 1e6
			}
			c.noise(level, scale, counts, rng)
		}
		c.Terms = append(c.Terms, Term{Name: fmt.Sprintf("s%04d", i+1), Shape: k.shape, Counts: counts, Expected: expected})
	}
	return c, nil
}

// shareRanks orders the terms by intended share, 0 being the most common:
// the headline words in a random order (those that tell a hand-over or two
// waves in the upper half, so a feature of the top few hundred keeps
// them), then the rest, hand-written words a little ahead of jargon and
// compounds.
func shareRanks(terms []word, rng *rand.Rand) []int {
	offset := [...]float64{headline: 0, handWritten: 1, jargon: 1.3, compound: 1.5}
	key := make([]float64, len(terms))
	order := make([]int, len(terms))
	for i, w := range terms {
		key[i] = offset[w.kind] + rng.Float64()
		if w.kind == headline && (story[w.text] || w.life.shape == TwinPeak) {
			key[i] /= 2
		}
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

// story holds the words the demo's inserts and README tell a hand-over
// with; they get no planted spike.
var story = map[string]bool{
	"telegraph": true, "telephone": true, "wireless": true, "email": true,
	"rivetting": true, "rivet": true, "welding": true, "slide rule": true, "pocket calculator": true,
	"aeroplane": true, "aircraft": true, "vacuum tube": true, "transistor": true, "microchip": true,
	"draughtsman": true, "computer-aided design": true,
}

// plantSpikes gives want of the most common terms (share rank below
// spikeRanks, so a feature of the top few hundred shows them) one year in
// which a single long article used the word 5–9 times as often as in the
// term's busiest other year: a spike a preflight check should list.
func plantSpikes(c *Corpus, rank []int, want int, rng *rand.Rand) {
	const spikeRanks = 300
	var planted []int
	for _, i := range rng.Perm(len(c.Terms)) {
		if want == 0 {
			return
		}
		t := &c.Terms[i]
		if rank[i] >= spikeRanks || t.Shape == TwinPeak || story[t.Name] {
			continue // keep two waves and hand-overs clean
		}
		// A year in the word's active life (at least a third of its
		// busiest year), not at either end of the span.
		var top float64
		for j, n := range t.Counts {
			top = math.Max(top, float64(n)/float64(c.Totals[j]))
		}
		var years []int
		for j := 1; j+1 < len(t.Counts); j++ {
			if 3*float64(t.Counts[j])/float64(c.Totals[j]) >= top && t.Counts[j] >= 20 {
				years = append(years, j)
			}
		}
		if len(years) == 0 {
			continue
		}
		j := years[rng.IntN(len(years))]
		if slices.ContainsFunc(planted, func(y int) bool { return y-c.Years[j] < 15 && c.Years[j]-y < 15 }) {
			continue // spread them over the span, one era each
		}
		next := 0
		for k, n := range t.Counts {
			if k != j {
				next = max(next, n)
			}
		}
		v := int(math.Ceil((5 + 4*rng.Float64()) * float64(next)))
		if v > c.Totals[j]/100 { // one article cannot fill the year's journal
			continue
		}
		t.Counts[j], t.SpikeYear = v, c.Years[j]
		planted = append(planted, c.Years[j])
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
