package shape

import (
	"fmt"
	"math"
	"slices"
)

// OptimalLimit is the most shapes Seriate orders with the optimal leaf
// ordering; above it the greedy flips are used. The optimal one's cost
// grows with the cube of the count: BenchmarkSeriate, on this project's
// 2-core machine under other jobs, took 0.3 s at 384 shapes (the demo)
// and 5.7 s at 1,000, where the greedy order takes 0.55 s.
const OptimalLimit = 600

// Seriation is an order of shapes in which neighbours look alike, with
// the tree it keeps together.
type Seriation struct {
	Order   []int   // shape indices, first to last
	Tree    *Tree   // average-linkage tree of Dist
	Dist    *Matrix // Distance between every two shapes' Signatures
	Optimal bool    // Order is the optimal leaf order (else the greedy one)
}

// Seriate orders shapes so that neighbours look alike: the optimal leaf
// order of their average-linkage tree under the Distance between their
// Signatures (GreedyLeafOrder above OptimalLimit shapes). Of the order and its reverse, which cost
// the same, it returns the one whose first shape has its weight (the
// mean position of its ink, Σ t·y(t) / Σ y(t)) no later than its last.
// Cost: O(n²·y) for the distances, O(n²) for the tree, O(n³) at most for
// the order.
func Seriate(shapes [][]float64) *Seriation {
	d := Distances(Signatures(shapes))
	t := AverageLinkage(d)
	s := &Seriation{Tree: t, Dist: d, Optimal: len(shapes) <= OptimalLimit}
	if s.Optimal {
		s.Order = OptimalLeafOrder(t, d)
	} else {
		s.Order = GreedyLeafOrder(t, d)
	}
	if n := len(s.Order); n > 1 && centre(shapes[s.Order[0]]) > centre(shapes[s.Order[n-1]]) {
		slices.Reverse(s.Order)
	}
	return s
}

// centre is the mean position of a shape's ink, in indices.
func centre(y []float64) float64 {
	var sw, st float64
	for t, v := range y {
		sw += v
		st += float64(t) * v
	}
	if sw == 0 {
		return 0
	}
	return st / sw
}

// Run is a run of consecutive places in an order.
type Run struct{ Start, Count int }

// Groups cuts the seriation's tree into about k clusters and returns
// them as runs of its order (a cluster of the tree is always a run of its
// leaf order). A cluster smaller than n/(3k) (at least 2) would make a
// heading over one or two panels: it joins the neighbouring run whose
// members are closer to it on average. k is clamped to 1…n.
func (s *Seriation) Groups(k int) []Run {
	n := len(s.Order)
	if n == 0 {
		return nil
	}
	at := make([]int, n) // shape → place in the order
	for p, i := range s.Order {
		at[i] = p
	}
	var runs []Run
	for _, c := range s.Tree.Cut(k) {
		lo, hi := n, -1
		for _, i := range c {
			lo, hi = min(lo, at[i]), max(hi, at[i])
		}
		runs = append(runs, Run{Start: lo, Count: hi - lo + 1})
	}
	slices.SortFunc(runs, func(a, b Run) int { return a.Start - b.Start })
	small := max(2, int(math.Ceil(float64(n)/float64(3*max(1, k)))))
	for len(runs) > 1 {
		// The smallest run below the floor (the first of equals) goes.
		x := -1
		for i, r := range runs {
			if r.Count < small && (x < 0 || r.Count < runs[x].Count) {
				x = i
			}
		}
		if x < 0 {
			break
		}
		into := x - 1
		if x == 0 || x+1 < len(runs) && s.between(runs[x], runs[x+1]) < s.between(runs[x], runs[x-1]) {
			into = x + 1
		}
		a, b := min(x, into), max(x, into)
		runs[a] = Run{Start: runs[a].Start, Count: runs[a].Count + runs[b].Count}
		runs = slices.Delete(runs, b, b+1)
	}
	return runs
}

// between is the mean distance between the members of two runs.
func (s *Seriation) between(a, b Run) float64 {
	var sum float64
	for p := a.Start; p < a.Start+a.Count; p++ {
		for q := b.Start; q < b.Start+b.Count; q++ {
			sum += s.Dist.At(s.Order[p], s.Order[q])
		}
	}
	return sum / float64(a.Count*b.Count)
}

// GroupCount is how many clusters to ask Groups for with n panels:
// √(n/4), rounded, between 2 and 12 — about ten headings for the demo's
// 384 panels, and never more than a reader can hold. Our own rule.
func GroupCount(n int) int {
	return max(2, min(12, int(math.Round(math.Sqrt(float64(n)/4)))))
}

// Described cuts the seriation into groups (Groups) headed by what
// their mean shape does (Headings), with as few groups as keep each
// heading true of most of its panels: starting at GroupCount(n) it asks
// for one more group while some group's mean is of another kind (rising,
// falling, peaked…, see Describe) than half or more of its members, up
// to twice GroupCount(n). A group that is still mixed then says so:
// "Steady throughout on average (mixed)".
func (s *Seriation) Described(shapes [][]float64, from int) ([]Run, []string) {
	n := len(s.Order)
	kinds := make([]Kind, len(shapes))
	for i, sh := range shapes {
		kinds[i] = Describe(sh, from).Kind
	}
	base := GroupCount(n)
	var runs []Run
	var heads []string
	var mixed []bool
	for k := base; ; k++ {
		runs = s.Groups(k)
		mixed = make([]bool, len(runs))
		any := false
		for g, r := range runs {
			members := make([][]float64, r.Count)
			for p := range r.Count {
				members[p] = shapes[s.Order[r.Start+p]]
			}
			kind := Describe(Mean(members), from).Kind
			same := 0
			for p := range r.Count {
				if kinds[s.Order[r.Start+p]] == kind {
					same++
				}
			}
			mixed[g] = 2*same < r.Count
			any = any || mixed[g]
		}
		if !any || k >= min(n, 2*base) {
			break
		}
	}
	heads = headings(shapes, s.Order, runs, from, mixed)
	return runs, heads
}

// Mean is the mean of shapes, year by year.
func Mean(shapes [][]float64) []float64 {
	if len(shapes) == 0 {
		return nil
	}
	out := make([]float64, len(shapes[0]))
	for _, s := range shapes {
		for t, v := range s {
			out[t] += v
		}
	}
	for t := range out {
		out[t] /= float64(len(shapes))
	}
	return out
}

// Headings describes each run's mean shape (Describe) and makes equal
// descriptions distinct: by the years the mean stays above half its top
// when those differ, else by counting them ("…, 2 of 3").
func Headings(shapes [][]float64, order []int, runs []Run, from int) []string {
	return headings(shapes, order, runs, from, nil)
}

// headings is Headings with the groups marked mixed saying so.
func headings(shapes [][]float64, order []int, runs []Run, from int, mixed []bool) []string {
	out := make([]string, len(runs))
	descs := make([]Description, len(runs))
	for i, r := range runs {
		members := make([][]float64, r.Count)
		for p := range r.Count {
			members[p] = shapes[order[r.Start+p]]
		}
		descs[i] = Describe(Mean(members), from)
		out[i] = descs[i].Text
		if mixed != nil && mixed[i] {
			out[i] += " on average (mixed)"
		}
	}
	// Equal words: the years above half tell them apart when they
	// differ for every one of them; else they are counted.
	byText := map[string][]int{}
	var texts []string
	for i, t := range out {
		if byText[t] == nil {
			texts = append(texts, t)
		}
		byText[t] = append(byText[t], i)
	}
	for _, t := range texts {
		idx := byText[t]
		if len(idx) < 2 {
			continue
		}
		spans := map[[2]int]bool{}
		for _, i := range idx {
			spans[[2]int{descs[i].HighFrom, descs[i].HighTo}] = true
		}
		for k, i := range idx {
			if len(spans) == len(idx) {
				out[i] = fmt.Sprintf("%s (high %d–%d)", t, descs[i].HighFrom, descs[i].HighTo)
			} else {
				out[i] = fmt.Sprintf("%s, %d of %d", t, k+1, len(idx))
			}
		}
	}
	return out
}
