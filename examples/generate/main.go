// Command generate writes the invented demo data of sheaf: yearly word
// counts for the vocabulary of Plumb & Pinion, a fictional engineering weekly
// of the invented town of Quillmere.
//
//	go run ./examples/generate -out examples/quillmere/data
//
// It writes counts.csv (term,year,count; nonzero counts only) and totals.csv
// (year,total) into the -out directory. Same flags, same bytes.
package main

import (
	"flag"
	"fmt"
	"os"
	"strconv"
	"strings"

	"sheaf/examples/generate/corpus"
)

func main() {
	def := corpus.DefaultConfig()
	out := flag.String("out", "", "directory to write counts.csv and totals.csv into (required)")
	terms := flag.Int("terms", def.Terms, "number of distinct terms")
	seed := flag.Uint64("seed", def.Seed, "random seed")
	from := flag.Int("from", def.From, "first year")
	to := flag.Int("to", def.To, "last year")
	spikes := flag.Int("spikes", def.Spikes, "number of common terms given a one-year spike")
	missing := flag.String("missing", joinInts(def.Missing), "comma-separated years in which the journal did not appear")
	flag.Parse()

	if *out == "" || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: generate -out DIR [-terms N] [-seed S] [-from YEAR] [-to YEAR] [-missing Y,Y,...] [-spikes N]")
		os.Exit(2)
	}
	skip, err := parseInts(*missing)
	if err != nil {
		fmt.Fprintf(os.Stderr, "generate: -missing: %v\n", err)
		os.Exit(2)
	}
	cfg := corpus.Config{Terms: *terms, Seed: *seed, From: *from, To: *to, Missing: skip, Spikes: *spikes}
	if err := corpus.WriteDir(*out, cfg); err != nil {
		fmt.Fprintf(os.Stderr, "generate: %v\n", err)
		os.Exit(1)
	}
}

func joinInts(v []int) string {
	s := make([]string, len(v))
	for i, n := range v {
		s[i] = strconv.Itoa(n)
	}
	return strings.Join(s, ",")
}

func parseInts(s string) ([]int, error) {
	var out []int
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f == "" {
			continue
		}
		n, err := strconv.Atoi(f)
		if err != nil {
			return nil, fmt.Errorf("%q is not a year", f)
		}
		out = append(out, n)
	}
	return out, nil
}
