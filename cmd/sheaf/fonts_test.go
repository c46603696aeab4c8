package main

import (
	"bytes"
	"encoding/binary"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/render/tooltest"
)

// fontSpec writes the small test feature with the given fonts key and
// font files into a temporary folder.
func fontSpec(t *testing.T, fonts string, files map[string][]byte) string {
	t.Helper()
	dir := t.TempDir()
	small, err := filepath.Abs("../../testdata/small")
	require.NoError(t, err)
	spec := `title: A small test feature
data:
  counts: ` + filepath.Join(small, "counts.csv") + `
  totals: ` + filepath.Join(small, "totals.csv") + `
years: {from: 1900, to: 1905}
terms:
  list: [telegraph, boiler, Maßstab]
outputs:
  print:
    kind: print
    trim: A5
    columns: 2
    fonts: ` + fonts + "\n"
	for name, b := range files {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	p := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(p, []byte(spec), 0o644))
	return p
}

// TestBuildWithCFFFonts is the case: Latin Modern (CFF outlines)
// named in the spec. The PDF must carry both faces as fonts (pdffonts:
// CID Type 0C, embedded, subset, ToUnicode) and pdftotext must find the
// terms; before, every word was drawn as outlines and pdffonts listed
// nothing of them.
func TestBuildWithCFFFonts(t *testing.T) {
	tooltest.Require(t, "pdffonts", "poppler-utils")
	tooltest.Require(t, "pdftotext", "poppler-utils")
	files := map[string][]byte{
		"lmsans10-regular.otf": lmsans10regular.TTF, "lmsans10-bold.otf": lmsans10bold.TTF,
		"lmsans10.otc": collection(t, lmsans10regular.TTF, lmsans10bold.TTF),
	}
	for _, fonts := range []string{
		"{regular: lmsans10-regular.otf, bold: lmsans10-bold.otf}",
		// both faces from one collection, the bold (its last face) by name
		`{regular: {path: lmsans10.otc, face: 0}, bold: {path: lmsans10.otc, face: "Latin Modern Sans 10 Bold"}}`,
	} {
		t.Run(fonts, func(t *testing.T) {
			spec := fontSpec(t, fonts, files)
			out := filepath.Join(t.TempDir(), "out")
			var o, e bytes.Buffer
			require.Equal(t, exitOK, run([]string{"build", spec, "--out", out, "--no-proofs", "--quiet"}, &o, &e), e.String())
			assert.NotContains(t, e.String(), "text-outlined")
			pdf := filepath.Join(out, "print", "print.pdf")
			fonts, err := exec.Command("pdffonts", pdf).Output()
			require.NoError(t, err)
			for _, name := range []string{"LMSans10-Regular", "LMSans10-Bold"} {
				var row string
				for _, l := range strings.Split(string(fonts), "\n") {
					if strings.Contains(l, "+"+name+" ") {
						row = l
					}
				}
				require.NotEmpty(t, row, "pdffonts lacks %s:\n%s", name, fonts)
				assert.Contains(t, row, "CID Type 0C")
				assert.Regexp(t, `yes\s+yes\s+yes`, row, "embedded, subset, ToUnicode")
			}
			text, err := exec.Command("pdftotext", pdf, "-").Output()
			require.NoError(t, err)
			for _, term := range []string{"telegraph", "boiler", "Maßstab", "A small test feature"} {
				assert.Contains(t, string(text), term)
			}
		})
	}
}

// collection joins fonts into one collection file (OpenType spec, "Font
// Collections": a 'ttcf' header, then each font's table directory, its
// table offsets counted from the start of the file).
func collection(t *testing.T, fonts ...[]byte) []byte {
	be := binary.BigEndian
	out := be.AppendUint32([]byte("ttcf"), 0x00010000)
	out = be.AppendUint32(out, uint32(len(fonts)))
	at := len(out)
	out = append(out, make([]byte, 4*len(fonts))...)
	for i, f := range fonts {
		be.PutUint32(out[at+4*i:], uint32(len(out)))
		n := int(be.Uint16(f[4:]))
		dir := append([]byte(nil), f[:12+16*n]...)
		base := len(out) + len(dir)
		var body []byte
		for r := 0; r < n; r++ {
			rec := 12 + 16*r
			off, length := be.Uint32(f[rec+8:]), be.Uint32(f[rec+12:])
			require.LessOrEqual(t, int(off+length), len(f))
			be.PutUint32(dir[rec+8:], uint32(base+len(body)))
			body = append(body, f[off:off+length]...)
			for len(body)%4 != 0 {
				body = append(body, 0)
			}
		}
		out = append(append(out, dir...), body...)
	}
	return out
}

// TestBadFontsExitTwo: fonts that cannot be used are bad input (exit 2)
// with the spec's place and the file, never a panic.
func TestBadFontsExitTwo(t *testing.T) {
	lm := lmsans10regular.TTF
	be := binary.BigEndian
	var cffOff, cffLen int
	for r := 0; r < int(be.Uint16(lm[4:])); r++ {
		if rec := 12 + 16*r; string(lm[rec:rec+4]) == "CFF " {
			cffOff, cffLen = int(be.Uint32(lm[rec+8:])), int(be.Uint32(lm[rec+12:]))
		}
	}
	require.NotZero(t, cffLen)
	restricted := append([]byte(nil), lm...)
	for r := 0; r < int(be.Uint16(lm[4:])); r++ {
		if rec := 12 + 16*r; string(lm[rec:rec+4]) == "OS/2" {
			be.PutUint16(restricted[int(be.Uint32(lm[rec+8:]))+8:], 0x0002) // OS/2 fsType: Restricted License embedding
		}
	}
	// DejaVu with the start of its cmap zeroed: tdewolff/font, which
	// Load parses with, reads it; go-text, which shapes and draws, does
	// not ("unsupported cmap table"). And DejaVu without an OS/2 table
	// (tag renamed), whose metrics canvas cannot read.
	dv := dejavusanscondensed.TTF
	noCmap, noOS2 := append([]byte(nil), dv...), append([]byte(nil), dv...)
	for r := 0; r < int(be.Uint16(dv[4:])); r++ {
		rec := 12 + 16*r
		switch string(dv[rec : rec+4]) {
		case "cmap":
			off := int(be.Uint32(dv[rec+8:]))
			clear(noCmap[off : off+64])
		case "OS/2":
			copy(noOS2[rec:], "OS/3")
		}
	}
	tests := []struct {
		name, fonts string
		file        []byte
		want        []string
	}{
		{"cmap go-text cannot read", "{regular: f.otf}", noCmap, []string{"spec.yaml:13:", "fonts.regular", "f.otf", "not a usable", "unsupported cmap table"}},
		{"no OS/2 table", "{regular: f.otf}", noOS2, []string{"spec.yaml:13:", "fonts.regular", "f.otf", "not a usable", "no OS/2"}},
		{"truncated CFF", "{regular: f.otf}", lm[:cffOff+cffLen/2], []string{"spec.yaml:13:", "fonts.regular", "f.otf", "not a usable"}},
		{"restricted licence", "{regular: f.otf}", restricted, []string{"spec.yaml:13:", "LMSans10-Regular", "Restricted License embedding", "f.otf"}},
		{"missing face", `{regular: {path: f.otf, face: "Nope"}}`, lm, []string{"spec.yaml:13:", "fonts.regular.face", `no face "Nope"`, `0 "Latin Modern Sans 10 Regular"`}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			spec := fontSpec(t, tc.fonts, map[string][]byte{"f.otf": tc.file})
			out := filepath.Join(t.TempDir(), "out")
			for _, args := range [][]string{{"check", spec}, {"build", spec, "--out", out}} {
				cmd := args[0]
				var o, e bytes.Buffer
				code := run(args, &o, &e)
				assert.Equal(t, exitBadInput, code, "%s: %s", cmd, e.String())
				for _, w := range tc.want {
					assert.Contains(t, e.String(), w, cmd)
				}
				assert.NotContains(t, e.String(), "panic")
			}
			_, err := os.Stat(out)
			assert.True(t, os.IsNotExist(err), "a refused build writes nothing")
		})
	}
}

// TestChromiumMatchesPNGWithCFF is TestChromiumMatchesPNG with CFF fonts
// (Latin Modern Sans) embedded in the SVG: Chromium draws the page from
// the embedded OpenType CFF subsets as our PNG draws it, within the same
// limits.
func TestChromiumMatchesPNGWithCFF(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a browser; skipped with -short")
	}
	chromium := tooltest.Require(t, "chromium", "chromium")
	fontDir := t.TempDir()
	reg, bold := filepath.Join(fontDir, "lmsans10-regular.otf"), filepath.Join(fontDir, "lmsans10-bold.otf")
	require.NoError(t, os.WriteFile(reg, lmsans10regular.TTF, 0o644))
	require.NoError(t, os.WriteFile(bold, lmsans10bold.TTF, 0o644))
	spec := screenSpec(t, 12, `  web:
    kind: screen
    trim: 900px x 700px
    fonts: {embed: true, family: '"Latin Modern Sans", sans-serif', regular: `+reg+`, bold: `+bold+`}
`, "")
	dir := t.TempDir()
	buildTo(t, spec, dir)
	svg, err := os.ReadFile(filepath.Join(dir, "web", "page-001.svg"))
	require.NoError(t, err)
	require.Contains(t, string(svg), `format("opentype")`)
	shot := filepath.Join(t.TempDir(), "shot.png")
	index, _ := filepath.Abs(filepath.Join(dir, "web", "index.html"))
	cmd := exec.Command(chromium, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir="+t.TempDir(),
		"--hide-scrollbars", "--force-device-scale-factor=1", "--window-size=900,700",
		"--screenshot="+shot, "file://"+index)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, string(out))
	theirs := tooltest.ReadPNG(t, shot)
	ours := tooltest.ReadPNG(t, filepath.Join(dir, "web", "page-001.png"))
	require.Equal(t, ours.Bounds().Size(), theirs.Bounds().Size())
	mean, strong := tooltest.CompareImages(ours, theirs, 64)
	t.Logf("Chromium vs our PNG (CFF fonts): mean channel difference %.2f, strongly different pixels %.2f%%", mean, strong*100)
	assert.LessOrEqual(t, mean, chromeMeanLimit)
	assert.LessOrEqual(t, strong, chromeStrongLimit)
}

// TestCFFProofMatchesPoppler: TestProofMatchesPoppler's check with the
// CFF fonts of the issue (Latin Modern Sans): our proof of page 1 against
// pdftoppm's rendering of the PDF, trim box, same resolution and limits.
func TestCFFProofMatchesPoppler(t *testing.T) {
	pdftoppm := tooltest.Require(t, "pdftoppm", "poppler-utils")
	spec := fontSpec(t, "{regular: lmsans10-regular.otf, bold: lmsans10-bold.otf}",
		map[string][]byte{"lmsans10-regular.otf": lmsans10regular.TTF, "lmsans10-bold.otf": lmsans10bold.TTF})
	out := filepath.Join(t.TempDir(), "out")
	var o, e bytes.Buffer
	require.Equal(t, exitOK, run([]string{"build", spec, "--out", out, "--quiet"}, &o, &e), e.String())
	j, err := feature.Load(spec)
	require.NoError(t, err)
	p, err := j.Prepare(j.Spec.Output("print"))
	require.NoError(t, err)
	dpi := p.Spec.Proofs
	pg := p.Plan.Pages[0]
	px := func(v float64) int { return int(math.Round(v * dpi / 72)) }
	x, y := px(pg.Trim.X0), px(pg.Media.H()-pg.Trim.Y1)
	w, h := px(pg.Trim.X1)-x, px(pg.Media.H()-pg.Trim.Y0)-y
	prefix := filepath.Join(t.TempDir(), "poppler")
	cmd := exec.Command(pdftoppm, "-r", strconv.FormatFloat(dpi, 'f', -1, 64), "-f", "1", "-l", "1", "-singlefile",
		"-x", strconv.Itoa(x), "-y", strconv.Itoa(y), "-W", strconv.Itoa(w), "-H", strconv.Itoa(h),
		"-png", filepath.Join(out, "print", "print.pdf"), prefix)
	b, err := cmd.CombinedOutput()
	require.NoError(t, err, string(b))
	theirs := tooltest.ReadPNG(t, prefix+".png")
	ours := tooltest.ReadPNG(t, filepath.Join(out, "print", "proofs", "page-001.png"))
	require.Equal(t, ours.Bounds().Size(), theirs.Bounds().Size())
	mean, strong := tooltest.CompareImages(ours, theirs, 64)
	t.Logf("CFF proof vs pdftoppm: mean |Δ| %.3f/255, %.3f%% of pixels differ by more than 64", mean, strong*100)
	assert.LessOrEqual(t, mean, 3.0)
	assert.LessOrEqual(t, strong, 0.015)
}
