package layout

import (
	"errors"
	"math"
)

// block is a run of rows of one group on one page.
type block struct {
	group, row0, rows int
	heading           bool // carries a group heading
	continued         bool // the group began on an earlier page
	keyBefore         bool // a repeated key band stands above it (scroll flows)
}

// pageFill is what one page holds before placement.
type pageFill struct {
	blocks []block
	rows   int
	heads  int
	keys   int // repeated key bands
}

const noLimit = math.MaxInt32

// capacity is the height the panels and headings may take on page i.
func (s *solver) capacity(i int) float64 {
	if s.scroll {
		return math.Inf(1)
	}
	if i == 0 {
		return s.gridH1
	}
	return s.gridHn
}

// need is the height of rows rows, heads headings and blocks blocks: rows
// are rowGap apart and each block ends with its tick area (tb).
func (s *solver) need(rows, heads, blocks int) float64 {
	if rows == 0 {
		return 0
	}
	return float64(rows)*s.rowH + float64(rows-1)*s.rowGap + float64(heads)*s.hh + float64(blocks)*s.tb
}

// room is how many more rows a new block (with a heading or not) can add
// to page i holding p, within the row limit.
func (s *solver) room(p *pageFill, i int, heading bool, limit int) int {
	k := limit - p.rows
	if c := s.capacity(i); !math.IsInf(c, 1) {
		h := p.heads
		if heading {
			h++
		}
		b := len(p.blocks) + 1
		fit := int(math.Floor((c+s.rowGap-float64(h)*s.hh-float64(b)*s.tb)/(s.rowH+s.rowGap)+1e-9)) - p.rows
		k = min(k, fit)
	}
	return max(k, 0)
}

var errNoRoom = errors.New("layout: a row does not fit on an empty page")

// fill pages greedily: each group starts a new block; a group that does
// not fit in what is left of a page starts a new page, unless it is larger
// than a whole page or the page would be left more than half empty, in
// which case it fills this one and continues under a "(continued)"
// heading.
func (s *solver) fill(rows []int, heads []bool, limit func(int) int) ([]pageFill, error) {
	pages := []pageFill{{}}
	for g, r := range rows {
		row0, cont := 0, false
		for r > 0 {
			i := len(pages) - 1
			p := &pages[i]
			k := s.room(p, i, heads[g], limit(i))
			if k >= r {
				p.add(block{group: g, row0: row0, rows: r, heading: heads[g], continued: cont})
				break
			}
			// Whether a group fits is a matter of room, not of the
			// balancing limit: the group rule comes first.
			if p.rows > 0 {
				// Move the group to a fresh page when it fits there — unless
				// that would leave this page more than half empty: then it
				// starts here and continues, as an editor would set it.
				halfEmpty := k >= 2 && 2*p.rows < s.room(&pageFill{}, i, false, noLimit)
				if k == 0 || !halfEmpty && s.room(&pageFill{}, i+1, heads[g], noLimit) >= r {
					pages = append(pages, pageFill{})
					continue
				}
			} else if s.room(p, i, heads[g], noLimit) >= r {
				p.add(block{group: g, row0: row0, rows: r, heading: heads[g], continued: cont})
				break
			} else if k == 0 {
				return nil, errNoRoom
			}
			p.add(block{group: g, row0: row0, rows: k, heading: heads[g], continued: cont})
			row0, r, cont = row0+k, r-k, true
			pages = append(pages, pageFill{})
		}
	}
	return pages, nil
}

func (p *pageFill) add(b block) {
	p.blocks = append(p.blocks, b)
	p.rows += b.rows
	if b.heading {
		p.heads++
	}
	if b.keyBefore {
		p.keys++
	}
}

// repeatKeys puts a key band before the first row of a scrolling page
// that would start more than keyEvery below the top of the key before it.
// The key splits the row's block there, so the rows above it end as a
// page's do, with their year labels; a heading stays with its first row,
// the key going above the heading. A key never stands before a page's
// first row, nor straight under another key, so every key is followed by
// a row: with keyEvery shorter than a key and a row there is a key before
// every row (solve warns).
//
// Distances are measured down from the grid's top as placePage sets
// them; the decision uses the row's place before the split adds the tick
// area, so that successive keys are at most keyEvery plus one row (with
// its tick labels and the gap under it) apart.
func (s *solver) repeatKeys(f pageFill) pageFill {
	kb := s.keyBandH()
	keyTop := -kb
	y, since := 0.0, 0 // top of the next row (or its heading); rows since the last key
	out := pageFill{blocks: make([]block, 0, len(f.blocks))}
	for _, b := range f.blocks {
		cur := b
		cur.rows = 0
		for r := range b.rows {
			head := 0.0
			if r == 0 && b.heading {
				head = s.hh
			}
			if since > 0 && y+head-keyTop > s.keyEvery+eps {
				if r > 0 {
					out.add(cur)
					y += s.tb
					cur = block{group: b.group, row0: b.row0 + r, continued: true}
				}
				cur.keyBefore = true
				keyTop = y
				y += kb
				since = 0
			}
			y += head + s.rowH + s.rowGap
			cur.rows++
			since++
		}
		out.add(cur)
		y += s.tb
	}
	return out
}

// paginate cuts the groups into pages, balancing them when asked. It
// reports whether the pages were balanced.
func (s *solver) paginate(groups []Group) ([]pageFill, bool, error) {
	rows := make([]int, len(groups))
	heads := make([]bool, len(groups))
	total := 0
	for i, g := range groups {
		rows[i] = (g.Count + s.n - 1) / s.n
		heads[i] = g.Heading != "" && g.Count > 0
		total += rows[i]
	}
	if s.perGroup {
		return s.pagePerGroup(rows, heads), false, nil
	}
	free := func(int) int { return noLimit }
	pages, err := s.fill(rows, heads, free)
	if err != nil || !s.out.Balance || s.scroll || len(pages) < 2 {
		return pages, false, err
	}

	// Balance: keep the page count, spread the rows evenly so pages differ
	// by at most one row (the first page, shorter for its header, may be
	// full and hold fewer). Groups can make an exact schedule impossible;
	// then the smallest even cap on rows a page that keeps the page count
	// is used instead.
	n := len(pages)
	c0 := s.room(&pageFill{}, 0, false, noLimit)
	cn := s.room(&pageFill{}, 1, false, noLimit)
	target := evenRows(total, n, c0)
	if try, err := s.fill(rows, heads, func(i int) int {
		if i < n {
			return min(target[i], cn)
		}
		return noLimit
	}); err == nil && len(try) == n {
		return try, true, nil
	}
	for l := (total + n - 1) / n; l < max(c0, cn); l++ {
		if try, err := s.fill(rows, heads, func(int) int { return l }); err == nil && len(try) == n {
			return try, true, nil
		}
	}
	return pages, false, nil
}

// pagePerGroup gives each group with panels a page of its own, as tall as
// it needs. With no panels at all there is still one page, for the header
// and key.
func (s *solver) pagePerGroup(rows []int, heads []bool) []pageFill {
	var pages []pageFill
	for g, r := range rows {
		if r > 0 {
			p := pageFill{}
			p.add(block{group: g, rows: r, heading: heads[g]})
			pages = append(pages, p)
		}
	}
	if len(pages) == 0 {
		pages = []pageFill{{}}
	}
	return pages
}

// evenRows spreads total rows over n pages as evenly as possible, earlier
// pages taking the odd rows, and the first page no more than c0.
func evenRows(total, n, c0 int) []int {
	t := make([]int, n)
	if (total+n-1)/n <= c0 {
		for i := range t {
			t[i] = total / n
			if i < total%n {
				t[i]++
			}
		}
		return t
	}
	t[0] = c0
	rest, m := total-c0, n-1
	for i := 1; i < n; i++ {
		t[i] = rest / m
		if i-1 < rest%m {
			t[i]++
		}
	}
	return t
}
