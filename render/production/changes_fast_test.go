package production

import (
	"fmt"
	"math/rand/v2"
	"sort"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
)

// The change report before it looked up only the terms it lists and
// mapped slots only for outputs whose panels moved: these are its
// functions as they were, the reference the report is held to.

func placesBefore(m *Manifest) map[string][]string {
	out := map[string][]string{}
	for _, o := range m.Outputs {
		for _, p := range o.Pages {
			for _, t := range p.Terms {
				out[t] = append(out[t], o.Name+" p. "+strconv.Itoa(p.Page))
			}
		}
	}
	for _, in := range m.Inserts {
		for _, t := range in.Terms {
			out[t.Term] = append(out[t.Term], "insert "+in.Name)
		}
	}
	return out
}

func movesBefore(prev, cur *Manifest) []PanelMove {
	slotsOf := func(m *Manifest) map[string]map[string]Slot {
		out := map[string]map[string]Slot{}
		for i := range m.Outputs {
			out[m.Outputs[i].Name] = slots(&m.Outputs[i])
		}
		return out
	}
	oldAt, newAt := slotsOf(prev), slotsOf(cur)
	all := []PanelMove{}
	for _, o := range cur.Outputs {
		if prev.Output(o.Name) == nil {
			continue
		}
		all = append(all, moves(oldAt[o.Name], newAt[o.Name])...)
	}
	return all
}

// randomManifest lays terms out over pages of two outputs, with an
// insert; rnd decides how many terms and pages.
func randomManifest(rnd *rand.Rand, terms []string) *Manifest {
	m := &Manifest{}
	for _, name := range []string{"print", "web"} {
		o := OutputEntry{Name: name, Kind: "print"}
		per, first := 1+rnd.IntN(5), 1+rnd.IntN(2) // a hand-edited manifest may number pages its own way
		for i := 0; i < len(terms); i += per {
			o.Pages = append(o.Pages, PageEntry{Page: len(o.Pages) + first, Terms: terms[i:min(i+per, len(terms))], Inputs: fmt.Sprint(rnd.IntN(3))})
		}
		m.Outputs = append(m.Outputs, o)
	}
	for _, t := range terms {
		m.Terms = append(m.Terms, TermHash{Term: t, SHA256: fmt.Sprint(rnd.IntN(2)), Peak: 1900 + rnd.IntN(3)})
	}
	sort.Slice(m.Terms, func(i, j int) bool { return m.Terms[i].Term < m.Terms[j].Term })
	if len(terms) > 0 {
		m.Inserts = []InsertEntry{{Name: "ins", Output: "print", Terms: []TermHash{{Term: terms[0], SHA256: fmt.Sprint(rnd.IntN(2))}}}}
	}
	return m
}

// TestChangeReportAsBefore: for random pairs of builds (terms added,
// removed, reordered, data changed, the same placement), the terms'
// places and the panel moves are what the report gave before.
func TestChangeReportAsBefore(t *testing.T) {
	rnd := rand.New(rand.NewPCG(7, 22))
	for k := range 300 {
		var a, b []string
		for i := range 3 + rnd.IntN(30) {
			term := fmt.Sprintf("t%02d", i)
			if rnd.IntN(8) > 0 {
				a = append(a, term)
			}
			if rnd.IntN(8) > 0 {
				b = append(b, term)
			}
		}
		if k%3 == 0 {
			b = append([]string(nil), a...) // the same terms: same places, or reordered
			if k%2 == 0 && len(b) > 1 {
				i, j := rnd.IntN(len(b)), rnd.IntN(len(b))
				b[i], b[j] = b[j], b[i]
			}
		}
		seed := rnd.Uint64()
		prev := randomManifest(rand.New(rand.NewPCG(seed, 1)), a)
		cur := randomManifest(rand.New(rand.NewPCG(seed, uint64(k%2+1))), b)
		r := compareManifests(prev, cur, nil)
		before, beforeOld := placesBefore(cur), placesBefore(prev)
		for _, tc := range r.Terms {
			want := before[tc.Term]
			if tc.Change == "removed" {
				want = beforeOld[tc.Term]
			}
			if want == nil {
				want = []string{}
			}
			assert.Equal(t, want, tc.Pages, "case %d: places of %s (%s)", k, tc.Term, tc.Change)
		}
		assert.Equal(t, movesBefore(prev, cur), r.Moves, "case %d: moves", k)
	}
}
