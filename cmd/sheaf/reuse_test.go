package main

// Whole-output reuse: screen outputs and inserts whose inputs did not
// change are carried over from the last build instead of drawn again.

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/production"
)

// reuseOutputs adds a scrolling web output with panel files to jobSpec's
// print output.
const reuseOutputs = `  web:
    kind: screen
    trim: 900px
    panel-files: true
`

// countDraws installs buildHooks.BeforeDraw to list the screen outputs and inserts
// drawn.
func countDraws(t *testing.T) *[]string {
	var mu sync.Mutex
	var got []string
	buildHooks.BeforeDraw = func(unit string) error {
		mu.Lock()
		defer mu.Unlock()
		got = append(got, unit)
		return nil
	}
	t.Cleanup(func() { buildHooks.BeforeDraw = nil })
	return &got
}

// outsideTerm returns a term of the counts table that the spec does not
// select, from the lower half of the table (so one more count cannot
// bring it into the top 60).
func outsideTerm(t *testing.T, spec string, selected []production.TermHash) string {
	t.Helper()
	f, err := os.Open(filepath.Join(filepath.Dir(spec), "data", "counts.csv"))
	require.NoError(t, err)
	defer f.Close()
	sel := map[string]bool{}
	for _, s := range selected {
		sel[s.Term] = true
	}
	rows := map[string]int{}
	var order []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		term, _, _ := strings.Cut(sc.Text(), ",")
		if rows[term] == 0 {
			order = append(order, term)
		}
		rows[term]++
	}
	for _, term := range order[len(order)/2:] {
		if !sel[term] && rows[term] > 100 && !strings.ContainsAny(term, `",:[]{}#`) {
			return term
		}
	}
	require.Fail(t, "no unselected term with a hundred rows")
	return ""
}

// stderrDrawing shows a progress line on a writer that is no terminal:
// always past the delay, so every begin and last step is drawn.
func stderrDrawing(t *testing.T) {
	progressFor = func(w io.Writer, quiet bool) *progress {
		return &progress{w: w, on: true, start: time.Unix(0, 0), now: func() time.Time { return time.Unix(100, 0) }}
	}
	t.Cleanup(func() { progressFor = newProgress })
}

// TestWholeOutputReuse builds a print output, a screen output and four
// inserts (one in print, three on screen; one showing a term the feature
// does not select). An unchanged rebuild draws nothing and leaves every
// file byte-identical (the same files, linked); a changed count redraws
// exactly the screen output and inserts that show the term, says so, and
// gives the same bytes as a clean full build; a damaged file is drawn
// again; --full draws everything.
func TestWholeOutputReuse(t *testing.T) {
	spec := newJob(t, jobSpec(reuseOutputs))
	learn := filepath.Join(t.TempDir(), "learn")
	buildInto(t, spec, learn, "--quiet", "--no-proofs")
	m0 := loadManifest(t, learn)
	pg := m0.Outputs[0].Pages[len(m0.Outputs[0].Pages)-1]
	t1, t2, t3 := pg.Terms[0], pg.Terms[len(pg.Terms)-1], m0.Outputs[0].Pages[0].Terms[0]
	u := outsideTerm(t, spec, m0.Terms)
	inserts := fmt.Sprintf(`inserts:
  col:
    output: print
    size: 60mm x 45mm
    terms: [%q]
  pair:
    output: web
    size: 480px x 300px
    terms: [%q, %q]
  other:
    output: web
    size: 480px x 300px
    terms: [%q]
  outside:
    output: web
    size: 480px x 300px
    terms: [%q]
`, t1, t1, t2, t3, u)
	require.NoError(t, os.WriteFile(spec, []byte(jobSpec(reuseOutputs)+inserts), 0o644))
	out := filepath.Join(filepath.Dir(spec), "out")
	draws := countDraws(t)
	stderrDrawing(t)
	_, stderr := buildInto(t, spec, out)
	assert.Equal(t, []string{"web", "insert col", "insert pair", "insert other", "insert outside"}, *draws, "the first build draws")
	// Progress covers the screen output and the inserts (done of total,
	// the current output).
	for _, s := range []string{"\rweb: SVG pages 1/1", "\rweb: PNG bands 17/17", "\rweb: panel files 60/60", "\rinserts 4/4", "\rprint: PDF pages"} {
		assert.Contains(t, stderr, s, "progress lacks %q:\n%q", s, stderr)
	}
	first := loadManifest(t, out)
	require.NotNil(t, first.Output("web"), "the web output's entry")
	require.Len(t, first.Output("web").Inputs, 64, "a SHA-256 in hex")
	require.Len(t, first.Inserts, 4)

	// Unchanged: nothing drawn, every file as it was, carried by link.
	*draws = nil
	encodes := countEncodes(t)
	before := snapshot(t, out)
	beforeInfo, _ := os.Stat(filepath.Join(out, "web", "page-001@2x.png"))
	_, stderr = buildInto(t, spec, out)
	assert.Equal(t, 0, len(*draws)+len(*encodes), "unchanged rebuild drew %v and encoded %v", *draws, *encodes)
	sameTree(t, before, snapshot(t, out), func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText })
	afterInfo, err := os.Stat(filepath.Join(out, "web", "page-001@2x.png"))
	require.NoError(t, err)
	assert.True(t, os.SameFile(beforeInfo, afterInfo), "the 2× PNG is carried over (the same file), not written again")
	for _, s := range []string{"nothing changed since the last build", "web: 1 page, reused (inputs unchanged)",
		"insert col: reused (inputs unchanged)", "insert outside: reused (inputs unchanged)", "\rweb: reusing files"} {
		assert.Contains(t, stderr, s, "stderr lacks %q:\n%s", s, stderr)
	}
	r := loadChanges(t, out)
	for _, w := range r.Work {
		assert.Zero(t, w.ProofsDrawn, "%+v", w)
		assert.Zero(t, w.Encoded, "%+v", w)
		if w.Kind != "print" {
			assert.Equal(t, "reused (inputs unchanged)", w.Whole, "%+v", w)
		}
	}
	assert.Equal(t, 6, len(r.Work), "work has %d entries, want 6 (print, web, four inserts)", len(r.Work))

	// One count of t1 (on print, web and in col and pair): exactly those
	// are drawn again.
	nudgeCount(t, spec, t1)
	*draws, *encodes = nil, nil
	_, stderr = buildInto(t, spec, out, "--quiet")
	assert.Equal(t, []string{"web", "insert col", "insert pair"}, *draws, "drawn again")
	assert.Equal(t, 1, len(*encodes), "encoded %v, want the one print page", *encodes)
	m := loadManifest(t, out)
	var at []string
	for _, p := range m.Outputs[0].Pages {
		if slices.Contains(p.Terms, t1) {
			at = append(at, fmt.Sprintf("print p. %d", p.Page))
		}
	}
	place := fmt.Sprintf("changed %q: %s, web p. 1, insert col, insert pair", t1, strings.Join(at, ", "))
	text, _ := os.ReadFile(filepath.Join(out, production.ChangesText))
	for _, s := range []string{place, "inserts/col.pdf: redrawn (its terms' data changed)",
		"inserts/pair.svg: redrawn (its terms' data changed)", "web: 1 page, drawn (inputs changed)",
		"insert col: drawn (inputs changed)", "insert other: reused (inputs unchanged)"} {
		assert.Contains(t, string(text), s, "changes.txt lacks %q:\n%s", s, text)
	}
	assert.NotContains(t, string(text), " of 0\n", "changes.txt")
	assert.NotContains(t, string(text), "inserts/other.svg: redrawn", "changes.txt")
	assert.Contains(t, stderr, place, "stderr lacks %q:\n%s", place, stderr)
	r = loadChanges(t, out)
	if assert.Len(t, r.Graphics, 4) {
		assert.Equal(t, "col", r.Graphics[0].Insert)
	}
	if assert.Len(t, r.Pages, 1) {
		assert.Equal(t, "print/print.pdf", r.Pages[0].File)
	}
	// Files carry their terms: a screen page its page, an insert its
	// terms, a panel file its term.
	if f := m.File("web/page-001@2x.png"); assert.NotNil(t, f, "web 2× PNG entry") && assert.Len(t, f.Pages, 1) {
		assert.Len(t, f.Pages[0].Terms, 60)
	}
	if f := m.File("inserts/pair.png"); assert.NotNil(t, f, "pair PNG entry") {
		assert.Equal(t, "pair", f.Insert)
		assert.Equal(t, []string{t1, t2}, f.Terms)
	}
	if f := m.File("web/panels/" + production.Slug(t1) + ".svg"); assert.NotNil(t, f, "panel file entry") {
		assert.Equal(t, []string{t1}, f.Terms)
	}

	// A term only an insert shows: listed with that insert.
	nudgeCount(t, spec, u)
	*draws = nil
	buildInto(t, spec, out, "--quiet")
	assert.Equal(t, []string{"insert outside"}, *draws, "drawn again")
	r = loadChanges(t, out)
	if assert.Len(t, r.Terms, 1) {
		assert.Equal(t, u, r.Terms[0].Term)
		assert.Equal(t, []string{"insert outside"}, r.Terms[0].Pages)
	}

	// The same bytes as a clean full build.
	clean := filepath.Join(t.TempDir(), "clean")
	buildInto(t, spec, clean, "--quiet", "--full")
	skip := func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText }
	sameTree(t, snapshot(t, clean), snapshot(t, out), skip)

	// A file altered after the build: the output is drawn again.
	require.NoError(t, os.WriteFile(filepath.Join(out, "web", "page-001.png"), []byte("edited"), 0o644))
	*draws = nil
	_, stderr = buildInto(t, spec, out)
	assert.Equal(t, []string{"web"}, *draws, "drawn again")
	assert.Contains(t, stderr, "web: 1 page, drawn (a file of the last build is missing or altered)")
	sameTree(t, snapshot(t, clean), snapshot(t, out), skip)

	// --full draws everything.
	*draws = nil
	buildInto(t, spec, out, "--quiet", "--full")
	assert.Equal(t, 5, len(*draws), "--full drew %v", *draws)
	r = loadChanges(t, out)
	assert.True(t, r.Nothing(), "a --full rebuild changes no file")
	assert.True(t, strings.HasPrefix(r.Work[1].Whole, "drawn (--full)"), r.Work[1].Whole)
	noStages(t, out)
}

// TestOutIsFile: --out naming a file (or a path under one) is bad input,
// said once, before anything is read.
func TestOutIsFile(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	file := filepath.Join(filepath.Dir(spec), "somefile")
	require.NoError(t, os.WriteFile(file, []byte("x"), 0o644))
	for _, c := range []struct{ out, want string }{
		{file, fmt.Sprintf("sheaf build: --out %s is a file; give a folder\n", file)},
		{filepath.Join(file, "sub"), fmt.Sprintf("sheaf build: --out %s: %s is a file; give a folder\n", filepath.Join(file, "sub"), file)},
	} {
		var o, e bytes.Buffer
		code := run([]string{"build", spec, "--out", c.out, "--quiet"}, &o, &e)
		assert.Equal(t, exitBadInput, code, "--out %s", c.out)
		assert.Equal(t, c.want, e.String(), "--out %s", c.out)
		assert.Zero(t, o.Len(), "--out %s", c.out)
	}
	b, _ := os.ReadFile(file)
	assert.Equal(t, "x", string(b), "the file is untouched")
}
