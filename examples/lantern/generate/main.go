// Command generate writes the invented text archive of The Fennock
// Lantern (see package archive): DIR/YYYY/issue-N.txt, 1880–1999.
//
//	go run ./examples/lantern/generate -out /tmp/lantern-text
//
// Same seed, same bytes.
package main

import (
	"flag"
	"fmt"
	"os"

	"sheaf/examples/lantern/archive"
)

func main() {
	out := flag.String("out", "", "folder to write the archive into (required)")
	seed := flag.Uint64("seed", 1880, "random seed")
	flag.Parse()
	if *out == "" || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: generate -out DIR [-seed S]")
		os.Exit(2)
	}
	if _, err := archive.Write(*out, *seed); err != nil {
		fmt.Fprintf(os.Stderr, "generate: %v\n", err)
		os.Exit(1)
	}
}
