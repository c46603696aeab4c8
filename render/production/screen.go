package production

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"html"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync/atomic"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/render/feature"
	"sheaf/render/raster"
	"sheaf/render/slug"
	"sheaf/render/svg"
	"sheaf/specs"
)

// screenScales are the PNG resolutions of every screen page: 1× is 96 dpi
// (one image pixel per CSS px, CSS Values and Units Level 3 §5.2), 2× is
// for high-density displays.
var screenScales = []struct {
	dpi    float64
	suffix string
}{{96, ""}, {192, "@2x"}}

// maxRasterPx is the tallest PNG written; a scrolling page longer than
// this at some scale gets no PNG at that scale (the SVG is still written).
const maxRasterPx = 40000

// buildScreen writes a screen output into the stage: one SVG per page (a
// scrolling output is one tall page, or with scroll-groups one tall page
// per group, the pages differing in height), a PNG of each at 1× and 2×,
// with panel-files one small SVG per term, and an HTML proof page showing
// every page in order at its own size. When the output's inputs hash is
// the last build's and its files are intact, the files are carried over
// instead: rasterizing a tall page at 2× is most of a rebuild otherwise.
// It returns the files, sorted.
func (b *build) buildScreen(p *feature.Output) ([]string, error) {
	out := p.Spec
	entry, err := b.entryOf(p, 0)
	if err != nil {
		return nil, err
	}
	entry.Inputs = b.screenInputs(p, entry.Pages)
	b.outputs = append(b.outputs, entry)
	st := OutputStats{Output: out.Name, Kind: string(out.Kind), Pages: len(entry.Pages)}
	odir := filepath.Join(b.stage.dir, out.Name)
	tasks, skipped := screenPNGTasks(p, odir)
	for _, s := range skipped {
		b.progress.Warn(s)
	}
	want := b.noteScreenFiles(p, entry.Pages, odir, tasks)
	prev := b.prev.Output(out.Name)
	why := b.drawReason(prev != nil, prev != nil && prev.Kind == entry.Kind && prev.Inputs == entry.Inputs)
	if why == "" {
		if b.keepAll(out.Name+": reusing files", want, b.prev.FilesOf(out.Name, "")) {
			b.keepScreenCache(out.Name)
			st.Reused, st.Whole = st.Pages, "reused (inputs unchanged)"
			b.stats = append(b.stats, st)
			return want, nil
		}
		why = "a file of the last build is missing or altered"
	}
	if err := b.ctx.Err(); err != nil {
		return nil, err
	}
	if h := b.hooks.BeforeDraw; h != nil {
		if err := h(out.Name); err != nil {
			return nil, err
		}
	}
	if err := os.MkdirAll(filepath.Join(b.stage.dir, CacheDir, out.Name), 0o755); err != nil {
		return nil, err
	}
	files, err := b.drawScreen(p, entry.Pages, odir, tasks, &st)
	if err != nil {
		return nil, err
	}
	sort.Strings(files)
	st.Encoded, st.Whole = st.Pages, "drawn ("+why+")"
	if st.BandsDrawn+st.BandsReused > 0 {
		st.Whole += fmt.Sprintf("; PNG bands %d drawn, %d reused", st.BandsDrawn, st.BandsReused)
	}
	if st.PanelsDrawn+st.PanelsReused > 0 {
		st.Whole += fmt.Sprintf("; panel files %d drawn, %d reused", st.PanelsDrawn, st.PanelsReused)
	}
	b.stats = append(b.stats, st)
	return files, nil
}

// cachedFile writes path from the cache of output: the file named name
// (a hash of its inputs) is linked from the last build's cache when it
// is there, else written into this build's cache by fill; either way
// path is linked to it.
func (b *build) cachedFile(output, name, path string, fill func(w io.Writer) error) error {
	oldC := filepath.Join(b.final, CacheDir, output, name)
	newC := filepath.Join(b.stage.dir, CacheDir, output, name)
	if b.full || linkOrCopy(oldC, newC) != nil {
		if err := WriteAtomic(newC, fill); err != nil {
			return err
		}
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return linkOrCopy(newC, path)
}

// keepScreenCache carries a screen output's cached PNG bands and panel
// files into the new cache when the output's files were carried over
// whole, so a later change still finds them.
func (b *build) keepScreenCache(name string) {
	old := filepath.Join(b.final, CacheDir, name)
	entries, err := os.ReadDir(old)
	if err != nil {
		return
	}
	dst := filepath.Join(b.stage.dir, CacheDir, name)
	if os.MkdirAll(dst, 0o755) != nil {
		return
	}
	for _, e := range entries {
		if n := e.Name(); e.Type().IsRegular() && (strings.HasSuffix(n, ".band") || strings.HasSuffix(n, ".svg")) {
			linkOrCopy(filepath.Join(old, n), filepath.Join(dst, n))
		}
	}
}

// screenInputs is the hash of everything that decides a screen output's
// files; equal hashes mean equal files. What goes in, and why it is
// enough:
//
//   - the sheaf version (the drawing code) and the spec file's hash: every
//     setting (width, type, fonts.family and embed, flow, spreads,
//     panel-files, palette) is in the spec, and any edit redraws, as for
//     print pages;
//   - the output's name and kind;
//   - every page's inputs (pageInputs: layout, the panels' data as drawn,
//     span, unit, palette stops, fonts), in order: page SVGs, spreads,
//     PNGs and panel files are drawn from them;
//   - the data hash (counts and plotted values) of every term on it;
//   - the palette's stops and the fonts' hashes, so an output with no
//     page is covered too;
//   - the plan's summary, which the proof page prints.
//
// The date is not in it: SVG and PNG carry none.
func (b *build) screenInputs(p *feature.Output, pages []PageEntry) string {
	h := newHasher("sheaf screen v1")
	h.str(Version)
	h.str(b.specSum)
	h.str(p.Spec.Name)
	h.str(string(p.Spec.Kind))
	terms := b.termSums()
	h.int(len(pages))
	for _, pg := range pages {
		h.str(pg.Inputs)
		h.int(len(pg.Terms))
		for _, t := range pg.Terms {
			h.str(t)
			h.str(terms[t])
		}
	}
	for _, s := range p.Feature.Stops {
		r := s.Color
		h.floats([]float64{s.Year, r.R, r.G, r.B})
	}
	h.str(b.fontSums.sum(p.Fonts))
	h.str(p.Plan.Summary())
	return h.sum()
}

// noteScreenFiles records, for the manifest, the pages or term each file
// of a screen output shows, and returns every file the output has
// (stage paths, sorted).
func (b *build) noteScreenFiles(p *feature.Output, pages []PageEntry, odir string, tasks []pngTask) []string {
	var files []string
	add := func(name string, m fileMeta) {
		path := filepath.Join(odir, filepath.FromSlash(name))
		b.note(path, m)
		files = append(files, path)
	}
	for i := range pages {
		add(fmt.Sprintf("page-%03d.svg", i+1), fileMeta{pages: pages[i : i+1]})
	}
	for _, t := range tasks {
		add(filepath.Base(t.path), fileMeta{pages: pages[t.page : t.page+1]})
	}
	if p.Spec.Spreads && p.Spec.Flow == specs.FlowPages {
		for k, sp := range p.Plan.Spreads() {
			var on []PageEntry
			for _, sg := range sp.Pages {
				on = append(on, pages[sg.Page])
			}
			add(fmt.Sprintf("spread-%03d.svg", k+1), fileMeta{pages: on})
		}
	}
	if p.Spec.PanelFiles {
		for _, pf := range panelFiles(b.j, p) {
			add("panels/"+pf.name+".svg", fileMeta{terms: []string{pf.term}})
		}
	}
	add("index.html", fileMeta{pages: pages})
	sort.Strings(files)
	return files
}

// drawScreen draws every file of a screen output into odir (see
// buildScreen) and returns them.
func (b *build) drawScreen(p *feature.Output, pages []PageEntry, odir string, tasks []pngTask, st *OutputStats) ([]string, error) {
	j, prog := b.j, b.progress
	out := p.Spec
	n := len(p.Plan.Pages)
	var files []string
	var shown []proofItem // what the proof page shows
	prog.Begin(out.Name+": SVG pages", n)
	for i := range p.Plan.Pages {
		pg := &p.Plan.Pages[i]
		name := fmt.Sprintf("page-%03d.svg", i+1)
		shown = append(shown, proofItem{name, pg.Trim.W(), pg.Trim.H()})
		path := filepath.Join(odir, name)
		opts := screenSVGOptions(j, p)
		switch {
		case out.Flow == specs.FlowScrollGroups && len(pg.Headings) > 0:
			// The page may be shown alone: its title names its group.
			opts.Title = fmt.Sprintf("%s: %s", opts.Title, pg.Headings[0].Text)
		case n > 1:
			opts.Title = fmt.Sprintf("%s (page %d of %d)", opts.Title, i+1, n)
		}
		// A page is cached under its inputs (pageInputs) and its title:
		// a page of a paged output whose panels did not change is the
		// last build's file.
		h := newHasher("sheaf page svg v1")
		h.str(pages[i].Inputs)
		h.str(opts.Title)
		for _, pn := range pg.Panels { // the SVG ids
			h.str(p.Feature.Slug(pn.Item))
		}
		err := b.cachedFile(out.Name, h.sum()+".svg", path, func(w io.Writer) error {
			return drawSVG(b.ctx, w, pg.Trim, opts, func(ctx *canvas.Context) error { return p.Feature.Draw(ctx, i) })
		})
		if err != nil {
			return nil, err
		}
		files = append(files, path)
		prog.Step()
	}
	if out.Spreads && out.Flow == specs.FlowPages {
		spreads, err := b.writeSpreads(p, odir)
		if err != nil {
			return nil, err
		}
		files = append(files, spreads...)
		shown = shown[:0]
		for k, sp := range p.Plan.Spreads() {
			shown = append(shown, proofItem{filepath.Base(spreads[k]), sp.Sheet.W(), sp.Sheet.H()})
		}
	}
	pngs, err := b.writeScreenPNGs(p, tasks, st)
	if err != nil {
		return nil, err
	}
	files = append(files, pngs...)
	var panels []string
	if out.PanelFiles {
		panels, err = b.writePanelFiles(p, filepath.Join(odir, "panels"), st)
		if err != nil {
			return nil, err
		}
		files = append(files, panels...)
	}
	index := filepath.Join(odir, "index.html")
	if err := WriteAtomic(index, func(w io.Writer) error {
		return writeProofPage(w, j, p, shown, len(panels))
	}); err != nil {
		return nil, err
	}
	return append(files, index), nil
}

// writeSpreads writes one SVG per spread (dir/spread-NNN.svg): a
// left-hand page and the right-hand page after it side by side, as a
// reader of a magazine app sees them.
func (b *build) writeSpreads(p *feature.Output, odir string) ([]string, error) {
	j := b.j
	var files []string
	spreads := p.Plan.Spreads()
	for k, sp := range spreads {
		opts := screenSVGOptions(j, p)
		opts.Title = fmt.Sprintf("%s (spread %d of %d)", opts.Title, k+1, len(spreads))
		path := filepath.Join(odir, fmt.Sprintf("spread-%03d.svg", k+1))
		err := WriteAtomic(path, func(w io.Writer) error {
			return drawSVG(b.ctx, w, sp.Sheet, opts, func(ctx *canvas.Context) error {
				for _, sg := range sp.Pages {
					ctx.SetView(canvas.Identity.Translate(sg.Offset.X*specs.MmPerPt, sg.Offset.Y*specs.MmPerPt))
					if err := p.Feature.Draw(ctx, sg.Page); err != nil {
						return err
					}
				}
				return nil
			})
		})
		if err != nil {
			return nil, err
		}
		files = append(files, path)
	}
	return files, nil
}

// screenSVGOptions are the document options every SVG of an output shares.
func screenSVGOptions(j *feature.Job, p *feature.Output) svg.Options {
	return svg.Options{
		Title:      j.Spec.Title,
		Desc:       j.Spec.Dek,
		FontFamily: p.Spec.Fonts.Family,
		EmbedFonts: p.Spec.Fonts.Embed,
		Background: p.Feature.PaperColor(),
	}
}

// drawSVG draws the part r (points) of a drawing into an SVG document
// and writes it.
func drawSVG(ctx context.Context, w io.Writer, r layout.Rect, opts svg.Options, draw func(ctx *canvas.Context) error) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	doc, err := svg.NewWindow(r.X0, r.Y0, r.X1, r.Y1, opts)
	if err != nil {
		return err
	}
	if err := draw(canvas.NewContext(doc)); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	_, err = doc.WriteTo(w)
	return err
}

// pngTask is one screen PNG: page (from 0) at dpi, to path.
type pngTask struct {
	page int
	dpi  float64
	path string
}

// screenPNGTasks lists the PNGs of every page at each screen scale, and
// a message for each one skipped: a page too tall for a PNG at a scale.
func screenPNGTasks(p *feature.Output, odir string) (tasks []pngTask, skipped []string) {
	for i := range p.Plan.Pages {
		pg := &p.Plan.Pages[i]
		for _, s := range screenScales {
			if pg.Trim.H()*s.dpi/72 > maxRasterPx || pg.Trim.W()*s.dpi/72 > maxRasterPx {
				skipped = append(skipped, fmt.Sprintf("output %q page %d: %.0f px tall at %g dpi is past the %d px PNG limit; no PNG%s written (the SVG has it all)",
					p.Spec.Name, i+1, pg.Trim.H()*s.dpi/72, s.dpi, maxRasterPx, s.suffix))
				continue
			}
			// One image's memory is bounded (specs.MaxRasterPixels).
			if px := pg.Trim.H() * pg.Trim.W() * (s.dpi / 72) * (s.dpi / 72); px > specs.MaxRasterPixels {
				skipped = append(skipped, fmt.Sprintf("output %q page %d: %.0f million pixels at %g dpi is past the %d million pixel limit of one image; no PNG%s written (the SVG has it all)",
					p.Spec.Name, i+1, px/1e6, s.dpi, specs.MaxRasterPixels/1_000_000, s.suffix))
				continue
			}
			tasks = append(tasks, pngTask{page: i, dpi: s.dpi,
				path: filepath.Join(odir, fmt.Sprintf("page-%03d%s.png", i+1, s.suffix))})
		}
	}
	return tasks, skipped
}

// writeScreenPNGs renders the PNGs tasks lists, band by band (see
// bands.go): bands whose inputs are in the last build's cache are taken
// from it, the others drawn, in parallel.
func (b *build) writeScreenPNGs(p *feature.Output, tasks []pngTask, st *OutputStats) (files []string, err error) {
	fontSum := b.fontSums.sum(p.Fonts)
	pages := map[int]*pageBands{}
	type job struct {
		task int
		band bandTask
		out  **encodedBand
	}
	var jobs []job
	results := make([][]*encodedBand, len(tasks))
	sizes := make([]raster.Region, len(tasks))
	for k, t := range tasks {
		if pages[t.page] == nil {
			pages[t.page] = b.newPageBands(p, t.page, fontSum)
		}
		pg := &p.Plan.Pages[t.page]
		r := raster.RegionOf(pg.Media.H(), t.dpi, pg.Trim.X0, pg.Trim.Y0, pg.Trim.X1, pg.Trim.Y1)
		sizes[k] = r
		bts := pages[t.page].bands(pg.Media.H(), t.dpi, r)
		results[k] = make([]*encodedBand, len(bts))
		for n, bt := range bts {
			jobs = append(jobs, job{task: k, band: bt, out: &results[k][n]})
		}
	}
	b.progress.Begin(p.Spec.Name+": PNG bands", len(jobs))
	var drawn, reused atomic.Int64
	err = each(b.ctx, len(jobs), func(n int) (struct{}, error) {
		defer b.progress.Step()
		jb := jobs[n]
		t := tasks[jb.task]
		eb, d, err := b.bandOf(p, t.page, t.dpi, jb.band, t.path)
		*jb.out = eb
		if d {
			drawn.Add(1)
		} else {
			reused.Add(1)
		}
		return struct{}{}, err
	}, nil)
	if err != nil {
		return nil, err
	}
	st.BandsDrawn, st.BandsReused = int(drawn.Load()), int(reused.Load())
	for k, t := range tasks {
		err := WriteAtomic(t.path, func(w io.Writer) error { return writeBandedPNG(w, sizes[k].W, sizes[k].H, results[k]) })
		if err != nil {
			return nil, err
		}
		files = append(files, t.path)
	}
	return files, nil
}

// panelWindow is the part of a page a panel file shows: the panel, the
// tick labels under its plot, and a margin of a quarter gutter.
func panelWindow(plan *layout.Plan, pn layout.Panel) (layout.Panel, layout.Rect) {
	pn.ShowTicks = true
	pn.Ticks = layout.Rect{X0: pn.Plot.X0, Y0: pn.Plot.Y0 - plan.TicksH, X1: pn.Plot.X1, Y1: pn.Plot.Y0}
	pad := plan.Gutter / 4
	box := pn.Box()
	win := layout.Rect{X0: box.X0 - pad, Y0: pn.Ticks.Y0 - pad, X1: box.X1 + pad, Y1: box.Y1 + pad}
	// The file is drawn with its window's corner at the origin and every
	// length rounded to a millionth of a point: a panel that moved to
	// another row or page is then drawn from the same numbers, so its file
	// keeps its bytes (page coordinates differ in their last bits, enough
	// to flip a 0.1 px rounding).
	x0, y0 := win.X0, win.Y0
	at := func(r layout.Rect) layout.Rect {
		return layout.Rect{X0: canon(r.X0 - x0), Y0: canon(r.Y0 - y0), X1: canon(r.X1 - x0), Y1: canon(r.Y1 - y0)}
	}
	pn.Label, pn.Plot, pn.Ticks = at(pn.Label), at(pn.Plot), at(pn.Ticks)
	pn.LabelBaseline = canon(pn.LabelBaseline - y0)
	pn.Row, pn.Col = 0, 0
	return pn, at(win)
}

// canon rounds a length to a millionth of a point.
func canon(v float64) float64 { return math.Round(v*1e6) / 1e6 }

// panelFile is one panel file of a screen output.
type panelFile struct {
	name  string // the term's slug, unique in the output
	term  string
	item  int
	panel layout.Panel
	win   layout.Rect
}

// panelFiles lists the panel files of an output in panel order, named.
func panelFiles(j *feature.Job, p *feature.Output) []panelFile {
	var out []panelFile
	for i := range p.Plan.Pages {
		for _, pn := range p.Plan.Pages[i].Panels {
			pn, win := panelWindow(p.Plan, pn)
			term := j.Data.Series[pn.Item].Term
			out = append(out, panelFile{name: p.Feature.Slug(pn.Item), term: term, item: pn.Item, panel: pn, win: win})
		}
	}
	return out
}

// writePanelFiles writes one SVG per term, named by the term's slug.
// A panel file is cached under the hash of what decides it (panelInputs):
// the file of a term whose data, label and panel size did not change is
// the last build's, wherever its panel now lands.
func (b *build) writePanelFiles(p *feature.Output, pdir string, st *OutputStats) ([]string, error) {
	j := b.j
	pfs := panelFiles(j, p)
	b.progress.Begin(p.Spec.Name+": panel files", len(pfs))
	files := make([]string, len(pfs))
	fontSum := b.fontSums.sum(p.Fonts)
	var drawn, reused atomic.Int64
	err := each(b.ctx, len(pfs), func(k int) (struct{}, error) {
		defer b.progress.Step()
		pf := pfs[k]
		title, desc := p.Feature.Describe(pf.item)
		opts := screenSVGOptions(j, p)
		opts.Title, opts.Desc = title, desc
		path := filepath.Join(pdir, pf.name+".svg")
		files[k] = path
		name := b.panelInputs(p, pf, opts, fontSum) + ".svg"
		oldC := filepath.Join(b.final, CacheDir, p.Spec.Name, name)
		newC := filepath.Join(b.stage.dir, CacheDir, p.Spec.Name, name)
		if b.full || linkOrCopy(oldC, newC) != nil {
			err := WriteAtomic(newC, func(w io.Writer) error {
				return drawSVG(b.ctx, w, pf.win, opts, func(ctx *canvas.Context) error { return p.Feature.DrawPanel(ctx, pf.panel) })
			})
			if err != nil {
				return struct{}{}, err
			}
			drawn.Add(1)
		} else {
			reused.Add(1)
		}
		if err := os.MkdirAll(pdir, 0o755); err != nil {
			return struct{}{}, err
		}
		return struct{}{}, linkOrCopy(newC, path)
	}, nil)
	if err != nil {
		return nil, err
	}
	st.PanelsDrawn, st.PanelsReused = int(drawn.Load()), int(reused.Load())
	return files, nil
}

// panelInputs is the hash of everything that decides a panel file: the
// drawing code and the spec (as for pages), the fonts, the panel as drawn
// (its geometry from its window's corner, see panelWindow), the term's
// data and label, its id, and the document's title and description.
func (b *build) panelInputs(p *feature.Output, pf panelFile, opts svg.Options, fontSum string) string {
	h := newHasher("sheaf panel file v1")
	h.str(Version)
	h.str(b.specSum)
	h.str(p.Spec.Name)
	h.str(fontSum)
	// The item and group index say where the panel is in the order, not
	// how it looks: the term's data is hashed below.
	drawn := pf.panel
	drawn.Item, drawn.Group = 0, 0
	if s, err := json.Marshal(drawn); err == nil {
		h.str(string(s))
	}
	h.floats([]float64{pf.win.X0, pf.win.Y0, pf.win.X1, pf.win.Y1})
	h.str(pf.name)
	sr := &b.j.Data.Series[pf.item]
	h.str(sr.Term)
	h.floats(sr.Values)
	h.float(sr.Peak)
	h.int(sr.PeakYear)
	h.float(sr.YMax)
	if l := p.Feature.Labels(); pf.item < len(l) {
		h.str(l[pf.item].DrawnText())
		h.float(l[pf.item].Size)
	}
	d := b.j.Data
	h.int(d.Span.From)
	h.int(d.Span.To)
	h.floats(d.Years)
	h.str(d.Unit)
	h.float(d.YMax)
	for _, s := range p.Feature.Stops {
		r := s.Color
		h.floats([]float64{s.Year, r.R, r.G, r.B})
	}
	h.str(opts.Title)
	h.str(opts.Desc)
	return h.sum()
}

// Slug turns a term into a file name stem that is safe everywhere (see
// slug.Of).
func Slug(term string) string { return slug.Of(term) }

// proofItem is one SVG the proof page shows, with its size in points.
type proofItem struct {
	name string
	w, h float64
}

// writeProofPage writes the HTML proof page of a screen output: every
// page's SVG in order, at its own size, each captioned with its name and
// size, the first at the page's top-left corner, so a screenshot of the
// window shows page 1 exactly as a browser draws it.
func writeProofPage(w io.Writer, j *feature.Job, p *feature.Output, items []proofItem, panels int) error {
	var b bytes.Buffer
	esc := html.EscapeString
	title := fmt.Sprintf("%s — %s (screen proof)", j.Spec.Title, p.Spec.Name)
	fmt.Fprintf(&b, `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>%s</title>
<style>
body{margin:0;background:#d9d9d6;font:14px/1.4 system-ui,sans-serif;color:#1a1a1a}
figure{margin:0 0 32px}
img{display:block;background:#fff}
figcaption{padding:6px 12px}
</style>
</head>
<body>
`, esc(title))
	for i, it := range items {
		wpx, hpx := it.w*specs.PxPerPt, it.h*specs.PxPerPt
		// HTML's width and height attributes take whole pixels; the
		// caption keeps the SVG's exact size.
		ws, hs := strconv.FormatFloat(roundTo(wpx, 1), 'f', -1, 64), strconv.FormatFloat(roundTo(hpx, 1), 'f', -1, 64)
		wi, hi := strconv.Itoa(int(math.Ceil(wpx-0.05))), strconv.Itoa(int(math.Ceil(hpx-0.05)))
		fmt.Fprintf(&b, "<figure>\n<img src=\"%s\" width=\"%s\" height=\"%s\" alt=\"%s\">\n<figcaption>%s · %s × %s px · %d of %d</figcaption>\n</figure>\n",
			esc(it.name), wi, hi, esc(fmt.Sprintf("%s, %d of %d", j.Spec.Title, i+1, len(items))), esc(it.name), ws, hs, i+1, len(items))
	}
	fmt.Fprintf(&b, "<p style=\"padding:0 12px\">%s", esc(p.Plan.Summary()))
	if panels > 0 {
		fmt.Fprintf(&b, "; %d panel files in <a href=\"panels/\">panels/</a>", panels)
	}
	b.WriteString(".</p>\n</body>\n</html>\n")
	_, err := w.Write(b.Bytes())
	return err
}

func roundTo(v float64, places int) float64 {
	p := 1.0
	for range places {
		p *= 10
	}
	return float64(int64(v*p+0.5)) / p
}
