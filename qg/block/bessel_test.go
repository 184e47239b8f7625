package block

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

// besselIPowerSeries returns I_n(x) for integer n ≥ 0 from its power series
// (DLMF 10.25.2), I_n(x) = Σ_k (x/2)^(2k+n) / (k! (k+n)!), for moderate x.
func besselIPowerSeries(n int, x float64) float64 {
	term := 1.0
	for k := 1; k <= n; k++ {
		term *= x / 2 / float64(k)
	}
	sum := term
	q := x * x / 4
	for k := 1; k < 500; k++ {
		term *= q / (float64(k) * float64(k+n))
		sum += term
		if term < 1e-18*sum {
			break
		}
	}
	return sum
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// Values of K0 and K1 as tabulated in Abramowitz & Stegun (1964), Table 9.8
// (10 significant figures), recalled from memory.
func TestBesselKTable(t *testing.T) {
	for _, c := range []struct{ x, k0, k1 float64 }{
		{0.5, 0.9244190712, 1.656441120},
		{1, 0.4210244382, 0.6019072302},
		{2, 0.1138938727, 0.1398658818},
		{5, 0.003691098334, 0.004044613445},
	} {
		if e := relErr(besselK(0, c.x), c.k0); e > 2e-9 {
			t.Errorf("K0(%g) = %.12g, A&S table %.10g (rel. error %.2g)", c.x, besselK(0, c.x), c.k0, e)
		}
		if e := relErr(besselK(1, c.x), c.k1); e > 2e-9 {
			t.Errorf("K1(%g) = %.12g, A&S table %.10g (rel. error %.2g)", c.x, besselK(1, c.x), c.k1, e)
		}
	}
}

// The Wronskian I_ν(x) K_{ν+1}(x) + I_{ν+1}(x) K_ν(x) = 1/x (DLMF 10.28.2),
// with I from its power series, for ν = 0 and 1, and the recurrence
// K_2 = K_0 + (2/x) K_1 (DLMF 10.29.1).
func TestBesselKWronskian(t *testing.T) {
	for _, x := range []float64{1e-3, 0.01, 0.1, 0.3, 0.7, 1, 1.5, 2.5, 4, 6, 9, 13, 18} {
		for nu := range 2 {
			w := besselIPowerSeries(nu, x)*besselK(float64(nu+1), x) + besselIPowerSeries(nu+1, x)*besselK(float64(nu), x)
			if e := relErr(w, 1/x); e > 1e-13 {
				t.Errorf("ν = %d, x = %g: I_ν K_ν+1 + I_ν+1 K_ν = %.16g, want 1/x = %.16g (rel. error %.2g)", nu, x, w, 1/x, e)
			}
		}
		k0, k1, k2 := besselKScaled(0, x), besselKScaled(1, x), besselKScaled(2, x)
		if e := relErr(k2, k0+2/x*k1); e > 1e-14 {
			t.Errorf("x = %g: K2 − K0 − 2K1/x: rel. error %.2g", x, e)
		}
	}
}

// Closed forms and a reference library: K_{1/2}(x) = √(π/(2x)) e^{−x} and
// K_{3/2}(x) = √(π/(2x)) e^{−x}(1 + 1/x) (DLMF 10.39.2 and 10.49.12);
// K_{1/3}(ζ) = π √(3/x) Ai(x) and K_{2/3}(ζ) = −π√3 Ai′(x)/x with
// ζ = (2/3) x^{3/2} (DLMF 9.6.1, 9.6.2), Ai from gonum's mathext (AMOS).
func TestBesselKClosedForms(t *testing.T) {
	for _, x := range []float64{1e-4, 0.05, 0.5, 1, 3, 10, 40, 200, 700, 5000} {
		h := math.Sqrt(math.Pi / (2 * x))
		if e := relErr(besselKScaled(0.5, x), h); e > 1e-14 {
			t.Errorf("K_1/2(%g): rel. error %.2g", x, e)
		}
		if e := relErr(besselKScaled(1.5, x), h*(1+1/x)); e > 1e-14 {
			t.Errorf("K_3/2(%g): rel. error %.2g", x, e)
		}
	}
	for _, x := range []float64{0.2, 0.6, 1, 1.7, 2.5, 4} {
		zeta := 2.0 / 3 * math.Pow(x, 1.5)
		ai := real(mathext.AiryAi(complex(x, 0)))
		aid := real(mathext.AiryAiDeriv(complex(x, 0)))
		if e := relErr(besselK(1.0/3, zeta), math.Pi*math.Sqrt(3/x)*ai); e > 1e-12 {
			t.Errorf("K_1/3(%g) against Ai(%g): rel. error %.2g", zeta, x, e)
		}
		if e := relErr(besselK(2.0/3, zeta), -math.Pi*math.Sqrt(3)*aid/x); e > 1e-12 {
			t.Errorf("K_2/3(%g) against Ai′(%g): rel. error %.2g", zeta, x, e)
		}
	}
	if !math.IsNaN(besselK(1, 0)) || !math.IsNaN(besselK(1, -1)) || !math.IsNaN(besselK(1, math.NaN())) {
		t.Error("K1 of a non-positive or NaN argument must be NaN")
	}
}
