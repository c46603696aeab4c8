package specs

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"time"

	"gopkg.in/yaml.v3"
)

// maxNodes bounds how many YAML nodes a spec may expand to. Aliases that
// expand exponentially (an "alias bomb") hit it long before they cost
// memory or time.
const maxNodes = 200_000

// Load reads and validates the spec at path.
func Load(path string) (*Spec, error) {
	info, err := os.Stat(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, Errors{{Pos: Pos{File: path}, Msg: "spec file does not exist"}}
		}
		return nil, Errors{{Pos: Pos{File: path}, Msg: err.Error()}}
	}
	if info.IsDir() {
		return nil, Errors{{Pos: Pos{File: path}, Msg: "is a directory; give the spec's YAML file"}}
	}
	data, err := ReadRegular(path, MaxSpecSize)
	if err != nil {
		msg := err.Error()
		var pe *fs.PathError
		if errors.As(err, &pe) {
			msg = pe.Err.Error() // the position names the path
		}
		return nil, Errors{{Pos: Pos{File: path}, Msg: msg}}
	}
	return Parse(path, data)
}

var yamlLine = regexp.MustCompile(`^yaml: line (\d+): (.*)$`)

// Parse validates spec text. file names it in messages and is the base for
// relative paths.
func Parse(file string, data []byte) (*Spec, error) {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, Errors{{Pos: Pos{File: file, Line: 1, Col: 1}, Msg: "the spec is empty; it needs at least data, years and outputs"}}
	}
	var root yaml.Node
	if err := decodeAll(data, &root); err != nil {
		var more *extraDocError
		if errors.As(err, &more) {
			return nil, Errors{{Pos: Pos{File: file, Line: more.line, Col: 1}, Msg: "a second YAML document (after ---); a spec is one document"}}
		}
		return nil, Errors{yamlError(file, data, err)}
	}
	doc := &root
	if doc.Kind == yaml.DocumentNode && len(doc.Content) == 1 {
		doc = doc.Content[0]
	}
	if doc.Kind == 0 || doc.Kind == yaml.DocumentNode || doc.Kind == yaml.ScalarNode && doc.Tag == "!!null" {
		// Only comments or document markers: nothing was said.
		return nil, Errors{{Pos: Pos{File: file, Line: 1, Col: 1}, Msg: "the spec is empty; it needs at least data, years and outputs"}}
	}
	if e := checkAliases(file, doc); e != nil {
		return nil, Errors{e}
	}
	d := &decoder{file: file, pos: map[string]Pos{}, plain: !hasAlias(doc)}
	s := &Spec{File: file, Dir: filepath.Dir(file), positions: d.pos}
	d.spec(doc, s)
	if len(d.errs) > 0 {
		sort.SliceStable(d.errs, func(i, j int) bool {
			a, b := d.errs[i].Pos, d.errs[j].Pos
			return a.Line < b.Line || a.Line == b.Line && a.Col < b.Col
		})
		return nil, d.errs
	}
	return s, nil
}

// extraDocError reports a document after the first.
type extraDocError struct{ line int }

func (e *extraDocError) Error() string { return fmt.Sprintf("line %d: a second YAML document", e.line) }

// decodeAll parses the first YAML document into root and makes sure no
// other follows: yaml.Unmarshal would silently drop the rest.
func decodeAll(data []byte, root *yaml.Node) error {
	return decodeAllFrom(bytes.NewReader(data), root)
}

// decodeAllFrom is decodeAll reading from r.
func decodeAllFrom(r io.Reader, root *yaml.Node) error {
	dec := yaml.NewDecoder(r)
	if err := dec.Decode(root); err != nil && err != io.EOF {
		return err
	}
	var next yaml.Node
	switch err := dec.Decode(&next); {
	case err == io.EOF:
		return nil
	case err != nil:
		return err
	}
	line := next.Line
	if len(next.Content) > 0 {
		line = next.Content[0].Line
	}
	return &extraDocError{line}
}

// checkAliases rejects documents whose aliases expand to more than
// maxNodes nodes (the "billion laughs" shape) or refer to themselves. It
// sizes every node once, so the check is linear in the text, not in the
// expansion. The error points at the first node whose expansion is too big.
func checkAliases(file string, root *yaml.Node) *Error {
	size := map[*yaml.Node]int{}
	const busy = -1
	var bad *Error
	var walk func(n *yaml.Node) int
	walk = func(n *yaml.Node) int {
		if bad != nil {
			return 0
		}
		if s, ok := size[n]; ok && s != busy {
			return s
		}
		size[n] = busy
		total := 1
		if n.Kind == yaml.AliasNode && n.Alias != nil {
			if size[n.Alias] == busy {
				bad = &Error{Pos: Pos{File: file, Line: n.Line, Col: n.Column}, Msg: "a YAML alias refers to a value that contains it; write it out plainly"}
				return 0
			}
			total = walk(n.Alias)
		}
		for _, c := range n.Content {
			total += walk(c)
			if total > maxNodes {
				break
			}
		}
		if total > maxNodes && bad == nil {
			msg := aliasMsg
			if !hasAlias(root) {
				msg = tooManyMsg
			}
			bad = &Error{Pos: Pos{File: file, Line: n.Line, Col: n.Column}, Msg: msg}
		}
		size[n] = total
		return total
	}
	walk(root)
	return bad
}

// yamlError turns a yaml.v3 syntax error into one with a line and column.
// yaml.v3 reports the line where the enclosing construct began (for some
// errors 0-based, for some not at all), so the line is found again in
// linear time: the text is parsed once more through a reader that hands
// the parser one line at a time, so the parser has read at most a line or
// two past the fault when it fails; then a handful of prefixes ending near
// there (and at the line yaml.v3 named) are parsed, and the shortest that
// fails with the same message wins. The column is the line's first
// non-blank character, or the first tab when tabs are the trouble.
func yamlError(file string, data []byte, err error) *Error {
	msg := err.Error()
	line := 1
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		line, _ = strconv.Atoi(m[1])
		msg = m[2]
	} else {
		msg = strings.TrimPrefix(msg, "yaml: ")
	}
	lines := strings.Split(string(data), "\n")
	lr := &lineReader{data: data}
	var n yaml.Node
	_ = decodeAllFrom(lr, &n)
	reached := lr.lines
	candidates := []int{line}
	for k := max(reached-3, 1); k <= reached; k++ {
		candidates = append(candidates, k)
	}
	sort.Ints(candidates)
	for _, k := range candidates {
		if k < 1 || k > len(lines) {
			continue
		}
		if sameYAMLFailure(lineEnd(data, k), msg) {
			line = k
			break
		}
	}
	col := 1
	if line >= 1 && line <= len(lines) {
		text := lines[line-1]
		if strings.Contains(msg, "cannot start any token") || strings.Contains(msg, "tab") {
			for l := max(line-1, 0); l < len(lines) && l <= line; l++ {
				if i := strings.IndexByte(lines[l], '\t'); i >= 0 && strings.TrimLeft(lines[l][:i], " ") == "" {
					return &Error{Pos: Pos{File: file, Line: l + 1, Col: i + 1}, Msg: "a tab is used for indentation; YAML needs spaces"}
				}
			}
		}
		col = len(text) - len(strings.TrimLeft(text, " \t")) + 1
	}
	return &Error{Pos: Pos{File: file, Line: line, Col: col}, Msg: "YAML syntax: " + msg}
}

// sameYAMLFailure reports whether prefix, parsed on its own, fails with
// the syntax message msg.
func sameYAMLFailure(prefix []byte, msg string) bool {
	var n yaml.Node
	perr := decodeAll(append(prefix[:len(prefix):len(prefix)], '\n'), &n)
	if perr == nil || errors.As(perr, new(*extraDocError)) {
		return false
	}
	pm := strings.TrimPrefix(perr.Error(), "yaml: ")
	if m := yamlLine.FindStringSubmatch(perr.Error()); m != nil {
		pm = m[2]
	}
	return pm == msg
}

// lineEnd returns data up to the end of line k (1-based), without its
// newline.
func lineEnd(data []byte, k int) []byte {
	off := 0
	for i := 1; i < k; i++ {
		j := bytes.IndexByte(data[off:], '\n')
		if j < 0 {
			return data
		}
		off += j + 1
	}
	if j := bytes.IndexByte(data[off:], '\n'); j >= 0 {
		return data[:off+j]
	}
	return data
}

// lineReader hands out its data at most one line per Read and counts the
// lines it has begun to hand out, so after a failed parse it says how far
// the parser read.
type lineReader struct {
	data  []byte
	off   int
	lines int
}

func (r *lineReader) Read(p []byte) (int, error) {
	if r.off >= len(r.data) {
		return 0, io.EOF
	}
	rest := r.data[r.off:]
	if i := bytes.IndexByte(rest, '\n'); i >= 0 {
		rest = rest[:i+1]
	}
	n := copy(p, rest)
	if r.off == 0 || r.data[r.off-1] == '\n' {
		r.lines++
	}
	r.off += n
	return n, nil
}

type decoder struct {
	file   string
	errs   Errors
	pos    map[string]Pos
	nodes  int
	plain  bool       // the document has no alias: too many values is its length
	desc   *describer // not nil: describe the key tables for Schema instead of decoding
	screen bool       // decoding a screen output: a unitless length suggests px
}

func (d *decoder) at(n *yaml.Node) Pos { return Pos{File: d.file, Line: n.Line, Col: n.Column} }

func (d *decoder) errorf(n *yaml.Node, format string, args ...any) {
	d.errs.Add(d.at(n), format, args...)
}

// resolve follows aliases and counts nodes against the expansion budget.
func (d *decoder) resolve(n *yaml.Node) *yaml.Node {
	for n != nil && n.Kind == yaml.AliasNode {
		n = n.Alias
	}
	d.nodes++
	return n
}

func (d *decoder) overBudget(n *yaml.Node) bool {
	if d.nodes > maxNodes {
		msg := aliasMsg
		if d.plain {
			msg = tooManyMsg
		}
		if len(d.errs) == 0 || d.errs[len(d.errs)-1].Msg != msg {
			d.errorf(n, "%s", msg)
		}
		return true
	}
	return false
}

const aliasMsg = "the spec expands to too many values (YAML aliases that multiply); write it out plainly"

// tooManyMsg is for a spec with no aliases that is simply that long.
var tooManyMsg = fmt.Sprintf("the spec has more than %d values (keys, list items); sheaf reads specs up to that size: shorten the lists", maxNodes)

// hasAlias reports whether the document under n uses a YAML alias.
func hasAlias(n *yaml.Node) bool {
	if n.Kind == yaml.AliasNode {
		return true
	}
	for _, c := range n.Content {
		if hasAlias(c) {
			return true
		}
	}
	return false
}

// field is one key a mapping accepts.
type field struct {
	name string
	set  func(n *yaml.Node, path string)
}

// mapping decodes a mapping node by its known keys; unknown keys are errors
// with a suggestion. required lists keys that must be present.
func (d *decoder) mapping(n *yaml.Node, path string, fields []field, required ...string) {
	if d.desc != nil {
		d.desc.mapping(n, fields, required)
		return
	}
	n = d.resolve(n)
	if d.overBudget(n) {
		return
	}
	if n.Kind != yaml.MappingNode {
		d.errorf(n, "%s must be a mapping of keys to values, not %s", nameOf(path), kindName(n))
		return
	}
	seen := map[string]bool{}
	names := make([]string, len(fields))
	for i, f := range fields {
		names[i] = f.name
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		key := k.Value
		p := joinPath(path, key)
		if seen[key] {
			d.errorf(k, "%s is given twice", p)
			continue
		}
		seen[key] = true
		var f *field
		for j := range fields {
			if fields[j].name == key {
				f = &fields[j]
			}
		}
		if f == nil {
			d.errorf(k, "unknown key %q in %s%s", key, nameOf(path), didYouMean(key, names))
			continue
		}
		d.pos[p] = d.at(k)
		f.set(v, p)
	}
	for _, r := range required {
		if !seen[r] {
			d.errorf(n, "%s is missing", joinPath(path, r))
		}
	}
}

func joinPath(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func nameOf(path string) string {
	if path == "" {
		return "the spec"
	}
	return path
}

func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.SequenceNode:
		return "a list"
	case yaml.MappingNode:
		return "a mapping"
	case yaml.ScalarNode:
		if n.Tag == "!!null" {
			return "empty"
		}
		return fmt.Sprintf("%q", n.Value)
	}
	return "that"
}

func (d *decoder) scalar(n *yaml.Node, path string) (*yaml.Node, bool) {
	if d.desc != nil {
		d.desc.record(n, map[string]any{"type": []any{"string", "number"}})
		return n, false
	}
	n = d.resolve(n)
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		d.errorf(n, "%s must be a single value, not %s", path, kindName(n))
		return n, false
	}
	return n, true
}

func (d *decoder) str(dst *string) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaString)
			return
		}
		if n, ok := d.scalar(n, path); ok {
			*dst = n.Value
		}
	}
}

func (d *decoder) boolean(dst *bool) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaBool)
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		switch strings.ToLower(n.Value) {
		case "true", "yes", "on":
			*dst = true
		case "false", "no", "off":
			*dst = false
		default:
			d.errorf(n, "%s must be true or false, not %q", path, n.Value)
		}
	}
}

func (d *decoder) integer(dst *int, lo, hi int) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaInteger(lo, hi))
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		v, err := strconv.Atoi(n.Value)
		if err != nil {
			d.errorf(n, "%s must be a whole number, not %q", path, n.Value)
			return
		}
		if v < lo || v > hi {
			d.errorf(n, "%s must be between %d and %d, not %d", path, lo, hi, v)
			return
		}
		*dst = v
	}
}

func (d *decoder) number(dst *float64, lo, hi float64, loOpen bool) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaNumber(lo, hi, loOpen))
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		v, err := strconv.ParseFloat(n.Value, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			d.errorf(n, "%s must be a number, not %q", path, n.Value)
			return
		}
		if v < lo || v > hi || loOpen && v == lo {
			if loOpen {
				d.errorf(n, "%s must be greater than %g and at most %g, not %g", path, lo, hi, v)
			} else {
				d.errorf(n, "%s must be between %g and %g, not %g", path, lo, hi, v)
			}
			return
		}
		*dst = v
	}
}

// length decodes a length with a unit. Zero is allowed only when
// allowZero is set; negative lengths never are.
func (d *decoder) length(dst *Length, allowZero bool) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaLength)
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		l, err := ParseLength(n.Value)
		if err != nil {
			d.errorf(n, "%s: %v", path, forKind(err, d.screen))
			return
		}
		if l > maxLength {
			d.errorf(n, "%s: %s is larger than the largest PDF page (14400 pt, 200 in; ISO 32000-1 Annex C.2)", path, n.Value)
			return
		}
		if l < 0 || l == 0 && !allowZero {
			if allowZero {
				d.errorf(n, "%s must not be negative, not %s", path, n.Value)
			} else {
				d.errorf(n, "%s must be greater than zero, not %s", path, n.Value)
			}
			return
		}
		*dst = l
	}
}

// maxLength bounds every length in a spec: nothing on a page can be
// larger than the page, and PDF pages stop at 14 400 pt.
const maxLength = 14400

func (d *decoder) choice(dst *string, options ...string) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaChoice(options))
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		for _, o := range options {
			if n.Value == o {
				*dst = o
				return
			}
		}
		d.errorf(n, "%s must be one of %s, not %q%s", path, strings.Join(options, ", "), n.Value, didYouMean(n.Value, options))
	}
}

// strings decodes a list of strings; a single string is a list of one.
func (d *decoder) strings(dst *[]string) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaStrings)
			return
		}
		n = d.resolve(n)
		if n.Kind == yaml.ScalarNode && n.Tag != "!!null" {
			*dst = []string{n.Value}
			return
		}
		if n.Kind != yaml.SequenceNode {
			d.errorf(n, "%s must be a list, not %s", path, kindName(n))
			return
		}
		for i, item := range n.Content {
			if d.overBudget(n) {
				return
			}
			p := fmt.Sprintf("%s.%d", path, i)
			if item, ok := d.scalar(item, p); ok {
				d.pos[p] = d.at(item)
				*dst = append(*dst, item.Value)
			}
		}
	}
}

func (d *decoder) spec(n *yaml.Node, s *Spec) {
	var order, group string
	outputsSeen := false
	d.mapping(n, "", []field{
		{"title", func(n *yaml.Node, path string) {
			d.str(&s.Title)(n, path)
			if n.Kind == yaml.ScalarNode && n.Tag == "!!str" && strings.TrimSpace(s.Title) == "" {
				d.errorf(n, "title is empty; every page shows it")
			}
		}},
		{"dek", d.str(&s.Dek)},
		{"source", d.str(&s.Source)},
		{"notes", d.strings(&s.Notes)},
		{"date", func(n *yaml.Node, path string) {
			d.str(&s.Date)(n, path)
			if s.Date == "" {
				return
			}
			v := d.resolve(n)
			if !regexp.MustCompile(`^\d{4}-\d{2}-\d{2}$`).MatchString(s.Date) {
				d.errorf(v, "date must be written YYYY-MM-DD, not %q", s.Date)
			} else if _, err := time.Parse("2006-01-02", s.Date); err != nil {
				d.errorf(v, "date %q is not a day of the calendar", s.Date)
			}
		}},
		{"data", func(n *yaml.Node, path string) {
			d.mapping(n, path, []field{
				{"counts", d.str(&s.Data.Counts)},
				{"totals", d.str(&s.Data.Totals)},
				{"fold-case", d.boolean(&s.Data.FoldCase)},
			}, "counts", "totals")
		}},
		{"years", func(n *yaml.Node, path string) {
			d.mapping(n, path, []field{
				{"from", d.integer(&s.Years.From, 1, 9999)},
				{"to", d.integer(&s.Years.To, 1, 9999)},
			}, "from", "to")
			if s.Years.From != 0 && s.Years.To != 0 && s.Years.To <= s.Years.From {
				d.errorf(n, "years: to (%d) must come after from (%d)", s.Years.To, s.Years.From)
			}
		}},
		{"terms", func(n *yaml.Node, path string) {
			d.mapping(n, path, []field{
				{"list", func(n *yaml.Node, path string) {
					d.strings(&s.Terms.List)(n, path)
					// An empty list would silently mean "every term".
					if v := d.resolve(n); v.Kind == yaml.SequenceNode && len(v.Content) == 0 {
						d.errorf(v, "terms.list is empty; list the terms to show, or leave the key out to choose them by top and min-total")
					}
				}},
				{"top", d.integer(&s.Terms.Top, 1, 1_000_000)},
				{"min-total", d.number(&s.Terms.MinTotal, 0, 1e15, false)},
				{"exclude", d.strings(&s.Terms.Exclude)},
			})
		}},
		{"order", d.choice(&order, string(OrderListed), string(OrderAlpha), string(OrderPeakYear), string(OrderSimilarity))},
		{"group", d.choice(&group, string(GroupNone), string(GroupPeakDecade), string(GroupSimilarity))},
		{"scale", func(n *yaml.Node, path string) {
			var mode, yr string
			d.mapping(n, path, []field{
				{"values", d.choice(&mode, string(ScaleShare), string(ScaleOwnPeak), string(ScaleRaw))},
				{"y-range", d.choice(&yr, string(YShared), string(YOwn))},
				{"rolling", func(n *yaml.Node, path string) { d.rolling(n, path, &s.Scale.Rolling) }},
			})
			s.Scale.Mode, s.Scale.YRange = ScaleMode(mode), YRange(yr)
		}},
		{"palette", func(n *yaml.Node, path string) { d.palette(n, path, &s.Palette) }},
		{"outputs", func(n *yaml.Node, path string) { outputsSeen = true; d.outputs(n, path, s) }},
		{"inserts", func(n *yaml.Node, path string) { d.inserts(n, path, s) }},
		{"language", d.language(&s.Language)},
		{"text", func(n *yaml.Node, path string) { d.text(n, path, &s.Text) }},
		{"annotations", func(n *yaml.Node, path string) { d.annotations(n, path, s) }},
		{"highlights", d.strings(&s.Highlights)},
		{"periods", func(n *yaml.Node, path string) { d.periods(n, path, s) }},
		{"period-bands", d.boolean(&s.PeriodBands)},
		{"preflight", func(n *yaml.Node, path string) {
			p := &s.Preflight
			d.mapping(n, path, []field{
				{"spike-ratio", d.number(&p.SpikeRatio, 1, 1e6, true)},
				{"min-type", d.length(&p.MinType, true)},
				{"min-screen-type", d.length(&p.MinScreenType, true)},
				{"min-line", d.length(&p.MinLine, true)},
				{"strict", d.boolean(&p.Strict)},
				{"min-count", d.number(&p.MinCount, 0, 1e9, false)},
			})
		}},
	}, "data", "years", "outputs")
	s.Order, s.Group = Order(order), Grouping(group)
	if s.Order == "" {
		s.Order = OrderListed
		if len(s.Terms.List) == 0 {
			s.Order = OrderPeakYear
		}
	}
	if s.Group == "" {
		s.Group = GroupNone
	}
	if s.Scale.Mode == "" {
		s.Scale.Mode = ScaleShare
	}
	if s.Scale.YRange == "" {
		s.Scale.YRange = YOwn
		if s.Scale.Mode == ScaleOwnPeak {
			s.Scale.YRange = YShared
		}
	}
	if _, given := d.pos["title"]; !given && n.Kind == yaml.MappingNode {
		d.errs.Add(Pos{File: d.file, Line: 1, Col: 1}, "title is missing; every page shows it")
	}
	if outputsSeen && len(s.Outputs) == 0 && len(d.errs) == 0 {
		d.errs.Add(s.Where("outputs"), "outputs: give at least one output")
	}
	d.checkInserts(s)
	d.checkEditorial(s)
	d.checkPress(s)
	d.palettePaper(&s.Palette)
	preflightDefaults(&s.Preflight, d.pos)
}

// preflightDefaults fills the thresholds the spec leaves out: spikes at 4×
// the next-highest year, type at 5 pt in print and 10 px on screen, rules
// at 0.25 pt (common practice for figure text and hairlines on press).
// A key given as 0 turns its check off.
func preflightDefaults(p *Preflight, given map[string]Pos) {
	set := func(key string) bool { _, ok := given["preflight."+key]; return ok }
	if !set("spike-ratio") {
		p.SpikeRatio = 4
	}
	if !set("min-type") {
		p.MinType = 5
	}
	if !set("min-screen-type") {
		p.MinScreenType = 7.5 // 10 px
	}
	if !set("min-line") {
		p.MinLine = 0.25
	}
	if !set("min-count") {
		// Poisson noise is 1/√k of a count k: 1/√10 ≈ 32 % (common practice).
		p.MinCount = 10
	}
}

// maxRolling bounds the rolling window: wider than a lifetime smooths a
// history away.
const maxRolling = 99

// rolling reads scale.rolling: {years: N}, a centred window of an odd
// number of years (so that it has a middle year); 1 is no smoothing.
func (d *decoder) rolling(n *yaml.Node, path string, dst *int) {
	years := 0
	d.mapping(n, path, []field{
		{"years", d.integer(&years, 1, maxRolling)},
	}, "years")
	if years > 1 && years%2 == 0 {
		d.errorf(d.resolve(n), "%s.years: a centred window needs an odd number of years (%d or %d), not %d", path, years-1, years+1, years)
		return
	}
	if years > 1 {
		*dst = years
	}
}

func (d *decoder) palettePaper(p *Palette) {
	if p.Paper.Text == "" {
		p.Paper = Color{Space: SpaceSRGB, V: [3]float64{1, 1, 1}, Text: "#ffffff"}
	}
	c := &p.Checks
	if c.MinStep == 0 {
		c.MinStep = 5
	}
	if c.MinSpan == 0 {
		c.MinSpan = 30
	}
	if c.MinContrast == 0 {
		c.MinContrast = 3
	}
	if c.MinCVDStep == 0 {
		c.MinCVDStep = 2
	}
	if c.Lightness == "" {
		c.Lightness = "monotone"
	}
}

func (d *decoder) palette(n *yaml.Node, path string, p *Palette) {
	d.mapping(n, path, []field{
		{"paper", func(n *yaml.Node, path string) { d.color(n, path, &p.Paper) }},
		{"anchors", func(n *yaml.Node, path string) {
			n = d.resolve(n)
			if n.Kind != yaml.SequenceNode {
				d.errorf(n, "%s must be a list of {year, color}, not %s", path, kindName(n))
				return
			}
			for i, item := range n.Content {
				var a Anchor
				var year float64 = math.NaN()
				p2 := fmt.Sprintf("%s.%d", path, i)
				d.mapping(item, p2, []field{
					{"year", d.number(&year, 1, 9999, false)},
					{"color", func(n *yaml.Node, path string) { d.color(n, path, &a.Color) }},
				}, "year", "color")
				if !math.IsNaN(year) && a.Color.Text != "" {
					a.Year = year
					if k := len(p.Anchors); k > 0 && p.Anchors[k-1].Year >= year {
						d.errorf(item, "%s: anchor years must increase (%g after %g)", p2, year, p.Anchors[k-1].Year)
					}
					p.Anchors = append(p.Anchors, a)
				}
			}
			if len(p.Anchors) == 1 {
				d.errorf(n, "%s: give at least two anchors, or none for the built-in palette", path)
			}
		}},
		{"eras", func(n *yaml.Node, path string) {
			n = d.resolve(n)
			if n.Kind != yaml.SequenceNode {
				d.errorf(n, "%s must be a list of boundary years, like [1900, 1945, 1990]", path)
				return
			}
			for i, item := range n.Content {
				var y int
				d.integer(&y, 1, 9999)(item, fmt.Sprintf("%s.%d", path, i))
				if y != 0 {
					if k := len(p.Eras); k > 0 && p.Eras[k-1] >= y {
						d.errorf(item, "%s: era boundaries must increase (%d after %d)", path, y, p.Eras[k-1])
					}
					p.Eras = append(p.Eras, y)
				}
			}
		}},
		{"checks", func(n *yaml.Node, path string) {
			c := &p.Checks
			d.mapping(n, path, []field{
				{"min-step", d.number(&c.MinStep, 0, 100, true)},
				{"min-span", d.number(&c.MinSpan, 0, 200, true)},
				{"min-contrast", d.number(&c.MinContrast, 1, 21, false)},
				{"min-cvd-step", d.number(&c.MinCVDStep, 0, 100, true)},
				{"lightness", d.choice(&c.Lightness, "monotone", "increasing", "decreasing", "any")},
			})
		}},
	})
}

var (
	hexColor  = regexp.MustCompile(`^#([0-9a-fA-F]{6}|[0-9a-fA-F]{3})$`)
	funcColor = regexp.MustCompile(`^(lab|oklch)\(\s*([-+0-9.eE]+)(%?)[\s,]+([-+0-9.eE]+)[\s,]+([-+0-9.eE]+)(deg)?\s*\)$`)
)

// color reads "#rrggbb", "#rgb", "lab(L a b)" or "oklch(L C h)" (L as
// 0–1 or a percentage), after CSS Color 4's notations.
func (d *decoder) color(n *yaml.Node, path string, dst *Color) {
	parsed(d, ParseColor, dst)(n, path)
}

// parsed decodes a scalar written as text and read by parse (a colour, a
// language): the schema sees a string, and parse's error is reported at
// the value.
func parsed[T any](d *decoder, parse func(string) (T, error), dst *T) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaString)
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		v, err := parse(n.Value)
		if err != nil {
			d.errorf(n, "%s: %v", path, err)
			return
		}
		*dst = v
	}
}

// ParseColor reads a colour in one of the spec's notations.
func ParseColor(text string) (Color, error) {
	t := strings.TrimSpace(text)
	if m := hexColor.FindStringSubmatch(t); m != nil {
		h := m[1]
		if len(h) == 3 {
			h = string([]byte{h[0], h[0], h[1], h[1], h[2], h[2]})
		}
		v, _ := strconv.ParseUint(h, 16, 32)
		return Color{Space: SpaceSRGB, Text: t, V: [3]float64{
			float64(v>>16&0xff) / 255, float64(v>>8&0xff) / 255, float64(v&0xff) / 255}}, nil
	}
	if m := funcColor.FindStringSubmatch(strings.ToLower(t)); m != nil {
		var v [3]float64
		for i, s := range []string{m[2], m[4], m[5]} {
			f, err := strconv.ParseFloat(s, 64)
			if err != nil {
				return Color{}, fmt.Errorf("%q: %q is not a number", text, s)
			}
			v[i] = f
		}
		if m[1] == "lab" {
			if v[0] < 0 || v[0] > 100 {
				return Color{}, fmt.Errorf("%q: L* must be between 0 and 100", text)
			}
			return Color{Space: SpaceLab, V: v, Text: t}, nil
		}
		if m[3] == "%" {
			v[0] /= 100
		}
		if v[0] < 0 || v[0] > 1 || v[1] < 0 {
			return Color{}, fmt.Errorf("%q: OKLCh needs L between 0 and 1 (or 0%%–100%%) and C ≥ 0", text)
		}
		return Color{Space: SpaceOKLCh, V: v, Text: t}, nil
	}
	return Color{}, fmt.Errorf("%q is not a colour; write #rrggbb, lab(L a b) or oklch(L C h)", text)
}
