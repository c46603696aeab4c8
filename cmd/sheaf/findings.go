package main

import (
	"bufio"
	"fmt"
	"io"
	"text/tabwriter"

	"sheaf/render/preflight"
)

// maxFindingsShown bounds the preflight table on stderr; `sheaf check
// --json` lists every finding.
const maxFindingsShown = 40

// writeFindings prints findings as a table, worst first, at most limit
// rows (0: all).
func writeFindings(w io.Writer, fs []preflight.Finding, limit int) {
	if len(fs) == 0 {
		return
	}
	// tabwriter writes cell by cell: on an unbuffered stderr, ten
	// system calls a row (21,000 for the catalog's check).
	bw := bufio.NewWriterSize(w, 64<<10)
	defer bw.Flush()
	w = bw
	fmt.Fprintln(w, findingsCount(fs))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for k, f := range fs {
		if limit > 0 && k == limit {
			fmt.Fprintf(tw, "  …\t%d more: sheaf check --json lists them all\t\t\n", len(fs)-k)
			break
		}
		msg := f.Message
		if f.At != "" {
			msg += " (" + f.At + ")"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", f.Severity, f.ID, f.Where(), msg)
	}
	tw.Flush()
}

// findingsCount is the table's first line: "preflight: 0 errors, 2
// warnings, 6 for review, 7 notes".
func findingsCount(fs []preflight.Finding) string {
	counts := map[preflight.Severity]int{}
	for _, f := range fs {
		counts[f.Severity]++
	}
	return fmt.Sprintf("preflight: %d errors, %d warnings, %d for review, %d notes",
		counts[preflight.Error], counts[preflight.Warning], counts[preflight.Review], counts[preflight.Info])
}
