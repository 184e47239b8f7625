package block

import (
	"fmt"
	"math"
)

// ModonProfile is the barotropic modon of Larichev & Reznik (1976) on the
// β-plane, solved for a radius and a speed: the streamfunction of the
// solution that travels east at Speed relative to a fluid at rest, with its
// low poleward of the centre and its high equatorward (for f0 > 0, β > 0),
// multiplied by Scale (Scale = 1 is the exact solution; −1 the same shape
// with the high poleward, the orientation of a block). See the package
// documentation for the formulas.
type ModonProfile struct {
	Radius float64 // a, m
	Speed  float64 // c, m s⁻¹, relative to the fluid
	Beta   float64 // β, m⁻¹ s⁻¹
	P      float64 // outer decay rate p = √(β/c), m⁻¹ (0 in the Lamb–Chaplygin limit β = 0)
	Kappa  float64 // inner wavenumber κ, m⁻¹
	Scale  float64 // factor applied to the exact solution

	b  float64 // coefficient of J1(κr) inside
	cl float64 // coefficient of r inside: −c(1 + p²/κ²)
	k1 float64 // e^{pa}·K1(pa)
}

// SolveModon solves the modon's matching condition for radius a > 0, speed
// c > 0 and β ≥ 0 and returns the exact solution (Scale = 1). With β = 0 it
// returns the Lamb–Chaplygin dipole (κa = j1,1, the first zero of J1, and a
// potential-flow exterior −c a² sin θ / r).
func SolveModon(radius, speed, beta float64) (ModonProfile, error) {
	switch {
	case !(radius > 0) || math.IsInf(radius, 0):
		return ModonProfile{}, fmt.Errorf("block: modon radius %g m must be a finite number greater than zero", radius)
	case !(speed > 0) || math.IsInf(speed, 0):
		return ModonProfile{}, fmt.Errorf("block: modon speed %g m/s must be a finite number greater than zero (eastward relative to the fluid)", speed)
	case !(beta >= 0) || math.IsInf(beta, 0):
		return ModonProfile{}, fmt.Errorf("block: β = %g must be a finite number, zero or greater", beta)
	}
	m := ModonProfile{Radius: radius, Speed: speed, Beta: beta, Scale: 1}
	a, c := radius, speed
	if beta == 0 {
		j11 := besselJZero(1)
		m.Kappa = j11 / a
		// ψ_r continuous at r = a: B κ J1′(j11) − c = c, J1′(j11) = J0(j11).
		m.b = 2 * c / (m.Kappa * math.J0(j11))
		m.cl = -c
		return m, nil
	}
	m.P = math.Sqrt(beta / c)
	P := m.P * a
	k, err := modonWavenumber(P)
	if err != nil {
		return ModonProfile{}, err
	}
	m.Kappa = k / a
	// ψ + cy = 0 on r = a from inside: B J1(κa) = c a p²/κ².
	m.b = c * a * (P * P / (k * k)) / math.J1(k)
	m.cl = -c * (1 + P*P/(k*k))
	m.k1 = besselKScaled(1, P)
	return m, nil
}

// modonWavenumber returns k = κa in (j1,1, j2,1) that solves the matching
// condition K2(P)/(P K1(P)) = −J2(k)/(k J1(k)) for P = pa > 0, by bisection
// on g(k) = K2(P)·k·J1(k) + P·K1(P)·J2(k), which is continuous on the
// bracket, positive at j1,1 (where J1 = 0 and J2 > 0) and negative at j2,1
// (where J2 = 0 and J1 < 0).
func modonWavenumber(P float64) (float64, error) {
	k1, k2 := besselKScaled(1, P), besselKScaled(2, P) // common factor e^{−P} dropped
	g := func(k float64) float64 { return k2*k*math.J1(k) + P*k1*math.Jn(2, k) }
	lo, hi := besselJZero(1), besselJZero(2)
	glo, ghi := g(lo), g(hi)
	if !(glo > 0 && ghi < 0) {
		return 0, fmt.Errorf("block: modon matching condition not bracketed for pa = %g (g = %g, %g)", P, glo, ghi)
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		if mid <= lo || mid >= hi {
			break
		}
		if g(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi), nil
}

// besselJZero returns the first positive zero of J_n for n = 1 or 2, by
// bisection on brackets that hold exactly one zero (j1,1 ≈ 3.8317,
// j2,1 ≈ 5.1356).
func besselJZero(n int) float64 {
	lo, hi := 3.5, 4.2
	if n == 2 {
		lo, hi = 4.9, 5.4
	}
	flo := math.Jn(n, lo)
	for range 200 {
		mid := 0.5 * (lo + hi)
		if mid <= lo || mid >= hi {
			break
		}
		if f := math.Jn(n, mid); (f > 0) == (flo > 0) {
			lo, flo = mid, f
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi)
}

// Psi returns the modon's streamfunction (m² s⁻¹) at displacement (dx, dy)
// (m) from its centre, times Scale.
func (m ModonProfile) Psi(dx, dy float64) float64 {
	return m.Scale * m.exact(dx, dy)
}

// exact is the unscaled solution.
func (m ModonProfile) exact(dx, dy float64) float64 {
	r := math.Hypot(dx, dy)
	a, c := m.Radius, m.Speed
	if r >= a {
		// ψ = −c a K1(pr)/K1(pa) sin θ, sin θ = dy/r.
		if m.P == 0 {
			return -c * a * a * dy / (r * r)
		}
		ratio := math.Exp(-m.P*(r-a)) * besselKScaled(1, m.P*r) / m.k1
		return -c * a * ratio * dy / r
	}
	// ψ = (B J1(κr) − c(1 + p²/κ²) r) sin θ; J1(κr)/r → κ/2 at r = 0.
	j := m.Kappa / 2
	if kr := m.Kappa * r; kr > 1e-8 {
		j = math.J1(kr) / r
	}
	return (m.b*j + m.cl) * dy
}

// Peak returns the largest |ψ| of the exact solution (Scale = 1), reached on
// the axis through the centre along y, inside the modon.
func (m ModonProfile) Peak() float64 {
	f := func(r float64) float64 { return math.Abs(m.exact(0, r)) }
	const n = 400
	best, rb := 0.0, 0.0
	for i := 1; i <= n; i++ {
		r := 2 * m.Radius * float64(i) / n
		if v := f(r); v > best {
			best, rb = v, r
		}
	}
	// Golden-section refinement around the best sample.
	lo, hi := math.Max(rb-2*m.Radius/n, 0), rb+2*m.Radius/n
	const gr = 0.6180339887498949
	x1, x2 := hi-gr*(hi-lo), lo+gr*(hi-lo)
	f1, f2 := f(x1), f(x2)
	for range 80 {
		if f1 > f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - gr*(hi-lo)
			f1 = f(x1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + gr*(hi-lo)
			f2 = f(x2)
		}
	}
	return math.Max(best, math.Max(f1, f2))
}
