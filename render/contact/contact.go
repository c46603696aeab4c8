// Package contact makes contact sheets: every page of an output as a
// numbered thumbnail on one image, so an editor sees the whole feature at
// a glance.
package contact

import (
	"image"
	"image/color"
	"image/draw"
	"strconv"

	xdraw "golang.org/x/image/draw"
	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"
)

// Thumbnail scales img to width pixels wide (at least one), keeping its
// proportions.
func Thumbnail(img image.Image, width int) *image.RGBA {
	width = max(1, width)
	b := img.Bounds()
	if b.Dx() == 0 {
		return image.NewRGBA(image.Rect(0, 0, width, width))
	}
	h := max(1, b.Dy()*width/b.Dx())
	dst := image.NewRGBA(image.Rect(0, 0, width, h))
	xdraw.CatmullRom.Scale(dst, dst.Bounds(), img, b, draw.Src, nil)
	return dst
}

// Layout of the sheet, in pixels.
const (
	gap    = 24
	margin = 32
	label  = 18
)

var (
	board  = color.RGBA{0xe4, 0xe2, 0xde, 0xff}
	shadow = color.RGBA{0xc8, 0xc5, 0xc0, 0xff}
	ink    = color.RGBA{0x33, 0x33, 0x33, 0xff}
)

// Sheet lays thumbnails out in cols columns on a neutral board, each with
// its page number underneath. Facing pages are not paired: the sheet shows
// order, not spreads.
func Sheet(thumbs []image.Image, cols int) *image.RGBA {
	if cols < 1 {
		cols = 1
	}
	cw, ch := 1, 1
	for _, t := range thumbs {
		if t != nil {
			cw, ch = max(cw, t.Bounds().Dx()), max(ch, t.Bounds().Dy())
		}
	}
	cols = min(cols, max(1, len(thumbs)))
	rows := (len(thumbs) + cols - 1) / cols
	w := 2*margin + cols*cw + (cols-1)*gap
	h := 2*margin + rows*(ch+label) + max(0, rows-1)*gap
	sheet := image.NewRGBA(image.Rect(0, 0, w, max(h, 2*margin)))
	draw.Draw(sheet, sheet.Bounds(), image.NewUniform(board), image.Point{}, draw.Src)
	face := basicfont.Face7x13
	for i, t := range thumbs {
		if t == nil {
			continue
		}
		x := margin + (i%cols)*(cw+gap)
		y := margin + (i/cols)*(ch+label+gap)
		r := t.Bounds().Sub(t.Bounds().Min).Add(image.Pt(x, y))
		draw.Draw(sheet, r.Add(image.Pt(3, 3)), image.NewUniform(shadow), image.Point{}, draw.Src)
		draw.Draw(sheet, r, t, t.Bounds().Min, draw.Src)
		num := strconv.Itoa(i + 1)
		d := font.Drawer{Dst: sheet, Src: image.NewUniform(ink), Face: face}
		tw := d.MeasureString(num).Ceil()
		d.Dot = fixed.P(x+(r.Dx()-tw)/2, y+r.Dy()+label-3)
		d.DrawString(num)
	}
	return sheet
}
