package main

import (
	"bytes"
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/examples/lantern/archive"
)

// TestCountExample runs README's "From text" steps: the example's text
// archive is generated, `sheaf count` turns it into tables — the same bytes
// as examples/lantern/data, and exactly what the generator wrote into the
// text (its own tally) — and `sheaf build` turns them into pages.
func TestCountExample(t *testing.T) {
	tmp := t.TempDir()
	text := filepath.Join(tmp, "text")
	tally, err := archive.Write(text, 1880)
	require.NoError(t, err)

	spec := filepath.Join(tmp, "feature.yaml")
	src, err := os.ReadFile("../../examples/lantern/feature.yaml")
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(spec, src, 0o644))

	var stdout, stderr bytes.Buffer
	code := run([]string{"count", text, "--spec", spec, "--out", filepath.Join(tmp, "data"), "--quiet"}, &stdout, &stderr)
	require.Equal(t, exitOK, code, stderr.String())
	assert.Equal(t, filepath.Join(tmp, "data", "counts.csv")+"\n"+filepath.Join(tmp, "data", "totals.csv")+"\n", stdout.String())

	for _, name := range []string{"counts.csv", "totals.csv"} {
		got, err := os.ReadFile(filepath.Join(tmp, "data", name))
		require.NoError(t, err)
		want, err := os.ReadFile(filepath.Join("../../examples/lantern/data", name))
		require.NoError(t, err)
		assert.Equal(t, string(want), string(got), "%s differs from examples/lantern/data (regenerate it as README says if the example changed)", name)
	}

	// The generator's tally (what it put into the text) is what was counted.
	for _, r := range readCSV(t, filepath.Join(tmp, "data", "totals.csv")) {
		y, _ := strconv.Atoi(r[0])
		assert.Equal(t, strconv.FormatInt(tally.Totals[y], 10), r[1], "words in %d", y)
	}
	rows := 0
	for _, r := range readCSV(t, filepath.Join(tmp, "data", "counts.csv")) {
		y, _ := strconv.Atoi(r[1])
		assert.Equal(t, strconv.FormatInt(tally.Counts[r[0]][y], 10), r[2], "%s in %d", r[0], y)
		rows++
	}
	want := 0
	for _, years := range tally.Counts {
		for _, n := range years {
			if n > 0 {
				want++
			}
		}
	}
	assert.Equal(t, want, rows, "rows: one per term and year the generator used it")

	stdout.Reset()
	stderr.Reset()
	code = run([]string{"build", spec, "--out", filepath.Join(tmp, "out"), "--no-proofs", "--quiet"}, &stdout, &stderr)
	require.Equal(t, exitOK, code, stderr.String())
	assert.FileExists(t, filepath.Join(tmp, "out", "print", "print.pdf"))
	assert.FileExists(t, filepath.Join(tmp, "out", "web", "page-001.svg"))
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	require.NoError(t, err)
	return recs[1:]
}

// TestCountBadInput: bad input is exit 2 with the file named, and the
// tables already in --out are left as they were, with no stray files.
func TestCountBadInput(t *testing.T) {
	tmp := t.TempDir()
	out := filepath.Join(tmp, "out")
	require.NoError(t, os.MkdirAll(out, 0o755))
	old := map[string]string{"counts.csv": "term,year,count\nold,1900,1\n", "totals.csv": "year,total\n1900,10\n"}
	for name, text := range old {
		require.NoError(t, os.WriteFile(filepath.Join(out, name), []byte(text), 0o644))
	}
	write := func(dir string, files map[string]string) string {
		p := filepath.Join(tmp, dir)
		for name, text := range files {
			require.NoError(t, os.MkdirAll(filepath.Dir(filepath.Join(p, name)), 0o755))
			require.NoError(t, os.WriteFile(filepath.Join(p, name), []byte(text), 0o644))
		}
		return p
	}
	terms := write("terms", map[string]string{"list.txt": "# terms\nsteam\n\nboiler\n"})
	termList := filepath.Join(terms, "list.txt")
	for _, tc := range []struct {
		name    string
		args    []string
		message string
	}{
		{"not UTF-8", []string{write("latin1", map[string]string{"1900/a.txt": "steam\n", "1901/b.txt": "caf\xe9\n"}), "--terms", termList}, "1901/b.txt:1: byte 3: not valid UTF-8"},
		{"binary", []string{write("binary", map[string]string{"1900/scan.txt": "\x00\x01\x02"}), "--ngrams", "1"}, "1900/scan.txt:1: byte 0: a NUL byte"},
		{"no year", []string{write("noyear", map[string]string{"1900/a.txt": "steam", "extra/notes.txt": "boiler"}), "--terms", termList}, "extra/notes.txt: no year in its path"},
		{"empty", []string{write("empty", map[string]string{"readme.md": "x"}), "--terms", termList}, "the archive is empty"},
		{"missing", []string{filepath.Join(tmp, "nowhere"), "--terms", termList}, "nowhere: cannot read"},
		{"manifest row", []string{filepath.Join(write("manifest", map[string]string{"m.csv": "year,path\n1900,gone.txt\n"}), "m.csv"), "--terms", termList}, "m.csv:2: "},
		{"year pattern", []string{write("pattern", map[string]string{"a.txt": "x"}), "--terms", termList, "--year-pattern", "[0-9]{4}"}, "exactly one capture group"},
		{"no terms option", []string{write("ok", map[string]string{"1900.txt": "steam"})}, "give one of --spec, --terms or --ngrams"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			args := append([]string{"count", "--out", out, "--quiet"}, tc.args...)
			code := run(args, &stdout, &stderr)
			assert.Equal(t, exitBadInput, code)
			assert.Contains(t, filepath.ToSlash(stderr.String()), tc.message)
			assert.Empty(t, stdout.String())
			entries, err := os.ReadDir(out)
			require.NoError(t, err)
			require.Len(t, entries, 2, "no stray files in --out")
			for name, text := range old {
				got, err := os.ReadFile(filepath.Join(out, name))
				require.NoError(t, err)
				assert.Equal(t, text, string(got), "%s untouched", name)
			}
		})
	}
}

// TestCountProgress: the progress line is drawn only when on and after
// the first second, and cleared at the end; off (not a terminal) it says
// nothing.
func TestCountProgress(t *testing.T) {
	var buf bytes.Buffer
	p := &countProgress{w: &buf, on: true, start: time.Now()}
	p.show(1e6, 4e6)
	assert.Empty(t, buf.String(), "nothing in the first second")
	p.start = time.Now().Add(-2 * time.Second)
	p.show(2e6, 4e6)
	assert.Contains(t, buf.String(), "count: 2 of 4 MB (50%)")
	p.end()
	assert.True(t, strings.HasSuffix(buf.String(), "\r\033[K"))

	buf.Reset()
	off := &countProgress{w: &buf, on: false, start: time.Now().Add(-time.Hour)}
	off.show(1, 2)
	off.end()
	assert.Empty(t, buf.String())
}
