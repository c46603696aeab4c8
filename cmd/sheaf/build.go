package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"sheaf/render/feature"
	"sheaf/render/production"
	"sheaf/specs"
)

// buildHooks are production's test hooks; tests set them.
var buildHooks production.Hooks

// stdoutIsTerminal decides between the brief report and the list of
// paths; a test may pretend.
var stdoutIsTerminal = isTerminal

// outFolder is the output folder --out names, or out/ beside the spec.
func outFolder(spec *specs.Spec, flag string) string {
	if flag == "" {
		return filepath.Join(spec.Dir, "out")
	}
	return flag
}

func runBuild(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("build", "SPEC [--out DIR] [--only OUTPUT] [--strict] [--no-proofs] [--full] [--quiet] [--paths]",
		"Render every output of the spec: for print, one PDF with bleed and crop marks, a PNG proof per page\n"+
			"and a contact sheet. Preflight runs first. Pages whose inputs did not change since the last build\n"+
			"are reused from DIR/.cache, and screen outputs and inserts whose inputs did not change keep their\n"+
			"files; DIR/manifest.json records what went in and came out, and\n"+
			"DIR/changes.txt and changes.json say what changed since the last build. The outputs are written\n"+
			"beside DIR and swapped in only when all is done: an interrupted build leaves DIR as it was.", stderr)
	outDir := fs.String("out", "", "folder `DIR` for the outputs (default: out/ beside the spec)")
	only := fs.String("only", "", "build only the output named `OUTPUT`; the others' files are kept")
	strict := fs.Bool("strict", false, "stop without writing anything when preflight finds warnings or errors")
	noProofs := fs.Bool("no-proofs", false, "draw no PNG proofs or contact sheet for print outputs; those of pages that did not change are kept,\nthose of changed pages removed and listed as stale in changes.txt")
	full := fs.Bool("full", false, "draw every page, screen output and insert afresh instead of reusing unchanged ones")
	quiet := fs.Bool("quiet", false, "no progress line")
	paths := fs.Bool("paths", false, "print the path of every file written on stdout, also on a terminal (without a terminal they are always printed)")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	// The data is loaded by Build, beside reading the last build's cache.
	spec, err := specs.Load(path)
	if err != nil {
		return report(stderr, specs.BadInput(err))
	}
	dir := outFolder(spec, *outDir)
	date, err := feature.DocumentDate(spec, os.Getenv("SOURCE_DATE_EPOCH"))
	if err != nil {
		return report(stderr, err)
	}
	ctx, stop := interruptible()
	defer stop()
	prog := progressFor(stderr, *quiet)
	res, err := production.Build(ctx, &feature.Job{Spec: spec}, production.Options{
		Dir: dir, Only: *only, Strict: *strict, NoProofs: *noProofs, Full: *full, Date: date,
		Progress: prog, Hooks: buildHooks,
	})
	prog.done()
	switch {
	case errors.Is(err, production.ErrStrict):
		fmt.Fprintln(stderr, "sheaf build: strict preflight: stopped before writing anything (fix the warnings and errors above, or build without --strict)")
		return exitFindings
	case err != nil && specs.IsBadInput(err):
		var fe *production.FolderError
		if errors.As(err, &fe) {
			flag := ""
			if *outDir != "" {
				flag = "--out "
			}
			fmt.Fprintf(stderr, "sheaf build: %s%v\n", flag, fe)
			return exitBadInput
		}
		return report(stderr, err)
	case err != nil && ctx.Err() != nil:
		fmt.Fprintf(stderr, "sheaf build: interrupted; %s is as it was before the build\n", dir)
		return exitFindings
	case err != nil:
		fmt.Fprintf(stderr, "sheaf build: %v\n", err)
		fmt.Fprintf(stderr, "sheaf build: nothing was changed in %s\n", dir)
		return exitFindings
	}
	// On a terminal, a few lines for a person; for a script (stdout
	// piped or redirected) or with --paths, every path on stdout and the
	// change report on stderr.
	if stdoutIsTerminal(stdout) && !*paths {
		res.Changes.WriteBrief(stdout, filepath.Join(dir, production.ChangesText))
		return exitOK
	}
	for _, f := range res.Files {
		fmt.Fprintln(stdout, f)
	}
	res.Changes.WriteSummary(stderr)
	return exitOK
}
