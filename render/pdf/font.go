package pdf

import (
	"crypto/sha256"
	"encoding/binary"
	"errors"
	"fmt"
	"sort"
	"strconv"
	"strings"
	"sync"

	"github.com/tdewolff/font"

	"sheaf/layout/fonts/cff"
	"sheaf/layout/fonts/glyf"

	otf "sheaf/render/internal/sfnt"
)

// FontKey identifies a font by a SHA-256 digest of its tables, so equal
// font files are one font however often they are loaded.
type FontKey [32]byte

func (k FontKey) String() string { return fmt.Sprintf("%x", k[:6]) }

// fontData is a parsed font plus what embedding needs. It is read-only
// once made, so pages encoded in parallel share it.
type fontData struct {
	key        FontKey
	sfnt       *font.SFNT
	unitsPerEm uint16
	numGlyphs  int
	embeddable bool // outlines a font file can carry: TrueType (FontFile2) or CFF (FontFile3)
	loca       []uint32
	cff        *cff.Font // CFF outlines; nil for TrueType
	psName     string
	// whole: the licence forbids subsetting (OS/2 fsType bit 8), so every
	// glyph is embedded and the name carries no subset tag.
	whole bool
	// refusal, when not "", is why the licence forbids embedding.
	refusal string
}

func (d *fontData) advance(id uint16) uint16 {
	if int(id) >= d.numGlyphs {
		return 0
	}
	return d.sfnt.GlyphAdvance(id)
}

// fontKeys caches fontData per parsed font, so that hashing a font's
// tables happens once per writer, not once per page.
type fontKeys struct {
	mu sync.Mutex
	m  map[*font.SFNT]*fontData
}

func newFontKeys() *fontKeys { return &fontKeys{m: map[*font.SFNT]*fontData{}} }

func (k *fontKeys) get(s *font.SFNT) (*fontData, error) {
	if s == nil {
		return nil, errors.New("text without a font")
	}
	k.mu.Lock()
	d, ok := k.m[s]
	k.mu.Unlock()
	if ok {
		return d, nil
	}
	d, err := newFontData(s)
	if err != nil {
		return nil, err
	}
	k.mu.Lock()
	if prev, ok := k.m[s]; ok {
		d = prev
	} else {
		k.m[s] = d
	}
	k.mu.Unlock()
	return d, nil
}

func newFontData(s *font.SFNT) (*fontData, error) {
	if s.Head == nil || s.Head.UnitsPerEm == 0 {
		return nil, errors.New("font has no usable head table")
	}
	tags := make([]string, 0, len(s.Tables))
	for t := range s.Tables {
		tags = append(tags, t)
	}
	sort.Strings(tags)
	h := sha256.New()
	for _, t := range tags {
		var n [4]byte
		binary.BigEndian.PutUint32(n[:], uint32(len(s.Tables[t])))
		h.Write([]byte(t))
		h.Write(n[:])
		h.Write(s.Tables[t])
	}
	d := &fontData{sfnt: s, unitsPerEm: s.Head.UnitsPerEm, numGlyphs: int(s.NumGlyphs()), psName: postScriptName(s)}
	copy(d.key[:], h.Sum(nil))
	if s.IsTrueType {
		if loca, err := parseLoca(s.Tables, d.numGlyphs); err == nil {
			d.loca = loca
			d.embeddable = true
		}
	} else if s.IsCFF && s.Tables["CFF "] != nil {
		if f, err := cff.Parse(s.Tables["CFF "]); err == nil && f.NumGlyphs() == d.numGlyphs {
			d.cff = f
			d.embeddable = true
		}
	}
	if s.OS2 != nil {
		// OpenType OS/2 fsType: 0x0002 Restricted License embedding
		// (unless 0x0004 Preview & Print or 0x0008 Editable is set too:
		// the least restrictive applies), 0x0200 Bitmap embedding only,
		// 0x0100 No subsetting. A font with no OS/2 table is treated as
		// installable (common practice).
		t := s.OS2.FsType
		switch {
		case t&0x0002 != 0 && t&0x000C == 0:
			d.refusal = fmt.Sprintf("its licence forbids embedding (OS/2 fsType 0x%04X: Restricted License embedding)", t)
		case t&0x0200 != 0:
			d.refusal = fmt.Sprintf("its licence allows only bitmaps to be embedded (OS/2 fsType 0x%04X: Bitmap embedding only)", t)
		}
		d.whole = t&0x0100 != 0
	}
	return d, nil
}

// program returns the font program to embed for the used glyphs: the
// bytes, the font file key of the FontDescriptor and the stream's own
// dictionary entries, and the CIDFont's subtype with its extra entries.
func (d *fontData) program(used map[uint16]bool) (file []byte, key, streamDict, subtype, cidExtra string, err error) {
	if d.whole {
		for id := 0; id < d.numGlyphs; id++ {
			used[uint16(id)] = true
		}
	}
	if d.cff != nil {
		ids := make([]uint16, 0, len(used))
		for id := range used {
			ids = append(ids, id)
		}
		file, err = d.cff.Subset(d.psName, ids)
		// CID-keyed CFF whose charset maps CID n to glyph n (ISO 32000-1
		// §9.7.4.2: a CIDFontType0's CIDs select glyphs through the
		// charset; Table 126: FontFile3 /CIDFontType0C).
		return file, "FontFile3", " /Subtype /CIDFontType0C", "CIDFontType0", "", err
	}
	file, err = d.subset(used)
	return file, "FontFile2", " /Length1 " + strconv.Itoa(len(file)), "CIDFontType2", " /CIDToGIDMap /Identity", err
}

// baseName is the font's name in the document: the subset tag and the
// PostScript name, or the name alone for a font embedded whole.
func (d *fontData) baseName(used map[uint16]bool) string {
	if d.whole {
		return d.psName
	}
	return subsetTag(d.key, used) + "+" + d.psName
}

// postScriptName is name ID 6, reduced to the characters a PDF name and
// a PostScript name may hold.
func postScriptName(s *font.SFNT) string {
	var name string
	if s.Name != nil {
		for _, id := range []font.NameID{6, 4, 1} {
			for _, r := range s.Name.Get(id) {
				if name = r.String(); name != "" {
					break
				}
			}
			if name != "" {
				break
			}
		}
	}
	var b strings.Builder
	for _, r := range name {
		if r > 32 && r < 127 && !strings.ContainsRune("()<>[]{}/%#", r) {
			b.WriteRune(r)
		}
	}
	if b.Len() == 0 {
		return "Font"
	}
	return b.String()
}

func parseLoca(t map[string][]byte, n int) ([]uint32, error) {
	head, loca, glyf := t["head"], t["loca"], t["glyf"]
	if len(head) < 54 || loca == nil || glyf == nil {
		return nil, errors.New("missing head, loca or glyf")
	}
	long := binary.BigEndian.Uint16(head[50:]) == 1
	out := make([]uint32, n+1)
	for i := range out {
		if long {
			if 4*i+4 > len(loca) {
				return nil, errors.New("loca too short")
			}
			out[i] = binary.BigEndian.Uint32(loca[4*i:])
		} else {
			if 2*i+2 > len(loca) {
				return nil, errors.New("loca too short")
			}
			out[i] = 2 * uint32(binary.BigEndian.Uint16(loca[2*i:]))
		}
		if out[i] > uint32(len(glyf)) || i > 0 && out[i] < out[i-1] {
			return nil, errors.New("loca offsets out of order")
		}
	}
	return out, nil
}

// glyph returns the glyf record of a glyph.
func (d *fontData) glyph(id int) []byte {
	return d.sfnt.Tables["glyf"][d.loca[id]:d.loca[id+1]]
}

// closeGlyphs adds the components of composite glyphs (OpenType glyf
// table, "Composite glyph description") and glyph 0, which PDF uses for
// missing glyphs.
func (d *fontData) closeGlyphs(used map[uint16]bool) error {
	used[0] = true
	stack := make([]uint16, 0, len(used))
	for id := range used {
		stack = append(stack, id)
	}
	for len(stack) > 0 {
		id := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if int(id) >= d.numGlyphs {
			return fmt.Errorf("glyph %d is beyond the font's %d glyphs", id, d.numGlyphs)
		}
		comps, err := glyf.Components(d.glyph(int(id)), d.numGlyphs)
		if err != nil {
			return fmt.Errorf("glyph %d: %v", id, err)
		}
		for _, comp := range comps {
			if !used[comp] {
				used[comp] = true
				stack = append(stack, comp)
			}
		}
	}
	return nil
}

// subset returns a TrueType font with only the used glyphs' outlines.
// Glyph IDs are unchanged — unused glyphs become empty — so content
// streams written before the subset was known stay valid (CIDToGIDMap
// Identity). The head table's dates are zeroed so the bytes never depend
// on when the font file was made or embedded.
func (d *fontData) subset(used map[uint16]bool) ([]byte, error) {
	if err := d.closeGlyphs(used); err != nil {
		return nil, err
	}
	t := d.sfnt.Tables
	var glyf []byte
	loca := make([]byte, 0, 4*(d.numGlyphs+1))
	for id := 0; id < d.numGlyphs; id++ {
		loca = binary.BigEndian.AppendUint32(loca, uint32(len(glyf)))
		if used[uint16(id)] {
			glyf = append(glyf, d.glyph(id)...)
			for len(glyf)%4 != 0 {
				glyf = append(glyf, 0)
			}
		}
	}
	loca = binary.BigEndian.AppendUint32(loca, uint32(len(glyf)))

	head := append([]byte(nil), t["head"]...)
	binary.BigEndian.PutUint32(head[8:], 0)  // checkSumAdjustment, set below
	clear(head[20:36])                       // created, modified
	binary.BigEndian.PutUint16(head[50:], 1) // long loca offsets

	// The tables ISO 32000-1 §9.9 lists for TrueType programs in PDF.
	tables := map[string][]byte{"head": head, "glyf": glyf, "loca": loca}
	for _, tag := range []string{"hhea", "hmtx", "maxp", "cvt ", "fpgm", "prep"} {
		if b, ok := t[tag]; ok {
			tables[tag] = b
		}
	}
	for _, tag := range []string{"hhea", "hmtx", "maxp"} {
		if tables[tag] == nil {
			return nil, fmt.Errorf("font %s has no %s table", d.psName, tag)
		}
	}
	return otf.Write(tables), nil
}

// subsetTag is the six-capital-letter prefix of a subset font's name
// (ISO 32000-1 §9.6.4), derived from the font and the glyph set so that
// it is deterministic and differs between different subsets.
func subsetTag(key FontKey, used map[uint16]bool) string {
	ids := make([]int, 0, len(used))
	for id := range used {
		ids = append(ids, int(id))
	}
	sort.Ints(ids)
	h := sha256.New()
	h.Write(key[:])
	for _, id := range ids {
		h.Write([]byte{byte(id >> 8), byte(id)})
	}
	sum := h.Sum(nil)
	tag := make([]byte, 6)
	for i := range tag {
		tag[i] = 'A' + sum[i]%26
	}
	return string(tag)
}

// toUnicodeCMap writes the CMap that maps glyph codes back to text
// (ISO 32000-1 §9.10.3), at most 100 entries per block as §9.7.5.4 asks.
func toUnicodeCMap(glyphs []GlyphUse) []byte {
	var b strings.Builder
	b.WriteString("/CIDInit /ProcSet findresource begin\n12 dict begin\nbegincmap\n" +
		"/CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def\n" +
		"/CMapName /Adobe-Identity-UCS def\n/CMapType 2 def\n" +
		"1 begincodespacerange\n<0000> <FFFF>\nendcodespacerange\n")
	var list []GlyphUse
	for _, g := range glyphs {
		if g.Text != "" {
			list = append(list, g)
		}
	}
	for i := 0; i < len(list); i += 100 {
		chunk := list[i:min(i+100, len(list))]
		fmt.Fprintf(&b, "%d beginbfchar\n", len(chunk))
		for _, g := range chunk {
			fmt.Fprintf(&b, "<%04X> <", g.ID)
			for _, r := range g.Text {
				if r >= 0x10000 {
					r -= 0x10000
					fmt.Fprintf(&b, "%04X%04X", 0xD800+(r>>10), 0xDC00+(r&0x3FF))
				} else {
					fmt.Fprintf(&b, "%04X", r)
				}
			}
			b.WriteString(">\n")
		}
		b.WriteString("endbfchar\n")
	}
	b.WriteString("endcmap\nCMapName currentdict /CMap defineresource pop\nend\nend\n")
	return []byte(b.String())
}
