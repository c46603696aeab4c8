package shape

import (
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func randomMatrix(r *rand.Rand, n int) *Matrix {
	m := NewMatrix(n)
	for i := range n {
		for j := range i {
			m.Set(i, j, r.Float64())
		}
	}
	return m
}

// treeOrders lists every leaf order the tree allows: each merge may put
// either child first (2^(n−1) orders).
func treeOrders(t *Tree, v int) [][]int {
	nd := t.Nodes[v]
	if nd.Left < 0 {
		return [][]int{{v}}
	}
	var out [][]int
	for _, a := range treeOrders(t, nd.Left) {
		for _, b := range treeOrders(t, nd.Right) {
			out = append(out, append(slices.Clone(a), b...), append(slices.Clone(b), a...))
		}
	}
	return out
}

// Bar-Joseph, Gifford & Jaakkola (2001), §2: the optimal leaf ordering is
// the least sum of neighbour distances over all orders the tree allows;
// here that minimum is found by trying every one of them.
func TestOptimalLeafOrderEqualsBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(17, 1))
	for n := 2; n <= 9; n++ {
		for trial := range 6 {
			d := randomMatrix(r, n)
			tr := AverageLinkage(d)
			best := math.Inf(1)
			for _, o := range treeOrders(tr, tr.Root()) {
				best = math.Min(best, PathLength(o, d))
			}
			got := OptimalLeafOrder(tr, d)
			require.ElementsMatch(t, seq(n), got, "n=%d trial %d: a permutation", n, trial)
			assert.InDelta(t, best, PathLength(got, d), 1e-9, "n=%d trial %d: brute force over the tree's %d orders", n, trial, 1<<(n-1))
			assert.Contains(t, treeOrders(tr, tr.Root()), got, "n=%d trial %d: an order the tree allows", n, trial)
			greedy := GreedyLeafOrder(tr, d)
			assert.Contains(t, treeOrders(tr, tr.Root()), greedy, "greedy order is one the tree allows")
			assert.GreaterOrEqual(t, PathLength(greedy, d), best-1e-9, "greedy is never better than optimal")
		}
	}
}

func seq(n int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = i
	}
	return s
}

// naiveAverageLinkage is the textbook greedy algorithm (Sokal & Michener
// 1958, UPGMA): merge the closest pair of clusters, distances as the mean
// over member pairs recomputed from the leaves. Heights in merge order.
func naiveAverageLinkage(d *Matrix) []float64 {
	var clusters [][]int
	for i := range d.Len() {
		clusters = append(clusters, []int{i})
	}
	var heights []float64
	for len(clusters) > 1 {
		ba, bb, best := 0, 1, math.Inf(1)
		for a := range clusters {
			for b := a + 1; b < len(clusters); b++ {
				var s float64
				for _, i := range clusters[a] {
					for _, j := range clusters[b] {
						s += d.At(i, j)
					}
				}
				if v := s / float64(len(clusters[a])*len(clusters[b])); v < best {
					ba, bb, best = a, b, v
				}
			}
		}
		heights = append(heights, best)
		clusters[ba] = append(clusters[ba], clusters[bb]...)
		clusters = slices.Delete(clusters, bb, bb+1)
	}
	return heights
}

// The nearest-neighbour chain gives the same tree as the greedy
// algorithm for a reducible linkage such as average linkage (Murtagh
// 1983; Müllner 2011, "Modern hierarchical, agglomerative clustering
// algorithms", arXiv:1109.2378, §3): the same merge heights.
func TestAverageLinkageMatchesGreedy(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 9))
	for _, n := range []int{2, 3, 7, 20, 41} {
		d := randomMatrix(r, n)
		tr := AverageLinkage(d)
		var got []float64
		for _, nd := range tr.Nodes[n:] {
			got = append(got, nd.Height)
		}
		want := naiveAverageLinkage(d)
		slices.Sort(got)
		slices.Sort(want)
		require.Len(t, got, n-1)
		assert.InDeltaSlice(t, want, got, 1e-6, "n=%d (float32 storage: 1e-6)", n)
		assert.Equal(t, n, tr.Nodes[tr.Root()].Size)
	}
}

// A Robinson dissimilarity (Robinson 1951; Liiv 2010, "Seriation and
// matrix reordering methods", Statistical Analysis and Data Mining 3(2),
// §2): there is an order in which distances never shrink moving away
// from the diagonal. Seriation must find that order, up to reversal,
// from a shuffled matrix.
func TestSeriationRecoversRobinsonOrder(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for trial, tc := range []struct {
		name string
		f    func(x, y float64) float64
	}{
		{"|x−y| of points on a line", func(x, y float64) float64 { return math.Abs(x - y) }},
		{"(x−y)²", func(x, y float64) float64 { return (x - y) * (x - y) }},
		{"1 − exp(−|x−y|)", func(x, y float64) float64 { return 1 - math.Exp(-math.Abs(x-y)) }},
	} {
		for _, n := range []int{10, 60, 200} {
			x := make([]float64, n)
			for i := range x {
				x[i] = r.Float64() * 10
			}
			perm := r.Perm(n)
			d := NewMatrix(n)
			for i := range n {
				for j := range i {
					d.Set(i, j, tc.f(x[perm[i]], x[perm[j]]))
				}
			}
			assert.True(t, isRobinson(d, sortedBy(x, perm)), "the matrix is Robinson in the sorted order")
			o := OptimalLeafOrder(AverageLinkage(d), d)
			got := make([]float64, n)
			for p, i := range o {
				got[p] = x[perm[i]]
			}
			ok := slices.IsSorted(got) || slices.IsSortedFunc(got, func(a, b float64) int { return -compare(a, b) })
			assert.True(t, ok, "%s, n=%d (trial %d): order recovered up to reversal: %v", tc.name, n, trial, got)
		}
	}
}

func compare(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// sortedBy is the matrix indices in the order of their points.
func sortedBy(x []float64, perm []int) []int {
	idx := seq(len(perm))
	slices.SortFunc(idx, func(a, b int) int { return compare(x[perm[a]], x[perm[b]]) })
	return idx
}

func isRobinson(d *Matrix, order []int) bool {
	n := len(order)
	for i := range n {
		for j := i + 1; j+1 < n; j++ {
			if d.At(order[i], order[j]) > d.At(order[i], order[j+1])+1e-12 {
				return false
			}
		}
	}
	return true
}

// Shapes whose peaks march through the years are a Robinson set under
// Distance (two bumps further apart overlap less): Seriate puts them in
// the order of their peaks, earliest first (its orientation rule).
func TestSeriateOrdersMarchingPeaks(t *testing.T) {
	const years, n = 150, 40
	r := rand.New(rand.NewPCG(8, 8))
	centres := make([]float64, n)
	for i := range centres {
		centres[i] = 10 + r.Float64()*130
	}
	shapes := make([][]float64, n)
	for i, c := range centres {
		shapes[i] = make([]float64, years)
		for t := range years {
			shapes[i][t] = math.Exp(-(float64(t) - c) * (float64(t) - c) / (2 * 15 * 15))
		}
	}
	s := Seriate(shapes)
	require.True(t, s.Optimal)
	got := make([]float64, n)
	for p, i := range s.Order {
		got[p] = centres[i]
	}
	assert.True(t, slices.IsSorted(got), "peaks in order: %v", got)
}

// Distance on hand-worked values: RMS of the differences.
func TestDistance(t *testing.T) {
	for _, tc := range []struct {
		a, b []float64
		want float64
	}{
		{[]float64{0, 0, 0, 0}, []float64{1, 1, 1, 1}, 1},                // worked by hand
		{[]float64{0, 1}, []float64{1, 0}, 1},                            // worked by hand
		{[]float64{0.5, 0.5, 0.5}, []float64{0.5, 0.5, 0.5}, 0},          // worked by hand
		{[]float64{0, 0, 0, 1}, []float64{0, 0, 0, 0}, 0.5},              // √(1/4), by hand
		{[]float64{0.2, 0.4, 0.6}, []float64{0.1, 0.1, 0.1}, 0.34156503}, // √((0.01+0.09+0.25)/3), by hand
	} {
		assert.InDelta(t, tc.want, Distance(tc.a, tc.b), 1e-8, "%v vs %v", tc.a, tc.b)
	}
}

// Of divides by the y-range's top and bridges gaps with straight lines.
func TestOfBridgesGaps(t *testing.T) {
	nan := math.NaN()
	got := Of([]float64{nan, 2, nan, nan, 8, nan}, 8)
	assert.InDeltaSlice(t, []float64{0.25, 0.25, 0.5, 0.75, 1, 1}, got, 1e-12, "by hand: 2/8, linear between, ends held")
	assert.Equal(t, []float64{0, 0}, Of([]float64{nan, nan}, 1), "no value: flat at 0")
}

// Cut: k clusters, each a run of the leaf order.
func TestCutGivesRuns(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	d := randomMatrix(r, 30)
	tr := AverageLinkage(d)
	o := OptimalLeafOrder(tr, d)
	at := make([]int, 30)
	for p, i := range o {
		at[i] = p
	}
	for k := 1; k <= 30; k++ {
		cs := tr.Cut(k)
		require.Len(t, cs, k)
		total := 0
		for _, c := range cs {
			lo, hi := 30, -1
			for _, i := range c {
				lo, hi = min(lo, at[i]), max(hi, at[i])
			}
			assert.Equal(t, len(c), hi-lo+1, "k=%d: a cluster is a run of the order", k)
			total += len(c)
		}
		assert.Equal(t, 30, total)
	}
}

// Signature: the shape, then its cumulative share of ink (by hand).
func TestSignature(t *testing.T) {
	assert.Equal(t, []float64{1, 0, 1, 0, 0.5, 0.5, 1, 1}, Signature([]float64{1, 0, 1, 0}))
	assert.Equal(t, []float64{0, 0, 0, 0}, Signature([]float64{0, 0}), "no ink: 0 throughout")
	// Why it is there: two brief peaks (3 years of 150) 80 years apart
	// and two 5 years apart are equally far as plotted lines (no overlap
	// either way), but not by when their ink falls.
	peak := func(at int) []float64 { s := make([]float64, 150); s[at], s[at+1], s[at+2] = 1, 1, 1; return s }
	a, near, far := peak(20), peak(25), peak(100)
	assert.InDelta(t, Distance(a, near), Distance(a, far), 1e-12)
	assert.Less(t, Distance(Signature(a), Signature(near)), Distance(Signature(a), Signature(far)))
}

// BenchmarkSeriate: distances, tree and order for n random-walk shapes of
// 158 years (the demo's span): optimal order up to OptimalLimit, greedy
// above.
func BenchmarkSeriate(b *testing.B) {
	for _, n := range []int{384, OptimalLimit, OptimalLimit + 1, 1000, 4000} {
		shapes := randomShapes(rand.New(rand.NewPCG(1, uint64(n))), n, 158)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				Seriate(shapes)
			}
		})
	}
}

// One, two and three shapes, and shapes of one or two years: no panic,
// a permutation, groups that cover every place.
func TestSeriateSmallInputs(t *testing.T) {
	for _, n := range []int{1, 2, 3} {
		for _, y := range []int{1, 2, 30} {
			shapes := randomShapes(rand.New(rand.NewPCG(uint64(n), uint64(y))), n, y)
			s := Seriate(shapes)
			assert.ElementsMatch(t, seq(n), s.Order, "n=%d y=%d", n, y)
			total := 0
			for _, r := range s.Groups(GroupCount(n)) {
				total += r.Count
			}
			assert.Equal(t, n, total)
			assert.Len(t, Headings(shapes, s.Order, s.Groups(GroupCount(n)), 1900), len(s.Groups(GroupCount(n))))
			assert.NotPanics(t, func() { Similar(shapes, 3, 1); HandOvers(shapes, 3, 1) })
		}
	}
}
