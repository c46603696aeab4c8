package main

import (
	"encoding/json"
	"fmt"
	"io"
	"regexp"
	"slices"
	"strings"

	"sheaf/specs"
	"sheaf/specs/series"
)

func runTerms(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("terms", termsArgs,
		"List the terms in the spec's data, to choose from: each term's total count over the span, its share of\n"+
			"all words printed (per million), its peak year (the year of its highest count per word printed), the\n"+
			"median of its yearly counts over the years it appears, how many years it appears, and whether the\n"+
			"spec's terms selection takes it (yes/no).", stderr)
	match := fs.String("match", "", "only terms containing `TEXT` (any case)")
	pattern := fs.String("pattern", "", "only terms matching the regular expression `RE` (Go RE2 syntax; (?i) for any case)")
	columns := series.TermColumns()
	by := fs.String("sort", "share", "sort by `COLUMN`: "+strings.Join(columns, ", ")+" (term and selected A→Z and yes first; numbers largest first)")
	reverse := fs.Bool("reverse", false, "reverse the order")
	selected := fs.Bool("selected", false, "only the terms the spec selects")
	limit := fs.Int("limit", 0, "at most `N` terms (0: all)")
	asJSON := fs.Bool("json", false, "print a JSON array on stdout (share as a fraction, not per million)")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	if !slices.Contains(columns, *by) {
		fmt.Fprintf(stderr, "sheaf terms: --sort %q: give one of %s\n", *by, strings.Join(columns, ", "))
		return exitBadInput
	}
	var re *regexp.Regexp
	if *pattern != "" {
		var err error
		if re, err = regexp.Compile(*pattern); err != nil {
			fmt.Fprintf(stderr, "sheaf terms: --pattern: %v\n", err)
			return exitBadInput
		}
	}
	if *limit < 0 {
		fmt.Fprintf(stderr, "sheaf terms: --limit %d: give 0 (all) or more\n", *limit)
		return exitBadInput
	}
	spec, err := specs.Load(path)
	if err != nil {
		return report(stderr, specs.BadInput(err))
	}
	all, err := series.Catalog(spec)
	if err != nil {
		return report(stderr, specs.BadInput(err))
	}
	rows := series.FilterTerms(all, series.TermFilter{Match: *match, Pattern: re, Selected: *selected})
	series.SortTerms(rows, *by, *reverse)
	if *limit > 0 && len(rows) > *limit {
		rows = rows[:*limit]
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if rows == nil {
			rows = []series.TermStats{}
		}
		if err := enc.Encode(rows); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		return exitOK
	}
	series.WriteTermTable(stdout, rows)
	sel := 0
	for _, t := range all {
		if t.Selected {
			sel++
		}
	}
	fmt.Fprintf(stderr, "%d of %d terms shown; the spec selects %d\n", len(rows), len(all), sel)
	return exitOK
}

const termsArgs = "SPEC [--match TEXT] [--pattern RE] [--sort COLUMN] [--reverse] [--selected] [--limit N] [--json]"
