package main

import (
	"errors"
	"flag"
	"fmt"
	"io"

	"sheaf/specs"
)

func runSchema(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("schema", "", "Print the JSON Schema (draft 2020-12) of the page spec, made from the loader's own key\ntables; the repository keeps a copy at specs/sheaf.schema.json for YAML editors.", stderr)
	pos, err := parseFlags(fs, args)
	if errors.Is(err, flag.ErrHelp) {
		return exitOK
	}
	if err != nil {
		return exitBadInput
	}
	if len(pos) != 0 {
		fmt.Fprintf(stderr, "sheaf schema: takes no arguments (got %d)\n", len(pos))
		fs.Usage()
		return exitBadInput
	}
	if _, err := stdout.Write(specs.Schema()); err != nil {
		fmt.Fprintln(stderr, "sheaf schema:", err)
		return exitFindings
	}
	return exitOK
}
