package production_test

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"
	"time"

	"sheaf/render/feature"
	"sheaf/render/production"
)

// Build a feature into a folder, then build it again: the second build
// reuses every page and reports that nothing changed.
func ExampleBuild() {
	job, err := feature.Load("../../testdata/small/spec.yaml")
	if err != nil {
		log.Fatal(err)
	}
	dir, err := os.MkdirTemp("", "sheaf-example-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	opts := production.Options{
		Dir:  filepath.Join(dir, "out"),
		Date: time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC), // never the clock: same inputs, same bytes
	}
	res, err := production.Build(context.Background(), job, opts)
	if err != nil {
		log.Fatal(err)
	}
	for _, f := range res.Files {
		rel, _ := filepath.Rel(opts.Dir, f)
		fmt.Println(filepath.ToSlash(rel))
	}
	res, err = production.Build(context.Background(), job, opts)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("changed files:", len(res.Changes.Files.Changed)+len(res.Changes.Files.Added), "nothing changed:", res.Changes.Nothing())
	// Output:
	// print/print.pdf
	// print/proofs/page-001.png
	// print/contact.png
	// changed files: 0 nothing changed: true
}
