package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"

	"sheaf/render/feature"
	"sheaf/render/preflight"
	"sheaf/render/production"
)

func runCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "SPEC [--json] [--strict] [--out DIR]", "Validate the spec and its data, print a summary, and run the preflight checks\n(the findings table goes to stderr). Exit status 1 when preflight finds errors, and with\n--strict when it finds warnings. Text widths the last build into DIR measured are read\nfrom DIR/.cache instead of measured again; the report is the same either way.", stderr)
	asJSON := fs.Bool("json", false, "print the summary and the findings as a JSON object on stdout")
	strict := fs.Bool("strict", false, "exit with status 1 when preflight finds warnings too")
	outDir := fs.String("out", "", "folder `DIR` of the last build, as given to build (default: out/ beside the spec)")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	job, err := feature.Load(path)
	if err != nil {
		return report(stderr, err)
	}
	production.ReuseWidths(job, outFolder(job.Spec, *outDir))
	rep, err := job.Summarize()
	if err != nil {
		return report(stderr, err)
	}
	// The date build will write: a bad SOURCE_DATE_EPOCH is bad input here too.
	if _, err := feature.DocumentDate(job.Spec, os.Getenv("SOURCE_DATE_EPOCH")); err != nil {
		return report(stderr, err)
	}
	code = exitOK
	if preflight.Errs(rep.Preflight) || (*strict || job.Spec.Preflight.Strict) && preflight.Stops(rep.Preflight) {
		code = exitFindings
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(rep); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		return code
	}
	rep.WriteText(stdout)
	preflight.WriteTable(stderr, rep.Preflight, 0)
	return code
}
