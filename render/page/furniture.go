package page

import (
	"strconv"
	"strings"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/specs"
)

// key draws one colour-key band: the era palette as a strip with year
// labels, so a reader never has to turn back to decode colour, and a note
// on what the panels' heights mean. Every page has one at its top; a
// scrolling page repeats it down the page (layout's KeyRepeats).
func (f *Feature) key(p pen, k layout.KeyBand) {
	r, strip, ticks := k.Key, k.Strip, k.Ticks
	if r.H() <= 0 || strip.W() <= 0 {
		return
	}
	size := f.Output.Type.Key.Pt()
	caption := f.Spec.Phrase(specs.PhraseKeyTitle)
	capW := f.Fonts.Width(fonts.Bold, size, caption)
	x0 := strip.X0 + capW + size*0.8
	x1 := strip.X1
	if x1-x0 < strip.W()/2 { // a narrow page: caption above the strip instead
		x0 = strip.X0
	}
	mid := (strip.Y0 + strip.Y1) / 2
	m := f.Fonts.Metrics(fonts.Bold, size)
	capBase := mid - (m.CapHeight)/2
	if x0 == strip.X0 {
		capBase = strip.Y1 + m.Descent + size*0.2
	}
	p.text(fonts.Bold, size, ink, strip.X0, capBase, canvas.Left, caption)
	p.fillRect(x0, strip.Y0, x1, strip.Y1, nil, f.gradient(p, x0, x1, strip.Y1))

	tsize := f.Output.Type.Ticks.Pt()
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	tick := tsize * 0.3
	base := ticks.Y1 - tick - f.Fonts.Metrics(fonts.Regular, tsize).Ascent - tsize*0.1
	years := f.tickYears(x1-x0, tsize)
	if len(f.Spec.Palette.Eras) > 0 {
		years = f.eraTicks(x1-x0, tsize)
	}
	for _, y := range years {
		x := x0 + (float64(y)-from)/(to-from)*(x1-x0)
		p.line(x, strip.Y0, x, strip.Y0-tick, f.Rule(), ruleGrey)
		p.text(fonts.Figures, tsize, inkSoft, x, base, canvas.Center, strconv.Itoa(y))
	}
	f.periodsRow(p, r, ticks, x0, x1)
	// What the height means, right-aligned in the band beside the strip:
	// on one line level with the strip, or on two (strip and tick row),
	// in the longest wording that fits, never over the strip.
	room := r.X1 - (x1 + size*1.5)
	lines := f.noteLines(size, room)
	for i, l := range lines {
		y := mid - m.CapHeight/2
		if i == 1 {
			y = base
		}
		p.text(fonts.Regular, size, inkSoft, r.X1, y, canvas.Right, l)
	}
}

// eraTicks labels a stepped palette's era boundaries (and its ends), left
// out where a label would collide with the one before.
func (f *Feature) eraTicks(width, size float64) []int {
	from, to := f.Data.Span.From, f.Data.Span.To
	gap := f.Fonts.Width(fonts.Figures, size, "0000") + size
	perYear := width / float64(to-from)
	years := []int{from}
	for _, e := range f.Spec.Palette.Eras {
		if float64(e-years[len(years)-1])*perYear >= gap {
			years = append(years, e)
		}
	}
	if float64(to-years[len(years)-1])*perYear < gap {
		years = years[:len(years)-1]
	}
	return append(years, to)
}

// noteLines returns the scale note set in at most two lines of width,
// trying the full wording first, then the short one; nil when neither
// fits (preflight then reports nothing is lost: the note is a courtesy,
// the label's peak year and the panels say the same).
func (f *Feature) noteLines(size, width float64) []string {
	if width <= 0 {
		return nil
	}
	for _, note := range f.scaleNotes() {
		if f.Fonts.Width(fonts.Regular, size, note) <= width {
			return []string{note}
		}
		if lines := f.Fonts.Wrap(fonts.Regular, size, note, width); len(lines) == 2 &&
			f.Fonts.Width(fonts.Regular, size, lines[0]) <= width && f.Fonts.Width(fonts.Regular, size, lines[1]) <= width {
			return lines
		}
	}
	return nil
}

// scaleNotes says what a panel's height means, in a full and a short
// wording; with smoothing it says so first ("5-year rolling share"), and
// with a band what the tint is.
func (f *Feature) scaleNotes() []string {
	notes := f.heightNotes()
	roll := f.Spec.Smoothing(f.Data.Rolling) // the language's "5-year rolling share" (Data.Note's wording in English)
	band := ""
	if f.Output.Band > 0 {
		band = "; " + specs.Fill(f.Spec.Phrase(specs.PhraseBandTint), "level", f.Spec.FormatSignificant(f.Output.Band*100))
	}
	if roll == "" && band == "" {
		return notes
	}
	lead := ""
	if roll != "" {
		lead = strings.ToUpper(roll[:1]) + roll[1:] + ". "
	}
	out := []string{lead + notes[0] + band, lead + notes[1] + band}
	if roll != "" {
		// The shortest says the smoothing and leaves out the rest.
		out = append(out, lead+notes[1], strings.TrimSuffix(lead, ". "))
	}
	return out
}

func (f *Feature) heightNotes() []string {
	s := f.Spec.Scale
	ph := func(id specs.PhraseID) string {
		return specs.Fill(f.Spec.Phrase(id), "max", f.Spec.FormatSignificant(f.Data.YMax), "unit", f.Data.Unit)
	}
	pair := func(full, short specs.PhraseID) []string {
		if f.Spec.Text.KeyNote != "" { // the spec's own wording, for both
			return []string{ph(full), ph(full)}
		}
		return []string{ph(full), ph(short)}
	}
	switch {
	case s.Mode == specs.ScaleOwnPeak && f.Output.PeakDot:
		return pair(specs.PhraseNoteOwnPeakDot, specs.PhraseNoteOwnPeakDotShort)
	case s.Mode == specs.ScaleOwnPeak:
		return pair(specs.PhraseNoteOwnPeak, specs.PhraseNoteOwnPeakShort)
	case s.YRange == specs.YShared:
		return pair(specs.PhraseNoteShared, specs.PhraseNoteSharedShort)
	default:
		return pair(specs.PhraseNoteOwn, specs.PhraseNoteOwnShort)
	}
}

// MeasureFurniture asks the fonts for the widths drawing the first
// page's colour key asks for (caption, year labels, periods, note; drawn
// on a canvas that is thrown away) and those of its panels' year labels.
// Every page has the same key and panels as wide, so a caller that saves
// the widths asked before drawing (a rebuild's widths cache) has them
// whichever pages it draws later.
func (f *Feature) MeasureFurniture() {
	if len(f.Plan.Pages) == 0 {
		return
	}
	pg := &f.Plan.Pages[0]
	c := canvas.New(pg.Media.W()*mm, pg.Media.H()*mm)
	p := pen{ctx: canvas.NewContext(c), fonts: f.Fonts}
	f.key(p, pg.Keys()[0]) // the repeats of a scrolling page are drawn alike
	size := f.Output.Type.Ticks.Pt()
	for _, pn := range pg.Panels {
		for _, y := range f.tickYears(pn.Plot.W(), size) { // as tickLabels asks
			f.Fonts.Width(fonts.Figures, size, strconv.Itoa(y))
		}
	}
}
