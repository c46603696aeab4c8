package layout

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// a5Print is an A5 page (148 × 210 mm, ISO 216) with sheaf's default
// print margins (top 14, bottom 13, inside 16, outside 13 mm): a live
// area 119 mm wide and 183 mm tall.
func a5Print() specs.Output {
	o := a4Print()
	o.Trim = specs.Size{W: mmL(148), H: mmL(210)}
	o.Margins = specs.Margins{Top: mmL(14), Bottom: mmL(13), Inside: mmL(16), Outside: mmL(13)}
	return o
}

// TestRemediesFound checks the remedies that are searched for rather
// than computed: fewer columns (with the nearest panel aspect whose row
// fits, when the wider panels grow too tall) and smaller type for text
// bands that leave no room for a row. The rules are this project's own;
// the arithmetic in the comments is by hand. Every remedy offered must
// solve, and where a remedy is a nearest value, the next step towards
// the request must not.
func TestRemediesFound(t *testing.T) {
	long := func(s string, n int) string { return strings.TrimSpace(strings.Repeat(s+" ", n)) }
	cases := []struct {
		name  string
		spec  func(*specs.Spec)
		out   func(*specs.Output)
		want  []string // in the message
		first string   // the first remedy's text; "" for none
		// closer is the first remedy moved one step towards the request:
		// it must fail. Empty when the remedy is not a nearest value.
		closer []Setting
	}{
		{"2 columns above an 80 mm floor: 1 column", nil, func(o *specs.Output) {
			// 2 × 80 + 4 = 164 mm > 119 mm; 1 × 80 mm fits. A 119 mm panel
			// at aspect 1.4 has an 85 mm plot, which the page holds.
			o.Columns, o.FloorWidth = 2, mmL(80)
		}, []string{"2 columns of panels at least 80 mm wide", "need 164 mm; the live area is 119 mm", "— use 1 column"},
			"1 column", nil},
		{"1 column too tall at its aspect: 1 column and a flatter aspect", nil, func(o *specs.Output) {
			// At aspect 0.7 a 119 mm panel has a 170 mm plot: more than
			// the page's grid, so 1 column alone does not work.
			o.Columns, o.FloorWidth, o.PanelAspect = 2, mmL(80), 0.7
		}, []string{"need 164 mm; the live area is 119 mm"},
			"1 column and a panel aspect of 0.87", []Setting{{"columns", 1}, {"panel.aspect", 0.86}}},
		{"long dek: smaller title and dek", func(s *specs.Spec) {
			s.Dek = long("A long dek about invented words that runs on and on.", 60)
		}, func(o *specs.Output) { o.Columns = 2 },
			[]string{"the header, key band and footer of the first page need", "the live area is 183 mm tall", "(the title and dek take", "shorten them)"},
			// 18 and 9 pt scaled by 14.5/18 give 14.5 and 7.25, rounded
			// down to 7 pt; one step larger, 15 and 7.5 pt, does not fit.
			"a 14.5 pt title and a 7 pt dek", []Setting{{"type.title", 15}, {"type.dek", 7.5}}},
		{"long dek leaves too little room for a row: smaller type first", func(s *specs.Spec) {
			s.Dek = long("A long dek about invented words that runs on and on.", 45)
		}, func(o *specs.Output) { o.Columns = 2 },
			// The bands take more than half the 183 mm live area, so the
			// message names the tallest; the panel remedies still follow.
			[]string{"a row of panels needs 46.6 mm", "the first page has 31.9 mm left", "(the title and dek take 127 mm: shorten them)", " or a panel aspect of "},
			"a 16.5 pt title and an 8 pt dek", []Setting{{"type.title", 17}, {"type.dek", 8.5}}},
		{"long title: the running head of later pages", func(s *specs.Spec) {
			s.Title = long("Title words", 150)
		}, func(o *specs.Output) {
			// The title fits the first page at 7 pt, but the running head
			// repeats it at the 14 pt heading size.
			o.Columns, o.Type.Title, o.Type.Heading = 2, 7, 14
		}, []string{"the later page need", "(the running head takes", "shorten it)"},
			"10.5 pt headings", []Setting{{"type.heading", 11}}},
		{"dek too long for any legible size: no type remedy", func(s *specs.Spec) {
			s.Dek = long("A long dek about invented words that runs on and on.", 600)
		}, func(o *specs.Output) { o.Columns = 2 },
			[]string{"(the title and dek take", "shorten them)"}, "", nil},
		{"screen pages: sizes in px", func(s *specs.Spec) {
			s.Dek = long("A long dek about invented words that runs on and on.", 80)
		}, func(o *specs.Output) {
			*o = webScroll()
			o.Flow, o.Trim.H = specs.FlowPages, pxL(700)
		}, []string{"(the title and dek take", "px"}, "", nil},
	}
	fs := fontSet(t)
	groups := []Group{{"", 40}}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			spec := testSpec()
			if tc.spec != nil {
				tc.spec(spec)
			}
			mk := func() specs.Output {
				o := a5Print()
				tc.out(&o)
				return o
			}
			out := mk()
			_, err := Solve(spec, &out, fs, groups)
			var inf *InfeasibleError
			require.ErrorAs(t, err, &inf)
			msg := err.Error()
			t.Log(msg)
			for _, w := range tc.want {
				assert.Contains(t, msg, w, "the infeasibility message")
			}
			switch {
			case tc.first == "" && tc.name == "screen pages: sizes in px":
				if assert.NotEmpty(t, inf.Remedies, "remedies offered") {
					assert.True(t, strings.HasSuffix(inf.Remedies[0].Text, " px dek"), "remedies %v, want px type sizes first", inf.Remedies)
				}
			case tc.first == "":
				for _, r := range inf.Remedies {
					assert.NotContains(t, r.Text, " pt ", "type remedy offered, though 5 pt does not fit")
				}
			default:
				if assert.NotEmpty(t, inf.Remedies, "remedies offered") {
					assert.Equal(t, tc.first, inf.Remedies[0].Text, "the first remedy of %v", inf.Remedies)
				}
			}
			for _, r := range inf.Remedies {
				fixed := mk()
				require.NoError(t, r.Apply(&fixed), "applying remedy %q", r.Text)
				_, err := Solve(spec, &fixed, fs, groups)
				assert.NoError(t, err, "remedy %q does not work", r.Text)
			}
			if tc.closer != nil {
				closer := mk()
				require.NoError(t, (Remedy{Set: tc.closer}).Apply(&closer), "applying %v", tc.closer)
				_, err := Solve(spec, &closer, fs, groups)
				assert.Error(t, err, "%v also works: the remedy is not the nearest", tc.closer)
			}
		})
	}
}

// TestWithArticle: "an" before a number read with a vowel sound (eight,
// eleven, eighteen, eighty…), "a" otherwise (English usage, common
// practice).
func TestWithArticle(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"6 mm", "a 6 mm"}, {"8 mm", "an 8 mm"}, {"11.5 pt", "an 11.5 pt"},
		{"18 px", "an 18 px"}, {"80 px", "an 80 px"}, {"1.8 mm", "a 1.8 mm"},
		{"110 pt", "a 110 pt"}, {"0.5 mm", "a 0.5 mm"}, {"11000 px", "an 11000 px"},
	} {
		assert.Equal(t, tc.want, withArticle(tc.in), "withArticle(%q)", tc.in)
	}
}

// BenchmarkInfeasibleRemedies measures the error path of a page whose dek
// leaves no room: the solve, the search for smaller type and the check of
// every remedy offered.
func BenchmarkInfeasibleRemedies(b *testing.B) {
	spec := testSpec()
	spec.Dek = strings.TrimSpace(strings.Repeat("A long dek about invented words that runs on and on. ", 60))
	fs := fontSet(b)
	for b.Loop() {
		o := a5Print()
		o.Columns = 2
		_, err := Solve(spec, &o, fs, []Group{{"", 400}})
		require.Error(b, err, "a dek with no room solved")
	}
}
