package production

import (
	"encoding/json"

	"sheaf/layout/fonts"
	"sheaf/render/feature"
	"sheaf/render/pdf"
)

// pageInputs is the hash of everything that decides how page i of an
// output is drawn. Equal hashes mean equal pages, so the build reuses the
// page encoded last time. What goes in, and why it is enough:
//
//   - the sheaf version (the drawing code);
//   - the SHA-256 of the spec file (every setting: type, margins, palette,
//     title, date — any edit, even a comment, redraws every page, the
//     simple and honest choice);
//   - the output name, the page index and the page count;
//   - the page setup (boxes, marks, slug line, which carries the date);
//   - the page's layout as computed (text lines, headings, panel boxes),
//     which also covers group sizes decided by the data;
//   - for every panel on it: the term, its plotted values, peak, peak
//     year, y-range top and how its label is set;
//   - the span, the years, the unit and the shared y-range top (the key
//     prints it);
//   - the palette as gradient stops;
//   - the SHA-256 of each font's bytes;
//   - the printing condition's fingerprint (profile bytes and settings),
//     since the profile file can change with the spec unchanged.
func pageInputs(j *feature.Job, p *feature.Output, i int, setup pdf.PageSetup, specSum, fontSum string) string {
	h := newHasher("sheaf page v1")
	h.str(Version)
	h.str(specSum)
	h.str(p.Spec.Name)
	h.int(i)
	h.int(len(p.Plan.Pages))
	if s, err := json.Marshal(setup); err == nil {
		h.bytes(s)
	}
	pg := &p.Plan.Pages[i]
	if s, err := json.Marshal(pg); err == nil {
		h.bytes(s)
	}
	d := j.Data
	labels := p.Feature.Labels()
	for _, pn := range pg.Panels {
		sr := &d.Series[pn.Item]
		h.str(sr.Term)
		h.floats(sr.Values)
		h.float(sr.Peak)
		h.int(sr.PeakYear)
		h.float(sr.YMax)
		if pn.Item < len(labels) {
			l := labels[pn.Item]
			h.str(l.DrawnText())
			h.float(l.Size)
		}
	}
	h.int(d.Span.From)
	h.int(d.Span.To)
	h.floats(d.Years)
	h.str(d.Unit)
	h.float(d.YMax)
	h.int(d.Rolling)     // the window the values were pooled over (the key's note says it)
	h.float(p.Spec.Band) // the band's level: the tint and the key's note
	for _, s := range p.Feature.Stops {
		r := s.Color
		h.floats([]float64{s.Year, r.R, r.G, r.B})
	}
	h.str(fontSum)
	if p.Press != nil {
		h.str("press " + p.Press.Fingerprint())
	}
	return h.sum()
}

// fontsSum is one hash over the SHA-256 of each of an output's fonts.
func fontsSum(fs *fonts.Set) string {
	h := newHasher("sheaf fonts v1")
	for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
		h.str(sumBytes(fs.Bytes(st)))
	}
	return h.sum()
}

// pageTerms lists the terms on page i, in panel order.
func pageTerms(j *feature.Job, p *feature.Output, i int) []string {
	terms := []string{}
	for _, pn := range p.Plan.Pages[i].Panels {
		terms = append(terms, j.Data.Series[pn.Item].Term)
	}
	return terms
}
