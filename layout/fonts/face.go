package fonts

import (
	"encoding/binary"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/tdewolff/font"

	"sheaf/layout/fonts/cff"
	glyfrec "sheaf/layout/fonts/glyf"
	"sheaf/specs"
)

// maxFaces bounds the faces listed from a collection's header.
const maxFaces = 1 << 12

// Faces lists the full names (name ID 4) of the faces in a font file: one
// for a single font, each face of a collection (.ttc, .otc: the OpenType
// spec's "Font Collections") in order. A face whose name cannot be read
// is listed as "".
func Faces(b []byte) ([]string, error) {
	n := 1
	if len(b) >= 12 && string(b[:4]) == "ttcf" {
		n = int(binary.BigEndian.Uint32(b[8:]))
		if n < 1 || n > maxFaces || 12+4*n > len(b) {
			return nil, fmt.Errorf("collection header lists %d faces", n)
		}
	}
	names := make([]string, n)
	for i := range names {
		s, err := parseFace(b, i)
		if err != nil {
			if n == 1 {
				return nil, err
			}
			continue
		}
		names[i] = fullNames(s)[0]
	}
	return names, nil
}

// parseFace parses face i of b.
func parseFace(b []byte, i int) (*font.SFNT, error) {
	one, err := extractFace(b, i)
	if err != nil {
		return nil, err
	}
	return parseSFNT(one, 0)
}

// extractFace returns face i of a collection as a font file of its own
// (its table directory and tables, offsets rebased); a single font is
// returned as it is. tdewolff/font refuses the last face of a collection
// (it measures each face by the gap to the next one), and a face of its
// own is also what gets hashed and embedded.
func extractFace(b []byte, i int) ([]byte, error) {
	if len(b) < 12 || string(b[:4]) != "ttcf" {
		if i != 0 {
			return nil, fmt.Errorf("face %d of a file that is not a collection", i)
		}
		return b, nil
	}
	be := binary.BigEndian
	n := int(be.Uint32(b[8:]))
	if i < 0 || i >= n || 12+4*(i+1) > len(b) {
		return nil, fmt.Errorf("collection has no face %d", i)
	}
	dir := int(be.Uint32(b[12+4*i:]))
	if dir < 0 || dir+12 > len(b) {
		return nil, fmt.Errorf("face %d's table directory is past the file's end", i)
	}
	nt := int(be.Uint16(b[dir+4:]))
	if dir+12+16*nt > len(b) {
		return nil, fmt.Errorf("face %d's table directory runs past the file's end", i)
	}
	out := append([]byte(nil), b[dir:dir+12+16*nt]...)
	for r := 0; r < nt; r++ {
		rec := 12 + 16*r
		off, length := int64(be.Uint32(out[rec+8:])), int64(be.Uint32(out[rec+12:]))
		if off+length > int64(len(b)) {
			return nil, fmt.Errorf("face %d: table %q runs past the file's end", i, out[rec:rec+4])
		}
		for len(out)%4 != 0 {
			out = append(out, 0)
		}
		be.PutUint32(out[rec+8:], uint32(len(out)))
		out = append(out, b[off:off+length]...)
	}
	for len(out)%4 != 0 {
		out = append(out, 0)
	}
	return out, nil
}

// parseSFNT parses face i of b, turning a panic of the parser into an
// error: font files come from users.
func parseSFNT(b []byte, i int) (s *font.SFNT, err error) {
	defer func() {
		if r := recover(); r != nil {
			s, err = nil, fmt.Errorf("font parser failed: %v", r)
		}
	}()
	return font.ParseSFNT(b, i)
}

// fullNames are the face's full names (name ID 4) as its name records
// give them (platforms differ), then its PostScript name (ID 6); the
// first is the one listed.
func fullNames(s *font.SFNT) []string {
	var out []string
	if s != nil && s.Name != nil {
		for _, id := range []font.NameID{4, 6} {
			for _, r := range s.Name.Get(id) {
				if v := r.String(); v != "" {
					out = append(out, v)
				}
			}
		}
	}
	if len(out) == 0 {
		out = []string{""}
	}
	return out
}

// FaceError is a face the spec names that the file does not have.
type FaceError struct {
	Want  specs.FaceRef
	Faces []string // the file's faces, by index
}

func (e *FaceError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "no face %s in the file; its faces are", e.Want)
	for i, n := range e.Faces {
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, " %d %s", i, strconv.Quote(n))
	}
	return b.String()
}

// pickFace returns the index of the face ref names in b.
func pickFace(b []byte, ref specs.FaceRef) (int, error) {
	collection := len(b) >= 4 && string(b[:4]) == "ttcf"
	if !collection && ref.Name == "" && ref.Index == 0 {
		return 0, nil
	}
	faces, err := Faces(b)
	if err != nil {
		return 0, err
	}
	if ref.Name == "" {
		if ref.Index < len(faces) {
			return ref.Index, nil
		}
		return 0, &FaceError{Want: ref, Faces: faces}
	}
	// Any full name record matches (or the PostScript name); case and
	// spacing differ between tools, so they do not count.
	norm := func(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), " ")) }
	for i := range faces {
		s, err := parseFace(b, i)
		if err != nil {
			continue
		}
		for _, n := range fullNames(s) {
			if norm(n) == norm(ref.Name) {
				return i, nil
			}
		}
	}
	return 0, &FaceError{Want: ref, Faces: faces}
}

// Licence is what a font's OS/2 fsType allows an embedder (OpenType
// spec, "OS/2 — OS/2 and Windows Metrics Table", fsType).
type Licence struct {
	FsType uint16
	HasOS2 bool
}

// fsType bits (OpenType OS/2 fsType).
const (
	fsRestricted   = 0x0002 // Restricted License embedding
	fsPreviewPrint = 0x0004 // Preview & Print embedding
	fsEditable     = 0x0008 // Editable embedding
	fsNoSubsetting = 0x0100
	fsBitmapOnly   = 0x0200
)

// LicenceOf reads the embedding permissions of a parsed face.
func LicenceOf(s *font.SFNT) Licence {
	if s == nil || s.OS2 == nil {
		return Licence{}
	}
	return Licence{FsType: s.OS2.FsType, HasOS2: true}
}

// Restricted reports a font its licence forbids to embed at all:
// Restricted License embedding with no less restrictive bit beside it
// (OS/2 versions 0–2 may set several; the least restrictive applies).
func (l Licence) Restricted() bool {
	return l.FsType&fsRestricted != 0 && l.FsType&(fsPreviewPrint|fsEditable) == 0
}

// BitmapOnly reports a font whose outlines may not be embedded.
func (l Licence) BitmapOnly() bool { return l.FsType&fsBitmapOnly != 0 }

// NoSubsetting reports a font that may be embedded only whole.
func (l Licence) NoSubsetting() bool { return l.FsType&fsNoSubsetting != 0 }

// PreviewPrint reports Preview & Print embedding: a document may carry the
// font to be viewed and printed, not edited.
func (l Licence) PreviewPrint() bool {
	return l.FsType&fsPreviewPrint != 0 && l.FsType&fsEditable == 0
}

// Refusal says why the licence forbids embedding, or "" when it allows it.
func (l Licence) Refusal() string {
	switch {
	case l.Restricted():
		return fmt.Sprintf("its licence forbids embedding it in a document (OS/2 fsType 0x%04X: Restricted License embedding)", l.FsType)
	case l.BitmapOnly():
		return fmt.Sprintf("its licence allows only its bitmaps to be embedded, not its outlines (OS/2 fsType 0x%04X: Bitmap embedding only)", l.FsType)
	}
	return ""
}

// String says what the licence allows, for findings.
func (l Licence) String() string {
	if !l.HasOS2 {
		return "no OS/2 table: embedding permission not stated; treated as installable (common practice)"
	}
	var parts []string
	switch {
	case l.Restricted():
		parts = append(parts, "Restricted License embedding")
	case l.PreviewPrint():
		parts = append(parts, "Preview & Print embedding")
	case l.FsType&fsEditable != 0:
		parts = append(parts, "Editable embedding")
	default:
		parts = append(parts, "Installable embedding")
	}
	if l.NoSubsetting() {
		parts = append(parts, "no subsetting")
	}
	if l.BitmapOnly() {
		parts = append(parts, "bitmap embedding only")
	}
	return fmt.Sprintf("OS/2 fsType 0x%04X: %s", l.FsType, strings.Join(parts, ", "))
}

// Outlines names a face's outline format.
type Outlines string

const (
	TrueType Outlines = "TrueType" // glyf/loca
	CFF      Outlines = "CFF"      // CFF version 1
	CFF2     Outlines = "CFF2"     // variable CFF
)

// Embedding is how a face goes into a document.
type Embedding struct {
	Outlines Outlines
	// Outlined, when not "", says why text in this face is drawn as glyph
	// outlines instead of embedded as a font (not searchable).
	Outlined string
	Licence  Licence
}

// embeddingOf checks a parsed face: a CFF table that does not parse, or
// whose charstrings do not, is an error, as the PDF and SVG writers would
// fail on it later.
func embeddingOf(s *font.SFNT) (Embedding, error) {
	e := Embedding{Licence: LicenceOf(s)}
	switch {
	case s.IsTrueType:
		e.Outlines = TrueType
		if why := locaProblem(s); why != "" {
			e.Outlined = why
		} else if err := compositeProblem(s); err != nil {
			return e, err
		}
	case s.Tables["CFF2"] != nil:
		e.Outlines = CFF2
		e.Outlined = "its outlines are CFF2 (a variable font), which sheaf does not embed"
	case s.IsCFF:
		e.Outlines = CFF
		f, err := cff.Parse(s.Tables["CFF "])
		if err != nil {
			return e, err
		}
		if err := f.Check(); err != nil {
			return e, err
		}
		if f.NumGlyphs() != int(s.NumGlyphs()) {
			return e, fmt.Errorf("CFF table has %d glyphs, maxp %d", f.NumGlyphs(), s.NumGlyphs())
		}
	default:
		return e, errors.New("font has neither TrueType nor CFF outlines")
	}
	return e, nil
}

// compositeProblem walks every composite glyph (OpenType glyf table,
// "Composite glyph description") as the PDF writer does when it closes a
// subset over the glyphs' components, so a damaged record is refused when
// the font is loaded (by check too) rather than when a page is written.
// It assumes locaProblem found nothing.
func compositeProblem(s *font.SFNT) error {
	head, loca, glyf := s.Tables["head"], s.Tables["loca"], s.Tables["glyf"]
	long := binary.BigEndian.Uint16(head[50:]) == 1
	n := int(s.NumGlyphs())
	at := func(i int) uint32 {
		if long {
			return binary.BigEndian.Uint32(loca[4*i:])
		}
		return 2 * uint32(binary.BigEndian.Uint16(loca[2*i:]))
	}
	for id := 0; id < n; id++ {
		if _, err := glyfrec.Components(glyf[at(id):at(id+1)], n); err != nil {
			return fmt.Errorf("glyph %d: %v (glyf table damaged)", id, err)
		}
	}
	return nil
}

// locaProblem says why a TrueType font's glyph locations (OpenType 'loca'
// table: numGlyphs+1 offsets into 'glyf', never decreasing) cannot be
// used to embed it, or "" when they can. The PDF writer reads them so.
func locaProblem(s *font.SFNT) string {
	head, loca, glyf := s.Tables["head"], s.Tables["loca"], s.Tables["glyf"]
	if len(head) < 54 || loca == nil || glyf == nil {
		return "its TrueType outlines lack a glyf or loca table"
	}
	long := binary.BigEndian.Uint16(head[50:]) == 1
	n := int(s.NumGlyphs()) + 1
	if long && len(loca) < 4*n || !long && len(loca) < 2*n {
		return "its loca table is shorter than its glyph count needs"
	}
	prev := uint32(0)
	for i := 0; i < n; i++ {
		var v uint32
		if long {
			v = binary.BigEndian.Uint32(loca[4*i:])
		} else {
			v = 2 * uint32(binary.BigEndian.Uint16(loca[2*i:]))
		}
		if v < prev || v > uint32(len(glyf)) {
			return fmt.Sprintf("its loca table is out of order at glyph %d", i)
		}
		prev = v
	}
	return ""
}
