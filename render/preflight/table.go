package preflight

import (
	"bufio"
	"fmt"
	"io"
	"text/tabwriter"
)

// WriteTable prints findings as a table, in their order (worst first as
// Check sorts them), at most limit rows (0: all), the rest counted in a
// last row. It prints nothing for no findings.
func WriteTable(w io.Writer, fs []Finding, limit int) {
	if len(fs) == 0 {
		return
	}
	// tabwriter writes cell by cell: on an unbuffered stderr, ten
	// system calls a row (21,000 for the catalog's check).
	bw := bufio.NewWriterSize(w, 64<<10)
	defer bw.Flush()
	w = bw
	fmt.Fprintln(w, CountLine(fs))
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

// CountLine is the table's first line: "preflight: 0 errors, 2
// warnings, 6 for review, 7 notes".
func CountLine(fs []Finding) string {
	counts := map[Severity]int{}
	for _, f := range fs {
		counts[f.Severity]++
	}
	return fmt.Sprintf("preflight: %d errors, %d warnings, %d for review, %d notes",
		counts[Error], counts[Warning], counts[Review], counts[Info])
}
