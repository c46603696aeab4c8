package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/insert"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/render/svg"
	"sheaf/specs"
	"sheaf/specs/series"
)

// preparedInsert is an insert laid out and ready to write.
type preparedInsert struct {
	in  *specs.Insert
	out *specs.Output
	g   *insert.Graphic
}

// prepareInsert loads an insert's terms (whether or not the feature
// selects them), its output's fonts and the palette, and lays it out.
// Its errors are bad input.
func prepareInsert(j *job, in *specs.Insert) (*preparedInsert, error) {
	out := j.spec.Output(in.Output)
	if out == nil {
		return nil, fmt.Errorf("%s: inserts.%s.output: no output named %q", j.spec.Where("inserts."+in.Name+".output"), in.Name, in.Output)
	}
	// The insert's own terms, in its order, scaled as the feature is.
	data, err := series.Load(j.spec.ForInsert(in))
	if err != nil {
		return nil, err
	}
	fs, err := fonts.Load(j.spec, out)
	if err != nil {
		return nil, err
	}
	sc, err := scaleFor(j.spec, data.Span)
	if err != nil {
		return nil, err
	}
	g, err := insert.New(j.spec, in, out, data, sc, fs)
	if err != nil {
		return nil, err
	}
	return &preparedInsert{in: in, out: out, g: g}, nil
}

// prepareInserts lays out every insert of the spec; its errors are bad
// input (a term missing from the data, a graphic too small), with the
// spec's file:line:col.
func prepareInserts(j *job) ([]*preparedInsert, error) {
	var preps []*preparedInsert
	var errs []string
	for i := range j.spec.Inserts {
		p, err := prepareInsert(j, &j.spec.Inserts[i])
		if err != nil {
			errs = append(errs, err.Error()) // every insert's problems at once
			continue
		}
		preps = append(preps, p)
	}
	if len(errs) > 0 {
		return nil, errors.New(strings.Join(errs, "\n"))
	}
	return preps, nil
}

// buildInserts writes every insert into the stage's inserts/ folder: a
// PDF for an insert that borrows a print output, an SVG and PNGs at 1×
// and 2× for a screen one. An insert whose inputs hash is the last
// build's, with its files intact, is carried over instead of drawn. The
// inserts were laid out before any file was written (bad input writes
// nothing). It returns the files, sorted per insert.
func (b *build) buildInserts(preps []*preparedInsert) ([]string, error) {
	var files []string
	idir := filepath.Join(b.stage.dir, "inserts")
	b.progress.begin("inserts", len(preps))
	for _, p := range preps {
		if err := b.ctx.Err(); err != nil {
			return nil, err
		}
		name := p.in.Name
		entry := insertEntry{Name: name, Output: p.out.Name, Terms: insertTerms(p)}
		entry.Inputs = b.insertInputs(p, entry.Terms)
		b.inserts = append(b.inserts, entry)
		st := outputStats{Output: p.out.Name, Insert: name, Kind: "insert", Pages: 1}
		want := insertFiles(p, idir)
		terms := make([]string, len(entry.Terms))
		for i, t := range entry.Terms {
			terms[i] = t.Term
		}
		for _, f := range want {
			b.note(f, fileMeta{insert: name, terms: terms})
		}
		prev := b.prev.insert(name)
		why := b.drawReason(prev != nil, prev != nil && prev.Output == entry.Output && prev.Inputs == entry.Inputs)
		if why == "" {
			old := b.prev.filesOf("", name)
			if b.keepAll("", want, old) {
				st.Reused, st.Whole = 1, "reused (inputs unchanged)"
				b.stats = append(b.stats, st)
				files = append(files, want...)
				b.progress.step()
				continue
			}
			why = "a file of the last build is missing or altered"
		}
		if drawHook != nil {
			if err := drawHook("insert " + name); err != nil {
				return nil, err
			}
		}
		if err := drawInsert(p, idir, b.date); err != nil {
			return nil, err
		}
		st.Encoded, st.Whole = 1, "drawn ("+why+")"
		b.stats = append(b.stats, st)
		files = append(files, want...)
		b.progress.step()
	}
	return files, nil
}

// insertFiles lists the files of an insert in dir, sorted.
func insertFiles(p *preparedInsert, dir string) []string {
	if p.out.Kind == specs.Print {
		return []string{filepath.Join(dir, p.in.Name+".pdf")}
	}
	files := []string{filepath.Join(dir, p.in.Name+".svg")}
	for _, s := range screenScales {
		files = append(files, filepath.Join(dir, p.in.Name+s.suffix+".png"))
	}
	sort.Strings(files)
	return files
}

// insertTerms is each term of an insert, in its order, with the hash of
// its data as the insert loaded it.
func insertTerms(p *preparedInsert) []termHash {
	h := newHasher(termKind)
	ts := make([]termHash, len(p.g.Data.Series))
	for i := range p.g.Data.Series {
		sr := &p.g.Data.Series[i]
		ts[i] = termHash{Term: sr.Term, SHA256: termSumWith(h, sr)}
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
func (b *build) insertInputs(p *preparedInsert, terms []termHash) string {
	h := newHasher("sheaf insert v1")
	h.str(version)
	h.str(b.specSum)
	h.str(p.in.Name)
	h.str(p.out.Name)
	h.str(string(p.out.Kind))
	if p.out.Kind == specs.Print {
		h.str(b.date.UTC().Format(time.RFC3339))
	}
	h.int(len(terms))
	for _, t := range terms {
		h.str(t.Term)
		h.str(t.SHA256)
	}
	d := p.g.Data
	h.int(d.Span.From)
	h.int(d.Span.To)
	h.floats(d.Years)
	h.int(len(d.Gaps))
	for _, y := range d.Gaps {
		h.int(y)
	}
	h.str(d.Unit)
	for _, s := range p.g.Palette.Stops(float64(d.Span.From), float64(d.Span.To), 0) {
		r := s.Color
		h.floats([]float64{s.Year, r.R, r.G, r.B})
	}
	h.str(fontsSum(p.g.Fonts))
	return h.sum()
}

// drawInsert draws one insert's files into dir.
func drawInsert(p *preparedInsert, dir string, date time.Time) error {
	w, h := p.g.Size()
	if p.out.Kind == specs.Print {
		// An insert is placed by the article's layout, which adds its
		// own bleed: the file is trimmed, media = trim.
		draw := func(c *canvas.Canvas) error { return p.g.Draw(canvas.NewContext(c)) }
		path := filepath.Join(dir, p.in.Name+".pdf")
		box := canvas.Rect{X0: 0, Y0: 0, X1: w, Y1: h}
		title, _ := p.g.Describe()
		return writeAtomic(path, func(wr io.Writer) error {
			pw := pdf.NewWriter(wr, pdf.Options{Title: title, Version: version, Date: date})
			if err := pw.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}}, draw); err != nil {
				return err
			}
			return pw.Close()
		})
	}
	title, desc := p.g.Describe()
	paper := p.g.Paper()
	opts := svg.Options{Title: title, Desc: desc, FontFamily: p.out.Fonts.Family, EmbedFonts: p.out.Fonts.Embed, Background: paper}
	path := filepath.Join(dir, p.in.Name+".svg")
	err := writeAtomic(path, func(wr io.Writer) error {
		doc, err := svg.New(w, h, opts)
		if err != nil {
			return err
		}
		if err := p.g.Draw(canvas.NewContext(doc)); err != nil {
			return err
		}
		_, err = doc.WriteTo(wr)
		return err
	})
	if err != nil {
		return err
	}
	for _, s := range screenScales {
		img, err := raster.Draw(w, h, s.dpi, paper, func(ctx *canvas.Context) error { return p.g.Draw(ctx) })
		if err != nil {
			return fmt.Errorf("insert %q: %w", p.in.Name, err)
		}
		ppath := filepath.Join(dir, p.in.Name+s.suffix+".png")
		if err := writeAtomic(ppath, func(wr io.Writer) error { return raster.WritePNG(wr, img) }); err != nil {
			return err
		}
	}
	return nil
}

// insertsBorrow reports whether an insert of the spec borrows the output
// named name, so `sheaf build --only NAME` writes the inserts too.
func insertsBorrow(s *specs.Spec, name string) bool {
	for _, in := range s.Inserts {
		if in.Output == name {
			return true
		}
	}
	return false
}
