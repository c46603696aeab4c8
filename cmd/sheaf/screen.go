package main

import (
	"bytes"
	"fmt"
	"html"
	"image"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode"

	"github.com/tdewolff/canvas"
	"golang.org/x/text/unicode/norm"

	"sheaf/layout"
	"sheaf/render/raster"
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

// buildScreen writes a screen output: one SVG per page (a scrolling
// output is one tall page, or with scroll-groups one tall page per group,
// the pages differing in height), a PNG of each at 1× and 2×, with
// panel-files one small SVG per term, and an HTML proof page showing every
// page in order at its own size. It returns the files written.
func buildScreen(j *job, p *prepared, dir string, date time.Time) ([]string, error) {
	_ = date // SVG and PNG carry no date; the argument keeps the build calls alike
	out := p.out
	odir := filepath.Join(dir, out.Name)
	n := len(p.plan.Pages)
	var files []string
	var shown []proofItem // what the proof page shows
	for i := range p.plan.Pages {
		pg := &p.plan.Pages[i]
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
		err := writeAtomic(path, func(w io.Writer) error {
			return drawSVG(w, pg.Trim, opts, func(ctx *canvas.Context) error { return p.feat.Draw(ctx, i) })
		})
		if err != nil {
			return nil, err
		}
		files = append(files, path)
	}
	if out.Spreads && out.Flow == specs.FlowPages {
		spreads, err := writeSpreads(j, p, odir)
		if err != nil {
			return nil, err
		}
		files = append(files, spreads...)
		shown = shown[:0]
		for k, sp := range p.plan.Spreads() {
			shown = append(shown, proofItem{filepath.Base(spreads[k]), sp.Sheet.W(), sp.Sheet.H()})
		}
	}
	pngs, skipped, err := writeScreenPNGs(p, odir)
	if err != nil {
		return nil, err
	}
	for _, s := range skipped {
		fmt.Fprintln(os.Stderr, "warning:", s)
	}
	files = append(files, pngs...)
	var panels []string
	if out.PanelFiles {
		panels, err = writePanelFiles(j, p, filepath.Join(odir, "panels"))
		if err != nil {
			return nil, err
		}
		files = append(files, panels...)
	}
	index := filepath.Join(odir, "index.html")
	if err := writeAtomic(index, func(w io.Writer) error {
		return writeProofPage(w, j, p, shown, len(panels))
	}); err != nil {
		return nil, err
	}
	return append(files, index), nil
}

// writeSpreads writes one SVG per spread (dir/spread-NNN.svg): a
// left-hand page and the right-hand page after it side by side, as a
// reader of a magazine app sees them.
func writeSpreads(j *job, p *prepared, odir string) ([]string, error) {
	var files []string
	spreads := p.plan.Spreads()
	for k, sp := range spreads {
		opts := screenSVGOptions(j, p)
		opts.Title = fmt.Sprintf("%s (spread %d of %d)", opts.Title, k+1, len(spreads))
		path := filepath.Join(odir, fmt.Sprintf("spread-%03d.svg", k+1))
		err := writeAtomic(path, func(w io.Writer) error {
			return drawSVG(w, sp.Sheet, opts, func(ctx *canvas.Context) error {
				for _, sg := range sp.Pages {
					ctx.SetView(canvas.Identity.Translate(sg.Offset.X*25.4/72, sg.Offset.Y*25.4/72))
					if err := p.feat.Draw(ctx, sg.Page); err != nil {
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
func screenSVGOptions(j *job, p *prepared) svg.Options {
	return svg.Options{
		Title:      j.spec.Title,
		Desc:       j.spec.Dek,
		FontFamily: p.out.Fonts.Family,
		EmbedFonts: p.out.Fonts.Embed,
		Background: p.feat.PaperColor(),
	}
}

// drawSVG draws the part r (points) of a drawing into an SVG document
// and writes it.
func drawSVG(w io.Writer, r layout.Rect, opts svg.Options, draw func(ctx *canvas.Context) error) error {
	doc, err := svg.NewWindow(r.X0, r.Y0, r.X1, r.Y1, opts)
	if err != nil {
		return err
	}
	if err := draw(canvas.NewContext(doc)); err != nil {
		return err
	}
	_, err = doc.WriteTo(w)
	return err
}

// writeScreenPNGs renders every page at each screen scale, pages in
// parallel. A page too tall for a PNG at a scale is skipped with a
// message.
func writeScreenPNGs(p *prepared, odir string) (files, skipped []string, err error) {
	type task struct {
		page  int
		dpi   float64
		path  string
		index int
	}
	var tasks []task
	for i := range p.plan.Pages {
		pg := &p.plan.Pages[i]
		for _, s := range screenScales {
			if pg.Trim.H()*s.dpi/72 > maxRasterPx || pg.Trim.W()*s.dpi/72 > maxRasterPx {
				skipped = append(skipped, fmt.Sprintf("output %q page %d: %.0f px tall at %g dpi is past the %d px PNG limit; no PNG%s written (the SVG has it all)",
					p.out.Name, i+1, pg.Trim.H()*s.dpi/72, s.dpi, maxRasterPx, s.suffix))
				continue
			}
			tasks = append(tasks, task{page: i, dpi: s.dpi, index: len(tasks),
				path: filepath.Join(odir, fmt.Sprintf("page-%03d%s.png", i+1, s.suffix))})
		}
	}
	errs := make([]error, len(tasks))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for _, t := range tasks {
		wg.Add(1)
		sem <- struct{}{}
		go func(t task) {
			defer func() { <-sem; wg.Done() }()
			img, err := screenPNG(p, t.page, t.dpi)
			if err == nil {
				err = writeAtomic(t.path, func(w io.Writer) error { return raster.WritePNG(w, img) })
			}
			errs[t.index] = err
		}(t)
	}
	wg.Wait()
	for i, t := range tasks {
		if errs[i] != nil {
			return nil, nil, errs[i]
		}
		files = append(files, t.path)
	}
	return files, skipped, nil
}

// screenPNG renders page i's trim box at dpi on the paper colour.
func screenPNG(p *prepared, i int, dpi float64) (image.Image, error) {
	pg := &p.plan.Pages[i]
	r := raster.RegionOf(pg.Media.H(), dpi, pg.Trim.X0, pg.Trim.Y0, pg.Trim.X1, pg.Trim.Y1)
	return raster.DrawRegion(pg.Media.H(), dpi, r, p.feat.PaperColor(), func(ctx *canvas.Context) error {
		return p.feat.Draw(ctx, i)
	})
}

// panelWindow is the part of a page a panel file shows: the panel, the
// tick labels under its plot, and a margin of a quarter gutter.
func panelWindow(plan *layout.Plan, pn layout.Panel) (layout.Panel, layout.Rect) {
	pn.ShowTicks = true
	pn.Ticks = layout.Rect{X0: pn.Plot.X0, Y0: pn.Plot.Y0 - plan.TicksH, X1: pn.Plot.X1, Y1: pn.Plot.Y0}
	pad := plan.Gutter / 4
	box := pn.Box()
	return pn, layout.Rect{X0: box.X0 - pad, Y0: pn.Ticks.Y0 - pad, X1: box.X1 + pad, Y1: box.Y1 + pad}
}

// writePanelFiles writes one SVG per term, named by the term's slug.
func writePanelFiles(j *job, p *prepared, pdir string) ([]string, error) {
	var files []string
	used := map[string]bool{}
	for i := range p.plan.Pages {
		for _, pn := range p.plan.Pages[i].Panels {
			pn, win := panelWindow(p.plan, pn)
			term := j.data.Series[pn.Item].Term
			name := uniqueSlug(slug(term), used)
			title, desc := p.feat.Describe(pn.Item)
			opts := screenSVGOptions(j, p)
			opts.Title, opts.Desc = title, desc
			path := filepath.Join(pdir, name+".svg")
			err := writeAtomic(path, func(w io.Writer) error {
				return drawSVG(w, win, opts, func(ctx *canvas.Context) error { return p.feat.DrawPanel(ctx, pn) })
			})
			if err != nil {
				return nil, err
			}
			files = append(files, path)
		}
	}
	return files, nil
}

// translit spells letters that Unicode decomposition does not split into
// a base letter and marks.
var translit = map[rune]string{
	'ß': "ss", 'æ': "ae", 'Æ': "ae", 'œ': "oe", 'Œ': "oe", 'ø': "o", 'Ø': "o",
	'ł': "l", 'Ł': "l", 'đ': "d", 'Đ': "d", 'ð': "d", 'Ð': "d", 'þ': "th", 'Þ': "th",
	'ı': "i", 'ħ': "h", 'Ħ': "h", '&': "and",
}

// maxSlug bounds a slug's length in bytes, well under every file
// system's name limit.
const maxSlug = 64

// slug turns a term into a file name stem that is safe everywhere: lower
// case ASCII letters and digits joined by single hyphens. Accents are
// dropped after Unicode compatibility decomposition (NFKD: "Café" →
// "cafe"), a few letters are spelled out ("ß" → "ss"), and everything
// else separates words. A term with no Latin letter or digit at all (say,
// Greek or CJK) is named by its code points instead ("u3b1-u3b2"), so two
// such terms never share a name and no percent sign appears.
func slug(term string) string {
	var b strings.Builder
	dash := false
	put := func(s string) {
		if dash && b.Len() > 0 {
			b.WriteByte('-')
		}
		dash = false
		b.WriteString(s)
	}
	for _, r := range norm.NFKD.String(term) {
		switch {
		case unicode.Is(unicode.Mn, r):
			// a combining mark: drop it, keep the base letter
		case r < 0x80 && (unicode.IsLetter(r) || unicode.IsDigit(r)):
			put(string(unicode.ToLower(r)))
		case translit[r] != "":
			put(translit[r])
		default:
			dash = true
		}
	}
	s := b.String()
	if s == "" {
		var parts []string
		for _, r := range term {
			if !unicode.IsSpace(r) {
				parts = append(parts, "u"+strconv.FormatInt(int64(r), 16))
			}
		}
		s = strings.Join(parts, "-")
		if s == "" {
			s = "term"
		}
	}
	if len(s) > maxSlug {
		s = strings.TrimRight(s[:maxSlug], "-")
	}
	return s
}

// uniqueSlug returns s, or s-2, s-3, … the first not yet used, and marks
// it used. Called in panel order, it names colliding terms
// deterministically.
func uniqueSlug(s string, used map[string]bool) string {
	name := s
	for k := 2; used[name]; k++ {
		name = s + "-" + strconv.Itoa(k)
	}
	used[name] = true
	return name
}

// proofItem is one SVG the proof page shows, with its size in points.
type proofItem struct {
	name string
	w, h float64
}

// writeProofPage writes the HTML proof page of a screen output: every
// page's SVG in order, at its own size, each captioned with its name and
// size, the first at the page's top-left corner, so a screenshot of the
// window shows page 1 exactly as a browser draws it.
func writeProofPage(w io.Writer, j *job, p *prepared, items []proofItem, panels int) error {
	var b bytes.Buffer
	esc := html.EscapeString
	title := fmt.Sprintf("%s — %s (screen proof)", j.spec.Title, p.out.Name)
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
		wpx, hpx := it.w*96/72, it.h*96/72
		// HTML's width and height attributes take whole pixels; the
		// caption keeps the SVG's exact size.
		ws, hs := strconv.FormatFloat(roundTo(wpx, 1), 'f', -1, 64), strconv.FormatFloat(roundTo(hpx, 1), 'f', -1, 64)
		wi, hi := strconv.Itoa(int(math.Ceil(wpx-0.05))), strconv.Itoa(int(math.Ceil(hpx-0.05)))
		fmt.Fprintf(&b, "<figure>\n<img src=\"%s\" width=\"%s\" height=\"%s\" alt=\"%s\">\n<figcaption>%s · %s × %s px · %d of %d</figcaption>\n</figure>\n",
			esc(it.name), wi, hi, esc(fmt.Sprintf("%s, %d of %d", j.spec.Title, i+1, len(items))), esc(it.name), ws, hs, i+1, len(items))
	}
	fmt.Fprintf(&b, "<p style=\"padding:0 12px\">%s", esc(p.plan.Summary()))
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
