package main

// Checks of the screen build (issue 8): file names, reflow, SVG read back
// with encoding/xml and librsvg, determinism, and a real browser's
// rendering of the HTML proof page compared with our PNG.

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"image"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/render/tooltest"
)

// screenSpec writes a spec over the demo's data with the given outputs
// (and inserts) YAML and returns its path.
func screenSpec(t testing.TB, terms int, outputs, inserts string) string {
	t.Helper()
	data, err := filepath.Abs("../../examples/quillmere/data")
	require.NoError(t, err)
	spec := fmt.Sprintf(`title: Screen test
dek: Invented terms from the demo data, for the screen tests.
source: "Source: invented demonstration data."
date: 2026-11-30
data:
  counts: %s
  totals: %s
years: {from: 1868, to: 2025}
terms: {top: %d}
order: peak-year
scale: {values: own-peak, y-range: shared}
outputs:
%s
%s`, filepath.Join(data, "counts.csv"), filepath.Join(data, "totals.csv"), terms, outputs, inserts)
	path := filepath.Join(t.TempDir(), "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(spec), 0o644))
	return path
}

// TestReflowColumns: with no columns given, a screen output takes as many
// columns as fit at the minimum panel width: n = ⌊(W − margins + gutter)
// ÷ (min + gutter)⌋ (worked by hand below); type sizes are the output's.
func TestReflowColumns(t *testing.T) {
	path := screenSpec(t, 24, `  phone:
    kind: screen
    trim: 360px
    margins: 16px
    min-panel-width: 140px
    type: {label: 13px}
  desk:
    kind: screen
    trim: 1200px
`, "")
	j, err := feature.Load(path)
	require.NoError(t, err)
	for _, c := range []struct {
		name    string
		columns int
		label   float64 // px
	}{
		// (360 − 2·16 + 20) ÷ (140 + 20) = 348 ÷ 160 = 2.17 → 2
		{"phone", 2, 13},
		// defaults: (1200 − 2·32 + 20) ÷ (170 + 20) = 1156 ÷ 190 = 6.08 → 6
		{"desk", 6, 14},
	} {
		p, err := j.Prepare(j.Spec.Output(c.name))
		require.NoError(t, err)
		assert.Equal(t, c.columns, p.Plan.Columns, "%s: %d columns, want %d", c.name, p.Plan.Columns, c.columns)
		assert.InDelta(t, c.label, p.Spec.Type.Label.Px(), 1e-9, "%s: label size, px", c.name)
		assert.EqualValues(t, "scroll", p.Plan.Flow, "%s: a width alone scrolls", c.name)
		assert.Len(t, p.Plan.Pages, 1, "%s: a width alone scrolls on one page", c.name)
	}
}

const screenOutputs = `  web:
    kind: screen
    trim: 1200px
    panel-files: true
  tall:
    kind: screen
    trim: 900px x 700px
    fonts: {embed: true}
    spreads: true
`

const screenInserts = `inserts:
  one:
    output: web
    size: 480px x 300px
    terms: [telegraph]
  four:
    output: web
    size: 720px x 440px
    terms: [telegraph, telephone, wireless, email]
    title: Sending word
  column:
    output: print
    size: 60mm x 45mm
    terms: [telegraph]
`

func buildTo(t testing.TB, spec, dir string) []string {
	t.Helper()
	var out, errb bytes.Buffer
	require.Equal(t, exitOK, run([]string{"build", spec, "--out", dir, "--quiet"}, &out, &errb), errb.String())
	return strings.Fields(out.String())
}

// TestScreenBuild builds two screen outputs (scroll with panel files,
// pages with embedded fonts) and three inserts, and checks what the web
// team gets.
func TestScreenBuild(t *testing.T) {
	if testing.Short() {
		t.Skip("builds screen outputs; skipped with -short")
	}
	printOut := `  print:
    kind: print
    trim: A4
`
	spec := screenSpec(t, 30, screenOutputs+printOut, screenInserts)
	dir := t.TempDir()
	files := buildTo(t, spec, dir)
	has := map[string]bool{}
	for _, f := range files {
		rel, _ := filepath.Rel(dir, f)
		has[filepath.ToSlash(rel)] = true
	}
	for _, want := range []string{
		"web/page-001.svg", "web/page-001.png", "web/page-001@2x.png", "web/index.html",
		"tall/page-001.svg", "tall/page-002.svg", "tall/page-002@2x.png", "tall/index.html",
		"tall/spread-001.svg", "tall/spread-002.svg",
		"inserts/one.svg", "inserts/four.svg", "inserts/four.png", "inserts/four@2x.png", "inserts/column.pdf",
	} {
		assert.True(t, has[want], "%s not written; wrote %d files", want, len(files))
	}
	panels, _ := filepath.Glob(filepath.Join(dir, "web", "panels", "*.svg"))
	assert.Equal(t, 30, len(panels), "%d panel files, want 30 (one per term)", len(panels))

	// Every SVG parses as XML (encoding/xml), has px sizes matching its
	// viewBox, one titled group per panel it shows.
	svgs, _ := filepath.Glob(filepath.Join(dir, "*", "*.svg"))
	svgs = append(svgs, panels...)
	for _, f := range svgs {
		b, err := os.ReadFile(f)
		require.NoError(t, err)
		assert.NoError(t, wellFormed(b), f)
		m := regexp.MustCompile(`^<svg [^>]*width="([\d.]+)" height="([\d.]+)" viewBox="0 0 ([\d.]+) ([\d.]+)"`).FindSubmatch(b)
		if assert.NotNil(t, m, "%s: no width, height and viewBox", f) {
			assert.Equal(t, string(m[1]), string(m[3]), "%s: width and viewBox width", f)
			assert.Equal(t, string(m[2]), string(m[4]), "%s: height and viewBox height", f)
		}
	}
	web, _ := os.ReadFile(filepath.Join(dir, "web", "page-001.svg"))
	assert.Equal(t, 30, bytes.Count(web, []byte(`role="img"><title>`)), "titled panel groups on the scroll page")
	assert.Contains(t, string(web), `<title id="doc-title">Screen test</title>`, "the scroll page's document title")
	// 1200 px wide (CSS Values and Units L3: 1 px = 0.75 pt, 900 pt).
	assert.True(t, bytes.HasPrefix(web, []byte(`<svg xmlns="http://www.w3.org/2000/svg" width="1200" `)), "scroll page is not 1200 px wide: %.120s", web)
	png1 := tooltest.ReadPNG(t, filepath.Join(dir, "tall", "page-001.png"))
	png2 := tooltest.ReadPNG(t, filepath.Join(dir, "tall", "page-001@2x.png"))
	assert.Equal(t, image.Pt(900, 700), png1.Bounds().Size(), "1× (96 dpi)")
	assert.Equal(t, image.Pt(1800, 1400), png2.Bounds().Size(), "2× (192 dpi)")
	// Page 1 is a right-hand page alone; pages 2 and 3 face each other on
	// one 1800 px sheet, both pages' panels in it.
	spread, _ := os.ReadFile(filepath.Join(dir, "tall", "spread-002.svg"))
	assert.Contains(t, string(spread), `width="1800" height="700"`, "spread 2: two 900 × 700 px pages side by side")
	index, _ := os.ReadFile(filepath.Join(dir, "tall", "index.html"))
	assert.Contains(t, string(index), `<img src="spread-002.svg" width="1800" height="700"`, "the proof page of a spreads output shows the spreads")
	tall, _ := os.ReadFile(filepath.Join(dir, "tall", "page-001.svg"))
	assert.Contains(t, string(tall), "@font-face{font-family:\"sheaf-subset-", "fonts.embed: true embeds the font subset")

	// Determinism: a second build into another folder is byte-identical.
	dir2 := t.TempDir()
	buildTo(t, spec, dir2)
	for _, f := range append(svgs, filepath.Join(dir, "web", "index.html"), filepath.Join(dir, "inserts", "four.png")) {
		rel, _ := filepath.Rel(dir, f)
		a, _ := os.ReadFile(f)
		b, err := os.ReadFile(filepath.Join(dir2, rel))
		assert.NoError(t, err, rel)
		assert.Equal(t, a, b, "%s differs between two builds", rel)
	}

	// librsvg (rsvg-convert, Debian librsvg2-bin) renders every SVG.
	rsvg := tooltest.Require(t, "rsvg-convert", "librsvg2-bin")
	sort.Strings(svgs)
	for i, f := range svgs {
		if i > 12 && strings.Contains(f, "panels") {
			break // a dozen panel files are enough
		}
		out, err := exec.Command(rsvg, "-o", filepath.Join(t.TempDir(), "x.png"), f).CombinedOutput()
		assert.NoError(t, err, "rsvg-convert %s: %s", f, out)
		assert.Empty(t, out, "rsvg-convert %s", f)
	}
}

// wellFormed reads b to the end with encoding/xml.
func wellFormed(b []byte) error {
	d := xml.NewDecoder(bytes.NewReader(b))
	for {
		_, err := d.Token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}

// TestChromiumMatchesPNG opens the HTML proof page of a paged screen
// output in headless Chromium, a real browser, takes a screenshot of
// page 1 and compares it with our 1× PNG of the same page. Fonts are
// embedded so both draw the same glyphs. Two anti-aliasing rasterizers
// never agree on every edge pixel, so the check bounds (a) the mean
// channel difference and (b) the share of strongly different pixels
// (any channel off by more than 64 of 255); the thresholds are ours,
// set about twice what a correct page measures here, and far below what a
// shifted panel, a missing line or a wrong colour gives.
func TestChromiumMatchesPNG(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a browser; skipped with -short")
	}
	chromium := tooltest.Require(t, "chromium", "chromium")
	spec := screenSpec(t, 12, `  web:
    kind: screen
    trim: 900px x 700px
    fonts: {embed: true}
`, "")
	dir := t.TempDir()
	buildTo(t, spec, dir)
	shot := filepath.Join(t.TempDir(), "shot.png")
	index, _ := filepath.Abs(filepath.Join(dir, "web", "index.html"))
	cmd := exec.Command(chromium, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir="+t.TempDir(),
		"--hide-scrollbars", "--force-device-scale-factor=1", "--window-size=900,700",
		"--screenshot="+shot, "file://"+index)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "chromium: %s", out)
	theirs := tooltest.ReadPNG(t, shot)
	ours := tooltest.ReadPNG(t, filepath.Join(dir, "web", "page-001.png"))
	require.Equal(t, ours.Bounds().Size(), theirs.Bounds().Size(), "screenshot %v, our PNG %v", theirs.Bounds().Size(), ours.Bounds().Size())
	mean, strong := tooltest.CompareImages(ours, theirs, 64)
	t.Logf("Chromium vs our PNG: mean channel difference %.2f, strongly different pixels %.2f%%", mean, strong*100)
	assert.LessOrEqual(t, mean, chromeMeanLimit, "mean channel difference from Chromium's rendering")
	assert.LessOrEqual(t, strong, chromeStrongLimit, "share of strongly different pixels")
	// Per panel: a panel drawn in the wrong place or with a wrong curve
	// stands out even when the page mean is small.
	j, _ := feature.Load(spec)
	p, _ := j.Prepare(j.Spec.Output("web"))
	pg := &p.Plan.Pages[0]
	px := func(v float64) int { return int(math.Round(v * 96 / 72)) }
	worst := 0.0
	for _, pn := range pg.Panels {
		r := image.Rect(px(pn.Plot.X0), px(pg.Media.H()-pn.Plot.Y1), px(pn.Plot.X1), px(pg.Media.H()-pn.Plot.Y0))
		_, s := tooltest.CompareImages(tooltest.SubImage(ours, r), tooltest.SubImage(theirs, r), 64)
		worst = max(worst, s)
		assert.LessOrEqual(t, s, chromePanelLimit, "panel %q: share of its plot's pixels that differ strongly from Chromium's", p.Feature.Data.Series[pn.Item].Term)
	}
	t.Logf("worst panel: %.2f%% strongly different pixels", worst*100)
}

// Limits of TestChromiumMatchesPNG; see there.
const (
	chromeMeanLimit   = 2.0
	chromeStrongLimit = 0.01
	chromePanelLimit  = 0.01
)

// TestInsertBadInput: an insert's term missing from the data, or a
// graphic too small for its plot, stops the build with the place in the
// spec.
func TestInsertBadInput(t *testing.T) {
	for _, c := range []struct{ inserts, want string }{
		{"inserts:\n  x: {output: web, size: 600px x 400px, terms: [telegraph, telegraf]}\n",
			`spec.yaml:%d:60: term "telegraf" is not in`}, // the column of "telegraf"
		{"inserts:\n  x: {output: web, size: 90px x 60px, terms: [telegraph, radio]}\n",
			`spec.yaml:%d:3: insert "x": the plot would be`},
	} {
		spec := screenSpec(t, 6, "  web: {kind: screen}\n", c.inserts)
		b, _ := os.ReadFile(spec)
		line := strings.Count(string(b[:bytes.Index(b, []byte("  x:"))]), "\n") + 1
		var out, errb bytes.Buffer
		code := run([]string{"build", spec, "--out", t.TempDir(), "--quiet"}, &out, &errb)
		assert.NotEqual(t, exitOK, code)
		assert.Contains(t, errb.String(), fmt.Sprintf(c.want, line))
	}
}
