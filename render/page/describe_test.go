package page

import (
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/svg"
	"sheaf/specs"
	"sheaf/specs/series"
)

// TestDescribeGerman: a panel's description for assistive technology is
// set in the spec's language, smoothing and unit included, and reaches
// the panel's <desc> in SVG. The sentence is written out by hand from the
// German phrases (German quotation marks „…“: Duden, from memory); years
// are never grouped ("1868", not "1.868": CLDR leaves years to the
// calendar, not the number format).
func TestDescribeGerman(t *testing.T) {
	s, err := specs.Load(demoSpec)
	require.NoError(t, err)
	s.Language = specs.German
	d, err := series.Load(s) // the unit in the spec's language, as a build loads it
	require.NoError(t, err)
	s.DataGaps = d.Gaps
	f, err := PrepareForTest(s, d, s.Output("web"))
	require.NoError(t, err)
	pn := f.Plan.Pages[0].Panels[0]
	sr := &f.Data.Series[pn.Item]
	title, desc := f.Describe(pn.Item)
	assert.Equal(t, sr.Term, title)
	want := "Wie oft „" + sr.Term + "“ in jedem Jahr verwendet wurde, 1868–2025 (Anteil am eigenen Höchstwert, gleitender 5-Jahres-Anteil); am häufigsten im Jahr " +
		strconv.Itoa(sr.PeakYear) + "."
	assert.Equal(t, want, desc)

	doc, err := svg.New(f.Plan.Pages[0].Media.X1, f.Plan.Pages[0].Media.Y1, svg.Options{})
	require.NoError(t, err)
	require.NoError(t, f.DrawPanel(canvas.NewContext(doc), pn))
	var b strings.Builder
	_, err = doc.WriteTo(&b)
	require.NoError(t, err)
	assert.Contains(t, b.String(), "<desc>"+want+"</desc>", "the panel's group in SVG carries it")
}
