package main

// Reflow in the change report (issue 15, items 1 and 2): a change that
// moves panels says which moved from where to where, why each page
// changed, and one summary line; an unchanged term's panel file stays
// byte-identical wherever its panel lands.

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/production"
)

// reflowSpec: the small print job ordered by peak year, with a web
// output that writes panel files.
func reflowSpec() string {
	return jobSpec(reuseOutputs + "order: peak-year\n")
}

// editCounts rewrites the counts table line by line: keep returns the
// line to write ("" drops it); extra lines go at the end.
func editCounts(t *testing.T, spec string, keep func(term string, year, count int, line string) string, extra ...string) {
	t.Helper()
	path := filepath.Join(filepath.Dir(spec), "data", "counts.csv")
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	lines := strings.Split(strings.TrimRight(string(b), "\n"), "\n")
	var out []string
	for i, l := range lines {
		if i == 0 {
			out = append(out, l)
			continue
		}
		k := strings.LastIndexByte(l, ',')
		j := strings.LastIndexByte(l[:k], ',')
		year, _ := strconv.Atoi(l[j+1 : k])
		count, _ := strconv.Atoi(l[k+1:])
		if s := keep(l[:j], year, count, l); s != "" {
			out = append(out, s)
		}
	}
	out = append(out, extra...)
	require.NoError(t, os.WriteFile(path, []byte(strings.Join(out, "\n")+"\n"), 0o644))
}

// panelFiles reads every panel file of the web output, by name.
func panelFilesOf(t *testing.T, out string) map[string][]byte {
	t.Helper()
	files, err := filepath.Glob(filepath.Join(out, "web", "panels", "*.svg"))
	require.NoError(t, err)
	m := map[string][]byte{}
	for _, f := range files {
		b, err := os.ReadFile(f)
		require.NoError(t, err)
		m[filepath.Base(f)] = b
	}
	return m
}

func slotOf(m *production.Manifest, output, term string) (page, slot int) {
	for _, p := range m.Output(output).Pages {
		for k, t := range p.Terms {
			if t == term {
				return p.Page, k + 1
			}
		}
	}
	return 0, 0
}

// TestReflowPeakMoves: one count raised above a term's peak, early in the
// span, moves the term's peak and so its panel under `order: peak-year`.
func TestReflowPeakMoves(t *testing.T) {
	spec := newJob(t, reflowSpec())
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out)
	before := loadManifest(t, out)
	panelsBefore := panelFilesOf(t, out)
	// A term on the last page: its peak moved to the span's first decade
	// carries it to page 1, and every panel between shifts one slot.
	last := before.Output("print").Pages[len(before.Output("print").Pages)-1]
	term := last.Terms[len(last.Terms)/2]
	fromPage, fromSlot := slotOf(before, "print", term)
	peakBefore := 0
	for _, th := range before.Terms {
		if th.Term == term {
			peakBefore = th.Peak
		}
	}
	require.NotZero(t, peakBefore)
	editCounts(t, spec, func(tm string, year, count int, line string) string {
		if tm == term && year == 1870 {
			return ""
		}
		return line
	}, fmt.Sprintf("%s,1870,1000000", term))
	_, stderr := buildInto(t, spec, out)
	after := loadManifest(t, out)
	r := loadChanges(t, out)
	toPage, toSlot := slotOf(after, "print", term)
	require.Less(t, toPage, fromPage, "the term's panel moves to an earlier page")

	// The term's own change, with its peak before and after.
	require.Len(t, r.Terms, 1)
	assert.Equal(t, "changed", r.Terms[0].Change)
	assert.Equal(t, peakBefore, r.Terms[0].PeakFrom)
	assert.Equal(t, 1870, r.Terms[0].PeakTo)

	// Its move, from where to where.
	var moved *production.PanelMove
	movedOnPrint := 0
	for i, m := range r.Moves {
		if m.Term == term && m.To.Output == "print" {
			moved = &r.Moves[i]
		}
		if m.From != nil && m.To != nil && m.To.Output == "print" {
			movedOnPrint++
		}
	}
	require.NotNil(t, moved)
	assert.Equal(t, production.Slot{Output: "print", Page: fromPage, Slot: fromSlot}, *moved.From)
	assert.Equal(t, production.Slot{Output: "print", Page: toPage, Slot: toSlot}, *moved.To)
	// Every panel from its new slot up to its old one shifted one slot on.
	shifted := 0
	for _, p := range before.Output("print").Pages {
		for k := range p.Terms {
			at := (p.Page-1)*100 + k
			if at >= (toPage-1)*100+toSlot-1 && at < (fromPage-1)*100+fromSlot-1 {
				shifted++
			}
		}
	}
	assert.Equal(t, shifted+1, movedOnPrint, "the term and every panel it pushed")

	// Why each page changed: the new page has the term's data, the pages
	// between only reflow.
	why := map[int][]string{}
	for _, p := range r.PageReasons {
		if p.Output == "print" {
			why[p.Page] = p.Why
		}
	}
	assert.Contains(t, why[toPage], "data")
	for pg := toPage + 1; pg < fromPage; pg++ {
		assert.Equal(t, []string{"reflow"}, why[pg], "page %d", pg)
	}
	assert.Equal(t, []string{"reflow"}, why[fromPage], "its old page lost it: reflow")

	// The line read first.
	want := fmt.Sprintf(`1 term's data changed (%q); its peak moved %d → 1870, so %d panels moved on print pp.`, term, peakBefore, movedOnPrint-1)
	assert.True(t, strings.HasPrefix(r.Summary, want), "summary %q should start %q", r.Summary, want)
	assert.Contains(t, r.Summary, "pages to resend: print pp. ")
	assert.Contains(t, stderr, r.Summary, "the summary is printed")
	text, err := os.ReadFile(filepath.Join(out, production.ChangesText))
	require.NoError(t, err)
	assert.Contains(t, string(text), "summary: "+r.Summary)
	assert.Regexp(t, regexp.MustCompile(fmt.Sprintf(`%q: print p\. %d slot %d → p\. %d slot %d`, term, fromPage, fromSlot, toPage, toSlot)), string(text))

	// Item 2: every other term's panel file is byte-identical, though
	// many of them moved.
	panelsAfter := panelFilesOf(t, out)
	own := production.Slug(term) + ".svg"
	require.Equal(t, len(panelsBefore), len(panelsAfter))
	var differ []string
	for name, b := range panelsBefore {
		if name != own && !bytes.Equal(b, panelsAfter[name]) {
			differ = append(differ, name)
		}
	}
	sort.Strings(differ)
	if len(differ) > 0 && os.Getenv("SHEAF_REFLOW_DEBUG") != "" {
		os.WriteFile("/tmp/pf-before.svg", panelsBefore[differ[0]], 0o644)
		os.WriteFile("/tmp/pf-after.svg", panelsAfter[differ[0]], 0o644)
	}
	assert.Empty(t, differ, "panel files of unchanged terms")
	assert.NotEqual(t, panelsBefore[own], panelsAfter[own], "the changed term's panel file")
}

// TestReflowTermAddedRemoved: a new term that enters the top 60 pushes
// the 60th out; a term taken out of the data lets the 61st in.
func TestReflowTermAddedRemoved(t *testing.T) {
	spec := newJob(t, reflowSpec())
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out)
	before := loadManifest(t, out)

	// Added: an invented term with a large count every year, peaking 1950.
	var rows []string
	for y := 1868; y <= 2025; y++ {
		if y == 1917 || y == 1918 || y == 1943 || y == 1944 {
			continue // the journal's gaps (see the spec's notes)
		}
		n := 50_000
		if y == 1950 {
			n = 90_000
		}
		rows = append(rows, fmt.Sprintf("zeltrawick,%d,%d", y, n))
	}
	editCounts(t, spec, func(_ string, _, _ int, line string) string { return line }, rows...)
	buildInto(t, spec, out)
	r := loadChanges(t, out)
	mid := loadManifest(t, out)
	changes := map[string]string{}
	for _, tc := range r.Terms {
		changes[tc.Term] = tc.Change
	}
	assert.Equal(t, "added", changes["zeltrawick"])
	require.Len(t, r.Terms, 2, "one in, one out: %v", changes)
	var out1 string
	for term, c := range changes {
		if c == "removed" {
			out1 = term
		}
	}
	require.NotEmpty(t, out1)
	var came, went bool
	for _, m := range r.Moves {
		if m.Term == "zeltrawick" && m.From == nil && m.To.Output == "print" {
			came = true
		}
		if m.Term == out1 && m.To == nil && m.From.Output == "print" {
			went = true
			p, s := slotOf(before, "print", out1)
			assert.Equal(t, production.Slot{Output: "print", Page: p, Slot: s}, *m.From)
		}
	}
	assert.True(t, came, "a move of the added term; moves: %+v", r.Moves)
	assert.True(t, went, "a move of the removed term; moves: %+v", r.Moves)
	assert.Contains(t, r.Summary, "1 term added; 1 term removed")
	assert.Contains(t, r.Summary, "pages to resend: print")

	// Removed: take a selected term out of the data.
	gone := mid.Output("print").Pages[0].Terms[0]
	editCounts(t, spec, func(term string, _, _ int, line string) string {
		if term == gone {
			return ""
		}
		return line
	})
	buildInto(t, spec, out)
	r = loadChanges(t, out)
	assert.Contains(t, r.Summary, "1 term added; 1 term removed")
	var reflowed bool
	for _, p := range r.PageReasons {
		if p.Output == "print" && p.Page == 1 {
			assert.Contains(t, p.Why, "reflow", "page 1 lost its first panel")
			reflowed = true
		}
	}
	assert.True(t, reflowed)
	for _, m := range r.Moves {
		if m.Term == gone && m.From.Output == "print" {
			assert.Nil(t, m.To)
			assert.Equal(t, production.Slot{Output: "print", Page: 1, Slot: 1}, *m.From)
		}
	}
}
