package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"sheaf/render/explore"
	"sheaf/render/feature"
	"sheaf/specs"
)

func runPairs(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("pairs", "SPEC [--top N] [--per-term N] [--output NAME] [--size 'W x H'] [--json] [--out DIR] [--no-sheet]",
		"Find the pairs of selected terms worth showing side by side: the most alike (their plotted\n"+
			"lines are closest) and the strongest hand-overs (one falls as the other rises, with the year\n"+
			"their lines cross). Prints a table, each row with an inserts entry ready to paste into the\n"+
			"spec, and writes a sheet of the pairs drawn as comparison panels (pairs.png and pairs.pdf).", stderr)
	top := fs.Int("top", 8, "pairs of each kind")
	perTerm := fs.Int("per-term", 2, "the most rows of a kind one term may appear in (0: no limit)")
	outName := fs.String("output", "", "the output the inserts borrow (default: the spec's first)")
	sizeText := fs.String("size", "", "the inserts' size, W x H (default 90mm x 60mm for print, 480px x 300px for screen)")
	asJSON := fs.Bool("json", false, "print the pairs as a JSON object on stdout")
	outDir := fs.String("out", "", "folder for pairs.png and pairs.pdf (default: out/pairs beside the spec)")
	noSheet := fs.Bool("no-sheet", false, "print the table only; write no files")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	if *top < 1 || *top > 100 || *perTerm < 0 {
		fmt.Fprintln(stderr, "sheaf pairs: --top must be 1 to 100 and --per-term 0 or more")
		return exitBadInput
	}
	spec, err := specs.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	j, err := explore.LoadData(spec)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	if len(j.Spec.Outputs) == 0 {
		fmt.Fprintln(stderr, "sheaf pairs: the spec has no outputs")
		return exitBadInput
	}
	rep, err := explore.Find(j, explore.Options{Top: *top, PerTerm: *perTerm, Output: *outName, Size: *sizeText})
	if err != nil {
		return pairsErr(stderr, err)
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(j.Spec.Dir, "out", "pairs")
	}
	if st, err := os.Stat(dir); err == nil && !st.IsDir() && !*noSheet {
		fmt.Fprintf(stderr, "sheaf pairs: --out %s is a file; give a folder\n", dir)
		return exitBadInput
	}
	// Every graphic is laid out, sheet or not, before any file is
	// written: a size too small for its plot is bad input (the pasted
	// entry would fail too) and writes nothing.
	graphics, err := rep.Graphics()
	if err != nil {
		return pairsErr(stderr, err)
	}
	if !*noSheet && len(graphics) > 0 {
		date, err := feature.DocumentDate(j.Spec, os.Getenv("SOURCE_DATE_EPOCH"))
		if err != nil {
			return report(stderr, err)
		}
		ctx, stop := interruptible()
		rep.Files, err = explore.WriteSheets(ctx, rep, graphics, dir, date)
		stop()
		if err != nil {
			if ctx.Err() != nil {
				err = fmt.Errorf("interrupted; pairs.png and pairs.pdf in %s are as they were", dir)
			}
			fmt.Fprintln(stderr, "sheaf pairs:", err)
			return exitFindings
		}
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if err := enc.Encode(rep); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		return exitOK
	}
	rep.WriteTable(stdout)
	for _, f := range rep.Files {
		fmt.Fprintln(stdout, f)
	}
	return exitOK
}

// pairsErr prints an error of the pairs search: an option the job cannot
// honour is named as its flag; every such error is bad input.
func pairsErr(stderr io.Writer, err error) int {
	if opt := (*explore.OptionError)(nil); errors.As(err, &opt) {
		fmt.Fprintf(stderr, "sheaf pairs: --%v\n", opt)
	} else {
		fmt.Fprintln(stderr, err)
	}
	return exitBadInput
}
