// Package cff reads the Compact Font Format table of an OpenType font
// (Adobe Technical Note #5176, "The Compact Font Format Specification")
// and writes subsets of it as CID-keyed CFF, the font program a PDF
// CIDFontType0 font embeds (ISO 32000-1 §9.9, FontFile3 /CIDFontType0C).
//
// Name-keyed and CID-keyed fonts are both read. A subset keeps glyph IDs:
// its charset maps CID n to glyph n, so text encoded with glyph IDs before
// the subset was known stays valid. Glyphs not kept become empty
// charstrings, and subroutines no kept glyph calls become empty too (their
// numbering, hence every call's bias, is unchanged).
//
// Only CFF version 1 is read; CFF2 (variable fonts) is refused.
package cff

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"sort"
)

// Font is a parsed CFF table. It is read-only once made.
type Font struct {
	// Name is the font's name from the Name INDEX.
	Name string
	// CIDKeyed says the font has a ROS operator (Registry-Ordering-
	// Supplement): glyphs are keyed by CID and Font DICTs come from
	// FDArray and FDSelect.
	CIDKeyed bool

	top         []byte // Top DICT entries kept in subsets, already encoded
	charStrings index
	gsubrs      index
	fds         []fontDict
	fdSelect    []uint8 // per glyph; nil for a name-keyed font (all FD 0)
}

type fontDict struct {
	own     []byte // Font DICT entries besides Private (FontMatrix), encoded
	private []byte // Private DICT entries besides Subrs, encoded
	subrs   index
}

// NumGlyphs is the number of charstrings.
func (f *Font) NumGlyphs() int { return f.charStrings.count() }

// Error is a malformed CFF table.
type Error struct{ Msg string }

func (e *Error) Error() string { return "CFF: " + e.Msg }

func errf(format string, a ...any) error { return &Error{fmt.Sprintf(format, a...)} }

// index is a CFF INDEX (TN #5176 §5): object i is data[off[i]:off[i+1]].
type index struct {
	data []byte
	off  []uint32
}

func (x index) count() int {
	if len(x.off) == 0 {
		return 0
	}
	return len(x.off) - 1
}

func (x index) get(i int) []byte { return x.data[x.off[i]:x.off[i+1]] }

// readIndex reads an INDEX at b[p:] and returns it and the offset after it.
func readIndex(b []byte, p int, what string) (index, int, error) {
	if p < 0 || p+2 > len(b) {
		return index{}, 0, errf("%s INDEX at %d is past the table's end (%d bytes)", what, p, len(b))
	}
	n := int(binary.BigEndian.Uint16(b[p:]))
	if n == 0 {
		return index{}, p + 2, nil
	}
	if p+3 > len(b) {
		return index{}, 0, errf("%s INDEX at %d is cut short", what, p)
	}
	size := int(b[p+2])
	if size < 1 || size > 4 {
		return index{}, 0, errf("%s INDEX at %d has offset size %d", what, p, size)
	}
	start := p + 3
	dataStart := start + (n+1)*size - 1 // offsets count from 1
	if dataStart+1 > len(b) {
		return index{}, 0, errf("%s INDEX at %d: %d offsets run past the table's end", what, p, n+1)
	}
	off := make([]uint32, n+1)
	for i := range off {
		var v uint32
		for _, c := range b[start+i*size : start+(i+1)*size] {
			v = v<<8 | uint32(c)
		}
		if v < 1 || i > 0 && v < off[i-1]+1 {
			return index{}, 0, errf("%s INDEX at %d: offset %d out of order", what, p, i)
		}
		off[i] = v - 1
	}
	end := dataStart + 1 + int(off[n])
	if end > len(b) || end < dataStart {
		return index{}, 0, errf("%s INDEX at %d: data runs past the table's end", what, p)
	}
	return index{data: b[dataStart+1 : end], off: off}, end, nil
}

// DICT operators (TN #5176 Tables 9, 10, 23; escaped ones as 1200+op).
const (
	opCharset     = 15
	opEncoding    = 16
	opCharStrings = 17
	opPrivate     = 18
	opSubrs       = 19
	opFontMatrix  = 1207
	opROS         = 1230
	opFDArray     = 1236
	opFDSelect    = 1237
	opSyntheticBs = 1220
)

// topKept are the Top DICT operators a subset keeps: the geometry a
// renderer needs. Name strings (SIDs) are dropped, so the subset needs no
// strings but the ROS's.
var topKept = map[int]bool{
	1201: true, // isFixedPitch
	1202: true, // ItalicAngle
	1203: true, // UnderlinePosition
	1204: true, // UnderlineThickness
	1205: true, // PaintType
	1206: true, // CharstringType
	1207: true, // FontMatrix
	1208: true, // StrokeWidth
	5:    true, // FontBBox
}

type entry struct {
	op   int
	args []float64
	raw  []byte // operands and operator as written
}

// parseDict splits a DICT into entries.
func parseDict(b []byte, what string) ([]entry, error) {
	var out []entry
	var args []float64
	start := 0
	for p := 0; p < len(b); {
		c := b[p]
		switch {
		case c <= 21:
			op := int(c)
			p++
			if c == 12 {
				if p >= len(b) {
					return nil, errf("%s DICT ends inside an operator", what)
				}
				op = 1200 + int(b[p])
				p++
			}
			out = append(out, entry{op: op, args: args, raw: b[start:p]})
			args, start = nil, p
		case c == 28:
			if p+3 > len(b) {
				return nil, errf("%s DICT ends inside a number", what)
			}
			args = append(args, float64(int16(binary.BigEndian.Uint16(b[p+1:]))))
			p += 3
		case c == 29:
			if p+5 > len(b) {
				return nil, errf("%s DICT ends inside a number", what)
			}
			args = append(args, float64(int32(binary.BigEndian.Uint32(b[p+1:]))))
			p += 5
		case c == 30:
			p++
			for {
				if p >= len(b) {
					return nil, errf("%s DICT ends inside a real number", what)
				}
				d := b[p]
				p++
				if d&0x0F == 0x0F || d>>4 == 0x0F {
					break
				}
			}
			args = append(args, math.NaN()) // reals are only copied, never used as offsets
		case c >= 32 && c <= 246:
			args = append(args, float64(int(c)-139))
			p++
		case c >= 247 && c <= 254:
			if p+2 > len(b) {
				return nil, errf("%s DICT ends inside a number", what)
			}
			v := (int(c)-247)*256 + int(b[p+1]) + 108
			if c >= 251 {
				v = -(int(c)-251)*256 - int(b[p+1]) - 108
			}
			args = append(args, float64(v))
			p += 2
		default:
			return nil, errf("%s DICT has reserved byte %d", what, c)
		}
		if len(args) > 48 {
			return nil, errf("%s DICT has more than 48 operands", what)
		}
	}
	if len(args) > 0 {
		return nil, errf("%s DICT ends with operands and no operator", what)
	}
	return out, nil
}

// intArg returns entry e's operand i as a non-negative integer offset or
// count no larger than limit.
func intArg(e entry, i int, limit int, what string) (int, error) {
	if i >= len(e.args) {
		return 0, errf("%s: operator %d lacks operands", what, e.op)
	}
	v := e.args[i]
	if math.IsNaN(v) || v < 0 || v > float64(limit) || v != math.Trunc(v) {
		return 0, errf("%s: operand %v of operator %d is out of range (0–%d)", what, v, e.op, limit)
	}
	return int(v), nil
}

// Parse reads a CFF table (the "CFF " table's bytes).
func Parse(b []byte) (*Font, error) {
	if len(b) < 4 {
		return nil, errf("table of %d bytes is too short", len(b))
	}
	if b[0] != 1 {
		return nil, errf("version %d.%d (only CFF 1 is supported; CFF2 variable fonts are not)", b[0], b[1])
	}
	hdr := int(b[2])
	if hdr < 4 || hdr > len(b) {
		return nil, errf("header size %d is out of range", hdr)
	}
	names, p, err := readIndex(b, hdr, "Name")
	if err != nil {
		return nil, err
	}
	tops, p, err := readIndex(b, p, "Top DICT")
	if err != nil {
		return nil, err
	}
	if names.count() < 1 || tops.count() < 1 {
		return nil, errf("no font in the table")
	}
	_, p, err = readIndex(b, p, "String")
	if err != nil {
		return nil, err
	}
	f := &Font{Name: string(names.get(0))}
	if f.gsubrs, _, err = readIndex(b, p, "Global Subr"); err != nil {
		return nil, err
	}
	top, err := parseDict(tops.get(0), "Top")
	if err != nil {
		return nil, err
	}
	charStrings, private, fdArray, fdSelect := -1, -1, -1, -1
	privateSize := 0
	for _, e := range top {
		switch e.op {
		case opCharStrings:
			if charStrings, err = intArg(e, 0, len(b), "Top DICT CharStrings"); err != nil {
				return nil, err
			}
		case opPrivate:
			if privateSize, err = intArg(e, 0, len(b), "Top DICT Private size"); err != nil {
				return nil, err
			}
			if private, err = intArg(e, 1, len(b), "Top DICT Private offset"); err != nil {
				return nil, err
			}
		case opROS:
			f.CIDKeyed = true
		case opFDArray:
			if fdArray, err = intArg(e, 0, len(b), "Top DICT FDArray"); err != nil {
				return nil, err
			}
		case opFDSelect:
			if fdSelect, err = intArg(e, 0, len(b), "Top DICT FDSelect"); err != nil {
				return nil, err
			}
		case opSyntheticBs:
			return nil, errf("synthetic fonts are not supported")
		case 1206: // CharstringType
			if len(e.args) > 0 && e.args[0] != 2 {
				return nil, errf("charstring type %v (only Type 2 is supported)", e.args[0])
			}
		}
		if topKept[e.op] {
			f.top = append(f.top, e.raw...)
		}
	}
	if charStrings < 0 {
		return nil, errf("Top DICT has no CharStrings")
	}
	if f.charStrings, _, err = readIndex(b, charStrings, "CharStrings"); err != nil {
		return nil, err
	}
	n := f.charStrings.count()
	if n == 0 {
		return nil, errf("font has no glyphs")
	}
	if !f.CIDKeyed {
		if private < 0 {
			return nil, errf("Top DICT has no Private DICT")
		}
		fd, err := readPrivate(b, privateSize, private, nil)
		if err != nil {
			return nil, err
		}
		f.fds = []fontDict{fd}
		return f, nil
	}
	if fdArray < 0 || fdSelect < 0 {
		return nil, errf("CID-keyed font without FDArray or FDSelect")
	}
	fdIndex, _, err := readIndex(b, fdArray, "FDArray")
	if err != nil {
		return nil, err
	}
	if fdIndex.count() == 0 || fdIndex.count() > 255 {
		return nil, errf("FDArray has %d Font DICTs", fdIndex.count())
	}
	for i := 0; i < fdIndex.count(); i++ {
		entries, err := parseDict(fdIndex.get(i), "Font")
		if err != nil {
			return nil, err
		}
		size, off := -1, -1
		var own []byte
		for _, e := range entries {
			switch e.op {
			case opPrivate:
				if size, err = intArg(e, 0, len(b), "Font DICT Private size"); err != nil {
					return nil, err
				}
				if off, err = intArg(e, 1, len(b), "Font DICT Private offset"); err != nil {
					return nil, err
				}
			case opFontMatrix:
				own = append(own, e.raw...)
			}
		}
		if off < 0 {
			return nil, errf("Font DICT %d has no Private DICT", i)
		}
		fd, err := readPrivate(b, size, off, own)
		if err != nil {
			return nil, err
		}
		f.fds = append(f.fds, fd)
	}
	if f.fdSelect, err = readFDSelect(b, fdSelect, n, len(f.fds)); err != nil {
		return nil, err
	}
	return f, nil
}

func readPrivate(b []byte, size, off int, own []byte) (fontDict, error) {
	if off+size > len(b) {
		return fontDict{}, errf("Private DICT at %d (%d bytes) runs past the table's end", off, size)
	}
	entries, err := parseDict(b[off:off+size], "Private")
	if err != nil {
		return fontDict{}, err
	}
	fd := fontDict{own: own}
	for _, e := range entries {
		if e.op == opSubrs {
			rel, err := intArg(e, 0, len(b)-off, "Private DICT Subrs")
			if err != nil {
				return fontDict{}, err
			}
			if fd.subrs, _, err = readIndex(b, off+rel, "Subrs"); err != nil {
				return fontDict{}, err
			}
			continue
		}
		fd.private = append(fd.private, e.raw...)
	}
	return fd, nil
}

func readFDSelect(b []byte, p, n, nfd int) ([]uint8, error) {
	if p >= len(b) {
		return nil, errf("FDSelect at %d is past the table's end", p)
	}
	sel := make([]uint8, n)
	switch b[p] {
	case 0:
		if p+1+n > len(b) {
			return nil, errf("FDSelect runs past the table's end")
		}
		copy(sel, b[p+1:p+1+n])
	case 3:
		if p+3 > len(b) {
			return nil, errf("FDSelect is cut short")
		}
		nr := int(binary.BigEndian.Uint16(b[p+1:]))
		q := p + 3
		if q+3*nr+2 > len(b) {
			return nil, errf("FDSelect's %d ranges run past the table's end", nr)
		}
		for r := 0; r < nr; r++ {
			first := int(binary.BigEndian.Uint16(b[q+3*r:]))
			fd := b[q+3*r+2]
			next := int(binary.BigEndian.Uint16(b[q+3*r+3:])) // next range's first, or the sentinel
			if first > next || next > n || r == 0 && first != 0 {
				return nil, errf("FDSelect range %d (%d–%d) is out of order", r, first, next)
			}
			for g := first; g < next; g++ {
				sel[g] = fd
			}
		}
	default:
		return nil, errf("FDSelect format %d is unknown", b[p])
	}
	for g, fd := range sel {
		if int(fd) >= nfd {
			return nil, errf("glyph %d selects Font DICT %d of %d", g, fd, nfd)
		}
	}
	return sel, nil
}

// fdOf returns the Font DICT of glyph g.
func (f *Font) fdOf(g int) int {
	if f.fdSelect == nil {
		return 0
	}
	return int(f.fdSelect[g])
}

// Check walks every glyph's charstring, as a subset would, so that a font
// that would fail later fails when it is loaded.
func (f *Font) Check() error {
	all := make([]uint16, 0, f.NumGlyphs())
	for g := 0; g < f.NumGlyphs(); g++ {
		all = append(all, uint16(g))
	}
	_, _, err := f.usedSubrs(all)
	return err
}

// Subset writes a CID-keyed CFF table holding the glyphs in keep (and
// glyph 0, .notdef), numbered as in f: glyph g is CID g. Glyphs above the
// highest kept one are left out; other glyphs not kept are empty. name is
// written as the font's name.
func (f *Font) Subset(name string, keep []uint16) ([]byte, error) {
	ids := append([]uint16{0}, keep...)
	sort.Slice(ids, func(i, j int) bool { return ids[i] < ids[j] })
	last := int(ids[len(ids)-1])
	if last >= f.NumGlyphs() {
		return nil, errf("glyph %d is beyond the font's %d glyphs", last, f.NumGlyphs())
	}
	n := last + 1
	kept := make([]bool, n)
	for _, g := range ids {
		kept[g] = true
	}
	global, local, err := f.usedSubrs(ids)
	if err != nil {
		return nil, err
	}

	// Charstrings: the kept ones as they are, the others an endchar.
	var cs [][]byte
	for g := 0; g < n; g++ {
		if kept[g] {
			cs = append(cs, f.charStrings.get(g))
		} else {
			cs = append(cs, []byte{14})
		}
	}
	blank := func(x index, used map[int]bool) [][]byte {
		out := make([][]byte, x.count())
		for i := range out {
			if used[i] {
				out[i] = x.get(i)
			} else {
				out[i] = []byte{11} // return
			}
		}
		return out
	}
	gsubrs := writeIndex(blank(f.gsubrs, global))
	charStrings := writeIndex(cs)

	// charset (format 2, one range): glyph g has CID g.
	charset := []byte{0}
	if n > 1 {
		charset = []byte{2, 0, 1, byte((n - 2) >> 8), byte(n - 2)}
	}
	// FDSelect (format 3): runs of glyphs with one Font DICT.
	fdSel := []byte{3, 0, 0}
	runs := 0
	for g := 0; g < n; g++ {
		if g == 0 || f.fdOf(g) != f.fdOf(g-1) {
			fdSel = append(fdSel, byte(g>>8), byte(g), byte(f.fdOf(g)))
			runs++
		}
	}
	binary.BigEndian.PutUint16(fdSel[1:], uint16(runs))
	fdSel = append(fdSel, byte(n>>8), byte(n))

	// Strings: the ROS's registry and ordering.
	strs := writeIndex([][]byte{[]byte("Adobe"), []byte("Identity")})
	const sidAdobe, sidIdentity = 391, 392 // the first non-standard SIDs (TN #5176 Appendix A)

	// Private DICTs with their Subrs, one per Font DICT. The layout is
	// fixed by writing every offset as a 5-byte integer.
	type priv struct{ dict, subrs []byte }
	privs := make([]priv, len(f.fds))
	for i, fd := range f.fds {
		p := priv{dict: append([]byte(nil), fd.private...)}
		if fd.subrs.count() > 0 {
			p.subrs = writeIndex(blank(fd.subrs, local[i]))
			p.dict = appendInt5(p.dict, int32(len(fd.private)+6))
			p.dict = append(p.dict, opSubrs)
		}
		privs[i] = p
	}

	topDict := func(charsetAt, fdSelAt, csAt, fdArrAt int) []byte {
		var t []byte
		t = appendInt5(t, sidAdobe)
		t = appendInt5(t, sidIdentity)
		t = appendInt5(t, 0)
		t = append(t, 12, 30) // ROS
		t = append(t, f.top...)
		t = appendInt5(t, int32(n))
		t = append(t, 12, 34) // CIDCount
		t = appendInt5(t, int32(charsetAt))
		t = append(t, opCharset)
		t = appendInt5(t, int32(fdSelAt))
		t = append(t, 12, 37)
		t = appendInt5(t, int32(csAt))
		t = append(t, opCharStrings)
		t = appendInt5(t, int32(fdArrAt))
		t = append(t, 12, 36)
		return t
	}
	fdArray := func(privAt []int) []byte {
		var dicts [][]byte
		for i, fd := range f.fds {
			d := append([]byte(nil), fd.own...)
			d = appendInt5(d, int32(len(privs[i].dict)))
			d = appendInt5(d, int32(privAt[i]))
			d = append(d, opPrivate)
			dicts = append(dicts, d)
		}
		return writeIndex(dicts)
	}

	header := []byte{1, 0, 4, 4}
	nameIdx := writeIndex([][]byte{[]byte(name)})
	topLen := len(writeIndex([][]byte{topDict(0, 0, 0, 0)}))
	charsetAt := len(header) + len(nameIdx) + topLen + len(strs) + len(gsubrs)
	fdSelAt := charsetAt + len(charset)
	csAt := fdSelAt + len(fdSel)
	fdArrAt := csAt + len(charStrings)
	privAt := make([]int, len(privs))
	fdArrLen := len(fdArray(privAt))
	at := fdArrAt + fdArrLen
	for i, p := range privs {
		privAt[i] = at
		at += len(p.dict) + len(p.subrs)
	}

	out := make([]byte, 0, at)
	out = append(out, header...)
	out = append(out, nameIdx...)
	out = append(out, writeIndex([][]byte{topDict(charsetAt, fdSelAt, csAt, fdArrAt)})...)
	out = append(out, strs...)
	out = append(out, gsubrs...)
	out = append(out, charset...)
	out = append(out, fdSel...)
	out = append(out, charStrings...)
	out = append(out, fdArray(privAt)...)
	for _, p := range privs {
		out = append(out, p.dict...)
		out = append(out, p.subrs...)
	}
	if len(out) != at {
		return nil, errf("internal error: subset is %d bytes, %d planned", len(out), at)
	}
	return out, nil
}

func appendInt5(b []byte, v int32) []byte {
	return binary.BigEndian.AppendUint32(append(b, 29), uint32(v))
}

// writeIndex encodes an INDEX with the smallest offset size.
func writeIndex(objs [][]byte) []byte {
	if len(objs) == 0 {
		return []byte{0, 0}
	}
	total := 1
	for _, o := range objs {
		total += len(o)
	}
	size := 1
	for total >= 1<<(8*size) {
		size++
	}
	out := binary.BigEndian.AppendUint16(nil, uint16(len(objs)))
	out = append(out, byte(size))
	off := 1
	put := func(v int) {
		for s := size - 1; s >= 0; s-- {
			out = append(out, byte(v>>(8*s)))
		}
	}
	put(off)
	for _, o := range objs {
		off += len(o)
		put(off)
	}
	for _, o := range objs {
		out = append(out, o...)
	}
	return out
}

// bias is the subroutine number bias of an INDEX of n subroutines
// (Adobe TN #5177, "The Type 2 Charstring Format", §4.7).
func bias(n int) int {
	switch {
	case n < 1240:
		return 107
	case n < 33900:
		return 1131
	}
	return 32768
}

// errUnsure stops a walk that met arithmetic it does not follow: every
// subroutine is then kept.
var errUnsure = errors.New("charstring arithmetic")

// usedSubrs returns the global subroutines and, per Font DICT, the local
// ones that the glyphs call, directly or through other subroutines.
func (f *Font) usedSubrs(glyphs []uint16) (map[int]bool, []map[int]bool, error) {
	global := map[int]bool{}
	local := make([]map[int]bool, len(f.fds))
	for i := range local {
		local[i] = map[int]bool{}
	}
	unsure := false
	total := 0
	for _, g := range glyphs {
		if int(g) >= f.NumGlyphs() {
			return nil, nil, errf("glyph %d is beyond the font's %d glyphs", g, f.NumGlyphs())
		}
		fd := f.fdOf(int(g))
		w := walker{f: f, local: f.fds[fd].subrs, usedLocal: local[fd], usedGlobal: global}
		_, err := w.run(f.charStrings.get(int(g)), 0)
		if total += w.steps; total > maxTotalSteps {
			return nil, nil, errf("charstrings take more than %d steps to walk", maxTotalSteps)
		}
		if errors.Is(err, errUnsure) {
			unsure = true
			continue
		}
		if err != nil {
			return nil, nil, errf("glyph %d: %v", g, err)
		}
	}
	if unsure {
		for i := 0; i < f.gsubrs.count(); i++ {
			global[i] = true
		}
		for fd := range f.fds {
			for i := 0; i < f.fds[fd].subrs.count(); i++ {
				local[fd][i] = true
			}
		}
	}
	return global, local, nil
}

// walker follows a Type 2 charstring (TN #5177) far enough to know which
// subroutines it calls: it tracks the operand stack and counts stem hints,
// whose number sets the length of hintmask and cntrmask operands.
type walker struct {
	f                     *Font
	local                 index
	usedLocal, usedGlobal map[int]bool
	stack                 []float64
	stems                 int
	steps                 int
}

// maxSteps bounds the work one glyph may cause, subroutine loops
// included; maxTotalSteps all glyphs' (a font of 65,535 glyphs of 500
// steps each is well under it).
const (
	maxSteps      = 1 << 16
	maxTotalSteps = 1 << 25
)

// run interprets cs; it reports whether endchar was met.
func (w *walker) run(cs []byte, depth int) (bool, error) {
	if depth > 10 {
		return false, errors.New("subroutines nested deeper than 10 (TN #5177 limit)")
	}
	for p := 0; p < len(cs); {
		w.steps++
		if w.steps > maxSteps {
			return false, errors.New("charstring does not end")
		}
		c := cs[p]
		switch {
		case c >= 32:
			var v float64
			switch {
			case c <= 246:
				v, p = float64(int(c)-139), p+1
			case c <= 250:
				if p+2 > len(cs) {
					return false, errors.New("charstring ends inside a number")
				}
				v, p = float64((int(c)-247)*256+int(cs[p+1])+108), p+2
			case c <= 254:
				if p+2 > len(cs) {
					return false, errors.New("charstring ends inside a number")
				}
				v, p = float64(-(int(c)-251)*256-int(cs[p+1])-108), p+2
			default:
				if p+5 > len(cs) {
					return false, errors.New("charstring ends inside a number")
				}
				v, p = float64(int32(binary.BigEndian.Uint32(cs[p+1:])))/65536, p+5
			}
			if len(w.stack) >= 48 {
				return false, errors.New("charstring operand stack overflows (48)")
			}
			w.stack = append(w.stack, v)
			continue
		case c == 28:
			if p+3 > len(cs) {
				return false, errors.New("charstring ends inside a number")
			}
			if len(w.stack) >= 48 {
				return false, errors.New("charstring operand stack overflows (48)")
			}
			w.stack = append(w.stack, float64(int16(binary.BigEndian.Uint16(cs[p+1:]))))
			p += 3
			continue
		}
		p++
		switch c {
		case 1, 3, 18, 23: // hstem, vstem, hstemhm, vstemhm
			w.stems += len(w.stack) / 2
			w.stack = w.stack[:0]
		case 19, 20: // hintmask, cntrmask: an implied vstem may come first
			w.stems += len(w.stack) / 2
			w.stack = w.stack[:0]
			p += (w.stems + 7) / 8
			if p > len(cs) {
				return false, errors.New("charstring ends inside a hint mask")
			}
		case 10, 29: // callsubr, callgsubr
			if len(w.stack) == 0 {
				return false, errors.New("subroutine call without a number")
			}
			x, used := w.local, w.usedLocal
			if c == 29 {
				x, used = w.f.gsubrs, w.usedGlobal
			}
			i := int(w.stack[len(w.stack)-1]) + bias(x.count())
			w.stack = w.stack[:len(w.stack)-1]
			if i < 0 || i >= x.count() {
				return false, fmt.Errorf("call of subroutine %d of %d", i, x.count())
			}
			used[i] = true
			end, err := w.run(x.get(i), depth+1)
			if err != nil || end {
				return end, err
			}
		case 11: // return
			return false, nil
		case 14: // endchar
			return true, nil
		case 12:
			if p >= len(cs) {
				return false, errors.New("charstring ends inside an operator")
			}
			op := cs[p]
			p++
			if op >= 3 && op <= 30 {
				// and, or, not, abs, add, …: values computed on the stack
				// could feed a call; follow no further.
				return false, errUnsure
			}
			w.stack = w.stack[:0]
		default: // path operators and reserved ones clear the stack
			w.stack = w.stack[:0]
		}
	}
	return false, nil
}
