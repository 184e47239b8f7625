package block

import (
	"math"
	"testing"
)

// The first zeros of J1 and J2: j1,1 = 3.8317059702, j2,1 = 5.1356223018
// (Abramowitz & Stegun 1964, Table 9.5; recalled from memory).
func TestBesselJZeros(t *testing.T) {
	if e := math.Abs(besselJZero(1) - 3.8317059702); e > 1e-9 {
		t.Errorf("j1,1 = %.12g", besselJZero(1))
	}
	if e := math.Abs(besselJZero(2) - 5.1356223018); e > 1e-9 {
		t.Errorf("j2,1 = %.12g", besselJZero(2))
	}
}

// As pa → 0 the modon tends to the Lamb–Chaplygin dipole, κa → j1,1
// (Lamb 1932, §165a; Larichev & Reznik 1976); as pa grows κa rises towards
// j2,1, and the root satisfies the matching condition
// K2(P)/(P K1(P)) = −J2(k)/(k J1(k)) (Larichev & Reznik 1976; Flierl,
// Larichev, McWilliams & Reznik 1980, Dyn. Atmos. Oceans 5, eq. for the
// barotropic modon, from memory).
func TestModonWavenumber(t *testing.T) {
	prev := besselJZero(1)
	for _, P := range []float64{1e-3, 0.1, 0.5, 1, 2, 4, 8, 20} {
		k, err := modonWavenumber(P)
		if err != nil {
			t.Fatal(err)
		}
		if !(k > prev && k < besselJZero(2)) {
			t.Errorf("pa = %g: κa = %.10g not increasing within (j1,1, j2,1)", P, k)
		}
		prev = k
		lhs := besselK(2, P) / (P * besselK(1, P))
		rhs := -math.Jn(2, k) / (k * math.J1(k))
		if e := math.Abs(lhs-rhs) / lhs; e > 1e-8 {
			t.Errorf("pa = %g: matching condition off by %.2g relative", P, e)
		}
	}
	k, _ := modonWavenumber(1e-3)
	if math.Abs(k-3.8317059702) > 1e-5 {
		t.Errorf("pa = 1e-3: κa = %.8g, want the Lamb limit 3.83171", k)
	}
}

// The steady-translation condition of the modon (Larichev & Reznik 1976):
// the potential vorticity ζ + βy is a function of the moving-frame
// streamfunction ψ + cy, −κ²(ψ + cy) inside r < a and p²(ψ + cy) outside,
// with ψ, its gradient and ζ continuous across r = a. Checked with
// fourth-order finite differences of the profile, an independent
// computation of the Laplacian.
func TestModonSolvesTranslationEquation(t *testing.T) {
	for _, beta := range []float64{1.6e-11, 0} {
		m, err := SolveModon(1e6, 4, beta)
		if err != nil {
			t.Fatal(err)
		}
		h := 2e3
		lap := func(x, y float64) float64 {
			f := m.Psi
			d2 := func(fm2, fm1, f0, fp1, fp2 float64) float64 {
				return (-fm2 + 16*fm1 - 30*f0 + 16*fp1 - fp2) / (12 * h * h)
			}
			return d2(f(x-2*h, y), f(x-h, y), f(x, y), f(x+h, y), f(x+2*h, y)) +
				d2(f(x, y-2*h), f(x, y-h), f(x, y), f(x, y+h), f(x, y+2*h))
		}
		c, p2, k2 := m.Speed, m.P*m.P, m.Kappa*m.Kappa
		scaleZ := c / m.Radius // vorticity scale
		for _, pt := range [][2]float64{{0.3e6, 0.2e6}, {-0.5e6, 0.6e6}, {0.1e6, -0.85e6}, {0, 0.5e6}, {1.4e6, 0.3e6}, {-0.9e6, -1.6e6}, {2e6, 1e6}} {
			x, y := pt[0], pt[1]
			r := math.Hypot(x, y)
			if math.Abs(r-m.Radius) < 5*h {
				continue
			}
			want := p2*(m.Psi(x, y)+c*y) - beta*y
			if r < m.Radius {
				want = -k2*(m.Psi(x, y)+c*y) - beta*y
			}
			if e := math.Abs(lap(x, y)-want) / scaleZ; e > 1e-6 {
				t.Errorf("β = %g at (%g, %g): ζ = %.6g, F(ψ + cy) − βy = %.6g (error %.2g of c/a)", beta, x, y, lap(x, y), want, e)
			}
		}
		// Continuity across r = a along several directions: ψ, ∂ψ/∂r and ζ
		// one-sided just inside and just outside.
		for _, th := range []float64{0.3, 1.2, math.Pi / 2, 2.5, -1} {
			at := func(r float64) float64 { return m.Psi(r*math.Cos(th), r*math.Sin(th)) }
			a, e := m.Radius, 1.0
			if d := math.Abs(at(a-e) - at(a+e)); d > 1e-5*c*a {
				t.Errorf("β = %g, θ = %g: ψ jumps by %.3g across r = a", beta, th, d)
			}
			din := (at(a-e) - at(a-3*e)) / (2 * e)
			dout := (at(a+3*e) - at(a+e)) / (2 * e)
			if d := math.Abs(din - dout); d > 1e-4*c {
				t.Errorf("β = %g, θ = %g: ∂ψ/∂r jumps by %.3g m/s across r = a", beta, th, d)
			}
			// Vorticity from the two PV relations at r = a: both give −βy
			// when ψ + cy = 0 on the circle.
			y := a * math.Sin(th)
			if d := math.Abs(at(a) + c*y); d > 1e-9*c*a {
				t.Errorf("β = %g, θ = %g: ψ + cy = %.3g on r = a, want 0 (the separatrix)", beta, th, d)
			}
		}
	}
}

// A modon's sign conventions: the exact solution (low_poleward) has ψ < 0
// north of the centre, westerlies between the lobes (u = −∂ψ/∂y > 0 at the
// centre) and so travels east (Larichev & Reznik 1976); the block polarity
// is its mirror image.
func TestModonPolarity(t *testing.T) {
	m, err := SolveModon(1e6, 4, 1.6e-11)
	if err != nil {
		t.Fatal(err)
	}
	if m.Psi(0, 0.5e6) >= 0 || m.Psi(0, -0.5e6) <= 0 {
		t.Errorf("exact modon: ψ north %.3g, south %.3g; want low north, high south", m.Psi(0, 0.5e6), m.Psi(0, -0.5e6))
	}
	if u := -(m.Psi(0, 1e3) - m.Psi(0, -1e3)) / 2e3; u <= 0 {
		t.Errorf("exact modon: u at the centre %.3g, want westerly", u)
	}
	peak := m.Peak()
	// Over a fine polar grid |ψ| never exceeds Peak.
	var mx float64
	for i := range 400 {
		for j := range 100 {
			r := 3e6 * float64(i) / 400
			th := 2 * math.Pi * float64(j) / 100
			mx = math.Max(mx, math.Abs(m.Psi(r*math.Cos(th), r*math.Sin(th))))
		}
	}
	if mx > peak*(1+1e-12) || mx < peak*(1-1e-3) {
		t.Errorf("Peak %.6g, max over a polar grid %.6g", peak, mx)
	}
}
