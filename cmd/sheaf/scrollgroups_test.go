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
	if err != nil {
		t.Fatal(err)
	}
	b = bytes.Replace(b, []byte("order: peak-year\n"), []byte("order: peak-year\ngroup: peak-decade\n"), 1)
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	j, err := feature.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	var counts []int // panels of each group that has some, in order
	var heads []string
	for _, g := range j.Data.Groups {
		if g.Count > 0 {
			counts = append(counts, g.Count)
			heads = append(heads, g.Heading)
		}
	}
	if len(counts) < 3 {
		t.Fatalf("the demo's top 24 terms fall in %d peak decades; the test needs 3 or more", len(counts))
	}

	dir := t.TempDir()
	buildTo(t, path, dir)
	svgs, _ := filepath.Glob(filepath.Join(dir, "web", "page-*.svg"))
	if len(svgs) != len(counts) {
		t.Fatalf("%d SVG pages for %d groups", len(svgs), len(counts))
	}
	size := regexp.MustCompile(`^<svg [^>]*width="([\d.]+)" height="([\d.]+)" viewBox="0 0 ([\d.]+) ([\d.]+)"`)
	index, err := os.ReadFile(filepath.Join(dir, "web", "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	heights := map[string]bool{}
	for i, f := range svgs {
		name := fmt.Sprintf("page-%03d", i+1)
		if filepath.Base(f) != name+".svg" {
			t.Fatalf("page %d is %s", i+1, f)
		}
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if err := wellFormed(b); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		m := size.FindSubmatch(b)
		if m == nil || string(m[1]) != string(m[3]) || string(m[2]) != string(m[4]) {
			t.Fatalf("%s: width/height and viewBox disagree: %.200s", name, b)
		}
		if string(m[1]) != "1200" {
			t.Errorf("%s is %s px wide, want 1200", name, m[1])
		}
		heights[string(m[2])] = true
		h, _ := strconv.ParseFloat(string(m[2]), 64)
		if n := bytes.Count(b, []byte(`role="img"><title>`)); n != counts[i] {
			t.Errorf("%s shows %d panels; its group %q has %d", name, n, heads[i], counts[i])
		}
		// Every page is titled with its group and carries the key; only the
		// first has the dek.
		if want := fmt.Sprintf(`<title id="doc-title">Screen test: %s</title>`, heads[i]); !bytes.Contains(b, []byte(want)) {
			t.Errorf("%s lacks %s", name, want)
		}
		for _, s := range [][]byte{[]byte(">Screen test<"), []byte("Source: invented demonstration data.")} {
			if !bytes.Contains(b, s) {
				t.Errorf("%s lacks the running head or source %q", name, s)
			}
		}
		// The dek is every SVG's <desc>; only the first page also sets it.
		if n, want := bytes.Count(b, []byte(">Invented terms from the demo data")), 1+btoi(i == 0); n != want {
			t.Errorf("%s has the dek %d times, want %d", name, n, want)
		}
		// PNGs at 1× (96 dpi: one pixel per px) and 2×, the SVG's size
		// rounded to whole pixels.
		for k, suffix := range []string{"", "@2x"} {
			img := tooltest.ReadPNG(t, filepath.Join(dir, "web", name+suffix+".png"))
			s := float64(k + 1)
			if w, ht := img.Bounds().Dx(), img.Bounds().Dy(); w != int(1200*s) || math.Abs(float64(ht)-h*s) > 1 {
				t.Errorf("%s%s.png is %d × %d, want %g × %.2f", name, suffix, w, ht, 1200*s, h*s)
			}
		}
		if !bytes.Contains(index, []byte(fmt.Sprintf(`<img src="%s.svg" width="1200" height="%d"`, name, int(math.Ceil(h-0.05))))) {
			t.Errorf("the proof page does not show %s at 1200 × %.2f px", name, h)
		}
	}
	if len(heights) < 2 {
		t.Errorf("every page is %v px tall; groups of %v panels should differ", heights, counts)
	}
	if strings.Count(string(index), "<figure>") != len(counts) {
		t.Errorf("the proof page shows %d figures, want %d", strings.Count(string(index), "<figure>"), len(counts))
	}
	if s := j.Spec.Output("web"); s.Flow != specs.FlowScrollGroups {
		t.Errorf("flow %q", s.Flow)
	}
	var out, errb bytes.Buffer
	run([]string{"check", path}, &out, &errb)
	if want := fmt.Sprintf("web: %d scrolling pages, one a group, 1200 × ", len(counts)); !strings.Contains(out.String(), "1200 px wide, scrolling, a page per group") || !strings.Contains(out.String(), want) {
		t.Errorf("check does not describe the flow (%q):\n%s%s", want, out.String(), errb.String())
	}
	// librsvg (rsvg-convert, Debian librsvg2-bin) draws each page at its
	// own size.
	rsvg := tooltest.Require(t, "rsvg-convert", "librsvg2-bin")
	for _, f := range svgs {
		png := filepath.Join(t.TempDir(), "x.png")
		if out, err := exec.Command(rsvg, "-o", png, f).CombinedOutput(); err != nil || len(out) > 0 {
			t.Errorf("rsvg-convert %s: %v\n%s", f, err, out)
			continue
		}
		if img := tooltest.ReadPNG(t, png); img.Bounds().Dx() != 1200 {
			t.Errorf("librsvg draws %s %d px wide, want 1200", filepath.Base(f), img.Bounds().Dx())
		}
	}
}

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}
