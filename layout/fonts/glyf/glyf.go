// Package glyf reads the parts of TrueType glyph records (the OpenType
// 'glyf' table) that sheaf needs: which glyphs a composite glyph is made
// of. The font loader uses it to refuse a damaged table, and the PDF
// writer to close a subset over its glyphs' components, so both walk the
// records the same way.
package glyf

import (
	"encoding/binary"
	"fmt"
)

// Composite record flags (OpenType glyf table, "Composite glyph
// description").
const (
	argsAreWords   = 0x0001
	haveScale      = 0x0008
	moreComponents = 0x0020
	haveXYScale    = 0x0040
	haveTwoByTwo   = 0x0080
)

// Components returns the glyph IDs a glyph record is composed of: nil for
// an empty or simple glyph. A record cut short, or a component at or past
// numGlyphs, is an error.
func Components(g []byte, numGlyphs int) ([]uint16, error) {
	if len(g) < 10 || int16(binary.BigEndian.Uint16(g)) >= 0 {
		return nil, nil // empty or simple
	}
	var comps []uint16
	for p := 10; ; {
		if p+4 > len(g) {
			return nil, fmt.Errorf("a truncated composite glyph record")
		}
		flags := binary.BigEndian.Uint16(g[p:])
		comp := binary.BigEndian.Uint16(g[p+2:])
		if int(comp) >= numGlyphs {
			return nil, fmt.Errorf("a component refers to glyph %d, beyond the font's %d glyphs", comp, numGlyphs)
		}
		comps = append(comps, comp)
		p += 4
		if flags&argsAreWords != 0 {
			p += 4
		} else {
			p += 2
		}
		switch {
		case flags&haveScale != 0:
			p += 2
		case flags&haveXYScale != 0:
			p += 4
		case flags&haveTwoByTwo != 0:
			p += 8
		}
		if flags&moreComponents == 0 {
			return comps, nil
		}
	}
}
