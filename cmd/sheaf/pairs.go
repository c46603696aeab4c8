package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"image"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/contact"
	"sheaf/render/feature"
	"sheaf/render/insert"
	"sheaf/render/pdf"
	"sheaf/render/production"
	"sheaf/render/raster"
	"sheaf/specs"
	"sheaf/specs/series"
	"sheaf/specs/series/shape"
)

// pairsReport is what `sheaf pairs --json` prints. README documents it.
type pairsReport struct {
	Spec      string        `json:"spec"`
	Terms     int           `json:"terms"`
	Alike     []pairRow     `json:"alike"`
	HandOvers []pairRow     `json:"hand_overs"`
	Files     []string      `json:"files,omitempty"`
	insertFor *specs.Output // the output the inserts borrow
	size      specs.Size    // the inserts' size
	rows      []*pairRow    // Alike then HandOvers, numbered in that order
	data      *series.Set   // the feature's data
}

// pairRow is one pair: its number (as on the sheet), its terms and
// score, and the inserts entry that shows it.
type pairRow struct {
	Number int      `json:"number"`
	Kind   string   `json:"kind"` // "alike" or "hand-over"
	Terms  []string `json:"terms"`
	// Distance (alike): the root-mean-square difference of the two
	// lines' signatures (as plotted, in plot heights, then their
	// cumulative share of ink; package shape).
	Distance float64 `json:"distance,omitempty"`
	// Strength (hand-over): the smaller of the first term's fall and the
	// second's rise across the split, in plot heights.
	Strength  float64    `json:"strength,omitempty"`
	SplitYear int        `json:"split_year,omitempty"`
	Crossing  int        `json:"crossing_year,omitempty"`
	Insert    pairInsert `json:"insert"`
	YAML      string     `json:"yaml"` // the entry, ready to paste under inserts:
	series    []int
}

// pairInsert is an inserts entry of the spec.
type pairInsert struct {
	Name   string   `json:"name"`
	Output string   `json:"output"`
	Size   string   `json:"size"`
	Terms  []string `json:"terms"`
	Title  string   `json:"title"`
}

func runPairs(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("pairs", "SPEC [--top N] [--per-term N] [--output NAME] [--size 'W x H'] [--json] [--out DIR] [--no-sheet]",
		"Find the pairs of selected terms worth showing side by side: the most alike (their plotted\n"+
			"lines are closest) and the strongest hand-overs (one falls as the other rises, with the year\n"+
			"their lines cross). Prints a table, each row with an inserts entry ready to paste into the\n"+
			"spec, and writes a sheet of the pairs drawn as comparison panels (pairs.png and pairs.pdf).", stderr)
	top := fs.Int("top", 8, "pairs of each kind")
	perTerm := fs.Int("per-term", 2, "the most rows of a kind one term may appear in (0: no limit)")
	outName := fs.String("output", "", "the output the inserts borrow (default: the spec's first)")
	sizeText := fs.String("size", "", "the inserts' size, W x H (default 90mm x 60mm for print, 480px x 300px for screen)")
	asJSON := fs.Bool("json", false, "print the pairs as a JSON object on stdout")
	outDir := fs.String("out", "", "folder for pairs.png and pairs.pdf (default: out/pairs beside the spec)")
	noSheet := fs.Bool("no-sheet", false, "print the table only; write no files")
	path, code, ok := startCommand(fs, args, stderr)
	if !ok {
		return code
	}
	if *top < 1 || *top > 100 || *perTerm < 0 {
		fmt.Fprintln(stderr, "sheaf pairs: --top must be 1 to 100 and --per-term 0 or more")
		return exitBadInput
	}
	spec, err := specs.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	// The panels' order and groups do not matter here: skip the
	// similarity ordering the spec may ask for (seconds for thousands).
	unordered := *spec
	unordered.Order, unordered.Group = specs.OrderListed, specs.GroupNone
	j, err := feature.LoadData(&unordered)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	if len(j.Spec.Outputs) == 0 {
		fmt.Fprintln(stderr, "sheaf pairs: the spec has no outputs")
		return exitBadInput
	}
	rep := &pairsReport{Spec: j.Spec.File, Terms: len(j.Data.Series), data: j.Data, insertFor: &j.Spec.Outputs[0],
		Alike: []pairRow{}, HandOvers: []pairRow{}}
	if *outName != "" {
		if rep.insertFor = j.Spec.Output(*outName); rep.insertFor == nil {
			fmt.Fprintf(stderr, "sheaf pairs: --output %s: the spec has no output of that name\n", *outName)
			return exitBadInput
		}
	}
	rep.size = specs.Size{W: specs.Length(90 * 72 / 25.4), H: specs.Length(60 * 72 / 25.4)}
	if rep.insertFor.Kind == specs.Screen {
		rep.size = specs.Size{W: 480 * 0.75, H: 300 * 0.75}
	}
	if *sizeText != "" {
		if rep.size, err = specs.ParseSize(*sizeText, false); err != nil {
			fmt.Fprintf(stderr, "sheaf pairs: --size: %v\n", err)
			return exitBadInput
		}
	}
	dir := *outDir
	if dir == "" {
		dir = filepath.Join(j.Spec.Dir, "out", "pairs")
	}
	if st, err := os.Stat(dir); err == nil && !st.IsDir() && !*noSheet {
		fmt.Fprintf(stderr, "sheaf pairs: --out %s is a file; give a folder\n", dir)
		return exitBadInput
	}

	findPairs(rep, *top, *perTerm)
	var graphics []*insert.Graphic
	if len(rep.rows) > 0 {
		// Every graphic is laid out, sheet or not, before any file is
		// written: a size too small for its plot is bad input (the pasted
		// entry would fail too) and writes nothing.
		if graphics, err = pairGraphics(j, rep); err != nil {
			fmt.Fprintln(stderr, err)
			return exitBadInput
		}
	}
	if !*noSheet && len(rep.rows) > 0 {
		if rep.Files, err = writePairSheets(j, rep, graphics, dir); err != nil {
			fmt.Fprintln(stderr, "sheaf pairs:", err)
			return exitFindings
		}
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if err := enc.Encode(rep); err != nil {
			fmt.Fprintln(stderr, err)
			return exitFindings
		}
		return exitOK
	}
	writePairsTable(stdout, rep)
	for _, f := range rep.Files {
		fmt.Fprintln(stdout, f)
	}
	return exitOK
}

// findPairs fills the report's rows from the plotted shapes.
func findPairs(rep *pairsReport, top, perTerm int) {
	d := rep.data
	shapes := d.Shapes()
	size := specLength(rep.insertFor, rep.size.W) + " x " + specLength(rep.insertFor, rep.size.H)
	entry := func(kind string, a, b int, title string) pairInsert {
		ta, tb := d.Series[a].Term, d.Series[b].Term
		return pairInsert{Name: kind + "-" + production.Slug(ta) + "-" + production.Slug(tb), Output: rep.insertFor.Name, Size: size,
			Terms: []string{ta, tb}, Title: title}
	}
	for _, p := range shape.Similar(shapes, top, perTerm) {
		ta, tb := d.Series[p.A].Term, d.Series[p.B].Term
		rep.Alike = append(rep.Alike, pairRow{Kind: "alike", Terms: []string{ta, tb}, Distance: round4(p.Distance),
			Insert: entry("alike", p.A, p.B, ta+" and "+tb), series: []int{p.A, p.B}})
	}
	for _, h := range shape.HandOvers(shapes, top, perTerm) {
		ta, tb := d.Series[h.Falling].Term, d.Series[h.Rising].Term
		cross := d.Span.From + h.Crossing
		rep.HandOvers = append(rep.HandOvers, pairRow{Kind: "hand-over", Terms: []string{ta, tb}, Strength: round4(h.Strength),
			SplitYear: d.Span.From + h.Split, Crossing: cross,
			Insert: entry("handover", h.Falling, h.Rising, fmt.Sprintf("%s gives way to %s; the lines cross in %d", ta, tb, cross)),
			series: []int{h.Falling, h.Rising}})
	}
	n := 0
	for _, list := range [][]pairRow{rep.Alike, rep.HandOvers} {
		for i := range list {
			n++
			list[i].Number = n
			list[i].YAML = list[i].Insert.yaml()
			rep.rows = append(rep.rows, &list[i])
		}
	}
}

// specLength writes a length as a spec would: px on screen, mm in
// print, to 0.1 without trailing zeros ("90mm", "480px").
func specLength(o *specs.Output, l specs.Length) string {
	v, unit := l.Mm(), "mm"
	if o.Kind == specs.Screen {
		v, unit = l.Px(), "px"
	}
	return strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64) + unit
}

func round4(v float64) float64 { return float64(int64(v*1e4+0.5)) / 1e4 }

// yaml is the entry as one line to paste under the spec's inserts key.
func (e pairInsert) yaml() string {
	q := func(s string) string {
		var b bytes.Buffer
		enc := json.NewEncoder(&b) // a JSON string is a YAML double-quoted scalar
		enc.SetEscapeHTML(false)
		enc.Encode(s)
		return strings.TrimSpace(b.String())
	}
	terms := make([]string, len(e.Terms))
	for i, t := range e.Terms {
		terms[i] = q(t)
	}
	return fmt.Sprintf("%s: {output: %s, size: %s, terms: [%s], title: %s}", e.Name, e.Output, e.Size, strings.Join(terms, ", "), q(e.Title))
}

func writePairsTable(w io.Writer, rep *pairsReport) {
	fmt.Fprintf(w, "%s: %d terms compared as plotted\n\n", rep.Spec, rep.Terms)
	fmt.Fprintln(w, "Most alike (distance: root-mean-square difference of the lines as plotted and of their cumulative ink; 0 is the same line)")
	if len(rep.Alike) == 0 {
		fmt.Fprintln(w, "  none")
	}
	for _, r := range rep.Alike {
		fmt.Fprintf(w, "%3d  %.4f  %s · %s\n", r.Number, r.Distance, r.Terms[0], r.Terms[1])
		fmt.Fprintf(w, "     %s\n", r.YAML)
	}
	fmt.Fprintln(w, "\nStrongest hand-overs (strength: the smaller of the first term's fall and the second's rise, in plot heights)")
	if len(rep.HandOvers) == 0 {
		fmt.Fprintln(w, "  none")
	}
	for _, r := range rep.HandOvers {
		fmt.Fprintf(w, "%3d  %.4f  %s → %s, lines cross in %d\n", r.Number, r.Strength, r.Terms[0], r.Terms[1], r.Crossing)
		fmt.Fprintf(w, "     %s\n", r.YAML)
	}
	fmt.Fprintln(w, "\nPaste a line under inserts: in the spec; `sheaf build` then draws it.")
}

// pairGraphics lays out each row as a comparison panel, as the insert
// it proposes would be drawn.
func pairGraphics(j *feature.Job, rep *pairsReport) ([]*insert.Graphic, error) {
	fset, err := fonts.Load(j.Spec, rep.insertFor)
	if err != nil {
		return nil, err
	}
	sc, err := feature.Scale(j.Spec, j.Data.Span)
	if err != nil {
		return nil, err
	}
	var out []*insert.Graphic
	for _, r := range rep.rows {
		in := &specs.Insert{Name: r.Insert.Name, Output: rep.insertFor.Name, Size: rep.size,
			Terms: r.Insert.Terms, Title: fmt.Sprintf("%d. %s", r.Number, r.Insert.Title)}
		d := *j.Data
		d.Series = []series.Series{j.Data.Series[r.series[0]], j.Data.Series[r.series[1]]}
		d.Groups = []series.Group{{Count: 2}}
		g, err := insert.New(j.Spec, in, rep.insertFor, &d, sc, fset)
		if err != nil {
			// The insert is not in the spec: its message names no place
			// in it, only what the size must become.
			msg := err.Error()
			if _, after, ok := strings.Cut(msg, fmt.Sprintf("insert %q: ", in.Name)); ok {
				msg = after
			}
			return nil, fmt.Errorf("sheaf pairs: --size %s x %s is too small for pair %d: %s", specLength(rep.insertFor, rep.size.W), specLength(rep.insertFor, rep.size.H), r.Number, msg)
		}
		out = append(out, g)
	}
	return out, nil
}

// sheetColumns is how many graphics a row of the sheet holds.
const sheetColumns = 4

// writePairSheets writes pairs.png (the graphics at 96 dpi on a contact
// sheet, numbered as in the table) and pairs.pdf (each graphic a page).
func writePairSheets(j *feature.Job, rep *pairsReport, gs []*insert.Graphic, dir string) ([]string, error) {
	paper := gs[0].Paper()
	var thumbs []image.Image
	for _, g := range gs {
		w, h := g.Size()
		img, err := raster.Draw(w, h, 96, paper, func(ctx *canvas.Context) error { return g.Draw(ctx) })
		if err != nil {
			return nil, err
		}
		thumbs = append(thumbs, img)
	}
	png := filepath.Join(dir, "pairs.png")
	if err := production.WriteAtomic(png, func(w io.Writer) error {
		return raster.WritePNG(w, contact.Sheet(thumbs, sheetColumns))
	}); err != nil {
		return nil, err
	}
	date, err := feature.DocumentDate(j.Spec, os.Getenv("SOURCE_DATE_EPOCH"))
	if err != nil {
		return nil, err
	}
	// The PDF has one page per graphic, at the insert's size, in the
	// table's order: a vector proof of each insert as build would draw it
	// (one graphic a page, so each keeps its own coordinates and
	// gradients).
	pdfPath := filepath.Join(dir, "pairs.pdf")
	err = production.WriteAtomic(pdfPath, func(w io.Writer) error {
		doc := pdf.NewWriter(w, pdf.Options{Title: j.Spec.Title + " — pairs", Version: version, Date: date})
		for _, g := range gs {
			gw, gh := g.Size()
			box := canvas.Rect{X0: 0, Y0: 0, X1: gw, Y1: gh}
			if err := doc.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}}, func(c *canvas.Canvas) error {
				return g.Draw(canvas.NewContext(c))
			}); err != nil {
				return err
			}
		}
		return doc.Close()
	})
	if err != nil {
		return nil, err
	}
	return []string{png, pdfPath}, nil
}
