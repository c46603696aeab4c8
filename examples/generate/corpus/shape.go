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
	TwinPeak              // two waves, decades apart
	Arrive                // absent until a year, then rises
	Vanish                // fades and is absent after a year
)

// Shapes lists every shape family, in order.
var Shapes = []Shape{Flat, Rise, Fall, Burst, Hump, TwinPeak, Arrive, Vanish}

var shapeNames = [...]string{"flat", "rise", "fall", "burst", "hump", "twin-peak", "arrive", "vanish"}

func (s Shape) String() string {
	if s < 0 || int(s) >= len(shapeNames) {
		return "shape(?)"
	}
	return shapeNames[s]
}

// curve is a term's expected relative frequency over time, peaking near 1.
// Bells are lopsided, as a word's life is: it usually catches on faster
// than it fades (rise < fall).
type curve struct {
	shape      Shape
	base       float64 // floor, as a fraction of the peak
	after      float64 // bells: the level a word keeps once its time has passed
	plateau    float64 // bells: years at the top before the fall begins
	drift      float64 // Rise: share lost per century once risen (a word that stays but fades)
	c          float64 // peak year of a bell; midpoint of an S-curve
	rise, fall float64 // widths in years: σ of each side of a bell, or the S-curve's scale
	c2         float64 // TwinPeak: the second wave's peak year
	rise2      float64 // … and its widths and height
	fall2, h2  float64
	start, end float64 // the term is absent before start and after end
	wobble     float64 // Flat: amplitude of a slow wander (two sines, a long and a shorter one)
	period     float64
	phase      float64
	wobble2    float64
	period2    float64
	phase2     float64
}

func logistic(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

// bell is a Gaussian bump at c with width rise before it and fall after.
func bell(x, c, rise, fall float64) float64 {
	s := fall
	if x < c {
		s = rise
	}
	d := (x - c) / s
	return math.Exp(-d * d / 2)
}

// at returns the relative level in year y; 0 means the word is not used.
func (k curve) at(y float64) float64 {
	if y < k.start || y > k.end {
		return 0
	}
	b := k.base
	switch k.shape {
	case Flat:
		return 1 + k.wobble*math.Sin(2*math.Pi*y/k.period+k.phase) + k.wobble2*math.Sin(2*math.Pi*y/k.period2+k.phase2)
	case Rise, Arrive:
		v := b + (1-b)*logistic((y-k.c)/k.rise)
		if settled := k.c + 2*k.rise; k.drift > 0 && y > settled {
			v *= 1 - k.drift*(y-settled)/100
		}
		return v
	case Fall, Vanish:
		return b + (1-b)*logistic((k.c-y)/k.fall)
	case Burst, Hump:
		switch {
		case y <= k.c:
			return b + (1-b)*bell(y, k.c, k.rise, k.fall)
		case y <= k.c+k.plateau:
			return 1
		}
		return k.after + (1-k.after)*bell(y-k.plateau, k.c, k.rise, k.fall)
	case TwinPeak:
		return b + (1-b)*math.Max(bell(y, k.c, k.rise, k.fall), k.h2*bell(y, k.c2, k.rise2, k.fall2))
	}
	return 0
}

// life is how a kind of word lives: its shape family and the ranges its
// parameters are drawn from. Years are calendar years; a term may pin its
// own peak (see cohort).
type life struct {
	shape Shape
	at    [2]float64 // peak year (bells), midpoint (S-curves), last year (Vanish)
	rise  [2]float64 // widths in years
	fall  [2]float64
	base  [2]float64 // floor as a fraction of the peak
	// Bells: the level kept after the fall, and the years at the top.
	after, plateau [2]float64
	drift          [2]float64 // Rise: share lost per century once risen
	// weight multiplies the overall share the term's rank gives it (0
	// counts as 1): workshop words that are always there are commoner than
	// a fashion.
	weight float64
	// born: a new coinage, absent until shortly before it catches on
	// (about 2.5 widths before the peak or midpoint); otherwise the word
	// is in use from the first year, at least at its floor.
	born bool
	// TwinPeak: where the second wave peaks and how high, relative to the
	// first.
	at2 [2]float64
	h2  [2]float64
}

// draw makes a curve of this life. pin, when not NaN, fixes the peak (or
// midpoint, or last year) give or take two years; pin2 the second wave's.
// Years are clamped into [from, to].
func (l life) draw(pin, pin2 float64, from, to int, rng *rand.Rand) curve {
	lo, hi := float64(from), float64(to)
	unif := func(r [2]float64) float64 { return r[0] + (r[1]-r[0])*rng.Float64() }
	place := func(p float64, window [2]float64) float64 {
		if math.IsNaN(p) {
			return unif(window)
		}
		return p + unif([2]float64{-2, 2})
	}
	k := curve{shape: l.shape, start: math.Inf(-1), end: math.Inf(1)}
	k.c = place(pin, l.at)
	k.rise, k.fall, k.base = unif(l.rise), unif(l.fall), unif(l.base)
	k.after, k.plateau, k.drift = unif(l.after), unif(l.plateau), unif(l.drift)
	switch l.shape {
	case Flat:
		k.wobble, k.period, k.phase = unif([2]float64{0.15, 0.3}), unif([2]float64{60, 140}), 2*math.Pi*rng.Float64()
		k.wobble2, k.period2, k.phase2 = unif([2]float64{0.04, 0.1}), unif([2]float64{20, 40}), 2*math.Pi*rng.Float64()
	case Vanish:
		k.end = math.Min(math.Max(k.c, lo+6), hi-2)
		k.c = k.end - 2*k.fall - unif([2]float64{0, 10})
	case TwinPeak:
		k.c2 = place(pin2, l.at2)
		k.rise2, k.fall2, k.h2 = unif(l.rise), unif(l.fall), unif(l.h2)
	}
	if l.born {
		w := k.rise
		if l.shape == Arrive || l.shape == Rise {
			w *= 1.2
		}
		k.start = math.Min(k.c-2.5*w, hi-3)
	}
	return k
}

// generic lives for the words not given one of their own (the long tail of
// the vocabulary), by era.
var generic = map[era][]weighted{
	eraSteam: {
		{life{shape: Fall, at: [2]float64{1880, 1930}, fall: [2]float64{6, 15}, base: [2]float64{0.02, 0.12}}, 0.5},
		{life{shape: Vanish, at: [2]float64{1900, 1960}, fall: [2]float64{4, 10}}, 0.2},
		{life{shape: Hump, at: [2]float64{1868, 1905}, rise: [2]float64{8, 15}, fall: [2]float64{15, 30}, base: [2]float64{0, 0.06}}, 0.3},
	},
	eraElectric: {
		{life{shape: Hump, at: [2]float64{1890, 1950}, rise: [2]float64{6, 14}, fall: [2]float64{12, 30}, base: [2]float64{0, 0.08}, born: true}, 0.6},
		{life{shape: Rise, at: [2]float64{1890, 1930}, rise: [2]float64{5, 12}, base: [2]float64{0, 0.03}, born: true}, 0.4},
	},
	eraMachine: {
		{life{shape: Hump, at: [2]float64{1915, 1975}, rise: [2]float64{6, 14}, fall: [2]float64{12, 30}, base: [2]float64{0, 0.08}, born: true}, 0.6},
		{life{shape: Rise, at: [2]float64{1910, 1960}, rise: [2]float64{5, 12}, base: [2]float64{0, 0.03}, born: true}, 0.4},
	},
	eraComputing: {
		{life{shape: Burst, at: [2]float64{1958, 2000}, rise: [2]float64{3, 6}, fall: [2]float64{5, 10}, base: [2]float64{0, 0.05}, born: true}, 0.4},
		{life{shape: Arrive, at: [2]float64{1955, 1995}, rise: [2]float64{4, 10}, born: true}, 0.6},
	},
	eraModern: {
		{life{shape: Arrive, at: [2]float64{1990, 2018}, rise: [2]float64{3, 8}, born: true}, 0.8},
		{life{shape: Burst, at: [2]float64{1998, 2020}, rise: [2]float64{2.5, 5}, fall: [2]float64{3, 8}, born: true}, 0.2},
	},
	eraAny: {
		{life{shape: Flat}, 0.5},
		{life{shape: Rise, at: [2]float64{1890, 1990}, rise: [2]float64{12, 30}, base: [2]float64{0.1, 0.4}}, 0.15},
		{life{shape: Fall, at: [2]float64{1890, 1990}, fall: [2]float64{12, 30}, base: [2]float64{0.1, 0.4}}, 0.15},
		{life{shape: Hump, at: [2]float64{1880, 2010}, rise: [2]float64{15, 30}, fall: [2]float64{15, 35}, base: [2]float64{0.1, 0.3}}, 0.2},
	},
}

type weighted struct {
	life   life
	weight float64
}

// pick chooses one of lives by weight.
func pick(lives []weighted, rng *rand.Rand) life {
	var sum float64
	for _, o := range lives {
		sum += o.weight
	}
	r := rng.Float64() * sum
	for _, o := range lives {
		if r < o.weight {
			return o.life
		}
		r -= o.weight
	}
	return lives[len(lives)-1].life
}
