package explore

import (
	"context"
	"image"
	"io"
	"path/filepath"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/render/contact"
	"sheaf/render/draw"
	"sheaf/render/insert"
	"sheaf/render/pdf"
	"sheaf/render/production"
	"sheaf/render/raster"
)

// sheetColumns is how many graphics a row of the sheet holds.
const sheetColumns = 4

// WriteSheets draws the report's graphics (Report.Graphics, in its
// order) into dir, made if missing: pairs.png, the graphics at 96 dpi on
// a contact sheet, numbered as in the report, and pairs.pdf, each graphic
// a page at the insert's size, dated date (see feature.DocumentDate). It
// returns the two paths. Each file is written under a temporary name and
// renamed into place when whole; cancelling ctx stops between graphics.
func WriteSheets(ctx context.Context, rep *Report, gs []*insert.Graphic, dir string, date time.Time) ([]string, error) {
	if len(gs) == 0 {
		return nil, nil
	}
	paper := gs[0].Paper()
	var thumbs []image.Image
	for _, g := range gs {
		w, h := g.Size()
		img, err := raster.DrawContext(ctx, w, h, 96, paper, func(c *canvas.Context) error { return g.Draw(c) })
		if err != nil {
			return nil, err
		}
		thumbs = append(thumbs, img)
	}
	png := filepath.Join(dir, "pairs.png")
	if err := production.WriteAtomic(png, func(w io.Writer) error {
		return raster.WritePNG(w, contact.Sheet(thumbs, sheetColumns))
	}); err != nil {
		return nil, err
	}
	// One page per graphic, at the insert's size, in the report's order:
	// a vector proof of each insert as build would draw it (one graphic a
	// page, so each keeps its own coordinates and gradients).
	pdfPath := filepath.Join(dir, "pairs.pdf")
	err := production.WriteAtomic(pdfPath, func(w io.Writer) error {
		doc := pdf.NewWriter(w, pdf.Options{Title: rep.job.Spec.Title + " — pairs", Version: production.Version, Date: date})
		for _, g := range gs {
			if err := ctx.Err(); err != nil {
				return err
			}
			gw, gh := g.Size()
			box := canvas.Rect{X0: 0, Y0: 0, X1: gw, Y1: gh}
			if err := doc.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}}, func(c *canvas.Canvas) error {
				return g.Draw(canvas.NewContext(draw.Recording{Canvas: c})) // replayed into our PDF encoder
			}); err != nil {
				return err
			}
		}
		return doc.Close()
	})
	if err != nil {
		return nil, err
	}
	return []string{png, pdfPath}, nil
}
