package shape

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/mat"
)

// laplacian is L = diag(S·1) − S with S_ij = max d − d_ij, dense.
func laplacian(d *Matrix) *mat.SymDense {
	n := d.Len()
	dmax := 0.0
	for i := range n {
		for j := range i {
			dmax = math.Max(dmax, d.At(i, j))
		}
	}
	L := mat.NewSymDense(n, nil)
	for i := range n {
		deg := 0.0
		for j := range n {
			if j != i {
				s := dmax - d.At(i, j)
				deg += s
				if j > i {
					L.SetSym(i, j, -s)
				}
			}
		}
		L.SetSym(i, i, deg)
	}
	return L
}

// Our Lanczos Fiedler vector against gonum's dense symmetric
// eigen-decomposition (mat.EigenSym, LAPACK's dsyev algorithm): the
// eigenvector of the second-smallest eigenvalue, up to sign.
func TestFiedlerMatchesGonumEigenSym(t *testing.T) {
	r := rand.New(rand.NewPCG(31, 32))
	for _, n := range []int{3, 10, 50, 150} { // two items: S = 0, L = 0, every vector is an eigenvector
		d := randomMatrix(r, n)
		var es mat.EigenSym
		require.True(t, es.Factorize(laplacian(d), true))
		vals := es.Values(nil)
		var vecs mat.Dense
		es.VectorsTo(&vecs)
		if n > 2 {
			require.Greater(t, vals[2]-vals[1], 1e-6, "λ2 simple, so its vector is defined")
		}
		want := mat.Col(nil, 1, &vecs)
		got, ok := Fiedler(d)
		require.True(t, ok)
		assert.InDelta(t, 1, math.Abs(dot(got, want)), 1e-8, "n=%d: |⟨ours, gonum's⟩| = 1", n)
	}
}

// Atkins, Boman & Hendrickson (1998), theorem 3.3: for a Robinson
// similarity with a simple λ2 the Fiedler vector is monotone along the
// Robinson order, so spectral seriation recovers it up to reversal.
func TestSpectralRecoversRobinsonOrder(t *testing.T) {
	r := rand.New(rand.NewPCG(41, 42))
	for _, n := range []int{8, 40, 120} {
		x := make([]float64, n)
		for i := range x {
			x[i] = r.Float64() * 10
		}
		perm := r.Perm(n)
		d := NewMatrix(n)
		for i := range n {
			for j := range i {
				d.Set(i, j, math.Abs(x[perm[i]]-x[perm[j]]))
			}
		}
		o := SpectralOrder(d)
		got := make([]float64, n)
		for p, i := range o {
			got[p] = x[perm[i]]
		}
		ok := slices.IsSorted(got) || slices.IsSortedFunc(got, func(a, b float64) int { return -compare(a, b) })
		assert.True(t, ok, "n=%d: %v", n, got)
	}
}

// The spectral leaf order keeps the tree's clusters together.
func TestSpectralLeafOrderIsATreeOrder(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	d := randomMatrix(r, 9)
	tr := AverageLinkage(d)
	assert.Contains(t, treeOrders(tr, tr.Root()), SpectralLeafOrder(tr, d))
}
