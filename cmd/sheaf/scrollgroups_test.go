package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// TestScreenScrollGroups builds a grouped feature with flow
// scroll-groups: one tall SVG per peak decade, each parsing as XML
// (encoding/xml) with its width and height equal to its viewBox (SVG 1.1
// §7.7: with equal sizes the user unit is one px), 1200 px wide, as tall
// as its group needs, so the heights differ; a PNG of each at 1× and 2×
// of the same size; and a proof page showing each at its own size.
func TestScreenScrollGroups(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a screen output; skipped with -short")
	}
	path := screenSpec(t, 24, `  web:
    kind: screen
    trim: 1200px
    flow: scroll-groups
`, "")
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	b = bytes.Replace(b, []byte("order: peak-year\n"), []byte("order: peak-year\ngroup: peak-decade\n"), 1)
	require.NoError(t, os.WriteFile(path, b, 0o644))
	j, err := feature.Load(path)
	require.NoError(t, err)
	var counts []int // panels of each group that has some, in order
	var heads []string
	for _, g := range j.Data.Groups {
		if g.Count > 0 {
			counts = append(counts, g.Count)
			heads = append(heads, g.Heading)
		}
	}
	require.GreaterOrEqual(t, len(counts), 3, "the demo's top 24 terms fall in this many peak decades; the test needs 3 or more")

	dir := t.TempDir()
	buildTo(t, path, dir)
	svgs, _ := filepath.Glob(filepath.Join(dir, "web", "page-*.svg"))
	require.Equal(t, len(counts), len(svgs), "%d SVG pages for %d groups", len(svgs), len(counts))
	size := regexp.MustCompile(`^<svg [^>]*width="([\d.]+)" height="([\d.]+)" viewBox="0 0 ([\d.]+) ([\d.]+)"`)
	index, err := os.ReadFile(filepath.Join(dir, "web", "index.html"))
	require.NoError(t, err)
	heights := map[string]bool{}
	for i, f := range svgs {
		name := fmt.Sprintf("page-%03d", i+1)
		require.Equal(t, name+".svg", filepath.Base(f), "page %d is %s", i+1, f)
		b, err := os.ReadFile(f)
		require.NoError(t, err)
		assert.NoError(t, wellFormed(b), name)
		m := size.FindSubmatch(b)
		require.NotNil(t, m, "%s: no width, height and viewBox: %.200s", name, b)
		require.Equal(t, string(m[1]), string(m[3]), "%s: width and viewBox width", name)
		require.Equal(t, string(m[2]), string(m[4]), "%s: height and viewBox height", name)
		assert.Equal(t, "1200", string(m[1]), "%s is %s px wide, want 1200", name, m[1])
		heights[string(m[2])] = true
		h, _ := strconv.ParseFloat(string(m[2]), 64)
		assert.Equal(t, counts[i], bytes.Count(b, []byte(`role="img"><title>`)), "%s: panels shown, those of its group %q", name, heads[i])
		// Every page is titled with its group and carries the key; only the
		// first has the dek.
		assert.Contains(t, string(b), fmt.Sprintf(`<title id="doc-title">Screen test: %s</title>`, heads[i]), name)
		for _, s := range []string{">Screen test<", "Source: invented demonstration data."} {
			assert.Contains(t, string(b), s, "%s: the running head or source", name)
		}
		// The dek is every SVG's <desc>; only the first page also sets it.
		assert.Equal(t, 1+btoi(i == 0), bytes.Count(b, []byte(">Invented terms from the demo data")), "%s: times the dek is there", name)
		// PNGs at 1× (96 dpi: one pixel per px) and 2×, the SVG's size
		// rounded to whole pixels.
		for k, suffix := range []string{"", "@2x"} {
			img := tooltest.ReadPNG(t, filepath.Join(dir, "web", name+suffix+".png"))
			s := float64(k + 1)
			assert.Equal(t, int(1200*s), img.Bounds().Dx(), "%s%s.png width", name, suffix)
			assert.InDelta(t, h*s, float64(img.Bounds().Dy()), 1, "%s%s.png height", name, suffix)
		}
		assert.Contains(t, string(index), fmt.Sprintf(`<img src="%s.svg" width="1200" height="%d"`, name, int(math.Ceil(h-0.05))), "the proof page shows %s at its size", name)
	}
	assert.GreaterOrEqual(t, len(heights), 2, "pages %v px tall; groups of %v panels should differ", heights, counts)
	assert.Equal(t, len(counts), strings.Count(string(index), "<figure>"), "figures on the proof page")
	assert.Equal(t, specs.FlowScrollGroups, j.Spec.Output("web").Flow)
	var out, errb bytes.Buffer
	run([]string{"check", path}, &out, &errb)
	assert.Contains(t, out.String(), "1200 px wide, scrolling, a page per group", errb.String())
	assert.Contains(t, out.String(), fmt.Sprintf("web: %d scrolling pages, one a group, 1200 × ", len(counts)), errb.String())
	// librsvg (rsvg-convert, Debian librsvg2-bin) draws each page at its
	// own size.
	rsvg := tooltest.Require(t, "rsvg-convert", "librsvg2-bin")
	for _, f := range svgs {
		png := filepath.Join(t.TempDir(), "x.png")
		out, err := exec.Command(rsvg, "-o", png, f).CombinedOutput()
		if !assert.NoError(t, err, "rsvg-convert %s: %s", f, out) || !assert.Empty(t, out, "rsvg-convert %s", f) {
			continue
		}
		assert.Equal(t, 1200, tooltest.ReadPNG(t, png).Bounds().Dx(), "librsvg's width of %s", filepath.Base(f))
	}
}

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}
