// Package explore finds what in a feature's data is worth showing on its
// own, before it goes on a page: the pairs of selected terms whose
// plotted lines are most alike, and the strongest hand-overs (one term
// falls as the other rises, with the year their lines cross). Each pair
// comes with the inserts entry that would show it, ready to paste under
// the spec's inserts key; Report.Graphics lays each out as that insert
// would be drawn, and WriteSheets draws them on a sheet (a PNG contact
// sheet and a PDF of one page per pair). WriteSwatches draws the era
// palette's swatch sheet, for a look at the colours before a build.
//
// Find and Graphics are pure; WriteSheets and WriteSwatches write their
// two files each through temporary names and touch nothing else. Nothing here reads the
// environment or the clock: the sheet's date is the caller's.
package explore

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"sheaf/layout/fonts"
	"sheaf/render/feature"
	"sheaf/render/insert"
	"sheaf/render/slug"
	"sheaf/specs"
	"sheaf/specs/series"
	"sheaf/specs/series/shape"
)

// Options says how many pairs to find and how their inserts look.
type Options struct {
	// Top is how many pairs of each kind to keep, 1 to 100.
	Top int
	// PerTerm is the most rows of a kind one term may appear in (0: no
	// limit), so one restless term does not fill the table.
	PerTerm int
	// Output names the output the inserts borrow (fonts, type, kind);
	// "" is the spec's first.
	Output string
	// Size is the inserts' size, "W x H" as a spec writes it; "" is
	// 90mm x 60mm for print and 480px x 300px for screen.
	Size string
}

// OptionError is an option the job cannot honour: an output the spec
// does not have, a size that does not parse or is too small to draw a
// pair in. It is bad input (wrapped in a *specs.InputError).
type OptionError struct {
	Option string // the option, as Options names it in lower case: "output", "size", "top"
	Text   string // what is wrong, as it follows the option's name
}

func (e *OptionError) Error() string { return e.Option + e.Text }

func optionErr(option, format string, a ...any) error {
	return specs.BadInput(&OptionError{Option: option, Text: fmt.Sprintf(format, a...)})
}

// Report is the pairs found: what `sheaf pairs --json` prints (README
// documents it).
type Report struct {
	Spec      string `json:"spec"`
	Terms     int    `json:"terms"`
	Alike     []Pair `json:"alike"`
	HandOvers []Pair `json:"hand_overs"`
	// Files are the sheet's files, once the caller has written them
	// (WriteSheets) and put them here.
	Files []string `json:"files,omitempty"`

	job    *feature.Job
	output *specs.Output // the output the inserts borrow
	size   specs.Size    // the inserts' size
	rows   []*Pair       // Alike then HandOvers, numbered in that order
}

// Pair is one pair: its number (as on the sheet), its terms and score,
// and the inserts entry that shows it.
type Pair struct {
	Number int      `json:"number"`
	Kind   string   `json:"kind"` // "alike" or "hand-over"
	Terms  []string `json:"terms"`
	// Distance (alike): the root-mean-square difference of the two
	// lines' signatures (as plotted, in plot heights, then their
	// cumulative share of ink; package shape).
	Distance float64 `json:"distance,omitempty"`
	// Strength (hand-over): the smaller of the first term's fall and the
	// second's rise across the split, in plot heights.
	Strength  float64 `json:"strength,omitempty"`
	SplitYear int     `json:"split_year,omitempty"`
	Crossing  int     `json:"crossing_year,omitempty"`
	Insert    Insert  `json:"insert"`
	YAML      string  `json:"yaml"` // the entry, ready to paste under inserts:
	series    []int
}

// Insert is an inserts entry of the spec.
type Insert struct {
	Name   string   `json:"name"`
	Output string   `json:"output"`
	Size   string   `json:"size"`
	Terms  []string `json:"terms"`
	Title  string   `json:"title"`
}

// LoadData reads a spec's data for exploring: the selected terms, in the
// listed order and ungrouped, since the order of panels does not matter
// here (the similarity order a spec may ask for takes seconds for
// thousands of terms). The spec itself is not changed.
func LoadData(s *specs.Spec) (*feature.Job, error) {
	unordered := *s
	unordered.Order, unordered.Group = specs.OrderListed, specs.GroupNone
	return feature.LoadData(&unordered)
}

// Find searches the job's selected terms, as plotted, for the most alike
// pairs and the strongest hand-overs. Errors are bad input.
func Find(j *feature.Job, opt Options) (*Report, error) {
	if opt.Top < 1 || opt.Top > 100 {
		return nil, optionErr("top", " %d: give 1 to 100", opt.Top)
	}
	if opt.PerTerm < 0 {
		return nil, optionErr("per-term", " %d: give 0 or more", opt.PerTerm)
	}
	if len(j.Spec.Outputs) == 0 {
		return nil, specs.BadInput(errors.New("the spec has no outputs"))
	}
	rep := &Report{Spec: j.Spec.File, Terms: len(j.Data.Series), job: j, output: &j.Spec.Outputs[0],
		Alike: []Pair{}, HandOvers: []Pair{}}
	if opt.Output != "" {
		if rep.output = j.Spec.Output(opt.Output); rep.output == nil {
			return nil, optionErr("output", " %s: the spec has no output of that name", opt.Output)
		}
	}
	rep.size = specs.Size{W: specs.Length(90 * specs.PtPerMm), H: specs.Length(60 * specs.PtPerMm)}
	if rep.output.Kind == specs.Screen {
		rep.size = specs.Size{W: specs.Length(480 * specs.PtPerPx), H: specs.Length(300 * specs.PtPerPx)}
	}
	if opt.Size != "" {
		var err error
		if rep.size, err = specs.ParseSize(opt.Size, false); err != nil {
			return nil, optionErr("size", ": %v", err)
		}
	}
	rep.find(opt.Top, opt.PerTerm)
	return rep, nil
}

// Pairs are the rows found, alike then hand-overs, in the numbers' order.
func (r *Report) Pairs() []*Pair { return r.rows }

// find fills the report's rows from the plotted shapes.
func (r *Report) find(top, perTerm int) {
	d := r.job.Data
	shapes := d.Shapes()
	size := specLength(r.output, r.size.W) + " x " + specLength(r.output, r.size.H)
	entry := func(kind string, a, b int, title string) Insert {
		ta, tb := d.Series[a].Term, d.Series[b].Term
		return Insert{Name: kind + "-" + slug.Of(ta) + "-" + slug.Of(tb), Output: r.output.Name, Size: size,
			Terms: []string{ta, tb}, Title: title}
	}
	for _, p := range shape.Similar(shapes, top, perTerm) {
		ta, tb := d.Series[p.A].Term, d.Series[p.B].Term
		r.Alike = append(r.Alike, Pair{Kind: "alike", Terms: []string{ta, tb}, Distance: round4(p.Distance),
			Insert: entry("alike", p.A, p.B, ta+" and "+tb), series: []int{p.A, p.B}})
	}
	for _, h := range shape.HandOvers(shapes, top, perTerm) {
		ta, tb := d.Series[h.Falling].Term, d.Series[h.Rising].Term
		cross := d.Span.From + h.Crossing
		r.HandOvers = append(r.HandOvers, Pair{Kind: "hand-over", Terms: []string{ta, tb}, Strength: round4(h.Strength),
			SplitYear: d.Span.From + h.Split, Crossing: cross,
			Insert: entry("handover", h.Falling, h.Rising, fmt.Sprintf("%s gives way to %s; the lines cross in %d", ta, tb, cross)),
			series: []int{h.Falling, h.Rising}})
	}
	n := 0
	for _, list := range [][]Pair{r.Alike, r.HandOvers} {
		for i := range list {
			n++
			list[i].Number = n
			list[i].YAML = list[i].Insert.yaml()
			r.rows = append(r.rows, &list[i])
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
func (e Insert) yaml() string {
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

// Graphics lays out each pair as a comparison panel, as the insert it
// proposes would be drawn, numbered as in the report. A size too small
// for a pair's plot is an *OptionError (bad input): the pasted entry
// would fail too.
func (r *Report) Graphics() ([]*insert.Graphic, error) {
	j := r.job
	if len(r.rows) == 0 {
		return nil, nil
	}
	fset, err := fonts.Load(j.Spec, r.output)
	if err != nil {
		return nil, err
	}
	sc, err := feature.Scale(j.Spec, j.Data.Span)
	if err != nil {
		return nil, err
	}
	var out []*insert.Graphic
	for _, p := range r.rows {
		in := &specs.Insert{Name: p.Insert.Name, Output: r.output.Name, Size: r.size,
			Terms: p.Insert.Terms, Title: fmt.Sprintf("%d. %s", p.Number, p.Insert.Title)}
		d := *j.Data
		d.Series = []series.Series{j.Data.Series[p.series[0]], j.Data.Series[p.series[1]]}
		d.Groups = []series.Group{{Count: 2}}
		g, err := insert.New(j.Spec, in, r.output, &d, sc, fset)
		if err != nil {
			// The insert is not in the spec: its message names no place
			// in it, only what the size must become.
			msg := err.Error()
			if _, after, ok := strings.Cut(msg, fmt.Sprintf("insert %q: ", in.Name)); ok {
				msg = after
			}
			return nil, optionErr("size", " %s x %s is too small for pair %d: %s", specLength(r.output, r.size.W), specLength(r.output, r.size.H), p.Number, msg)
		}
		out = append(out, g)
	}
	return out, nil
}

// WriteTable prints the report for a person, as `sheaf pairs` does: each
// list numbered as on the sheet, each pair with its score and the
// inserts entry to paste.
func (r *Report) WriteTable(w io.Writer) {
	fmt.Fprintf(w, "%s: %d terms compared as plotted\n\n", r.Spec, r.Terms)
	fmt.Fprintln(w, "Most alike (distance: root-mean-square difference of the lines as plotted and of their cumulative ink; 0 is the same line)")
	if len(r.Alike) == 0 {
		fmt.Fprintln(w, "  none")
	}
	for _, p := range r.Alike {
		fmt.Fprintf(w, "%3d  %.4f  %s · %s\n", p.Number, p.Distance, p.Terms[0], p.Terms[1])
		fmt.Fprintf(w, "     %s\n", p.YAML)
	}
	fmt.Fprintln(w, "\nStrongest hand-overs (strength: the smaller of the first term's fall and the second's rise, in plot heights)")
	if len(r.HandOvers) == 0 {
		fmt.Fprintln(w, "  none")
	}
	for _, p := range r.HandOvers {
		fmt.Fprintf(w, "%3d  %.4f  %s → %s, lines cross in %d\n", p.Number, p.Strength, p.Terms[0], p.Terms[1], p.Crossing)
		fmt.Fprintf(w, "     %s\n", p.YAML)
	}
	fmt.Fprintln(w, "\nPaste a line under inserts: in the spec; `sheaf build` then draws it.")
}
