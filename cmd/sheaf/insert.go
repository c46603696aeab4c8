package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/insert"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/render/svg"
	"sheaf/specs"
	"sheaf/specs/series"
)

// preparedInsert is an insert laid out and ready to write.
type preparedInsert struct {
	in  *specs.Insert
	out *specs.Output
	g   *insert.Graphic
}

// prepareInsert loads an insert's terms (whether or not the feature
// selects them), its output's fonts and the palette, and lays it out.
// Its errors are bad input.
func prepareInsert(j *job, in *specs.Insert) (*preparedInsert, error) {
	out := j.spec.Output(in.Output)
	if out == nil {
		return nil, fmt.Errorf("%s: inserts.%s.output: no output named %q", j.spec.Where("inserts."+in.Name+".output"), in.Name, in.Output)
	}
	// The insert's own terms, in its order, scaled as the feature is.
	data, err := series.Load(j.spec.ForInsert(in))
	if err != nil {
		return nil, err
	}
	fs, err := fonts.Load(j.spec, out)
	if err != nil {
		return nil, err
	}
	sc, err := scaleFor(j.spec, data.Span)
	if err != nil {
		return nil, err
	}
	g, err := insert.New(j.spec, in, out, data, sc, fs)
	if err != nil {
		return nil, err
	}
	return &preparedInsert{in: in, out: out, g: g}, nil
}

// prepareInserts lays out every insert of the spec; its errors are bad
// input (a term missing from the data, a graphic too small), with the
// spec's file:line:col.
func prepareInserts(j *job) ([]*preparedInsert, error) {
	var preps []*preparedInsert
	var errs []string
	for i := range j.spec.Inserts {
		p, err := prepareInsert(j, &j.spec.Inserts[i])
		if err != nil {
			errs = append(errs, err.Error()) // every insert's problems at once
			continue
		}
		preps = append(preps, p)
	}
	if len(errs) > 0 {
		return nil, errors.New(strings.Join(errs, "\n"))
	}
	return preps, nil
}

// buildInserts writes every insert of the spec to dir/inserts/: a PDF for an insert that borrows a print output, an
// SVG and PNGs at 1× and 2× for a screen one. It returns the files
// written.
// All are laid out before any file is written, so bad input writes
// nothing.
func buildInserts(j *job, dir string, date time.Time) ([]string, error) {
	preps, err := prepareInserts(j)
	if err != nil {
		return nil, err
	}
	var files []string
	idir := filepath.Join(dir, "inserts")
	for _, p := range preps {
		w, h := p.g.Size()
		draw := func(c *canvas.Canvas) error { return p.g.Draw(canvas.NewContext(c)) }
		if p.out.Kind == specs.Print {
			// An insert is placed by the article's layout, which adds
			// its own bleed: the file is trimmed, media = trim.
			path := filepath.Join(idir, p.in.Name+".pdf")
			box := canvas.Rect{X0: 0, Y0: 0, X1: w, Y1: h}
			title, _ := p.g.Describe()
			err := writeAtomic(path, func(wr io.Writer) error {
				pw := pdf.NewWriter(wr, pdf.Options{Title: title, Version: version, Date: date})
				if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}}, draw); err != nil {
					return err
				}
				return pw.Close()
			})
			if err != nil {
				return nil, err
			}
			files = append(files, path)
			continue
		}
		title, desc := p.g.Describe()
		paper := p.g.Paper()
		opts := svg.Options{Title: title, Desc: desc, FontFamily: p.out.Fonts.Family, EmbedFonts: p.out.Fonts.Embed, Background: paper}
		path := filepath.Join(idir, p.in.Name+".svg")
		err := writeAtomic(path, func(wr io.Writer) error {
			doc, err := svg.New(w, h, opts)
			if err != nil {
				return err
			}
			if err := p.g.Draw(canvas.NewContext(doc)); err != nil {
				return err
			}
			_, err = doc.WriteTo(wr)
			return err
		})
		if err != nil {
			return nil, err
		}
		files = append(files, path)
		for _, s := range screenScales {
			img, err := raster.Draw(w, h, s.dpi, paper, func(ctx *canvas.Context) error { return p.g.Draw(ctx) })
			if err != nil {
				return nil, fmt.Errorf("insert %q: %w", p.in.Name, err)
			}
			ppath := filepath.Join(idir, p.in.Name+s.suffix+".png")
			if err := writeAtomic(ppath, func(wr io.Writer) error { return raster.WritePNG(wr, img) }); err != nil {
				return nil, err
			}
			files = append(files, ppath)
		}
	}
	return files, nil
}

// insertsBorrow reports whether an insert of the spec borrows the output
// named name, so `sheaf build --only NAME` writes the inserts too.
func insertsBorrow(s *specs.Spec, name string) bool {
	for _, in := range s.Inserts {
		if in.Output == name {
			return true
		}
	}
	return false
}
