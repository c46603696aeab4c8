package series

import "math"

// PoissonInterval returns the exact (central) confidence interval at
// level for the mean of a Poisson count k (Garwood 1936, Biometrika
// 28:437–442): lower = χ²(α/2; 2k)/2, upper = χ²(1−α/2; 2k+2)/2 with
// α = 1 − level, and lower = 0 when k = 0. Half a χ² quantile with 2a
// degrees of freedom is the quantile of a Gamma(a, 1), which is how it is
// computed, so fractional (weighted) counts get the continuous
// generalisation.
func PoissonInterval(k, level float64) (lower, upper float64) {
	alpha := 1 - level
	if k > 0 {
		lower = gammaQuantile(k, alpha/2)
	}
	upper = gammaQuantile(k+1, 1-alpha/2)
	return lower, upper
}

// gammaQuantile returns x with P(a, x) = p, P the regularized lower
// incomplete gamma function: Newton's method on P from the
// Wilson–Hilferty approximation (Johnson, Kotz & Balakrishnan,
// Continuous Univariate Distributions vol. 1, 2nd ed., §18.8), kept
// inside a bracket that bisection shrinks whenever a step would leave it.
func gammaQuantile(a, p float64) float64 {
	if p <= 0 {
		return 0
	}
	if p >= 1 {
		return math.Inf(1)
	}
	z := math.Sqrt2 * math.Erfinv(2*p-1)
	c := 1 - 1/(9*a) + z/(3*math.Sqrt(a))
	x := a * c * c * c
	if !(x > 0) {
		x = math.Min(a, 1) * 0.5
	}
	lo, hi := 0.0, math.Inf(1)
	lg, _ := math.Lgamma(a)
	for range 400 {
		f := gammaP(a, x) - p
		if f < 0 {
			lo = x
		} else {
			hi = x
		}
		// P'(a, x) = x^(a−1) e^(−x) / Γ(a)
		d := math.Exp((a-1)*math.Log(x) - x - lg)
		step := f / d
		if math.Abs(step) <= 1e-13*math.Max(1e-3, x) || f == 0 {
			return x - step
		}
		next := x - step
		if !(next > lo && next < hi) || d == 0 || math.IsNaN(next) {
			if math.IsInf(hi, 1) {
				next = 2 * x
			} else {
				next = (lo + hi) / 2
			}
		}
		x = next
	}
	return x
}

// gammaP is the regularized lower incomplete gamma function P(a, x):
// its power series below a+1 and the continued fraction of Q = 1 − P
// (modified Lentz) above, the usual split where each converges fast
// (Press et al., Numerical Recipes, 3rd ed., §6.2).
func gammaP(a, x float64) float64 {
	if x <= 0 {
		return 0
	}
	lg, _ := math.Lgamma(a)
	front := math.Exp(a*math.Log(x) - x - lg)
	if x < a+1 {
		sum, term := 1/a, 1/a
		for n := 1; n < 10000; n++ {
			term *= x / (a + float64(n))
			sum += term
			if math.Abs(term) < math.Abs(sum)*1e-17 {
				break
			}
		}
		return sum * front
	}
	const tiny = 1e-300
	b := x + 1 - a
	c := 1 / tiny
	d := 1 / b
	h := d
	for i := 1; i < 10000; i++ {
		an := -float64(i) * (float64(i) - a)
		b += 2
		d = an*d + b
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = b + an/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) < 1e-15 {
			break
		}
	}
	return 1 - front*h
}
