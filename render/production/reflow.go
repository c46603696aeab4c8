package production

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
)

// Slot is where a panel sits: an output, a page (from 1) and its place on
// the page in panel order (from 1).
type Slot struct {
	Output string `json:"output"`
	Page   int    `json:"page"`
	Slot   int    `json:"slot"`
}

func (s Slot) String() string { return fmt.Sprintf("%s p. %d slot %d", s.Output, s.Page, s.Slot) }

// PanelMove is a term whose panel moved, came or went in one output:
// From is nil for a term new to the output, To nil for one that left it.
type PanelMove struct {
	Term string `json:"term"`
	From *Slot  `json:"from"`
	To   *Slot  `json:"to"`
}

// PageReason says why one page of an output changed: "data" (a term on it
// changed, came or went), "reflow" (panels moved onto, off or within it,
// its own terms' data the same) or "inputs" (the spec, fonts, sheaf
// version or page count changed, with the same panels on it). Terms are
// the page's terms whose data changed or which are new.
type PageReason struct {
	Output string   `json:"output"`
	Page   int      `json:"page"`
	Why    []string `json:"why"`
	Terms  []string `json:"terms,omitempty"`
}

// slots maps every term of an output to its slot.
func slots(o *OutputEntry) map[string]Slot {
	at := map[string]Slot{}
	for _, p := range o.Pages {
		for k, t := range p.Terms {
			if _, dup := at[t]; !dup {
				at[t] = Slot{Output: o.Name, Page: p.Page, Slot: k + 1}
			}
		}
	}
	return at
}

// samePlaces reports whether two outputs' pages hold the same terms in
// the same order: then no panel moved, came or went, and slots need not
// be mapped (a rebuild's usual case, thousands of terms).
func samePlaces(a, b *OutputEntry) bool {
	if len(a.Pages) != len(b.Pages) {
		return false
	}
	for i := range a.Pages {
		if a.Pages[i].Page != b.Pages[i].Page || !sameStrings(a.Pages[i].Terms, b.Pages[i].Terms) {
			return false
		}
	}
	return true
}

// reflow fills r.Moves, r.PageReasons and r.Summary from the two
// manifests; r.Terms must be filled.
func (r *ChangeReport) reflow(prev, cur *Manifest) {
	r.Moves, r.PageReasons = []PanelMove{}, []PageReason{}
	data := map[string]bool{} // terms whose data changed or which came
	for _, t := range r.Terms {
		if t.Change != "removed" {
			data[t.Term] = true
		}
	}
	for _, o := range cur.Outputs {
		po := prev.Output(o.Name)
		if po == nil {
			continue
		}
		if !samePlaces(po, &o) {
			r.Moves = append(r.Moves, moves(slots(po), slots(&o))...)
		}
		for _, p := range o.Pages {
			var old *PageEntry
			if p.Page-1 < len(po.Pages) {
				old = &po.Pages[p.Page-1]
			}
			if old != nil && old.Inputs == p.Inputs {
				continue
			}
			pr := PageReason{Output: o.Name, Page: p.Page}
			for _, t := range p.Terms {
				if data[t] {
					pr.Terms = append(pr.Terms, t)
				}
			}
			if len(pr.Terms) > 0 {
				pr.Why = append(pr.Why, "data")
			}
			if old == nil || !sameStrings(old.Terms, p.Terms) {
				pr.Why = append(pr.Why, "reflow")
			}
			if len(pr.Why) == 0 {
				pr.Why = append(pr.Why, "inputs")
			}
			r.PageReasons = append(r.PageReasons, pr)
		}
	}
	r.Summary = r.summary(prev, cur)
}

// moves lists the terms whose slot differs between was and is, ordered
// by where they land.
func moves(was, is map[string]Slot) []PanelMove {
	var names []string
	for t := range is {
		names = append(names, t)
	}
	for t := range was {
		if _, ok := is[t]; !ok {
			names = append(names, t)
		}
	}
	var out []PanelMove
	for _, t := range names {
		a, hadA := was[t]
		b, hasB := is[t]
		if hadA && hasB && a == b {
			continue
		}
		mv := PanelMove{Term: t}
		if hadA {
			mv.From = &a
		}
		if hasB {
			mv.To = &b
		}
		out = append(out, mv)
	}
	sort.Slice(out, func(i, j int) bool { return slotKey(out[i]) < slotKey(out[j]) })
	return out
}

// slotKey orders moves by where the panel lands (then where it came from).
func slotKey(m PanelMove) string {
	s := m.To
	if s == nil {
		s = m.From
	}
	return fmt.Sprintf("%s\x00%06d\x00%06d\x00%s", s.Output, s.Page, s.Slot, m.Term)
}

func sameStrings(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// summary is the one line a production editor reads first: what changed
// in the data, what moved because of it, and which pages to send again.
func (r *ChangeReport) summary(prev, cur *Manifest) string {
	var parts []string
	count := map[string][]string{}
	for _, t := range r.Terms {
		count[t.Change] = append(count[t.Change], t.Term)
	}
	if n := len(count["changed"]); n > 0 {
		s := fmt.Sprintf("%s data changed", possessive(n))
		if n == 1 {
			s = fmt.Sprintf("1 term's data changed (%q)", count["changed"][0])
			if a, b := peakOf(prev, count["changed"][0]), peakOf(cur, count["changed"][0]); a != 0 && b != 0 && a != b {
				s += fmt.Sprintf("; its peak moved %d → %d", a, b)
			}
		}
		parts = append(parts, s)
	}
	if n := len(count["added"]); n > 0 {
		parts = append(parts, fmt.Sprintf("%s added", plural(n, "term")))
	}
	if n := len(count["removed"]); n > 0 {
		parts = append(parts, fmt.Sprintf("%s removed", plural(n, "term")))
	}
	var why []string
	if r.SheafChanged {
		why = append(why, "sheaf version")
	}
	if r.SpecChanged {
		why = append(why, "spec")
	}
	if len(r.FontsChanged) > 0 {
		why = append(why, "fonts")
	}
	if len(why) > 0 {
		parts = append(parts, strings.Join(why, ", ")+" changed")
	}
	line := strings.Join(parts, "; ")
	// Panels that moved, per output, with the pages they moved on.
	var moved []string
	for _, o := range cur.Outputs {
		n, pages := 0, map[int]bool{}
		for _, m := range r.Moves {
			if m.From != nil && m.To != nil && m.To.Output == o.Name && !(len(r.Terms) > 0 && onlyDataTerm(r, m.Term)) {
				n++
				pages[m.From.Page], pages[m.To.Page] = true, true
			}
		}
		if n > 0 {
			moved = append(moved, fmt.Sprintf("%s moved on %s %s", plural(n, "panel"), o.Name, pageList(pages)))
		}
	}
	if len(moved) > 0 {
		if line != "" {
			line += ", so "
		}
		line += strings.Join(moved, " and ")
	}
	if line == "" {
		line = "no term's data changed"
	}
	resend := map[string]map[int]bool{}
	for _, p := range r.PageReasons {
		if resend[p.Output] == nil {
			resend[p.Output] = map[int]bool{}
		}
		resend[p.Output][p.Page] = true
	}
	var rs []string
	for _, o := range cur.Outputs {
		if len(resend[o.Name]) > 0 {
			rs = append(rs, o.Name+" "+pageList(resend[o.Name]))
		}
	}
	if len(rs) == 0 {
		return line + "; no page to resend"
	}
	return line + "; pages to resend: " + strings.Join(rs, ", ")
}

// onlyDataTerm reports whether term is one whose own data changed: its
// move is the cause, not a reflow, so it is not counted among the panels
// it pushed.
func onlyDataTerm(r *ChangeReport, term string) bool {
	for _, t := range r.Terms {
		if t.Term == term {
			return true
		}
	}
	return false
}

func possessive(n int) string {
	if n == 1 {
		return "1 term's"
	}
	return strconv.Itoa(n) + " terms'"
}

func peakOf(m *Manifest, term string) int {
	i := sort.Search(len(m.Terms), func(i int) bool { return m.Terms[i].Term >= term })
	if i < len(m.Terms) && m.Terms[i].Term == term {
		return m.Terms[i].Peak
	}
	return 0
}

// pageList writes "p. 2" or "pp. 2, 5".
func pageList(pages map[int]bool) string {
	var ns []int
	for p := range pages {
		ns = append(ns, p)
	}
	sort.Ints(ns)
	ss := make([]string, len(ns))
	for i, n := range ns {
		ss[i] = strconv.Itoa(n)
	}
	if len(ns) == 1 {
		return "p. " + ss[0]
	}
	return "pp. " + strings.Join(ss, ", ")
}
