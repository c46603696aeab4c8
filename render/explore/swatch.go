package explore

import (
	"context"
	"io"
	"path/filepath"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/render/feature"
	"sheaf/render/pdf"
	"sheaf/render/production"
	"sheaf/render/swatch"
	"sheaf/specs"
)

// SwatchCheck picks the palette check the swatch sheet shows: the first
// output printed on a press (the sheet shows the press beside the
// screen), else the first. checks must not be empty.
func SwatchCheck(checks []feature.PaletteCheck) feature.PaletteCheck {
	for _, c := range checks {
		if c.Press != nil {
			return c
		}
	}
	return checks[0]
}

// WriteSwatches writes the era palette's swatch sheet for a palette
// check (feature.Job.CheckPalette, SwatchCheck) into dir, made if
// missing: swatch.png at 150 dpi and swatch.pdf titled after the
// feature, dated date. It returns the two paths. Each file is written
// under a temporary name and renamed into place when whole.
func WriteSwatches(ctx context.Context, c feature.PaletteCheck, title, dir string, date time.Time) ([]string, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	png := filepath.Join(dir, "swatch.png")
	if err := production.WriteAtomic(png, func(w io.Writer) error { return swatch.WritePNGFor(w, c.Scale, c.Report, 150, c.Press) }); err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	pdfPath := filepath.Join(dir, "swatch.pdf")
	err := production.WriteAtomic(pdfPath, func(w io.Writer) error {
		wmm, hmm := swatch.SizeFor(c.Press)
		pw := pdf.NewWriter(w, pdf.Options{Title: title + " — era palette", Version: production.Version, Date: date})
		r := canvas.Rect{X0: 0, Y0: 0, X1: wmm * specs.PtPerMm, Y1: hmm * specs.PtPerMm}
		if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r, Bleed: r, Trim: r}}, func(cv *canvas.Canvas) error {
			return swatch.DrawFor(cv, c.Scale, c.Report, c.Press)
		}); err != nil {
			return err
		}
		return pw.Close()
	})
	if err != nil {
		return nil, err
	}
	return []string{png, pdfPath}, nil
}
