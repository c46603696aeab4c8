package icc

import "fmt"

// matrixShaper is the matrix/TRC model of RGB and gray profiles
// (ICC.1:2010 §F.2, §F.3): a tone curve per channel, then for RGB the
// colorant matrix to PCS XYZ.
type matrixShaper struct {
	gray bool
	trc  [3]curve
	m    [3][3]float64 // columns are rXYZ, gXYZ, bXYZ
	inv  [3][3]float64
}

type invertible interface {
	curve
	inverse(y float64) float64
}

func (identityCurve) inverse(y float64) float64 { return y }

func readShaper(r *tagReader, space Signature) (*matrixShaper, error) {
	trc := func(name string) (curve, bool, error) {
		d, _, off, ok := r.get(name)
		if !ok {
			return nil, false, nil
		}
		c, _, err := readCurve(d, name, off)
		if err != nil {
			return nil, false, err
		}
		if _, ok := c.(invertible); !ok {
			return nil, false, &FormatError{Tag: name, Offset: off, Reason: "tone curve cannot be inverted"}
		}
		return c, true, nil
	}
	switch space {
	case SpaceGray:
		c, ok, err := trc("kTRC")
		if err != nil || !ok {
			return nil, err
		}
		return &matrixShaper{gray: true, trc: [3]curve{c, c, c}}, nil
	case SpaceRGB:
		s := &matrixShaper{}
		for i, n := range []string{"r", "g", "b"} {
			c, ok, err := trc(n + "TRC")
			if err != nil || !ok {
				return nil, err
			}
			s.trc[i] = c
			d, typ, off, ok := r.get(n + "XYZ")
			if !ok {
				return nil, nil
			}
			xyz, err := readXYZ(d, typ, n+"XYZ", off)
			if err != nil {
				return nil, err
			}
			s.m[0][i], s.m[1][i], s.m[2][i] = xyz.X, xyz.Y, xyz.Z
		}
		inv, ok := invert3(s.m)
		if !ok {
			return nil, &FormatError{Tag: "rXYZ", Reason: fmt.Sprintf("colorant matrix %v is singular", s.m)}
		}
		s.inv = inv
		return s, nil
	}
	return nil, nil
}

func invert3(a [3][3]float64) ([3][3]float64, bool) {
	det := a[0][0]*(a[1][1]*a[2][2]-a[1][2]*a[2][1]) -
		a[0][1]*(a[1][0]*a[2][2]-a[1][2]*a[2][0]) +
		a[0][2]*(a[1][0]*a[2][1]-a[1][1]*a[2][0])
	if det == 0 || det != det {
		return [3][3]float64{}, false
	}
	var r [3][3]float64
	r[0][0] = (a[1][1]*a[2][2] - a[1][2]*a[2][1]) / det
	r[0][1] = (a[0][2]*a[2][1] - a[0][1]*a[2][2]) / det
	r[0][2] = (a[0][1]*a[1][2] - a[0][2]*a[1][1]) / det
	r[1][0] = (a[1][2]*a[2][0] - a[1][0]*a[2][2]) / det
	r[1][1] = (a[0][0]*a[2][2] - a[0][2]*a[2][0]) / det
	r[1][2] = (a[0][2]*a[1][0] - a[0][0]*a[1][2]) / det
	r[2][0] = (a[1][0]*a[2][1] - a[1][1]*a[2][0]) / det
	r[2][1] = (a[0][1]*a[2][0] - a[0][0]*a[2][1]) / det
	r[2][2] = (a[0][0]*a[1][1] - a[0][1]*a[1][0]) / det
	return r, true
}
