package layout

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"sheaf/specs"
)

// InfeasibleError says that an output's request cannot be laid out: which
// constraint failed, by how much, where the spec asked for it, and what
// nearby changes would work. Every Remedy it offers has been checked by
// solving again with the change applied.
type InfeasibleError struct {
	Pos        specs.Pos
	Output     string
	Constraint string  // short name: "panel width", "plot height", "page height", "slug", "live area"
	Need, Have float64 // points
	Message    string  // the failed constraint with its numbers, in the output's units
	Remedies   []Remedy
}

func (e *InfeasibleError) Error() string {
	msg := fmt.Sprintf("%s: output %q: %s", e.Pos, e.Output, e.Message)
	if s := e.Suggest(); s != "" {
		msg += " — " + s
	}
	return msg
}

// Suggest joins the remedies into one phrase, such as
// "use 5 columns or a 4 mm gutter".
func (e *InfeasibleError) Suggest() string {
	if len(e.Remedies) == 0 {
		return ""
	}
	parts := make([]string, len(e.Remedies))
	for i, r := range e.Remedies {
		parts[i] = r.Text
	}
	return "use " + strings.Join(parts, " or ")
}

// A Remedy is one change to an output that makes it feasible.
type Remedy struct {
	Text string    `json:"text"` // e.g. "5 columns", "a 4 mm gutter", "a 12 pt title and a 6 pt dek"
	Set  []Setting `json:"set"`
}

// Setting is one value of a Remedy. Key names the output field as the spec
// writes it; lengths and type sizes are in points.
type Setting struct {
	Key   string  `json:"key"`
	Value float64 `json:"value"`
}

// Apply makes the remedy's changes to out.
func (r Remedy) Apply(out *specs.Output) error {
	for _, s := range r.Set {
		l := specs.Length(s.Value)
		switch s.Key {
		case "columns":
			out.Columns = int(s.Value)
		case "gutter":
			out.Gutter = l
		case "panel.height":
			out.PanelHeight = l
		case "panel.aspect":
			out.PanelAspect = s.Value
		case "min-panel-width":
			out.MinPanelWidth = l
		case "slug":
			out.Slug = l
		case "margins.top":
			out.Margins.Top = l
		case "margins.bottom":
			out.Margins.Bottom = l
		case "margins.inside":
			out.Margins.Inside = l
		case "margins.outside":
			out.Margins.Outside = l
		case "type.title":
			out.Type.Title = l
		case "type.dek":
			out.Type.Dek = l
		case "type.notes":
			out.Type.Notes = l
		case "type.heading":
			out.Type.Heading = l
		default:
			return fmt.Errorf("layout: remedy sets unknown key %q", s.Key)
		}
	}
	return nil
}

// units formats lengths the way the output's medium measures them:
// millimetres for print, CSS pixels for screens.
type units struct{ screen bool }

func (u units) step() float64 { // one display step, in points
	if u.screen {
		return 0.75 // 1 px (CSS Values and Units Level 3: 1 px = 0.75 pt)
	}
	return 0.1 * 72 / 25.4 // 0.1 mm
}

func (u units) len(pt float64) string {
	// A length from an absurd value (aspect: 1e-300) is written short:
	// three significant digits and an exponent, not 300 digits.
	if v := pt * 25.4 / 72; math.Abs(v) >= 1e9 || math.IsInf(v, 0) {
		if u.screen {
			v = pt / 0.75
		}
		unit := " mm"
		if u.screen {
			unit = " px"
		}
		return strconv.FormatFloat(v, 'e', 2, 64) + unit
	}
	if u.screen {
		return trimNum(pt/0.75, 0) + " px"
	}
	return trimNum(pt*25.4/72, 1) + " mm"
}

// down and up round a length in points to the display step, so a value
// shown in a suggestion is the value that was checked.
func (u units) down(pt float64) float64 {
	s := u.step()
	return math.Floor(pt/s+1e-9) * s
}

func (u units) up(pt float64) float64 {
	s := u.step()
	return math.Ceil(pt/s-1e-9) * s
}

func trimNum(v float64, prec int) string {
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

// Warning is a choice that works but can hurt the job, such as a missing
// bleed or hairline rules.
type Warning struct {
	Pos     specs.Pos `json:"-"`
	Key     string    `json:"key"` // the output's spec key it is about, e.g. "type.label", "line", "bleed"
	Where   string    `json:"where"`
	Output  string    `json:"output"`
	Message string    `json:"message"`
}

func (w Warning) String() string {
	return fmt.Sprintf("%s: output %q: warning: %s", w.Pos, w.Output, w.Message)
}
