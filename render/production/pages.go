package production

import (
	"reflect"
	"sync"

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
//
// The setup and the layout are hashed field by field (hasher.value), and
// a panel's term and data by the term's hash (termSums, by series index:
// its counts and plotted values), which the build takes once anyway.
func pageInputs(j *feature.Job, p *feature.Output, i int, setup pdf.PageSetup, specSum, fontSum string, termSums []string) string {
	h := newHasher("sheaf page v2")
	h.str(Version)
	h.str(specSum)
	h.str(p.Spec.Name)
	h.int(i)
	h.int(len(p.Plan.Pages))
	h.value(reflect.ValueOf(&setup).Elem())
	pg := &p.Plan.Pages[i]
	h.value(reflect.ValueOf(pg).Elem())
	d := j.Data
	labels := p.Feature.Labels()
	for _, pn := range pg.Panels {
		sr := &d.Series[pn.Item]
		h.str(termSums[pn.Item])
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

// fontsSumOf is one hash over the SHA-256 of each of an output's fonts.
func fontsSumOf(sums [3]string) string {
	h := newHasher("sheaf fonts v1")
	for _, s := range sums {
		h.str(s)
	}
	return h.sum()
}

// fontStyles are the styles a Set holds, in the order they are hashed.
var fontStyles = [3]fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic}

// fontSHA256s hashes the bytes of each of a Set's fonts.
func fontSHA256s(fs *fonts.Set) [3]string {
	var out [3]string
	for k, st := range fontStyles {
		out[k] = sumBytes(fs.Bytes(st))
	}
	return out
}

// fontSums remembers each Set's font hashes for one build: the pages',
// the screen outputs', the inserts' inputs and the manifest all want
// them, and each font is a few hundred KB of SHA-256.
type fontSums struct {
	mu   sync.Mutex
	sets map[*fonts.Set][3]string
}

func (c *fontSums) of(fs *fonts.Set) [3]string {
	c.mu.Lock()
	defer c.mu.Unlock()
	if s, ok := c.sets[fs]; ok {
		return s
	}
	if c.sets == nil {
		c.sets = map[*fonts.Set][3]string{}
	}
	s := fontSHA256s(fs)
	c.sets[fs] = s
	return s
}

// sum is one hash over the SHA-256 of each of fs's fonts (fontsSumOf).
func (c *fontSums) sum(fs *fonts.Set) string { return fontsSumOf(c.of(fs)) }

// hashes lists the fonts of an output with the hash of their bytes
// (fontHashesOf).
func (c *fontSums) hashes(output string, fs *fonts.Set) []FontHash {
	return fontHashesOf(output, fs, c.of(fs))
}

// pageTerms lists the terms on page i, in panel order.
func pageTerms(j *feature.Job, p *feature.Output, i int) []string {
	terms := []string{}
	for _, pn := range p.Plan.Pages[i].Panels {
		terms = append(terms, j.Data.Series[pn.Item].Term)
	}
	return terms
}
