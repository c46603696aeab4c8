package production

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/render/pdf"
)

// TestMarkDefaultsFollowLayout: the PDF writer's crop-mark defaults, for
// callers with no plan, are the layout's one rule (layout.CropMarks): a
// page drawn with default marks has the very content of one drawn with
// the rule's numbers, whatever the bleed.
func TestMarkDefaultsFollowLayout(t *testing.T) {
	const mm = 72 / 25.4
	for _, bleed := range []float64{0, 1.5 * mm, 3 * mm, 0.125 * 72, 5 * mm} { // none, thin, Europe, North America, wide (print-facts.md)
		slug := 12 * mm
		m := bleed + slug
		boxes := pdf.PageBoxes{
			Media: canvas.Rect{X0: 0, Y0: 0, X1: 420 + 2*m, Y1: 595 + 2*m},
			Bleed: canvas.Rect{X0: slug, Y0: slug, X1: 420 + 2*m - slug, Y1: 595 + 2*m - slug},
			Trim:  canvas.Rect{X0: m, Y0: m, X1: 420 + m, Y1: 595 + m},
		}
		off, length := layout.CropMarks(bleed)
		byDefault, err := pdf.EncodePage(pdf.PageSetup{Boxes: boxes, Marks: &pdf.MarkOptions{}}, nil)
		require.NoError(t, err)
		byRule, err := pdf.EncodePage(pdf.PageSetup{Boxes: boxes, Marks: &pdf.MarkOptions{Offset: off, Length: length}}, nil)
		require.NoError(t, err)
		assert.Equal(t, string(byRule.Content), string(byDefault.Content), "bleed %.3f pt", bleed)
	}
}
