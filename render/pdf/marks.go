package pdf

import (
	"fmt"
	"sync"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/tdewolff/font"
)

// MarkOptions are the printer's marks of a page. No standard fixes crop
// mark geometry: sheaf's rule is layout.CropMarks, which the layout
// reports in its plan and callers pass here as Offset and Length. The
// defaults are the same rule, for callers with no plan (weight: common
// practice, print-facts.md, 0.25–0.5 pt). Zero fields take the defaults.
type MarkOptions struct {
	Weight float64 // line weight in pt; default 0.25
	// Offset is how far outside the trim a mark starts, pt, along the line
	// of a trim edge; it must reach past the BleedBox. Default: 1 mm past
	// the BleedBox, at least 3 mm from the trim.
	Offset float64
	Length float64 // mark length in pt; default 6 mm
	// SlugOnly draws the slug but no crop marks.
	SlugOnly bool
	// SlugSize is the slug's font size in pt; default 6.
	SlugSize float64
	// SlugBlack prints the slug in black instead of registration colour
	// (registration puts the text on every plate).
	SlugBlack bool
}

// Defaults of MarkOptions, in points.
const (
	DefaultMarkWeight = 0.25
	DefaultMarkGap    = 1 * 72 / 25.4 // past the BleedBox
	DefaultMarkMin    = 3 * 72 / 25.4 // from the trim, at least
	DefaultMarkLength = 6 * 72 / 25.4
	DefaultSlugSize   = 6.0
)

// bleedWidth is the widest distance between TrimBox and BleedBox.
func (b PageBoxes) bleedWidth() float64 {
	return max(b.Trim.X0-b.Bleed.X0, b.Trim.Y0-b.Bleed.Y0, b.Bleed.X1-b.Trim.X1, b.Bleed.Y1-b.Trim.Y1, 0)
}

func (o MarkOptions) withDefaults(b PageBoxes) MarkOptions {
	if o.Weight == 0 {
		o.Weight = DefaultMarkWeight
	}
	if o.Offset == 0 {
		o.Offset = max(b.bleedWidth()+DefaultMarkGap, DefaultMarkMin)
	}
	if o.Length == 0 {
		o.Length = DefaultMarkLength
	}
	if o.SlugSize == 0 {
		o.SlugSize = DefaultSlugSize
	}
	return o
}

// validate checks that the marks fit between the BleedBox and the media
// edge, so they never print into the bleed (print-facts.md, "Crop marks").
func (o MarkOptions) validate(b PageBoxes, slug string) error {
	o = o.withDefaults(b)
	if !finite(o.Weight, o.Offset, o.Length, o.SlugSize) || o.Weight < 0 || o.Offset < 0 || o.Length < 0 || o.SlugSize < 0 {
		return fmt.Errorf("mark options %+v must be finite and not negative", o)
	}
	// From the trim: the bleed the marks must clear, the media they must
	// stay inside.
	sides := []struct {
		name         string
		bleed, media float64
	}{
		{"left", b.Trim.X0 - b.Bleed.X0, b.Trim.X0 - b.Media.X0},
		{"bottom", b.Trim.Y0 - b.Bleed.Y0, b.Trim.Y0 - b.Media.Y0},
		{"right", b.Bleed.X1 - b.Trim.X1, b.Media.X1 - b.Trim.X1},
		{"top", b.Bleed.Y1 - b.Trim.Y1, b.Media.Y1 - b.Trim.Y1},
	}
	for _, s := range sides {
		if o.SlugOnly {
			break
		}
		if o.Offset < s.bleed-1e-9 {
			return fmt.Errorf("crop marks starting %.3f pt outside the trim would print into the %.3f pt bleed on the %s", o.Offset, s.bleed, s.name)
		}
		if need := o.Offset + o.Length; s.media < need-1e-9 {
			return fmt.Errorf("crop marks need %.3f pt between TrimBox and MediaBox on the %s, there are %.3f pt", need, s.name, s.media)
		}
	}
	if slug != "" {
		f := slugFont()
		// descender room: a quarter of the size is enough for DejaVu Sans
		// Condensed (hhea descender 483 of 2048 units: 0.236 em)
		if b.Trim.Y0-o.Offset-o.SlugSize*1.25 < b.Media.Y0 {
			return fmt.Errorf("slug of %g pt does not fit below the BleedBox (%.3f pt there)", o.SlugSize, b.Bleed.Y0-b.Media.Y0)
		}
		// The slug sits between the vertical crop marks at the trim edges.
		room := b.Trim.W() - 2*o.slugInset(b) - 2*o.Weight
		if w := runWidth(f, slug, o.SlugSize); w > room {
			return fmt.Errorf("slug %q is %.1f pt wide; only %.1f pt fit between the crop marks", slug, w, room)
		}
	}
	return nil
}

// slugInset is how far right of the trim's left edge the slug starts:
// as far as the marks start beyond the BleedBox.
func (o MarkOptions) slugInset(b PageBoxes) float64 {
	return max(o.Offset-(b.Trim.Y0-b.Bleed.Y0), 0)
}

// slugFont is DejaVu Sans Condensed (github.com/go-fonts/dejavu), the
// default face, parsed once; it is immutable afterwards.
var slugFont = sync.OnceValue(func() *fontData {
	s, err := font.ParseFont(dejavusanscondensed.TTF, 0)
	if err != nil {
		panic("pdf: the built-in DejaVu Sans Condensed font does not parse: " + err.Error())
	}
	d, err := newFontData(s)
	if err != nil || !d.embeddable {
		panic("pdf: the built-in DejaVu Sans Condensed font is not embeddable")
	}
	return d
})

// drawMarks draws crop marks at the four trim corners in registration
// colour and the slug below the bleed.
func (e *encoder) drawMarks(b PageBoxes, o MarkOptions, slug string) error {
	o = o.withDefaults(b)
	e.save()
	e.setAlpha(Alpha{Fill: 1, Stroke: 1})
	e.setRegistration()
	e.buf = appendNum(e.buf, o.Weight)
	e.buf = append(e.buf, " w 0 J 0 j [] 0 d\n"...)
	line := func(x0, y0, x1, y1 float64) {
		e.buf = appendNums(e.buf, x0, y0)
		e.buf = append(e.buf, " m "...)
		e.buf = appendNums(e.buf, x1, y1)
		e.buf = append(e.buf, " l S\n"...)
	}
	t := b.Trim
	near, far := o.Offset, o.Offset+o.Length
	if !o.SlugOnly {
		for _, x := range []float64{t.X0, t.X1} {
			line(x, t.Y0-near, x, t.Y0-far) // below
			line(x, t.Y1+near, x, t.Y1+far) // above
		}
		for _, y := range []float64{t.Y0, t.Y1} {
			line(t.X0-near, y, t.X0-far, y) // left
			line(t.X1+near, y, t.X1+far, y) // right
		}
	}
	if slug != "" {
		if o.SlugBlack {
			e.setColor([3]float64{0, 0, 0}, false)
		}
		e.showRun(slugFont(), slug, o.SlugSize, t.X0+o.slugInset(b)+o.Weight, t.Y0-o.Offset-o.SlugSize)
	}
	e.restore()
	return nil
}
