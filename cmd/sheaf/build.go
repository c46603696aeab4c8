package main

import (
	"fmt"
	"image"
	"io"
	"path/filepath"
	"runtime"
	"sync"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/render/contact"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/specs"
)

func runBuild(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("build", "SPEC [--out DIR] [--only OUTPUT]",
		"Render every output of the spec: for print, one PDF with bleed and crop marks, a PNG proof per page\nand a contact sheet.", stderr)
	outDir := fs.String("out", "", "folder for the outputs (default: out/ beside the spec)")
	only := fs.String("only", "", "build only the output with this name")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	j, err := loadJob(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(j.spec.Dir, "out")
	}
	var outs []*specs.Output
	for i := range j.spec.Outputs {
		o := &j.spec.Outputs[i]
		if *only == "" || o.Name == *only {
			outs = append(outs, o)
		}
	}
	if len(outs) == 0 {
		var names []string
		for _, o := range j.spec.Outputs {
			names = append(names, o.Name)
		}
		fmt.Fprintf(stderr, "sheaf build: no output named %q; the spec has %v\n", *only, names)
		return exitBadInput
	}
	date, err := documentDate(j.spec)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	// Prepare every output first: bad input stops the build before any
	// file is touched.
	var preps []*prepared
	for _, o := range outs {
		p, err := prepare(j, o)
		if err != nil {
			fmt.Fprintln(stderr, err)
			return exitBadInput
		}
		for _, w := range p.plan.Warnings {
			fmt.Fprintln(stderr, "warning:", w)
		}
		preps = append(preps, p)
	}
	for _, p := range preps {
		build := buildPrint
		if p.out.Kind == specs.Screen {
			build = buildScreen
		}
		files, err := build(j, p, dir, date)
		if err != nil {
			fmt.Fprintf(stderr, "sheaf build: output %q: %v\n", p.out.Name, err)
			return exitFindings
		}
		for _, f := range files {
			fmt.Fprintln(stdout, f)
		}
	}
	return exitOK
}

// boxes converts a layout page's boxes for the PDF writer.
func boxes(pg *layout.Page) pdf.PageBoxes {
	r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
	return pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}
}

// buildPrint writes the PDF, the proofs and the contact sheet of a print
// output and returns the files written.
func buildPrint(j *job, p *prepared, dir string, date time.Time) ([]string, error) {
	day := date.Format("2006-01-02")
	out := p.out
	odir := filepath.Join(dir, out.Name)
	pdfPath := filepath.Join(odir, out.Name+".pdf")
	n := len(p.plan.Pages)
	err := writeAtomic(pdfPath, func(w io.Writer) error {
		pw := pdf.NewWriter(w, pdf.Options{Title: j.spec.Title, Version: version, Date: date})
		for i := range p.plan.Pages {
			pg := &p.plan.Pages[i]
			setup := pdf.PageSetup{Boxes: boxes(pg)}
			if out.Marks {
				setup.Marks = &pdf.MarkOptions{}
			}
			if out.SlugLine {
				if setup.Marks == nil {
					setup.Marks = &pdf.MarkOptions{Length: 0.001}
				}
				setup.Slug = fmt.Sprintf("%s · %s · page %d of %d · %s", j.spec.Title, out.Name, i+1, n, day)
			}
			i := i
			if err := pw.AddPage(setup, func(c *canvas.Canvas) error { return p.feat.Draw(canvas.NewContext(c), i) }); err != nil {
				return err
			}
		}
		return pw.Close()
	})
	if err != nil {
		return nil, err
	}
	files := []string{pdfPath}
	proofs, err := writeProofs(p, odir)
	if err != nil {
		return nil, err
	}
	return append(files, proofs...), nil
}

// writeProofs renders a PNG of every page's trim area, pages in parallel,
// and the contact sheet of all pages.
func writeProofs(p *prepared, odir string) ([]string, error) {
	dpi := p.out.Proofs
	if dpi <= 0 {
		dpi = 100
	}
	n := len(p.plan.Pages)
	files := make([]string, n)
	thumbs := make([]image.Image, n)
	errs := make([]error, n)
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for i := range p.plan.Pages {
		wg.Add(1)
		sem <- struct{}{}
		go func(i int) {
			defer func() { <-sem; wg.Done() }()
			pg := &p.plan.Pages[i]
			region := raster.RegionOf(pg.Media.H(), dpi, pg.Trim.X0, pg.Trim.Y0, pg.Trim.X1, pg.Trim.Y1)
			trim, err := raster.DrawRegion(pg.Media.H(), dpi, region, p.feat.PaperColor(), func(ctx *canvas.Context) error {
				return p.feat.Draw(ctx, i)
			})
			if err != nil {
				errs[i] = err
				return
			}
			path := filepath.Join(odir, "proofs", fmt.Sprintf("page-%03d.png", i+1))
			if err := writeAtomic(path, func(w io.Writer) error { return raster.WritePNG(w, trim) }); err != nil {
				errs[i] = err
				return
			}
			files[i] = path
			thumbs[i] = contact.Thumbnail(trim, 240)
		}(i)
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	sheet := contact.Sheet(thumbs, 4)
	cpath := filepath.Join(odir, "contact.png")
	if err := writeAtomic(cpath, func(w io.Writer) error { return raster.WritePNG(w, sheet) }); err != nil {
		return nil, err
	}
	return append(files, cpath), nil
}
