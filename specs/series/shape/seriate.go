package shape

import (
	"cmp"
	"slices"
)

// Tree is a binary merge tree (dendrogram) over n leaves: nodes 0..n−1
// are the leaves, n..2n−2 the merges in the order they were made; the
// last node is the root. A merge is made after both its children, so a
// parent's index is above its children's.
type Tree struct {
	Nodes []Node
}

// Node is a leaf (Left = Right = −1) or a merge of two nodes.
type Node struct {
	Left, Right int
	Height      float64 // the average distance between the two children's leaves
	Size        int     // leaves under the node
}

// Leaves is the number of leaves.
func (t *Tree) Leaves() int { return (len(t.Nodes) + 1) / 2 }

// Root is the index of the root.
func (t *Tree) Root() int { return len(t.Nodes) - 1 }

// AverageLinkage builds the average-linkage (UPGMA) tree of a distance
// matrix: each step merges the two clusters with the smallest mean
// distance between their members. It uses the nearest-neighbour chain
// (Murtagh 1983, "A survey of recent advances in hierarchical clustering
// algorithms", Computer Journal 26(4)), which gives the same tree as the
// greedy algorithm because average linkage is reducible, in O(n²) time
// with the Lance–Williams update. Ties go to the lower index.
func AverageLinkage(d *Matrix) *Tree {
	n := d.Len()
	t := &Tree{Nodes: make([]Node, n, max(2*n-1, n))}
	for i := range t.Nodes {
		t.Nodes[i] = Node{Left: -1, Right: -1, Size: 1}
	}
	if n < 2 {
		return t
	}
	w := &Matrix{n: n, d: slices.Clone(d.d)} // working distances between clusters, by slot
	node := make([]int, n)                   // slot → node
	for i := range node {
		node[i] = i
	}
	active := make([]int, n) // slots in use, ascending
	for i := range active {
		active[i] = i
	}
	var chain []int
	for len(active) > 1 {
		if len(chain) == 0 {
			chain = append(chain, active[0])
		}
		for {
			a := chain[len(chain)-1]
			prev := -1
			if len(chain) > 1 {
				prev = chain[len(chain)-2]
			}
			b, best := -1, 0.0
			for _, c := range active {
				if c == a {
					continue
				}
				if v := w.At(a, c); b < 0 || v < best {
					b, best = c, v
				}
			}
			// The chain ends at a reciprocal pair; on a tie, the one
			// before in the chain wins, so the chain never cycles.
			if prev >= 0 && w.At(a, prev) <= best {
				b = prev
			}
			if b == prev {
				break
			}
			chain = append(chain, b)
		}
		a, b := chain[len(chain)-1], chain[len(chain)-2]
		chain = chain[:len(chain)-2]
		if a > b {
			a, b = b, a
		}
		na, nb := t.Nodes[node[a]].Size, t.Nodes[node[b]].Size
		h := w.At(a, b)
		l, r := node[a], node[b]
		if l > r {
			l, r = r, l
		}
		t.Nodes = append(t.Nodes, Node{Left: l, Right: r, Height: h, Size: na + nb})
		// Slot a becomes the merged cluster; slot b is retired.
		for _, c := range active {
			if c != a && c != b {
				w.Set(a, c, (float64(na)*w.At(a, c)+float64(nb)*w.At(b, c))/float64(na+nb))
			}
		}
		node[a] = len(t.Nodes) - 1
		i, _ := slices.BinarySearch(active, b)
		active = slices.Delete(active, i, i+1)
	}
	return t
}

// span lays the leaves out left subtree first and records each node's
// run of that layout: node v's leaves are leaves[lo[v]:hi[v]], and an
// internal node's left child ends at hi[Left].
type span struct {
	leaves, lo, hi, pos []int // pos: leaf → its place in leaves
}

func (t *Tree) spans() span {
	n := t.Leaves()
	s := span{lo: make([]int, len(t.Nodes)), hi: make([]int, len(t.Nodes)), pos: make([]int, n)}
	var walk func(v int)
	walk = func(v int) {
		s.lo[v] = len(s.leaves)
		if nd := t.Nodes[v]; nd.Left < 0 {
			s.pos[v] = len(s.leaves)
			s.leaves = append(s.leaves, v)
		} else {
			walk(nd.Left)
			walk(nd.Right)
		}
		s.hi[v] = len(s.leaves)
	}
	walk(t.Root())
	return s
}

// OptimalLeafOrder returns the order of the tree's leaves that keeps
// every cluster of the tree together and, among the 2^(n−1) such orders
// (each merge may flip its two children), has the least sum of distances
// between neighbours: Bar-Joseph, Gifford & Jaakkola (2001), "Fast
// optimal leaf ordering for hierarchical clustering", Bioinformatics
// 17(Suppl 1):S22–S29. For every merge v and every leaf i on its left
// and j on its right it finds the best cost of an order of v's leaves
// from i to j,
//
//	M(v,i,j) = min over k, l of M(L,i,k) + d(k,l) + M(R,l,j),
//
// k on the far side of L from i, l on the far side of R from j, first
// minimising over k for each l (their O(n³) scheme, without the pruning
// of their section 3.2). Memory: one n × n table.
func OptimalLeafOrder(t *Tree, d *Matrix) []int {
	n := t.Leaves()
	if n <= 2 {
		out := make([]int, n)
		for i := range out {
			out[i] = i
		}
		return out
	}
	s := t.spans()
	m := make([]float64, n*n) // M(lca(i,j), i, j) at i*n+j
	// far returns the leaves of the child of v that does not hold leaf i
	// (v itself when it is a leaf).
	far := func(v, i int) []int {
		nd := t.Nodes[v]
		if nd.Left < 0 {
			return s.leaves[s.lo[v]:s.hi[v]]
		}
		if s.pos[i] < s.hi[nd.Left] {
			return s.leaves[s.lo[nd.Right]:s.hi[nd.Right]]
		}
		return s.leaves[s.lo[nd.Left]:s.hi[nd.Left]]
	}
	tmp := make([]float64, n)
	for v := n; v < len(t.Nodes); v++ {
		nd := t.Nodes[v]
		L, R := nd.Left, nd.Right
		left, right := s.leaves[s.lo[L]:s.hi[L]], s.leaves[s.lo[R]:s.hi[R]]
		for _, i := range left {
			ks := far(L, i)
			for _, l := range right {
				best := 0.0
				for x, k := range ks {
					if c := m[i*n+k] + d.At(k, l); x == 0 || c < best {
						best = c
					}
				}
				tmp[l] = best
			}
			for _, j := range right {
				best := 0.0
				for x, l := range far(R, j) {
					if c := tmp[l] + m[l*n+j]; x == 0 || c < best {
						best = c
					}
				}
				m[i*n+j], m[j*n+i] = best, best
			}
		}
	}
	root := t.Nodes[t.Root()]
	bi, bj, best := -1, -1, 0.0
	for _, i := range s.leaves[s.lo[root.Left]:s.hi[root.Left]] {
		for _, j := range s.leaves[s.lo[root.Right]:s.hi[root.Right]] {
			if c := m[i*n+j]; bi < 0 || c < best {
				bi, bj, best = i, j, c
			}
		}
	}
	out := make([]int, 0, n)
	// trace appends the best order of v's leaves from i to j.
	var trace func(v, i, j int)
	trace = func(v, i, j int) {
		nd := t.Nodes[v]
		if nd.Left < 0 {
			out = append(out, v)
			return
		}
		if s.pos[i] >= s.hi[nd.Left] { // i on the right: the reverse of j…i
			start := len(out)
			trace(v, j, i)
			slices.Reverse(out[start:])
			return
		}
		bk, bl, best := -1, -1, 0.0
		for _, k := range far(nd.Left, i) {
			for _, l := range far(nd.Right, j) {
				if c := m[i*n+k] + d.At(k, l) + m[l*n+j]; bk < 0 || c < best {
					bk, bl, best = k, l, c
				}
			}
		}
		trace(nd.Left, i, bk)
		trace(nd.Right, bl, j)
	}
	trace(t.Root(), bi, bj)
	return out
}

// GreedyLeafOrder flips each merge's children, from the leaves up, so
// that the two ends that meet are the closest of the four possible
// pairs: the heuristic of Gruvaeus & Wainer (1972), "Two additions to
// hierarchical cluster analysis", British Journal of Mathematical and
// Statistical Psychology 25:200–206. O(n) after the tree; used where the
// optimal order's O(n³) is too slow.
func GreedyLeafOrder(t *Tree, d *Matrix) []int {
	n := t.Leaves()
	first := make([]int, len(t.Nodes))
	last := make([]int, len(t.Nodes))
	flipL := make([]bool, len(t.Nodes))
	flipR := make([]bool, len(t.Nodes))
	for v := range t.Nodes {
		nd := t.Nodes[v]
		if nd.Left < 0 {
			first[v], last[v] = v, v
			continue
		}
		L, R := nd.Left, nd.Right
		best := -1.0
		for _, c := range [4][2]bool{{false, false}, {false, true}, {true, false}, {true, true}} {
			a := last[L]
			if c[0] {
				a = first[L]
			}
			b := first[R]
			if c[1] {
				b = last[R]
			}
			if x := d.At(a, b); best < 0 || x < best {
				best, flipL[v], flipR[v] = x, c[0], c[1]
			}
		}
		first[v], last[v] = first[L], last[R]
		if flipL[v] {
			first[v] = last[L]
		}
		if flipR[v] {
			last[v] = first[R]
		}
	}
	out := make([]int, 0, n)
	var walk func(v int, flip bool)
	walk = func(v int, flip bool) {
		nd := t.Nodes[v]
		if nd.Left < 0 {
			out = append(out, v)
			return
		}
		a, fa := nd.Left, flipL[v] != flip
		b, fb := nd.Right, flipR[v] != flip
		if flip {
			a, b, fa, fb = b, a, fb, fa
		}
		walk(a, fa)
		walk(b, fb)
	}
	if n > 0 {
		walk(t.Root(), false)
	}
	return out
}

// PathLength is the sum of distances between neighbours in an order.
func PathLength(order []int, d *Matrix) float64 {
	var s float64
	for i := 1; i < len(order); i++ {
		s += d.At(order[i-1], order[i])
	}
	return s
}

// Cut cuts the tree into k clusters by undoing its k−1 highest merges
// (ties: the later merge first, so a merge is undone before its
// children). Clusters come back as lists of leaves, in no set order.
func (t *Tree) Cut(k int) [][]int {
	n := t.Leaves()
	k = max(1, min(k, n))
	internal := make([]int, 0, n-1)
	for v := n; v < len(t.Nodes); v++ {
		internal = append(internal, v)
	}
	slices.SortFunc(internal, func(a, b int) int {
		if c := cmp.Compare(t.Nodes[b].Height, t.Nodes[a].Height); c != 0 {
			return c
		}
		return cmp.Compare(b, a)
	})
	cut := map[int]bool{}
	for _, v := range internal[:k-1] {
		cut[v] = true
	}
	var out [][]int
	var collect func(v int, into *[]int)
	collect = func(v int, into *[]int) {
		if nd := t.Nodes[v]; nd.Left >= 0 {
			collect(nd.Left, into)
			collect(nd.Right, into)
			return
		}
		*into = append(*into, v)
	}
	var walk func(v int)
	walk = func(v int) {
		if cut[v] {
			walk(t.Nodes[v].Left)
			walk(t.Nodes[v].Right)
			return
		}
		var c []int
		collect(v, &c)
		out = append(out, c)
	}
	if n > 0 {
		walk(t.Root())
	}
	return out
}
