package production

import (
	"encoding/binary"
	"errors"
	"fmt"
	"hash/crc32"
	"io"
	"math"

	"github.com/tdewolff/canvas"

	"sheaf/render/pdf"
)

// A cached page (.cache/OUTPUT/HASH.page) is a pdf.EncodedPage in a plain
// binary layout: a rebuild reads every unchanged page back, and decoding
// gob costs ten times more than the bytes. Little-endian throughout;
// counts and lengths are uvarints, floats their IEEE 754 bits:
//
//	magic "sheaf page v2\n"
//	boxes       12 × float64 (media, bleed, trim: x0 y0 x1 y1)
//	content     length, bytes; compressed: 1 byte
//	fonts       count; each: key (32 bytes), glyph count, each glyph:
//	            id uint16, text length, text
//	patterns    count; each: radial byte, device components (1 byte),
//	            coord count, coords, stop count, stops (offset r g b,
//	            ink count, inks)
//	gstates     count; each: fill, stroke, overprint byte
//	transparent 1 byte
//	device      device components of the page (1 byte; 0 = sRGB)
//	CRC-32C of all the above, 4 bytes
//
// TestPageCacheCoversEncodedPage fails when pdf.EncodedPage gains a field
// this layout does not carry.
const pageMagic = "sheaf page v2\n"

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

// writeCachedPage writes e in the layout above.
func writeCachedPage(w io.Writer, e *pdf.EncodedPage) error {
	b := make([]byte, 0, len(e.Content)+4096)
	b = append(b, pageMagic...)
	f64 := func(v float64) { b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v)) }
	n := func(v int) { b = binary.AppendUvarint(b, uint64(v)) }
	flag := func(v bool) {
		if v {
			b = append(b, 1)
		} else {
			b = append(b, 0)
		}
	}
	for _, r := range []canvas.Rect{e.Boxes.Media, e.Boxes.Bleed, e.Boxes.Trim} {
		f64(r.X0)
		f64(r.Y0)
		f64(r.X1)
		f64(r.Y1)
	}
	n(len(e.Content))
	b = append(b, e.Content...)
	flag(e.Compressed)
	n(len(e.Fonts))
	for _, f := range e.Fonts {
		b = append(b, f.Key[:]...)
		n(len(f.Glyphs))
		for _, g := range f.Glyphs {
			b = binary.LittleEndian.AppendUint16(b, g.ID)
			n(len(g.Text))
			b = append(b, g.Text...)
		}
	}
	n(len(e.Patterns))
	for _, s := range e.Patterns {
		flag(s.Radial)
		b = append(b, byte(s.Device))
		n(len(s.Coords))
		for _, c := range s.Coords {
			f64(c)
		}
		n(len(s.Stops))
		for _, st := range s.Stops {
			f64(st.Offset)
			f64(st.R)
			f64(st.G)
			f64(st.B)
			n(len(st.Ink))
			for _, v := range st.Ink {
				f64(v)
			}
		}
	}
	n(len(e.GStates))
	for _, g := range e.GStates {
		f64(g.Fill)
		f64(g.Stroke)
		flag(g.Overprint)
	}
	flag(e.Transparent)
	b = append(b, byte(e.Device))
	b = binary.LittleEndian.AppendUint32(b, crc32.Checksum(b, castagnoli))
	_, err := w.Write(b)
	return err
}

// pageReader takes a cached page apart; the first problem sticks.
type pageReader struct {
	b   []byte
	err error
}

func (r *pageReader) fail(what string) {
	if r.err == nil {
		r.err = fmt.Errorf("cached page: %s is cut short or malformed", what)
	}
}

func (r *pageReader) bytes(n int, what string) []byte {
	if r.err != nil || n < 0 || n > len(r.b) {
		r.fail(what)
		return nil
	}
	out := r.b[:n]
	r.b = r.b[n:]
	return out
}

func (r *pageReader) count(what string) int {
	if r.err != nil {
		return 0
	}
	v, k := binary.Uvarint(r.b)
	// No count can exceed the bytes left: every item takes at least one.
	if k <= 0 || v > uint64(len(r.b)) {
		r.fail(what)
		return 0
	}
	r.b = r.b[k:]
	return int(v)
}

func (r *pageReader) f64(what string) float64 {
	if b := r.bytes(8, what); b != nil {
		return math.Float64frombits(binary.LittleEndian.Uint64(b))
	}
	return 0
}

// device reads a colour space's component count: 0 (sRGB), 1, 3 or 4.
func (r *pageReader) device(what string) int {
	b := r.bytes(1, what)
	if b == nil {
		return 0
	}
	switch b[0] {
	case 0, 1, 3, 4:
		return int(b[0])
	}
	r.fail(what)
	return 0
}

func (r *pageReader) flag(what string) bool {
	b := r.bytes(1, what)
	if b != nil && b[0] > 1 {
		r.fail(what)
	}
	return b != nil && b[0] == 1
}

// decodeCachedPage reads what writeCachedPage wrote. Empty lists come
// back nil, as gob gives them.
func decodeCachedPage(data []byte) (*pdf.EncodedPage, error) {
	e, _, err := decodePage(data)
	return e, err
}

// decodePage is decodeCachedPage that also tells where in data the
// content stream starts.
func decodePage(data []byte) (e *pdf.EncodedPage, off int, err error) {
	if len(data) < len(pageMagic)+4 || string(data[:len(pageMagic)]) != pageMagic {
		return nil, 0, errors.New("cached page: not a page of this version")
	}
	body := data[:len(data)-4]
	if crc32.Checksum(body, castagnoli) != binary.LittleEndian.Uint32(data[len(data)-4:]) {
		return nil, 0, errors.New("cached page: checksum mismatch (damaged file)")
	}
	r := &pageReader{b: body[len(pageMagic):]}
	e = &pdf.EncodedPage{}
	for _, box := range []*canvas.Rect{&e.Boxes.Media, &e.Boxes.Bleed, &e.Boxes.Trim} {
		box.X0, box.Y0, box.X1, box.Y1 = r.f64("boxes"), r.f64("boxes"), r.f64("boxes"), r.f64("boxes")
	}
	n := r.count("content")
	off = len(body) - len(r.b)
	if c := r.bytes(n, "content"); len(c) > 0 {
		e.Content = c[:len(c):len(c)] // data is the caller's to give away
	}
	e.Compressed = r.flag("compressed")
	if n := r.count("fonts"); n > 0 {
		e.Fonts = make([]pdf.PageFont, n)
		for i := range e.Fonts {
			f := &e.Fonts[i]
			copy(f.Key[:], r.bytes(len(f.Key), "font key"))
			if g := r.count("glyphs"); g > 0 {
				f.Glyphs = make([]pdf.GlyphUse, g)
				for j := range f.Glyphs {
					if id := r.bytes(2, "glyph"); id != nil {
						f.Glyphs[j].ID = binary.LittleEndian.Uint16(id)
					}
					f.Glyphs[j].Text = string(r.bytes(r.count("glyph text"), "glyph text"))
				}
			}
		}
	}
	if n := r.count("patterns"); n > 0 {
		e.Patterns = make([]pdf.Shading, n)
		for i := range e.Patterns {
			s := &e.Patterns[i]
			s.Radial = r.flag("pattern")
			s.Device = r.device("pattern device")
			if c := r.count("coords"); c > 0 {
				s.Coords = make([]float64, c)
				for j := range s.Coords {
					s.Coords[j] = r.f64("coords")
				}
			}
			if c := r.count("stops"); c > 0 {
				s.Stops = make([]pdf.Stop, c)
				for j := range s.Stops {
					s.Stops[j] = pdf.Stop{Offset: r.f64("stops"), R: r.f64("stops"), G: r.f64("stops"), B: r.f64("stops")}
					if k := r.count("inks"); k > 0 {
						s.Stops[j].Ink = make([]float64, k)
						for m := range s.Stops[j].Ink {
							s.Stops[j].Ink[m] = r.f64("inks")
						}
					}
				}
			}
		}
	}
	if n := r.count("gstates"); n > 0 {
		e.GStates = make([]pdf.Alpha, n)
		for i := range e.GStates {
			e.GStates[i] = pdf.Alpha{Fill: r.f64("gstates"), Stroke: r.f64("gstates"), Overprint: r.flag("overprint")}
		}
	}
	e.Transparent = r.flag("transparent")
	e.Device = r.device("device")
	if r.err == nil && len(r.b) != 0 {
		r.fail("the end")
	}
	if r.err != nil {
		return nil, 0, r.err
	}
	return e, off, nil
}
