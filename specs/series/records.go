package series

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"

	"sheaf/specs"
)

// errRecordTooLong ends reading a table with a record (a line, or lines
// of one quoted value) longer than specs.MaxRecordSize: an endless line
// must not grow memory without bound.
var errRecordTooLong = fmt.Errorf("the record is longer than %d KiB, the most sheaf reads in one row (a file that is not a table?)", specs.MaxRecordSize>>10)

// records reads a CSV or TSV table record by record with the results of
// encoding/csv (RFC 4180 as csv.Reader reads it: CRLF taken as LF, blank
// lines skipped, a trailing CR before EOF dropped, positions in bytes from
// 1), but faster. Counts tables are millions of lines with no quotes, so a
// line without a '"' is split here; a line with one, or one longer than
// the buffer, is handed to a csv.Reader, which then reads exactly that
// record's lines (see feeder) and reports positions counted from where it
// took over.
type records struct {
	br    *bufio.Reader
	comma byte
	csv   *csv.Reader // reads from feed; made on the first line with a quote
	feed  feeder
	lazy  bool // csv.Reader.LazyQuotes

	fast int // lines the fast path consumed, blank ones included

	// win is br's buffered bytes as last looked at, pos how far they are
	// read, quote the index of the first '"' in win (or len(win)).
	win        []byte
	pos, quote int

	err error // a read error block met, for Read to return
	eof bool  // block met the end of the file

	rec [][]byte
	// Where the fields of the record last read are: split here, all on
	// line, pieces of whole; from csv.Reader, at lines and cols.
	line        int
	whole       []byte
	lines, cols []int
}

func newRecords(br *bufio.Reader, comma byte, lazyQuotes bool) *records {
	return &records{br: br, comma: comma, lazy: lazyQuotes, feed: feeder{br: br}}
}

// Read returns the next record; its fields stay valid until the next
// call. Errors are encoding/csv's, *csv.ParseError with lines counted from
// the top of the file.
func (r *records) Read() ([][]byte, error) {
	if r.err != nil {
		// As ReadSlice would have: the partial line before the error is
		// dropped.
		err := r.err
		r.err = nil
		r.br.Discard(r.br.Buffered())
		return nil, err
	}
	for {
		// Whole lines in br's buffer before its next quote are split in
		// place; one look for a quote covers the buffer.
		if r.win == nil {
			r.win, _ = r.br.Peek(r.br.Buffered())
			r.pos, r.quote = 0, bytes.IndexByte(r.win, '"')
			if r.quote < 0 {
				r.quote = len(r.win)
			}
		}
		rest := r.win[r.pos:]
		if nl := bytes.IndexByte(rest, '\n'); nl >= 0 && r.pos+nl < r.quote {
			r.pos += nl + 1
			line := rest[:nl]
			if n := len(line); n > 0 && line[n-1] == '\r' {
				line = line[:n-1] // CRLF is read as LF
			}
			if r.split(line) {
				return r.rec, nil
			}
			continue
		}
		// The rest is a line with a quote, or runs past the buffer.
		r.br.Discard(r.pos)
		r.win = nil
		line, err := r.br.ReadSlice('\n')
		switch err {
		case nil, bufio.ErrBufferFull, io.EOF:
		default:
			return nil, err
		}
		if err == io.EOF && len(line) == 0 {
			return nil, io.EOF
		}
		if err == bufio.ErrBufferFull || bytes.IndexByte(line, '"') >= 0 {
			return r.slow(line, err)
		}
		// encoding/csv drops a CR before EOF, and reads CRLF as LF.
		if err == io.EOF && line[len(line)-1] == '\r' {
			line = line[:len(line)-1]
		}
		if n := len(line); n > 0 && line[n-1] == '\n' {
			line = line[:n-1]
			if n >= 2 && line[n-2] == '\r' {
				line = line[:n-2]
			}
		}
		if r.split(line) {
			return r.rec, nil
		}
	}
}

// block returns the whole lines ahead that the fast path of Read would
// split — as many as fill br's buffer, up to the first quote — and the
// number of the first line, counting them all as read. It returns nil
// when the next line has a quote, runs past the buffer or is the last
// one and has no line end: Read reads that one. The bytes stay valid
// until the next call of block or Read. A caller takes each line as Read
// would (a CR before the LF dropped, blank lines skipped) and splits it
// with splitAt, or reads its fields itself.
func (r *records) block() ([]byte, int) {
	if r.win != nil {
		r.br.Discard(r.pos)
		r.win = nil
	}
	if r.err != nil {
		return nil, 0
	}
	// Fill the buffer only when under half of it is left: filling moves
	// what is left to its start, which for every line (a table of quoted
	// lines, each read by Read between two calls) would cost a buffer a
	// line. At the end of the file there is nothing to fill it with.
	n := r.br.Buffered()
	if n < r.br.Size()/2 && !r.eof {
		n = r.br.Size()
	}
	b, err := r.br.Peek(n)
	switch err {
	case nil, bufio.ErrBufferFull:
	case io.EOF:
		r.eof = true
	default:
		r.err = err // Peek forgets it: Read returns it after these lines
	}
	if q := bytes.IndexByte(b, '"'); q >= 0 {
		b = b[:q]
	}
	nl := bytes.LastIndexByte(b, '\n')
	if nl < 0 {
		return nil, 0
	}
	b = b[:nl+1]
	first := r.fast + r.feed.lines + 1
	r.fast += bytes.Count(b, []byte{'\n'})
	r.br.Discard(len(b))
	return b, first
}

// split makes the record of a line without quotes and its line end,
// counting the line. It reports false for a blank line, which is no
// record.
func (r *records) split(line []byte) bool {
	n := r.fast + r.feed.lines + 1
	r.fast++
	return r.splitAt(line, n)
}

// splitAt is split for line n, a line block returned (so counted).
func (r *records) splitAt(line []byte, n int) bool {
	r.line = n
	if len(line) == 0 {
		return false
	}
	r.rec, r.lines, r.cols, r.whole = r.rec[:0], nil, nil, line
	start := 0
	for {
		i := bytes.IndexByte(line[start:], r.comma)
		if i < 0 {
			r.rec = append(r.rec, line[start:])
			return true
		}
		r.rec = append(r.rec, line[start:start+i])
		start += i + 1
	}
}

// slow reads the record that starts with line (already taken from br,
// with err from ReadSlice) through encoding/csv.
func (r *records) slow(line []byte, err error) ([][]byte, error) {
	if r.csv == nil {
		r.csv = csv.NewReader(&r.feed)
		r.csv.Comma = rune(r.comma)
		r.csv.LazyQuotes = r.lazy
		r.csv.FieldsPerRecord = -1
		r.csv.ReuseRecord = true
	}
	r.feed.pending = line
	r.feed.taken = 0
	start := r.fast + r.feed.lines + 1
	if err == io.EOF {
		r.feed.err = io.EOF
	}
	rec, err := r.csv.Read()
	if errors.Is(err, errRecordTooLong) {
		return nil, &csv.ParseError{StartLine: start, Line: start, Column: 1, Err: errRecordTooLong}
	}
	if pe, ok := err.(*csv.ParseError); ok {
		e := *pe
		e.StartLine += r.fast
		e.Line += r.fast
		return nil, &e
	}
	if err != nil {
		return nil, err
	}
	r.rec, r.lines, r.cols = r.rec[:0], r.lines[:0], r.cols[:0]
	if r.lines == nil {
		r.lines, r.cols = []int{}, []int{}
	}
	for i, f := range rec {
		l, c := r.csv.FieldPos(i)
		r.rec = append(r.rec, []byte(f))
		r.lines = append(r.lines, l+r.fast)
		r.cols = append(r.cols, c)
	}
	return r.rec, nil
}

// FieldPos returns the line and column of field i of the record last
// read, as csv.Reader.FieldPos does.
func (r *records) FieldPos(i int) (line, col int) {
	switch {
	case i < 0 || i >= len(r.rec):
		return 0, 0
	case r.lines == nil:
		// A field split here is a piece of r.whole: its offset in the line
		// is the difference of their capacities.
		return r.line, cap(r.whole) - cap(r.rec[i]) + 1
	}
	return r.lines[i], r.cols[i]
}

// feeder is the csv.Reader's input: the rest of the line the fast path
// handed over, then further lines of br, at most one line a Read. The
// bufio.Reader inside csv.Reader fills itself by one Read at a time and
// csv.Reader reads whole lines, so when a record is done it holds nothing
// beyond it and br is back at the start of the next line.
type feeder struct {
	br      *bufio.Reader
	pending []byte // bytes of br's buffer not yet handed on
	err     error  // to return once pending is empty
	lines   int    // line ends handed on
	taken   int    // bytes handed on for the record being read
}

func (f *feeder) Read(p []byte) (int, error) {
	if f.taken > specs.MaxRecordSize {
		return 0, errRecordTooLong
	}
	if len(f.pending) == 0 {
		if f.err != nil {
			err := f.err
			f.err = nil
			return 0, err
		}
		line, err := f.br.ReadSlice('\n')
		if err != nil && err != bufio.ErrBufferFull {
			if len(line) == 0 {
				return 0, err
			}
			f.err = err
		}
		f.pending = line
	}
	n := copy(p, f.pending)
	f.pending = f.pending[n:]
	f.taken += n
	if n > 0 && p[n-1] == '\n' {
		f.lines++
	}
	return n, nil
}
