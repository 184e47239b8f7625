package block

import "math"

// besselKScaled returns e^x·K_ν(x), the exponentially scaled modified
// Bessel function of the second kind, for real order ν and x > 0, from the
// integral representation (DLMF 10.32.9)
//
//	e^x·K_ν(x) = ∫₀^∞ exp(−x(cosh t − 1)) cosh(νt) dt,
//
// evaluated with the trapezoidal rule. The integrand is even, entire in t and
// decays doubly exponentially, so the trapezoidal rule converges
// geometrically in 1/h (error of order exp(−π²/h) from the width π/2 of the
// strip in which Re cosh t > 0); the step is also kept below a fraction of the
// integrand's width 1/√x at large x. With h ≤ 0.1 the result is accurate to a
// few units of rounding. It returns NaN for x ≤ 0 or NaN.
func besselKScaled(nu, x float64) float64 {
	if !(x > 0) {
		return math.NaN()
	}
	if math.IsInf(x, 1) {
		return 0
	}
	h := 0.1
	if w := 0.5 / math.Sqrt(x); w < h {
		h = w
	}
	// Stop where the integrand is below 1e-18 of its value at t = 0:
	// x(cosh t − 1) − |ν|t > 41.5.
	sum := 0.5
	for i := 1; ; i++ {
		t := float64(i) * h
		sh := math.Sinh(t / 2)
		c := 2 * x * sh * sh // x(cosh t − 1) without cancellation
		if c-math.Abs(nu)*t > 41.5 && t > 1 {
			break
		}
		sum += math.Exp(-c) * math.Cosh(nu*t)
	}
	return h * sum
}

// besselK returns K_ν(x) for real order ν and x > 0.
func besselK(nu, x float64) float64 {
	return math.Exp(-x) * besselKScaled(nu, x)
}
