package page

import (
	"math"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
)

// Label is how a panel's term is set: on one line at its size beside the
// peak text; wrapped onto more lines at that size (up to the output's
// label-lines); shrunk, on as few lines as the smaller size allows; when
// even the smallest allowed size is too wide, the peak text (which the
// peak dot and the curve also show) makes room; only then is the term cut
// with an ellipsis.
type Label struct {
	Item      int     `json:"item"`      // index into the data's series
	Term      string  `json:"term"`      // the term as written
	Text      string  `json:"text"`      // what is drawn, on one line or wrapped
	Size      float64 `json:"size"`      // type size in points
	Shrunk    bool    `json:"shrunk"`    // set smaller than the output's label size
	Truncated bool    `json:"truncated"` // cut with an ellipsis
	NoPeak    bool    `json:"no_peak"`   // the peak year is left out to make room
	// ForRow: the label would fit at a larger size and is set smaller
	// only so its row keeps one size.
	ForRow bool `json:"for_row,omitempty"`
	// Lines are Text's lines, top down, when the label wraps (two or
	// more); nil when it is set on one line. The last line stands on the
	// row's baseline beside the peak text; the ones above rise into the
	// label band the layout reserved (layout.Plan.LabelLines).
	Lines []string `json:"lines,omitempty"`
}

// Wrapped reports whether the label is set on more than one line.
func (l Label) Wrapped() bool { return len(l.Lines) > 1 }

// Drawn returns the label's lines as drawn, top down.
func (l Label) Drawn() []string {
	if len(l.Lines) > 0 {
		return l.Lines
	}
	return []string{l.Text}
}

// DrawnText is the label's lines joined by newlines: Text when it is set
// on one line. Build caches hash it, so a label that wraps differently
// redraws its page.
func (l Label) DrawnText() string { return strings.Join(l.Drawn(), "\n") }

// labelGap is the clear space between a label's last line and the peak
// text beside it, in ems of the tick size.
const labelGap = 0.8

// labelRoom is the room a term's lines have in a panel w wide: every line
// but the last spans the panel; the last shares it with the peak text.
type labelRoom struct{ last, other float64 }

// roomFor is the room of item's label with or without its peak text.
func (f *Feature) roomFor(item int, w float64, peak bool) labelRoom {
	if !peak {
		return labelRoom{w, w}
	}
	tsize := f.Output.Type.Ticks.Pt()
	pw := f.Fonts.Width(fonts.Regular, tsize, f.peakText(&f.Data.Series[item]))
	return labelRoom{w - pw - tsize*labelGap, w}
}

// labelBreak is a place a label may break between lines: the line ends
// at byte end and the next starts at next.
type labelBreak struct {
	end, next int
	soft      bool // after a hyphen or slash inside a word: only when spaces do not do
}

// labelBreaks lists where text may break: at a space (dropped), and after
// a hyphen or slash that joins two letters or digits ("non-destructive",
// "AC/DC"; never before a digit), which stays at the end of its line. Never inside a word
// otherwise: a term broken mid-word reads as two terms (common practice
// for display type: no hyphenation in labels).
func labelBreaks(text string) []labelBreak {
	var bs []labelBreak
	prev := rune(-1)
	for i, r := range text {
		w := utf8.RuneLen(r)
		switch {
		case r == ' ':
			if i > 0 && i+w < len(text) {
				bs = append(bs, labelBreak{end: i, next: i + w})
			}
		case r == '-' || r == '\u2010' || r == '/':
			next, _ := utf8.DecodeRuneInString(text[i+w:])
			// Before a digit it is a minus sign, a range or a fraction:
			// it stays with its number (UAX #14, LB25).
			if isWordRune(prev) && unicode.IsLetter(next) {
				bs = append(bs, labelBreak{end: i + w, next: i + w, soft: true})
			}
		}
		prev = r
	}
	return bs
}

func isWordRune(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }

// breakLabel sets text at size on at most n lines in room, or returns nil
// when it does not fit. It takes the fewest lines; for a given number of
// lines, breaks at spaces before breaks after a hyphen or slash; for a
// given kind, the longest first line (then second, …): lines read as far
// as they can before turning, and the last line, which shares the panel
// with the peak text, is the shortest.
func (f *Feature) breakLabel(text string, size float64, n int, room labelRoom) []string {
	width := func(s string) float64 { return f.Fonts.Width(fonts.Bold, size, s) }
	if width(text) <= room.last {
		return []string{text}
	}
	if n < 2 {
		return nil
	}
	all := labelBreaks(text)
	var hard []labelBreak
	for _, b := range all {
		if !b.soft {
			hard = append(hard, b)
		}
	}
	var set func(bs []labelBreak, start, left int) []string
	set = func(bs []labelBreak, start, left int) []string {
		if rest := text[start:]; width(rest) <= room.last {
			return []string{rest}
		}
		if left < 2 {
			return nil
		}
		for i := len(bs) - 1; i >= 0; i-- {
			b := bs[i]
			if b.end <= start {
				break
			}
			line := text[start:b.end]
			if width(line) > room.other {
				continue
			}
			// The longest first line that fits: when the rest cannot be
			// set after it, it cannot after a shorter one either (a longer
			// rest), so greedy filling finds the fewest lines and the
			// search stays linear in the breaks, for any term.
			if r := set(bs, b.next, left-1); r != nil {
				return append([]string{line}, r...)
			}
			return nil
		}
		return nil
	}
	for k := 2; k <= n; k++ {
		for _, bs := range [][]labelBreak{hard, all} {
			if len(bs) == 0 {
				continue
			}
			if ls := set(bs, 0, k); ls != nil {
				return ls
			}
		}
	}
	return nil
}

// setLines puts lines on l: nil for one line.
func (l *Label) setLines(lines []string) {
	l.Lines = nil
	if len(lines) > 1 {
		l.Lines = lines
	}
}

// fitLabel sets item's term in a panel w wide on at most n lines: at the
// label size on one line, then wrapped, then shrunk (down to the floor,
// each size on as few lines as it needs), then without the peak text the
// same way, then cut.
func (f *Feature) fitLabel(item int, w float64, n int) Label {
	sr := &f.Data.Series[item]
	size, floor := f.Output.Type.Label.Pt(), f.labelFloor()
	for _, peak := range []bool{true, false} {
		room := f.roomFor(item, w, peak)
		for s := size; ; s = max(floor, s-0.25) {
			if ls := f.breakLabel(sr.Term, s, n, room); ls != nil {
				l := Label{Item: item, Term: sr.Term, Text: sr.Term, Size: s, Shrunk: s < size, NoPeak: !peak}
				l.setLines(ls)
				return l
			}
			if s <= floor {
				break
			}
		}
	}
	l := Label{Item: item, Term: sr.Term, Size: floor, Shrunk: floor < size, NoPeak: true, Truncated: true}
	f.cutLabel(&l, w, n)
	return l
}

// cutLabel cuts l's term with an ellipsis at l.Size in a panel w wide
// (no peak text): its first n−1 lines filled as far as they reach at its
// breaks, the rest cut on the last. A term whose first word alone is too
// wide is cut on one line.
func (f *Feature) cutLabel(l *Label, w float64, n int) {
	text := l.Term
	width := func(s string) float64 { return f.Fonts.Width(fonts.Bold, l.Size, s) }
	bs := labelBreaks(text)
	var lines []string
	start := 0
	for len(lines) < n-1 {
		end, nextStart := -1, -1
		for _, b := range bs {
			if b.end > start && width(text[start:b.end]) <= w {
				end, nextStart = b.end, b.next
			}
		}
		if end < 0 {
			break
		}
		lines = append(lines, text[start:end])
		start = nextStart
	}
	r := []rune(text[start:])
	last := "…"
	for k := len(r) - 1; k > 0; k-- {
		t := strings.TrimRight(string(r[:k]), " -") + "…"
		if width(t) <= w {
			last = t
			break
		}
	}
	lines = append(lines, last)
	l.Text = text[:start] + last
	l.setLines(lines)
}

// labelLines is how many lines a label may take in the plan: the band the
// layout reserved, at most the output's label-lines.
func (f *Feature) labelLines() int {
	n := 1
	if f.Plan != nil {
		n = max(n, f.Plan.LabelLines)
	}
	return min(n, max(1, f.Output.LabelLines))
}

// LabelLinesWanted is the label band the output's terms ask for in the
// plan's panel width: the most lines any term takes when it may wrap to
// the output's label-lines before it shrinks (1 when every term fits on
// one line beside its peak text at the label size). render/feature lays
// the output out again with that band when it is more than one, so every
// panel keeps one plot height.
func (f *Feature) LabelLinesWanted() int {
	if f.Plan == nil || len(f.Plan.Pages) == 0 || f.Output.LabelLines < 2 {
		return 1
	}
	w, size, n := f.Plan.PanelW, f.Output.Type.Label.Pt(), 1
	for i := range f.Data.Series {
		room := f.roomFor(i, w, true)
		if f.Fonts.Width(fonts.Bold, size, f.Data.Series[i].Term) <= room.last {
			continue
		}
		n = max(n, len(f.fitLabel(i, w, f.Output.LabelLines).Drawn()))
	}
	return n
}

// fitLabels sets every term in the room its panel's label band leaves
// (see fitLabel), then evens out each row's sizes.
func (f *Feature) fitLabels() {
	if f.Plan == nil || len(f.Plan.Pages) == 0 {
		return
	}
	w, n := f.Plan.PanelW, f.labelLines()
	f.labels = make([]Label, len(f.Data.Series))
	for i := range f.Data.Series {
		f.labels[i] = f.fitLabel(i, w, n)
	}
	f.evenRows()
}

// Labels returns how every term's label is set; the ones wrapped, shrunk
// or cut are reported to the editor. The first call fits them all.
func (f *Feature) Labels() []Label {
	f.labelsOnce.Do(f.fitLabels)
	return f.labels
}

// evenRows sets every label of a row at one size, the smallest any of
// them needed, so a row never mixes sizes; a label set smaller than it
// needed is set again on as few lines as the smaller size takes.
func (f *Feature) evenRows() {
	n := f.labelLines()
	for _, pg := range f.Plan.Pages {
		for i := 0; i < len(pg.Panels); {
			j := i
			size := math.Inf(1)
			for ; j < len(pg.Panels) && pg.Panels[j].Row == pg.Panels[i].Row; j++ {
				size = math.Min(size, f.labels[pg.Panels[j].Item].Size)
			}
			for k := i; k < j; k++ {
				pn := pg.Panels[k]
				l := &f.labels[pn.Item]
				if l.Size <= size {
					continue
				}
				l.ForRow = !l.Shrunk
				l.Size, l.Shrunk = size, true
				if ls := f.breakLabel(l.Term, size, n, f.roomFor(pn.Item, pn.Label.W(), !l.NoPeak)); ls != nil {
					l.setLines(ls)
				}
			}
			i = j
		}
	}
}

// drawLabel draws a panel's term, its last line on the panel's label
// baseline beside the peak text and the lines above it a line of its
// size apart, and the peak text at the right.
func (f *Feature) drawLabel(p pen, pn layout.Panel, l Label, peak string) {
	lines := l.Drawn()
	pitch := l.Size * f.leading()
	for i, t := range lines {
		y := pn.LabelBaseline + float64(len(lines)-1-i)*pitch
		p.text(fonts.Bold, l.Size, ink, pn.Label.X0, y, canvas.Left, t)
	}
	if !l.NoPeak {
		p.text(fonts.Regular, f.Output.Type.Ticks.Pt(), inkSoft, pn.Label.X1, pn.LabelBaseline, canvas.Right, peak)
	}
}

// LabelTop is the top of the line box of a panel's label's first line:
// a label on one line in a band of two has its top one line down.
func (f *Feature) LabelTop(pn layout.Panel, l Label) float64 {
	lines := len(l.Drawn())
	lead := f.leading()
	// The last line's box top: the baseline sits a fixed distance below
	// it at the label size (the layout's placement).
	top := pn.Label.Y1
	if f.Plan != nil && f.Plan.LabelLines > 1 {
		la := f.Plan.LabelH / float64(f.Plan.LabelLines)
		top = pn.Label.Y1 - float64(f.Plan.LabelLines-1)*la
	}
	return math.Min(pn.Label.Y1, top+float64(lines-1)*l.Size*lead)
}
