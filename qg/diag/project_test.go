package diag

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

func tstSpectral(plan *fft.Plan2D, g *qg.Grid, f [2][]float64) [2][]complex128 {
	var s [2][]complex128
	for n := range 2 {
		s[n] = make([]complex128, g.Len())
		plan.Forward(s[n], f[n])
		for p := range s[n] {
			s[n][p] *= complex(g.Keep(p), 0)
		}
		s[n][0] = 0
	}
	return s
}

// Projections of known tendencies on a dipole block pattern P: P itself per
// day gives r = 1 day⁻¹ and correlation 1; the tendency of the dipole
// translated at (c_x, c_y), computed from the analytic dipole at shifted
// positions (centred difference, no derivative of the package involved),
// gives the drift (c_x, c_y) ×86.4 km day⁻¹ per m s⁻¹ and nothing else
// (a pattern moving at c has ∂ψ/∂t = −c·∇ψ: common practice); and a field
// odd in x and even in y about the block's centre is orthogonal, by
// symmetry, to the dipole (even in x, odd in y) and to both its derivatives,
// so it projects to zero and is wholly unexplained.
func TestFitKnownTendencies(t *testing.T) {
	cfg := tstConfig(64, 64)
	m := tstModel(t, cfg)
	g, ph := m.Grid(), m.Physics()
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	const amp, R, d = 3e7, 8e5, 1.2e6
	x0, y0 := cfg.Lx/2, cfg.Ly/2
	dip := tstDipole(cfg, amp, R, d, x0, y0)
	P := tstSpectral(plan, g, [2][]float64{dip, dip})
	for _, norm := range []Norm{EnergyNorm, LayerNorm} {
		t.Run(string(norm), func(t *testing.T) {
			self := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
			for n := range 2 {
				for p := range self[n] {
					self[n][p] = P[n][p] / day
				}
			}
			pr := Fit(g, ph, norm, self, P)
			if math.Abs(pr.Rate-1) > 1e-12 || math.Abs(pr.Correlation-1) > 1e-12 || math.Abs(pr.DriftEast) > 1e-9 || math.Abs(pr.DriftNorth) > 1e-9 || pr.Unexplained > 1e-12 {
				t.Errorf("P/day: %+v, want rate 1, correlation 1, no drift, nothing unexplained", pr)
			}

			const cx, cy = 12.0, -4.0 // m s⁻¹
			const dt = 100.0          // s: displacement 1.2 km ≪ R
			plus := tstDipole(cfg, amp, R, d, x0+cx*dt, y0+cy*dt)
			minus := tstDipole(cfg, amp, R, d, x0-cx*dt, y0-cy*dt)
			tr := make([]float64, len(plus))
			for i := range tr {
				tr[i] = (plus[i] - minus[i]) / (2 * dt)
			}
			X := tstSpectral(plan, g, [2][]float64{tr, tr})
			pr = Fit(g, ph, norm, X, P)
			if e := math.Abs(pr.DriftEast - cx*86.4); e > 1e-4*cx*86.4 {
				t.Errorf("drift east %.6g km/day, want %.6g", pr.DriftEast, cx*86.4)
			}
			if e := math.Abs(pr.DriftNorth - cy*86.4); e > 1e-4*math.Abs(cy)*86.4 {
				t.Errorf("drift north %.6g km/day, want %.6g", pr.DriftNorth, cy*86.4)
			}
			if math.Abs(pr.Rate) > 1e-9 || pr.Unexplained > 1e-6 {
				t.Errorf("translation: rate %.3g day⁻¹, unexplained %.3g, want 0", pr.Rate, pr.Unexplained)
			}

			odd := tstField(cfg, func(x, y float64) float64 {
				xe, xw := qg.PeriodicDistance(x, x0+d/2, cfg.Lx), qg.PeriodicDistance(x, x0-d/2, cfg.Lx)
				yy := qg.PeriodicDistance(y, y0, cfg.Ly)
				return 1e7 * (math.Exp(-(xe*xe+yy*yy)/(R*R)) - math.Exp(-(xw*xw+yy*yy)/(R*R))) / day
			})
			X = tstSpectral(plan, g, [2][]float64{odd, odd})
			pr = Fit(g, ph, norm, X, P)
			if math.Abs(pr.Rate) > 1e-12 || math.Abs(pr.Correlation) > 1e-12 || math.Abs(pr.Unexplained-1) > 1e-12 ||
				math.Abs(pr.DriftEast) > 1e-9 || math.Abs(pr.DriftNorth) > 1e-9 {
				t.Errorf("orthogonal field: %+v, want rate 0, correlation 0, unexplained 1", pr)
			}
		})
	}
}

// A block held by the forced mode (package qg) without eddies: the state
// stays q_B, so the eddy terms and the trend vanish and the steady forcing
// balances the mean-flow terms and the dissipation (the residual is zero).
// Ekman drag on the lower layer, −r∇²ψ2, does work −W2·r·⟨|∇ψ_B|²⟩ on a
// barotropic block whose energy norm is ⟨|∇ψ_B|²⟩, so in the energy inner
// product r_drag = −W2·r exactly (by hand from the energy budget of package
// qg); in the layer inner product, for the single mode (A, B)·cos kx cos ly,
// the inversion of the drag tendency (0, rK²B) gives ψ_t = −rB(F1, K² + F1)/
// (K² + F1 + F2) and r_drag = −rB(W1F1A + W2(K² + F1)B)/((K² + F1 + F2)
// (W1A² + W2B²)) (by hand from the inversion of package qg).
func TestForcedBlockWithoutEddies(t *testing.T) {
	cfg := tstConfig(32, 32)
	cfg.U1, cfg.U2 = 10, 4
	cfg.Drag = 1 / (5 * day)
	cfg.ScaleSelective = qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 1e14, Order: 2}
	cfg.Sponge = qg.Sponge{Rate: 1 / day, Width: 1.5e6, X: 1e6}
	const amp, R, d = 3e7, 8e5, 1.2e6
	k, l := 2*math.Pi*2/cfg.Lx, 2*math.Pi*1/cfg.Ly
	for _, tc := range []struct {
		name  string
		norm  Norm
		psi   []float64
		rdrag float64
	}{
		{"dipole, energy norm", EnergyNorm, tstDipole(cfg, amp, R, d, cfg.Lx/2, cfg.Ly/2), -0.5 * cfg.Drag * day},
		{"single mode, layer norm", LayerNorm,
			tstField(cfg, func(x, y float64) float64 { return amp * math.Cos(k*x) * math.Cos(l*y) }), 0},
	} {
		lower := tc.psi
		t.Run(tc.name, func(t *testing.T) {
			m := tstModel(t, cfg)
			ph := m.Physics()
			if tc.rdrag == 0 {
				const A, B = 1, 0.4 // lower layer 0.4 times the upper
				lower = make([]float64, len(tc.psi))
				for i, v := range tc.psi {
					lower[i] = B * v
				}
				K2 := k*k + l*l
				tc.rdrag = -cfg.Drag * B * (ph.W1*ph.F1*A + ph.W2*(K2+ph.F1)*B) / ((K2 + ph.F1 + ph.F2) * (ph.W1*A*A + ph.W2*B*B)) * day
			}
			if err := m.SetBlock(qg.Block{Psi: [2][]float64{tc.psi, lower}, Mode: qg.Forced}); err != nil {
				t.Fatal(err)
			}
			a := tstNew(t, m, Options{Norm: tc.norm})
			for range 6 {
				if err := m.Step(); err != nil {
					t.Fatal(err)
				}
				if err := a.Sample(); err != nil {
					t.Fatal(err)
				}
			}
			s := a.Summary()
			if math.Abs(s.Drag-tc.rdrag) > 1e-9*math.Abs(tc.rdrag) {
				t.Errorf("drag rate %.12g day⁻¹, want %.12g", s.Drag, tc.rdrag)
			}
			scale := math.Abs(s.MeanFlow.Rate) + math.Abs(s.Dissipation.Rate) + math.Abs(s.Maintenance)
			if scale == 0 || math.Abs(s.Dissipation.Rate) < 1e-3 {
				t.Fatalf("degenerate test: %+v", s)
			}
			for name, v := range map[string]float64{"eddy": s.Eddy.Rate, "trend": s.Trend, "residual": s.Residual} {
				if math.Abs(v) > 1e-8*scale {
					t.Errorf("%s = %.3g day⁻¹, want 0 (scale %.3g)", name, v, scale)
				}
			}
			if math.Abs(s.Index.Mean-1) > 1e-10 {
				t.Errorf("block index %.12g, want 1", s.Index.Mean)
			}
		})
	}
}
