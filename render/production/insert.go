package production

import (
	"fmt"
	"image"
	"io"
	"path/filepath"
	"sort"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/render/draw"
	"sheaf/render/feature"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/render/svg"
	"sheaf/specs"
)

// buildInserts writes every insert into the stage's inserts/ folder: a
// PDF for an insert that borrows a print output, an SVG and PNGs at 1×
// and 2× for a screen one. An insert whose inputs hash is the last
// build's, with its files intact, is carried over instead of drawn. The
// inserts were laid out before any file was written (bad input writes
// nothing). It returns the files, sorted per insert.
func (b *build) buildInserts(preps []*feature.Insert) ([]string, error) {
	var files []string
	idir := filepath.Join(b.stage.dir, "inserts")
	b.progress.Begin("inserts", len(preps))
	for _, p := range preps {
		if err := b.ctx.Err(); err != nil {
			return nil, err
		}
		name := p.Spec.Name
		if b.only != "" && p.Output.Name != b.only {
			// --only OUTPUT draws the inserts that borrow OUTPUT; the others
			// keep the last build's files when they are intact, and are
			// left out until a build that makes them otherwise.
			files = append(files, b.keepInsert(p, idir)...)
			continue
		}
		entry := InsertEntry{Name: name, Output: p.Output.Name, Terms: insertTerms(p)}
		entry.Inputs = b.insertInputs(p, entry.Terms)
		b.inserts = append(b.inserts, entry)
		st := OutputStats{Output: p.Output.Name, Insert: name, Kind: "insert", Pages: 1}
		want := insertFiles(p, idir)
		terms := make([]string, len(entry.Terms))
		for i, t := range entry.Terms {
			terms[i] = t.Term
		}
		for _, f := range want {
			b.note(f, fileMeta{insert: name, terms: terms})
		}
		prev := b.prev.Insert(name)
		why := b.drawReason(prev != nil, prev != nil && prev.Output == entry.Output && prev.Inputs == entry.Inputs)
		if why == "" {
			old := b.prev.FilesOf("", name)
			if b.keepAll("", want, old) {
				st.Reused, st.Whole = 1, "reused (inputs unchanged)"
				b.stats = append(b.stats, st)
				files = append(files, want...)
				b.progress.Step()
				continue
			}
			why = "a file of the last build is missing or altered"
		}
		if h := b.hooks.BeforeDraw; h != nil {
			if err := h("insert " + name); err != nil {
				return nil, err
			}
		}
		if err := b.drawInsert(p, idir); err != nil {
			return nil, err
		}
		st.Encoded, st.Whole = 1, "drawn ("+why+")"
		b.stats = append(b.stats, st)
		files = append(files, want...)
		b.progress.Step()
	}
	return files, nil
}

// keepInsert carries an insert this build does not draw (--only another
// output) with its last manifest entry, when the last build made it and
// every one of its files is there as recorded. It returns the files kept.
func (b *build) keepInsert(p *feature.Insert, idir string) []string {
	prev := b.prev.Insert(p.Spec.Name)
	if prev == nil || prev.Output != p.Output.Name {
		return nil
	}
	want := insertFiles(p, idir)
	if !b.keepAll("", want, b.prev.FilesOf("", p.Spec.Name)) {
		return nil
	}
	terms := make([]string, len(prev.Terms))
	for i, t := range prev.Terms {
		terms[i] = t.Term
	}
	for _, f := range want {
		b.note(f, fileMeta{insert: p.Spec.Name, terms: terms})
	}
	b.inserts = append(b.inserts, *prev)
	return want
}

// insertFiles lists the files of an insert in dir, sorted.
func insertFiles(p *feature.Insert, dir string) []string {
	if p.Output.Kind == specs.Print {
		return []string{filepath.Join(dir, p.Spec.Name+".pdf")}
	}
	files := []string{filepath.Join(dir, p.Spec.Name+".svg")}
	for _, s := range screenScales {
		files = append(files, filepath.Join(dir, p.Spec.Name+s.suffix+".png"))
	}
	sort.Strings(files)
	return files
}

// insertTerms is each term of an insert, in its order, with the hash of
// its data as the insert loaded it.
func insertTerms(p *feature.Insert) []TermHash {
	h := newHasher(termKind)
	ts := make([]TermHash, len(p.Graphic.Data.Series))
	for i := range p.Graphic.Data.Series {
		sr := &p.Graphic.Data.Series[i]
		ts[i] = TermHash{Term: sr.Term, SHA256: termSumWith(h, sr)}
	}
	return ts
}

// insertInputs is the hash of everything that decides an insert's files;
// equal hashes mean equal files. What goes in, and why it is enough:
//
//   - the sheaf version and the spec file's hash: the insert's size,
//     title and terms, the borrowed output's type, fonts and line width,
//     the scale and the palette are all in the spec;
//   - the insert's name, and the name and kind of the output it borrows
//     (a PDF or an SVG with PNGs);
//   - the date, for a PDF (its metadata has it; SOURCE_DATE_EPOCH can
//     change it with the spec unchanged);
//   - each term's data hash (counts and plotted values), in order, and
//     the span, years, gaps and unit of the insert's data;
//   - the palette's stops over the span;
//   - the hash of each font's bytes.
func (b *build) insertInputs(p *feature.Insert, terms []TermHash) string {
	h := newHasher("sheaf insert v1")
	h.str(Version)
	h.str(b.specSum)
	h.str(p.Spec.Name)
	h.str(p.Output.Name)
	h.str(string(p.Output.Kind))
	if p.Output.Kind == specs.Print {
		h.str(b.date.UTC().Format(time.RFC3339))
	}
	h.int(len(terms))
	for _, t := range terms {
		h.str(t.Term)
		h.str(t.SHA256)
	}
	d := p.Graphic.Data
	h.int(d.Span.From)
	h.int(d.Span.To)
	h.floats(d.Years)
	h.int(len(d.Gaps))
	for _, y := range d.Gaps {
		h.int(y)
	}
	h.str(d.Unit)
	h.int(d.Rolling)
	h.float(p.Graphic.Output.Band)
	h.str(string(p.Graphic.Insert.Compare))
	for _, s := range p.Graphic.Palette.Stops(float64(d.Span.From), float64(d.Span.To), 0) {
		r := s.Color
		h.floats([]float64{s.Year, r.R, r.G, r.B})
	}
	h.str(b.fontSums.sum(p.Graphic.Fonts))
	if p.Press != nil {
		h.str("press " + p.Press.Fingerprint())
	}
	return h.sum()
}

// drawInsert draws one insert's files into dir.
func (b *build) drawInsert(p *feature.Insert, dir string) error {
	if err := b.ctx.Err(); err != nil {
		return err
	}
	w, h := p.Graphic.Size()
	if p.Output.Kind == specs.Print {
		// An insert is placed by the article's layout, which adds its
		// own bleed: the file is trimmed, media = trim.
		paint := func(c *canvas.Canvas) error { return p.Graphic.Draw(canvas.NewContext(draw.Recording{Canvas: c})) }
		path := filepath.Join(dir, p.Spec.Name+".pdf")
		box := canvas.Rect{X0: 0, Y0: 0, X1: w, Y1: h}
		title, _ := p.Graphic.Describe()
		return WriteAtomic(path, func(wr io.Writer) error {
			pw := pdf.NewWriter(wr, pdf.Options{Title: title, Version: Version, Date: b.date, Press: p.Press})
			if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}, Press: p.Press}, paint); err != nil {
				return err
			}
			return pw.Close()
		})
	}
	title, desc := p.Graphic.Describe()
	paper := p.Graphic.Paper()
	opts := svg.Options{Title: title, Desc: desc, FontFamily: p.Output.Fonts.Family, EmbedFonts: p.Output.Fonts.Embed, Background: paper}
	path := filepath.Join(dir, p.Spec.Name+".svg")
	err := WriteAtomic(path, func(wr io.Writer) error {
		doc, err := svg.New(w, h, opts)
		if err != nil {
			return err
		}
		if err := p.Graphic.Draw(canvas.NewContext(doc)); err != nil {
			return err
		}
		if err := b.ctx.Err(); err != nil {
			return err
		}
		_, err = doc.WriteTo(wr)
		return err
	})
	if err != nil {
		return err
	}
	for _, s := range screenScales {
		ppath := filepath.Join(dir, p.Spec.Name+s.suffix+".png")
		img, err := b.rasterize(ppath, func() (*image.RGBA, error) {
			return raster.DrawContext(b.ctx, w, h, s.dpi, paper, func(ctx *canvas.Context) error { return p.Graphic.Draw(ctx) })
		})
		if err != nil {
			return fmt.Errorf("insert %q: %w", p.Spec.Name, err)
		}
		if err := WriteAtomic(ppath, func(wr io.Writer) error { return raster.WritePNGContext(b.ctx, wr, img) }); err != nil {
			return err
		}
	}
	return nil
}
