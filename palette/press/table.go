package press

import (
	"fmt"
	"io"
	"text/tabwriter"

	"sheaf/palette"
)

// Row is one palette colour as this press prints it.
type Row struct {
	Label   string
	Color   palette.Color
	Ink     []float64 // device values 0–1
	Total   float64   // total ink, percent
	Shift   float64   // ΔE00 between the colour and its print
	Proof   palette.RGB
	OverInk bool // Total above the condition's ink limit
	Moves   bool // Shift above maxShift
}

// Rows converts a palette report's rows; maxShift is the ΔE00 above which
// a row is marked as moving.
func (c *Condition) Rows(r palette.Report, maxShift float64) []Row {
	out := make([]Row, 0, len(r.Rows))
	for _, row := range r.Rows {
		rgb := row.Color.RGB()
		ink, _ := c.Ink(rgb)
		pr := Row{Label: row.Label, Color: row.Color, Ink: ink, Total: Total(ink), Proof: c.Proof(ink)}
		pr.Shift = c.shiftOf(rgb, ink)
		pr.OverInk = pr.Total > c.InkLimit+0.05
		pr.Moves = pr.Shift > maxShift
		out = append(out, pr)
	}
	return out
}

// WriteTable prints the rows: label, screen hex, the inks in percent,
// total ink, press ΔE00 and the soft proof's hex, with a note on rows over
// the ink limit or moving more than maxShift.
func (c *Condition) WriteTable(w io.Writer, rows []Row, maxShift float64) error {
	fmt.Fprintf(w, "On press: %s (%s, %s; ink limit %.0f%%)\n", c.Identifier, c.Profile.Space, c.Intent, c.InkLimit)
	tw := tabwriter.NewWriter(w, 2, 8, 2, ' ', tabwriter.AlignRight)
	names := map[int]string{4: "C\tM\tY\tK", 3: "R\tG\tB", 1: "gray"}[c.Components()]
	fmt.Fprintf(tw, "year\tscreen\t%s\tink %%\tΔE00\tproof\t\n", names)
	for _, r := range rows {
		inks := ""
		for i, v := range r.Ink {
			if i > 0 {
				inks += "\t"
			}
			inks += fmt.Sprintf("%.1f", 100*v)
		}
		note := ""
		if r.OverInk {
			note += fmt.Sprintf("  over the %.0f%% limit", c.InkLimit)
		}
		if r.Moves {
			note += fmt.Sprintf("  moves > %g", maxShift)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%.0f\t%.1f\t%s\t%s\n", r.Label, r.Color.Hex(), inks, r.Total, r.Shift, r.Proof.Hex(), note)
	}
	return tw.Flush()
}
