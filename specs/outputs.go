package specs

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"
)

// DefaultOutput returns the settings an output of kind k starts from.
// They are chosen to give a handsome page with no further keys: a print
// output is an A4 page of six columns with 3 mm bleed; a screen output is
// a 1200 px wide scrolling page.
func DefaultOutput(name string, k Kind) Output {
	if k == Screen {
		px := func(v float64) Length { return Length(v * PtPerPx) }
		return Output{
			Name: name, Kind: Screen,
			Trim:          Size{W: px(1200)},
			Margins:       Margins{px(32), px(32), px(32), px(32)},
			MinPanelWidth: px(170),
			Gutter:        px(20), RowGap: px(18),
			PanelAspect: 1.6, Slack: SlackSpread,
			Fonts: Fonts{Family: `"DejaVu Sans Condensed", sans-serif`},
			Type: TypeSizes{Title: px(34), Dek: px(17), Label: px(14), Ticks: px(11), Key: px(12),
				Notes: px(12), Folio: px(12), Heading: px(16), Leading: 1.3},
			Line:  px(1.75),
			Ticks: TicksBottomRow, PeakDot: true,
			LabelLines: 2,
			Flow:       FlowScroll,
			// About one and a half screens of a laptop (1600 px): a reader
			// never scrolls more than a screen back up to decode colour.
			KeyEvery: px(1600),
		}
	}
	mm := func(v float64) Length { return Length(v * PtPerMm) }
	return Output{
		Name: name, Kind: Print,
		Trim:    Size{mm(210), mm(297)},
		Bleed:   mm(3),
		Slug:    mm(10),
		Margins: Margins{Top: mm(14), Bottom: mm(13), Inside: mm(16), Outside: mm(13)},
		Facing:  true,
		Columns: 6,
		Gutter:  mm(4), RowGap: mm(3),
		PanelAspect: 1.6, Slack: SlackSpread,
		Type: TypeSizes{Title: 22, Dek: 9.5, Label: 7, Ticks: 5.5, Key: 6.5,
			Notes: 6, Folio: 7, Heading: 8, Leading: 1.25},
		Line:  0.75,
		Ticks: TicksBottomRow, PeakDot: true,
		LabelLines: 2,
		Marks:      true, Proofs: 150,
	}
}

// usBleed is the bleed a US trim gets when none is given: North American
// printers usually ask 0.125 in (common practice), European ones 3 mm.
const usBleed = Length(0.125 * PtPerIn)

// usTrimText reports whether a trim is a US one: Letter, Tabloid, or
// given in inches.
func usTrimText(t string) bool {
	t = strings.ToLower(t)
	return strings.HasPrefix(strings.TrimSpace(t), "letter") || strings.HasPrefix(strings.TrimSpace(t), "tabloid") || inches.MatchString(t)
}

var inches = regexp.MustCompile(`[0-9.]\s*in\b`)

var outputName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$`)

func (d *decoder) outputs(n *yaml.Node, path string, s *Spec) {
	n = d.resolve(n)
	if n.Kind != yaml.MappingNode {
		d.errorf(n, "outputs must be a mapping of output names to settings, like\n  outputs:\n    print: {kind: print, trim: A4}")
		return
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		name := k.Value
		p := joinPath(path, name)
		d.pos[p] = d.at(k)
		if !outputName.MatchString(name) {
			d.errorf(k, "output name %q: use letters, digits, - and _ (it names a folder)", name)
			continue
		}
		if s.Output(name) != nil {
			d.errorf(k, "output %q is given twice", name)
			continue
		}
		s.Outputs = append(s.Outputs, d.output(v, p, name))
	}
}

func (d *decoder) output(n *yaml.Node, path, name string) Output {
	n = d.resolve(n)
	kind := Print
	if n.Kind == yaml.MappingNode {
		for i := 0; i+1 < len(n.Content); i += 2 {
			if n.Content[i].Value == "kind" {
				if v := d.resolve(n.Content[i+1]); v.Kind == yaml.ScalarNode && v.Value == string(Screen) {
					kind = Screen
				}
			}
		}
	}
	o := DefaultOutput(name, kind)
	var kindText, firstPage, slack, ticks, flow string
	trimSet, keyEverySet := false, false
	d.screen = kind == Screen
	defer func() { d.screen = false }()
	bleedSet, usTrim := false, false
	d.mapping(n, path, []field{
		{"kind", d.choice(&kindText, string(Print), string(Screen))},
		{"trim", func(n *yaml.Node, path string) {
			n, ok := d.scalar(n, path)
			if !ok {
				return
			}
			usTrim = usTrimText(n.Value)
			sz, err := ParseSize(n.Value, kind == Screen)
			if err != nil {
				d.errorf(n, "%s: %v", path, err)
				return
			}
			if sz.W <= 0 || sz.H < 0 || sz.H == 0 && kind == Print {
				d.errorf(n, "%s: width and height must be greater than zero", path)
				return
			}
			// A screen page is bounded as a PDF page is (print pages are
			// checked with bleed and slug below): a width of 1e20px would
			// overflow every integer it meets.
			if kind == Screen && (sz.W > maxLength || sz.H > maxLength) {
				d.errorf(n, "%s: %s is larger than a screen page may be (19200 px, 14400 pt)", path, n.Value)
				return
			}
			o.Trim, trimSet = sz, true
		}},
		{"bleed", func(n *yaml.Node, path string) { bleedSet = true; d.length(&o.Bleed, true)(n, path) }},
		{"slug", d.length(&o.Slug, true)},
		{"margins", func(n *yaml.Node, path string) {
			n = d.resolve(n)
			if n.Kind == yaml.ScalarNode {
				var l Length
				d.length(&l, true)(n, path)
				o.Margins = Margins{l, l, l, l}
				return
			}
			d.mapping(n, path, []field{
				{"top", d.length(&o.Margins.Top, true)},
				{"bottom", d.length(&o.Margins.Bottom, true)},
				{"inside", d.length(&o.Margins.Inside, true)},
				{"outside", d.length(&o.Margins.Outside, true)},
			})
		}},
		{"facing", d.boolean(&o.Facing)},
		{"first-page", d.choice(&firstPage, "right", "left")},
		{"columns", d.integer(&o.Columns, 1, 100)},
		{"min-panel-width", d.length(&o.MinPanelWidth, false)},
		{"gutter", d.length(&o.Gutter, true)},
		{"row-gap", d.length(&o.RowGap, true)},
		{"panel", func(n *yaml.Node, path string) {
			aspect := math.NaN()
			var h Length
			bank := false
			d.mapping(n, path, []field{
				{"aspect", func(n *yaml.Node, path string) {
					// "bank": the aspect is chosen from the data (layout/bank).
					if v := d.resolve(n); v.Kind == yaml.ScalarNode && v.Value == "bank" {
						bank, aspect = true, 0
						return
					} else if _, err := strconv.ParseFloat(v.Value, 64); v.Kind == yaml.ScalarNode && err != nil {
						d.errorf(v, "%s must be a number (plot width ÷ height) or bank, not %q%s", path, v.Value, didYouMean(v.Value, []string{"bank"}))
						return
					}
					d.number(&aspect, 0, 100, true)(n, path)
				}},
				{"height", d.length(&h, false)},
			})
			if !math.IsNaN(aspect) && h > 0 {
				d.errorf(n, "%s: give aspect or height, not both", path)
			}
			if !math.IsNaN(aspect) {
				o.PanelAspect, o.PanelHeight, o.PanelBank = aspect, 0, bank
			}
			if h > 0 {
				o.PanelHeight = h
			}
		}},
		{"slack", d.choice(&slack, string(SlackSpread), string(SlackGrow))},
		{"balance", d.boolean(&o.Balance)},
		{"floor", func(n *yaml.Node, path string) {
			d.mapping(n, path, []field{
				{"width", d.length(&o.FloorWidth, false)},
				{"height", d.length(&o.FloorHeight, false)},
			})
		}},
		{"fonts", func(n *yaml.Node, path string) {
			d.mapping(n, path, []field{
				{"regular", d.fontFile(&o.Fonts.Regular, &o.Fonts.RegularFace)},
				{"bold", d.fontFile(&o.Fonts.Bold, &o.Fonts.BoldFace)},
				{"family", d.str(&o.Fonts.Family)},
				{"embed", d.boolean(&o.Fonts.Embed)},
			})
		}},
		{"type", func(n *yaml.Node, path string) {
			t := &o.Type
			d.mapping(n, path, []field{
				{"title", d.length(&t.Title, false)},
				{"dek", d.length(&t.Dek, false)},
				{"label", d.length(&t.Label, false)},
				{"ticks", d.length(&t.Ticks, false)},
				{"key", d.length(&t.Key, false)},
				{"notes", d.length(&t.Notes, false)},
				{"folio", d.length(&t.Folio, false)},
				{"heading", d.length(&t.Heading, false)},
				{"leading", d.number(&t.Leading, 0.8, 3, false)},
			})
		}},
		{"line", d.length(&o.Line, false)},
		{"ticks", d.choice(&ticks, string(TicksBottomRow), string(TicksEveryPanel))},
		{"peak-dot", d.boolean(&o.PeakDot)},
		{"label-lines", d.integer(&o.LabelLines, 1, 3)},
		{"running-head", d.str(&o.Running)},
		{"marks", d.boolean(&o.Marks)},
		{"slug-line", d.boolean(&o.SlugLine)},
		{"proofs", d.number(&o.Proofs, 10, 1200, false)},
		{"flow", d.choice(&flow, string(FlowPages), string(FlowScroll), string(FlowScrollGroups))},
		{"panel-files", d.boolean(&o.PanelFiles)},
		{"spreads", d.boolean(&o.Spreads)},
		{"key-every", func(n *yaml.Node, path string) {
			// A bare 0 is allowed: with no distance, no unit is needed.
			if v := d.resolve(n); v.Kind == yaml.ScalarNode && v.Value == "0" {
				o.KeyEvery, keyEverySet = 0, true
				return
			}
			o.KeyEvery = 0
			d.length(&o.KeyEvery, true)(n, path)
			keyEverySet = true
		}},
		{"press", func(n *yaml.Node, path string) { o.Press = d.press(n, path) }},
		{"band", func(n *yaml.Node, path string) { d.level(n, path, &o.Band) }},
	}, "kind")
	at := func(key string) *yaml.Node {
		if p, ok := d.pos[path+"."+key]; ok {
			return &yaml.Node{Line: p.Line, Column: p.Col}
		}
		return n
	}
	o.FirstPageLeft = firstPage == "left"
	if kind == Print && usTrim && !bleedSet {
		o.Bleed = usBleed
	}
	if slack != "" {
		o.Slack = Slack(slack)
	}
	if ticks != "" {
		o.Ticks = TickPlacement(ticks)
	}
	if flow != "" {
		o.Flow = Flow(flow)
	}
	if kind == Screen && trimSet && o.Trim.H > 0 && flow == "" {
		o.Flow = FlowPages
	}
	if kind == Screen && o.Flow == FlowPages && o.Trim.H == 0 {
		d.errorf(n, "%s: flow pages needs a page height, like trim: 1200px x 1600px", path)
	}
	if kind == Screen && o.Spreads && o.Flow.Scrolls() {
		d.errorf(at("spreads"), "%s.spreads: spreads pair a left and a right page; flow %s has no facing pages (use flow: pages with a trim height, like 900px x 1200px)", path, o.Flow)
	}
	switch {
	case kind == Print && keyEverySet:
		d.errorf(at("key-every"), "%s.key-every: the colour key repeats down scrolling screen pages; every print page carries its own key", path)
	case kind == Screen && !o.Flow.Scrolls() && keyEverySet:
		d.errorf(at("key-every"), "%s.key-every: the colour key repeats down scrolling pages; with flow %s every page carries its own key (use flow: scroll or scroll-groups)", path, o.Flow)
	case !o.Flow.Scrolls():
		o.KeyEvery = 0 // the default is for scrolling pages only
	}
	if kind == Screen && (o.Bleed > 0 || o.Marks || o.SlugLine) {
		d.errorf(n, "%s: bleed, marks and slug-line are for print outputs", path)
	}
	if kind == Screen && o.Press != nil {
		d.errorf(at("press"), "%s.press: a printing condition is for print outputs; screen colours are sRGB", path)
		o.Press = nil
	}
	if kind == Print && (o.Spreads || o.PanelFiles || flow != "") {
		d.errorf(n, "%s: flow, spreads and panel-files are for screen outputs", path)
	}
	// Whether the slug holds the crop marks is the layout's to say: it
	// owns the one crop-mark rule (layout.CropMarks).
	// Compare with a little slack: margins that use up the page exactly
	// should not slip through on rounding (110 mm + 100 mm vs 210 mm).
	const eps = 1e-6
	if kind == Print {
		// ISO 32000-1 Annex C.2: page sizes outside 3–14 400 units are not
		// portable; the media box adds bleed and slug on each side.
		media := func(l Length) Length { return l + 2*(o.Bleed+o.Slug) }
		if mw, mh := media(o.Trim.W), media(o.Trim.H); mw > 14400 || mh > 14400 {
			d.errorf(at("trim"), "%s: with bleed and slug the page is %.0f × %.0f pt; PDF pages stop at 14400 pt (200 in, ISO 32000-1 Annex C.2)", path, mw.Pt(), mh.Pt())
		} else if px := max(mw, mh).Pt() * o.Proofs / 72; px > maxProofPixels {
			d.errorf(at("proofs"), "%s: proofs at %g dpi would be %.0f pixels across; the most is %d — lower proofs", path, o.Proofs, px, maxProofPixels)
		} else if area := o.Trim.W.Pt() * o.Trim.H.Pt() * (o.Proofs / 72) * (o.Proofs / 72); area > MaxRasterPixels {
			d.errorf(at("proofs"), "%s: proofs at %g dpi would be %.0f million pixels; the most sheaf draws in one image is %d million — lower proofs", path, o.Proofs, area/1e6, MaxRasterPixels/1_000_000)
		}
	}
	if w := o.Margins.Inside + o.Margins.Outside; w >= o.Trim.W-eps {
		d.errorf(at("margins"), "%s: the inside and outside margins (%s together) leave no room on a %s wide page", path, o.Describe(w), o.Describe(o.Trim.W))
	}
	if h := o.Margins.Top + o.Margins.Bottom; o.Trim.H > 0 && h >= o.Trim.H-eps {
		d.errorf(at("margins"), "%s: the top and bottom margins (%s together) leave no room on a %s tall page", path, o.Describe(h), o.Describe(o.Trim.H))
	}
	return o
}

// level reads a confidence level written as a percentage, "95%", or
// none (no band). Levels from 50 % to 99.9 % are allowed: below, the
// band says little; above, it is mostly the tail of the distribution.
func (d *decoder) level(n *yaml.Node, path string, dst *float64) {
	n, ok := d.scalar(n, path)
	if !ok {
		return
	}
	v := strings.TrimSpace(n.Value)
	if v == "none" || v == "false" || v == "off" || v == "no" {
		*dst = 0
		return
	}
	num, pct := strings.CutSuffix(v, "%")
	f, err := strconv.ParseFloat(strings.TrimSpace(num), 64)
	if !pct || err != nil || math.IsNaN(f) {
		d.errorf(n, "%s must be a confidence level such as 95%% (or none), not %q", path, n.Value)
		return
	}
	if f < 50 || f > 99.9 {
		d.errorf(n, "%s must be between 50%% and 99.9%%, not %s", path, n.Value)
		return
	}
	*dst = f / 100
}

// maxProofPixels bounds a proof image's side, as render/raster does.
const maxProofPixels = 40000

// MaxRasterPixels bounds the pixels of any one image sheaf draws (a
// proof, a screen PNG, an insert's PNG), so that the memory of one
// graphic is bounded: 4 bytes a pixel, about 400 MB, and the
// rasterizer's coverage buffer beside it.
const MaxRasterPixels = 100_000_000

func mmPt(v float64) Length { return Length(v * PtPerMm) }

// InsertsFolder is the folder of the output folder that inserts are
// written to.
const InsertsFolder = "inserts"

func (d *decoder) inserts(n *yaml.Node, path string, s *Spec) {
	n = d.resolve(n)
	if n.Kind != yaml.MappingNode {
		d.errorf(n, "inserts must be a mapping of insert names to settings")
		return
	}
	seen := map[string]*yaml.Node{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		p := joinPath(path, k.Value)
		if first, dup := seen[k.Value]; dup {
			// The second would overwrite the first's files.
			d.errorf(k, "insert %q is given twice (first at line %d)", k.Value, first.Line)
			continue
		}
		seen[k.Value] = k
		d.pos[p] = d.at(k)
		if !outputName.MatchString(k.Value) {
			d.errorf(k, "insert name %q: use letters, digits, - and _ (it names a file)", k.Value)
			continue
		}
		in := Insert{Name: k.Value, Compare: CompareRows}
		var size, compare string
		d.mapping(v, p, []field{
			{"output", d.str(&in.Output)},
			{"size", d.str(&size)},
			{"terms", d.strings(&in.Terms)},
			{"title", d.str(&in.Title)},
			{"compare", d.choice(&compare, string(CompareRows), string(CompareOverlay))},
		}, "output", "size", "terms")
		if compare != "" {
			in.Compare = Compare(compare)
		}
		if size != "" {
			sz, err := ParseSize(size, false)
			switch {
			case err != nil:
				d.errs.Add(s.Where(p+".size"), "%s.size: %v", p, err)
			case sz.W > maxLength || sz.H > maxLength:
				// One limit for both kinds: a PDF page (ISO 32000-1 Annex
				// C.2); a screen insert is further bounded by its PNG's
				// pixels (checkInserts).
				d.errs.Add(s.Where(p+".size"), "%s.size: %s is larger than the largest PDF page (14400 pt, 200 in; ISO 32000-1 Annex C.2)", p, size)
			default:
				in.Size = sz
			}
		}
		if len(in.Terms) == 0 {
			d.errs.Add(s.Where(p+".terms"), "%s.terms: an insert shows 1 to 4 terms; the list is empty", p)
		}
		if len(in.Terms) > 4 {
			d.errs.Add(s.Where(p+".terms"), "%s.terms: an insert shows 1 to 4 terms, not %d", p, len(in.Terms))
		}
		s.Inserts = append(s.Inserts, in)
	}
}

func (d *decoder) checkInserts(s *Spec) {
	// Inserts are written to the folder "inserts" beside the outputs'
	// folders: an output of that name would share it, and an insert could
	// overwrite its pages.
	if o := s.Output(InsertsFolder); o != nil && len(s.Inserts) > 0 {
		d.errs.Add(s.Where("outputs."+o.Name), "output %q: the spec has inserts, which are written to the folder %q; give the output another name", o.Name, InsertsFolder)
	}
	for _, in := range s.Inserts {
		if o := s.Output(in.Output); o != nil && o.Kind == Screen {
			// The 2× PNG (192 dpi) is the largest raster of an insert.
			if px := in.Size.W.Pt() * in.Size.H.Pt() * (192.0 / 72) * (192.0 / 72); px > MaxRasterPixels {
				d.errs.Add(s.Where("inserts."+in.Name+".size"), "inserts.%s.size: its 2× PNG would be %.0f million pixels; the most sheaf draws in one image is %d million (about %d MiB): make it smaller", in.Name, px/1e6, MaxRasterPixels/1_000_000, MaxRasterPixels*4>>20)
			}
		}
		if in.Output != "" && s.Output(in.Output) == nil {
			var names []string
			for _, o := range s.Outputs {
				names = append(names, o.Name)
			}
			d.errs.Add(s.Where("inserts."+in.Name+".output"), "inserts.%s.output: no output named %q%s", in.Name, in.Output, didYouMean(in.Output, names))
		}
	}
}

// String describes a length in the unit its medium uses.
func (o *Output) Describe(l Length) string {
	if o.Kind == Screen {
		return strconv.FormatFloat(math.Round(l.Px()*100)/100, 'f', -1, 64) + " px"
	}
	return fmt.Sprintf("%.1f mm", l.Mm())
}

// fontFile reads a font as a path, or as {path, face} where face picks a
// face of a collection by full name (a string) or index (an integer).
func (d *decoder) fontFile(path *string, face *FaceRef) func(*yaml.Node, string) {
	return func(n *yaml.Node, p string) {
		if v := d.resolve(n); v.Kind != yaml.MappingNode {
			d.str(path)(n, p)
			return
		}
		d.mapping(n, p, []field{
			{"path", d.str(path)},
			{"face", func(n *yaml.Node, p string) {
				v, ok := d.scalar(n, p)
				if !ok {
					return
				}
				if v.Tag == "!!int" {
					i, err := strconv.Atoi(v.Value)
					if err != nil || i < 0 || i > 65535 {
						d.errorf(v, "%s: a face index is a whole number from 0, not %s", p, v.Value)
						return
					}
					*face = FaceRef{Index: i}
					return
				}
				if v.Value == "" {
					d.errorf(v, "%s: name the face (its full name) or give its index", p)
					return
				}
				*face = FaceRef{Name: v.Value}
			}},
		}, "path")
	}
}
