package explore_test

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"

	"sheaf/render/explore"
	"sheaf/render/feature"
	"sheaf/specs"
)

// Find the two most alike pairs of a small feature's terms, print the
// inserts entries that would show them, and draw them on a sheet.
func ExampleFind() {
	spec, err := specs.Load("../../testdata/small/spec.yaml")
	if err != nil {
		log.Fatal(err)
	}
	job, err := explore.LoadData(spec)
	if err != nil {
		log.Fatal(err)
	}
	rep, err := explore.Find(job, explore.Options{Top: 2})
	if err != nil {
		log.Fatal(err) // a *specs.InputError: errors.As finds an *explore.OptionError in it
	}
	for _, p := range rep.Pairs() {
		fmt.Printf("%d %s %.4f\n  %s\n", p.Number, p.Kind, p.Distance, p.YAML)
	}
	graphics, err := rep.Graphics()
	if err != nil {
		log.Fatal(err)
	}
	dir, err := os.MkdirTemp("", "sheaf-example-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	// The date comes from the caller (never the clock): same inputs, same bytes.
	files, err := explore.WriteSheets(context.Background(), rep, graphics, dir, feature.FallbackDate)
	if err != nil {
		log.Fatal(err)
	}
	for _, f := range files {
		fmt.Println(filepath.Base(f))
	}
	// Output:
	// 1 alike 0.2870
	//   alike-telegraph-massstab: {output: print, size: 90mm x 60mm, terms: ["telegraph", "Maßstab"], title: "telegraph and Maßstab"}
	// 2 alike 0.5229
	//   alike-boiler-massstab: {output: print, size: 90mm x 60mm, terms: ["boiler", "Maßstab"], title: "boiler and Maßstab"}
	// pairs.png
	// pairs.pdf
}
