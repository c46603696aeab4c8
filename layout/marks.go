package layout

// Crop-mark rule (common practice; no standard fixes it — print-facts.md
// "Crop marks": marks start at least one bleed width outside the trim and
// never print into the bleed, about 6 mm long; trimming drifts 0.5–1 mm):
// a mark runs along the line of a trim edge from CropMarks' offset to
// offset+length outside the trim.
const (
	markGap       = 1 * mm // clear of the bleed's edge, so trimming drift never shows a mark on the artwork
	markMinOffset = 3 * mm // clear of the trim when there is little or no bleed
	markLength    = 6 * mm
)

// CropMarks is sheaf's one crop-mark rule: for a bleed (pt), where a
// mark starts outside the trim and how long it is (pt): offset =
// max(bleed + 1 mm, 3 mm), length 6 mm. The layout reports it in the
// plan (MarkOffset, MarkLength), checks the slug holds it, and the PDF
// writer draws what the plan says.
func CropMarks(bleed float64) (offset, length float64) {
	return max(bleed+markGap, markMinOffset), markLength
}
