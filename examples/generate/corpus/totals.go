package corpus

import (
	"math"
	"math/rand/v2"
)

// Words printed per year: about 2 million in 1868 (a weekly of some
// 38,000 words an issue) growing to about 15 million by 2025, as the journal
// added pages and issues, with dips for wars, slumps and paper shortages.
// Invented for the demo; a large archive keeps the counts of mid-ranked
// terms in the tens, so their lines show shape rather than sampling noise.
const (
	wordsFirst, yearFirst = 2_000_000.0, 1868.0
	wordsLast, yearLast   = 15_000_000.0, 2025.0
)

// dips scales the volume in hard years (years not listed are 1).
var dips = map[int]float64{
	1914: 0.85, 1915: 0.7, 1916: 0.6, 1919: 0.8, 1920: 0.92,
	1931: 0.88, 1932: 0.8, 1933: 0.82, 1934: 0.9,
	1940: 0.7, 1941: 0.55, 1942: 0.5, 1945: 0.6, 1946: 0.8, 1947: 0.9,
	1974: 0.92, 1975: 0.88, 1976: 0.94,
	2009: 0.93, 2010: 0.95, 2020: 0.84, 2021: 0.92,
}

// makeTotals returns the words printed in each year.
func makeTotals(years []int, rng *rand.Rand) []int {
	growth := math.Log(wordsLast / wordsFirst)
	out := make([]int, len(years))
	var e float64 // slow editorial drift, AR(1) on the log scale
	for i, y := range years {
		u := (float64(y) - yearFirst) / (yearLast - yearFirst)
		// Slower growth in the early decades, faster after 1950.
		trend := growth * (u - 0.15*math.Sin(math.Pi*u)*(1-2*u))
		e = 0.7*e + 0.03*rng.NormFloat64()
		v := wordsFirst * math.Exp(trend+e)
		if d, ok := dips[y]; ok {
			v *= d
		}
		out[i] = int(math.Round(v))
	}
	return out
}
