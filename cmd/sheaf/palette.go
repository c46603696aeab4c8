package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/tdewolff/canvas"

	"sheaf/palette"
	"sheaf/render/page"
	"sheaf/render/pdf"
	"sheaf/render/swatch"
	"sheaf/specs"
)

// paletteCheck is the era palette checked for one output: its line width
// and medium decide the size-aware check.
type paletteCheck struct {
	output string
	scale  palette.Scale
	report palette.Report
}

// thresholds turns the spec's palette checks into the palette package's.
func thresholds(s *specs.Spec) (palette.Thresholds, error) {
	th := palette.DefaultThresholds()
	c := s.Palette.Checks
	dir := c.Lightness
	if dir == "monotone" {
		dir = "auto"
	}
	d, err := palette.ParseDirection(dir)
	if err != nil {
		return th, fmt.Errorf("%s: %v", s.Where("palette.checks.lightness"), err)
	}
	th.Lightness = d
	th.MinStep, th.MinSpan, th.MinContrast, th.MinCVDStep = c.MinStep, c.MinSpan, c.MinContrast, c.MinCVDStep
	return th, nil
}

// checkPalette runs the palette checks for every output of the spec.
func checkPalette(j *job) ([]paletteCheck, error) {
	sc, err := scaleFor(j.spec, j.data.Span)
	if err != nil {
		return nil, err
	}
	th, err := thresholds(j.spec)
	if err != nil {
		return nil, err
	}
	paper := page.ColorOf(j.spec.Palette.Paper)
	var out []paletteCheck
	for _, o := range j.spec.Outputs {
		m := palette.Print
		if o.Kind == specs.Screen {
			m = palette.Screen
		}
		r, err := palette.Check(sc, paper, o.Line.Pt(), m, th)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", j.spec.Where("palette"), err)
		}
		out = append(out, paletteCheck{output: o.Name, scale: sc, report: r})
	}
	return out, nil
}

func runPalette(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("palette", "SPEC [--out DIR]",
		"Print the era palette as a table with its checks (lightness, steps, span, contrast, gamut,\ncolour-vision deficiencies, line size) and write a swatch sheet (PNG and PDF).\nExit status 1 when a check fails.", stderr)
	outDir := fs.String("out", "", "folder for swatch.png and swatch.pdf (default: out/palette beside the spec)")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	j, err := loadJob(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	checks, err := checkPalette(j)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(j.spec.Dir, "out", "palette")
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
		fmt.Fprintf(stdout, "Output %s (line %s):\n", c.output, j.spec.Outputs[i].Describe(j.spec.Outputs[i].Line))
		if err := c.report.WriteTable(stdout); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		fmt.Fprintln(stdout)
		failed = failed || c.report.Failed()
	}
	first := checks[0]
	png := filepath.Join(dir, "swatch.png")
	if err := writeAtomic(png, func(w io.Writer) error { return swatch.WritePNG(w, first.scale, first.report, 150) }); err != nil {
		fmt.Fprintln(stderr, "sheaf palette:", err)
		return exitFindings
	}
	date, err := documentDate(j.spec)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	pdfPath := filepath.Join(dir, "swatch.pdf")
	err = writeAtomic(pdfPath, func(w io.Writer) error {
		wmm, hmm := swatch.Size()
		pw := pdf.NewWriter(w, pdf.Options{Title: j.spec.Title + " — era palette", Version: version, Date: date})
		r := canvas.Rect{X0: 0, Y0: 0, X1: wmm / pdf.MMPerPt, Y1: hmm / pdf.MMPerPt}
		if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r, Bleed: r, Trim: r}}, func(c *canvas.Canvas) error {
			return swatch.Draw(c, first.scale, first.report)
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
