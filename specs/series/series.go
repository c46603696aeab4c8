// Package series reads a feature's two tables (yearly counts per term and
// yearly total words), picks the terms the spec asks for, and turns their
// counts into the values a panel plots: per-million shares, shares scaled
// to each term's own peak, or raw counts.
//
// The counts table is read as a stream: once to total every term (memory
// grows with the number of distinct terms, not with the file), and again
// to collect the yearly values of the selected terms only. The first
// read keeps every term's yearly counts as long as they take at most
// twice what the selected terms' will; when the spec can select all or
// most of the terms, that is all of them, and the second read is skipped.
package series

import (
	"bufio"
	"bytes"
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"golang.org/x/text/cases"
	"golang.org/x/text/unicode/norm"

	"sheaf/specs"
)

// Series is one term's line.
type Series struct {
	Term     string    // as first written in the data, NFC
	Values   []float64 // one per year of the span; NaN where the year is a gap
	Counts   []float64 // raw counts; NaN where the year is a gap
	Total    float64   // occurrences over the span
	Share    float64   // Total / all words over the span
	Peak     float64   // highest value
	PeakYear int       // first year reaching Peak
	YMax     float64   // top of this panel's y-range (shared or own)
	// Factor turns a pooled rate (pooled count ÷ exposure, see
	// Set.Pooled) into a plotted value: 10⁶ for per-million shares, 10⁶
	// ÷ the share at the peak for own-peak, 1 for raw counts.
	Factor float64
}

// Group is a run of consecutive series under one heading.
type Group struct {
	Heading      string
	Start, Count int
}

// Set is the data of a feature, ready to plot.
type Set struct {
	Span   specs.Span
	Years  []float64 // x values, one per year of the span
	Gaps   []int     // years of the span the totals table lacks
	Series []Series  // selected terms, in panel order
	Groups []Group   // one group with an empty heading when not grouping
	Unit   string    // what a value means, for the key
	YMax   float64   // the shared y-range top (largest YMax)
	Terms  int       // distinct terms in the counts table
	Rows   int       // data rows read from the counts table
	// Rolling is the centred window, in years, the counts are pooled
	// over before scaling (see Pool); 0: every year alone.
	Rolling int
	counts  [][]float64 // raw counts of the selected terms, selection order
	// totals are the words of each year of the span (NaN in a gap), or
	// nil with raw counts; unitFactor is 10⁶ for shares, 1 for raw.
	totals     []float64
	unitFactor float64
}

// Load reads and scales the data a spec names. Problems come back as
// specs.Errors with file and line.
func Load(s *specs.Spec) (*Set, error) {
	t, err := ReadTable(s)
	if err != nil {
		return nil, err
	}
	return t.Select(s)
}

// Table is a spec's counts table read and checked once, so that the spec
// and the specs made from it for its inserts (specs.Spec.ForInsert: the
// same data, span and scaling, other terms) select from one reading of
// what may be millions of rows. Its methods are safe for concurrent use.
type Table struct {
	mu     sync.Mutex // Select marks the selection in aggs
	spec   *specs.Spec
	totals map[int]float64
	aggs   map[string]*agg
	order  []string // keys in the table's order
	rows   int
	keep   bool // every term's counts are in aggs: Select reads no more
	// noBlocks: Select reads the counts again as readTable read them.
	noBlocks bool
}

// ReadTable reads and checks the totals and counts tables a spec names.
// It keeps every term's yearly counts when the table has at most twice as
// many terms as the spec can select (else Select reads the counts of its
// terms again).
func ReadTable(s *specs.Spec) (*Table, error) {
	return readTable(s, false)
}

// readTable is ReadTable, reading every row as a record with noBlocks.
func readTable(s *specs.Spec, noBlocks bool) (*Table, error) {
	var errs specs.Errors
	totals, ok := readTotals(s, &errs)
	if !ok {
		return nil, errs
	}
	r := &reader{spec: s, totals: totals, errs: &errs, fold: s.Data.FoldCase, noBlocks: noBlocks}
	if s.Data.FoldCase {
		r.folder = cases.Fold()
	}
	aggs, order := r.pass1()
	if len(errs) > 0 {
		return nil, errs
	}
	return &Table{spec: s, totals: totals, aggs: aggs, order: order, rows: r.rows, keep: r.keep, noBlocks: noBlocks}, nil
}

// Select picks, scales and arranges the terms s asks for from the table.
// s is the spec the table was read for or one made from it with
// specs.Spec.ForInsert.
func (t *Table) Select(s *specs.Spec) (*Set, error) {
	t.mu.Lock()
	defer t.mu.Unlock()
	var errs specs.Errors
	r := &reader{spec: s, totals: t.totals, errs: &errs, fold: s.Data.FoldCase, rows: t.rows, keep: t.keep, noBlocks: t.noBlocks}
	if s.Data.FoldCase {
		r.folder = cases.Fold()
	}
	aggs, order := t.aggs, t.order
	for _, a := range aggs {
		a.idx = -1 // a selection before this one's
	}
	selected := r.selectTerms(aggs, order)
	if len(errs) > 0 {
		return nil, errs
	}
	set := &Set{Span: s.Years, Terms: len(order), Rows: r.rows, Rolling: s.Scale.Rolling}
	for y := s.Years.From; y <= s.Years.To; y++ {
		set.Years = append(set.Years, float64(y))
		if _, ok := t.totals[y]; !ok {
			set.Gaps = append(set.Gaps, y)
		}
	}
	if len(selected) == 0 {
		errs.Add(whereSelection(s), "no terms are selected: the data has %d terms and none pass the spec's selection", len(order))
		return nil, errs
	}
	if n := len(selected); n > MaxSimilar && (s.Order == specs.OrderSimilarity || s.Group == specs.GroupSimilarity) {
		key := "order"
		if s.Order != specs.OrderSimilarity {
			key = "group"
		}
		errs.Add(s.Where(key), "%s: similarity compares every two panels and takes at most %d; the spec selects %d terms: select fewer (terms.top) or choose another %s", key, MaxSimilar, n, key)
		return nil, errs
	}
	if r.keep {
		// Copies: a Set's counts are its own, whoever else selects.
		span := s.Years.Len()
		all := make([]float64, len(selected)*span)
		for i, k := range selected {
			c := all[i*span : (i+1)*span : (i+1)*span]
			copy(c, aggs[k].counts)
			r.counts = append(r.counts, c)
		}
	} else {
		r.pass2(aggs, selected)
	}
	if len(errs) > 0 {
		return nil, errs
	}
	set.counts = r.counts
	set.Series = scale(s, r.spanTotals(), aggs, selected, set)
	set.counts = nil
	arrange(s, set)
	return set, nil
}

type agg struct {
	term  string // first spelling seen
	total float64
	share float64
	years []uint64 // bitset over the span: duplicate rows
	line  int
	idx   int // position in the selection, or -1
	// counts are the yearly counts as the first read adds them up (NaN in
	// gap years without a row), while reader.keep.
	counts []float64
}

type reader struct {
	spec    *specs.Spec
	totals  map[int]float64
	errs    *specs.Errors
	fold    bool
	folder  cases.Caser
	rows    int
	counts  [][]float64 // of the selected terms, by pass2 or from pass1
	keep    bool        // pass1 keeps every term's counts (see keepLimit)
	keepAll bool        // keep every term's counts, however many (Catalog)
	// noBlocks reads every row as a record, as tally.row does: the
	// reference tally.read and tally.add are tested against.
	noBlocks bool

	lastRaw, lastKey string // key's one-entry cache
}

func (r *reader) key(term string) string {
	// Tables are usually sorted by term, so a row's term is most often the
	// row before's: reuse its key rather than normalise again.
	if term == r.lastRaw && r.lastKey != "" {
		return r.lastKey
	}
	r.lastRaw, r.lastKey = strings.Clone(term), r.normKey(term)
	return r.lastKey
}

// keyOf is key for a field as read; it copies the field only when the
// term differs from the row before's.
func (r *reader) keyOf(term []byte) string {
	if string(term) == r.lastRaw && r.lastKey != "" {
		return r.lastKey
	}
	return r.key(string(term))
}

func (r *reader) normKey(term string) string {
	t := norm.NFC.String(term)
	if r.fold {
		return r.folder.String(t)
	}
	return t
}

// table opens a CSV or TSV file (by extension) and maps its header.
type table struct {
	name   string // resolved path, for positions in messages
	f      *os.File
	csv    *records
	cols   map[string]int
	width  int
	fields int // in the header: a row may have no more
}

func openTable(s *specs.Spec, key, name string, want []string, errs *specs.Errors) *table {
	path := s.Resolve(name)
	if st, err := os.Stat(path); err == nil && st.IsDir() {
		errs.Add(s.Where("data."+key), "data.%s: %q (resolved to %s) is a directory, not a table", key, name, path)
		return nil
	}
	// Only a regular file: a FIFO or a device would block or never end.
	f, err := specs.OpenRegular(path)
	if err != nil {
		what := err.Error()
		var pe *fs.PathError
		switch {
		case errors.Is(err, fs.ErrNotExist):
			what = "does not exist"
		case errors.As(err, &pe):
			what = pe.Err.Error()
		}
		errs.Add(s.Where("data."+key), "data.%s: %q (resolved to %s) %s", key, name, path, what)
		return nil
	}
	br := bufio.NewReaderSize(f, 1<<16)
	if b, _ := br.Peek(3); bytes.Equal(b, []byte("\xef\xbb\xbf")) {
		br.Discard(3)
	}
	var c *records
	switch strings.ToLower(filepath.Ext(name)) {
	case ".tsv", ".tab":
		c = newRecords(br, '\t', true)
	case ".csv", ".txt":
		c = newRecords(br, ',', false)
	default:
		f.Close()
		errs.Add(s.Where("data."+key), "data.%s: %q must end in .csv or .txt (comma-separated) or .tsv or .tab (tab-separated): the ending decides the separator", key, name)
		return nil
	}
	// Positions name the file as resolved, so that they can be opened
	// from where sheaf was run.
	t := &table{name: path, f: f, csv: c, cols: map[string]int{}}
	head, err := c.Read()
	if err == io.EOF {
		errs.Add(specs.Pos{File: path, Line: 1, Col: 1}, "the table is empty; it needs a header row with %s", strings.Join(want, ", "))
		f.Close()
		return nil
	}
	if err != nil {
		errs.Add(csvPos(path, err), "%v", csvMsg(err))
		f.Close()
		return nil
	}
	names := make([]string, len(head))
	for i, h := range head {
		if !utf8.Valid(h) {
			errs.Add(t.at(i), "the header %q is not valid UTF-8 text; save the table as UTF-8", h)
			f.Close()
			return nil
		}
		names[i] = string(h)
		col := strings.ToLower(strings.TrimSpace(names[i]))
		if j, dup := t.cols[col]; dup && slices.Contains(want, col) {
			errs.Add(t.at(i), "column %q appears twice in the header (also column %d); which one holds the data is unclear", names[i], j+1)
			f.Close()
			return nil
		}
		t.cols[col] = i
	}
	t.fields = len(head)
	var missing []string
	for _, w := range want {
		if _, ok := t.cols[w]; !ok {
			missing = append(missing, w)
		}
		t.width = max(t.width, t.cols[w]+1)
	}
	if len(missing) > 0 {
		errs.Add(specs.Pos{File: path, Line: 1, Col: 1}, "the header needs columns named %s; it has %s",
			strings.Join(want, ", "), quoteList(names))
		f.Close()
		return nil
	}
	return t
}

func quoteList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}

func csvPos(name string, err error) specs.Pos {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return specs.Pos{File: name, Line: pe.Line, Col: pe.Column}
	}
	return specs.Pos{File: name}
}

func csvMsg(err error) string {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// at is the place of field i of the record last read.
func (t *table) at(i int) specs.Pos {
	line, col := t.csv.FieldPos(i)
	return specs.Pos{File: t.name, Line: line, Col: col}
}

// next returns the next record and its line, or nil at the end. The
// fields are valid until the next call.
func (t *table) next(errs *specs.Errors) ([][]byte, int, bool) {
	for {
		rec, err := t.csv.Read()
		if err == io.EOF {
			return nil, 0, false
		}
		if err != nil {
			if !errs.Add(csvPos(t.name, err), "%s", csvMsg(err)) || errors.Is(err, errRecordTooLong) {
				// After a record too long, where the next one starts is
				// not known: stop reading.
				return nil, 0, false
			}
			continue
		}
		line, _ := t.csv.FieldPos(0)
		switch t.check(rec, line, errs) {
		case rowStop:
			return nil, 0, false
		case rowSkip:
			continue
		}
		return rec, line, true
	}
}

// What table.check makes of a record.
const (
	rowOK   = iota
	rowSkip // a blank row, or one with an error reported
	rowStop // one error too many: read no further
)

// check says whether rec, the record last read (on line), is a row of
// the table: not blank, with the header's fields.
func (t *table) check(rec [][]byte, line int, errs *specs.Errors) int {
	if len(rec) == 1 && len(bytes.TrimSpace(rec[0])) == 0 {
		return rowSkip
	}
	if len(rec) < t.width {
		if !errs.Add(specs.Pos{File: t.name, Line: line, Col: 1}, "the row has %d fields; the header asks for at least %d", len(rec), t.width) {
			return rowStop
		}
		return rowSkip
	}
	if len(rec) > t.fields {
		// A field too many is a misplaced separator (a count of
		// "1,250"): reading the row by its first fields would be wrong.
		if !errs.Add(t.at(t.fields), "the row has %d fields; the header has %d (a separator inside a value? quote the value)", len(rec), t.fields) {
			return rowStop
		}
		return rowSkip
	}
	return rowOK
}

// parseNumber reads a count or total: a decimal number, which may have a
// fraction (weighted or estimated counts) or an exponent, read as
// strconv.ParseFloat reads it. Plain digits, the usual case, are read
// here: up to 15 of them are below 2^53, so the integer is the exact value
// strconv.ParseFloat would return.
func parseNumber(b []byte) (float64, string) {
	if n, ok := digits(b, 15); ok {
		return float64(n), ""
	}
	s := string(b)
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	switch {
	case err != nil || strings.ContainsAny(s, "xX_"):
		// Counts are decimal: ParseFloat's hexadecimal and underscored
		// forms are refused, as a spreadsheet would not write them.
		return 0, fmt.Sprintf("%q is not a number", s)
	case math.IsNaN(v) || math.IsInf(v, 0):
		return 0, fmt.Sprintf("%q is not a finite number", s)
	case v < 0:
		return 0, fmt.Sprintf("%s is negative", s)
	}
	return v, ""
}

// parseYear reads a year: plain digits here, anything else as
// strconv.Atoi reads it.
func parseYear(b []byte) (int, string) {
	if n, ok := digits(b, 9); ok {
		return int(n), ""
	}
	s := string(b)
	y, err := strconv.Atoi(strings.TrimSpace(s))
	if err != nil {
		return 0, fmt.Sprintf("year %q is not a whole number", s)
	}
	return y, ""
}

// digits reads b as a decimal number when it is 1 to max ASCII digits
// and nothing else.
func digits(b []byte, max int) (uint64, bool) {
	if len(b) == 0 || len(b) > max {
		return 0, false
	}
	var n uint64
	for _, c := range b {
		if c < '0' || c > '9' {
			return 0, false
		}
		n = n*10 + uint64(c-'0')
	}
	return n, true
}

func readTotals(s *specs.Spec, errs *specs.Errors) (map[int]float64, bool) {
	t := openTable(s, "totals", s.Data.Totals, []string{"year", "total"}, errs)
	if t == nil {
		return nil, false
	}
	defer t.f.Close()
	totals := map[int]float64{}
	lines := map[int]int{}
	yc, tc := t.cols["year"], t.cols["total"]
	for {
		rec, line, ok := t.next(errs)
		if !ok {
			break
		}
		y, msg := parseYear(rec[yc])
		if msg != "" {
			errs.Add(t.at(yc), "%s", msg)
			continue
		}
		v, msg := parseNumber(rec[tc])
		if msg != "" {
			errs.Add(t.at(tc), "total for %d: %s", y, msg)
			continue
		}
		if v == 0 {
			errs.Add(t.at(tc), "total for %d is 0; leave the year out if nothing was published", y)
			continue
		}
		if l, dup := lines[y]; dup {
			errs.Add(t.at(yc), "year %d is given twice (first on line %d)", y, l)
			continue
		}
		lines[y] = line
		if y >= s.Years.From && y <= s.Years.To {
			totals[y] = v
		}
	}
	if len(*errs) == 0 && len(totals) == 0 {
		errs.Add(s.Where("years"), "no totals in %s fall inside the span %d–%d", t.name, s.Years.From, s.Years.To)
	}
	return totals, len(*errs) == 0
}

// pass1 totals every term and checks every row.
func (r *reader) pass1() (map[string]*agg, []string) {
	s := r.spec
	t := openTable(s, "counts", s.Data.Counts, []string{"term", "year", "count"}, r.errs)
	if t == nil {
		return nil, nil
	}
	defer t.f.Close()
	span := s.Years.Len()
	x := &tally{r: r, t: t, aggs: map[string]*agg{}, span: span, from: s.Years.From, to: s.Years.To,
		tc: t.cols["term"], yc: t.cols["year"], cc: t.cols["count"],
		needTotals: s.Scale.Mode != specs.ScaleRaw, spellings: map[string][]uint64{},
		totals: r.spanTotals(), limit: r.keepLimit(), empty: make([]float64, span), seen: map[string]seenTerm{}}
	var words float64
	for _, v := range r.totals {
		words += v
	}
	r.keep = true
	for j, t := range x.totals {
		if math.IsNaN(t) {
			x.empty[j] = math.NaN()
		}
	}
	for {
		// Runs of plain lines are read in place; a line with a quote, or
		// the last one without a line end, as a record.
		if !r.noBlocks {
			if b, first := t.csv.block(); b != nil {
				if !x.block(b, first) {
					break
				}
				continue
			}
		}
		rec, line, ok := t.next(r.errs)
		if !ok || !x.row(rec, line) {
			break
		}
	}
	for _, a := range x.aggs {
		a.share = a.total / words
	}
	return x.aggs, x.order
}

// tally is pass1's state: the terms so far, and what it knows of the
// row before.
type tally struct {
	r              *reader
	t              *table
	aggs           map[string]*agg
	order          []string
	span, from, to int
	tc, yc, cc     int
	needTotals     bool
	spellings      map[string][]uint64 // fold-case only: rows seen per spelling
	totals         []float64           // by year of the span (reader.spanTotals)
	limit          int                 // reader.keepLimit
	empty          []float64           // a term's counts before its rows: NaN in gap years
	last           *agg                // the row before's term: tables are usually sorted
	lastKey        string
	// seen holds, by term as written (trimmed), the terms row has met
	// again after others: the agg and the years the spelling has rows
	// in, which add needs; cur is the term of the last row added.
	seen map[string]seenTerm
	cur  seenTerm
}

// seenTerm is what tally.add needs of a term seen before.
type seenTerm struct {
	raw   string // the term as written, trimmed
	a     *agg
	years []uint64
}

// block adds the lines of records.block, b, whose first is line first.
// It reports false when reading must stop (too many errors).
func (x *tally) block(b []byte, first int) bool {
	for n := first; len(b) > 0; n++ {
		var line []byte
		line, b = blockLine(b)
		if term, y, v, ok := x.read(line); ok && x.add(term, y, v) {
			continue
		}
		if !x.slow(line, n) {
			return false
		}
	}
	return true
}

// blockLine splits the first line off a block (records.block: whole
// lines, each ending in '\n'), CRLF read as LF.
func blockLine(b []byte) (line, rest []byte) {
	nl := bytes.IndexByte(b, '\n')
	line, rest = b[:nl], b[nl+1:]
	if k := len(line); k > 0 && line[k-1] == '\r' {
		line = line[:k-1]
	}
	return line, rest
}

// slow reads line n of a block as a record would be read: its errors,
// with positions, are row's and table.check's. It reports false when
// reading must stop.
func (x *tally) slow(line []byte, n int) bool {
	c := x.t.csv
	if !c.splitAt(line, n) {
		return true // blank
	}
	switch x.t.check(c.rec, n, x.r.errs) {
	case rowStop:
		return false
	case rowSkip:
		return true
	}
	return x.row(c.rec, n)
}

// read reads the term, year and count of a row in place, as row reads
// them, when it has the header's fields and its year and count are
// numbers; ok is false for any other row (a blank line among them).
func (x *tally) read(line []byte) (term []byte, year int, v float64, ok bool) {
	if len(line) == 0 {
		return nil, 0, 0, false
	}
	// The fields as records.split splits them; only three are kept.
	var yb, cb []byte
	keep := func(n int, f []byte) {
		switch n {
		case x.tc:
			term = f
		case x.yc:
			yb = f
		case x.cc:
			cb = f
		}
	}
	comma := x.t.csv.comma
	n, rest := 0, line
	for {
		i := bytes.IndexByte(rest, comma)
		if i < 0 {
			keep(n, rest)
			n++
			break
		}
		keep(n, rest[:i])
		n++
		rest = rest[i+1:]
	}
	if n < x.t.width || n > x.t.fields {
		return nil, 0, 0, false
	}
	if k := len(term); k == 0 || term[0] <= ' ' || term[k-1] <= ' ' || term[0] >= utf8.RuneSelf || term[k-1] >= utf8.RuneSelf {
		term = bytes.TrimSpace(term) // else it has no space to trim
	}
	// Plain digits are read here, anything else by parseYear and
	// parseNumber, which read plain digits the same way.
	if y, ok := digits(yb, 9); ok {
		year = int(y)
	} else {
		var msg string
		if year, msg = parseYear(yb); msg != "" {
			return nil, 0, 0, false
		}
	}
	if c, ok := digits(cb, 15); ok {
		v = float64(c)
	} else {
		var msg string
		if v, msg = parseNumber(cb); msg != "" {
			return nil, 0, 0, false
		}
	}
	return term, year, v, true
}

// add adds a row read by read when it is of the term of the row before
// and row would report nothing, as row would add it. It reports false,
// having done nothing, for any other row.
func (x *tally) add(term []byte, y int, v float64) bool {
	r := x.r
	if x.cur.a == nil || string(term) != x.cur.raw {
		// Tables are usually sorted by term: a run's rows need no look-up.
		cur, ok := x.seen[string(term)]
		if !ok {
			return false
		}
		x.cur = cur
	}
	if y < x.from || y > x.to {
		return false
	}
	i := y - x.from
	tot := x.totals[i]
	has := !math.IsNaN(tot)
	if !has && x.needTotals || has && v > tot {
		return false
	}
	years := x.cur.years
	if years[i/64]&(1<<(i%64)) != 0 {
		return false
	}
	r.rows++
	years[i/64] |= 1 << (i % 64)
	a := x.cur.a
	a.total += v
	if r.keep {
		if c := &a.counts[i]; math.IsNaN(*c) {
			*c = v
		} else {
			*c += v
		}
	}
	return true
}

// row checks and adds one row, rec, read from line. It reports false
// when reading must stop (too many errors).
func (x *tally) row(rec [][]byte, line int) bool {
	r, s, t := x.r, x.r.spec, x.t
	tc, yc, cc := x.tc, x.yc, x.cc
	r.rows++
	term := bytes.TrimSpace(rec[tc])
	if len(term) == 0 {
		return r.errs.Add(t.at(tc), "the term is empty")
	}
	// A term is checked once a run: the row before's term (the key
	// cache's) was valid.
	if string(term) != r.lastRaw || r.lastKey == "" {
		if msg := checkTerm(term); msg != "" {
			return r.errs.Add(t.at(tc), "%s", msg)
		}
	}
	field := yc // the field a problem is in
	y, msg := parseYear(rec[yc])
	if msg == "" && (y < s.Years.From || y > s.Years.To) {
		msg = fmt.Sprintf("year %d is outside the span %d–%d set at %s", y, s.Years.From, s.Years.To, s.Where("years"))
	}
	var v float64
	if msg == "" {
		field = cc
		if v, msg = parseNumber(rec[cc]); msg != "" {
			msg = fmt.Sprintf("count for %q in %d: %s", term, y, msg)
		}
	}
	if msg == "" {
		tot := x.totals[y-s.Years.From]
		has := !math.IsNaN(tot)
		switch {
		case !has && x.needTotals:
			field = yc
			msg = fmt.Sprintf("%q has a count in %d but the totals table has no total for %d; %s scaling needs it", term, y, y, s.Scale.Mode)
		case has && v > tot:
			msg = fmt.Sprintf("count %g for %q in %d is more than that year's total %g", v, term, y, tot)
		}
	}
	if msg != "" {
		return r.errs.Add(t.at(field), "%s", msg)
	}
	k := r.keyOf(term)
	a := x.last
	created := false
	if k != x.lastKey {
		if a = x.aggs[k]; a == nil {
			created = true
			a = &agg{term: norm.NFC.String(string(term)), years: make([]uint64, (x.span+63)/64), line: line, idx: -1}
			x.aggs[k] = a
			x.order = append(x.order, k)
			if r.keep && x.limit >= 0 && len(x.order) > x.limit {
				r.keep = false // read again for the selected terms
				for _, a := range x.aggs {
					a.counts = nil
				}
			}
			if r.keep {
				a.counts = make([]float64, x.span)
				copy(a.counts, x.empty)
			}
		}
		x.last, x.lastKey = a, k
	}
	// A second row for the same spelling and year is a mistake; with
	// fold-case, spellings that differ in case are added together.
	years := a.years
	if r.fold {
		sp := norm.NFC.String(string(term))
		if years = x.spellings[sp]; years == nil {
			years = make([]uint64, (x.span+63)/64)
			x.spellings[sp] = years
		}
	}
	// The key, the agg and the spelling are the term's alone (keyOf left
	// the term in r.lastRaw): add can take its further rows, those of
	// its run from cur and, once it comes back after other terms (an
	// unsorted table), from seen.
	x.cur = seenTerm{raw: r.lastRaw, a: a, years: years}
	if !created {
		if _, ok := x.seen[r.lastRaw]; !ok {
			x.seen[r.lastRaw] = x.cur
		}
	}
	i := y - s.Years.From
	if years[i/64]&(1<<(i%64)) != 0 {
		return r.errs.Add(t.at(yc), "%q has a second row for %d", term, y)
	}
	years[i/64] |= 1 << (i % 64)
	a.total += v
	if r.keep {
		// As pass2 adds: see there.
		if c := &a.counts[i]; math.IsNaN(*c) {
			*c = v
		} else {
			*c += v
		}
	}
	return true
}

// selectTerms applies the list, the rule and the exclusions, and returns
// the keys of the selected terms in list-then-share order. A term listed
// twice, a term both listed and excluded and an excluded term the data
// lacks are errors: each is more likely a slip than a wish.
func (r *reader) selectTerms(aggs map[string]*agg, order []string) []string {
	s := r.spec
	var names []string
	notIn := func(term string) string {
		if names == nil {
			for _, k := range order {
				names = append(names, aggs[k].term)
			}
		}
		hint := ""
		if c := specs.Closest(term, names, 3); len(c) > 0 {
			hint = "; closest: " + quoteList(c)
		}
		return fmt.Sprintf("is not in %s%s", s.Data.Counts, hint)
	}
	excluded := map[string]int{} // key → first exclude entry
	for i, e := range s.Terms.Exclude {
		if k := r.key(e); !hasKey(excluded, k) {
			excluded[k] = i
		}
	}
	var sel []string
	listed := map[string]int{} // key → first list entry
	for i, term := range s.Terms.List {
		k := r.key(term)
		at := s.Where(fmt.Sprintf("terms.list.%d", i))
		if j, dup := listed[k]; dup {
			r.errs.Add(at, "term %q is listed twice (first at %s)", term, seenAt(s.Where(fmt.Sprintf("terms.list.%d", j)), at))
			continue
		}
		listed[k] = i
		if j, ex := excluded[k]; ex {
			r.errs.Add(at, "term %q is both listed and excluded (exclude at %s)", term, seenAt(s.Where(fmt.Sprintf("terms.exclude.%d", j)), at))
			continue
		}
		if aggs[k] == nil {
			r.errs.Add(at, "term %q %s", term, notIn(term))
			continue
		}
		sel = append(sel, k)
	}
	for i, e := range s.Terms.Exclude {
		if aggs[r.key(e)] == nil {
			r.errs.Add(s.Where(fmt.Sprintf("terms.exclude.%d", i)), "excluded term %q %s", e, notIn(e))
		}
	}
	if s.Terms.Top > 0 || len(s.Terms.List) == 0 {
		var cand []*agg
		keys := map[*agg]string{}
		for _, k := range order {
			if a := aggs[k]; !hasKey(listed, k) && !hasKey(excluded, k) && a.total >= s.Terms.MinTotal {
				cand = append(cand, a)
				keys[a] = k
			}
		}
		// Most used first; equal shares by term.
		idx := stableOrder(len(cand), func(x, y int) int {
			a, b := cand[x], cand[y]
			if c := cmp.Compare(b.share, a.share); c != 0 {
				return c
			}
			return strings.Compare(a.term, b.term)
		})
		if s.Terms.Top > 0 && len(idx) > s.Terms.Top {
			idx = idx[:s.Terms.Top]
		}
		for _, i := range idx {
			sel = append(sel, keys[cand[i]])
		}
	}
	for i, k := range sel {
		aggs[k].idx = i
	}
	return sel
}

func hasKey(m map[string]int, k string) bool {
	_, ok := m[k]
	return ok
}

// seenAt says where an earlier entry is, seen from here: "line 8", or
// "line 8, column 10" when both are on one line (a flow list).
func seenAt(first, here specs.Pos) string {
	if first.Line == here.Line && first.Col > 0 {
		return fmt.Sprintf("line %d, column %d", first.Line, first.Col)
	}
	return fmt.Sprintf("line %d", first.Line)
}

// keepLimit is how many terms pass1 keeps the counts of: twice the most
// the spec can select, or -1 for all when it can select them all.
func (r *reader) keepLimit() int {
	t := r.spec.Terms
	switch {
	case r.keepAll:
		return -1
	case t.Top > 0:
		return 2 * (t.Top + len(t.List))
	case len(t.List) > 0:
		return 2 * len(t.List)
	}
	return -1
}

// spanTotals is the totals by year of the span from its first year; NaN
// where the table has none (a total is never NaN: parseNumber refuses it).
func (r *reader) spanTotals() []float64 {
	s := r.spec
	out := make([]float64, s.Years.Len())
	for i := range out {
		out[i] = math.NaN()
		if v, ok := r.totals[s.Years.From+i]; ok {
			out[i] = v
		}
	}
	return out
}

// pass2 collects the counts of the selected terms.
func (r *reader) pass2(aggs map[string]*agg, selected []string) {
	s := r.spec
	t := openTable(s, "counts", s.Data.Counts, []string{"term", "year", "count"}, r.errs)
	if t == nil {
		return
	}
	defer t.f.Close()
	span := s.Years.Len()
	counts := make([]float64, len(selected)*span)
	for i := range selected {
		r.counts = append(r.counts, counts[i*span:(i+1)*span:(i+1)*span])
	}
	totals := r.spanTotals()
	for i := range selected {
		for j, t := range totals {
			if math.IsNaN(t) {
				counts[i*span+j] = math.NaN()
			}
		}
	}
	tc, yc, cc := t.cols["term"], t.cols["year"], t.cols["count"]
	var a *agg
	lastKey := ""
	add := func(term []byte, y int, v float64) {
		if k := r.keyOf(term); k != lastKey || a == nil {
			a, lastKey = aggs[k], k
		}
		if a == nil || a.idx < 0 {
			return
		}
		// Add, not set: with fold-case several spellings share a term. A
		// gap year (NaN) takes the count as it is; only raw scaling
		// lets counts into such years.
		if c := &counts[a.idx*span+y-s.Years.From]; math.IsNaN(*c) {
			*c = v
		} else {
			*c += v
		}
	}
	// The rows pass1 checked: runs of plain lines are read in place (as
	// pass1 reads them, with tally.read), the rest as records.
	x := &tally{t: t, tc: tc, yc: yc, cc: cc}
	c := t.csv
	for {
		if !r.noBlocks {
			if b, first := c.block(); b != nil {
				for n := first; len(b) > 0; n++ {
					var line []byte
					line, b = blockLine(b)
					if term, y, v, ok := x.read(line); ok {
						add(term, y, v)
						continue
					}
					if !c.splitAt(line, n) {
						continue // blank
					}
					switch t.check(c.rec, n, r.errs) {
					case rowStop:
						return
					case rowSkip:
						continue
					}
					y, _ := parseYear(c.rec[yc])
					v, _ := parseNumber(c.rec[cc])
					add(bytes.TrimSpace(c.rec[tc]), y, v)
				}
				continue
			}
		}
		rec, _, ok := t.next(r.errs)
		if !ok {
			break
		}
		y, _ := parseYear(rec[yc])
		v, _ := parseNumber(rec[cc])
		add(bytes.TrimSpace(rec[tc]), y, v)
	}
}

// checkTerm says what is wrong with a term as read from the counts table,
// or "": it must be UTF-8 text of at most specs.MaxTermSize bytes with no
// control character or byte order mark, which would make a term that
// looks like another one, or none.
func checkTerm(term []byte) string {
	if len(term) > specs.MaxTermSize {
		return fmt.Sprintf("the term %.40q… is %d bytes long; a term is at most %d bytes", term, len(term), specs.MaxTermSize)
	}
	if !utf8.Valid(term) {
		return fmt.Sprintf("the term %q is not valid UTF-8 text; save the table as UTF-8", term)
	}
	for i, c := range string(term) {
		switch {
		case c == 0:
			return fmt.Sprintf("the term %q has a NUL byte at byte %d", term, i+1)
		case c == '\ufeff':
			return fmt.Sprintf("the term %q has a byte order mark (U+FEFF) at byte %d; remove it", term, i+1)
		case c < 0x20 || c == 0x7f || c >= 0x80 && c < 0xa0:
			return fmt.Sprintf("the term %q has the control character U+%04X at byte %d", term, c, i+1)
		}
	}
	return ""
}

// whereSelection is the spec line that decides which terms are shown:
// terms (or a key under it), else data.counts, whose every term is a
// candidate when the spec has no terms key.
func whereSelection(s *specs.Spec) specs.Pos {
	for _, k := range []string{"terms", "data.counts"} {
		if p := s.Where(k); p.Line > 0 {
			return p
		}
	}
	return specs.Pos{File: s.File}
}
