package qg

import (
	"math"
	"math/cmplx"
	"testing"
)

// Rossby wave frequencies of the barotropic and baroclinic modes.
//
// Source: Pedlosky (1987), Geophysical Fluid Dynamics, 2nd ed. (Rossby waves
// of the two-layer model). With no shear (U1 = U2 = U, so Q1y = Q2y = β):
//
//   - barotropic mode ψ1 = ψ2: q_n = −K²ψ_n, so ω = Uk − βk/K²;
//   - baroclinic mode: the vertical structure with no net mass transport,
//     H1ψ1 + H2ψ2 = 0, i.e. ψ2 = −δψ1. Derivation for any δ (done here): with
//     F1 = 1/(Ld²(1+δ)) and F2 = δF1,
//     q1 = −K²ψ1 + F1(ψ2 − ψ1) = −(K² + F1(1+δ))ψ1 = −(K² + F1 + F2)ψ1 and
//     q2 = −K²ψ2 + F2(1+δ)ψ1 = −(K² + F2(1+δ)/δ)ψ2 = −(K² + F1 + F2)ψ2, so
//     both layers obey the same equation and ω = Uk − βk/(K² + F1 + F2),
//     with F1 + F2 = 1/Ld² (for δ = 1 this is Pedlosky's baroclinic mode).
//
// Method: seed the mode (i, j) with the mode's vertical structure, step the
// inviscid model and fit the unwrapped phase of the upper layer's spectral
// coefficient, which is ∝ exp(−iωt), against time.

func TestRossbyWaveFrequencies(t *testing.T) {
	type tc struct {
		name       string
		delta, u   float64
		baroclinic bool
		i, j       int
	}
	cases := []tc{
		{"barotropic U=0 (1,0)", 1, 0, false, 1, 0},
		{"barotropic U=10 (2,1)", 1, 10, false, 2, 1},
		{"barotropic U=-5 (3,-2)", 1, -5, false, 3, -2},
		{"baroclinic δ=1 U=0 (1,0)", 1, 0, true, 1, 0},
		{"baroclinic δ=1 U=-8 (2,1)", 1, -8, true, 2, 1},
		{"baroclinic δ=1 U=0 (4,-3)", 1, 0, true, 4, -3},
		{"baroclinic δ=0.5 U=0 (2,0)", 0.5, 0, true, 2, 0},
		{"baroclinic δ=0.25 U=6 (1,2)", 0.25, 6, true, 1, 2},
		{"barotropic δ=0.25 U=6 (1,2)", 0.25, 6, false, 1, 2},
	}
	for _, c := range cases {
		cfg := chkConfig(16, 16, 1e7, 1e7)
		cfg.Beta, cfg.Ld, cfg.Delta = 1.6e-11, 7e5, c.delta
		cfg.U1, cfg.U2 = c.u, c.u
		cfg.Dt = 1800
		m := chkModel(t, cfg)
		g := m.Grid()
		k, l := chkWavenumber(g, c.i, c.j)
		k2 := k*k + l*l
		s := 1.0 // ψ2/ψ1
		want := c.u*k - cfg.Beta*k/k2
		if c.baroclinic {
			s = -c.delta
			want = c.u*k - cfg.Beta*k/(k2+1/(cfg.Ld*cfg.Ld))
		}
		amp := 1.0 / math.Sqrt(k2) // 1 m/s
		if err := m.SetStreamfunction([2][]float64{chkCosine(g, c.i, c.j, amp, 0.7), chkCosine(g, c.i, c.j, s*amp, 0.7)}); err != nil {
			t.Fatal(err)
		}
		p := chkIndex(g, c.i, c.j)
		psi := m.SpectralStreamfunction()
		a0 := cmplx.Abs(psi[0][p])
		// Run for one period, but 100 to 300 steps (a phase change of at
		// least 0.6 rad for the slowest case).
		nsteps := min(300, max(100, int(math.Ceil(2*math.Pi/math.Abs(want)/cfg.Dt))))
		var ts, ph []float64
		maxRatioErr, maxAmpErr := 0.0, 0.0
		for range nsteps {
			if err := m.Step(); err != nil {
				t.Fatal(err)
			}
			psi := m.SpectralStreamfunction()
			a := cmplx.Phase(psi[0][p])
			if n := len(ph); n > 0 {
				a -= 2 * math.Pi * math.Round((a-ph[n-1])/(2*math.Pi))
			}
			ts, ph = append(ts, m.Time()), append(ph, a)
			maxRatioErr = math.Max(maxRatioErr, cmplx.Abs(psi[1][p]/psi[0][p]-complex(s, 0)))
			maxAmpErr = math.Max(maxAmpErr, math.Abs(cmplx.Abs(psi[0][p])/a0-1))
		}
		slope, _ := chkFit(ts, ph)
		got := -slope
		// Pedlosky (1987): Rossby wave dispersion relation, within 0.5 %.
		if re := chkRelErr(got, want); re > 0.005 {
			t.Errorf("%s: ω = %.6g s⁻¹, Pedlosky gives %.6g (error %.2g)", c.name, got, want, re)
		} else {
			t.Logf("%s: ω = %.6g s⁻¹ (period %.3f days), Pedlosky %.6g, relative error %.2g", c.name, got, 2*math.Pi/math.Abs(got)/86400, want, re)
		}
		// A normal mode keeps its vertical structure and, being neutral,
		// its amplitude (Pedlosky 1987); 1e-6 allows for RK4's amplitude
		// error (ωdt)⁶/144 per step (common practice).
		if maxRatioErr > 1e-6 {
			t.Errorf("%s: ψ̂2/ψ̂1 departs from %g by %.3g", c.name, s, maxRatioErr)
		}
		if maxAmpErr > 1e-6 {
			t.Errorf("%s: amplitude changed by a fraction %.3g", c.name, maxAmpErr)
		}
	}
}
