package pdf

import (
	"bytes"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/model"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/types"
	"github.com/tdewolff/canvas"

	"sheaf/render/tooltest"
)

// readStrict reads and validates a document with pdfcpu v0.15.0 (a
// general-purpose PDF library) in strict mode.
func readStrict(t *testing.T, b []byte) *model.Context {
	t.Helper()
	conf := model.NewDefaultConfiguration()
	conf.ValidationMode = model.ValidationStrict
	ctx, err := api.ReadContext(bytes.NewReader(b), conf)
	if err != nil {
		t.Fatalf("pdfcpu read: %v", err)
	}
	if err := api.ValidateContext(ctx); err != nil {
		t.Fatalf("pdfcpu strict validation: %v", err)
	}
	return ctx
}

func dict(t *testing.T, ctx *model.Context, o types.Object) types.Dict {
	t.Helper()
	d, err := ctx.DereferenceDict(o)
	if err != nil || d == nil {
		t.Fatalf("dereference %v: %v", o, err)
	}
	return d
}

func TestPDFCPUReadBack(t *testing.T) {
	const pages = 3
	doc := writeDoc(t, Options{Title: "Read back", Version: "0.0.1", Date: testDate}, pages)
	ctx := readStrict(t, doc)

	if ctx.PageCount != pages {
		t.Errorf("page count %d, want %d", ctx.PageCount, pages)
	}
	want := a5Boxes()
	pbs, err := ctx.PageBoundaries(nil)
	if err != nil {
		t.Fatal(err)
	}
	near := func(r *types.Rectangle, w canvas.Rect) bool {
		return r != nil && math.Abs(r.LL.X-w.X0) < 0.01 && math.Abs(r.LL.Y-w.Y0) < 0.01 &&
			math.Abs(r.UR.X-w.X1) < 0.01 && math.Abs(r.UR.Y-w.Y1) < 0.01
	}
	for i, pb := range pbs {
		// ISO 32000-1 §14.11.2: boxes as asked, CropBox = MediaBox here.
		for _, c := range []struct {
			name string
			box  *model.Box
			want canvas.Rect
		}{{"MediaBox", pb.Media, want.Media}, {"CropBox", pb.Crop, want.Media}, {"BleedBox", pb.Bleed, want.Bleed}, {"TrimBox", pb.Trim, want.Trim}} {
			if c.box == nil || !near(c.box.Rect, c.want) {
				t.Errorf("page %d %s = %v, want %v (±0.01 pt)", i+1, c.name, c.box, c.want)
			}
		}
		// PDF/X: TrimBox or ArtBox, not both (print-facts.md, PDF/X-4).
		d, _, _, err := ctx.PageDict(i+1, false)
		if err != nil {
			t.Fatal(err)
		}
		if _, ok := d.Find("ArtBox"); ok {
			t.Errorf("page %d has an ArtBox besides its TrimBox", i+1)
		}
		// every font embedded (PDF/X-4, print-facts.md)
		res := dict(t, ctx, d["Resources"])
		fonts := dict(t, ctx, res["Font"])
		if len(fonts) < 2 {
			t.Errorf("page %d has %d fonts, want the two test fonts", i+1, len(fonts))
		}
		for name, f := range fonts {
			fd := dict(t, ctx, f)
			if st := fd.NameEntry("Subtype"); st == nil || *st != "Type0" {
				t.Errorf("font %s subtype %v, want Type0", name, st)
			}
			if _, ok := fd.Find("ToUnicode"); !ok {
				t.Errorf("font %s has no ToUnicode", name)
			}
			arr, err := ctx.DereferenceArray(fd["DescendantFonts"])
			if err != nil || len(arr) != 1 {
				t.Fatalf("font %s descendants: %v", name, err)
			}
			cid := dict(t, ctx, arr[0])
			if st := cid.NameEntry("Subtype"); st == nil || *st != "CIDFontType2" {
				t.Errorf("font %s descendant %v, want CIDFontType2", name, st)
			}
			desc := dict(t, ctx, cid["FontDescriptor"])
			if _, ok := desc.Find("FontFile2"); !ok {
				t.Errorf("font %s is not embedded (no FontFile2)", name)
			}
		}
	}

	root, err := ctx.Catalog()
	if err != nil {
		t.Fatal(err)
	}
	ois, err := ctx.DereferenceArray(root["OutputIntents"])
	if err != nil || len(ois) != 1 {
		t.Fatalf("OutputIntents %v (%v); PDF/X-4 wants exactly one", ois, err)
	}
	oi := dict(t, ctx, ois[0])
	if s := oi.NameEntry("S"); s == nil || *s != "GTS_PDFX" {
		t.Errorf("output intent S = %v, want GTS_PDFX", s)
	}
	if _, ok := oi.Find("DestOutputProfile"); !ok {
		t.Error("output intent has no DestOutputProfile")
	}
	if _, ok := root.Find("Metadata"); !ok {
		t.Error("catalog has no Metadata (XMP)")
	}
	info := dict(t, ctx, *ctx.Info)
	if tr := info.NameEntry("Trapped"); tr == nil || *tr != "False" {
		t.Errorf("Info /Trapped = %v, want /False (PDF/X-4 wants True or False)", tr)
	}
	for _, k := range []string{"Title", "CreationDate", "ModDate", "Producer"} {
		if _, ok := info.Find(k); !ok {
			t.Errorf("Info has no %s", k)
		}
	}
	if len(ctx.ID) != 2 {
		t.Errorf("trailer /ID = %v, want two strings (required by PDF/X)", ctx.ID)
	}
}

// TestXMPMatchesInfo: PDF/X-4 wants Title and dates in Info and XMP to
// agree (print-facts.md, PDF/X-4).
func TestXMPMatchesInfo(t *testing.T) {
	doc := writeDoc(t, Options{Title: "Words & <years>", Version: "2.0", Date: testDate}, 1)
	s := string(doc)
	for _, want := range []string{
		"/CreationDate (D:20240517093000Z00'00')", "/ModDate (D:20240517093000Z00'00')", "/Trapped /False",
		"<xmp:CreateDate>2024-05-17T09:30:00Z</xmp:CreateDate>", "<xmp:ModifyDate>2024-05-17T09:30:00Z</xmp:ModifyDate>",
		"<pdf:Producer>sheaf 2.0</pdf:Producer>", "/Producer (sheaf 2.0)", "<pdf:Trapped>False</pdf:Trapped>",
		"<pdfxid:GTS_PDFXVersion>PDF/X-4</pdfxid:GTS_PDFXVersion>",
		`<rdf:li xml:lang="x-default">Words &amp; &lt;years&gt;</rdf:li>`, "/Title (Words & <years>)",
	} {
		if !strings.Contains(s, want) {
			t.Errorf("document lacks %q", want)
		}
	}
}

func writeTemp(t *testing.T, name string, b []byte) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func run(t *testing.T, name string, args ...string) string {
	t.Helper()
	out, err := exec.Command(name, args...).CombinedOutput()
	if err != nil {
		t.Fatalf("%s %v: %v\n%s", name, args, err, out)
	}
	return string(out)
}

// TestOutsideTools runs the document through qpdf, poppler and
// Ghostscript.
func TestOutsideTools(t *testing.T) {
	doc := writeDoc(t, Options{Title: "Outside", Version: "0.0.1", Date: testDate}, 2)
	path := writeTemp(t, "doc.pdf", doc)

	t.Run("qpdf --check", func(t *testing.T) {
		tooltest.Require(t, "qpdf", "qpdf")
		out := run(t, "qpdf", "--check", path)
		if !strings.Contains(out, "No syntax or stream encoding errors") {
			t.Errorf("qpdf --check:\n%s", out)
		}
	})
	t.Run("pdfinfo -box", func(t *testing.T) {
		tooltest.Require(t, "pdfinfo", "poppler-utils")
		out := run(t, "pdfinfo", "-box", path)
		b := a5Boxes()
		for _, c := range []struct {
			name string
			r    canvas.Rect
		}{{"MediaBox", b.Media}, {"CropBox", b.Media}, {"BleedBox", b.Bleed}, {"TrimBox", b.Trim}} {
			re := regexp.MustCompile(c.name + `:\s+([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)`)
			m := re.FindStringSubmatch(out)
			if m == nil {
				t.Errorf("pdfinfo shows no %s:\n%s", c.name, out)
				continue
			}
			for i, want := range []float64{c.r.X0, c.r.Y0, c.r.X1, c.r.Y1} {
				got, _ := strconv.ParseFloat(m[i+1], 64)
				if math.Abs(got-want) > 0.01 { // pdfinfo prints 2 decimals
					t.Errorf("%s[%d] = %v, want %.3f", c.name, i, got, want)
				}
			}
		}
		if !strings.Contains(out, "Pages:           2") {
			t.Errorf("pdfinfo pages:\n%s", out)
		}
	})
	t.Run("pdffonts", func(t *testing.T) {
		tooltest.Require(t, "pdffonts", "poppler-utils")
		out := run(t, "pdffonts", path)
		lines := strings.Split(strings.TrimSpace(out), "\n")
		if len(lines) < 4 {
			t.Fatalf("pdffonts lists too few fonts:\n%s", out)
		}
		tag := regexp.MustCompile(`^[A-Z]{6}\+`)
		for _, l := range lines[2:] {
			f := strings.Fields(l)
			// name type(2 words) encoding emb sub uni object ID
			if len(f) < 8 || f[len(f)-5] != "yes" || f[len(f)-4] != "yes" || f[len(f)-3] != "yes" {
				t.Errorf("font not embedded+subset+ToUnicode: %q", l)
			}
			if !tag.MatchString(f[0]) {
				t.Errorf("font name %q lacks a subset tag", f[0])
			}
		}
	})
	t.Run("gs renders", func(t *testing.T) {
		tooltest.Require(t, "gs", "ghostscript")
		out := run(t, "gs", "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=nullpage", path)
		if strings.Contains(strings.ToLower(out), "error") || strings.Contains(out, "****") {
			t.Errorf("ghostscript complained:\n%s", out)
		}
	})
	t.Run("pdftotext", func(t *testing.T) {
		tooltest.Require(t, "pdftotext", "poppler-utils")
		out := run(t, "pdftotext", path, "-")
		for _, want := range []string{"Sheaf of words 1820–2020", "office affine AVATAR", "job demo · sheet.pdf · page 2"} {
			if !strings.Contains(out, want) {
				t.Errorf("pdftotext lacks %q:\n%s", want, out)
			}
		}
	})
}
