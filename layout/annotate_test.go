package layout

import (
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestDekMeasure: the dek is set at text.dek-measure characters (default
// 70; comfortable reading is about 45–75 characters a line — common
// practice) of its own average width: every line but the last is longer
// than the measure less the next word (the wrap is greedy) and no line
// is wider than the measure.
func TestDekMeasure(t *testing.T) {
	dek := strings.Repeat("How often the words of an invented weekly rose and fell, year by year. ", 5)
	for _, measure := range []int{45, 70} {
		s := testSpec()
		s.Dek = dek
		s.Text.DekMeasure = measure
		out := a4Print()
		p, err := Solve(s, &out, fontSet(t), []Group{{Count: 12}})
		require.NoError(t, err)
		var lines []string
		for _, l := range p.Pages[0].Text {
			if l.Role == RoleDek {
				lines = append(lines, l.Text)
				sp := &solver{spec: s, fs: fontSet(t), dek: out.Type.Dek.Pt(), liveW: p.Pages[0].Live.W()}
				assert.LessOrEqual(t, l.Width, sp.dekMeasure()+1e-9, "measure %d: %q", measure, l.Text)
			}
		}
		require.Greater(t, len(lines), 2)
		for _, l := range lines[:len(lines)-1] {
			n := utf8.RuneCountInString(l)
			assert.InDelta(t, measure, n, float64(measure)*0.2, "measure %d: %q has %d characters", measure, l, n)
		}
	}
}

// TestGapNote: the gap note stands on every page by default, on page 1
// only with gap-note-on: first-page, nowhere with none; it says the years
// as spans.
func TestGapNote(t *testing.T) {
	for _, tt := range []struct {
		on    string
		pages []int // pages (1-based) with the note
	}{
		{specs.GapNoteEveryPage, []int{1, 2, 3}},
		{specs.GapNoteFirstPage, []int{1}},
		{specs.GapNoteNone, nil},
	} {
		s := testSpec()
		s.DataGaps = []int{1917, 1918, 1943}
		s.Text.GapNoteOn = tt.on
		out := a4Print()
		p, err := Solve(s, &out, fontSet(t), []Group{{Count: 150}})
		require.NoError(t, err)
		require.GreaterOrEqual(t, len(p.Pages), 3)
		var with []int
		for _, pg := range p.Pages[:3] {
			for _, l := range pg.Text {
				if strings.Contains(l.Text, "1917–1918 and 1943") {
					with = append(with, pg.Number)
					assert.GreaterOrEqual(t, l.Box.Y0, pg.Footer.Y0-1e-9, "the note's bottom is in the footer %v", pg.Footer)
					assert.LessOrEqual(t, l.Box.Y1, pg.Footer.Y1+1e-9, "the note's top is in the footer %v", pg.Footer)
				}
			}
		}
		assert.Equal(t, tt.pages, with, tt.on)
	}
}
