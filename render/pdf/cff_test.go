package pdf

import (
	"bytes"
	"encoding/binary"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/canvas/renderers/rasterizer"

	"sheaf/layout/fonts/cff"
	"sheaf/render/tooltest"

	otf "sheaf/render/internal/sfnt"
)

// CFF fonts for the tests: Latin Modern Sans (github.com/go-fonts/
// latin-modern, GUST Font License), EB Garamond 12 (tdewolff/font's
// resources in the module cache, SIL Open Font License), TeX Gyre Heros
// (Debian fonts-texgyre), and a CID-keyed version of Latin Modern made
// below.

func moduleFile(t testing.TB, module, rel string) []byte {
	t.Helper()
	return tooltest.ModuleFile(t, module, rel)
}

func debianFile(t testing.TB, path, pkg string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		require.False(t, os.Getenv(tooltest.EnvRequire) == "1", "%s not found; install Debian package %s (required because %s=1)", path, pkg, tooltest.EnvRequire)
		t.Skipf("%s not found; install Debian package %s", path, pkg)
	}
	return b
}

// withTable returns an OpenType file with one table replaced (table
// directory rebuilt, offsets 4-byte aligned; OpenType spec, "Organization
// of an OpenType Font"), or with the OS/2 fsType set when tag is "fsType".
func withTable(t testing.TB, b []byte, tag string, table []byte) []byte {
	t.Helper()
	be := binary.BigEndian
	n := int(be.Uint16(b[4:]))
	tables := map[string][]byte{}
	for r := 0; r < n; r++ {
		rec := 12 + 16*r
		off, length := be.Uint32(b[rec+8:]), be.Uint32(b[rec+12:])
		tables[string(b[rec:rec+4])] = append([]byte(nil), b[off:off+length]...)
	}
	if tag == "fsType" {
		be.PutUint16(tables["OS/2"][8:], binary.BigEndian.Uint16(table))
	} else {
		tables[tag] = table
	}
	out := otf.Write(tables)
	copy(out, b[:4]) // keep "OTTO"
	// writeSFNT set checkSumAdjustment for the TrueType version number;
	// set it again for this one (OpenType spec, head table).
	for r := 0; r < n; r++ {
		rec := 12 + 16*r
		if string(out[rec:rec+4]) == "head" {
			at := be.Uint32(out[rec+8:])
			be.PutUint32(out[at+8:], 0)
			be.PutUint32(out[at+8:], 0xB1B0AFBA-otf.Checksum(out))
		}
	}
	return out
}

// cidKeyedLM is Latin Modern Sans with its CFF rewritten CID-keyed (all
// glyphs), as a font with CID-keyed CFF outlines comes from a foundry.
func cidKeyedLM(t testing.TB) []byte {
	t.Helper()
	s := loadFont(t, lmsans10regular.TTF).SFNT
	f, err := cff.Parse(s.Tables["CFF "])
	require.NoError(t, err)
	all := make([]uint16, f.NumGlyphs())
	for i := range all {
		all[i] = uint16(i)
	}
	table, err := f.Subset("LMSans10-Regular", all)
	require.NoError(t, err)
	g, err := cff.Parse(table)
	require.NoError(t, err)
	require.True(t, g.CIDKeyed)
	return withTable(t, lmsans10regular.TTF, "CFF ", table)
}

// cffDoc writes two pages of the test drawing with the given fonts.
func cffDoc(t testing.TB, regular, bold []byte) []byte {
	t.Helper()
	reg, b := loadFont(t, regular), loadFont(t, bold)
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "CFF", Version: "0.0.1", Date: testDate})
	for i := 0; i < 2; i++ {
		setup := PageSetup{Boxes: a5Boxes(), Marks: &MarkOptions{}, Slug: "cff · page " + string(rune('1'+i))}
		require.NoError(t, w.AddPage(setup, testDrawing(reg, b)))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}

type pdffontsRow struct{ name, typ, emb, sub, uni string }

// pdffonts lists a document's fonts with poppler's pdffonts.
func pdffonts(t *testing.T, path string) []pdffontsRow {
	t.Helper()
	out := run(t, "pdffonts", path)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	var rows []pdffontsRow
	for _, l := range lines[2:] {
		f := strings.Fields(l)
		require.GreaterOrEqual(t, len(f), 8, l)
		rows = append(rows, pdffontsRow{name: f[0], typ: strings.Join(f[1:len(f)-6], " "), emb: f[len(f)-5], sub: f[len(f)-4], uni: f[len(f)-3]})
	}
	sort.Slice(rows, func(i, j int) bool { return rows[i].name[7:] < rows[j].name[7:] })
	return rows
}

func TestCFFFontsWithOutsideReaders(t *testing.T) {
	fonts := []struct {
		name          string
		regular, bold func(t *testing.T) []byte
		psRegular     string // PostScript names (name ID 6)
		psBold        string
	}{
		{"Latin Modern", func(*testing.T) []byte { return lmsans10regular.TTF }, func(*testing.T) []byte { return lmsans10bold.TTF }, "LMSans10-Regular", "LMSans10-Bold"},
		{"EB Garamond", func(t *testing.T) []byte {
			return moduleFile(t, "github.com/tdewolff/font", "resources/EBGaramond12-Regular.otf")
		}, func(*testing.T) []byte { return lmsans10bold.TTF }, "EBGaramond12-Regular", "LMSans10-Bold"},
		{"TeX Gyre Heros", func(t *testing.T) []byte {
			return debianFile(t, "/usr/share/texmf/fonts/opentype/public/tex-gyre/texgyreheros-regular.otf", "fonts-texgyre")
		}, func(t *testing.T) []byte {
			return debianFile(t, "/usr/share/texmf/fonts/opentype/public/tex-gyre/texgyreheros-bold.otf", "fonts-texgyre")
		}, "TeXGyreHeros-Regular", "TeXGyreHeros-Bold"},
		{"CID-keyed", func(t *testing.T) []byte { return cidKeyedLM(t) }, func(*testing.T) []byte { return lmsans10bold.TTF }, "LMSans10-Regular", "LMSans10-Bold"},
	}
	for _, fc := range fonts {
		t.Run(fc.name, func(t *testing.T) {
			doc := cffDoc(t, fc.regular(t), fc.bold(t))
			path := writeTemp(t, "cff.pdf", doc)
			assert.Equal(t, doc, cffDoc(t, fc.regular(t), fc.bold(t)), "same inputs, same bytes")

			t.Run("pdffonts", func(t *testing.T) {
				tooltest.Require(t, "pdffonts", "poppler-utils")
				rows := pdffonts(t, path)
				tag := regexp.MustCompile(`^[A-Z]{6}\+`)
				var cffNames []string
				for _, r := range rows {
					assert.Regexp(t, tag, r.name)
					assert.Equal(t, []string{"yes", "yes", "yes"}, []string{r.emb, r.sub, r.uni}, "embedded, subset, ToUnicode: %v", r)
					if r.typ == "CID Type 0C" { // poppler's name for CIDFontType0 with FontFile3/CIDFontType0C
						cffNames = append(cffNames, r.name[7:])
					}
				}
				want := []string{fc.psBold, fc.psRegular}
				if fc.psBold == fc.psRegular {
					want = want[:1]
				}
				sort.Strings(want)
				sort.Strings(cffNames)
				assert.Equal(t, want, cffNames, "the CFF fonts, as pdffonts lists them:\n%v", rows)
			})
			t.Run("pdftotext", func(t *testing.T) {
				tooltest.Require(t, "pdftotext", "poppler-utils")
				out := run(t, "pdftotext", path, "-")
				for _, want := range []string{"Sheaf of words 1820–2020", "office affine AVATAR"} {
					assert.Contains(t, out, want)
				}
			})
			t.Run("qpdf --check", func(t *testing.T) {
				tooltest.Require(t, "qpdf", "qpdf")
				assert.Contains(t, run(t, "qpdf", "--check", path), "No syntax or stream encoding errors")
			})
			t.Run("gs renders without warnings", func(t *testing.T) {
				tooltest.Require(t, "gs", "ghostscript")
				out, err := exec.Command("gs", "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=png16m", "-r100", "-sOutputFile="+filepath.Join(t.TempDir(), "p%d.png"), path).CombinedOutput()
				require.NoError(t, err, string(out))
				assert.Empty(t, strings.TrimSpace(string(out)), "ghostscript printed messages")
			})
			t.Run("pdftoppm matches canvas's rasterizer", func(t *testing.T) {
				tooltest.Require(t, "pdftoppm", "poppler-utils")
				comparePixels(t, fc.regular(t), fc.bold(t))
			})
		})
	}
}

// comparePixels renders the test drawing with pdftoppm from our PDF and
// with canvas's rasterizer, within TestPixelsMatchCanvasRasterizer's
// limits (mean under 1/255, under 1 % of pixels off by more than 48/255).
func comparePixels(t *testing.T, regular, bold []byte) {
	reg, b := loadFont(t, regular), loadFont(t, bold)
	res := canvas.DPI(100)
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "pixels", Date: testDate})
	require.NoError(t, w.AddPage(PageSetup{Boxes: a5Boxes()}, testDrawing(reg, b)))
	require.NoError(t, w.Close())
	dir := t.TempDir()
	p := filepath.Join(dir, "p.pdf")
	require.NoError(t, os.WriteFile(p, buf.Bytes(), 0o644))
	out, err := exec.Command("pdftoppm", "-r", "100", "-png", "-singlefile", p, filepath.Join(dir, "p")).CombinedOutput()
	require.NoError(t, err, string(out))
	f, err := os.Open(filepath.Join(dir, "p.png"))
	require.NoError(t, err)
	got, err := png.Decode(f)
	f.Close()
	require.NoError(t, err)
	bx := a5Boxes()
	c := canvas.New(bx.Media.W()*MMPerPt, bx.Media.H()*MMPerPt)
	toPixels := func(c *canvas.Canvas, p canvas.Point) canvas.Point {
		return canvas.Point{X: p.X * res.DPMM(), Y: (c.H - p.Y) * res.DPMM()}
	}
	require.NoError(t, testDrawingWith(reg, b, toPixels)(c))
	want := rasterizer.Draw(c, res, canvas.LinearColorSpace{})
	require.Equal(t, want.Bounds().Size(), got.Bounds().Size())
	mean, share := tooltest.CompareImages(got, want, 48)
	t.Logf("mean abs diff %.3f/255, pixels off by > 48: %.3f %%", mean, 100*share)
	assert.Less(t, mean, 1.0)
	assert.Less(t, share, 0.01)
	// The text alone (the two lines at y 165 and 180 mm, x 20–110 mm),
	// where a wrong glyph would hide in the whole page's average. Limits
	// set here: measured 0.50–0.67/255 and 0.08–0.18 % on these fonts; a
	// charset off by one (every glyph the next one's) gave 4.3–6.9/255
	// and 3.3–4.8 %.
	px := func(x, y float64) (int, int) { return int(x * res.DPMM()), int((c.H - y) * res.DPMM()) }
	x0, y0 := px(18, 190)
	x1, y1 := px(110, 160)
	r := image.Rect(x0, y0, x1, y1)
	mean, share = tooltest.CompareImages(tooltest.SubImage(got, r), tooltest.SubImage(want, r), 48)
	t.Logf("text: mean abs diff %.3f/255, pixels off by > 48: %.3f %%", mean, 100*share)
	assert.Less(t, mean, 2.0, "text pixels")
	assert.Less(t, share, 0.01, "text pixels")
}

func TestCFFLicenceInPDF(t *testing.T) {
	tooltest.Require(t, "pdffonts", "poppler-utils")
	fs := func(v uint16) []byte { return binary.BigEndian.AppendUint16(nil, v) }
	// OpenType OS/2 fsType 0x0100: No subsetting. The font goes in whole,
	// named without a subset tag (ISO 32000-1 §9.6.4 tags subsets only).
	whole := withTable(t, lmsans10regular.TTF, "fsType", fs(0x0100))
	doc := cffDoc(t, whole, lmsans10bold.TTF)
	rows := pdffonts(t, writeTemp(t, "whole.pdf", doc))
	var found bool
	for _, r := range rows {
		if r.name == "LMSans10-Regular" {
			found = true
			assert.Equal(t, "no", r.sub)
			assert.Equal(t, "yes", r.emb)
		}
	}
	assert.True(t, found, "whole font listed without a tag: %v", rows)
	assert.Greater(t, len(doc), len(cffDoc(t, lmsans10regular.TTF, lmsans10bold.TTF))+20000, "the whole font is larger than a subset")

	// 0x0002 Restricted License embedding: the writer refuses.
	restricted := loadFont(t, withTable(t, lmsans10regular.TTF, "fsType", fs(0x0002)))
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "x", Date: testDate})
	require.NoError(t, w.AddPage(PageSetup{Boxes: a5Boxes()}, testDrawing(restricted, restricted)))
	err := w.Close()
	require.Error(t, err)
	assert.Contains(t, err.Error(), "Restricted License embedding")
	assert.Contains(t, err.Error(), "LMSans10-Regular")
}
