package qg

import (
	"math"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Growth rates of the two-layer baroclinic instability.
//
// Sources: Phillips (1954), "Energy transformations and meridional
// circulations associated with simple baroclinic waves in a two-level,
// quasi-geostrophic model", Tellus 6; Vallis (2017), Atmospheric and Oceanic
// Fluid Dynamics, 2nd ed., ch. 9 (the two-layer instability problem).
//
// Method: a single Fourier mode (k, l) in both layers is an exact solution of
// the nonlinear equations (J(ψ_n, q_n) vanishes when ψ_n and q_n share one
// wavevector), so a small seed in the upper layer only evolves as the sum of
// the two normal modes of the linear problem. After the decaying mode has
// fallen by e^(−2σt) ≤ e^(−14) relative to the growing one, the growth rate
// is the least-squares slope of ln|q̂| (norm over both layers) against time.
// No drag, no dissipation.

// chkPhillipsC returns the phase speed c of the growing (Im c ≥ 0) normal
// mode of the Phillips problem for equal layers (δ = 1, F = F1 = F2), with
// Um, Us the mean and half-difference of U1, U2 (Vallis 2017, ch. 9; Phillips
// 1954):
//
//	c = Um − β(K² + F)/(K²(K² + 2F)) ± √(β²F²/(K⁴(K² + 2F)²) − Us²(2F − K²)/(K² + 2F)).
func chkPhillipsC(beta, f, k2, um, us float64) complex128 {
	a := um - beta*(k2+f)/(k2*(k2+2*f))
	disc := beta*beta*f*f/(k2*k2*(k2+2*f)*(k2+2*f)) - us*us*(2*f-k2)/(k2+2*f)
	return complex(a, 0) + cmplx.Sqrt(complex(disc, 0))
}

// chkEigenC returns the phase speeds c of the two normal modes
// ψ_n ∝ exp(ik(x − ct) + ily) of the linearised two-layer equations for any
// layer depth ratio, computed with gonum's general eigensolver. Derivation
// (done here, independently of the solver's code): with q̂ = P ψ̂,
//
//	P = [[−K² − F1, F1], [F2, −K² − F2]],
//
// the linear equations ∂t q_n + U_n ∂x q_n + Q_ny ∂x ψ_n = 0 with
// Q1y = β + F1(U1 − U2), Q2y = β − F2(U1 − U2) give
// c P ψ̂ = (diag(U) P + diag(Qy)) ψ̂, that is c are the eigenvalues of
// A = P⁻¹(diag(U) P + diag(Qy)).
func chkEigenC(t testing.TB, beta, ld, delta, u1, u2, k2 float64) [2]complex128 {
	t.Helper()
	f1 := 1 / (ld * ld * (1 + delta)) // package qg: F1 = 1/(Ld²(1+δ)), F2 = δF1
	f2 := delta * f1
	q1y, q2y := beta+f1*(u1-u2), beta-f2*(u1-u2)
	p := mat.NewDense(2, 2, []float64{-k2 - f1, f1, f2, -k2 - f2})
	rhs := mat.NewDense(2, 2, []float64{
		u1*(-k2-f1) + q1y, u1 * f1,
		u2 * f2, u2*(-k2-f2) + q2y,
	})
	var a mat.Dense
	if err := a.Solve(p, rhs); err != nil {
		t.Fatalf("solving P A = diag(U) P + diag(Qy): %v", err)
	}
	var eig mat.Eigen
	if !eig.Factorize(&a, mat.EigenNone) {
		t.Fatal("gonum Eigen failed to factorise the 2×2 problem")
	}
	v := eig.Values(nil)
	return [2]complex128{v[0], v[1]}
}

// chkMaxImag returns the larger imaginary part of two phase speeds.
func chkMaxImag(c [2]complex128) float64 { return math.Max(imag(c[0]), imag(c[1])) }

// chkMeasureGrowth seeds the mode (i, j) in the upper layer of a model built
// from cfg and returns the measured exponential growth rate of its spectral
// amplitude and its angular frequency (from the phase of the upper-layer
// coefficient, ∝ exp(−iωt)), both fitted over σ_ref·t ∈ [7, 12].
func chkMeasureGrowth(t *testing.T, cfg Config, i, j int, sigmaRef float64) (sigma, omega float64) {
	t.Helper()
	m := chkModel(t, cfg)
	g := m.Grid()
	k, l := chkWavenumber(g, i, j)
	amp := 1e-6 / math.Hypot(k, l) // velocity 1e-6 m/s: far from any nonlinearity
	psi := [2][]float64{chkCosine(g, i, j, amp, 0.3), make([]float64, g.Nx*g.Ny)}
	if err := m.SetStreamfunction(psi); err != nil {
		t.Fatal(err)
	}
	p := chkIndex(g, i, j)
	t0, t1 := 7/sigmaRef, 12/sigmaRef
	var ts, ls, ph []float64
	for m.Time() < t1 {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if m.Time() >= t0 {
			q := m.SpectralPV()
			n2 := real(q[0][p])*real(q[0][p]) + imag(q[0][p])*imag(q[0][p]) +
				real(q[1][p])*real(q[1][p]) + imag(q[1][p])*imag(q[1][p])
			ts = append(ts, m.Time())
			ls = append(ls, 0.5*math.Log(n2))
			a := cmplx.Phase(q[0][p])
			if n := len(ph); n > 0 { // unwrap
				a -= 2 * math.Pi * math.Round((a-ph[n-1])/(2*math.Pi))
			}
			ph = append(ph, a)
		}
	}
	sigma, _ = chkFit(ts, ls)
	omega, _ = chkFit(ts, ph)
	return sigma, -omega
}

// TestPhillipsGrowthRateEqualLayers checks the growth rate of the fastest
// growing mode on the grid and of two other unstable modes against the
// closed-form Phillips growth rate, for δ = 1 with β and a Doppler shift.
func TestPhillipsGrowthRateEqualLayers(t *testing.T) {
	cfg := chkConfig(32, 16, 4e7, 1e7)
	cfg.Beta, cfg.Ld, cfg.Delta = 1.6e-11, 7e5, 1
	cfg.U1, cfg.U2 = 25, -5 // Um = 10, Us = 15 m/s; critical Us = β/(2F) = βLd² = 7.84 m/s
	cfg.Dt = 3600
	m := chkModel(t, cfg)
	g := m.Grid()
	f := 1 / (2 * cfg.Ld * cfg.Ld) // F = F1 = F2 = 1/(2Ld²) for δ = 1 (package qg)
	um, us := (cfg.U1+cfg.U2)/2, (cfg.U1-cfg.U2)/2

	sigma := func(i, j int) float64 {
		k, l := chkWavenumber(g, i, j)
		return k * imag(chkPhillipsC(cfg.Beta, f, k*k+l*l, um, us))
	}
	// Fastest-growing retained mode of the grid.
	bi, bj, smax := fastestMode(sigma)
	if smax <= 0 {
		t.Fatal("setup: no unstable mode")
	}
	modes := [][2]int{{bi, bj}, {5, 0}, {4, -1}}
	for _, md := range modes {
		i, j := md[0], md[1]
		want := sigma(i, j)
		if want < 0.25*smax {
			t.Fatalf("setup: mode (%d,%d) grows at %.3g s⁻¹, too slowly to test (max %.3g)", i, j, want, smax)
		}
		// Cross-check of the closed form against the independent 2×2
		// eigenproblem (both derived from the same linear equations).
		k, l := chkWavenumber(g, i, j)
		if e := k * chkMaxImag(chkEigenC(t, cfg.Beta, cfg.Ld, 1, cfg.U1, cfg.U2, k*k+l*l)); chkRelErr(e, want) > 1e-9 {
			t.Errorf("mode (%d,%d): Phillips closed form σ = %.6g, gonum eigenvalues give %.6g", i, j, want, e)
		}
		got, omega := chkMeasureGrowth(t, cfg, i, j, want)
		// Phillips (1954), Vallis (2017) ch. 9: frequency k Re c of the
		// growing mode, within 1 %.
		if wr := k * real(chkPhillipsC(cfg.Beta, f, k*k+l*l, um, us)); chkRelErr(omega, wr) > 0.01 {
			t.Errorf("mode (%d,%d): frequency %.6g s⁻¹, Phillips k·Re c = %.6g", i, j, omega, wr)
		}
		// Phillips (1954), Vallis (2017) ch. 9: σ = k Im c, within 1 %.
		if re := chkRelErr(got, want); re > 0.01 {
			t.Errorf("mode (%d,%d): growth rate %.6g s⁻¹, Phillips gives %.6g (error %.2g)", i, j, got, want, re)
		} else {
			t.Logf("mode (%d,%d): growth rate %.6g s⁻¹ (e-folding %.3f days), Phillips %.6g, relative error %.2g; frequency error %.2g", i, j, got, 1/got/86400, want, re, chkRelErr(omega, k*real(chkPhillipsC(cfg.Beta, f, k*k+l*l, um, us))))
		}
	}
}

// TestPhillipsNeutralModes checks two modes the Phillips problem predicts to
// be neutral for δ = 1: a long wave stabilised by β (discriminant > 0 for
// K⁴(4F² − K⁴) < β²F²/Us²) and a short wave beyond the cutoff K² > 2F,
// stable whatever β and the shear (Phillips 1954; Vallis 2017, ch. 9). The
// seed is a sum of two neutral normal modes, so its amplitude beats but
// does not grow: the growth rate fitted over 17.5 to 30 e-folding times of the
// fastest mode (many beat periods) must be under 1 % of the fastest growth
// rate on the grid. (Beyond ~35 e-foldings the rounding noise of the initial
// transform, amplified in the unstable modes, would become finite.)
func TestPhillipsNeutralModes(t *testing.T) {
	cfg := chkConfig(32, 16, 4e7, 1e7)
	cfg.Beta, cfg.Ld, cfg.Delta = 1.6e-11, 7e5, 1
	cfg.U1, cfg.U2 = 25, -5
	cfg.Dt = 3600
	g := chkModel(t, cfg).Grid()
	f := 1 / (2 * cfg.Ld * cfg.Ld)
	um, us := (cfg.U1+cfg.U2)/2, (cfg.U1-cfg.U2)/2
	smax := 0.0
	for i := 1; i <= 10; i++ {
		k, _ := chkWavenumber(g, i, 0)
		smax = math.Max(smax, k*imag(chkPhillipsC(cfg.Beta, f, k*k, um, us)))
	}
	for _, i := range []int{2, 10} {
		k, _ := chkWavenumber(g, i, 0)
		if c := chkPhillipsC(cfg.Beta, f, k*k, um, us); imag(c) != 0 {
			t.Fatalf("setup: mode (%d,0) is not neutral (c = %v)", i, c)
		}
		if i == 10 && k*k <= 2*f {
			t.Fatalf("setup: mode (10,0) is not beyond the short-wave cutoff")
		}
		got, _ := chkMeasureGrowth(t, cfg, i, 0, smax*12/30)
		t.Logf("neutral mode (%d,0): fitted growth rate %.3g s⁻¹ (%.2g of the fastest, %.3g s⁻¹)", i, got, got/smax, smax)
		if math.Abs(got) > 0.01*smax {
			t.Errorf("mode (%d,0): growth rate %.3g s⁻¹, Phillips predicts a neutral mode (fastest growth %.3g)", i, got, smax)
		}
	}
}

// TestPhillipsGrowthRateUnequalLayers checks growth rates for δ = H1/H2 ≠ 1
// against the eigenvalues of the 2×2 linear problem (gonum mat.Eigen).
func TestPhillipsGrowthRateUnequalLayers(t *testing.T) {
	for _, tc := range []struct {
		delta, u1, u2 float64
		others        [][2]int // modes tested besides the fastest-growing one
	}{
		{0.5, 25, -5, [][2]int{{6, 0}, {5, -1}}},
		{0.25, 40, -15, [][2]int{{5, 0}, {4, 1}}}, // needs ΔU > βLd²(1+δ)/δ = 39 m/s for Q2y < 0
	} {
		cfg := chkConfig(32, 16, 4e7, 1e7)
		cfg.Beta, cfg.Ld, cfg.Delta = 1.6e-11, 7e5, tc.delta
		cfg.U1, cfg.U2 = tc.u1, tc.u2
		cfg.Dt = 3600
		m := chkModel(t, cfg)
		g := m.Grid()
		sigma := func(i, j int) float64 {
			k, l := chkWavenumber(g, i, j)
			return k * chkMaxImag(chkEigenC(t, cfg.Beta, cfg.Ld, tc.delta, cfg.U1, cfg.U2, k*k+l*l))
		}
		bi, bj, smax := fastestMode(sigma)
		if smax <= 0 {
			t.Fatalf("δ = %g: setup: no unstable mode", tc.delta)
		}
		for _, md := range append([][2]int{{bi, bj}}, tc.others...) {
			i, j := md[0], md[1]
			want := sigma(i, j)
			if want < 0.25*smax {
				t.Fatalf("δ = %g: setup: mode (%d,%d) grows at %.3g s⁻¹, too slowly to test (max %.3g)", tc.delta, i, j, want, smax)
			}
			got, omega := chkMeasureGrowth(t, cfg, i, j, want)
			k, l := chkWavenumber(g, i, j)
			c := chkEigenC(t, cfg.Beta, cfg.Ld, tc.delta, cfg.U1, cfg.U2, k*k+l*l)
			wr := k * real(c[0])
			if imag(c[1]) > imag(c[0]) {
				wr = k * real(c[1])
			}
			// Frequency k·Re c of the growing eigenvalue, within 1 %.
			if chkRelErr(omega, wr) > 0.01 {
				t.Errorf("δ = %g, mode (%d,%d): frequency %.6g s⁻¹, eigenproblem k·Re c = %.6g", tc.delta, i, j, omega, wr)
			}
			// Eigenvalues of the 2×2 linear problem (Vallis 2017, ch. 9;
			// computed with gonum mat.Eigen), within 1 %.
			if re := chkRelErr(got, want); re > 0.01 {
				t.Errorf("δ = %g, mode (%d,%d): growth rate %.6g s⁻¹, eigenproblem gives %.6g (error %.2g)", tc.delta, i, j, got, want, re)
			} else {
				t.Logf("δ = %g, mode (%d,%d): growth rate %.6g s⁻¹, eigenproblem %.6g, relative error %.2g; frequency error %.2g", tc.delta, i, j, got, want, re, chkRelErr(omega, wr))
			}
		}
	}
}

// fastestMode returns the mode (i, j), 1 ≤ i ≤ 10, |j| ≤ 5, of largest
// growth rate sigma(i, j) > 0, and that rate (0 if no mode grows).
func fastestMode(sigma func(i, j int) float64) (bi, bj int, smax float64) {
	for i := 1; i <= 10; i++ {
		for j := -5; j <= 5; j++ {
			if s := sigma(i, j); s > smax {
				bi, bj, smax = i, j, s
			}
		}
	}
	return bi, bj, smax
}
