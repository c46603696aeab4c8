package contact

import (
	"image"
	"image/draw"
	"strconv"

	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"
)

// Spread is a pair of facing pages as thumbnail indices: Left or Right is
// -1 when that side is empty (a first right-hand page, a last left-hand
// one).
type Spread struct{ Left, Right int }

// Pair pairs pages into spreads the way they face in the bound feature:
// right[i] says whether page i is a right-hand (recto) page. Each
// left-hand page faces the right-hand page after it.
func Pair(right []bool) []Spread {
	var out []Spread
	for i := 0; i < len(right); {
		if !right[i] && i+1 < len(right) && right[i+1] {
			out = append(out, Spread{i, i + 1})
			i += 2
			continue
		}
		if right[i] {
			out = append(out, Spread{-1, i})
		} else {
			out = append(out, Spread{i, -1})
		}
		i++
	}
	return out
}

// Spreads lays thumbnails out as facing pages, perRow spreads a row: the
// two pages of a spread touch at the spine, as the reader sees them, and
// an empty side is left blank; each page has its number underneath.
func Spreads(thumbs []image.Image, right []bool, perRow int) *image.RGBA {
	perRow = max(perRow, 1)
	cw, ch := 1, 1
	for _, t := range thumbs {
		if t != nil {
			cw, ch = max(cw, t.Bounds().Dx()), max(ch, t.Bounds().Dy())
		}
	}
	sp := Pair(right)
	cols := min(perRow, max(1, len(sp)))
	rows := (len(sp) + cols - 1) / cols
	w := 2*margin + cols*2*cw + (cols-1)*gap
	h := 2*margin + rows*(ch+label) + max(0, rows-1)*gap
	sheet := image.NewRGBA(image.Rect(0, 0, w, max(h, 2*margin)))
	draw.Draw(sheet, sheet.Bounds(), image.NewUniform(board), image.Point{}, draw.Src)
	face := basicfont.Face7x13
	for k, s := range sp {
		x := margin + (k%cols)*(2*cw+gap)
		y := margin + (k/cols)*(ch+label+gap)
		// One shadow under the whole spread, so the pair reads as one sheet.
		x0, x1 := x, x+2*cw
		if s.Left < 0 {
			x0 = x + cw
		}
		if s.Right < 0 {
			x1 = x + cw
		}
		draw.Draw(sheet, image.Rect(x0+3, y+3, x1+3, y+ch+3), image.NewUniform(shadow), image.Point{}, draw.Src)
		for side, i := range []int{s.Left, s.Right} {
			if i < 0 || i >= len(thumbs) || thumbs[i] == nil {
				continue
			}
			t := thumbs[i]
			px := x + side*cw
			if side == 0 { // a left page sits against the spine
				px = x + cw - t.Bounds().Dx()
			}
			r := t.Bounds().Sub(t.Bounds().Min).Add(image.Pt(px, y))
			draw.Draw(sheet, r, t, t.Bounds().Min, draw.Src)
			num := strconv.Itoa(i + 1)
			d := font.Drawer{Dst: sheet, Src: image.NewUniform(ink), Face: face}
			tw := d.MeasureString(num).Ceil()
			d.Dot = fixed.P(px+(r.Dx()-tw)/2, y+r.Dy()+label-3)
			d.DrawString(num)
		}
	}
	return sheet
}
