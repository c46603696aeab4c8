// Package layout places every panel of a feature on every page of an
// output, as pure geometry in points: page boxes, text bands, the panel
// grid and the pagination of groups. Nothing here draws.
//
// Coordinates follow PDF and canvas: points (1/72 in), y up, origin at the
// bottom-left corner of the page's MediaBox. A request that cannot fit
// returns an *InfeasibleError naming the constraint, the numbers and a
// change that works.
package layout

import (
	"fmt"
	"math"

	"sheaf/layout/fonts"
	"sheaf/specs"
)

// Group is a run of consecutive panels under one heading. A feature that is
// not grouped is a single Group with an empty heading.
type Group struct {
	Heading string
	Count   int
}

// Plan is the layout of one output.
type Plan struct {
	Output string     `json:"output"`
	Kind   specs.Kind `json:"kind"`
	Flow   specs.Flow `json:"flow,omitempty"`

	Columns       int `json:"columns"`
	RowsPerPage   int `json:"rows_per_page"`   // rows a page after the first holds, no headings
	RowsFirstPage int `json:"rows_first_page"` // rows the first page holds, no headings

	// Panel sizes, the same for every panel of the output. A panel is its
	// label area over its plot; the tick-label area is below the plot.
	// The label area holds LabelLines lines of the label size (more than
	// one when some label of the output wraps); a panel's LabelBaseline
	// is that of the last, next to the plot.
	PanelW     float64 `json:"panel_w"`
	PanelH     float64 `json:"panel_h"`
	LabelH     float64 `json:"label_h"`
	LabelLines int     `json:"label_lines"`
	PlotH      float64 `json:"plot_h"`
	TicksH     float64 `json:"ticks_h"`
	Gutter     float64 `json:"gutter"`
	RowGap     float64 `json:"row_gap"`

	// Crop marks (print with marks on): each mark runs along a trim edge's
	// line, from MarkOffset to MarkOffset+MarkLength outside the trim.
	MarkOffset float64 `json:"mark_offset,omitempty"`
	MarkLength float64 `json:"mark_length,omitempty"`

	Pages    []Page    `json:"pages"`
	Warnings []Warning `json:"warnings,omitempty"`

	// Banking is set when the panel aspect was chosen from the data
	// (panel: {aspect: bank}; package layout/bank).
	Banking *Banking `json:"banking,omitempty"`
}

// Banking is how a banked panel aspect was chosen.
type Banking struct {
	Method string `json:"method"` // "arc-length": Talbot, Gerth & Hanrahan 2011
	// Aspect is the plot's width ÷ height it chose (the spec's panel aspect).
	Aspect float64 `json:"aspect"`
	// MedianOrientation is the median absolute orientation, in degrees,
	// of the lines' yearly segments drawn at Aspect: 45 means half are
	// steeper than 45° and half flatter.
	MedianOrientation float64 `json:"median_orientation_deg"`
	Segments          int     `json:"segments"` // yearly segments of all panels it weighed
}

// Page is one page: for a scrolling screen output the whole sheet, or with
// flow scroll-groups one group's sheet. Scrolling pages differ in height.
type Page struct {
	Number int  `json:"number"` // folio, from 1
	Right  bool `json:"right"`  // a right-hand (recto) page

	// Boxes per ISO 32000-1 §14.11.2: Trim ⊆ Bleed ⊆ Media. Live is the
	// trim less the margins, mirrored on facing pages.
	Media Rect `json:"media"`
	Bleed Rect `json:"bleed"`
	Trim  Rect `json:"trim"`
	Live  Rect `json:"live"`

	Header   Rect `json:"header,omitzero"` // title and dek, or the running head
	Key      Rect `json:"key"`             // colour-key band at the top
	KeyStrip Rect `json:"key_strip"`       // the colour strip itself
	KeyTicks Rect `json:"key_ticks"`       // year labels under the strip
	Grid     Rect `json:"grid"`            // the room the panels, group headings and repeated keys share
	Footer   Rect `json:"footer,omitzero"` // source, notes, folio
	Slug     Rect `json:"slug,omitzero"`   // slug line, outside the bleed

	// KeyRepeats are the colour-key bands repeated between the rows of a
	// scrolling page (output key-every), top down, below the top one.
	KeyRepeats []KeyBand `json:"key_repeats,omitempty"`

	Text     []TextLine `json:"text,omitempty"`
	Headings []Heading  `json:"headings,omitempty"`
	Panels   []Panel    `json:"panels"`
}

// KeyBand is one colour-key band: the band, the colour strip at its top
// and the year labels under the strip. Each band is drawn alike.
type KeyBand struct {
	Key   Rect `json:"key"`
	Strip Rect `json:"strip"`
	Ticks Rect `json:"ticks"`
}

// Keys returns every colour-key band on the page, top down: the one at
// the top (Key, KeyStrip, KeyTicks) and the repeats.
func (pg *Page) Keys() []KeyBand {
	ks := make([]KeyBand, 0, 1+len(pg.KeyRepeats))
	ks = append(ks, KeyBand{Key: pg.Key, Strip: pg.KeyStrip, Ticks: pg.KeyTicks})
	return append(ks, pg.KeyRepeats...)
}

// TextRole says what a line of text is.
type TextRole string

const (
	RoleTitle   TextRole = "title"
	RoleDek     TextRole = "dek"
	RoleRunning TextRole = "running-head"
	RoleSource  TextRole = "source"
	RoleNote    TextRole = "note"
	RoleFolio   TextRole = "folio"
	RoleGapNote TextRole = "gap-note" // the note on years without data (text.gap-note-on)
)

// TextLine is one measured line of text, ready to draw: start it at (X,
// Baseline) in Style at Size points.
type TextLine struct {
	Role     TextRole    `json:"role"`
	Text     string      `json:"text"`
	Style    fonts.Style `json:"style"`
	Size     float64     `json:"size"`
	X        float64     `json:"x"`
	Baseline float64     `json:"baseline"`
	Width    float64     `json:"width"`
	Box      Rect        `json:"box"` // the line box, Size × leading tall
}

// Heading is a group heading above the first row of a group's block.
type Heading struct {
	Group     int     `json:"group"`
	Text      string  `json:"text"` // text.continued filled in when Continued
	Continued bool    `json:"continued,omitempty"`
	Box       Rect    `json:"box"`
	Baseline  float64 `json:"baseline"`
}

// Panel is one small-multiple chart.
type Panel struct {
	Item          int     `json:"item"`  // index into the flattened items, in order
	Group         int     `json:"group"` // index into the groups given to Solve
	Row           int     `json:"row"`   // row on its page, from the top, from 0
	Col           int     `json:"col"`
	Label         Rect    `json:"label"`
	LabelBaseline float64 `json:"label_baseline"` // of the label's last line, next to the plot
	Plot          Rect    `json:"plot"`
	Ticks         Rect    `json:"ticks,omitzero"` // set when ShowTicks
	ShowTicks     bool    `json:"show_ticks"`
}

// Box is the panel's label and plot together.
func (p Panel) Box() Rect { return Rect{p.Plot.X0, p.Plot.Y0, p.Label.X1, p.Label.Y1} }

// Summary is a one-line description of the plan, such as
// "print: 8 pages, 6 × 8 panels a page, panel 25 × 21.4 mm".
func (p *Plan) Summary() string {
	if b := p.Banking; b != nil {
		return fmt.Sprintf("%s, banked aspect %s (median orientation %.1f°)", p.summary(), trimNum(b.Aspect, 2), b.MedianOrientation)
	}
	return p.summary()
}

func (p *Plan) summary() string {
	u := units{screen: p.Kind == specs.Screen}
	pages := "1 page"
	if len(p.Pages) != 1 {
		pages = fmt.Sprintf("%d pages", len(p.Pages))
	}
	if p.Flow.Scrolls() && len(p.Pages) == 1 {
		t := p.Pages[0].Trim
		return fmt.Sprintf("%s: 1 scrolling page %s × %s, %d × %d panels, panel %s × %s",
			p.Output, trimUnit(u, t.W()), u.len(t.H()), p.Columns, p.RowsPerPage,
			trimUnit(u, p.PanelW), u.len(p.PanelH))
	}
	if p.Flow.Scrolls() {
		lo, hi := math.Inf(1), 0.0
		for i := range p.Pages {
			h := p.Pages[i].Trim.H()
			lo, hi = min(lo, h), max(hi, h)
		}
		hs := trimUnit(u, lo) + "–" + u.len(hi)
		if u.len(lo) == u.len(hi) {
			hs = u.len(hi)
		}
		return fmt.Sprintf("%s: %d scrolling pages, one a group, %s × %s, %d columns, panel %s × %s",
			p.Output, len(p.Pages), trimUnit(u, p.Pages[0].Trim.W()), hs, p.Columns,
			trimUnit(u, p.PanelW), u.len(p.PanelH))
	}
	return fmt.Sprintf("%s: %s, %d × %d panels a page, panel %s × %s",
		p.Output, pages, p.Columns, p.RowsPerPage, trimUnit(u, p.PanelW), u.len(p.PanelH))
}

// trimUnit formats a length without its unit, for "25 × 21.4 mm".
func trimUnit(u units, pt float64) string {
	s := u.len(pt)
	return s[:len(s)-3]
}

// Panels returns the number of panels placed on all pages.
func (p *Plan) Panels() int {
	n := 0
	for i := range p.Pages {
		n += len(p.Pages[i].Panels)
	}
	return n
}

// Spread is one sheet of a screen output shown as spreads: a left and a
// right page side by side, or a page alone (the first page when it is a
// right-hand page, the last when it is a left-hand one).
type Spread struct {
	Sheet Rect         `json:"sheet"` // from (0, 0)
	Pages []SpreadPage `json:"pages"`
}

// SpreadPage places a page on a spread's sheet.
type SpreadPage struct {
	Page   int   `json:"page"` // index into Plan.Pages
	Offset Point `json:"offset"`
}

// Spreads pairs the plan's pages into spreads: each left-hand page with the
// right-hand page after it. Pages keep their own media size; a pair's sheet
// is both side by side.
func (p *Plan) Spreads() []Spread {
	var out []Spread
	for i := 0; i < len(p.Pages); {
		a := p.Pages[i]
		if !a.Right && i+1 < len(p.Pages) && p.Pages[i+1].Right {
			b := p.Pages[i+1]
			w, h := a.Media.W(), max(a.Media.H(), b.Media.H())
			out = append(out, Spread{
				Sheet: Rect{0, 0, w + b.Media.W(), h},
				Pages: []SpreadPage{{Page: i}, {Page: i + 1, Offset: Point{X: w}}},
			})
			i += 2
			continue
		}
		out = append(out, Spread{Sheet: Rect{0, 0, a.Media.W(), a.Media.H()}, Pages: []SpreadPage{{Page: i}}})
		i++
	}
	return out
}
