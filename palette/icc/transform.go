package icc

import (
	"errors"
	"fmt"
	"math"
	"sync"
)

// Intent is an ICC rendering intent (ICC.1:2010 §7.2.15).
type Intent int

const (
	Perceptual           Intent = 0
	RelativeColorimetric Intent = 1
)

func (i Intent) String() string {
	switch i {
	case Perceptual:
		return "perceptual"
	case RelativeColorimetric:
		return "relative colorimetric"
	}
	return fmt.Sprintf("intent %d", int(i))
}

// inputLUT is the A2B table for intent, falling back to A2B0 as ICC.1:2010
// §8.1 (Table 25 note) and LittleCMS do.
func (p *Profile) inputLUT(intent Intent) *lut {
	if intent >= 0 && int(intent) < len(p.a2b) && p.a2b[intent] != nil {
		return p.a2b[intent]
	}
	return p.a2b[0]
}

func (p *Profile) outputLUT(intent Intent) *lut {
	if intent >= 0 && int(intent) < len(p.b2a) && p.b2a[intent] != nil {
		return p.b2a[intent]
	}
	return p.b2a[0]
}

// CanOutput says whether colours can be converted into this profile's
// device space (it has a B2A table or a matrix/TRC model).
func (p *Profile) CanOutput() bool { return p.b2a[0] != nil || p.shaper != nil }

func (p *Profile) isMatrixShaper() bool { return p.shaper != nil }

// ToXYZ converts device values (each in [0, 1], Channels() of them) to
// PCS XYZ with the intent's table.
func (p *Profile) ToXYZ(dev []float64, intent Intent) XYZ {
	in := p.fit(dev)
	if l := p.inputLUT(intent); l != nil {
		v := l.eval(in)
		pcs := l.pcs.decode([3]float64{v[0], v[1], v[2]})
		if l.pcs == encXYZ {
			return XYZ{pcs[0], pcs[1], pcs[2]}
		}
		return LabToXYZ(Lab{pcs[0], pcs[1], pcs[2]})
	}
	s := p.shaper
	if s.gray {
		y := s.trc[0].eval(clamp01(in[0]))
		if p.PCS == SpaceLab {
			// A gray TRC against a Lab PCS gives L* (LittleCMS,
			// BuildGrayInputMatrixPipeline).
			return LabToXYZ(Lab{100 * y, 0, 0})
		}
		return XYZ{D50.X * y, D50.Y * y, D50.Z * y}
	}
	var lin [3]float64
	for i := range lin {
		lin[i] = s.trc[i].eval(clamp01(in[i]))
	}
	m := s.m
	return XYZ{
		m[0][0]*lin[0] + m[0][1]*lin[1] + m[0][2]*lin[2],
		m[1][0]*lin[0] + m[1][1]*lin[1] + m[1][2]*lin[2],
		m[2][0]*lin[0] + m[2][1]*lin[1] + m[2][2]*lin[2],
	}
}

// ToLab converts device values to PCS CIELAB (D50).
func (p *Profile) ToLab(dev []float64, intent Intent) Lab { return XYZToLab(p.ToXYZ(dev, intent)) }

// FromXYZ converts PCS XYZ to device values in [0, 1]. The profile must
// be able to output (CanOutput); otherwise it returns zeros.
func (p *Profile) FromXYZ(x XYZ, intent Intent) []float64 {
	out := make([]float64, p.Channels())
	if l := p.outputLUT(intent); l != nil {
		var pcs [3]float64
		if l.pcs == encXYZ {
			pcs = [3]float64{x.X, x.Y, x.Z}
		} else {
			lab := XYZToLab(x)
			pcs = [3]float64{lab.L, lab.A, lab.B}
		}
		enc := l.pcs.encode(pcs)
		v := l.eval(enc[:])
		for i := range out {
			out[i] = clamp01(v[i])
		}
		return out
	}
	s := p.shaper
	if s == nil {
		return out
	}
	if s.gray {
		y := x.Y
		if p.PCS == SpaceLab {
			y = XYZToLab(x).L / 100
		}
		out[0] = clamp01(s.trc[0].(invertible).inverse(y))
		return out
	}
	m := s.inv
	lin := [3]float64{
		m[0][0]*x.X + m[0][1]*x.Y + m[0][2]*x.Z,
		m[1][0]*x.X + m[1][1]*x.Y + m[1][2]*x.Z,
		m[2][0]*x.X + m[2][1]*x.Y + m[2][2]*x.Z,
	}
	for i := range out {
		out[i] = clamp01(s.trc[i].(invertible).inverse(clamp01(lin[i])))
	}
	return out
}

// FromLab converts PCS CIELAB (D50) to device values in [0, 1].
func (p *Profile) FromLab(l Lab, intent Intent) []float64 { return p.FromXYZ(LabToXYZ(l), intent) }

func (p *Profile) fit(dev []float64) []float64 {
	n := p.Channels()
	if len(dev) == n {
		return dev
	}
	in := make([]float64, n)
	copy(in, dev)
	return in
}

// XYZToLab is CIE 15's CIELAB against the PCS white D50.
func XYZToLab(x XYZ) Lab {
	f := func(t float64) float64 {
		if t > 216.0/24389.0 {
			return math.Cbrt(t)
		}
		return (24389.0/27.0*t + 16) / 116
	}
	fx, fy, fz := f(x.X/D50.X), f(x.Y/D50.Y), f(x.Z/D50.Z)
	return Lab{116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)}
}

// LabToXYZ inverts XYZToLab.
func LabToXYZ(l Lab) XYZ {
	fy := (l.L + 16) / 116
	fx := fy + l.A/500
	fz := fy - l.B/200
	g := func(t float64) float64 {
		if t > 6.0/29.0 {
			return t * t * t
		}
		return (116*t - 16) * 27.0 / 24389.0
	}
	return XYZ{D50.X * g(fx), D50.Y * g(fy), D50.Z * g(fz)}
}

// Transform converts device colours of one profile into another's with a
// rendering intent, optionally with black-point compensation. It caches
// every colour it has converted; it is safe for concurrent use.
type Transform struct {
	src, dst *Profile
	intent   Intent
	bpc      bool
	scale    [3]float64 // black-point compensation in XYZ: x' = scale·x + offset
	offset   [3]float64

	mu    sync.Mutex
	cache map[[maxChannels]float64][]float64
}

// ErrNoOutput is returned by NewTransform for a destination profile that
// cannot take colours in (no B2A table, no matrix/TRC model).
var ErrNoOutput = errors.New("icc: the destination profile has no PCS-to-device table")

// NewTransform links src to dst. With bpc, the source's black point is
// mapped onto the destination's (black-point compensation: Adobe's
// algorithm, as in LittleCMS 2). As in LittleCMS, the perceptual intent into
// an ICC v4 profile always compensates, since v4 perceptual tables share
// one reference medium black.
func NewTransform(src, dst *Profile, intent Intent, bpc bool) (*Transform, error) {
	if intent != Perceptual && intent != RelativeColorimetric {
		return nil, fmt.Errorf("icc: %v is not supported", intent)
	}
	if !dst.CanOutput() {
		return nil, ErrNoOutput
	}
	t := &Transform{src: src, dst: dst, intent: intent, scale: [3]float64{1, 1, 1}, cache: map[[maxChannels]float64][]float64{}}
	if intent == Perceptual && dst.Version >= 0x04000000 {
		bpc = true
	}
	t.bpc = bpc
	if bpc {
		t.scale, t.offset = bpcMapping(detectBlackPoint(src, intent), detectDestinationBlackPoint(dst, intent))
	}
	return t, nil
}

// BPC says whether the transform compensates black points.
func (t *Transform) BPC() bool { return t.bpc }

// Convert takes the source's device values (each in [0, 1]) to the
// destination's. The result is the caller's to keep.
func (t *Transform) Convert(in []float64) []float64 {
	var key [maxChannels]float64
	copy(key[:], in)
	t.mu.Lock()
	v, ok := t.cache[key]
	t.mu.Unlock()
	if !ok {
		v = t.dst.FromXYZ(t.PCS(in), t.intent)
		t.mu.Lock()
		t.cache[key] = v
		t.mu.Unlock()
	}
	return append([]float64(nil), v...)
}

// PCS is the colour as the transform hands it to the destination: the
// source's PCS value after black-point compensation.
func (t *Transform) PCS(in []float64) XYZ {
	x := t.src.ToXYZ(in, t.intent)
	return XYZ{t.scale[0]*x.X + t.offset[0], t.scale[1]*x.Y + t.offset[1], t.scale[2]*x.Z + t.offset[2]}
}

// Black points, after LittleCMS 2's cmssamp.c (Adobe, "Black Point
// Compensation: Theory and Application", 2006, §7).

// perceptualBlack is the ICC v4 perceptual reference medium black
// (ICC.1:2010 §6.3.4.4 / LittleCMS cmsPERCEPTUAL_BLACK_*).
var perceptualBlack = XYZ{0.00336, 0.0034731, 0.00287}

func detectBlackPoint(p *Profile, intent Intent) XYZ {
	if p.Version >= 0x04000000 && intent == Perceptual {
		if p.isMatrixShaper() {
			return blackAsDarkestColorant(p, RelativeColorimetric)
		}
		return perceptualBlack
	}
	if intent == RelativeColorimetric && p.Class == ClassOutput && p.Space == SpaceCMYK {
		return blackThroughPerceptual(p)
	}
	return blackAsDarkestColorant(p, intent)
}

// inputSupported mirrors cmsIsIntentSupported for the device → PCS side.
func (p *Profile) inputSupported(intent Intent) bool {
	return p.a2b[intent] != nil || p.isMatrixShaper()
}

func neutralBlack(l Lab) XYZ {
	l.A, l.B = 0, 0
	if l.L > 50 {
		l.L = 50
	}
	if l.L < 0 {
		l.L = 0
	}
	return LabToXYZ(l)
}

func blackAsDarkestColorant(p *Profile, intent Intent) XYZ {
	if !p.inputSupported(intent) {
		return XYZ{}
	}
	dark := make([]float64, p.Channels())
	switch p.Space {
	case SpaceCMYK, SpaceCMY:
		for i := range dark {
			dark[i] = 1
		}
	case SpaceGray, SpaceRGB:
	default:
		return XYZ{}
	}
	return neutralBlack(p.ToLab(dark, intent))
}

// blackThroughPerceptual is the black of a CMYK output profile without its
// ink limit: Lab 0 through the perceptual B2A, back through the
// colorimetric A2B.
func blackThroughPerceptual(p *Profile) XYZ {
	if !p.inputSupported(Perceptual) {
		return XYZ{}
	}
	return neutralBlack(roundTrip(p, Perceptual, Lab{}))
}

// roundTrip is Lab → p (intent) → p (relative colorimetric) → Lab, the
// probe of LittleCMS's black-point detection (CreateRoundtripXForm). Like
// any LittleCMS link, the perceptual step into a v4 profile compensates
// black points: from the Lab profile's (zero) to p's.
func roundTrip(p *Profile, intent Intent, l Lab) Lab {
	x := LabToXYZ(l)
	if intent == Perceptual && p.Version >= 0x04000000 {
		scale, offset := bpcMapping(XYZ{}, detectDestinationBlackPoint(p, Perceptual))
		x = XYZ{scale[0]*x.X + offset[0], scale[1]*x.Y + offset[1], scale[2]*x.Z + offset[2]}
	}
	return p.ToLab(p.FromXYZ(x, intent), RelativeColorimetric)
}

// bpcMapping maps in → out and D50 → D50 linearly per XYZ channel
// (LittleCMS cmscnvrt.c, ComputeBlackPointCompensation).
func bpcMapping(in, out XYZ) (scale, offset [3]float64) {
	scale = [3]float64{1, 1, 1}
	if in == out {
		return scale, offset
	}
	w := [3]float64{D50.X, D50.Y, D50.Z}
	bi := [3]float64{in.X, in.Y, in.Z}
	bo := [3]float64{out.X, out.Y, out.Z}
	for i := range w {
		scale[i] = (bo[i] - w[i]) / (bi[i] - w[i])
		offset[i] = -w[i] * (bo[i] - bi[i]) / (bi[i] - w[i])
	}
	return scale, offset
}

func detectDestinationBlackPoint(p *Profile, intent Intent) XYZ {
	if p.Version >= 0x04000000 && intent == Perceptual {
		if p.isMatrixShaper() {
			return blackAsDarkestColorant(p, RelativeColorimetric)
		}
		return perceptualBlack
	}
	if p.b2a[intent] == nil || (p.Space != SpaceGray && p.Space != SpaceRGB && p.Space != SpaceCMYK) {
		return detectBlackPoint(p, intent)
	}
	var initial Lab
	if intent == RelativeColorimetric {
		initial = XYZToLab(detectBlackPoint(p, intent))
	}
	var in, out [256]float64
	ab := func(v float64) float64 { return math.Min(50, math.Max(-50, v)) }
	for l := range in {
		lab := Lab{float64(l) * 100 / 255, ab(initial.A), ab(initial.B)}
		in[l] = lab.L
		out[l] = roundTrip(p, intent, lab).L
	}
	for l := 254; l > 0; l-- {
		out[l] = math.Min(out[l], out[l+1])
	}
	if !(out[0] < out[255]) {
		return XYZ{}
	}
	minL, maxL := out[0], out[255]
	if intent == RelativeColorimetric {
		straight := true
		for l := range in {
			if !(in[l] <= minL+0.2*(maxL-minL) || math.Abs(in[l]-out[l]) < 4) {
				straight = false
			}
		}
		if straight {
			return LabToXYZ(initial)
		}
	}
	lo, hi := 0.1, 0.5
	if intent != RelativeColorimetric {
		lo, hi = 0.03, 0.25
	}
	var xs, ys []float64
	for l := range in {
		y := (out[l] - minL) / (maxL - minL)
		if y >= lo && y < hi {
			xs = append(xs, in[l])
			ys = append(ys, y)
		}
	}
	if len(xs) < 3 {
		return XYZ{}
	}
	L := quadraticRoot(xs, ys)
	if L < 0 {
		L = 0
	}
	return LabToXYZ(Lab{L, initial.A, initial.B})
}

// quadraticRoot fits y = a x² + b x + c by least squares and returns the
// root where the fitted shadow curve meets 0, within [0, 50] (LittleCMS's
// RootOfLeastSquaresFitQuadraticCurve, including its choice of root).
func quadraticRoot(x, y []float64) float64 {
	if len(x) < 4 {
		return 0
	}
	var sx, sx2, sx3, sx4, sy, syx, syx2 float64
	for i := range x {
		xi, yi := x[i], y[i]
		sx += xi
		sx2 += xi * xi
		sx3 += xi * xi * xi
		sx4 += xi * xi * xi * xi
		sy += yi
		syx += yi * xi
		syx2 += yi * xi * xi
	}
	m := [3][3]float64{{float64(len(x)), sx, sx2}, {sx, sx2, sx3}, {sx2, sx3, sx4}}
	inv, ok := invert3(m)
	if !ok {
		return 0
	}
	v := [3]float64{sy, syx, syx2}
	c := inv[0][0]*v[0] + inv[0][1]*v[1] + inv[0][2]*v[2]
	b := inv[1][0]*v[0] + inv[1][1]*v[1] + inv[1][2]*v[2]
	a := inv[2][0]*v[0] + inv[2][1]*v[1] + inv[2][2]*v[2]
	if math.Abs(a) < 1e-10 {
		// LittleCMS returns min(0, max(50, −c/b)), which is always 0.
		return 0
	}
	d := b*b - 4*a*c
	if d <= 0 {
		return 0
	}
	return math.Max(0, math.Min(50, (-b+math.Sqrt(d))/(2*a)))
}
