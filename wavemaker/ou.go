package wavemaker

import "math"

// ouStep holds the coefficients of the exact update over a step dt of an
// Ornstein–Uhlenbeck process F of unit stationary variance and correlation
// time τ, together with its integral I = ∫ F dt over the step. Given F at
// the start, (F', I) is Gaussian with (Gillespie 1996, Phys. Rev. E 54,
// 2084, with h = dt/τ and a = e^{−h})
//
//	E[F'] = a F,            Var F' = 1 − a²,
//	E[I]  = τ(1 − a) F,     Var I  = τ²(2h − 3 + 4a − a²),
//	Cov(F', I) = τ(1 − a)²,
//
// so with two independent unit normals ξ1, ξ2
//
//	I  = cI F + sI ξ1,
//	F' = a F + g1 ξ1 + g2 ξ2,  g1 = Cov/sI,  g2 = √(Var F' − g1²).
type ouStep struct {
	dt             float64
	a, cI, sI      float64
	g1, g2         float64
	varI, varFnext float64
}

func newOUStep(dt, tau float64) ouStep {
	h := dt / tau
	a := math.Exp(-h)
	oneMinusA := -math.Expm1(-h)
	varF := -math.Expm1(-2 * h)
	varI := tau * tau * ouIntegralVar(h)
	cov := tau * oneMinusA * oneMinusA
	s := ouStep{dt: dt, a: a, cI: tau * oneMinusA, varI: varI, varFnext: varF}
	s.sI = math.Sqrt(varI)
	if s.sI > 0 {
		s.g1 = cov / s.sI
	}
	s.g2 = math.Sqrt(math.Max(0, varF-s.g1*s.g1))
	return s
}

// ouIntegralVar returns f(h) = 2h − 3 + 4e^{−h} − e^{−2h}, the conditional
// variance of the integral over a step in units of τ², without the
// cancellation of the closed form at small h: there it sums the series
// Σ_{n≥3} (−1)^n (4 − 2^n) hⁿ/n! (which starts 2h³/3 − h⁴/2 + 7h⁵/30).
func ouIntegralVar(h float64) float64 {
	if h >= 0.5 {
		return 2*h - 3 + 4*math.Exp(-h) - math.Exp(-2*h)
	}
	var s float64
	term := h * h / 2 // hⁿ/n! at n = 2
	for n := 3; n <= 30; n++ {
		term *= h / float64(n)
		c := (4 - math.Ldexp(1, n)) * term
		if n%2 == 1 {
			c = -c
		}
		s += c
	}
	return s
}
