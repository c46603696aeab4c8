package pdf

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/tooltest"
)

// TestXMPMatchesInfo: PDF/X-4 wants Title and dates in Info and XMP to
// agree (print-facts.md, PDF/X-4).
func TestXMPMatchesInfo(t *testing.T) {
	doc := writeDoc(t, Options{Title: "Words & <years>", Version: "2.0", Date: testDate}, 1)
	s := string(doc)
	for _, want := range []string{
		"/CreationDate (D:20240517093000Z00'00')", "/ModDate (D:20240517093000Z00'00')", "/Trapped /False",
		"<xmp:CreateDate>2024-05-17T09:30:00Z</xmp:CreateDate>", "<xmp:ModifyDate>2024-05-17T09:30:00Z</xmp:ModifyDate>",
		"<pdf:Producer>sheaf 2.0</pdf:Producer>", "/Producer (sheaf 2.0)", "<pdf:Trapped>False</pdf:Trapped>",
		`<rdf:li xml:lang="x-default">Words &amp; &lt;years&gt;</rdf:li>`, "/Title (Words & <years>)",
	} {
		assert.True(t, strings.Contains(s, want), "document lacks %q", want)
	}
	// Without a printing condition the file is honest RGB: no PDF/X claim
	// (ISO 15930-7 needs a printing condition's output intent).
	for _, not := range []string{"pdfxid", "GTS_PDFX", "/OutputIntents"} {
		assert.False(t, strings.Contains(s, not), "an RGB document has %q", not)
	}
}

func writeTemp(t *testing.T, name string, b []byte) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	require.NoError(t, os.WriteFile(p, b, 0o644))
	return p
}

func run(t *testing.T, name string, args ...string) string {
	t.Helper()
	out, err := exec.Command(name, args...).CombinedOutput()
	require.NoError(t, err, "%s %v: %v\n%s", name, args, err, out)
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
		assert.True(t, strings.Contains(out, "No syntax or stream encoding errors"), "qpdf --check:\n%s", out)
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
			if !assert.NotNil(t, m, "pdfinfo shows no %s:\n%s", c.name, out) {
				continue
			}
			for i, want := range []float64{c.r.X0, c.r.Y0, c.r.X1, c.r.Y1} {
				got, err := strconv.ParseFloat(m[i+1], 64)
				require.NoError(t, err, "%s[%d]", c.name, i)
				assert.InDelta(t, want, got, 0.01, "%s[%d] (pdfinfo prints 2 decimals)", c.name, i)
			}
		}
		assert.True(t, strings.Contains(out, "Pages:           2"), "pdfinfo pages:\n%s", out)
	})
	t.Run("pdffonts", func(t *testing.T) {
		tooltest.Require(t, "pdffonts", "poppler-utils")
		out := run(t, "pdffonts", path)
		lines := strings.Split(strings.TrimSpace(out), "\n")
		require.GreaterOrEqual(t, len(lines), 4, "pdffonts lists too few fonts:\n%s", out)
		tag := regexp.MustCompile(`^[A-Z]{6}\+`)
		for _, l := range lines[2:] {
			f := strings.Fields(l)
			// name type(2 words) encoding emb sub uni object ID
			assert.False(t, len(f) < 8 || f[len(f)-5] != "yes" || f[len(f)-4] != "yes" || f[len(f)-3] != "yes", "font not embedded+subset+ToUnicode: %q", l)
			assert.True(t, tag.MatchString(f[0]), "font name %q lacks a subset tag", f[0])
		}
	})
	t.Run("gs renders", func(t *testing.T) {
		tooltest.Require(t, "gs", "ghostscript")
		out := run(t, "gs", "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=nullpage", path)
		assert.False(t, strings.Contains(strings.ToLower(out), "error") || strings.Contains(out, "****"), "ghostscript complained:\n%s", out)
	})
	t.Run("pdftotext", func(t *testing.T) {
		tooltest.Require(t, "pdftotext", "poppler-utils")
		out := run(t, "pdftotext", path, "-")
		for _, want := range []string{"Sheaf of words 1820–2020", "office affine AVATAR", "job demo · sheet.pdf · page 2"} {
			assert.True(t, strings.Contains(out, want), "pdftotext lacks %q:\n%s", want, out)
		}
	})
}
