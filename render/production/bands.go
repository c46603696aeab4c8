package production

import (
	"bytes"
	"compress/flate"
	"context"
	"encoding/binary"
	"encoding/json"
	"errors"
	"hash/adler32"
	"hash/crc32"
	"image"
	"io"
	"os"
	"path/filepath"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/render/feature"
	"sheaf/render/raster"
)

// A screen PNG is drawn and compressed in bands of bandRows pixel rows,
// each band cached under the hash of everything that decides its pixels
// (bandInputs): a rebuild draws only the bands whose inputs changed and
// takes the others' compressed bytes from the last build. A full build is
// made the same way, so the two give the same bytes by construction.
//
// The PNG (ISO/IEC 15948 / W3C PNG 2nd ed.) is RGB, 8 bits a channel.
// Its zlib stream (RFC 1950) is the bands' deflate data (RFC 1951), each
// ended by a sync flush so that they follow one another at byte
// boundaries, then an empty final stored block and the Adler-32 of all
// rows, combined from the bands' own; every band is an IDAT chunk of its
// own. A band's first row is filtered with Sub, which looks at no row
// above, so a band's bytes depend on its own pixels alone; later rows use
// Paeth.
const bandRows = 512

// bandMargin is how far, in points, a panel's ink may reach beyond its
// box (label and plot) and tick labels: a band draws every panel whose
// box so grown meets it. Strokes, the peak dot and glyphs overhang by a
// few points at most.
const bandMargin = 12.0

// encodedBand is one band: its filtered rows deflated, their Adler-32
// and their length.
type encodedBand struct {
	adler uint32
	raw   int64
	data  []byte
}

// encodeBand filters and deflates the rows of img (opaque: the alpha is
// dropped; screen pages are drawn on the paper colour).
func encodeBand(img *image.RGBA) (*encodedBand, error) {
	w, h := img.Bounds().Dx(), img.Bounds().Dy()
	n := 3 * w
	raw := make([]byte, 0, (1+n)*h)
	prev, cur := make([]byte, n), make([]byte, n)
	for y := range h {
		row := img.Pix[img.PixOffset(img.Bounds().Min.X, img.Bounds().Min.Y+y):]
		for x := range w {
			copy(cur[3*x:3*x+3], row[4*x:4*x+3])
		}
		if y == 0 {
			raw = append(raw, 1) // Sub
			for i := range n {
				var a byte
				if i >= 3 {
					a = cur[i-3]
				}
				raw = append(raw, cur[i]-a)
			}
		} else {
			raw = append(raw, 4) // Paeth
			for i := range n {
				var a, c byte
				if i >= 3 {
					a, c = cur[i-3], prev[i-3]
				}
				raw = append(raw, cur[i]-paeth(a, prev[i], c))
			}
		}
		prev, cur = cur, prev
	}
	var buf bytes.Buffer
	fw, err := flate.NewWriter(&buf, flate.DefaultCompression)
	if err != nil {
		return nil, err
	}
	if _, err := fw.Write(raw); err != nil {
		return nil, err
	}
	if err := fw.Flush(); err != nil { // a sync flush: byte-aligned, not final
		return nil, err
	}
	return &encodedBand{adler: adler32.Checksum(raw), raw: int64(len(raw)), data: buf.Bytes()}, nil
}

// paeth is the PNG Paeth predictor (PNG 2nd ed. §9.4).
func paeth(a, b, c byte) byte {
	p := int(a) + int(b) - int(c)
	pa, pb, pc := abs(p-int(a)), abs(p-int(b)), abs(p-int(c))
	switch {
	case pa <= pb && pa <= pc:
		return a
	case pb <= pc:
		return b
	}
	return c
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

// adler32Combine is the Adler-32 of two byte strings one after the other,
// from their own Adler-32s and the second's length (as zlib's
// adler32_combine computes it).
func adler32Combine(a1, a2 uint32, len2 int64) uint32 {
	const base = 65521
	rem := uint32(len2 % base)
	sum1 := a1 & 0xffff
	sum2 := (rem * sum1) % base
	sum1 += (a2 & 0xffff) + base - 1
	sum2 += (a1 >> 16) + (a2 >> 16) + base - rem
	if sum1 >= base {
		sum1 -= base
	}
	if sum1 >= base {
		sum1 -= base
	}
	if sum2 >= base<<1 {
		sum2 -= base << 1
	}
	if sum2 >= base {
		sum2 -= base
	}
	return sum1 | sum2<<16
}

// writeBandedPNG writes a w × h RGB PNG made of bands, top to bottom.
func writeBandedPNG(out io.Writer, w, h int, bands []*encodedBand) error {
	bw := &chunkWriter{w: out}
	bw.raw([]byte("\x89PNG\r\n\x1a\n"))
	var ihdr [13]byte
	binary.BigEndian.PutUint32(ihdr[0:], uint32(w))
	binary.BigEndian.PutUint32(ihdr[4:], uint32(h))
	ihdr[8], ihdr[9] = 8, 2 // 8 bits, truecolour
	bw.chunk("IHDR", ihdr[:])
	bw.chunk("IDAT", []byte{0x78, 0x9c}) // zlib: deflate, 32 KiB window
	sum := uint32(1)
	for _, b := range bands {
		if len(b.data) > 0 {
			bw.chunk("IDAT", b.data)
		}
		sum = adler32Combine(sum, b.adler, b.raw)
	}
	tail := []byte{1, 0, 0, 0xff, 0xff, 0, 0, 0, 0} // final empty stored block, Adler-32
	binary.BigEndian.PutUint32(tail[5:], sum)
	bw.chunk("IDAT", tail)
	bw.chunk("IEND", nil)
	return bw.err
}

type chunkWriter struct {
	w   io.Writer
	err error
}

func (c *chunkWriter) raw(p []byte) {
	if c.err == nil {
		_, c.err = c.w.Write(p)
	}
}

func (c *chunkWriter) chunk(typ string, data []byte) {
	var n [4]byte
	binary.BigEndian.PutUint32(n[:], uint32(len(data)))
	c.raw(n[:])
	c.raw([]byte(typ))
	c.raw(data)
	crc := crc32.NewIEEE()
	crc.Write([]byte(typ))
	crc.Write(data)
	binary.BigEndian.PutUint32(n[:], crc.Sum32())
	c.raw(n[:])
}

// bandMagic starts a cached band file.
const bandMagic = "sheaf band v1\n"

func writeBandFile(w io.Writer, b *encodedBand) error {
	var hdr [12]byte
	binary.BigEndian.PutUint32(hdr[0:], b.adler)
	binary.BigEndian.PutUint64(hdr[4:], uint64(b.raw))
	if _, err := io.WriteString(w, bandMagic); err != nil {
		return err
	}
	if _, err := w.Write(hdr[:]); err != nil {
		return err
	}
	_, err := w.Write(b.data)
	return err
}

func readBandFile(path string) (*encodedBand, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if len(data) < len(bandMagic)+12 || string(data[:len(bandMagic)]) != bandMagic {
		return nil, errors.New("not a band file")
	}
	d := data[len(bandMagic):]
	return &encodedBand{adler: binary.BigEndian.Uint32(d[0:]), raw: int64(binary.BigEndian.Uint64(d[4:])), data: d[12:]}, nil
}

// pageBands is what the bands of one page's PNGs share: the hash of all
// but its panels, and each panel's hash with its reach in points.
type pageBands struct {
	base   string // see bandInputs
	panels []bandPanel
}

type bandPanel struct {
	pn     layout.Panel
	y0, y1 float64 // the panel's reach, grown by bandMargin
	sum    string
}

// newPageBands hashes page i of a screen output for its bands.
func (b *build) newPageBands(p *feature.Output, i int, fontSum string) *pageBands {
	pg := p.Plan.Pages[i]
	h := newHasher("sheaf band page v1")
	h.str(Version)
	h.str(b.specSum)
	h.str(p.Spec.Name)
	h.int(i)
	h.int(len(p.Plan.Pages))
	bare := pg
	bare.Panels = nil
	if s, err := json.Marshal(bare); err == nil {
		h.str(string(s))
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
	h.str(fontSum)
	pb := &pageBands{base: h.sum()}
	labels := p.Feature.Labels()
	for _, pn := range pg.Panels {
		h.reset("sheaf band panel v1")
		if s, err := json.Marshal(pn); err == nil {
			h.str(string(s))
		}
		sr := &d.Series[pn.Item]
		h.str(sr.Term)
		h.floats(sr.Values)
		h.float(sr.Peak)
		h.int(sr.PeakYear)
		h.float(sr.YMax)
		if pn.Item < len(labels) {
			h.str(labels[pn.Item].DrawnText())
			h.float(labels[pn.Item].Size)
		}
		box := pn.Box()
		lo := box.Y0
		if pn.ShowTicks {
			lo = min(lo, pn.Ticks.Y0)
		}
		pb.panels = append(pb.panels, bandPanel{pn: pn, y0: lo - bandMargin, y1: box.Y1 + bandMargin, sum: h.sum()})
	}
	return pb
}

// bandTask is one band of one PNG.
type bandTask struct {
	key    string
	region raster.Region // the band's pixels on the page
	panels []layout.Panel
}

// bands cuts the PNG of page i at dpi into bands and names each by the
// hash of its inputs: the page's, the scale, the band's rows, and the
// panels it meets.
func (pb *pageBands) bands(pageH, dpi float64, r raster.Region) []bandTask {
	var out []bandTask
	for y := 0; y < r.H; y += bandRows {
		y1 := min(y+bandRows, r.H)
		top := pageH - float64(r.Y+y)*72/dpi
		bottom := pageH - float64(r.Y+y1)*72/dpi
		h := newHasher("sheaf band v1")
		h.str(pb.base)
		h.float(dpi)
		h.int(r.X)
		h.int(r.Y + y)
		h.int(r.W)
		h.int(y1 - y)
		t := bandTask{region: raster.Region{X: r.X, Y: r.Y + y, W: r.W, H: y1 - y}}
		for _, bp := range pb.panels {
			if bp.y1 >= bottom && bp.y0 <= top {
				h.str(bp.sum)
				t.panels = append(t.panels, bp.pn)
			}
		}
		t.key = h.sum()
		out = append(out, t)
	}
	return out
}

// drawBand draws the band's pixels: everything on the page but the
// panels it does not meet.
func drawBand(ctx context.Context, p *feature.Output, i int, dpi float64, t bandTask) (*image.RGBA, error) {
	pg := &p.Plan.Pages[i]
	in := map[int]bool{}
	for _, pn := range t.panels {
		in[pn.Item] = true
	}
	return raster.DrawRegionContext(ctx, pg.Media.H(), dpi, t.region, p.Feature.PaperColor(), func(ctx *canvas.Context) error {
		return p.Feature.DrawSome(ctx, i, func(pn layout.Panel) bool { return in[pn.Item] })
	})
}

// bandOf returns a band of the PNG file from the last build's cache, or
// draws and encodes it; either way it is in this build's cache after.
// drawn says which.
func (b *build) bandOf(p *feature.Output, i int, dpi float64, t bandTask, file string) (eb *encodedBand, drawn bool, err error) {
	name := t.key + ".band"
	oldPath := filepath.Join(b.final, CacheDir, p.Spec.Name, name)
	newPath := filepath.Join(b.stage.dir, CacheDir, p.Spec.Name, name)
	if !b.full {
		if eb, err := readBandFile(oldPath); err == nil && linkOrCopy(oldPath, newPath) == nil {
			return eb, false, nil
		}
	}
	img, err := b.rasterize(file, func() (*image.RGBA, error) { return drawBand(b.ctx, p, i, dpi, t) })
	if err != nil {
		return nil, true, err
	}
	eb, err = encodeBand(img)
	if err != nil {
		return nil, true, err
	}
	err = WriteAtomic(newPath, func(w io.Writer) error { return writeBandFile(w, eb) })
	return eb, true, err
}
