package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/tdewolff/canvas"

	"sheaf/render/feature"
	"sheaf/render/pdf"
	"sheaf/render/production"
	"sheaf/render/swatch"
	"sheaf/specs"
)

func runPalette(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("palette", "SPEC [--out DIR]",
		"Print the era palette as a table with its checks (lightness, steps, span, contrast, gamut,\ncolour-vision deficiencies, line size) and write a swatch sheet (PNG and PDF).\nExit status 1 when a check fails.", stderr)
	outDir := fs.String("out", "", "folder for swatch.png and swatch.pdf (default: out/palette beside the spec)")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	j, err := feature.Load(path)
	if err != nil {
		return report(stderr, err)
	}
	checks, err := j.CheckPalette()
	if err != nil {
		return report(stderr, err)
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(j.Spec.Dir, "out", "palette")
	}
	if st, err := os.Stat(dir); err == nil && !st.IsDir() {
		fmt.Fprintf(stderr, "sheaf palette: --out %s is a file; give a folder\n", dir)
		return exitBadInput
	}
	if len(checks) == 0 {
		fmt.Fprintln(stderr, "sheaf palette: the spec has no outputs")
		return exitBadInput
	}
	failed := false
	for i, c := range checks {
		fmt.Fprintf(stdout, "Output %s (line %s):\n", c.Output, j.Spec.Outputs[i].Describe(j.Spec.Outputs[i].Line))
		if err := c.Report.WriteTable(stdout); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		fmt.Fprintln(stdout)
		if c.Press != nil {
			if err := c.Press.WriteTable(stdout, c.PressRows, c.MaxShift); err != nil {
				fmt.Fprintln(stderr, err)
				return exitFindings
			}
			fmt.Fprintln(stdout)
		}
		failed = failed || c.Report.Failed()
	}
	first := checks[0]
	for _, c := range checks {
		if c.Press != nil { // the swatch shows the press beside the screen
			first = c
			break
		}
	}
	png := filepath.Join(dir, "swatch.png")
	if err := production.WriteAtomic(png, func(w io.Writer) error { return swatch.WritePNGFor(w, first.Scale, first.Report, 150, first.Press) }); err != nil {
		fmt.Fprintln(stderr, "sheaf palette:", err)
		return exitFindings
	}
	date, err := feature.DocumentDate(j.Spec, os.Getenv("SOURCE_DATE_EPOCH"))
	if err != nil {
		return report(stderr, err)
	}
	pdfPath := filepath.Join(dir, "swatch.pdf")
	err = production.WriteAtomic(pdfPath, func(w io.Writer) error {
		wmm, hmm := swatch.SizeFor(first.Press)
		pw := pdf.NewWriter(w, pdf.Options{Title: j.Spec.Title + " — era palette", Version: version, Date: date})
		r := canvas.Rect{X0: 0, Y0: 0, X1: wmm * specs.PtPerMm, Y1: hmm * specs.PtPerMm}
		if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r, Bleed: r, Trim: r}}, func(c *canvas.Canvas) error {
			return swatch.DrawFor(c, first.Scale, first.Report, first.Press)
		}); err != nil {
			return err
		}
		return pw.Close()
	})
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitFindings
	}
	fmt.Fprintln(stdout, png)
	fmt.Fprintln(stdout, pdfPath)
	if failed {
		fmt.Fprintln(stderr, "sheaf palette: the palette fails a check (see the findings above)")
		return exitFindings
	}
	return exitOK
}
