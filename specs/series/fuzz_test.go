package series

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// FuzzRecords: the record reader returns what encoding/csv returns (the
// reference, see recordCases) for any text: the same records, field
// positions and errors, through a small buffer so that line ends and
// quotes fall everywhere. Records over specs.MaxRecordSize are this
// reader's own error and are left out.
func FuzzRecords(f *testing.F) {
	for _, tc := range recordCases {
		f.Add(tc.text, false)
		f.Add(tc.text, true)
	}
	f.Fuzz(func(t *testing.T, text string, tsv bool) {
		if len(text) > specs.MaxRecordSize {
			return
		}
		comma := byte(',')
		if tsv {
			comma = '\t'
		}
		ref := csv.NewReader(strings.NewReader(text))
		ref.Comma, ref.LazyQuotes, ref.FieldsPerRecord, ref.ReuseRecord = rune(comma), tsv, -1, true
		want := readAll(ref.Read, ref.FieldPos)
		r := newRecords(bufio.NewReaderSize(strings.NewReader(text), 16), comma, tsv)
		got := readAll(func() ([]string, error) {
			rec, err := r.Read()
			out := make([]string, len(rec))
			for i, f := range rec {
				out[i] = string(f)
			}
			return out, err
		}, r.FieldPos)
		assert.Equal(t, want, got, "text %q: records, field positions and errors; want those of encoding/csv", text)
	})
}

// FuzzLoad: any counts and totals tables load or fail with an error;
// never a panic or a hang. A loaded set is consistent: one value per year
// of the span for every series. Reading runs of plain lines in place
// (tally.read and tally.add) gives the set and the errors, to the bit
// and the letter, that reading every row as a record does.
func FuzzLoad(f *testing.F) {
	f.Add("term,year,count\nboiler,1900,5\nsteam,1901,7\n", "year,total\n1900,100\n1901,200\n", false)
	f.Add("term,year,count\n\"a,b\",1900,5\n", "year,total\n1900,100\n", true)
	f.Add("term,year,count\nx,1900,1,2\n", "year,total\n1900,0\n", false)
	// Runs of one term that tally.add takes, broken by rows it hands to
	// tally.row: a second row, a fraction, a bad year, CRLF, a new term.
	f.Add("term,year,count\nx,1900,1\nx,1901,2\r\nx,1901,3\nx,1902,1.5\nx,19x,1\nX,1903,4\n\nx,1903,1", "year,total\n1900,100\n1901,200\n1902,300\n1903,400\n", true)
	f.Fuzz(func(t *testing.T, counts, totals string, fold bool) {
		dir := t.TempDir()
		write(t, filepath.Join(dir, "counts.csv"), counts)
		write(t, filepath.Join(dir, "totals.csv"), totals)
		spec := "title: T\ndata: {counts: counts.csv, totals: totals.csv, fold-case: " + map[bool]string{true: "true", false: "false"}[fold] + "}\nyears: {from: 1900, to: 1903}\noutputs: {print: {kind: print}}\n"
		path := filepath.Join(dir, "spec.yaml")
		require.NoError(t, os.WriteFile(path, []byte(spec), 0o644))
		s, err := specs.Load(path)
		require.NoError(t, err)
		set, err := Load(s)
		// The reference: every row read as a record (tally.row), as
		// before runs of plain lines were read in place.
		ref, refErr := loadRecords(s)
		if refErr != nil || err != nil {
			assert.Equal(t, fmt.Sprint(refErr), fmt.Sprint(err), "errors; want those of reading every row as a record")
			return
		}
		assert.Equal(t, setDigest(ref), setDigest(set), "the set; want that of reading every row as a record")
		for _, sr := range set.Series {
			require.Len(t, sr.Values, 4, "series %q: one value for each of 4 years", sr.Term)
		}
	})
}

// loadRecords is Load reading every row of the counts as a record.
func loadRecords(s *specs.Spec) (*Set, error) {
	t, err := readTable(s, true)
	if err != nil {
		return nil, err
	}
	return t.Select(s)
}
