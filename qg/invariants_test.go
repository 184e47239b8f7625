package qg

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

// Inviscid invariants of the dealiased Galerkin system.
//
// Source: properties of the Galerkin truncation of the two-layer QG
// equations. With the nonlinear term computed without aliasing and truncated
// to the retained modes, the semi-discrete system conserves the total energy
// KE + APE exactly for any β (β and a barotropic U do no work), and, when
// β = 0 and U1 = U2 = 0, each layer's enstrophy ½⟨q_n²⟩ (the layer PV is then
// only advected by the layer's own flow). What remains is the error of the time
// scheme, which for RK4 is O(dt⁴) and small at a modest CFL number.

// chkRandomState returns gridded streamfunctions that are sums of cosines
// of every mode with 1 ≤ max(|i|, |j|) ≤ nmax, random amplitudes (velocity
// up to u0 per mode) and random phases, drawn from a seeded PCG generator.
func chkRandomState(g *Grid, nmax int, u0 float64, seed uint64) [2][]float64 {
	r := rand.New(rand.NewPCG(seed, 0x5eed))
	var psi [2][]float64
	for n := range 2 {
		psi[n] = make([]float64, g.Nx*g.Ny)
		for i := 0; i <= nmax; i++ {
			for j := -nmax; j <= nmax; j++ {
				if i == 0 && j <= 0 {
					continue // each real cosine once; no mean
				}
				k, l := chkWavenumber(g, i, j)
				amp := u0 * r.Float64() / math.Hypot(k, l)
				f := chkCosine(g, i, j, amp, 2*math.Pi*r.Float64())
				for p := range f {
					psi[n][p] += f[p]
				}
			}
		}
	}
	return psi
}

// chkInvariantModel returns an inviscid model (δ = 0.5, so the layer
// weights differ) on a 64² grid of a 6000 km square with a random
// well-resolved state (modes up to index 6 of the 21 retained).
func chkInvariantModel(t *testing.T, beta float64, scheme Scheme, dt float64) *Model {
	t.Helper()
	cfg := chkConfig(64, 64, 6e6, 6e6)
	cfg.Beta, cfg.Delta, cfg.Ld = beta, 0.5, 7e5
	cfg.Scheme, cfg.Dt = scheme, dt
	m := chkModel(t, cfg)
	if err := m.SetStreamfunction(chkRandomState(m.Grid(), 6, 1.5, 20261201)); err != nil {
		t.Fatal(err)
	}
	return m
}

// TestInvariantEnergy checks that RK4 conserves the total energy with β ≠ 0
// and that the energy ledger books no work by the advection or by β.
func TestInvariantEnergy(t *testing.T) {
	m := chkInvariantModel(t, 1.6e-11, RK4, 900)
	ke0, ape0 := m.Energy()
	e0 := ke0 + ape0
	maxDrift := 0.0
	for range 1000 {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		ke, ape := m.Energy()
		maxDrift = math.Max(maxDrift, math.Abs(ke+ape-e0)/e0)
	}
	led := m.Ledger()
	t.Logf("rk4, dt = 900 s: E0 = %.6g m²/s² (APE/E %.2f), %d steps, CFL %.3f, max |ΔE|/E = %.3g; ledger advection %.3g, shear %.3g (relative)",
		e0, ape0/e0, m.Steps(), m.CFL(), maxDrift, led[TermAdvection]/e0, led[TermShear]/e0)
	// Energy is an invariant of the Galerkin system (any β); 1e-6 over 1000
	// RK4 steps bounds the time-stepping error (task specification).
	if maxDrift > 1e-6 {
		t.Errorf("energy drift %.3g over 1000 RK4 steps, tolerance 1e-6 (Galerkin invariant)", maxDrift)
	}
	// The advection does no work on the full flow (Galerkin invariant); the
	// ledger books the stage work with the scheme's weights, so it must stay
	// at rounding level relative to E.
	if r := math.Abs(led[TermAdvection]) / e0; r > 1e-12 {
		t.Errorf("ledger advection term %.3g of the energy, want ≈ 0", r)
	}
	// β alone does no work, and U1 = U2 = 0 (Galerkin invariant; package qg).
	if r := math.Abs(led[TermShear]) / e0; r > 1e-12 {
		t.Errorf("ledger shear term %.3g of the energy with U1 = U2 = 0, want ≈ 0", r)
	}
}

// TestInvariantLayerEnstrophy checks that RK4 conserves each layer's
// enstrophy (and the energy) when β = 0 and U1 = U2 = 0.
func TestInvariantLayerEnstrophy(t *testing.T) {
	m := chkInvariantModel(t, 0, RK4, 600)
	z10, z20 := m.Enstrophy()
	var d1, d2 float64
	for range 1000 {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		z1, z2 := m.Enstrophy()
		d1 = math.Max(d1, math.Abs(z1-z10)/z10)
		d2 = math.Max(d2, math.Abs(z2-z20)/z20)
	}
	t.Logf("rk4, dt = 600 s, β = 0: max relative drift over 1000 steps: Z1 %.3g, Z2 %.3g (CFL %.3f)", d1, d2, m.CFL())
	// Each layer's enstrophy is a Galerkin invariant for β = 0, U = 0;
	// 1e-6 over 1000 steps (task specification).
	if d1 > 1e-6 || d2 > 1e-6 {
		t.Errorf("layer enstrophy drift Z1 %.3g, Z2 %.3g over 1000 RK4 steps, tolerance 1e-6", d1, d2)
	}
}

// TestInvariantDriftAB3 measures the drift of the invariants under AB3. AB3
// does not conserve them to 1e-6 at the RK4 time step: its amplification
// factor on the imaginary axis is 1 + (3/8)(ωdt)⁴ + … (Durran 2010,
// Numerical Methods for Fluid Dynamics, §2.4, from memory), so the drift over
// a fixed time is O(dt³). The check is that the drift is a time-stepping
// error: it converges at third order when dt is halved, and is small.
func TestInvariantDriftAB3(t *testing.T) {
	const span = 9e5 // s: 1000 steps of 900 s
	drift := func(beta, dt float64) (de, dz float64) {
		m := chkInvariantModel(t, beta, AB3, dt)
		ke0, ape0 := m.Energy()
		z10, z20 := m.Enstrophy()
		e0 := ke0 + ape0
		for range int(math.Round(span / dt)) {
			if err := m.Step(); err != nil {
				t.Fatal(err)
			}
			ke, ape := m.Energy()
			z1, z2 := m.Enstrophy()
			de = math.Max(de, math.Abs(ke+ape-e0)/e0)
			dz = math.Max(dz, math.Max(math.Abs(z1-z10)/z10, math.Abs(z2-z20)/z20))
		}
		return de, dz
	}
	e900, _ := drift(1.6e-11, 900)
	e450, _ := drift(1.6e-11, 450)
	_, z900 := drift(0, 900)
	_, z450 := drift(0, 450)
	pe, pz := math.Log2(e900/e450), math.Log2(z900/z450)
	t.Logf("ab3: energy drift (β ≠ 0) %.3g at dt = 900 s (1000 steps), %.3g at 450 s, order %.2f; layer enstrophy drift (β = 0) %.3g, %.3g, order %.2f",
		e900, e450, pe, z900, z450, pz)
	// Third-order convergence of AB3 (Durran 2010, from memory): observed
	// order within ±0.5 of 3.
	if math.Abs(pe-3) > 0.5 || math.Abs(pz-3) > 0.5 {
		t.Errorf("ab3: drift converges at order %.2f (energy), %.2f (enstrophy), want 3 ± 0.5", pe, pz)
	}
	// Loose bound on the drift over 1000 AB3 steps at CFL ≈ 0.2 (common
	// practice: under 0.1 %).
	if e900 > 1e-3 || z900 > 1e-2 {
		t.Errorf("ab3: drift over 1000 steps: energy %.3g (bound 1e-3), enstrophy %.3g (bound 1e-2)", e900, z900)
	}
}

// chkNaNSource is a Source whose increment is not finite.
type chkNaNSource struct{ p int }

func (s chkNaNSource) Increment(dq [2][]complex128, t, dt float64) {
	dq[0][s.p] = complex(math.NaN(), 0)
}

// TestFailedStepRestoresLedger checks the ledger's contract, "the sum over
// the terms equals the change of total energy" (Ledger doc; energy budget of
// the model): a step that fails is undone (Step doc), so the ledger must be
// as it was before the step, like the state, the time and the step count.
func TestFailedStepRestoresLedger(t *testing.T) {
	cfg := chkConfig(16, 16, 6e6, 6e6)
	cfg.Beta, cfg.U1, cfg.U2, cfg.Drag = 1.6e-11, 10, 4, 1e-6
	m := chkModel(t, cfg)
	if err := m.SetStreamfunction(chkRandomState(m.Grid(), 3, 1.5, 7)); err != nil {
		t.Fatal(err)
	}
	if err := m.Run(3); err != nil {
		t.Fatal(err)
	}
	led0, t0, n0 := m.Ledger(), m.Time(), m.Steps()
	ke0, ape0 := m.Energy()
	m.AddSource(chkNaNSource{p: chkIndex(m.Grid(), 1, 1)})
	err := m.Step()
	var se *StepError
	if !errors.As(err, &se) {
		t.Fatalf("step with a NaN source returned %v, want a *StepError", err)
	}
	ke, ape := m.Energy()
	if m.Time() != t0 || m.Steps() != n0 || ke != ke0 || ape != ape0 {
		t.Errorf("failed step not undone: t %g → %g, steps %d → %d, E %g → %g", t0, m.Time(), n0, m.Steps(), ke0+ape0, ke+ape)
	}
	if led := m.Ledger(); led != led0 {
		t.Errorf("failed step left its terms in the ledger:\n before %v\n after  %v", led0, led)
	}
}

// TestLedgerClosure checks the energy budget of the model (the model's energy budget,
// "energy budget of the model"; Ledger doc): with shear, β, Ekman drag and
// either dissipation, the sum of the ledger's terms equals the change of
// KE + APE up to the time-stepping error, and each loss term has the sign
// of a loss (drag, hyperviscosity and the filter remove energy).
func TestLedgerClosure(t *testing.T) {
	for _, diss := range []ScaleSelective{
		{Kind: Hyperviscosity, Viscosity: 1e15, Order: 2},
		{Kind: CutoffFilter, FilterTime: 3600, FilterCutoff: 0.6, FilterOrder: 4},
	} {
		cfg := chkConfig(32, 32, 6e6, 6e6)
		cfg.Beta, cfg.Delta, cfg.U1, cfg.U2 = 1.6e-11, 0.5, 12, 2
		cfg.Drag = 1 / (3 * 86400.0)
		cfg.ScaleSelective = diss
		cfg.Dt = 900
		m := chkModel(t, cfg)
		if err := m.SetStreamfunction(chkRandomState(m.Grid(), 8, 2, 99)); err != nil {
			t.Fatal(err)
		}
		ke0, ape0 := m.Energy()
		if err := m.Run(500); err != nil {
			t.Fatal(err)
		}
		ke, ape := m.Energy()
		led := m.Ledger()
		de := ke + ape - ke0 - ape0
		var gross float64
		for _, v := range led {
			gross += math.Abs(v)
		}
		t.Logf("%s: ΔE = %.6g m²/s², ledger sum %.6g (closure error %.2g of the gross %.3g); terms %v",
			diss.Kind, de, led.Sum(), math.Abs(led.Sum()-de)/gross, gross, led)
		// Energy budget of the model: closure to 1e-6 of the gross exchange
		// over 500 RK4 steps (time-stepping error only, common practice).
		if e := math.Abs(led.Sum()-de) / gross; e > 1e-6 {
			t.Errorf("%s: ledger sum %.6g, energy change %.6g (error %.2g of the gross exchange)", diss.Kind, led.Sum(), de, e)
		}
		if led[TermDrag] >= 0 || led[TermScaleSelective] > 0 {
			t.Errorf("%s: a loss term adds energy: drag %.3g, scale-selective %.3g", diss.Kind, led[TermDrag], led[TermScaleSelective])
		}
		if led[TermScaleSelective] == 0 {
			t.Errorf("%s: the dissipation booked nothing", diss.Kind)
		}
	}
}
