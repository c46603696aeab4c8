package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"sheaf/render/explore"
	"sheaf/render/feature"
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
	// The date comes first now: a bad SOURCE_DATE_EPOCH writes nothing.
	date, err := feature.DocumentDate(j.Spec, os.Getenv("SOURCE_DATE_EPOCH"))
	if err != nil {
		return report(stderr, err)
	}
	ctx, stop := interruptible()
	files, err := explore.WriteSwatches(ctx, explore.SwatchCheck(checks), j.Spec.Title, dir, date)
	stop()
	if err != nil {
		if ctx.Err() != nil {
			err = fmt.Errorf("interrupted; the swatch sheets in %s are as they were", dir)
		}
		fmt.Fprintln(stderr, "sheaf palette:", err)
		return exitFindings
	}
	for _, f := range files {
		fmt.Fprintln(stdout, f)
	}
	if failed {
		fmt.Fprintln(stderr, "sheaf palette: the palette fails a check (see the findings above)")
		return exitFindings
	}
	return exitOK
}
