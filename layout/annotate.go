package layout

import (
	"unicode/utf8"

	"sheaf/layout/fonts"
)

// wrapDek sets the dek to its measure: text.dek-measure characters of the
// dek's own average width (default 70; comfortable reading is about 45–75
// characters a line — common practice), never wider than the live area.
// The lines are fewer and longer than a narrow column's, and each reads
// comfortably.
func (s *solver) wrapDek(wrap func(fonts.Style, float64, string, string, ...float64) []string) []string {
	dek := s.spec.Dek
	if dek == "" {
		return nil
	}
	return wrap(fonts.Regular, s.dek, dek, "dek", s.dekMeasure())
}

// dekMeasure is the dek's line length in points.
func (s *solver) dekMeasure() float64 {
	dek, n := s.spec.Dek, s.spec.Text.DekMeasure
	runes := utf8.RuneCountInString(dek)
	if n <= 0 || runes == 0 {
		return s.liveW
	}
	avg := s.fs.Width(fonts.Regular, s.dek, dek) / float64(runes)
	return min(s.liveW, avg*float64(n))
}

// PeriodRow is the height of the key's row of labelled periods: a
// bracket over each span, clear of the year labels above, and the label
// under it.
func PeriodRow(ticks, leading float64) float64 { return 1.5 * ticks * leading }
