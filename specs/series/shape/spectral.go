package shape

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// Fiedler returns the Fiedler vector of the similarity S_ij = max d − d_ij
// of a distance matrix: the eigenvector of the second-smallest eigenvalue
// of the Laplacian L = diag(S·1) − S, unit length, its largest entry
// positive. Sorting by it is spectral seriation (Atkins, Boman &
// Hendrickson 1998, "A spectral algorithm for seriation and the
// consecutive ones problem", SIAM J. Comput. 28(1):297–310): when S is a
// Robinson similarity the sorted order is a Robinson order (their
// theorem 3.3).
//
// Seriate does not use it: the optimal leaf ordering puts alike lines
// next to each other far more closely (TestOrdersCompared, README); it
// is here, checked, as the measured alternative.
//
// It is found by Lanczos iteration with full reorthogonalisation on the
// complement of the constant vector (L's first eigenvector), restarted
// from its own estimate until the residual ‖Lx − θx‖ is below 1e-9 of
// ‖L‖'s bound or 20 restarts pass. Each step is one product with L,
// O(n²), computed from the distances without storing S or L. ok is
// false for fewer than 2 items.
func Fiedler(d *Matrix) (x []float64, ok bool) {
	n := d.Len()
	if n < 2 {
		return nil, false
	}
	dmax := 0.0
	for _, v := range d.d {
		dmax = math.Max(dmax, float64(v))
	}
	deg := make([]float64, n)
	for i := range n {
		for j := range n {
			if i != j {
				deg[i] += dmax - d.At(i, j)
			}
		}
	}
	norm := 0.0 // a bound of ‖L‖: twice the largest degree (Gershgorin)
	for _, v := range deg {
		norm = math.Max(norm, 2*v)
	}
	if norm == 0 { // all distances equal: any order is as good
		x = make([]float64, n)
		for i := range x {
			x[i] = float64(i) - float64(n-1)/2
		}
		return unit(x), true
	}
	lap := func(dst, v []float64) { // dst = L v
		for i := range n {
			s := deg[i] * v[i]
			for j := range n {
				if j != i {
					s -= (dmax - d.At(i, j)) * v[j]
				}
			}
			dst[i] = s
		}
	}
	ones := make([]float64, n)
	for i := range ones {
		ones[i] = 1 / math.Sqrt(float64(n))
	}
	// A fixed start, so the answer is the same every run.
	start := make([]float64, n)
	for i := range start {
		start[i] = math.Sin(float64(i+1)*1.618) + 0.5
	}
	m := min(n-1, 60)
	for range 20 {
		theta, vec := lanczos(lap, start, ones, m)
		r := make([]float64, n)
		lap(r, vec)
		res := 0.0
		for i := range r {
			e := r[i] - theta*vec[i]
			res += e * e
		}
		start = vec
		if math.Sqrt(res) <= 1e-9*norm {
			break
		}
	}
	x = unit(start)
	big := 0
	for i := range x {
		if math.Abs(x[i]) > math.Abs(x[big])+1e-12 {
			big = i
		}
	}
	if x[big] < 0 {
		for i := range x {
			x[i] = -x[i]
		}
	}
	return x, true
}

// lanczos runs m steps from start, orthogonal to the unit vector skip,
// and returns the smallest Ritz value and its vector.
func lanczos(op func(dst, v []float64), start, skip []float64, m int) (float64, []float64) {
	n := len(start)
	orth := func(v []float64, basis [][]float64) {
		for range 2 { // twice is enough (Parlett's "twice is enough")
			for _, b := range basis {
				c := dot(v, b)
				for i := range v {
					v[i] -= c * b[i]
				}
			}
		}
	}
	q := slices.Clone(start)
	orth(q, [][]float64{skip})
	q = unit(q)
	basis := [][]float64{skip}
	var V [][]float64
	var alpha, beta []float64
	w := make([]float64, n)
	for k := range m {
		V = append(V, q)
		basis = append(basis, q)
		op(w, q)
		a := dot(w, q)
		alpha = append(alpha, a)
		next := slices.Clone(w)
		orth(next, basis)
		b := math.Sqrt(dot(next, next))
		if k == m-1 || b < 1e-12 {
			break
		}
		beta = append(beta, b)
		for i := range next {
			next[i] /= b
		}
		q = next
	}
	k := len(alpha)
	T := mat.NewSymDense(k, nil)
	for i := range k {
		T.SetSym(i, i, alpha[i])
		if i+1 < k {
			T.SetSym(i, i+1, beta[i])
		}
	}
	var es mat.EigenSym
	if !es.Factorize(T, true) {
		return alpha[0], V[0]
	}
	vals := es.Values(nil) // ascending
	var vecs mat.Dense
	es.VectorsTo(&vecs)
	y := make([]float64, n)
	for j := range k {
		c := vecs.At(j, 0)
		for i := range y {
			y[i] += c * V[j][i]
		}
	}
	return vals[0], unit(y)
}

func dot(a, b []float64) float64 {
	var s float64
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

func unit(v []float64) []float64 {
	l := math.Sqrt(dot(v, v))
	if l == 0 {
		return v
	}
	out := make([]float64, len(v))
	for i := range v {
		out[i] = v[i] / l
	}
	return out
}

// SpectralOrder is spectral seriation: the items sorted by their Fiedler
// coordinate (ties by index).
func SpectralOrder(d *Matrix) []int {
	x, ok := Fiedler(d)
	order := make([]int, d.Len())
	for i := range order {
		order[i] = i
	}
	if ok {
		slices.SortStableFunc(order, func(a, b int) int { return cmpFloat(x[a], x[b]) })
	}
	return order
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// SpectralLeafOrder keeps the tree's clusters together and, at every
// merge, puts first the child whose leaves lie earlier on average along
// the Fiedler vector: the tree's order arranged by the spectral
// seriation's global sweep.
func SpectralLeafOrder(t *Tree, d *Matrix) []int {
	x, ok := Fiedler(d)
	if !ok {
		return GreedyLeafOrder(t, d)
	}
	sum := make([]float64, len(t.Nodes))
	for v, nd := range t.Nodes {
		if nd.Left < 0 {
			sum[v] = x[v]
		} else {
			sum[v] = sum[nd.Left] + sum[nd.Right]
		}
	}
	out := make([]int, 0, t.Leaves())
	var walk func(v int)
	walk = func(v int) {
		nd := t.Nodes[v]
		if nd.Left < 0 {
			out = append(out, v)
			return
		}
		a, b := nd.Left, nd.Right
		if sum[b]/float64(t.Nodes[b].Size) < sum[a]/float64(t.Nodes[a].Size) {
			a, b = b, a
		}
		walk(a)
		walk(b)
	}
	walk(t.Root())
	return out
}
