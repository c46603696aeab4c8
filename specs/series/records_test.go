package series

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"testing"
	"testing/iotest"

	"github.com/stretchr/testify/assert"
)

// recordCases are tricky tables for the record reader. The reference is
// encoding/csv, which reads RFC 4180 (Shafranovich, "Common Format and
// MIME Type for Comma-Separated Values (CSV) Files", 2005, §2 rules 1–7)
// plus its documented leniencies: LF or CRLF line ends, blank lines
// skipped, a CR before EOF dropped, and for TSV LazyQuotes. The reader
// must return the same records, the same field positions and the same
// errors at the same line and column.
var recordCases = []struct {
	name, text string
}{
	{"§2.1 records on lines, CRLF", "term,year,count\r\nboiler,1900,5\r\n"},
	{"§2.1 records on lines, LF", "term,year,count\nboiler,1900,5\n"},
	{"§2.2 last record without a line end", "term,year,count\nboiler,1900,5"},
	{"§2.2 last line ends in CR", "term,year,count\nboiler,1900,5\r"},
	{"§2.4 spaces are part of a field", " term , year ,count\n boiler ,1900, 5 \n"},
	{"§2.4 trailing commas give empty fields", "a,b,\n1,,\n,,\n"},
	{"§2.5 quoted fields", "\"term\",\"year\",count\n\"boiler\",1900,\"5\"\n"},
	{"§2.6 quoted comma", "term,year,count\n\"steam, high-pressure\",1900,5\n"},
	{"§2.6 quoted LF", "term,year,count\n\"two\nlines\",1900,5\nafter,1901,6\n"},
	{"§2.6 quoted CRLF", "term,year,count\r\n\"two\r\nlines\",1900,5\r\nafter,1901,6\r\n"},
	{"§2.7 doubled quotes", "term,year,count\n\"the \"\"big\"\" one\",1900,5\n\"\"\"\",1901,6\n"},
	{"quoted field at EOF", "a,\"b\""},
	{"quoted field then CRLF", "\"a\"\r\nb\r\n"},
	{"quotes, then plain lines keep their numbers", "a,b\n\"x\ny\",2\nc,d\n\n\"e\"\"\",f\ng,h\n"},
	{"blank lines", "a,b\n\n1,2\n\r\n\n3,4\n\n"},
	{"only blank lines", "\n\r\n\n"},
	{"empty", ""},
	{"blank-looking line of spaces is a record", "a,b\n   \n1,2\n"},
	{"byte order mark is data here", "\ufeffterm,year\nx,1\n"},
	{"lone CR inside a field", "a\rb,c\nd,e\r\r\n"},
	{"UTF-8 terms", "Maßstab,1900,3\ncafe\u0301,1901,4\n"},
	{"bare quote in a plain field", "term,year\nbo\"iler,1900\nnext,1901\n"},
	{"text after a closing quote", "term,year\n\"bo\"iler,1900\nnext,1901\n"},
	{"quote never closed", "term,year\n\"boiler,1900\nnext,1901\n"},
	{"error, then good lines", "a,b\nx\"y,1\nc,d\n\"p\"q\nr,s\n"},
	{"long plain line", "a," + strings.Repeat("x", 300) + ",b\n" + strings.Repeat("y,", 200) + "z\nlast,1\n"},
	{"long quoted line", "a,\"" + strings.Repeat("x,", 150) + "\",b\nlast,1\n"},
}

// readAll reads every record, position and error until EOF (at most 200
// reads, so a reader stuck in a loop fails instead of hanging).
func readAll(read func() ([]string, error), pos func(i int) (int, int)) string {
	var b strings.Builder
	for range 200 {
		rec, err := read()
		if err == io.EOF {
			return b.String()
		}
		if err != nil {
			fmt.Fprintf(&b, "error: %v\n", err)
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				fmt.Fprintf(&b, "  start line %d line %d column %d\n", pe.StartLine, pe.Line, pe.Column)
			}
			continue
		}
		fmt.Fprintf(&b, "%q", rec)
		for i := range rec {
			l, c := pos(i)
			fmt.Fprintf(&b, " %d:%d", l, c)
		}
		b.WriteByte('\n')
	}
	return b.String() + "too many reads\n"
}

func TestRecordsAgreeWithEncodingCSV(t *testing.T) {
	// Small buffers put line ends, quotes and the buffer's end everywhere;
	// readers that hand out one or a few bytes a time split them further.
	sources := []struct {
		name string
		wrap func(io.Reader) io.Reader
	}{
		{"whole", func(r io.Reader) io.Reader { return r }},
		{"one byte a read", iotest.OneByteReader},
		{"half a buffer a read", iotest.HalfReader},
	}
	for _, tc := range recordCases {
		for _, tsv := range []bool{false, true} {
			text, comma, kind := tc.text, byte(','), "CSV"
			if tsv {
				text, comma, kind = strings.ReplaceAll(text, ",", "\t"), '\t', "TSV"
			}
			ref := csv.NewReader(strings.NewReader(text))
			ref.Comma, ref.LazyQuotes, ref.FieldsPerRecord, ref.ReuseRecord = rune(comma), tsv, -1, true
			want := readAll(ref.Read, ref.FieldPos)
			for _, size := range []int{16, 23, 64, 4096} {
				for _, src := range sources {
					r := newRecords(bufio.NewReaderSize(src.wrap(strings.NewReader(text)), size), comma, tsv)
					got := readAll(func() ([]string, error) {
						rec, err := r.Read()
						out := make([]string, len(rec))
						for i, f := range rec {
							out[i] = string(f)
						}
						return out, err
					}, r.FieldPos)
					assert.Equal(t, want, got, "%s, %s, buffer %d, %s: records against encoding/csv", tc.name, kind, size, src.name)
				}
			}
		}
	}
}

// countingReader counts the reads made of it.
type countingReader struct {
	r     io.Reader
	reads int
}

func (c *countingReader) Read(p []byte) (int, error) {
	c.reads++
	return c.r.Read(p)
}

// TestBlockFillsRarely: reading a table of quoted lines (each one read by
// Read, the next looked at by block) reads the file a buffer at a time,
// not a line at a time: block fills the buffer only when under half of
// it is left, as filling moves what is left to its start. 2,000 lines
// of 20 bytes through a 4 KiB buffer need about 40,000 ÷ 2,048 ≈ 20
// reads; filling for every line would make 2,000. Counts reads, not time.
func TestBlockFillsRarely(t *testing.T) {
	var b strings.Builder
	for i := range 2000 {
		fmt.Fprintf(&b, "\"term%04d\",1900,%d\n", i, i%10)
	}
	src := &countingReader{r: strings.NewReader(b.String())}
	r := newRecords(bufio.NewReaderSize(src, 4096), ',', false)
	records := 0
	for {
		if blk, _ := r.block(); blk != nil {
			continue
		}
		_, err := r.Read()
		if err == io.EOF {
			break
		}
		assert.NoError(t, err)
		records++
	}
	assert.Equal(t, 2000, records, "records read")
	assert.LessOrEqual(t, src.reads, 50, "reads of the file")
}
