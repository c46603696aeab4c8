package palette

import "math"

// DeltaE00 is the CIEDE2000 colour difference between two CIELAB colours
// with parametric factors kL = kC = kH = 1, following Sharma, Wu & Dalal
// (2005), equations (1)–(22).
//
// Ours rather than go-colorful's: that one takes sRGB colours and goes
// through its own Lab (with a different white), so it cannot be fed Lab
// values such as the Sharma et al. test pairs.
func DeltaE00(x, y Lab) float64 {
	const (
		deg   = math.Pi / 180
		pow25 = 6103515625.0 // 25^7
	)
	c1 := math.Hypot(x.A, x.B)
	c2 := math.Hypot(y.A, y.B)
	cm := (c1 + c2) / 2
	cm7 := math.Pow(cm, 7)
	g := 0.5 * (1 - math.Sqrt(cm7/(cm7+pow25)))
	a1, a2 := (1+g)*x.A, (1+g)*y.A
	c1p, c2p := math.Hypot(a1, x.B), math.Hypot(a2, y.B)
	h1p, h2p := hueDeg(x.B, a1), hueDeg(y.B, a2)

	dL := y.L - x.L
	dC := c2p - c1p
	var dh float64
	if c1p*c2p != 0 {
		dh = h2p - h1p
		// Sharma eq. (10): exactly ±180° stays as is (pairs 10 and 14).
		if dh > 180 {
			dh -= 360
		} else if dh < -180 {
			dh += 360
		}
	}
	dH := 2 * math.Sqrt(c1p*c2p) * math.Sin(dh/2*deg)

	lm := (x.L + y.L) / 2
	cmp := (c1p + c2p) / 2
	hm := h1p + h2p
	if c1p*c2p != 0 {
		// Sharma eq. (14): the mean hue needs the 180° shift only when
		// the hues are more than 180° apart.
		switch {
		case math.Abs(h1p-h2p) <= 180:
			hm /= 2
		case hm < 360:
			hm = (hm + 360) / 2
		default:
			hm = (hm - 360) / 2
		}
	}
	t := 1 - 0.17*math.Cos((hm-30)*deg) + 0.24*math.Cos(2*hm*deg) +
		0.32*math.Cos((3*hm+6)*deg) - 0.20*math.Cos((4*hm-63)*deg)
	dTheta := 30 * math.Exp(-sq((hm-275)/25))
	cmp7 := math.Pow(cmp, 7)
	rc := 2 * math.Sqrt(cmp7/(cmp7+pow25))
	sl := 1 + 0.015*sq(lm-50)/math.Sqrt(20+sq(lm-50))
	sc := 1 + 0.045*cmp
	sh := 1 + 0.015*cmp*t
	rt := -math.Sin(2*dTheta*deg) * rc
	l, c, h := dL/sl, dC/sc, dH/sh
	return math.Sqrt(l*l + c*c + h*h + rt*c*h)
}

// hueDeg is atan2 in degrees [0, 360), 0 for the achromatic case.
func hueDeg(b, a float64) float64 {
	if a == 0 && b == 0 {
		return 0
	}
	h := math.Atan2(b, a) * 180 / math.Pi
	if h < 0 {
		h += 360
	}
	return h
}

func sq(v float64) float64 { return v * v }

// DeltaE00 is the CIEDE2000 difference between two colours (CIELAB, D65).
func (c Color) DeltaE00(d Color) float64 { return DeltaE00(c.Lab(), d.Lab()) }
