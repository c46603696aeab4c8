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
	"sheaf/render/production"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"
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
	if err != nil {
		t.Fatal(err)
	}
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
	t.Fatal("no unselected term with a hundred rows")
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
	if err := os.WriteFile(spec, []byte(jobSpec(reuseOutputs)+inserts), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(filepath.Dir(spec), "out")
	draws := countDraws(t)
	stderrDrawing(t)
	_, stderr := buildInto(t, spec, out)
	if want := "[web insert col insert pair insert other insert outside]"; fmt.Sprint(*draws) != want {
		t.Errorf("first build drew %v, want %s", *draws, want)
	}
	// Progress covers the screen output and the inserts (done of total,
	// the current output).
	for _, s := range []string{"\rweb: SVG pages 1/1", "\rweb: PNG bands 17/17", "\rweb: panel files 60/60", "\rinserts 4/4", "\rprint: PDF pages"} {
		if !strings.Contains(stderr, s) {
			t.Errorf("progress lacks %q:\n%q", s, stderr)
		}
	}
	first := loadManifest(t, out)
	if o := first.Output("web"); o == nil || len(o.Inputs) != 64 || len(first.Inserts) != 4 {
		t.Fatalf("manifest: web %+v, inserts %+v", o, first.Inserts)
	}

	// Unchanged: nothing drawn, every file as it was, carried by link.
	*draws = nil
	encodes := countEncodes(t)
	before := snapshot(t, out)
	beforeInfo, _ := os.Stat(filepath.Join(out, "web", "page-001@2x.png"))
	_, stderr = buildInto(t, spec, out)
	if len(*draws)+len(*encodes) != 0 {
		t.Errorf("unchanged rebuild drew %v and encoded %v", *draws, *encodes)
	}
	sameTree(t, before, snapshot(t, out), func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText })
	if afterInfo, err := os.Stat(filepath.Join(out, "web", "page-001@2x.png")); err != nil || !os.SameFile(beforeInfo, afterInfo) {
		t.Errorf("the 2× PNG was written again, not carried over (%v)", err)
	}
	for _, s := range []string{"nothing changed since the last build", "web: 1 page, reused (inputs unchanged)",
		"insert col: reused (inputs unchanged)", "insert outside: reused (inputs unchanged)", "\rweb: reusing files"} {
		if !strings.Contains(stderr, s) {
			t.Errorf("stderr lacks %q:\n%s", s, stderr)
		}
	}
	r := loadChanges(t, out)
	for _, w := range r.Work {
		if w.ProofsDrawn != 0 || w.Encoded != 0 || w.Kind != "print" && w.Whole != "reused (inputs unchanged)" {
			t.Errorf("unchanged rebuild work %+v", w)
		}
	}
	if len(r.Work) != 6 {
		t.Errorf("work has %d entries, want 6 (print, web, four inserts)", len(r.Work))
	}

	// One count of t1 (on print, web and in col and pair): exactly those
	// are drawn again.
	nudgeCount(t, spec, t1)
	*draws, *encodes = nil, nil
	_, stderr = buildInto(t, spec, out, "--quiet")
	if want := "[web insert col insert pair]"; fmt.Sprint(*draws) != want {
		t.Errorf("drew %v, want %s", *draws, want)
	}
	if len(*encodes) != 1 {
		t.Errorf("encoded %v, want the one print page", *encodes)
	}
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
		if !strings.Contains(string(text), s) {
			t.Errorf("changes.txt lacks %q:\n%s", s, text)
		}
	}
	if bytes.Contains(text, []byte(" of 0\n")) || bytes.Contains(text, []byte("inserts/other.svg: redrawn")) {
		t.Errorf("changes.txt:\n%s", text)
	}
	if !strings.Contains(stderr, place) {
		t.Errorf("stderr lacks %q:\n%s", place, stderr)
	}
	r = loadChanges(t, out)
	if len(r.Graphics) != 4 || r.Graphics[0].Insert != "col" || len(r.Pages) != 1 || r.Pages[0].File != "print/print.pdf" {
		t.Errorf("graphics %+v, pages %+v", r.Graphics, r.Pages)
	}
	// Files carry their terms: a screen page its page, an insert its
	// terms, a panel file its term.
	if f := m.File("web/page-001@2x.png"); f == nil || len(f.Pages) != 1 || len(f.Pages[0].Terms) != 60 {
		t.Errorf("web 2× PNG entry %+v", f)
	}
	if f := m.File("inserts/pair.png"); f == nil || f.Insert != "pair" || fmt.Sprint(f.Terms) != fmt.Sprint([]string{t1, t2}) {
		t.Errorf("pair PNG entry %+v", f)
	}
	if f := m.File("web/panels/" + production.Slug(t1) + ".svg"); f == nil || fmt.Sprint(f.Terms) != fmt.Sprint([]string{t1}) {
		t.Errorf("panel file entry %+v", f)
	}

	// A term only an insert shows: listed with that insert.
	nudgeCount(t, spec, u)
	*draws = nil
	buildInto(t, spec, out, "--quiet")
	if want := "[insert outside]"; fmt.Sprint(*draws) != want {
		t.Errorf("drew %v, want %s", *draws, want)
	}
	r = loadChanges(t, out)
	if len(r.Terms) != 1 || r.Terms[0].Term != u || fmt.Sprint(r.Terms[0].Pages) != "[insert outside]" {
		t.Errorf("terms %+v, want %q on insert outside", r.Terms, u)
	}

	// The same bytes as a clean full build.
	clean := filepath.Join(t.TempDir(), "clean")
	buildInto(t, spec, clean, "--quiet", "--full")
	skip := func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText }
	sameTree(t, snapshot(t, clean), snapshot(t, out), skip)

	// A file altered after the build: the output is drawn again.
	if err := os.WriteFile(filepath.Join(out, "web", "page-001.png"), []byte("edited"), 0o644); err != nil {
		t.Fatal(err)
	}
	*draws = nil
	_, stderr = buildInto(t, spec, out)
	if want := "[web]"; fmt.Sprint(*draws) != want || !strings.Contains(stderr, "web: 1 page, drawn (a file of the last build is missing or altered)") {
		t.Errorf("drew %v; stderr:\n%s", *draws, stderr)
	}
	sameTree(t, snapshot(t, clean), snapshot(t, out), skip)

	// --full draws everything.
	*draws = nil
	buildInto(t, spec, out, "--quiet", "--full")
	if len(*draws) != 5 {
		t.Errorf("--full drew %v", *draws)
	}
	if r := loadChanges(t, out); !r.Nothing() || !strings.HasPrefix(r.Work[1].Whole, "drawn (--full)") {
		t.Errorf("--full rebuild report %+v", r)
	}
	noStages(t, out)
}

// TestOutIsFile: --out naming a file (or a path under one) is bad input,
// said once, before anything is read.
func TestOutIsFile(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	file := filepath.Join(filepath.Dir(spec), "somefile")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ out, want string }{
		{file, fmt.Sprintf("sheaf build: --out %s is a file; give a folder\n", file)},
		{filepath.Join(file, "sub"), fmt.Sprintf("sheaf build: --out %s: %s is a file; give a folder\n", filepath.Join(file, "sub"), file)},
	} {
		var o, e bytes.Buffer
		code := run([]string{"build", spec, "--out", c.out, "--quiet"}, &o, &e)
		if code != exitBadInput || e.String() != c.want || o.Len() != 0 {
			t.Errorf("--out %s: exit %d, stderr %q, want exit %d and %q", c.out, code, e.String(), exitBadInput, c.want)
		}
	}
	if b, _ := os.ReadFile(file); string(b) != "x" {
		t.Errorf("the file was touched: %q", b)
	}
}
