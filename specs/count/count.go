// Package count turns a dated text archive into the two tables a spec's
// data reads: how often each term was printed in each year (counts) and
// how many words were printed in each year (totals).
//
// Text is read as a stream, file by file, on as many goroutines as asked;
// memory grows with the number of distinct terms counted, not with the
// size of the text. Terms are either a given list, matched as sequences
// of tokens (see Tokenizer) by one Aho–Corasick automaton, or every word
// and phrase of up to N words that occurs at least a minimum number of
// times (n-gram mode), found level by level: a phrase of n words is
// counted only when both its (n−1)-word halves passed the minimum, and
// the number of distinct phrases held at once is capped.
package count

import (
	"bufio"
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"unicode"

	"sheaf/specs"
)

// DefaultMaxTerms is the default cap on distinct terms held in n-gram
// mode, per worker (see Options.MaxTerms).
const DefaultMaxTerms = 1_000_000

// Options says what to count and how.
type Options struct {
	// Fold case-folds words (Unicode full case folding); listed terms are
	// written as listed all the same.
	Fold bool
	// Terms lists the terms to count. When empty, every word and phrase of
	// up to NGrams words that occurs at least MinCount times over the
	// archive is counted.
	Terms    []string
	NGrams   int
	MinCount int64
	// MaxTerms caps the distinct terms n-gram mode holds at once, per
	// worker and over the archive, at one phrase length (0:
	// DefaultMaxTerms). Past it Count stops with a *LimitError: raise
	// MinCount or lower NGrams. Each held term takes about 120 bytes plus
	// its text plus 16 bytes for each year it occurs in, so memory stays
	// under about (Workers + 1) × MaxTerms × that.
	MaxTerms int
	// Workers is how many files are read at once (0: 1).
	Workers int
	// Progress, when set, is told the bytes read so far and the bytes to
	// read in all (every pass), now and then and at the end; calls do not
	// overlap.
	Progress func(done, total int64)
}

// Result is an archive's counts.
type Result struct {
	Years  []int   // ascending
	Totals []int64 // words in Years[i]
	Rows   []Row   // by term (byte order), then year; no zero counts
	// Missing lists listed terms found nowhere in the archive, in list
	// order: the counts table has no row for them.
	Missing []string
}

// Row is one line of the counts table.
type Row struct {
	Term  string
	Year  int
	Count int64
}

// LimitError says n-gram mode met its cap on distinct terms.
type LimitError struct {
	Words, Max int
	Path       string // the file being read, or "" when merging
}

func (e *LimitError) Error() string {
	where := "over the archive"
	if e.Path != "" {
		where = "in " + e.Path
	}
	return fmt.Sprintf("more than %d distinct %d-word terms %s, the memory cap: raise --min-count, lower --ngrams, or raise --max-terms", e.Max, e.Words, where)
}

// BadInput marks the error as the user's to fix (exit status 2).
func (e *LimitError) BadInput() bool { return true }

// TermError is a listed term that cannot be counted.
type TermError struct {
	Term, Msg string
}

func (e *TermError) Error() string        { return fmt.Sprintf("term %q: %s", e.Term, e.Msg) }
func (e *TermError) BadInput() bool       { return true }
func termErr(t, f string, a ...any) error { return &TermError{t, fmt.Sprintf(f, a...)} }

// Tokenize returns the tokens of a term as the archive's text would give
// them with tk's settings.
func Tokenize(tk *Tokenizer, term string) []string {
	var toks []string
	tk.Tokens(strings.NewReader(term), func(b []byte, _ bool) { toks = append(toks, string(b)) })
	return toks
}

// Count reads the files and counts what opt asks for. Errors that are the
// input's (a file that cannot be read or is not UTF-8 text, a bad term, the
// n-gram cap) are marked as *specs.InputError around a *BadInput,
// *TermError or *LimitError.
func Count(files []File, opt Options) (*Result, error) {
	res, err := count(files, opt)
	if err != nil && isBad(err) {
		err = specs.BadInput(err)
	}
	return res, err
}

func count(files []File, opt Options) (*Result, error) {
	if len(files) == 0 {
		return nil, errors.New("count: no files")
	}
	yearSet := map[int]bool{}
	for _, f := range files {
		yearSet[f.Year] = true
	}
	c := &counter{files: files, opt: opt, yearIdx: map[int]int{}}
	for y := range yearSet {
		c.years = append(c.years, y)
	}
	slices.Sort(c.years)
	for i, y := range c.years {
		c.yearIdx[y] = i
	}
	for _, f := range files {
		c.total += f.Size
	}
	if opt.Workers < 1 {
		c.opt.Workers = 1
	}
	if opt.MaxTerms <= 0 {
		c.opt.MaxTerms = DefaultMaxTerms
	}
	var res *Result
	var err error
	if len(opt.Terms) > 0 {
		c.passes = 1
		res, err = c.list()
	} else {
		if opt.NGrams < 1 {
			return nil, errors.New("count: no terms listed and NGrams < 1")
		}
		c.passes = opt.NGrams
		res, err = c.ngrams()
	}
	if err != nil {
		return nil, err
	}
	for i, t := range res.Totals {
		if t == 0 {
			for _, f := range files {
				if f.Year == res.Years[i] {
					return nil, bad(f.Path, "year %d has no words in its files (this is the first of them): an empty or blank text", f.Year)
				}
			}
		}
	}
	return res, nil
}

type counter struct {
	files   []File
	opt     Options
	years   []int
	yearIdx map[int]int
	total   int64 // bytes a pass
	passes  int

	mu   sync.Mutex
	done atomic.Int64
}

// each runs read on every file, opt.Workers at a time, each worker with
// its own state from newState. The first failing file in list order is
// the error.
func (c *counter) each(read func(w int, f File, r io.Reader) error) error {
	jobs := make(chan int)
	errs := make([]error, len(c.files))
	var failed atomic.Bool
	var wg sync.WaitGroup
	for w := range c.opt.Workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				if err := c.readFile(w, c.files[i], read); err != nil {
					errs[i] = err
					failed.Store(true)
				}
			}
		}()
	}
	for i := range c.files {
		if failed.Load() {
			break // every file before one that failed was handed out
		}
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

func (c *counter) readFile(w int, f File, read func(int, File, io.Reader) error) error {
	fh, err := os.Open(f.Path)
	if err != nil {
		return bad(f.Path, "cannot read: %v", unwrapPath(err))
	}
	defer fh.Close()
	pr := &progressReader{r: fh, c: c}
	err = read(w, f, pr)
	pr.flush()
	var se *SyntaxError
	switch {
	case errors.As(err, &se):
		return &BadInput{Path: f.Path, Line: se.Line, Off: se.Offset, Msg: se.Msg}
	case err != nil && !isBad(err):
		return bad(f.Path, "cannot read: %v", unwrapPath(err))
	}
	return err
}

func isBad(err error) bool {
	var b interface{ BadInput() bool }
	return errors.As(err, &b) && b.BadInput()
}

// progressReader tells opt.Progress of every 4 MiB read.
type progressReader struct {
	r       io.Reader
	c       *counter
	pending int64
}

func (p *progressReader) Read(b []byte) (int, error) {
	n, err := p.r.Read(b)
	p.pending += int64(n)
	if p.pending >= 4<<20 {
		p.flush()
	}
	return n, err
}

func (p *progressReader) flush() {
	done := p.c.done.Add(p.pending)
	p.pending = 0
	if p.c.opt.Progress != nil {
		p.c.mu.Lock()
		p.c.opt.Progress(min(done, p.c.total*int64(p.c.passes)), p.c.total*int64(p.c.passes))
		p.c.mu.Unlock()
	}
}

// list counts the listed terms.
func (c *counter) list() (*Result, error) {
	tk := &Tokenizer{Fold: c.opt.Fold}
	seqs := make([][]string, len(c.opt.Terms))
	seen := map[string]int{}
	keep := map[string]bool{}
	for i, term := range c.opt.Terms {
		toks := Tokenize(tk, term)
		words := 0
		for _, t := range toks {
			if classify([]byte(t)) == kindWord {
				words++
				if strings.ContainsAny(t, "-\u2010") {
					keep[t] = true
				}
			}
		}
		if words == 0 {
			return nil, termErr(term, "has no word in it (a letter or digit)")
		}
		key := strings.Join(toks, "\x00")
		if j, ok := seen[key]; ok {
			return nil, termErr(term, "reads as the same words as %q (case folded, NFKC): list it once", c.opt.Terms[j])
		}
		seen[key] = i
		seqs[i] = toks
	}
	m := newMatcher(seqs)
	nt, ny := len(seqs), len(c.years)
	type state struct {
		tk     *Tokenizer
		counts []int64 // [year*nt + term]
		totals []int64
	}
	states := make([]state, c.opt.Workers)
	for w := range states {
		states[w] = state{tk: &Tokenizer{Fold: c.opt.Fold, Keep: keep}, counts: make([]int64, nt*ny), totals: make([]int64, ny)}
	}
	err := c.each(func(w int, f File, r io.Reader) error {
		st := &states[w]
		yi := c.yearIdx[f.Year]
		row := st.counts[yi*nt : (yi+1)*nt]
		var words int64
		s := int32(0)
		err := st.tk.Tokens(r, func(b []byte, word bool) {
			if word {
				words++
			}
			s = m.step(s, b)
			for _, t := range m.out[s] {
				row[t]++
			}
		})
		if err == nil {
			st.totals[yi] += words
		}
		return err
	})
	if err != nil {
		return nil, err
	}
	res := &Result{Years: c.years, Totals: make([]int64, ny)}
	counts := make([]int64, nt*ny)
	for _, st := range states {
		for i, v := range st.counts {
			counts[i] += v
		}
		for i, v := range st.totals {
			res.Totals[i] += v
		}
	}
	order := make([]int, nt)
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(a, b int) int { return strings.Compare(c.opt.Terms[a], c.opt.Terms[b]) })
	found := make([]bool, nt)
	for _, ti := range order {
		for yi, y := range c.years {
			if n := counts[yi*nt+ti]; n > 0 {
				res.Rows = append(res.Rows, Row{c.opt.Terms[ti], y, n})
				found[ti] = true
			}
		}
	}
	for ti, ok := range found {
		if !ok {
			res.Missing = append(res.Missing, c.opt.Terms[ti])
		}
	}
	return res, nil
}

// entry is one term's counts in n-gram mode.
type entry struct {
	term  string
	total int64
	years []yearCount
}

type yearCount struct {
	year int32
	n    int64
}

// ngrams counts every word and phrase of up to opt.NGrams words seen at
// least opt.MinCount times, one phrase length a pass.
func (c *counter) ngrams() (*Result, error) {
	res := &Result{Years: c.years, Totals: make([]int64, len(c.years))}
	var kept []*entry
	var prev map[string]bool // terms of the previous length that passed
	for n := 1; n <= c.opt.NGrams; n++ {
		level, err := c.level(n, prev, res.Totals)
		if err != nil {
			return nil, err
		}
		prev = map[string]bool{}
		for _, e := range level {
			if e.total >= c.opt.MinCount {
				kept = append(kept, e)
				prev[e.term] = true
			}
		}
		if len(prev) == 0 {
			c.done.Add(c.total * int64(c.opt.NGrams-n)) // no longer phrase can pass
			break
		}
	}
	slices.SortFunc(kept, func(a, b *entry) int { return strings.Compare(a.term, b.term) })
	for _, e := range kept {
		slices.SortFunc(e.years, func(a, b yearCount) int { return cmp.Compare(a.year, b.year) })
		for _, yc := range e.years {
			res.Rows = append(res.Rows, Row{e.term, int(yc.year), yc.n})
		}
	}
	return res, nil
}

// level counts the n-word terms whose two (n−1)-word halves are in prev
// (every word when n is 1, adding the words to totals).
func (c *counter) level(n int, prev map[string]bool, totals []int64) (map[string]*entry, error) {
	// Each worker counts into its own table, with no lock; the tables are
	// added up at the end. A table holds at most MaxTerms terms.
	type state struct {
		tk     *Tokenizer
		terms  map[string]*entry
		totals []int64
		win    [][]byte // the last words, none across a mark
		bufs   [][]byte // their storage, reused
		key    []byte
	}
	states := make([]*state, c.opt.Workers)
	for w := range states {
		states[w] = &state{tk: &Tokenizer{Fold: c.opt.Fold}, terms: map[string]*entry{}, totals: make([]int64, len(c.years)), bufs: make([][]byte, n)}
	}
	err := c.each(func(w int, f File, r io.Reader) error {
		st := states[w]
		var words int64
		st.win = st.win[:0]
		y := int32(f.Year)
		tooMany := false
		err := st.tk.Tokens(r, func(b []byte, word bool) {
			if word {
				words++
			}
			if !word || !hasLetter(b) {
				st.win = st.win[:0]
				return
			}
			if len(st.win) == n {
				first := st.win[0]
				copy(st.win, st.win[1:])
				st.win[n-1] = append(first[:0], b...)
			} else {
				i := len(st.win)
				st.bufs[i] = append(st.bufs[i][:0], b...)
				st.win = append(st.win, st.bufs[i])
			}
			if len(st.win) < n || tooMany {
				return
			}
			if n > 1 {
				st.key = join(st.key[:0], st.win[:n-1])
				if !prev[string(st.key)] {
					return
				}
				st.key = join(st.key[:0], st.win[1:])
				if !prev[string(st.key)] {
					return
				}
			}
			st.key = join(st.key[:0], st.win)
			e := st.terms[string(st.key)]
			if e == nil {
				if len(st.terms) >= c.opt.MaxTerms {
					tooMany = true
					return
				}
				e = &entry{term: string(st.key)}
				st.terms[e.term] = e
			}
			e.total++
			if k := len(e.years) - 1; k >= 0 && e.years[k].year == y {
				e.years[k].n++
			} else {
				e.years = append(e.years, yearCount{y, 1})
			}
		})
		if err != nil {
			return err
		}
		if tooMany {
			return &LimitError{Words: n, Max: c.opt.MaxTerms, Path: f.Path}
		}
		st.totals[c.yearIdx[f.Year]] += words
		return nil
	})
	if err != nil {
		return nil, err
	}
	global := states[0].terms
	for _, st := range states[1:] {
		for k, e := range st.terms {
			g := global[k]
			if g == nil {
				if len(global) >= c.opt.MaxTerms {
					return nil, &LimitError{Words: n, Max: c.opt.MaxTerms}
				}
				global[k] = e
				continue
			}
			g.total += e.total
			g.years = append(g.years, e.years...)
		}
		st.terms = nil
	}
	for _, e := range global {
		// A worker may have read a year's files apart: one entry a year.
		slices.SortFunc(e.years, func(a, b yearCount) int { return cmp.Compare(a.year, b.year) })
		out := e.years[:0]
		for _, yc := range e.years {
			if k := len(out) - 1; k >= 0 && out[k].year == yc.year {
				out[k].n += yc.n
			} else {
				out = append(out, yc)
			}
		}
		e.years = out
	}
	if n == 1 {
		for _, st := range states {
			for i, v := range st.totals {
				totals[i] += v
			}
		}
	}
	return global, nil
}

func join(dst []byte, ws [][]byte) []byte {
	for i, w := range ws {
		if i > 0 {
			dst = append(dst, ' ')
		}
		dst = append(dst, w...)
	}
	return dst
}

// hasLetter reports whether a word has a letter: numbers alone are words
// for the totals but no terms in n-gram mode.
func hasLetter(b []byte) bool {
	for _, r := range string(b) {
		if r < 0x80 {
			if r|0x20 >= 'a' && r|0x20 <= 'z' {
				return true
			}
			continue
		}
		if unicode.IsLetter(r) {
			return true
		}
	}
	return false
}

// WriteCounts writes the counts table: a header term,year,count and a row
// for each nonzero count, as Rows orders them (RFC 4180 quoting).
func (r *Result) WriteCounts(w io.Writer) error {
	bw := bufio.NewWriterSize(w, 64<<10)
	cw := csv.NewWriter(bw)
	if err := cw.Write([]string{"term", "year", "count"}); err != nil {
		return err
	}
	rec := make([]string, 3)
	for _, row := range r.Rows {
		rec[0], rec[1], rec[2] = row.Term, strconv.Itoa(row.Year), strconv.FormatInt(row.Count, 10)
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}

// WriteTotals writes the totals table: a header year,total and a row for
// each year of the archive.
func (r *Result) WriteTotals(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "year,total")
	for i, y := range r.Years {
		fmt.Fprintf(bw, "%d,%d\n", y, r.Totals[i])
	}
	return bw.Flush()
}
