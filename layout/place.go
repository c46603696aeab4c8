package layout

import (
	"math"
	"strconv"

	"sheaf/layout/fonts"
	"sheaf/specs"
)

// place turns filled pages into geometry.
func (s *solver) place(groups []Group, fills []pageFill, balanced bool) *Plan {
	o := s.out
	// Grow: every panel grows by the same amount, the most the tightest
	// page allows, so all panels stay one size.
	if o.Slack == specs.SlackGrow && !s.scroll {
		grow := math.Inf(1)
		for i, f := range fills {
			if f.rows > 0 {
				grow = min(grow, (s.capacity(i)-s.need(f.rows, f.heads, len(f.blocks)))/float64(f.rows))
			}
		}
		if grow > 0 && !math.IsInf(grow, 1) {
			s.plotH += grow
			s.setRowH()
		}
	}

	// Spread what is left evenly between the rows of each page. A last
	// page that ends because the panels ran out (not balanced) keeps the
	// pitch of the page before it so its rows line up with that page's.
	extra := make([]float64, len(fills))
	for i, f := range fills {
		if s.scroll || f.rows < 2 {
			continue
		}
		extra[i] = max(0, (s.capacity(i)-s.need(f.rows, f.heads, len(f.blocks)))/float64(f.rows-1))
	}
	if last := len(fills) - 1; last > 0 && !balanced {
		extra[last] = min(extra[last], extra[last-1])
	}
	// A page that ends early — the panels ran out, or the next group
	// starts on a new page — never spreads wider than a full page of the
	// same kind would: two rows pushed to the top and bottom of an empty
	// page read as unrelated. Its rows keep a full page's pitch and the
	// room left stays below them.
	for i, f := range fills {
		if s.scroll || f.rows < 2 {
			continue
		}
		full := s.room(&pageFill{}, i, false, noLimit)
		if full < 2 {
			continue
		}
		pitch := max(0, (s.capacity(i)-s.need(full, 0, 1))/float64(full-1))
		extra[i] = min(extra[i], pitch)
	}

	// A scrolling page is as tall as its content; with a page per group
	// the pages differ.
	trimH := make([]float64, len(fills))
	for i, f := range fills {
		trimH[i] = s.trimH
		if s.scroll {
			trimH[i] = s.top + s.bandsH(i == 0) + s.need(f.rows, f.heads, len(f.blocks)) + float64(f.keys)*s.keyBandH() + s.bottom
		}
	}

	start := make([]int, len(groups)+1) // first item of each group
	for i, g := range groups {
		start[i+1] = start[i] + g.Count
	}

	plan := &Plan{
		Output: o.Name, Kind: o.Kind, Columns: s.n,
		PanelW: s.colW, PanelH: s.lb + s.plotH, LabelH: s.lb, LabelLines: s.labelLines, PlotH: s.plotH, TicksH: s.ta,
		Gutter: s.gutter, RowGap: s.rowGap,
		MarkOffset: s.markOff, MarkLength: s.markLen,
		Pages:    make([]Page, len(fills)),
		Warnings: s.warnings,
	}
	if s.screen {
		plan.Flow = o.Flow
	}
	plan.RowsFirstPage = s.room(&pageFill{}, 0, false, noLimit)
	plan.RowsPerPage = s.room(&pageFill{}, 1, false, noLimit)
	if s.scroll {
		// Rows the first page and the tallest page hold.
		plan.RowsFirstPage, plan.RowsPerPage = fills[0].rows, 0
		for _, f := range fills {
			plan.RowsPerPage = max(plan.RowsPerPage, f.rows)
		}
	}

	// One backing array for all panels: pages take consecutive slices.
	all := make([]Panel, 0, start[len(groups)])
	for i, f := range fills {
		s.placePage(&plan.Pages[i], i, trimH[i], f, extra[i], groups, start, all[len(all):len(all):cap(all)])
		all = all[:len(all)+len(plan.Pages[i].Panels)]
	}
	return plan
}

// placePage fills in page i. Every coordinate is computed from indices
// (page, row slot, column, counts of headings and blocks above) rather than
// by adding heights in a loop, so nothing drifts.
func (s *solver) placePage(pg *Page, i int, trimH float64, f pageFill, extra float64, groups []Group, start []int, panels []Panel) {
	o := s.out
	pg.Number = i + 1
	pg.Right = (i%2 == 0) != o.FirstPageLeft

	ms := s.slug + s.bleed
	pg.Media = Rect{0, 0, s.trimW + 2*ms, trimH + 2*ms}
	pg.Bleed = pg.Media.Inset(s.slug)
	pg.Trim = pg.Media.Inset(ms)
	left, right := s.inner, s.outer
	if o.Facing && !pg.Right {
		left, right = s.outer, s.inner
	}
	t := pg.Trim
	pg.Live = Rect{t.X0 + left, t.Y0 + s.bottom, t.X1 - right, t.Y1 - s.top}
	live := pg.Live
	x0, x1 := live.X0, live.X1

	// Bands from the top: header, key; footer from the bottom.
	y := live.Y1
	first := i == 0
	if first && s.headerH1 > 0 {
		pg.Header = Rect{x0, y - s.headerH1, x1, y}
		y = s.lines(pg, RoleTitle, fonts.Bold, s.title, s.titleLines, y, false)
		y = s.lines(pg, RoleDek, fonts.Regular, s.dek, s.dekLines, y, false)
		y -= s.gap
	} else if !first && s.headerHn > 0 {
		pg.Header = Rect{x0, y - s.headerHn, x1, y}
		y = s.lines(pg, RoleRunning, fonts.Regular, s.heading, s.runLines, y, o.Facing && pg.Right) // on the outside
		y -= s.gap
	}
	k0 := s.keyBand(live, y)
	pg.Key, pg.KeyStrip, pg.KeyTicks = k0.Key, k0.Strip, k0.Ticks
	gridTop := y - s.keyH - s.gap

	fh := s.footerHn
	if first {
		fh = s.footerH1
	}
	gridBottom := live.Y0
	if fh > 0 {
		pg.Footer = Rect{x0, live.Y0, x1, live.Y0 + fh}
		gridBottom = pg.Footer.Y1 + s.gap
		fy := pg.Footer.Y1
		if first || s.perGroup {
			fy = s.lines(pg, RoleSource, fonts.Regular, s.notes, s.sourceLines, fy, false)
		}
		if first {
			for _, nl := range s.noteLines {
				fy = s.lines(pg, RoleNote, fonts.Regular, s.notes, nl, fy, false)
			}
		}
		fy = s.lines(pg, RoleGapNote, fonts.Regular, s.notes, s.gapLines, fy, false)
		if !s.scroll {
			// The folio sits on the outside edge of the page.
			folio := specs.Fill(s.spec.Phrase(specs.PhraseFolio), "page", strconv.Itoa(pg.Number))
			s.lines(pg, RoleFolio, fonts.Regular, s.folio, []string{folio}, fy, !o.Facing || pg.Right)
		}
	}
	pg.Grid = Rect{x0, gridBottom, x1, gridTop}

	if !s.screen && o.SlugLine {
		pg.Slug = Rect{pg.Trim.X0 + slugGap, pg.Bleed.Y0 - slugGap - s.folio*s.lead, pg.Trim.X1 - slugGap, pg.Bleed.Y0 - slugGap}
	}

	pg.Panels = panels
	pitch := s.rowH + s.rowGap + extra
	// Below a panel whose column is empty in the next row, the tick labels
	// go into that empty cell; that needs the tick area to fit there.
	ticksBelowFit := s.ta <= s.rowGap+extra+s.rowH+eps
	// Baselines sit a fixed distance below their line box's top. A label
	// band of several lines has its baseline in the last line box, next to
	// the plot: a label that fits on one line sits on it, and one that
	// wraps rises into the lines above.
	labelBase := s.fs.Baseline(fonts.Regular, s.label, s.lead, 0) - float64(s.labelLines-1)*s.la
	headBase := s.fs.Baseline(fonts.Bold, s.heading, s.lead, 0)
	kb := s.keyBandH()
	k, heads, ended, keys := 0, 0, 0, 0
	// below is how far row k's top (with heads headings, ended blocks
	// and keys repeated keys above it) is below the grid's top.
	below := func() float64 {
		return float64(k)*pitch + float64(heads)*s.hh + float64(ended)*s.tb + float64(keys)*kb
	}
	if f.keys > 0 {
		pg.KeyRepeats = make([]KeyBand, 0, f.keys)
	}
	for _, b := range f.blocks {
		if b.keyBefore {
			pg.KeyRepeats = append(pg.KeyRepeats, s.keyBand(live, gridTop-below()))
			keys++
		}
		if b.heading {
			heads++
		}
		gStart, gEnd := start[b.group], start[b.group+1]
		bEnd := min(gEnd, gStart+(b.row0+b.rows)*s.n)
		if b.heading {
			top := gridTop - below()
			text := groups[b.group].Heading
			if b.continued {
				text = specs.Fill(s.spec.Phrase(specs.PhraseContinued), "heading", text)
			}
			pg.Headings = append(pg.Headings, Heading{
				Group: b.group, Text: text, Continued: b.continued,
				Box:      Rect{x0, top, x1, top + s.hh},
				Baseline: top + s.hh + headBase,
			})
		}
		for r := 0; r < b.rows; r++ {
			top := gridTop - below()
			item0 := gStart + (b.row0+r)*s.n
			for c := 0; c < s.n && item0+c < bEnd; c++ {
				item := item0 + c
				px0 := s.colX(live, c)
				p := Panel{
					Item: item, Group: b.group, Row: k, Col: c,
					Label:         Rect{px0, top - s.lb, px0 + s.colW, top},
					LabelBaseline: top + labelBase,
					Plot:          Rect{px0, top - s.lb - s.plotH, px0 + s.colW, top - s.lb},
				}
				lastInCol := item+s.n >= bEnd
				p.ShowTicks = s.every || (lastInCol && (r == b.rows-1 || ticksBelowFit))
				if p.ShowTicks {
					p.Ticks = Rect{px0, p.Plot.Y0 - s.ta, px0 + s.colW, p.Plot.Y0}
				}
				pg.Panels = append(pg.Panels, p)
			}
			k++
		}
		ended++
	}
	// Full slice expression: an append to one page's panels must not
	// write over the next page's in the shared array.
	pg.Panels = pg.Panels[:len(pg.Panels):len(pg.Panels)]
}

// keyBand is a colour-key band whose top is at y: the strip spans the
// first half of the columns, so it lines up with the grid below.
func (s *solver) keyBand(live Rect, y float64) KeyBand {
	half := (s.n+1)/2 - 1
	sx0, sx1 := s.colX(live, 0), s.colX(live, half)+s.colW
	strip := keyStripFactor * s.key
	return KeyBand{
		Key:   Rect{live.X0, y - s.keyH, live.X1, y},
		Strip: Rect{sx0, y - strip, sx1, y},
		Ticks: Rect{sx0, y - s.keyH, sx1, y - strip},
	}
}

// colX is the left edge of column c, from its index so that every gutter
// is the spec's to rounding error.
func (s *solver) colX(live Rect, c int) float64 {
	return live.X0 + float64(c)*(s.colW+s.gutter)
}

// lines sets text lines in line boxes from top down and returns the bottom
// of the last. alignRight sets them flush right in the live area.
func (s *solver) lines(pg *Page, role TextRole, st fonts.Style, size float64, text []string, top float64, alignRight bool) float64 {
	lh := size * s.lead
	base := s.fs.Baseline(st, size, s.lead, 0)
	for j, l := range text {
		t := top - float64(j)*lh
		w := s.fs.Width(st, size, l)
		x := pg.Live.X0
		if alignRight {
			x = pg.Live.X1 - w
		}
		pg.Text = append(pg.Text, TextLine{
			Role: role, Text: l, Style: st, Size: size, X: x,
			Baseline: t + base, Width: w,
			Box: Rect{pg.Live.X0, t - lh, pg.Live.X1, t},
		})
	}
	return top - float64(len(text))*lh
}
