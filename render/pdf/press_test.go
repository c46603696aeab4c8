package pdf

import (
	"bytes"
	"os"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/tooltest"
)

func coated(t testing.TB) *press.Condition {
	t.Helper()
	b, err := os.ReadFile(tooltest.ICCProfile(t, "default_cmyk.icc"))
	require.NoError(t, err)
	c, err := press.New(b, press.Settings{Condition: "Generic coated for a test", Registry: "http://www.color.org", InkLimit: 300, Intent: icc.RelativeColorimetric})
	require.NoError(t, err)
	return c
}

func writePressDoc(t testing.TB, cond *press.Condition, level int) []byte {
	t.Helper()
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "Press", Version: "0.0.1", Date: testDate, Press: cond, Compression: level})
	for i := 0; i < 2; i++ {
		setup := PageSetup{Boxes: a5Boxes(), Marks: &MarkOptions{}, Slug: "press test", Press: cond}
		draw := testDrawing(reg, bold)
		require.NoError(t, w.AddPage(setup, func(c *canvas.Canvas) error {
			if err := draw(c); err != nil {
				return err
			}
			// black type, as sheaf sets its furniture (#1a1a1a)
			ctx := canvas.NewContext(c)
			ctx.DrawText(20, 40, canvas.NewTextLine(reg.Face(9, canvas.Hex("#1a1a1a")), "Black type", canvas.Left))
			return nil
		}))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}

// TestPressDocument: with a printing condition the document is PDF/X-4 in
// the press's colours. Each requirement is ISO 15930-7:2010 as README lists
// it (from memory where marked there).
func TestPressDocument(t *testing.T) {
	cond := coated(t)
	doc := string(writePressDoc(t, cond, Uncompressed))
	for _, want := range []struct{ text, why string }{
		{"/OutputIntents [<< /Type /OutputIntent /S /GTS_PDFX /OutputConditionIdentifier (Generic coated for a test)", "§6.2.4: a GTS_PDFX output intent naming the condition"},
		{"/RegistryName (http://www.color.org)", "the registry of the condition"},
		{"/DestOutputProfile 5 0 R", "§6.2.4: the output intent embeds the press profile"},
		{"/N 4 /Alternate /DeviceCMYK", "the embedded profile is CMYK (ISO 32000-1 §8.6.5.5)"},
		{"/GTS_PDFXVersion (PDF/X-4)", "Info identifies the file"},
		{"<pdfxid:GTS_PDFXVersion>PDF/X-4</pdfxid:GTS_PDFXVersion>", "§6.7.5: XMP identifies the file"},
		{"/DeviceCMYK cs", "content is in the press's device space"},
		{"/OP true /op true /OPM 1", "black type overprints (common practice)"},
		{"/ColorSpace /DeviceCMYK /Coords", "gradients are CMYK shadings"},
		{"[/Separation /All 6 0 R << /FunctionType 2 /Domain [0 1] /C0 [0 0 0 0] /C1 [1 1 1 1] /N 1 >>]", "registration marks all four plates"},
		{"/Trapped /False", "§6.7.4 (from memory): Trapped is True or False"},
	} {
		assert.Contains(t, doc, want.text, want.why)
	}
	assert.NotContains(t, doc, "/CS0 cs", "no sRGB colour is left")
	assert.NotContains(t, doc, "/CS0 CS", "no sRGB colour is left")
	// The embedded profile is the press's, byte for byte.
	assert.True(t, bytes.Contains([]byte(doc), cond.Profile.Bytes()), "DestOutputProfile carries the given profile")
}

// A page drawn for another colour space is refused, not mixed in.
func TestPressPageMismatch(t *testing.T) {
	cond := coated(t)
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	rgbPage, err := EncodePage(PageSetup{Boxes: a5Boxes()}, testDrawing(reg, bold))
	require.NoError(t, err)
	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Press: cond})
	require.NoError(t, w.AddEncoded(rgbPage))
	err = w.Close()
	require.Error(t, err)
	assert.Contains(t, err.Error(), "does not belong")
}

func TestPressOutsideTools(t *testing.T) {
	cond := coated(t)
	path := writeTemp(t, "press.pdf", writePressDoc(t, cond, 0))
	t.Run("qpdf --check", func(t *testing.T) {
		tooltest.Require(t, "qpdf", "qpdf")
		out := run(t, "qpdf", "--check", path)
		assert.Contains(t, out, "No syntax or stream encoding errors")
	})
	t.Run("gs renders", func(t *testing.T) {
		tooltest.Require(t, "gs", "ghostscript")
		out := run(t, "gs", "-q", "-dNOPAUSE", "-dBATCH", "-dSAFER", "-sDEVICE=nullpage", path)
		assert.False(t, strings.Contains(strings.ToLower(out), "error") || strings.Contains(out, "****"), out)
	})
}
