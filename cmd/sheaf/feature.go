package main

import (
	"fmt"
	"time"

	"sheaf/layout"
	"sheaf/layout/bank"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/page"
	"sheaf/render/pdf"
	"sheaf/specs"
)

// scaleFor builds the era palette the spec asks for over the data's span.
func scaleFor(s *specs.Spec, span specs.Span) (palette.Scale, error) {
	from, to := float64(span.From), float64(span.To)
	var bounds []float64
	if len(s.Palette.Eras) > 0 {
		bounds = append(bounds, from)
		for _, e := range s.Palette.Eras {
			if float64(e) <= from || float64(e) >= to {
				return palette.Scale{}, fmt.Errorf("%s: palette.eras: boundary %d must lie inside the span %d–%d", s.Where("palette.eras"), e, span.From, span.To)
			}
			bounds = append(bounds, float64(e))
		}
		bounds = append(bounds, to)
	}
	anchors := palette.DefaultAnchors(from, to)
	name := palette.DefaultName
	if len(s.Palette.Anchors) > 0 {
		name = "custom"
		anchors = anchors[:0:0]
		for _, a := range s.Palette.Anchors {
			anchors = append(anchors, palette.Anchor{Year: a.Year, Color: page.ColorOf(a.Color)})
		}
	}
	sc, err := palette.NewScale(name, anchors, bounds)
	if err != nil {
		return palette.Scale{}, fmt.Errorf("%s: %v", s.Where("palette"), err)
	}
	return sc, nil
}

// groupsOf turns the data's groups into the layout's.
func groupsOf(j *job) []layout.Group {
	var gs []layout.Group
	for _, g := range j.data.Groups {
		gs = append(gs, layout.Group{Heading: g.Heading, Count: g.Count})
	}
	return gs
}

// prepared is one output ready to draw.
type prepared struct {
	out   *specs.Output
	fonts *fonts.Set
	plan  *layout.Plan
	feat  *page.Feature
}

// prepare loads fonts, solves the layout and builds the palette for an
// output. Its errors are bad input (exit 2).
func prepare(j *job, out *specs.Output) (*prepared, error) {
	fs, err := fonts.Load(j.spec, out)
	if err != nil {
		return nil, err
	}
	plan, err := bank.Solve(j.spec, out, fs, groupsOf(j), j.data) // layout.Solve, banking the aspect when asked
	if err != nil {
		return nil, err
	}
	sc, err := scaleFor(j.spec, j.data.Span)
	if err != nil {
		return nil, err
	}
	return &prepared{out: out, fonts: fs, plan: plan,
		feat: page.NewFeature(j.spec, out, plan, j.data, sc, fs)}, nil
}

// fallbackDate stands in when neither SOURCE_DATE_EPOCH nor the spec's
// date is set: a fixed day, so files never depend on the clock.
var fallbackDate = time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)

// documentDate is the date written into file metadata:
// SOURCE_DATE_EPOCH first, then the spec's date, then fallbackDate.
func documentDate(s *specs.Spec) (time.Time, error) {
	d := fallbackDate
	if s.Date != "" {
		t, err := time.Parse("2006-01-02", s.Date)
		if err != nil {
			return time.Time{}, fmt.Errorf("%s: date %q: %v", s.Where("date"), s.Date, err)
		}
		d = t
	}
	return pdf.DateFromEnv(d)
}
