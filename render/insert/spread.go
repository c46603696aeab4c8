package insert

import (
	"fmt"
	"math"
	"sort"
)

// Spread places labels along one axis as near their wanted positions as
// possible while keeping every two at least gap apart and all inside
// [lo, hi]. want holds each label's wanted centre; the result holds the
// placed centres in the same order. Labels keep their order along the
// axis (ties keep their input order).
//
// Among all placements that keep the order and the gap, Spread returns the
// one with the least sum of squared moves. Substituting z_k = y_k − k·gap
// (labels sorted) turns "y_{k+1} − y_k ≥ gap" into "z non-decreasing", so
// the placement is an isotonic regression of the wanted z, solved exactly
// by pooling adjacent violators (Ayer, Brunk, Ewing, Reid & Silverman
// 1955; Barlow, Bartholomew, Bremner & Brunk 1972, ch. 1): a run of labels
// that would overlap is set as a block centred on the mean of its wanted
// positions. The bounds become one box on z, [lo, hi − (n−1)·gap], and
// clipping the isotonic solution to a box that is the same for every
// element is still optimal (Barlow et al. 1972, §1.4, bounded isotonic
// regression).
func Spread(want []float64, gap, lo, hi float64) ([]float64, error) {
	n := len(want)
	if n == 0 {
		return nil, nil
	}
	for i, w := range want {
		if math.IsNaN(w) || math.IsInf(w, 0) {
			return nil, fmt.Errorf("label %d: wanted position %v is not a number", i+1, w)
		}
	}
	if !(gap >= 0) || math.IsInf(gap, 0) || !(lo <= hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return nil, fmt.Errorf("label spacing: gap %v and range %v–%v are not usable", gap, lo, hi)
	}
	need := float64(n-1) * gap
	if need > hi-lo+1e-9 {
		return nil, fmt.Errorf("%d labels need %.4g of height (%.4g each), only %.4g is free", n, need, gap, hi-lo)
	}
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return want[idx[a]] < want[idx[b]] })

	// Pool adjacent violators on z = y − k·gap.
	type block struct {
		sum   float64
		count int
	}
	var blocks []block
	for k, i := range idx {
		blocks = append(blocks, block{want[i] - float64(k)*gap, 1})
		for len(blocks) > 1 {
			a, b := blocks[len(blocks)-2], blocks[len(blocks)-1]
			if a.sum/float64(a.count) <= b.sum/float64(b.count) {
				break
			}
			blocks = blocks[:len(blocks)-2]
			blocks = append(blocks, block{a.sum + b.sum, a.count + b.count})
		}
	}
	zlo, zhi := lo, hi-need
	out := make([]float64, n)
	k := 0
	for _, b := range blocks {
		z := math.Min(math.Max(b.sum/float64(b.count), zlo), zhi)
		for range b.count {
			out[idx[k]] = z + float64(k)*gap
			k++
		}
	}
	return out, nil
}
