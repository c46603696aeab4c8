package icc

import (
	"encoding/binary"
	"fmt"
	"strings"
	"unicode/utf16"
)

// Signature is a four-byte ICC signature ('prtr', 'CMYK', 'A2B0', …).
type Signature uint32

func sig(s string) Signature { return Signature(binary.BigEndian.Uint32([]byte(s))) }

// String gives the signature as its four characters, trailing spaces
// dropped ("RGB ", "Lab " → "RGB", "Lab"); unprintable bytes as hex.
func (s Signature) String() string {
	b := binary.BigEndian.AppendUint32(nil, uint32(s))
	for _, c := range b {
		if c < 0x20 || c > 0x7e {
			return fmt.Sprintf("0x%08x", uint32(s))
		}
	}
	return strings.TrimRight(string(b), " ")
}

// Profile classes and colour spaces this package names (ICC.1:2010 §7.2.5,
// §7.2.6).
var (
	ClassInput    = sig("scnr")
	ClassDisplay  = sig("mntr")
	ClassOutput   = sig("prtr")
	ClassLink     = sig("link")
	ClassSpace    = sig("spac")
	ClassAbstract = sig("abst")
	ClassNamed    = sig("nmcl")

	SpaceXYZ  = sig("XYZ ")
	SpaceLab  = sig("Lab ")
	SpaceRGB  = sig("RGB ")
	SpaceGray = sig("GRAY")
	SpaceCMYK = sig("CMYK")
	SpaceCMY  = sig("CMY ")
)

// MaxProfileSize is the largest profile Parse accepts. Printer profiles
// are a few megabytes at most; the limit keeps a hostile file from making
// us hold (and expand) gigabytes.
const MaxProfileSize = 64 << 20

// maxChannels is the most device channels a table may have (ICC allows
// 15; n-colour printer profiles beyond 8 inks are out of our scope).
const maxChannels = 8

// FormatError reports a profile this package cannot read: where (the tag
// and the byte offset in the profile) and why.
type FormatError struct {
	Tag    string // tag signature, empty for the header and tag table
	Offset int64  // byte offset in the profile where the problem is
	Reason string
}

func (e *FormatError) Error() string {
	if e.Tag == "" {
		return fmt.Sprintf("icc: byte %d: %s", e.Offset, e.Reason)
	}
	return fmt.Sprintf("icc: tag %s at byte %d: %s", e.Tag, e.Offset, e.Reason)
}

// XYZ is CIE XYZ with the PCS white (D50) at Y = 1.
type XYZ struct{ X, Y, Z float64 }

// Lab is CIELAB relative to the PCS white D50.
type Lab struct{ L, A, B float64 }

// D50 is the PCS illuminant as ICC.1:2010 §7.2.16 encodes it.
var D50 = XYZ{0.9642, 1.0, 0.8249}

// Profile is a parsed ICC profile: its header facts and the parts of it a
// colour conversion needs. A Profile is read-only after Parse and safe for
// concurrent use.
type Profile struct {
	Version     uint32    // as encoded in the header: 0x04200000 is 4.2.0
	Class       Signature // device class: ClassOutput ('prtr') for a press
	Space       Signature // the device's colour space ('CMYK', 'RGB ', 'GRAY', …)
	PCS         Signature // profile connection space: SpaceLab or SpaceXYZ
	Description string    // the desc tag's text (ASCII part of v2 desc; en-US or first record of v4 mluc)
	Copyright   string
	MediaWhite  XYZ  // wtpt
	MediaBlack  XYZ  // bkpt, when HasBlack
	HasBlack    bool // the profile has a bkpt tag
	data        []byte

	a2b, b2a [3]*lut       // by intent; nil where the tag is absent
	shaper   *matrixShaper // RGB or gray matrix/TRC model, nil if absent
}

// Bytes returns the profile as it was parsed (to embed it in a file).
func (p *Profile) Bytes() []byte { return p.data }

// VersionString gives the version as major.minor ("2.1", "4.2").
func (p *Profile) VersionString() string {
	return fmt.Sprintf("%d.%d", p.Version>>24, (p.Version>>20)&0xf)
}

// Channels is the number of device components (4 for CMYK).
func (p *Profile) Channels() int { return channelsOf(p.Space) }

func channelsOf(s Signature) int {
	switch s {
	case SpaceGray:
		return 1
	case SpaceRGB, SpaceLab, SpaceXYZ, SpaceCMY, sig("HSV "), sig("HLS "), sig("YCbr"), sig("Yxy "), sig("Luv "):
		return 3
	case SpaceCMYK:
		return 4
	}
	// 'nCLR' for n = 2…15 (ICC.1:2010 Table 19).
	b := binary.BigEndian.AppendUint32(nil, uint32(s))
	if string(b[1:]) == "CLR" {
		if n := hexDigit(b[0]); n >= 2 {
			return n
		}
	}
	return 0
}

func hexDigit(c byte) int {
	switch {
	case c >= '0' && c <= '9':
		return int(c - '0')
	case c >= 'A' && c <= 'F':
		return int(c-'A') + 10
	}
	return -1
}

// Header is the part of a profile's 128-byte header that tells what kind of
// profile it is. ReadHeader reads it without parsing the tags, for callers
// that only need to validate a file's kind.
type Header struct {
	Size    uint32
	Version uint32
	Class   Signature
	Space   Signature
	PCS     Signature
}

// ReadHeader checks the header of a profile (size, 'acsp' signature, PCS)
// and returns it. b may be just the first 128 bytes.
func ReadHeader(b []byte) (Header, error) {
	if len(b) < 128 {
		return Header{}, &FormatError{Offset: int64(len(b)), Reason: fmt.Sprintf("%d bytes is too short for an ICC header (128)", len(b))}
	}
	be := binary.BigEndian
	h := Header{
		Size:    be.Uint32(b[0:]),
		Version: be.Uint32(b[8:]),
		Class:   Signature(be.Uint32(b[12:])),
		Space:   Signature(be.Uint32(b[16:])),
		PCS:     Signature(be.Uint32(b[20:])),
	}
	if string(b[36:40]) != "acsp" {
		return h, &FormatError{Offset: 36, Reason: "no 'acsp' signature: not an ICC profile"}
	}
	if h.Size < 132 {
		return h, &FormatError{Offset: 0, Reason: fmt.Sprintf("declared size %d is too small", h.Size)}
	}
	if h.Size > MaxProfileSize {
		return h, &FormatError{Offset: 0, Reason: fmt.Sprintf("declared size %d is over the %d-byte limit", h.Size, MaxProfileSize)}
	}
	if major := h.Version >> 24; major < 2 || major > 4 {
		return h, &FormatError{Offset: 8, Reason: fmt.Sprintf("version %d is not ICC v2 or v4", major)}
	}
	if h.Class != ClassLink && h.PCS != SpaceLab && h.PCS != SpaceXYZ {
		return h, &FormatError{Offset: 20, Reason: fmt.Sprintf("connection space %q is neither Lab nor XYZ", h.PCS)}
	}
	return h, nil
}

// Parse reads a profile. It keeps b (see Bytes); the caller must not
// change it afterwards.
func Parse(b []byte) (*Profile, error) {
	if len(b) > MaxProfileSize {
		return nil, &FormatError{Reason: fmt.Sprintf("%d bytes is over the %d-byte limit", len(b), MaxProfileSize)}
	}
	h, err := ReadHeader(b)
	if err != nil {
		return nil, err
	}
	if int64(h.Size) > int64(len(b)) {
		return nil, &FormatError{Offset: int64(len(b)), Reason: fmt.Sprintf("truncated: the header declares %d bytes, the file has %d", h.Size, len(b))}
	}
	b = b[:h.Size]
	if h.Class == ClassLink || h.Class == ClassAbstract || h.Class == ClassNamed {
		return nil, &FormatError{Offset: 12, Reason: fmt.Sprintf("device class %q is not supported (device and colour space profiles only)", h.Class)}
	}
	p := &Profile{Version: h.Version, Class: h.Class, Space: h.Space, PCS: h.PCS, data: b}
	if n := p.Channels(); n == 0 || n > maxChannels {
		return nil, &FormatError{Offset: 16, Reason: fmt.Sprintf("colour space %q is not supported", h.Space)}
	}
	tags, err := readTagTable(b)
	if err != nil {
		return nil, err
	}
	r := tagReader{b: b, tags: tags}
	if err := p.readTags(&r); err != nil {
		return nil, err
	}
	return p, nil
}

type tagEntry struct {
	off, size uint32
}

func readTagTable(b []byte) (map[Signature]tagEntry, error) {
	be := binary.BigEndian
	n := be.Uint32(b[128:])
	if uint64(n)*12+132 > uint64(len(b)) {
		return nil, &FormatError{Offset: 128, Reason: fmt.Sprintf("tag table of %d entries runs past the end (%d bytes)", n, len(b))}
	}
	tags := make(map[Signature]tagEntry, n)
	for i := uint32(0); i < n; i++ {
		e := b[132+12*i:]
		s := Signature(be.Uint32(e))
		t := tagEntry{be.Uint32(e[4:]), be.Uint32(e[8:])}
		if uint64(t.off)+uint64(t.size) > uint64(len(b)) || t.size < 8 {
			return nil, &FormatError{Tag: s.String(), Offset: int64(132 + 12*i), Reason: fmt.Sprintf("offset %d + size %d lies past the end (%d bytes) or is too short", t.off, t.size, len(b))}
		}
		if _, dup := tags[s]; !dup {
			tags[s] = t
		}
	}
	return tags, nil
}

type tagReader struct {
	b    []byte
	tags map[Signature]tagEntry
}

// get returns the tag's bytes, its type signature and its offset, or ok
// false when absent.
func (r *tagReader) get(s string) (data []byte, typ string, off int64, ok bool) {
	t, ok := r.tags[sig(s)]
	if !ok {
		return nil, "", 0, false
	}
	data = r.b[t.off : t.off+t.size]
	return data, string(data[:4]), int64(t.off), true
}

func (p *Profile) readTags(r *tagReader) error {
	var err error
	if d, typ, off, ok := r.get("desc"); ok {
		if p.Description, err = readText(d, typ, "desc", off); err != nil {
			return err
		}
	}
	if d, typ, off, ok := r.get("cprt"); ok {
		if p.Copyright, err = readText(d, typ, "cprt", off); err != nil {
			return err
		}
	}
	p.MediaWhite = D50
	if d, typ, off, ok := r.get("wtpt"); ok {
		if p.MediaWhite, err = readXYZ(d, typ, "wtpt", off); err != nil {
			return err
		}
	}
	if d, typ, off, ok := r.get("bkpt"); ok {
		if p.MediaBlack, err = readXYZ(d, typ, "bkpt", off); err != nil {
			return err
		}
		p.HasBlack = true
	}
	nDev := p.Channels()
	for i := 0; i < 3; i++ {
		name := fmt.Sprintf("A2B%d", i)
		if d, typ, off, ok := r.get(name); ok {
			l, err := readLUT(d, typ, name, off)
			if err != nil {
				return err
			}
			if l.nIn != nDev || l.nOut != 3 {
				return &FormatError{Tag: name, Offset: off, Reason: fmt.Sprintf("table maps %d → %d channels; a %s profile needs %d → 3", l.nIn, l.nOut, p.Space, nDev)}
			}
			l.pcs = pcsEncodingOf(p.PCS, typ)
			p.a2b[i] = l
		}
		name = fmt.Sprintf("B2A%d", i)
		if d, typ, off, ok := r.get(name); ok {
			l, err := readLUT(d, typ, name, off)
			if err != nil {
				return err
			}
			if l.nIn != 3 || l.nOut != nDev {
				return &FormatError{Tag: name, Offset: off, Reason: fmt.Sprintf("table maps %d → %d channels; a %s profile needs 3 → %d", l.nIn, l.nOut, p.Space, nDev)}
			}
			l.pcs = pcsEncodingOf(p.PCS, typ)
			if typ == "mft1" || typ == "mft2" {
				// ICC.1:2001-04 §6.5.7: the lut8/lut16 matrix applies only
				// when the input is XYZ.
				if p.PCS != SpaceXYZ {
					l.dropMatrix()
				}
			}
			// LittleCMS interpolates tables indexed by CIELAB trilinearly
			// (cmsio1.c, _cmsReadOutputLUT); so do we, to agree with it.
			if p.PCS == SpaceLab {
				l.setTrilinear()
			}
			p.b2a[i] = l
		}
	}
	for i := range p.a2b {
		if l := p.a2b[i]; l != nil && p.PCS != SpaceXYZ && (l.kind == "mft1" || l.kind == "mft2") {
			l.dropMatrix()
		}
	}
	shaper, err := readShaper(r, p.Space)
	if err != nil {
		return err
	}
	p.shaper = shaper
	if p.a2b[0] == nil && p.shaper == nil {
		return &FormatError{Tag: "A2B0", Reason: fmt.Sprintf("a %s profile with neither an A2B0 table nor a matrix/TRC model cannot convert colours", p.Space)}
	}
	return nil
}

func readXYZ(d []byte, typ, name string, off int64) (XYZ, error) {
	if typ != "XYZ " {
		return XYZ{}, &FormatError{Tag: name, Offset: off, Reason: fmt.Sprintf("type %q where XYZ was expected", typ)}
	}
	if len(d) < 20 {
		return XYZ{}, &FormatError{Tag: name, Offset: off, Reason: "XYZ tag shorter than 20 bytes"}
	}
	return XYZ{s15f16(d[8:]), s15f16(d[12:]), s15f16(d[16:])}, nil
}

func s15f16(b []byte) float64 { return float64(int32(binary.BigEndian.Uint32(b))) / 65536 }

// readText reads the text types: v2 textDescriptionType ('desc', its ASCII
// part), v4 multiLocalizedUnicodeType ('mluc', the en-US record or else the
// first) and textType ('text').
func readText(d []byte, typ, name string, off int64) (string, error) {
	be := binary.BigEndian
	bad := func(why string) (string, error) {
		return "", &FormatError{Tag: name, Offset: off, Reason: why}
	}
	switch typ {
	case "desc":
		if len(d) < 12 {
			return bad("desc tag shorter than 12 bytes")
		}
		n := be.Uint32(d[8:])
		if uint64(n) > uint64(len(d)-12) {
			return bad(fmt.Sprintf("description of %d bytes runs past the tag (%d)", n, len(d)))
		}
		return strings.TrimRight(string(d[12:12+n]), "\x00"), nil
	case "text":
		return strings.TrimRight(string(d[8:]), "\x00"), nil
	case "mluc":
		if len(d) < 16 {
			return bad("mluc tag shorter than 16 bytes")
		}
		n, size := be.Uint32(d[8:]), be.Uint32(d[12:])
		if size < 12 || uint64(n)*uint64(size)+16 > uint64(len(d)) {
			return bad(fmt.Sprintf("%d records of %d bytes run past the tag (%d)", n, size, len(d)))
		}
		pick := -1
		for i := uint32(0); i < n; i++ {
			rec := d[16+i*size:]
			if pick < 0 || string(rec[:4]) == "enUS" {
				pick = int(i)
				if string(rec[:4]) == "enUS" {
					break
				}
			}
		}
		if pick < 0 {
			return "", nil
		}
		rec := d[16+uint32(pick)*size:]
		ln, o := be.Uint32(rec[4:]), be.Uint32(rec[8:])
		if uint64(o)+uint64(ln) > uint64(len(d)) || ln%2 != 0 {
			return bad(fmt.Sprintf("record text at %d+%d lies outside the tag (%d)", o, ln, len(d)))
		}
		u := make([]uint16, ln/2)
		for i := range u {
			u[i] = be.Uint16(d[o+uint32(2*i):])
		}
		return strings.TrimRight(string(utf16.Decode(u)), "\x00"), nil
	}
	return bad(fmt.Sprintf("unknown text type %q", typ))
}
