package feature_test

import (
	"fmt"
	"log"

	"sheaf/render/feature"
)

// Load a spec with its data, prepare every output and read what
// preflight found: what `sheaf check` does.
func Example() {
	job, err := feature.Load("../../testdata/small/spec.yaml")
	if err != nil {
		log.Fatal(err) // a *specs.InputError: the message names file:line:col
	}
	outs, err := job.PrepareAll()
	if err != nil {
		log.Fatal(err)
	}
	for _, o := range outs {
		fmt.Printf("%s: %d page(s), %d panels\n", o.Name(), len(o.Plan.Pages), o.Plan.Panels())
	}
	findings, err := job.Preflight(outs)
	if err != nil {
		log.Fatal(err)
	}
	for _, f := range findings {
		fmt.Println(f.Severity, f.ID)
	}
	// Output:
	// print: 1 page(s), 3 panels
	// review sparse-counts
	// info palette
	// info rgb-output
}

// Summarize is the report `sheaf check --json` prints.
func ExampleJob_Summarize() {
	job, err := feature.Load("../../testdata/small/spec.yaml")
	if err != nil {
		log.Fatal(err)
	}
	r, err := job.Summarize()
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(r.Terms.List, r.Years.From, r.Years.To)
	fmt.Println(r.Outputs[0].Summary)
	// Output:
	// [telegraph boiler Maßstab] 1900 1905
	// print: 1 page, 2 × 3 panels a page, panel 57.5 × 39 mm
}
