package icc_test

import (
	"encoding/binary"
	"math"
)

// Invented profiles built here, so the tests of mAB/mBA and of hostile
// input need no third-party file. The tables are smooth made-up functions
// (no printing condition is claimed); LittleCMS and we must evaluate them
// alike.

type tagData struct {
	sig  string
	data []byte
}

func buildProfile(class, space, pcs string, version uint32, tags []tagData) []byte {
	be := binary.BigEndian
	off := 128 + 4 + 12*len(tags)
	var body []byte
	type ent struct{ off, size int }
	ents := make([]ent, len(tags))
	for i, t := range tags {
		for (off+len(body))%4 != 0 {
			body = append(body, 0)
		}
		ents[i] = ent{off + len(body), len(t.data)}
		body = append(body, t.data...)
	}
	for len(body)%4 != 0 {
		body = append(body, 0)
	}
	size := off + len(body)
	p := be.AppendUint32(nil, uint32(size))
	p = be.AppendUint32(p, 0)
	p = be.AppendUint32(p, version)
	p = append(p, class+space+pcs...)
	p = append(p, make([]byte, 12)...)
	p = append(p, "acsp"...)
	p = append(p, make([]byte, 128-len(p))...)
	// PCS illuminant D50 (§7.2.16).
	be.PutUint32(p[68:], 0x0000F6D6)
	be.PutUint32(p[72:], 0x00010000)
	be.PutUint32(p[76:], 0x0000D32D)
	p = be.AppendUint32(p, uint32(len(tags)))
	for i, t := range tags {
		p = append(p, t.sig...)
		p = be.AppendUint32(p, uint32(ents[i].off))
		p = be.AppendUint32(p, uint32(ents[i].size))
	}
	return append(p, body...)
}

func s15(v float64) []byte {
	return binary.BigEndian.AppendUint32(nil, uint32(int32(math.Round(v*65536))))
}

func xyzTag(x, y, z float64) []byte {
	b := append([]byte("XYZ "), 0, 0, 0, 0)
	return append(append(append(b, s15(x)...), s15(y)...), s15(z)...)
}

func descTag(s string) []byte {
	b := append([]byte("desc"), 0, 0, 0, 0)
	b = binary.BigEndian.AppendUint32(b, uint32(len(s)+1))
	b = append(b, s...)
	b = append(b, 0)
	return append(b, make([]byte, 4+4+2+1+67)...) // empty Unicode and ScriptCode parts
}

func paraTag(typ int, params ...float64) []byte {
	b := append([]byte("para"), 0, 0, 0, 0)
	b = binary.BigEndian.AppendUint16(b, uint16(typ))
	b = append(b, 0, 0)
	for _, v := range params {
		b = append(b, s15(v)...)
	}
	return b
}

func curvTag(f func(x float64) float64, n int) []byte {
	b := append([]byte("curv"), 0, 0, 0, 0)
	b = binary.BigEndian.AppendUint32(b, uint32(n))
	for i := 0; i < n; i++ {
		b = binary.BigEndian.AppendUint16(b, uint16(math.Round(65535*clamp(f(float64(i)/float64(n-1))))))
	}
	return b
}

func clamp(v float64) float64 { return math.Max(0, math.Min(1, v)) }

func pad4(b []byte) []byte {
	for len(b)%4 != 0 {
		b = append(b, 0)
	}
	return b
}

// clutBytes samples f over a grid of dims (first input slowest), 16-bit.
func clutBytes(dims []int, nOut int, f func(in []float64) []float64) []byte {
	b := make([]byte, 16)
	for i, d := range dims {
		b[i] = byte(d)
	}
	b = append(b, 2, 0, 0, 0)
	n := len(dims)
	idx := make([]int, n)
	in := make([]float64, n)
	for {
		for i := range idx {
			in[i] = float64(idx[i]) / float64(dims[i]-1)
		}
		for _, v := range f(in)[:nOut] {
			b = binary.BigEndian.AppendUint16(b, uint16(math.Round(65535*clamp(v))))
		}
		k := n - 1
		for k >= 0 {
			idx[k]++
			if idx[k] < dims[k] {
				break
			}
			idx[k] = 0
			k--
		}
		if k < 0 {
			return b
		}
	}
}

// lutAB builds an mAB or mBA tag; nil elements are left out.
func lutAB(typ string, nIn, nOut int, bCurves, matrix, mCurves, clut, aCurves [][]byte) []byte {
	be := binary.BigEndian
	b := append([]byte(typ), 0, 0, 0, 0, byte(nIn), byte(nOut), 0, 0)
	b = append(b, make([]byte, 20)...)
	place := func(slot int, parts [][]byte) {
		if parts == nil {
			return
		}
		b = pad4(b)
		be.PutUint32(b[12+4*slot:], uint32(len(b)))
		for _, p := range parts {
			b = pad4(append(b, p...))
		}
	}
	place(0, bCurves)
	place(1, matrix)
	place(2, mCurves)
	place(3, clut)
	place(4, aCurves)
	return b
}

func repeatTag(t []byte, n int) [][]byte {
	r := make([][]byte, n)
	for i := range r {
		r[i] = t
	}
	return r
}

// inventedCMYK is a made-up ICC v4 CMYK output profile with a Lab PCS and
// mAB/mBA tables using every element (curves of both kinds, matrix with
// offset, 16-bit CLUT).
func inventedCMYK() []byte {
	// CMYK → Lab: a toy subtractive model (colorants as filters).
	toLab := func(in []float64) []float64 {
		c, m, y, k := in[0], in[1], in[2], in[3]
		r := (1 - 0.92*c) * (1 - 0.1*m) * (1 - 0.8*k)
		g := (1 - 0.3*c) * (1 - 0.9*m) * (1 - 0.05*y) * (1 - 0.8*k)
		bl := (1 - 0.1*c) * (1 - 0.4*m) * (1 - 0.93*y) * (1 - 0.8*k)
		yy := 0.25*r + 0.65*g + 0.1*bl
		L := 116*math.Cbrt(yy) - 16
		a := 200 * (r - g)
		bb := 150 * (g - bl)
		return []float64{L / 100, (a + 128) / 255, (bb + 128) / 255}
	}
	// Lab → CMYK: some smooth separation (not an exact inverse; the test
	// compares evaluation, not quality).
	toCMYK := func(in []float64) []float64 {
		L, a, b := in[0], in[1]*255-128, in[2]*255-128
		k := clamp((0.55 - L) * 1.3)
		c := clamp(1 - L - a/200 + 0.1)
		m := clamp(1 - L + a/150 - b/400)
		y := clamp(1 - L + b/150)
		return []float64{c * (1 - k/2), m * (1 - k/2), y * (1 - k/2), k}
	}
	matrix := [][]byte{}
	mat := []float64{0.98, 0.01, 0.01, 0.0, 0.97, 0.02, 0.01, 0.0, 0.99, 0.005, 0.01, 0.0}
	for _, v := range mat {
		matrix = append(matrix, s15(v))
	}
	a2b := lutAB("mAB ", 4, 3,
		repeatTag(curvTag(func(x float64) float64 { return x }, 0), 3),
		matrix,
		repeatTag(paraTag(0, 1.05), 3),
		[][]byte{clutBytes([]int{7, 6, 5, 9}, 3, toLab)},
		[][]byte{paraTag(3, 1.2, 1/1.1, 0.1/1.1, 1/6.0, 0.06), paraTag(0, 0.9), curvTag(func(x float64) float64 { return x*x*0.5 + x*0.5 }, 64), paraTag(1, 1.1, 1, 0)},
	)
	b2aMat := [][]byte{}
	for _, v := range []float64{1.01, 0, 0, 0, 0.99, 0.005, 0, 0.01, 0.98, 0, 0, 0} {
		b2aMat = append(b2aMat, s15(v))
	}
	b2a := lutAB("mBA ", 3, 4,
		repeatTag(paraTag(0, 1.0), 3),
		b2aMat,
		repeatTag(curvTag(func(x float64) float64 { return math.Pow(x, 1.1) }, 256), 3),
		[][]byte{clutBytes([]int{17, 15, 13}, 4, toCMYK)},
		repeatTag(paraTag(2, 1.0, 0.95, 0.02, 0.01), 4),
	)
	return buildProfile("prtr", "CMYK", "Lab ", 0x04300000, []tagData{
		{"desc", descTag("invented CMYK test profile")},
		{"wtpt", xyzTag(0.9642, 1, 0.8249)},
		{"A2B0", a2b},
		{"B2A0", b2a},
	})
}
