package specs

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Unit sizes in points. 1 in = 25.4 mm exactly (international yard and
// pound agreement, 1959); 1 pt = 1/72 in (ISO 32000-1 §8.3.2.3); 1 pc =
// 12 pt; 1 px = 1/96 in (CSS Values and Units Level 3, absolute lengths).
const (
	PtPerIn = 72.0
	PtPerMm = 72.0 / 25.4
	PtPerCm = 720.0 / 25.4
	PtPerPc = 12.0
	PtPerPx = 72.0 / 96.0

	// The other way round: canvas draws in millimetres, SVG in px.
	MmPerPt = 25.4 / 72.0
	PxPerPt = 96.0 / 72.0
)

var units = []struct {
	name string
	pt   float64
}{
	{"mm", PtPerMm}, {"cm", PtPerCm}, {"in", PtPerIn}, {"pt", 1}, {"pc", PtPerPc}, {"px", PtPerPx},
}

// ParseLength reads a length such as "3mm", "0.25 pt", "1.5in" or "96px".
// A bare number is an error: a length without a unit is ambiguous between
// print and screen.
func ParseLength(s string) (Length, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, fmt.Errorf("empty length; write a number with a unit, like 3mm")
	}
	i := len(t)
	for i > 0 && (t[i-1] >= 'a' && t[i-1] <= 'z' || t[i-1] >= 'A' && t[i-1] <= 'Z') {
		i--
	}
	num, unit := strings.TrimSpace(t[:i]), strings.ToLower(t[i:])
	if unit == "" {
		if _, err := strconv.ParseFloat(num, 64); err == nil {
			return 0, &UnitlessError{Text: s, Num: num}
		}
		return 0, fmt.Errorf("%q is not a length; write a number with a unit (mm, cm, in, pt, pc, px), like 3mm", s)
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q is not a length; write a number with a unit (mm, cm, in, pt, pc, px), like 3mm", s)
	}
	for _, u := range units {
		if u.name == unit {
			return Length(v * u.pt), nil
		}
	}
	return 0, fmt.Errorf("unknown unit %q in %q; use mm, cm, in, pt, pc or px", unit, s)
}

// UnitlessError is a length written without a unit. Its message suggests
// print units; Screen gives the one for a screen output (px).
type UnitlessError struct {
	Text, Num string
	Screen    bool
}

func (e *UnitlessError) Error() string {
	if e.Screen {
		return fmt.Sprintf("%q has no unit; write it with one, like %spx (CSS px, 96 to the inch)", e.Text, e.Num)
	}
	return fmt.Sprintf("%q has no unit; write it with one, like %smm or %spt", e.Text, e.Num, e.Num)
}

// forKind returns err with a unitless length's suggestion fitted to the
// output kind.
func forKind(err error, screen bool) error {
	var ue *UnitlessError
	if screen && errors.As(err, &ue) {
		c := *ue
		c.Screen = true
		return &c
	}
	return err
}

// Named trim sizes. ISO 216 sizes in mm; US sizes in inches (ANSI).
var namedSizes = map[string]Size{
	"a3":      {297 * PtPerMm, 420 * PtPerMm},
	"a4":      {210 * PtPerMm, 297 * PtPerMm},
	"a5":      {148 * PtPerMm, 210 * PtPerMm},
	"letter":  {8.5 * PtPerIn, 11 * PtPerIn},
	"tabloid": {11 * PtPerIn, 17 * PtPerIn},
}

// ParseSize reads a trim size: a name (A3, A4, A5, Letter, Tabloid,
// optionally followed by "landscape") or "W x H" with units, such as
// "230mm x 300mm". When heightOptional is set, a single length is a width
// with height 0 (a screen output that grows downwards).
func ParseSize(s string, heightOptional bool) (Size, error) {
	t := strings.ToLower(strings.TrimSpace(s))
	fields := strings.Fields(t)
	if len(fields) >= 1 {
		if sz, ok := namedSizes[fields[0]]; ok {
			switch {
			case len(fields) == 1 || len(fields) == 2 && fields[1] == "portrait":
				return sz, nil
			case len(fields) == 2 && fields[1] == "landscape":
				return Size{sz.H, sz.W}, nil
			}
			return Size{}, fmt.Errorf("%q: after a size name only \"portrait\" or \"landscape\" may follow", s)
		}
	}
	var parts []string
	switch {
	case strings.Contains(t, "×"):
		parts = strings.Split(t, "×")
	case len(fields) == 3 && fields[1] == "x":
		parts = []string{fields[0], fields[2]}
	default:
		parts = []string{t}
	}
	if len(parts) == 1 && heightOptional {
		w, err := ParseLength(parts[0])
		if err != nil {
			return Size{}, forKind(err, true)
		}
		return Size{W: w}, nil
	}
	if len(parts) != 2 {
		return Size{}, fmt.Errorf("%q is not a size; use A3, A4, A5, Letter, Tabloid or a width and height like \"230mm x 300mm\"", s)
	}
	w, err := ParseLength(parts[0])
	if err != nil {
		return Size{}, err
	}
	h, err := ParseLength(parts[1])
	if err != nil {
		return Size{}, err
	}
	return Size{w, h}, nil
}
