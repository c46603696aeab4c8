package corpus

import (
	"math"
	"math/rand/v2"
)

// Shape names the family of a term's underlying curve, before noise.
type Shape int

const (
	Flat     Shape = iota // level with a slow wander
	Rise                  // S-curve up to a plateau
	Fall                  // S-curve down to a long flat tail
	Burst                 // rises and falls within 10–30 years
	Hump                  // a broad rise and fall over several decades
	TwinPeak              // two broad peaks
	Arrive                // absent until a year, then rises
	Vanish                // fades and is absent after a year
)

var shapeNames = [...]string{"flat", "rise", "fall", "burst", "hump", "twin-peak", "arrive", "vanish"}

func (s Shape) String() string {
	if s < 0 || int(s) >= len(shapeNames) {
		return "shape(?)"
	}
	return shapeNames[s]
}

// curve is a term's expected relative frequency over time, peaking near 1.
type curve struct {
	shape      Shape
	base       float64 // floor, as a fraction of the peak
	c, w       float64 // centre and width in years (σ for bell shapes)
	c2, w2     float64 // second peak of TwinPeak
	start, end float64 // the term is absent before start and after end
	wobble     float64 // Flat: amplitude of a slow sine wander
	period     float64
	phase      float64
}

func logistic(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

func bell(x, c, s float64) float64 { d := (x - c) / s; return math.Exp(-d * d / 2) }

// at returns the relative level in year y; 0 means the word is not used.
func (k curve) at(y float64) float64 {
	if y < k.start || y > k.end {
		return 0
	}
	b := k.base
	switch k.shape {
	case Flat:
		return 1 + k.wobble*math.Sin(2*math.Pi*y/k.period+k.phase)
	case Rise, Arrive:
		return b + (1-b)*logistic((y-k.c)/k.w)
	case Fall, Vanish:
		return b + (1-b)*logistic((k.c-y)/k.w)
	case Burst, Hump:
		return b + (1-b)*bell(y, k.c, k.w)
	case TwinPeak:
		return b + (1-b)*math.Max(bell(y, k.c, k.w), 0.8*bell(y, k.c2, k.w2))
	}
	return 0
}

// choice is one shape an era may take, with its weight and the window (in
// calendar years) its centre or start is drawn from.
type choice struct {
	shape  Shape
	weight float64
	lo, hi float64
}

// eraShapes suits each era's shapes to its words: steam words fade, computing
// words arrive after the war, and so on. Windows are in calendar years and
// are clamped to the configured span.
var eraShapes = map[era][]choice{
	eraSteam: {
		{Vanish, 0.35, 1895, 1965}, {Fall, 0.3, 1880, 1940},
		{Burst, 0.15, 1868, 1910}, {Hump, 0.2, 1868, 1915},
	},
	eraElectric: {
		{Rise, 0.35, 1885, 1925}, {Hump, 0.3, 1895, 1960},
		{Burst, 0.2, 1880, 1935}, {Arrive, 0.15, 1875, 1905},
	},
	eraMachine: {
		{Rise, 0.3, 1905, 1960}, {Hump, 0.3, 1915, 1975},
		{Burst, 0.2, 1910, 1970}, {Arrive, 0.2, 1895, 1940},
	},
	eraComputing: {
		{Arrive, 0.5, 1946, 1982}, {Burst, 0.2, 1958, 2000}, {Hump, 0.3, 1965, 2010},
	},
	eraModern: {
		{Arrive, 0.6, 1980, 2012}, {Burst, 0.2, 1995, 2020}, {Hump, 0.2, 1992, 2025},
	},
	eraAny: {
		{Flat, 0.2, 0, 0}, {Rise, 0.1, 1868, 2025}, {Fall, 0.1, 1868, 2025},
		{Burst, 0.18, 1868, 2025}, {Hump, 0.22, 1868, 2025}, {TwinPeak, 0.12, 1868, 2025},
		{Vanish, 0.04, 1890, 2000}, {Arrive, 0.04, 1890, 2010},
	},
}

// eraFloor is the first year a word of the era can appear in print.
var eraFloor = map[era]float64{eraComputing: 1946, eraModern: 1980}

// drawCurve picks a shape suited to the era and its parameters.
func drawCurve(e era, from, to int, rng *rand.Rand) curve {
	lo, hi := float64(from), float64(to)
	clamp := func(y float64) float64 { return math.Min(math.Max(y, lo+2), hi-2) }
	unif := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }

	opts := eraShapes[e]
	var sum float64
	for _, o := range opts {
		sum += o.weight
	}
	r := rng.Float64() * sum
	o := opts[len(opts)-1]
	for _, x := range opts {
		if r < x.weight {
			o = x
			break
		}
		r -= x.weight
	}

	k := curve{shape: o.shape, start: math.Inf(-1), end: math.Inf(1)}
	if f, ok := eraFloor[e]; ok {
		k.start = math.Min(f, hi-3)
	}
	at := clamp(unif(o.lo, o.hi))
	switch o.shape {
	case Flat:
		k.wobble, k.period, k.phase = unif(0.05, 0.3), unif(25, 90), unif(0, 2*math.Pi)
	case Rise, Fall:
		k.c, k.w, k.base = at, unif(4, 15), unif(0.01, 0.15)
	case Burst:
		k.c, k.w, k.base = at, unif(2.5, 7.5), unif(0, 0.06)
	case Hump:
		k.c, k.w, k.base = at, unif(10, 28), unif(0, 0.1)
	case TwinPeak:
		k.c, k.w = at, unif(6, 16)
		k.c2, k.w2 = clamp(at+unif(35, 80)*float64(1-2*rng.IntN(2))), unif(6, 16)
		k.base = unif(0.02, 0.12)
	case Arrive:
		k.start = clamp(at)
		k.c, k.w, k.base = clamp(k.start+unif(3, 18)), unif(3, 10), 0
	case Vanish:
		k.end = clamp(at)
		k.c, k.w, k.base = k.end-unif(8, 30), unif(3, 10), 0
	}
	return k
}
