package icc

// grid is a colour lookup table: values at the nodes of a regular grid over
// [0, 1]^n, the first input varying slowest (ICC.1:2010 §10.10.4).
type grid struct {
	dims   []int
	nOut   int
	stride []int     // per input, in values
	data   []float32 // 16-bit table values need 16 of float32's 24 bits
	// trilinear selects trilinear rather than tetrahedral interpolation
	// for three inputs (LittleCMS's choice for CIELAB-indexed tables).
	trilinear bool
}

func newGrid(dims []int, nOut, n int) *grid {
	g := &grid{dims: dims, nOut: nOut, stride: make([]int, len(dims)), data: make([]float32, n)}
	s := nOut
	for i := len(dims) - 1; i >= 0; i-- {
		g.stride[i] = s
		s *= dims[i]
	}
	return g
}

// apply interpolates the table at in. Like LittleCMS (cmsintrp.c), three
// inputs are interpolated in tetrahedra (or trilinearly, see trilinear);
// four or more linearly along the first inputs down to three, which are
// interpolated in tetrahedra; one or two inputs linearly.
func (g *grid) apply(in []float64) []float64 {
	var idx [maxChannels]int
	var frac [maxChannels]float64
	for i, d := range g.dims {
		pos := clamp01(in[i]) * float64(d-1)
		k := int(pos)
		if k >= d-1 {
			k, frac[i] = d-2, 1
		} else {
			frac[i] = pos - float64(k)
		}
		idx[i] = k
	}
	out := make([]float64, g.nOut)
	g.eval(0, 0, idx[:len(g.dims)], frac[:len(g.dims)], 1, out)
	return out
}

// eval adds weight × the interpolated value over inputs dim… at the cell
// whose base node is at offset base.
func (g *grid) eval(dim, base int, idx []int, frac []float64, weight float64, out []float64) {
	n := len(g.dims) - dim
	switch {
	case n == 3 && !g.trilinear:
		g.tetrahedral(dim, base, idx, frac, weight, out)
		return
	case n <= 3:
		g.multilinear(dim, base, idx, frac, weight, out)
		return
	}
	at := base + idx[dim]*g.stride[dim]
	f := frac[dim]
	if f != 1 {
		g.eval(dim+1, at, idx, frac, weight*(1-f), out)
	}
	if f != 0 {
		g.eval(dim+1, at+g.stride[dim], idx, frac, weight*f, out)
	}
}

func (g *grid) tetrahedral(dim, base int, idx []int, frac []float64, weight float64, out []float64) {
	a, b, c := dim, dim+1, dim+2
	// order the three axes by their fraction, largest first; the cell's
	// tetrahedron is the path from the base corner along them in that order.
	if frac[a] < frac[b] {
		a, b = b, a
	}
	if frac[b] < frac[c] {
		b, c = c, b
	}
	if frac[a] < frac[b] {
		a, b = b, a
	}
	at := base + idx[dim]*g.stride[dim] + idx[dim+1]*g.stride[dim+1] + idx[dim+2]*g.stride[dim+2]
	v0 := at
	v1 := v0 + g.stride[a]
	v2 := v1 + g.stride[b]
	v3 := v2 + g.stride[c]
	w0, w1, w2, w3 := 1-frac[a], frac[a]-frac[b], frac[b]-frac[c], frac[c]
	for o := range out {
		out[o] += weight * (w0*float64(g.data[v0+o]) + w1*float64(g.data[v1+o]) + w2*float64(g.data[v2+o]) + w3*float64(g.data[v3+o]))
	}
}

func (g *grid) multilinear(dim, base int, idx []int, frac []float64, weight float64, out []float64) {
	n := len(g.dims) - dim
	at := base
	for i := dim; i < len(g.dims); i++ {
		at += idx[i] * g.stride[i]
	}
	for corner := 0; corner < 1<<n; corner++ {
		w, off := weight, at
		for i := 0; i < n; i++ {
			f := frac[dim+i]
			if corner&(1<<i) != 0 {
				w *= f
				off += g.stride[dim+i]
			} else {
				w *= 1 - f
			}
		}
		if w == 0 {
			continue
		}
		for o := range out {
			out[o] += w * float64(g.data[off+o])
		}
	}
}
