// Package press turns sheaf's sRGB colours into a printer's inks through
// the printer's ICC output profile (a printing condition), and tells how
// they will look and what they cost in ink.
//
// Chart colours go through the profile (relative colorimetric with
// black-point compensation, or perceptual). Neutral greys — type, rules,
// ticks — become black ink alone, a tint of K whose lightness through the
// profile matches the grey's (CIELAB L*), so small type never lands on four
// plates (common practice: four-colour type goes fuzzy with
// misregistration). A gradient's stops are added until linear
// interpolation between ink values stays within MaxRampError of converting
// each colour along it directly.
//
// A Condition caches every colour it converts; it is safe for concurrent
// use.
package press

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"sort"
	"sync"

	"sheaf/palette"
	"sheaf/palette/icc"
)

// Settings are how a printing condition is used.
type Settings struct {
	// Condition is the OutputConditionIdentifier; empty: the profile's
	// description.
	Condition string
	Registry  string
	// InkLimit is the total area coverage the press allows, in percent.
	InkLimit float64
	// Intent is icc.RelativeColorimetric (always with black-point
	// compensation) or icc.Perceptual.
	Intent icc.Intent
}

// Condition is a printing condition: an output profile and settings.
type Condition struct {
	Profile    *icc.Profile
	Identifier string // OutputConditionIdentifier
	Registry   string
	InkLimit   float64
	Intent     icc.Intent

	srgb  *icc.Profile
	xf    *icc.Transform
	proof *icc.Transform // press → sRGB, for soft proofs

	mu      sync.Mutex
	neutral map[float64][]float64
	ramps   map[string][]Stop
	inks    map[palette.RGB]solid
}

type solid struct {
	ink   []float64
	black bool
}

// ErrNotOutput is wrapped by New for a profile that is not a printer's.
var ErrNotOutput = errors.New("not a printer's output profile")

// MaxRampError is the largest ΔE00 allowed between a gradient drawn with
// linearly interpolated ink values and the colours along it converted
// directly. Half the 1 ΔE00, leaving room for the palette's own
// stop spacing.
const MaxRampError = 0.5

// New parses an output profile and sets up the conversion into it.
func New(profile []byte, s Settings) (*Condition, error) {
	p, err := icc.Parse(profile)
	if err != nil {
		return nil, err
	}
	if p.Class != icc.ClassOutput {
		return nil, fmt.Errorf("device class %q: %w (class 'prtr')", p.Class, ErrNotOutput)
	}
	switch p.Space {
	case icc.SpaceCMYK, icc.SpaceGray, icc.SpaceRGB:
	default:
		return nil, fmt.Errorf("colour space %q: press takes CMYK, gray or RGB output profiles", p.Space)
	}
	if !p.CanOutput() {
		return nil, fmt.Errorf("%w: it has no B2A table to convert colours into", ErrNotOutput)
	}
	if s.Intent != icc.Perceptual {
		s.Intent = icc.RelativeColorimetric
	}
	src := icc.SRGB()
	xf, err := icc.NewTransform(src, p, s.Intent, true)
	if err != nil {
		return nil, err
	}
	proof, err := icc.NewTransform(p, src, icc.RelativeColorimetric, true)
	if err != nil {
		return nil, err
	}
	c := &Condition{Profile: p, Identifier: s.Condition, Registry: s.Registry, InkLimit: s.InkLimit, Intent: s.Intent,
		srgb: src, xf: xf, proof: proof, neutral: map[float64][]float64{}, ramps: map[string][]Stop{}, inks: map[palette.RGB]solid{}}
	if c.Identifier == "" {
		c.Identifier = p.Description
	}
	if c.Identifier == "" {
		c.Identifier = "Custom"
	}
	if c.InkLimit <= 0 {
		c.InkLimit = 300
	}
	return c, nil
}

// Fingerprint is a hash of everything that decides the conversions: the
// profile's bytes and the settings. Equal fingerprints convert alike.
func (c *Condition) Fingerprint() string {
	h := sha256.New()
	h.Write(c.Profile.Bytes())
	fmt.Fprintf(h, "\x00%s\x00%s\x00%g\x00%d\x00press v1", c.Identifier, c.Registry, c.InkLimit, c.Intent)
	return hex.EncodeToString(h.Sum(nil))
}

// Components is the number of device components: 4 (CMYK), 3 (RGB), 1 (gray).
func (c *Condition) Components() int { return c.Profile.Channels() }

// CMYK says whether the press prints with cyan, magenta, yellow and black.
func (c *Condition) CMYK() bool { return c.Profile.Space == icc.SpaceCMYK }

// Convert gives the device values (each 0–1) of an sRGB colour through
// the profile. It does not treat greys specially; see Ink.
func (c *Condition) Convert(rgb palette.RGB) []float64 {
	r := rgb.Clip()
	return c.xf.Convert([]float64{r.R, r.G, r.B})
}

// IsNeutral says whether an sRGB colour is a grey (equal components to
// within half an 8-bit step).
func IsNeutral(rgb palette.RGB) bool {
	const tol = 0.5 / 255
	return math.Abs(rgb.R-rgb.G) < tol && math.Abs(rgb.G-rgb.B) < tol
}

// Ink is what a solid colour prints as: greys as black ink alone (see
// Neutral), other colours through the profile. black reports a grey.
func (c *Condition) Ink(rgb palette.RGB) (ink []float64, black bool) {
	c.mu.Lock()
	s, ok := c.inks[rgb]
	c.mu.Unlock()
	if !ok {
		if IsNeutral(rgb) {
			s = solid{c.Neutral(c.lab(rgb).L), true}
		} else {
			s = solid{c.Convert(rgb), false}
		}
		c.mu.Lock()
		c.inks[rgb] = s
		c.mu.Unlock()
	}
	return append([]float64(nil), s.ink...), s.black
}

// Neutral is the black-ink tint whose lightness through the profile is L*
// (relative colorimetric; paper white is L* 100): the darkest the K
// channel alone reaches for anything darker. A gray profile gives its
// gray; an RGB press the profile's neutral.
func (c *Condition) Neutral(L float64) []float64 {
	L = math.Round(L*1000) / 1000
	c.mu.Lock()
	v, ok := c.neutral[L]
	c.mu.Unlock()
	if ok {
		return append([]float64(nil), v...)
	}
	n := c.Components()
	switch {
	case c.CMYK():
		lOf := func(k float64) float64 {
			return c.Profile.ToLab([]float64{0, 0, 0, k}, icc.RelativeColorimetric).L
		}
		v = make([]float64, 4)
		switch {
		case L >= lOf(0):
			v[3] = 0
		case L <= lOf(1):
			v[3] = 1
		default:
			lo, hi := 0.0, 1.0 // L falls as k rises
			for i := 0; i < 40; i++ {
				mid := (lo + hi) / 2
				if lOf(mid) > L {
					lo = mid
				} else {
					hi = mid
				}
			}
			v[3] = (lo + hi) / 2
		}
	default:
		v = c.Profile.FromLab(icc.Lab{L: L}, c.Intent)
		if n == 3 && c.Profile.Space == icc.SpaceRGB {
			// keep an RGB press's grey grey
			m := (v[0] + v[1] + v[2]) / 3
			v = []float64{m, m, m}
		}
	}
	c.mu.Lock()
	c.neutral[L] = v
	c.mu.Unlock()
	return append([]float64(nil), v...)
}

// Total is the total area coverage of device values, in percent (the sum
// of the inks; ISO 12647-2 calls it TAC).
func Total(ink []float64) float64 {
	t := 0.0
	for _, v := range ink {
		t += v
	}
	return 100 * t
}

// lab is an sRGB colour in the PCS (CIELAB D50) through sheaf's sRGB profile.
func (c *Condition) lab(rgb palette.RGB) icc.Lab {
	r := rgb.Clip()
	return c.srgb.ToLab([]float64{r.R, r.G, r.B}, icc.RelativeColorimetric)
}

// Printed is how device values look on this press: CIELAB D50 (relative
// colorimetric, paper white L* 100).
func (c *Condition) Printed(ink []float64) palette.Lab {
	l := c.Profile.ToLab(ink, icc.RelativeColorimetric)
	return palette.Lab{L: l.L, A: l.A, B: l.B}
}

// Intended is an sRGB colour in CIELAB D50, to compare with Printed.
func (c *Condition) Intended(rgb palette.RGB) palette.Lab {
	l := c.lab(rgb)
	return palette.Lab{L: l.L, A: l.A, B: l.B}
}

// Proof is the soft proof of device values: how the press prints them,
// as sRGB (device → PCS → sRGB, relative colorimetric with black-point
// compensation, so paper shows as white and solid ink as the screen's
// black — what Ghostscript and LittleCMS show by default; colours the
// screen cannot show are clipped).
func (c *Condition) Proof(ink []float64) palette.RGB {
	v := c.proof.Convert(ink)
	return palette.RGB{R: v[0], G: v[1], B: v[2]}
}

// Shift is the ΔE00 between a colour as intended and its press round
// trip: the colour to ink (Ink) and back as the soft proof shows it
// (Proof), both in CIELAB D50. The black-point compensation of the way
// there is undone on the way back, so what is left is what the press
// cannot print.
func (c *Condition) Shift(rgb palette.RGB) float64 {
	ink, _ := c.Ink(rgb)
	return c.shiftOf(rgb, ink)
}

func (c *Condition) shiftOf(rgb palette.RGB, ink []float64) float64 {
	return palette.DeltaE00(c.Intended(rgb), c.Intended(c.Proof(ink)))
}

// Stop is a gradient stop in device values.
type Stop struct {
	Offset float64
	Ink    []float64
}

// RGBStop is a gradient stop in sRGB.
type RGBStop struct {
	Offset float64
	RGB    palette.RGB
}

// Ramp converts a gradient whose colours are interpolated linearly in
// sRGB between stops. It adds stops until, everywhere along it, ink
// values interpolated linearly between the returned stops print within
// MaxRampError (ΔE00) of the colour at that place converted directly.
// Equal inputs give the same (cached) result.
func (c *Condition) Ramp(stops []RGBStop) []Stop {
	key := rampKey(stops)
	c.mu.Lock()
	r, ok := c.ramps[key]
	c.mu.Unlock()
	if ok {
		return r
	}
	sorted := append([]RGBStop(nil), stops...)
	sort.SliceStable(sorted, func(i, j int) bool { return sorted[i].Offset < sorted[j].Offset })
	var out []Stop
	for i, s := range sorted {
		ink, _ := c.Ink(s.RGB)
		st := Stop{Offset: s.Offset, Ink: ink}
		if i > 0 {
			prev := sorted[i-1]
			out = c.refine(out, prev, s, out[len(out)-1], st, 0)
		}
		out = append(out, st)
	}
	c.mu.Lock()
	c.ramps[key] = out
	c.mu.Unlock()
	return out
}

// refine adds stops strictly between a and b (already converted as ia, ib).
func (c *Condition) refine(out []Stop, a, b RGBStop, ia, ib Stop, depth int) []Stop {
	if b.Offset-a.Offset < 1e-4 || depth > 12 {
		return out
	}
	worst := 0.0
	for _, t := range []float64{0.25, 0.5, 0.75} {
		rgb := lerpRGB(a.RGB, b.RGB, t)
		want := c.Printed(c.mustInk(rgb))
		got := c.Printed(lerpInk(ia.Ink, ib.Ink, t))
		worst = math.Max(worst, palette.DeltaE00(want, got))
	}
	if worst <= MaxRampError {
		return out
	}
	mid := RGBStop{Offset: (a.Offset + b.Offset) / 2, RGB: lerpRGB(a.RGB, b.RGB, 0.5)}
	im := Stop{Offset: mid.Offset, Ink: c.mustInk(mid.RGB)}
	out = c.refine(out, a, mid, ia, im, depth+1)
	out = append(out, im)
	return c.refine(out, mid, b, im, ib, depth+1)
}

func (c *Condition) mustInk(rgb palette.RGB) []float64 {
	ink, _ := c.Ink(rgb)
	return ink
}

func lerpRGB(a, b palette.RGB, t float64) palette.RGB {
	return palette.RGB{R: a.R + t*(b.R-a.R), G: a.G + t*(b.G-a.G), B: a.B + t*(b.B-a.B)}
}

func lerpInk(a, b []float64, t float64) []float64 {
	out := make([]float64, len(a))
	for i := range a {
		out[i] = a[i] + t*(b[i]-a[i])
	}
	return out
}

func rampKey(stops []RGBStop) string {
	b := make([]byte, 0, 32*len(stops))
	for _, s := range stops {
		for _, v := range [4]float64{s.Offset, s.RGB.R, s.RGB.G, s.RGB.B} {
			b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
		}
	}
	return string(b)
}
