package icc

import (
	"crypto/md5"
	"encoding/binary"
	"math"
	"unicode/utf16"
)

// ICC profile built from the sRGB definition rather than shipped as a blob,
// so its provenance is plain: IEC 61966-2-1 primaries and D65 white, the
// ICC PCS illuminant D50, a Bradford chromatic adaptation between them
// (ICC.1:2010 Annex E / ICC v4 'chad'), and the sRGB tone curve as an ICC
// parametric curve of function type 3 (ICC.1:2010 §10.18, Table 68).
//
// The version is 4.1 (ICC.1:2003-09), the ICC edition PDF 1.6 and so
// PDF/X-4 refer to. The creation date is left zero so the bytes never
// depend on the clock; the profile ID is the MD5 digest the ICC defines
// (§7.2.18), so a reader can check the bytes.

// SRGBDescription is the description tag of the built-in sRGB profile.
const SRGBDescription = "sheaf sRGB IEC61966-2.1"

// sRGB chromaticities, IEC 61966-2-1:1999 §5.1 Table 1.
var (
	srgbPrimaries = [3][2]float64{{0.64, 0.33}, {0.30, 0.60}, {0.15, 0.06}}
	srgbWhiteD65  = [2]float64{0.3127, 0.3290}
	// srgbPCSWhite is the ICC PCS illuminant, ICC.1:2010 §7.2.16 (s15Fixed16
	// values 0x0000F6D6, 0x00010000, 0x0000D32D).
	srgbPCSWhite = [3]float64{0.9642, 1.0, 0.8249}
)

// bradford is the Bradford cone response matrix (Lam 1985, as given in
// ICC.1:2010 Annex E.3).
var bradford = mat3{
	{0.8951, 0.2664, -0.1614},
	{-0.7502, 1.7135, 0.0367},
	{0.0389, -0.0685, 1.0296},
}

type mat3 [3][3]float64

func (a mat3) mul(b mat3) mat3 {
	var c mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			for k := 0; k < 3; k++ {
				c[i][j] += a[i][k] * b[k][j]
			}
		}
	}
	return c
}

func (a mat3) apply(v [3]float64) [3]float64 {
	var r [3]float64
	for i := 0; i < 3; i++ {
		r[i] = a[i][0]*v[0] + a[i][1]*v[1] + a[i][2]*v[2]
	}
	return r
}

// inv is the inverse of a matrix known to be invertible (the sRGB
// primaries, Bradford's cone matrix).
func (a mat3) inv() mat3 {
	r, _ := invert3(a)
	return r
}

func xyToXYZ(x, y float64) [3]float64 { return [3]float64{x / y, 1, (1 - x - y) / y} }

// srgbToXYZD65 derives the linear sRGB → XYZ matrix from the primaries and
// white point (the usual construction, e.g. SMPTE RP 177-1993 §3.3).
func srgbToXYZD65() mat3 {
	var p mat3
	for j, xy := range srgbPrimaries {
		c := xyToXYZ(xy[0], xy[1])
		for i := 0; i < 3; i++ {
			p[i][j] = c[i]
		}
	}
	s := p.inv().apply(xyToXYZ(srgbWhiteD65[0], srgbWhiteD65[1]))
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			p[i][j] *= s[j]
		}
	}
	return p
}

// bradfordD65ToD50 is the chromatic adaptation matrix from the sRGB white
// to the PCS illuminant.
func bradfordD65ToD50() mat3 {
	src := bradford.apply(xyToXYZ(srgbWhiteD65[0], srgbWhiteD65[1]))
	dst := bradford.apply(srgbPCSWhite)
	var d mat3
	for i := 0; i < 3; i++ {
		d[i][i] = dst[i] / src[i]
	}
	return bradford.inv().mul(d).mul(bradford)
}

// SRGB returns the built-in sRGB profile (see SRGBBytes), parsed: the
// source of every colour sheaf converts for press.
func SRGB() *Profile {
	p, err := Parse(SRGBBytes())
	if err != nil {
		panic("icc: the built-in sRGB profile does not parse: " + err.Error()) // a bug, caught by the tests
	}
	return p
}

// SRGBBytes returns the bytes of the ICC v4 sRGB display profile that
// every RGB colour in sheaf's documents is tagged with. The bytes are the
// same on every call and every machine.
func SRGBBytes() []byte {
	chad := bradfordD65ToD50()
	colorants := chad.mul(srgbToXYZD65())

	type tag struct {
		sig  string
		data []byte
	}
	colorants = balanceColorants(colorants)
	col := func(j int) []byte { return xyzType(colorants[0][j], colorants[1][j], colorants[2][j]) }
	// IEC 61966-2-1 §5.2: V = ((V' + 0.055)/1.055)^2.4 above 0.04045,
	// V'/12.92 below; para type 3 is Y = (aX+b)^g for X ≥ d, Y = cX else.
	trc := paraType3(2.4, 1/1.055, 0.055/1.055, 1/12.92, 0.04045)
	tags := []tag{
		{"desc", mlucType(SRGBDescription)},
		{"cprt", mlucType("No copyright, use freely")},
		{"wtpt", xyzType(srgbPCSWhite[0], srgbPCSWhite[1], srgbPCSWhite[2])},
		{"chad", sf32Type(chad)},
		{"rXYZ", col(0)},
		{"gXYZ", col(1)},
		{"bXYZ", col(2)},
		{"rTRC", trc},
		{"gTRC", trc},
		{"bTRC", trc},
	}

	const headerLen = 128
	tableLen := 4 + 12*len(tags)
	off := headerLen + tableLen
	var body []byte
	type entry struct{ off, size int }
	entries := make([]entry, len(tags))
	shared := map[string]int{} // identical tag data is stored once (§7.3.1 allows sharing)
	for i, t := range tags {
		key := string(t.data)
		if o, ok := shared[key]; ok {
			entries[i] = entry{o, len(t.data)}
			continue
		}
		for (off+len(body))%4 != 0 {
			body = append(body, 0)
		}
		o := off + len(body)
		shared[key] = o
		entries[i] = entry{o, len(t.data)}
		body = append(body, t.data...)
	}
	for len(body)%4 != 0 {
		body = append(body, 0)
	}
	size := off + len(body)

	p := make([]byte, 0, size)
	be := binary.BigEndian
	p = be.AppendUint32(p, uint32(size))
	p = be.AppendUint32(p, 0)          // preferred CMM: none
	p = be.AppendUint32(p, 0x04100000) // version 4.1.0
	p = append(p, "mntrRGB XYZ "...)
	p = append(p, make([]byte, 12)...) // date and time: deliberately zero
	p = append(p, "acsp"...)
	p = append(p, make([]byte, 64-40)...) // platform, flags, manufacturer, model, attributes
	p = be.AppendUint32(p, 0)             // rendering intent: perceptual
	p = append(p, xyzType(srgbPCSWhite[0], srgbPCSWhite[1], srgbPCSWhite[2])[8:]...)
	p = append(p, make([]byte, headerLen-len(p))...) // creator, ID (filled below), reserved
	p = be.AppendUint32(p, uint32(len(tags)))
	for i, t := range tags {
		p = append(p, t.sig...)
		p = be.AppendUint32(p, uint32(entries[i].off))
		p = be.AppendUint32(p, uint32(entries[i].size))
	}
	p = append(p, body...)

	// Profile ID, ICC.1:2010 §7.2.18: MD5 over the profile with the flags,
	// rendering intent and profile ID fields set to zero — as they are here.
	id := md5.Sum(p)
	copy(p[84:100], id[:])
	return p
}

func encS15f16(v float64) []byte {
	return binary.BigEndian.AppendUint32(nil, uint32(int32(math.Round(v*65536))))
}

func xyzType(x, y, z float64) []byte {
	b := append([]byte("XYZ "), 0, 0, 0, 0)
	b = append(b, encS15f16(x)...)
	b = append(b, encS15f16(y)...)
	return append(b, encS15f16(z)...)
}

func sf32Type(m mat3) []byte {
	b := append([]byte("sf32"), 0, 0, 0, 0)
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			b = append(b, encS15f16(m[i][j])...)
		}
	}
	return b
}

func paraType3(g, a, bb, c, d float64) []byte {
	b := append([]byte("para"), 0, 0, 0, 0)
	b = binary.BigEndian.AppendUint16(b, 3)
	b = append(b, 0, 0)
	for _, v := range []float64{g, a, bb, c, d} {
		b = append(b, encS15f16(v)...)
	}
	return b
}

// mlucType is a multiLocalizedUnicodeType with one en-US record.
func mlucType(s string) []byte {
	u := utf16.Encode([]rune(s))
	b := append([]byte("mluc"), 0, 0, 0, 0)
	be := binary.BigEndian
	b = be.AppendUint32(b, 1)  // records
	b = be.AppendUint32(b, 12) // record size
	b = append(b, "enUS"...)
	b = be.AppendUint32(b, uint32(2*len(u)))
	b = be.AppendUint32(b, 28) // offset from the tag start
	for _, c := range u {
		b = be.AppendUint16(b, c)
	}
	return b
}

// balanceColorants rounds the colorants to the s15Fixed16 grid so that each
// row still sums exactly to the encoded PCS white: R=G=B=1 then lands on D50
// and neutrals get a* = b* = 0 up to the CMM's arithmetic, instead of
// picking up the three rounding errors. The residual (at most 1.5/65536)
// goes to the entry whose rounding moved it least.
func balanceColorants(c mat3) mat3 {
	for i := 0; i < 3; i++ {
		target := math.Round(srgbPCSWhite[i] * 65536)
		var q [3]float64
		sum := 0.0
		for j := 0; j < 3; j++ {
			q[j] = math.Round(c[i][j] * 65536)
			sum += q[j]
		}
		if r := target - sum; r != 0 {
			best, bestErr := 0, math.Inf(1)
			for j := 0; j < 3; j++ {
				if e := math.Abs(q[j] + r - c[i][j]*65536); e < bestErr {
					best, bestErr = j, e
				}
			}
			q[best] += r
		}
		for j := 0; j < 3; j++ {
			c[i][j] = q[j] / 65536
		}
	}
	return c
}
