package shape

import (
	"cmp"
	"container/heap"
	"math"
	"runtime"
	"slices"
	"sync"
)

// Pair is two shapes that look alike.
type Pair struct {
	A, B     int     // shape indices, A < B
	Distance float64 // Distance between their Signatures
}

// HandOver is two shapes of which one falls as the other rises.
type HandOver struct {
	Falling, Rising int
	// Strength is how much each changes across the split, the smaller of
	// the two: the falling shape's mean before the split less its mean
	// after, and the rising one's mean after less before (in plotted
	// units: 1 is the height of the plot).
	Strength float64
	// Split is the index of the first year after the split.
	Split int
	// Crossing is the index of the year, nearest the split, in which the
	// rising line (smoothed by a centred 9-year mean) first stands above
	// the falling one.
	Crossing int
}

// MinSide is the fewest years on each side of a hand-over's split: a
// change over fewer is a blip, not a hand-over. Our own choice.
const MinSide = 10

// sketchWidth is how many pieces a sketch cuts a shape into.
const sketchWidth = 16

// sketches are the shapes' piecewise means ("piecewise aggregate
// approximation": Keogh, Chakrabarti, Pazzani & Mehrotra 2001,
// "Dimensionality reduction for fast similarity search in large time
// series databases", Knowledge and Information Systems 3(3)). For every
// piece s of L_s years, Σ_s L_s (ā_s − b̄_s)² ≤ Σ_t (a_t − b_t)² (the
// mean's square is at most the mean square, within each piece), so a
// sketch distance is a lower bound of the true one.
type sketches struct {
	w      []float64 // piece lengths
	v      []float64 // n × pieces
	pieces int
}

func newSketches(shapes [][]float64, pieces int) sketches {
	y := len(shapes[0])
	p := min(pieces, y)
	sk := sketches{pieces: p, w: make([]float64, p), v: make([]float64, len(shapes)*p)}
	for s := range p {
		sk.w[s] = float64((s+1)*y/p - s*y/p)
	}
	for i, sh := range shapes {
		for s := range p {
			lo, hi := s*y/p, (s+1)*y/p
			sk.v[i*p+s] = mean(sh[lo:hi])
		}
	}
	return sk
}

// lower is the lower bound of the squared distance between i and j.
func (sk sketches) lower(i, j int) float64 {
	a, b := sk.v[i*sk.pieces:(i+1)*sk.pieces], sk.v[j*sk.pieces:(j+1)*sk.pieces]
	var s float64
	for k, w := range sk.w {
		d := a[k] - b[k]
		s += w * d * d
	}
	return s
}

// pairHeap keeps the worst of the best pairs on top (a max-heap by
// distance, then indices), so that it holds the k best.
type pairHeap []Pair

func worsePair(a, b Pair) int {
	if c := cmp.Compare(a.Distance, b.Distance); c != 0 {
		return c
	}
	if c := cmp.Compare(a.A, b.A); c != 0 {
		return c
	}
	return cmp.Compare(a.B, b.B)
}

func (h pairHeap) Len() int           { return len(h) }
func (h pairHeap) Less(i, j int) bool { return worsePair(h[i], h[j]) > 0 }
func (h pairHeap) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *pairHeap) Push(x any)        { *h = append(*h, x.(Pair)) }
func (h *pairHeap) Pop() any          { x := (*h)[len(*h)-1]; *h = (*h)[:len(*h)-1]; return x }

// offer keeps p if it is among the k best.
func (h *pairHeap) offer(p Pair, k int) {
	if len(*h) < k {
		heap.Push(h, p)
	} else if worsePair(p, (*h)[0]) < 0 {
		(*h)[0] = p
		heap.Fix(h, 0)
	}
}

// workers splits rows 0..n−1 among goroutines (row i to worker i mod w)
// and returns what each collected; the caller merges them, so the
// result does not depend on the split.
func workers[T any](n int, work func(rows func(yield func(int) bool)) T) []T {
	w := max(1, min(runtime.GOMAXPROCS(0), n/64))
	out := make([]T, w)
	var wg sync.WaitGroup
	for k := range w {
		wg.Go(func() {
			out[k] = work(func(yield func(int) bool) {
				for i := k; i < n; i += w {
					if !yield(i) {
						return
					}
				}
			})
		})
	}
	wg.Wait()
	return out
}

// Similar returns the top most alike pairs of shapes (by the Distance
// between their Signatures, as Seriate compares them), closest first,
// with no shape in more than perTerm of them (0: no limit; the limit
// picks from the 4·top closest pairs), so that one term alike to many
// does not fill the list.
//
// Cost: measuring every pair is n²/2 × y (2.8·10⁹ operations for 4,000
// terms of 175 years); the search avoids most of it with lower bounds of
// the distance (sketches, Keogh et al. 2001) that are cheap to test: the
// shapes are sorted by their mean, and from each shape only those whose
// mean is close enough to beat the current list's worst are visited (a
// one-piece sketch: y·(mean_a − mean_b)² ≤ ‖a − b‖²); a 4-piece and then
// a 16-piece sketch must beat it too before the distance is measured.
// The list starts from neighbours in the sort, so its worst is small
// from the start. Rows are shared among the processor's cores. The
// result is exact: a bound never exceeds the true distance.
func Similar(shapes [][]float64, top, perTerm int) []Pair {
	n := len(shapes)
	if n < 2 || top <= 0 {
		return nil
	}
	shapes = Signatures(shapes)
	y := float64(len(shapes[0]))
	keep := top
	if perTerm > 0 {
		keep = top * 4 // room for the limit per term to pass over some
	}
	sk4, sk16 := newSketches(shapes, 4), newSketches(shapes, sketchWidth)
	means := make([]float64, n)
	ord := make([]int, n)
	for i, sh := range shapes {
		means[i], ord[i] = mean(sh), i
	}
	slices.SortStableFunc(ord, func(a, b int) int { return cmp.Compare(means[a], means[b]) })
	pair := func(i, j int) Pair {
		if i > j {
			i, j = j, i
		}
		return Pair{A: i, B: j, Distance: sqDist(shapes[i], shapes[j])}
	}
	// Seed: each shape against its next few in the sort.
	var seed pairHeap
	for p := range n {
		for q := p + 1; q < min(n, p+5); q++ {
			seed.offer(pair(ord[p], ord[q]), keep)
		}
	}
	limit := math.Inf(1)
	if len(seed) == keep {
		limit = seed[0].Distance
	}
	const slack = 1 + 1e-9 // rounding in the bounds
	found := workers(n, func(rows func(func(int) bool)) pairHeap {
		var h pairHeap
		lim := limit // the seed's pairs are found again: their bounds are below it
		for p := range rows {
			i := ord[p]
			for q := p + 1; q < n; q++ {
				if len(h) == keep {
					lim = min(lim, h[0].Distance)
				}
				j := ord[q]
				if d := means[j] - means[i]; y*d*d > lim*slack {
					break // sorted by mean: the rest are further
				}
				if sk4.lower(i, j) > lim*slack || sk16.lower(i, j) > lim*slack {
					continue
				}
				h.offer(pair(i, j), keep)
			}
		}
		return h
	})
	var all []Pair // each pair was measured by one worker only (its row's)
	for _, h := range found {
		all = append(all, h...)
	}
	slices.SortFunc(all, worsePair)
	// The best keep of all pairs, whatever the number of cores: each
	// worker kept its own best keep.
	all = limitPerTerm(all[:min(len(all), keep)], top, perTerm, func(p Pair) (int, int) { return p.A, p.B })
	for i := range all {
		all[i].Distance = math.Sqrt(all[i].Distance / y)
	}
	return all
}

// limitPerTerm keeps, best first, up to top items with no index in more
// than perTerm of them (0: no limit).
func limitPerTerm[T any](items []T, top, perTerm int, ends func(T) (int, int)) []T {
	count := map[int]int{}
	var out []T
	for _, it := range items {
		if len(out) == top {
			break
		}
		a, b := ends(it)
		if perTerm > 0 && (count[a] >= perTerm || count[b] >= perTerm) {
			continue
		}
		count[a]++
		count[b]++
		out = append(out, it)
	}
	return out
}

// falls holds, for each shape and each split c (MinSide ≤ c ≤ y −
// MinSide), its fall across c: the mean before less the mean after.
type falls struct {
	lo, splits int
	f          []float64 // n × splits
	maxFall    []float64 // per shape: the largest fall
	maxRise    []float64 // the largest rise (−fall)
	blockFall  []float64 // n × blocks: the largest fall within each block of splits
	blockRise  []float64
	blocks     int
}

const splitBlock = 10 // splits a block bound covers

func newFalls(shapes [][]float64) (falls, bool) {
	y := len(shapes[0])
	lo, hi := MinSide, y-MinSide
	if hi < lo {
		return falls{}, false
	}
	n, k := len(shapes), hi-lo+1
	nb := (k + splitBlock - 1) / splitBlock
	fl := falls{lo: lo, splits: k, f: make([]float64, n*k), maxFall: make([]float64, n), maxRise: make([]float64, n),
		blockFall: make([]float64, n*nb), blockRise: make([]float64, n*nb), blocks: nb}
	pre := make([]float64, y+1)
	for i, sh := range shapes {
		for t, v := range sh {
			pre[t+1] = pre[t] + v
		}
		f := fl.f[i*k : (i+1)*k]
		fl.maxFall[i], fl.maxRise[i] = math.Inf(-1), math.Inf(-1)
		for b := range nb {
			fl.blockFall[i*nb+b], fl.blockRise[i*nb+b] = math.Inf(-1), math.Inf(-1)
		}
		for c := lo; c <= hi; c++ {
			v := pre[c]/float64(c) - (pre[y]-pre[c])/float64(y-c)
			f[c-lo] = v
			b := (c - lo) / splitBlock
			fl.maxFall[i] = math.Max(fl.maxFall[i], v)
			fl.maxRise[i] = math.Max(fl.maxRise[i], -v)
			fl.blockFall[i*nb+b] = math.Max(fl.blockFall[i*nb+b], v)
			fl.blockRise[i*nb+b] = math.Max(fl.blockRise[i*nb+b], -v)
		}
	}
	return fl, true
}

// bound is an upper bound of the strength of a hand-over from a to b:
// within each block, the smaller of a's largest fall and b's largest rise.
func (fl *falls) bound(a, b int) float64 {
	best := math.Inf(-1)
	fa, rb := fl.blockFall[a*fl.blocks:(a+1)*fl.blocks], fl.blockRise[b*fl.blocks:(b+1)*fl.blocks]
	for k := range fa {
		best = math.Max(best, math.Min(fa[k], rb[k]))
	}
	return best
}

// strength is the best split of a hand-over from a to b: the split
// where the smaller of a's fall and b's rise is largest, among splits
// where the two lines' means trade places (a above b before, below
// after). ok is false when there is none.
func (fl *falls) strength(shapes [][]float64, pre [][]float64, a, b int) (float64, int, bool) {
	y := len(shapes[a])
	fa, fb := fl.f[a*fl.splits:(a+1)*fl.splits], fl.f[b*fl.splits:(b+1)*fl.splits]
	pa, pb := pre[a], pre[b]
	best, split, ok := 0.0, 0, false
	for k := range fa {
		v := min(fa[k], -fb[k])
		if v <= 0 || ok && v <= best {
			continue
		}
		c := fl.lo + k
		// The means trade places: a above b before the split, below after.
		if pa[c] <= pb[c] || pa[y]-pa[c] >= pb[y]-pb[c] {
			continue
		}
		best, split, ok = v, c, true
	}
	return best, split, ok
}

// hoHeap keeps the weakest of the strongest hand-overs on top.
type hoHeap []HandOver

func weakerHO(a, b HandOver) int { // < 0: a is stronger
	if c := cmp.Compare(b.Strength, a.Strength); c != 0 {
		return c
	}
	if c := cmp.Compare(a.Falling, b.Falling); c != 0 {
		return c
	}
	return cmp.Compare(a.Rising, b.Rising)
}

func (h hoHeap) Len() int           { return len(h) }
func (h hoHeap) Less(i, j int) bool { return weakerHO(h[i], h[j]) > 0 }
func (h hoHeap) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *hoHeap) Push(x any)        { *h = append(*h, x.(HandOver)) }
func (h *hoHeap) Pop() any          { x := (*h)[len(*h)-1]; *h = (*h)[:len(*h)-1]; return x }

func (h *hoHeap) offer(x HandOver, k int) {
	if len(*h) < k {
		heap.Push(h, x)
	} else if weakerHO(x, (*h)[0]) < 0 {
		(*h)[0] = x
		heap.Fix(h, 0)
	}
}

// HandOvers returns the top strongest hand-overs, strongest first, with
// no shape in more than perTerm of them (0: no limit). A hand-over from
// a to b is scored at its best split c (at least MinSide years from
// either end): min(mean of a before c − mean of a after, mean of b
// after − mean of b before), among splits where the means trade places.
//
// Cost: each shape's fall at every split, n·y with prefix sums; then the
// ordered pairs in order of the falling shape's largest fall and the
// rising one's largest rise, stopping as soon as neither can beat the
// current top's weakest; a pair left is first bounded per block of ten
// splits and measured (y) only when the bound beats it. Exact, like
// Similar.
func HandOvers(shapes [][]float64, top, perTerm int) []HandOver {
	n := len(shapes)
	if n < 2 || top <= 0 {
		return nil
	}
	fl, ok := newFalls(shapes)
	if !ok {
		return nil
	}
	y := len(shapes[0])
	pre := make([][]float64, n)
	for i, sh := range shapes {
		pre[i] = make([]float64, y+1)
		for t, v := range sh {
			pre[i][t+1] = pre[i][t] + v
		}
	}
	keep := top
	if perTerm > 0 {
		keep = top * 4
	}
	byFall, byRise := make([]int, n), make([]int, n)
	for i := range n {
		byFall[i], byRise[i] = i, i
	}
	slices.SortStableFunc(byFall, func(a, b int) int { return cmp.Compare(fl.maxFall[b], fl.maxFall[a]) })
	slices.SortStableFunc(byRise, func(a, b int) int { return cmp.Compare(fl.maxRise[b], fl.maxRise[a]) })
	found := workers(n, func(rows func(func(int) bool)) hoHeap {
		var h hoHeap
		floor := 0.0 // the weakest kept, once the heap is full
		for r := range rows {
			a := byFall[r]
			if len(h) == keep {
				floor = h[0].Strength
			}
			if fl.maxFall[a] <= floor {
				break // byFall is sorted: no later a can do better
			}
			for _, b := range byRise {
				if len(h) == keep {
					floor = h[0].Strength
				}
				if fl.maxRise[b] <= floor {
					break
				}
				if a == b || fl.bound(a, b) <= floor {
					continue
				}
				if s, c, ok := fl.strength(shapes, pre, a, b); ok {
					h.offer(HandOver{Falling: a, Rising: b, Strength: s, Split: c}, keep)
				}
			}
		}
		return h
	})
	var all []HandOver
	for _, h := range found {
		all = append(all, h...)
	}
	slices.SortFunc(all, weakerHO)
	all = limitPerTerm(all[:min(len(all), keep)], top, perTerm, func(h HandOver) (int, int) { return h.Falling, h.Rising })
	for i := range all {
		all[i].Crossing = crossing(shapes[all[i].Falling], shapes[all[i].Rising], all[i].Split)
	}
	return all
}

// crossing is the year nearest the split (the earlier on a tie) in which
// the rising line, smoothed by a centred 9-year mean, first stands at or
// above the falling one after standing below it the year before; the
// split itself when the smoothed lines never cross so.
func crossing(falling, rising []float64, split int) int {
	f, r := movingMean(falling, 4), movingMean(rising, 4)
	best, bd := split, -1
	for t := 1; t < len(f); t++ {
		if r[t-1] < f[t-1] && r[t] >= f[t] {
			d := t - split
			if d < 0 {
				d = -d
			}
			if bd < 0 || d < bd {
				best, bd = t, d
			}
		}
	}
	return best
}
