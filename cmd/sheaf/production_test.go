package main

// Production (issue 9): manifest, change report, incremental rebuilds,
// staged builds that survive failures and signals, preflight in builds.

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/render/production"
	"sheaf/render/tooltest"
)

// jobSpec is a print spec over the demo's data, small enough to build in
// about a second: the 60 most used terms on A5 pages, 4 columns. extra is added at the top level.
func jobSpec(extra string) string {
	return `title: Production test
date: 2026-01-15
data: {counts: data/counts.csv, totals: data/totals.csv}
years: {from: 1868, to: 2025}
terms: {top: 60}
scale: {values: own-peak}
outputs:
  print:
    kind: print
    trim: A5
    columns: 4
    slug-line: true
    proofs: 40
` + extra
}

// demoData reads the demo's counts and totals once.
var demoData = sync.OnceValues(func() (map[string][]byte, error) {
	out := map[string][]byte{}
	for _, f := range []string{"counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("../../examples/quillmere/data", f))
		if err != nil {
			return nil, err
		}
		out[f] = b
	}
	return out, nil
})

// newJob writes a spec and the demo data into a fresh folder and returns
// the spec's path.
func newJob(t testing.TB, spec string) string {
	t.Helper()
	data, err := demoData()
	require.NoError(t, err)
	dir := t.TempDir()
	require.NoError(t, os.MkdirAll(filepath.Join(dir, "data"), 0o755))
	for name, b := range data {
		require.NoError(t, os.WriteFile(filepath.Join(dir, "data", name), b, 0o644))
	}
	path := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(spec), 0o644))
	return path
}

// buildInto runs `sheaf build` and fails the test on a non-zero exit.
func buildInto(t testing.TB, spec, out string, flags ...string) (stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	args := append([]string{"build", spec, "--out", out}, flags...)
	require.Equal(t, exitOK, run(args, &o, &e), "sheaf %s\n%s", strings.Join(args, " "), e.String())
	return o.String(), e.String()
}

func loadManifest(t testing.TB, dir string) *production.Manifest {
	t.Helper()
	m, err := production.ReadManifest(dir)
	require.NoError(t, err, "manifest in %s", dir)
	require.NotNil(t, m, "manifest in %s", dir)
	return m
}

func loadChanges(t testing.TB, dir string) production.ChangeReport {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, production.ChangesJSON))
	require.NoError(t, err)
	var r production.ChangeReport
	require.NoError(t, json.Unmarshal(b, &r))
	return r
}

// nudgeCount changes one count of term in a counts CSV: in a year well
// below the term's peak, so the peak year, and with it the panel order,
// stays. It adds a twentieth of the peak count (at least one), so the line
// moves visibly (past the 0.1 px SVG rounding) even where the demo's counts
// run to thousands. It returns the year.
func nudgeCount(t testing.TB, spec, term string) int {
	t.Helper()
	path := filepath.Join(filepath.Dir(spec), "data", "counts.csv")
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	re := regexp.MustCompile(fmt.Sprintf(`(?m)^%s,(\d+),(\d+)\r?$`, regexp.QuoteMeta(term)))
	rows := re.FindAllSubmatchIndex(b, -1)
	top := 0
	for _, r := range rows {
		top = max(top, atoi(b[r[4]:r[5]]))
	}
	// The latest such year: its total is among the largest, so the bump
	// moves the term's share least and never makes a new peak (a bump in
	// a thin early year could, and reorder a peak-year layout).
	for k := len(rows) - 1; k >= 0; k-- {
		r := rows[k]
		if n := atoi(b[r[4]:r[5]]); n > 0 && n < top/2 {
			out := append(append(append([]byte{}, b[:r[4]]...), fmt.Sprint(n+max(1, top/20))...), b[r[5]:]...)
			require.NoError(t, os.WriteFile(path, out, 0o644))
			return atoi(b[r[2]:r[3]])
		}
	}
	require.Failf(t, "no row to bump", "no row of %s below half its peak in %s", term, path)
	return 0
}

func atoi(b []byte) int {
	n := 0
	for _, c := range b {
		n = n*10 + int(c-'0')
	}
	return n
}

// countEncodes installs buildHooks.BeforeEncode to count pages drawn for PDFs.
func countEncodes(t *testing.T) *[]string {
	var mu sync.Mutex
	var got []string
	buildHooks.BeforeEncode = func(output string, page int) error {
		mu.Lock()
		defer mu.Unlock()
		got = append(got, fmt.Sprintf("%s p. %d", output, page))
		return nil
	}
	t.Cleanup(func() { buildHooks.BeforeEncode = nil })
	return &got
}

// snapshot reads every file under dir (relative path → bytes).
func snapshot(t testing.TB, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		r, _ := filepath.Rel(dir, p)
		out[r] = b
		return nil
	})
	require.NoError(t, err)
	return out
}

func sameTree(t testing.TB, a, b map[string][]byte, skip func(string) bool) {
	t.Helper()
	for p, x := range a {
		if skip != nil && skip(p) {
			continue
		}
		y, ok := b[p]
		if assert.True(t, ok, "%s: missing in the second tree", p) {
			assert.Equal(t, x, y, "%s: bytes differ", p)
		}
	}
	for p := range b {
		if skip == nil || !skip(p) {
			assert.Contains(t, a, p, "%s: only in the second tree", p)
		}
	}
}

// noStages fails when a stage folder is left beside dir.
func noStages(t testing.TB, dir string) {
	t.Helper()
	entries, _ := os.ReadDir(filepath.Dir(dir))
	for _, e := range entries {
		assert.NotContains(t, e.Name(), production.StageMark, "stage left behind: %s", e.Name())
	}
}

// TestManifestHashes checks every SHA-256 in the manifest against
// coreutils' sha256sum (FIPS 180-4 SHA-256, an independent
// implementation) and every size against the file system.
func TestManifestHashes(t *testing.T) {
	sum := tooltest.Require(t, "sha256sum", "coreutils")
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	m := loadManifest(t, out)
	check := func(path, want string) {
		t.Helper()
		b, err := exec.Command(sum, path).Output()
		require.NoError(t, err, "sha256sum %s: %v", path, err)
		got, _, _ := strings.Cut(string(b), " ")
		assert.Equal(t, got, want, "%s: the manifest's hash, and sha256sum's (GNU coreutils)", path)
	}
	pages := len(m.Outputs[0].Pages)
	require.Equal(t, version, m.Sheaf)
	require.GreaterOrEqual(t, pages, 2)
	require.Len(t, m.Files, 1+pages+1, "PDF, proofs, contact sheet")
	for _, f := range m.Files {
		p := filepath.Join(out, filepath.FromSlash(f.Path))
		check(p, f.SHA256)
		fi, err := os.Stat(p)
		if assert.NoError(t, err, f.Path) {
			assert.Equal(t, fi.Size(), f.Size, "%s: size in the manifest, and stat's", f.Path)
		}
	}
	check(spec, m.Spec.SHA256)
	for _, d := range m.Data {
		check(filepath.Join(filepath.Dir(spec), d.Path), d.SHA256)
	}
	pdf := m.File("print/print.pdf")
	require.NotNil(t, pdf, "the PDF's entry")
	require.Len(t, pdf.Pages, pages)
	require.Equal(t, "print", pdf.Output)
	n := 0
	for _, p := range pdf.Pages {
		n += len(p.Terms)
		assert.Equal(t, 64, len(p.Inputs), "page %d inputs %q", p.Page, p.Inputs)
	}
	assert.Equal(t, 60, n, "terms on pages (terms: {top: 60})")
	assert.Len(t, m.Terms, 60, "terms in the manifest")
	// The Go fonts are listed, by hash, with no path.
	if assert.Len(t, m.Fonts, 3) {
		assert.Empty(t, m.Fonts[0].Path)
		assert.NotEmpty(t, m.Fonts[0].Name)
	}
	r := loadChanges(t, out)
	assert.True(t, r.FirstBuild, "first build")
	assert.Len(t, r.Files.Added, len(m.Files), "every file added")
	noStages(t, out)
}

// TestIncremental changes one count of one term and rebuilds: the report
// names exactly that term and its page, only that page is encoded and
// proofed again, and every file equals a clean full build's, byte for
// byte. A rebuild with no change encodes nothing and reports nothing.
func TestIncremental(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	first := loadManifest(t, out)
	pages := len(first.Outputs[0].Pages)

	// Unchanged rebuild.
	encodes := countEncodes(t)
	before := snapshot(t, out)
	_, stderr := buildInto(t, spec, out, "--quiet")
	assert.Empty(t, *encodes, "unchanged rebuild encoded %v", *encodes)
	assert.Contains(t, stderr, "nothing changed since the last build", "stderr:\n%s", stderr)
	r := loadChanges(t, out)
	assert.False(t, r.FirstBuild)
	assert.Zero(t, len(r.Files.Changed)+len(r.Files.Added)+len(r.Files.Removed)+len(r.Terms)+len(r.Pages), "changes in %+v", r)
	assert.Equal(t, pages, r.Work[0].Reused, "pages reused")
	assert.Equal(t, pages, r.Work[0].ProofsReused, "proofs kept")
	sameTree(t, before, snapshot(t, out), func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText })

	// Pick a term on page 2 and change one year.
	p2 := first.Outputs[0].Pages[1]
	term := p2.Terms[len(p2.Terms)/2]
	nudgeCount(t, spec, term)
	*encodes = nil
	_, stderr = buildInto(t, spec, out, "--quiet")
	assert.Equal(t, []string{"print p. 2"}, *encodes, "pages encoded")
	r = loadChanges(t, out)
	if assert.Len(t, r.Terms, 1) {
		assert.Equal(t, term, r.Terms[0].Term)
		assert.Equal(t, "changed", r.Terms[0].Change)
		assert.Equal(t, []string{"print p. 2"}, r.Terms[0].Pages)
	}
	if assert.Len(t, r.Pages, 1) {
		assert.Equal(t, "print/print.pdf", r.Pages[0].File)
		assert.Equal(t, []int{2}, r.Pages[0].Pages)
	}
	assert.Equal(t, []string{"print/contact.png", "print/print.pdf", "print/proofs/page-002.png"}, r.Files.Changed)
	assert.Len(t, r.Files.Unchanged, pages-1)
	assert.False(t, r.SpecChanged)
	assert.Equal(t, []string{"data/counts.csv"}, r.DataChanged)
	w := r.Work[0]
	assert.Equal(t, 1, w.Encoded, "pages encoded")
	assert.Equal(t, pages-1, w.Reused, "pages reused")
	assert.Equal(t, 1, w.ProofsDrawn, "proofs drawn")
	assert.Equal(t, pages-1, w.ProofsReused, "proofs kept")
	for _, s := range []string{fmt.Sprintf("changed %q: print p. 2", term), fmt.Sprintf("print/print.pdf: pages 2 of %d", pages)} {
		assert.Contains(t, stderr, s, "stderr lacks %q:\n%s", s, stderr)
	}
	text, _ := os.ReadFile(filepath.Join(out, production.ChangesText))
	assert.Contains(t, string(text), fmt.Sprintf("changed %q: print p. 2", term), "changes.txt:\n%s", text)

	// A clean full build of the same inputs elsewhere.
	clean := filepath.Join(t.TempDir(), "clean")
	buildInto(t, spec, clean, "--quiet", "--full")
	sameTree(t, snapshot(t, clean), snapshot(t, out), func(p string) bool {
		return p == production.ChangesJSON || p == production.ChangesText
	})
	noStages(t, out)
}

// TestFailedBuildKeepsPrevious makes page 2's drawing fail in a rebuild:
// the build exits 1 and the folder holds the previous build, byte for
// byte, with no stage left.
func TestFailedBuildKeepsPrevious(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	before := snapshot(t, out)
	buildHooks.BeforeEncode = func(output string, page int) error {
		if page == 2 {
			return errors.New("injected failure")
		}
		return nil
	}
	defer func() { buildHooks.BeforeEncode = nil }()
	var o, e bytes.Buffer
	code := run([]string{"build", spec, "--out", out, "--full", "--quiet"}, &o, &e)
	assert.Equal(t, exitFindings, code)
	assert.Contains(t, e.String(), "page 2: injected failure")
	assert.Contains(t, e.String(), "nothing was changed in")
	assert.Zero(t, o.Len(), "stdout: %s", o.String())
	sameTree(t, before, snapshot(t, out), nil)
	noStages(t, out)

	// A failure at the very end, after everything is written to the stage.
	buildHooks.BeforeEncode = nil
	buildHooks.BeforeCommit = func(string) error { return errors.New("injected failure before the swap") }
	defer func() { buildHooks.BeforeCommit = nil }()
	nudgeCount(t, spec, loadManifest(t, out).Terms[0].Term)
	assert.Equal(t, exitFindings, run([]string{"build", spec, "--out", out, "--quiet"}, &o, &e))
	sameTree(t, before, snapshot(t, out), nil)
	noStages(t, out)
}

// TestOnlyKeepsOtherOutputs builds two outputs, then only one after a
// data change: the other's files stay, byte for byte, and stay in the
// manifest; files sheaf never wrote in the folder stay too.
func TestOnlyKeepsOtherOutputs(t *testing.T) {
	spec := newJob(t, jobSpec("")+`  second:
    kind: print
    trim: A4
    columns: 6
    proofs: 30
`)
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	// A folder sheaf did not write (as `sheaf palette` would).
	os.MkdirAll(filepath.Join(out, "palette"), 0o755)
	os.WriteFile(filepath.Join(out, "palette", "swatch.png"), []byte("not ours"), 0o644)
	before := snapshot(t, out)
	m0 := loadManifest(t, out)

	nudgeCount(t, spec, m0.Terms[0].Term)
	buildInto(t, spec, out, "--quiet", "--only", "print")
	after := snapshot(t, out)
	for p, b := range before {
		if strings.HasPrefix(p, "second/") || strings.HasPrefix(p, "palette/") || strings.HasPrefix(p, ".cache/second/") {
			assert.Equal(t, b, after[p], "%s changed or went missing", p)
		}
	}
	m := loadManifest(t, out)
	require.Len(t, m.Outputs, 2)
	assert.Equal(t, "second", m.Outputs[1].Name)
	require.NotNil(t, m.File("second/second.pdf"), "second's PDF is kept")
	assert.Nil(t, m.File("palette/swatch.png"), "a file sheaf did not write is not in the manifest")
	assert.True(t, equalJSON(m.Outputs[1], m0.Outputs[1]), "second's entry is kept")
	assert.NotEmpty(t, m.File("second/second.pdf").Pages)
	// A whole build again: the palette folder still stays.
	buildInto(t, spec, out, "--quiet")
	b, err := os.ReadFile(filepath.Join(out, "palette", "swatch.png"))
	require.NoError(t, err, "the foreign file stays")
	assert.Equal(t, "not ours", string(b))
}

// TestStrictPreflight: a 4 pt label and a 0.1 pt line are found by
// check and build; strict stops the build before anything is written.
func TestStrictPreflight(t *testing.T) {
	spec := newJob(t, strings.Replace(jobSpec(""), "    proofs: 40\n", "    proofs: 40\n    type: {label: 4pt}\n    line: 0.1pt\n", 1))
	out := filepath.Join(filepath.Dir(spec), "out")
	var o, e bytes.Buffer
	require.Equal(t, exitFindings, run([]string{"build", spec, "--out", out, "--strict"}, &o, &e), e.String())
	for _, s := range []string{"warning  type-floor", "warning  line-floor", "strict preflight: stopped"} {
		assert.Contains(t, e.String(), s, "stderr lacks %q:\n%s", s, e.String())
	}
	assert.NoDirExists(t, out, "a strict build that stopped writes nothing")
	noStages(t, out)

	o.Reset()
	e.Reset()
	assert.Equal(t, exitFindings, run([]string{"check", spec, "--json", "--strict"}, &o, &e), "check --strict")
	var rep feature.Report
	require.NoError(t, json.Unmarshal(o.Bytes(), &rep))
	ids := map[string]bool{}
	for _, f := range rep.Preflight {
		ids[f.ID] = true
	}
	assert.True(t, ids["type-floor"], "check --json lists type-floor")
	assert.True(t, ids["line-floor"], "check --json lists line-floor")
	// Without strict the build goes ahead, warning.
	_, stderr := buildInto(t, spec, out, "--quiet")
	assert.Contains(t, stderr, "type-floor", "build stderr lacks the finding:\n%s", stderr)
}

// TestProgress: silent when not a terminal; on a terminal, a line after
// the delay, redrawn no faster than progressEvery, cleared at the end.
func TestProgress(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(&buf, false)
	p.Begin("print: PDF pages", 3)
	p.Step()
	p.done()
	assert.Zero(t, buf.Len(), "not a terminal, yet %q", buf.String())

	now := time.Unix(0, 0)
	p = &progress{w: &buf, on: true, start: now, now: func() time.Time { return now }}
	p.Begin("print: PDF pages", 3)
	p.Step() // before the delay: nothing
	now = now.Add(progressDelay)
	p.Step() // drawn
	now = now.Add(progressEvery / 2)
	p.Step() // last step: always drawn
	p.done()
	want := "\rprint: PDF pages 2/3\rprint: PDF pages 3/3\r                    \r"
	assert.Equal(t, want, buf.String(), "progress wrote %q, want %q", buf.String(), want)
}

// equalJSON compares two values by their JSON.
func equalJSON(a, b any) bool {
	x, _ := json.Marshal(a)
	y, _ := json.Marshal(b)
	return bytes.Equal(x, y)
}
