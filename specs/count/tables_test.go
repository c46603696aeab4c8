package count

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// The tables are written whole, with the header each reader expects
// (counts: term,year,count; totals: year,total — README, "Data"), and a
// second write replaces them; a file that is not ours is left alone.
func TestWriteTables(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "made")
	res := &Result{Years: []int{1900, 1901}, Totals: []int64{10, 12},
		Rows: []Row{{Term: "steam", Year: 1900, Count: 2}, {Term: "steam", Year: 1901, Count: 3}}}
	paths, err := WriteTables(dir, res)
	require.NoError(t, err)
	assert.Equal(t, []string{filepath.Join(dir, "counts.csv"), filepath.Join(dir, "totals.csv")}, paths)
	for _, tc := range []struct{ path, want string }{
		{paths[0], "term,year,count\nsteam,1900,2\nsteam,1901,3\n"},
		{paths[1], "year,total\n1900,10\n1901,12\n"},
	} {
		got, err := os.ReadFile(tc.path)
		require.NoError(t, err)
		assert.Equal(t, tc.want, string(got))
		fi, err := os.Stat(tc.path)
		require.NoError(t, err)
		assert.Equal(t, os.FileMode(0o644), fi.Mode().Perm(), "readable by all, like any file we write (common practice)")
	}
	require.NoError(t, os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o600))
	res.Totals[0] = 11
	_, err = WriteTables(dir, res)
	require.NoError(t, err)
	got, _ := os.ReadFile(paths[1])
	assert.Equal(t, "year,total\n1900,11\n1901,12\n", string(got), "replaced")
	notes, _ := os.ReadFile(filepath.Join(dir, "notes.txt"))
	assert.Equal(t, "mine", string(notes), "a file we did not write is untouched")
}

// When a table cannot be put in place (here counts.csv is a folder of
// someone else's), nothing is replaced and no temporary file is left.
func TestWriteTablesFailureKeepsOld(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.Mkdir(filepath.Join(dir, "counts.csv"), 0o755))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "counts.csv", "keep"), []byte("x"), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "totals.csv"), []byte("old\n"), 0o644))
	_, err := WriteTables(dir, &Result{Years: []int{1900}, Totals: []int64{1}})
	require.Error(t, err)
	old, _ := os.ReadFile(filepath.Join(dir, "totals.csv"))
	assert.Equal(t, "old\n", string(old), "the old totals table stays")
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	assert.Equal(t, []string{"counts.csv", "totals.csv"}, names, "no stray temporary file")
	_, err = os.Stat(filepath.Join(dir, "counts.csv", "keep"))
	assert.NoError(t, err, "the folder's content is untouched")
}

// ReadTerms: a term a line; comments, blank lines and a byte-order mark
// are skipped; faults name the file and line.
func TestReadTerms(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		name, text string
		want       []string
		fault      string
	}{
		{"list", "\ufeff# engines\nsteam\n\n  boiler  \nsteam engine\n", []string{"steam", "boiler", "steam engine"}, ""},
		{"twice", "steam\nboiler\nsteam\n", nil, `twice.txt:3: "steam" listed twice (first at line 1)`},
		{"latin1", "caf\xe9\n", nil, "latin1.txt:1: not valid UTF-8"},
		{"empty", "# nothing\n\n", nil, "empty.txt: lists no terms"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, tc.name+".txt")
			require.NoError(t, os.WriteFile(p, []byte(tc.text), 0o644))
			got, err := ReadTerms(p)
			if tc.fault == "" {
				require.NoError(t, err)
				assert.Equal(t, tc.want, got)
				return
			}
			require.Error(t, err)
			assert.True(t, specs.IsBadInput(specs.BadInput(err)))
			var bad *BadInput
			require.ErrorAs(t, err, &bad)
			assert.Contains(t, filepath.ToSlash(err.Error()), tc.fault)
		})
	}
	_, err := ReadTerms(filepath.Join(dir, "nowhere.txt"))
	assert.ErrorContains(t, err, "nowhere.txt: cannot read")
}

// SpecTerms: the list first, then the inserts' terms not in it, each once.
func TestSpecTerms(t *testing.T) {
	s := &specs.Spec{Terms: specs.Terms{List: []string{"steam", "boiler"}},
		Inserts: []specs.Insert{{Terms: []string{"boiler", "lamp"}}, {Terms: []string{"lamp", "bell"}}}}
	assert.Equal(t, []string{"steam", "boiler", "lamp", "bell"}, SpecTerms(s))
}

// Within keeps the span's years, both ends included, in order.
func TestWithin(t *testing.T) {
	files := []File{{Year: 1879}, {Year: 1880, Path: "a"}, {Year: 1999, Path: "b"}, {Year: 2000}}
	in, left := Within(files, specs.Span{From: 1880, To: 1999})
	assert.Equal(t, []File{{Year: 1880, Path: "a"}, {Year: 1999, Path: "b"}}, in)
	assert.Equal(t, 2, left)
}

// Archive: a folder is listed with the year pattern; a bad pattern is
// named as the flag; a missing path cannot be read.
func TestArchive(t *testing.T) {
	dir := t.TempDir()
	for _, name := range []string{"1900/a.txt", "1901/b.txt", "1901/c.md"} {
		require.NoError(t, os.MkdirAll(filepath.Join(dir, filepath.Dir(name)), 0o755))
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), []byte("steam\n"), 0o644))
	}
	files, err := Archive(dir, "txt", DefaultYearPattern)
	require.NoError(t, err)
	require.Len(t, files, 2, "the .md file is left out; an ext without a dot gets one")
	assert.Equal(t, 1900, files[0].Year)
	assert.True(t, strings.HasSuffix(filepath.ToSlash(files[1].Path), "1901/b.txt"))
	_, err = Archive(dir, ".txt", "(")
	assert.ErrorContains(t, err, "--year-pattern")
	_, err = Archive(filepath.Join(dir, "nowhere"), ".txt", DefaultYearPattern)
	assert.ErrorContains(t, err, "cannot read")
}
