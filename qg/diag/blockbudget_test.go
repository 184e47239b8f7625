package diag

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// The time mean of the model's PV equation is exact over the samples:
// mean(−J(ψ, q)) = −J(ψ̄, q̄) − ∇·(u′q′) with eddies the departures from
// the window mean, and every other term is linear (packages qg and diag). So in the
// forced mode, with eddies from a deterministic wave source on a shear and no
// stochastic source, the projections of the eddy, mean-flow, dissipation,
// maintenance and forcing tendencies add up to the observed trend of the
// flow, to the difference between the sample mean and the time integral
// (O(1/N)): the residual must be under 3 % of the largest term.
func TestForcedBlockBudgetCloses(t *testing.T) {
	m, cfg := tstForcedRun(t, 32, 32)
	dip := tstDipole(cfg, 2e7, 7e5, 1e6, 4.5e6, cfg.Ly/2)
	low := make([]float64, len(dip))
	for i, v := range dip {
		low[i] = 0.5 * v // an equivalent-barotropic block: a warm high over a cold low
	}
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{dip, low}, Mode: qg.Forced}); err != nil {
		t.Fatal(err)
	}
	// SetBlock replaced the state by q_B: add back small eddies to seed the
	// instability.
	q := clonePair(m.SpectralPV())
	for n := range 2 {
		for p := range q[n] {
			i := p % m.Grid().Nkx
			if i == 3 && p/m.Grid().Nkx == 2 {
				q[n][p] += complex(1e-7*float64(cfg.Nx*cfg.Ny), 0)
			}
		}
	}
	if err := m.SetSpectralPV(q); err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{Spinup: 10 * day})
	for range int(30 * day / cfg.Dt) {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
	}
	s := a.Summary()
	t.Log("\n" + s.String())
	big := 0.0
	for _, v := range []float64{s.Eddy.Rate, s.MeanFlow.Rate, s.Dissipation.Rate, s.Maintenance, s.Forcing, s.Trend} {
		big = math.Max(big, math.Abs(v))
	}
	if math.Abs(s.Eddy.Rate) < 1e-3*big {
		t.Fatalf("degenerate run: eddy rate %g day⁻¹", s.Eddy.Rate)
	}
	if math.Abs(s.Residual) > 0.03*big {
		t.Errorf("residual %.4g day⁻¹, over 3 %% of the largest term %.4g", s.Residual, big)
	}
	t.Logf("residual %.3g day⁻¹, %.2g of the largest term", s.Residual, math.Abs(s.Residual)/big)
	// The interface (stretching) part is purely baroclinic: its PV tendencies
	// in the two layers are −F1·D and F2·D for one divergence D (since
	// J(ψ1, ψ1 − ψ2) = J(ψ2, ψ1 − ψ2)), and W1F1 = W2F2 (package qg), so it
	// has no barotropic projection (by hand).
	if math.Abs(s.EddyInterface.Barotropic) > 1e-9*big || s.EddyInterface.Baroclinic == 0 {
		t.Errorf("interface part: barotropic rate %.3g (want 0), baroclinic %.3g (want ≠ 0)", s.EddyInterface.Barotropic, s.EddyInterface.Baroclinic)
	}
	if e := s.EddyVorticity.Rate + s.EddyInterface.Rate - s.Eddy.Rate; math.Abs(e) > 1e-10*big {
		t.Errorf("vorticity + interface parts %.6g ≠ eddy %.6g", s.EddyVorticity.Rate+s.EddyInterface.Rate, s.Eddy.Rate)
	}
}
