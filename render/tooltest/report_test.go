package tooltest

import (
	"bytes"
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestReport(t *testing.T) {
	var b bytes.Buffer
	Report(&b)
	assert.Empty(t, b.String(), "nothing skipped, nothing said")
	skipped("pdftoppm", "poppler-utils")
	skipped("pdfinfo", "poppler-utils")
	skipped("pdftoppm", "poppler-utils")
	skipped("qpdf", "qpdf")
	t.Cleanup(func() { skips.n, skips.missing = 0, map[string]map[string]bool{} })
	Report(&b)
	assert.Equal(t, "tooltest: 4 outside checks skipped; missing: poppler-utils (pdfinfo, pdftoppm), qpdf (qpdf); install them with the apt-get line in README (Tests)\n", b.String())
}
