package icc

import (
	"encoding/binary"
	"fmt"
	"math"
)

// curve is a one-dimensional transfer function on [0, 1].
type curve interface {
	eval(x float64) float64
}

// tableCurve is a sampled curve (curv with n ≥ 2 entries, or a lut8/lut16
// table), linearly interpolated.
type tableCurve []float64

func (t tableCurve) eval(x float64) float64 {
	x = clamp01(x)
	pos := x * float64(len(t)-1)
	i := int(pos)
	if i >= len(t)-1 {
		return t[len(t)-1]
	}
	f := pos - float64(i)
	return t[i] + f*(t[i+1]-t[i])
}

// inverse finds x with eval(x) = y on a monotone table (rising or falling),
// by bisection on the segments; flat runs return their first x.
func (t tableCurve) inverse(y float64) float64 {
	n := len(t)
	rising := t[n-1] >= t[0]
	lo, hi := 0, n-1
	if rising && y <= t[0] || !rising && y >= t[0] {
		return 0
	}
	if rising && y >= t[n-1] || !rising && y <= t[n-1] {
		return 1
	}
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if (t[mid] < y) == rising {
			lo = mid
		} else {
			hi = mid
		}
	}
	d := t[hi] - t[lo]
	f := 0.0
	if d != 0 {
		f = (y - t[lo]) / d
	}
	return (float64(lo) + f) / float64(n-1)
}

// paraCurve is ICC.1:2010 §10.18 parametricCurveType, function types 0–4.
type paraCurve struct {
	typ                 int
	g, a, b, c, d, e, f float64
}

func (p paraCurve) eval(x float64) float64 {
	switch p.typ {
	case 0:
		return pow(x, p.g)
	case 1:
		if x >= -p.b/p.a {
			return pow(p.a*x+p.b, p.g)
		}
		return 0
	case 2:
		if x >= -p.b/p.a {
			return pow(p.a*x+p.b, p.g) + p.c
		}
		return p.c
	case 3:
		if x >= p.d {
			return pow(p.a*x+p.b, p.g)
		}
		return p.c * x
	case 4:
		if x >= p.d {
			return pow(p.a*x+p.b, p.g) + p.e
		}
		return p.c*x + p.f
	}
	return x
}

// inverse of a monotone parametric curve, by bisection on [0, 1]: exact
// enough (2⁻⁴⁰) and correct for every type and parameter set.
func (p paraCurve) inverse(y float64) float64 {
	lo, hi := 0.0, 1.0
	rising := p.eval(1) >= p.eval(0)
	for i := 0; i < 50; i++ {
		mid := (lo + hi) / 2
		if (p.eval(mid) < y) == rising {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

func pow(x, g float64) float64 {
	if x <= 0 {
		return 0
	}
	return math.Pow(x, g)
}

type identityCurve struct{}

func (identityCurve) eval(x float64) float64 { return x }

func clamp01(x float64) float64 {
	if x < 0 || x != x {
		return 0
	}
	if x > 1 {
		return 1
	}
	return x
}

// readCurve reads a curv or para at the start of d and returns it with the
// bytes it took (unpadded).
func readCurve(d []byte, name string, off int64) (curve, int, error) {
	be := binary.BigEndian
	bad := func(why string) (curve, int, error) {
		return nil, 0, &FormatError{Tag: name, Offset: off, Reason: why}
	}
	if len(d) < 12 {
		return bad("curve shorter than 12 bytes")
	}
	switch string(d[:4]) {
	case "curv":
		n := be.Uint32(d[8:])
		if uint64(n)*2 > uint64(len(d)-12) {
			return bad(fmt.Sprintf("curve of %d entries runs past its tag", n))
		}
		switch n {
		case 0:
			return identityCurve{}, 12, nil
		case 1:
			return paraCurve{typ: 0, g: float64(be.Uint16(d[12:])) / 256}, 14, nil
		}
		t := make(tableCurve, n)
		for i := range t {
			t[i] = float64(be.Uint16(d[12+2*i:])) / 65535
		}
		return t, 12 + 2*int(n), nil
	case "para":
		typ := int(be.Uint16(d[8:]))
		counts := []int{1, 3, 4, 5, 7}
		if typ >= len(counts) {
			return bad(fmt.Sprintf("parametric curve of unknown function type %d", typ))
		}
		n := counts[typ]
		if len(d) < 12+4*n {
			return bad("parametric curve runs past its tag")
		}
		v := make([]float64, 7)
		for i := 0; i < n; i++ {
			v[i] = s15f16(d[12+4*i:])
		}
		p := paraCurve{typ: typ, g: v[0], a: v[1], b: v[2], c: v[3], d: v[4], e: v[5], f: v[6]}
		if typ >= 1 && p.a == 0 {
			return bad("parametric curve with a = 0")
		}
		return p, 12 + 4*n, nil
	}
	return bad(fmt.Sprintf("unknown curve type %q", string(d[:4])))
}

// pcsEncoding says how a table encodes the PCS on [0, 1].
type pcsEncoding int

const (
	encLabV4 pcsEncoding = iota // ICC v4 16-bit Lab, and lut8's 8-bit Lab: L = 100x, a = 255x − 128
	encLabV2                    // ICC v2 lut16 "legacy" Lab: 0xFF00 is L* 100
	encXYZ                      // u1Fixed15: 0x8000 is 1.0
)

func pcsEncodingOf(pcs Signature, tagType string) pcsEncoding {
	switch {
	case pcs == SpaceXYZ:
		return encXYZ
	case tagType == "mft2":
		return encLabV2
	}
	return encLabV4
}

const (
	labV2Scale = 65535.0 / 65280.0 // v4 → v2 16-bit Lab code, ICC.1:2010 Annex A
	xyzScale   = 65535.0 / 32768.0 // u1Fixed15 full scale
)

// decode turns the table's output into PCS values: Lab or XYZ.
func (e pcsEncoding) decode(v [3]float64) [3]float64 {
	switch e {
	case encXYZ:
		return [3]float64{v[0] * xyzScale, v[1] * xyzScale, v[2] * xyzScale}
	case encLabV2:
		for i := range v {
			v[i] *= labV2Scale
		}
	}
	return [3]float64{v[0] * 100, v[1]*255 - 128, v[2]*255 - 128}
}

func (e pcsEncoding) encode(p [3]float64) [3]float64 {
	switch e {
	case encXYZ:
		return [3]float64{p[0] / xyzScale, p[1] / xyzScale, p[2] / xyzScale}
	}
	v := [3]float64{p[0] / 100, (p[1] + 128) / 255, (p[2] + 128) / 255}
	if e == encLabV2 {
		for i := range v {
			v[i] /= labV2Scale
		}
	}
	return v
}

// lut is one A2Bn or B2An table as a chain of steps on values in [0, 1].
type lut struct {
	kind      string // mft1, mft2, mAB , mBA
	nIn, nOut int
	steps     []step
	pcs       pcsEncoding
}

type step interface {
	apply(in []float64) []float64
}

type curveStep []curve

func (c curveStep) apply(in []float64) []float64 {
	out := make([]float64, len(in))
	for i, v := range in {
		out[i] = c[i].eval(v)
	}
	return out
}

// matrixStep is a 3×3 matrix with an offset (the offset is zero in lut8
// and lut16).
type matrixStep struct {
	m   [9]float64
	off [3]float64
}

func (m *matrixStep) apply(in []float64) []float64 {
	out := make([]float64, 3)
	for i := 0; i < 3; i++ {
		out[i] = m.m[3*i]*in[0] + m.m[3*i+1]*in[1] + m.m[3*i+2]*in[2] + m.off[i]
	}
	return out
}

func (m *matrixStep) identity() bool {
	return m.m == [9]float64{1, 0, 0, 0, 1, 0, 0, 0, 1} && m.off == [3]float64{}
}

func (l *lut) eval(in []float64) []float64 {
	v := in
	for _, s := range l.steps {
		v = s.apply(v)
	}
	return v
}

func (l *lut) dropMatrix() {
	kept := l.steps[:0]
	for _, s := range l.steps {
		if _, ok := s.(*matrixStep); ok && (l.kind == "mft1" || l.kind == "mft2") {
			continue
		}
		kept = append(kept, s)
	}
	l.steps = kept
}

func (l *lut) setTrilinear() {
	for _, s := range l.steps {
		if g, ok := s.(*grid); ok {
			g.trilinear = true
		}
	}
}

func readLUT(d []byte, typ, name string, off int64) (*lut, error) {
	switch typ {
	case "mft1", "mft2":
		return readLegacyLUT(d, typ, name, off)
	case "mAB ", "mBA ":
		return readModernLUT(d, typ, name, off)
	}
	return nil, &FormatError{Tag: name, Offset: off, Reason: fmt.Sprintf("unknown table type %q (lut8, lut16, lutAToB, lutBToA are read)", typ)}
}

// readLegacyLUT reads lut8Type ('mft1') and lut16Type ('mft2'),
// ICC.1:2010 §10.8 and §10.9: matrix, input tables, CLUT, output tables.
func readLegacyLUT(d []byte, typ, name string, off int64) (*lut, error) {
	be := binary.BigEndian
	bad := func(why string) (*lut, error) { return nil, &FormatError{Tag: name, Offset: off, Reason: why} }
	wide := typ == "mft2"
	head := 48
	if wide {
		head = 52
	}
	if len(d) < head {
		return bad(fmt.Sprintf("%s shorter than its %d-byte header", typ, head))
	}
	nIn, nOut, gp := int(d[8]), int(d[9]), int(d[10])
	if nIn < 1 || nIn > maxChannels || nOut < 1 || nOut > maxChannels {
		return bad(fmt.Sprintf("%d inputs, %d outputs: 1–%d supported", nIn, nOut, maxChannels))
	}
	if gp < 2 {
		return bad(fmt.Sprintf("%d grid points; at least 2 are needed", gp))
	}
	inEntries, outEntries, width := 256, 256, 1
	if wide {
		inEntries, outEntries, width = int(be.Uint16(d[48:])), int(be.Uint16(d[50:])), 2
		if inEntries < 2 || inEntries > 4096 || outEntries < 2 || outEntries > 4096 {
			return bad(fmt.Sprintf("table sizes %d and %d outside 2–4096", inEntries, outEntries))
		}
	}
	gridN, ok := gridSize(repeat(gp, nIn), nOut)
	if !ok {
		return bad(fmt.Sprintf("a CLUT of %d^%d × %d entries is absurd", gp, nIn, nOut))
	}
	need := uint64(head) + uint64(width)*(uint64(nIn*inEntries)+gridN+uint64(nOut*outEntries))
	if need > uint64(len(d)) {
		return bad(fmt.Sprintf("%s needs %d bytes (CLUT %d^%d × %d), the tag has %d", typ, need, gp, nIn, nOut, len(d)))
	}
	read := func(p int) float64 {
		if wide {
			return float64(be.Uint16(d[p:])) / 65535
		}
		return float64(d[p]) / 255
	}
	l := &lut{kind: typ, nIn: nIn, nOut: nOut}
	mat := &matrixStep{}
	for i := range mat.m {
		mat.m[i] = s15f16(d[12+4*i:])
	}
	if nIn == 3 && !mat.identity() {
		l.steps = append(l.steps, mat)
	}
	p := head
	tables := func(n, entries int) curveStep {
		cs := make(curveStep, n)
		for c := 0; c < n; c++ {
			t := make(tableCurve, entries)
			for i := range t {
				t[i] = read(p)
				p += width
			}
			cs[c] = t
		}
		return cs
	}
	l.steps = append(l.steps, tables(nIn, inEntries))
	g := newGrid(repeat(gp, nIn), nOut, int(gridN))
	for i := range g.data {
		g.data[i] = float32(read(p))
		p += width
	}
	l.steps = append(l.steps, g, tables(nOut, outEntries))
	return l, nil
}

// readModernLUT reads lutAToBType ('mAB ') and lutBToAType ('mBA '),
// ICC.1:2010 §10.10 and §10.11.
func readModernLUT(d []byte, typ, name string, off int64) (*lut, error) {
	be := binary.BigEndian
	bad := func(why string) (*lut, error) { return nil, &FormatError{Tag: name, Offset: off, Reason: why} }
	if len(d) < 32 {
		return bad(typ + " shorter than its 32-byte header")
	}
	nIn, nOut := int(d[8]), int(d[9])
	if nIn < 1 || nIn > maxChannels || nOut < 1 || nOut > maxChannels {
		return bad(fmt.Sprintf("%d inputs, %d outputs: 1–%d supported", nIn, nOut, maxChannels))
	}
	offB, offMat, offM, offCLUT, offA := be.Uint32(d[12:]), be.Uint32(d[16:]), be.Uint32(d[20:]), be.Uint32(d[24:]), be.Uint32(d[28:])
	for _, o := range []uint32{offB, offMat, offM, offCLUT, offA} {
		if o != 0 && (o < 32 || uint64(o) >= uint64(len(d))) {
			return bad(fmt.Sprintf("element offset %d lies outside the tag (%d bytes)", o, len(d)))
		}
	}
	curves := func(o uint32, n int) (curveStep, error) {
		cs := make(curveStep, n)
		p := uint64(o)
		for i := 0; i < n; i++ {
			if p >= uint64(len(d)) {
				return nil, &FormatError{Tag: name, Offset: off + int64(p), Reason: "curves run past the tag"}
			}
			c, used, err := readCurve(d[p:], name, off+int64(p))
			if err != nil {
				return nil, err
			}
			cs[i] = c
			p += uint64((used + 3) &^ 3)
		}
		return cs, nil
	}
	matrix := func(o uint32) (*matrixStep, error) {
		if uint64(o)+48 > uint64(len(d)) {
			return nil, &FormatError{Tag: name, Offset: off + int64(o), Reason: "matrix runs past the tag"}
		}
		m := &matrixStep{}
		for i := range m.m {
			m.m[i] = s15f16(d[o+uint32(4*i):])
		}
		for i := range m.off {
			m.off[i] = s15f16(d[o+36+uint32(4*i):])
		}
		return m, nil
	}
	clut := func(o uint32, in, out int) (*grid, error) {
		if uint64(o)+20 > uint64(len(d)) {
			return nil, &FormatError{Tag: name, Offset: off + int64(o), Reason: "CLUT header runs past the tag"}
		}
		dims := make([]int, in)
		for i := range dims {
			dims[i] = int(d[o+uint32(i)])
			if dims[i] < 2 {
				return nil, &FormatError{Tag: name, Offset: off + int64(o), Reason: fmt.Sprintf("CLUT dimension %d has %d grid points; at least 2 are needed", i+1, dims[i])}
			}
		}
		prec := int(d[o+16])
		if prec != 1 && prec != 2 {
			return nil, &FormatError{Tag: name, Offset: off + int64(o) + 16, Reason: fmt.Sprintf("CLUT precision %d is neither 1 nor 2 bytes", prec)}
		}
		n, ok := gridSize(dims, out)
		if !ok || uint64(o)+20+n*uint64(prec) > uint64(len(d)) {
			return nil, &FormatError{Tag: name, Offset: off + int64(o), Reason: fmt.Sprintf("CLUT of %v × %d entries does not fit in the tag (%d bytes)", dims, out, len(d))}
		}
		g := newGrid(dims, out, int(n))
		p := o + 20
		for i := range g.data {
			if prec == 2 {
				g.data[i] = float32(float64(be.Uint16(d[p:])) / 65535)
			} else {
				g.data[i] = float32(float64(d[p]) / 255)
			}
			p += uint32(prec)
		}
		return g, nil
	}
	l := &lut{kind: typ, nIn: nIn, nOut: nOut}
	add := func(s step, err error) error {
		if err != nil {
			return err
		}
		l.steps = append(l.steps, s)
		return nil
	}
	if offB == 0 {
		return bad("no B curves (they are required)")
	}
	if offCLUT == 0 && nIn != nOut {
		return bad(fmt.Sprintf("no CLUT yet %d inputs and %d outputs", nIn, nOut))
	}
	if offMat != 0 && (typ == "mAB " && nOut != 3 || typ == "mBA " && nIn != 3) {
		return bad("a matrix needs three channels on its side")
	}
	var err error
	if typ == "mAB " {
		// A curves → CLUT → M curves → matrix → B curves (§10.10.1).
		if offA != 0 {
			if offCLUT == 0 {
				return bad("A curves without a CLUT")
			}
			if err = add(curves(offA, nIn)); err != nil {
				return nil, err
			}
		}
		if offCLUT != 0 {
			if err = add(clut(offCLUT, nIn, nOut)); err != nil {
				return nil, err
			}
		}
		if offM != 0 {
			if err = add(curves(offM, nOut)); err != nil {
				return nil, err
			}
		}
		if offMat != 0 {
			if err = add(matrix(offMat)); err != nil {
				return nil, err
			}
		}
		if err = add(curves(offB, nOut)); err != nil {
			return nil, err
		}
		return l, nil
	}
	// mBA: B curves → matrix → M curves → CLUT → A curves (§10.11.1).
	if err = add(curves(offB, nIn)); err != nil {
		return nil, err
	}
	if offMat != 0 {
		if err = add(matrix(offMat)); err != nil {
			return nil, err
		}
	}
	if offM != 0 {
		if err = add(curves(offM, nIn)); err != nil {
			return nil, err
		}
	}
	if offCLUT != 0 {
		if err = add(clut(offCLUT, nIn, nOut)); err != nil {
			return nil, err
		}
	}
	if offA != 0 {
		if offCLUT == 0 {
			return bad("A curves without a CLUT")
		}
		if err = add(curves(offA, nOut)); err != nil {
			return nil, err
		}
	}
	return l, nil
}

func repeat(v, n int) []int {
	r := make([]int, n)
	for i := range r {
		r[i] = v
	}
	return r
}

// gridSize is the number of values in a CLUT, or false when it passes
// 2²⁴ (64 MB as float32; a 33⁴ CMYK table has 4.7 million values, so no
// real profile comes near; a hostile one could ask for gigabytes).
func gridSize(dims []int, nOut int) (uint64, bool) {
	n := uint64(nOut)
	for _, g := range dims {
		n *= uint64(g)
		if n > maxGridValues {
			return 0, false
		}
	}
	return n, true
}

const maxGridValues = 1 << 24
