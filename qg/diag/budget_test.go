package diag

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// tstWaveForcing is a deterministic PV forcing of the upper layer: a fixed
// spatial pattern times cos(ωt) (a localised, oscillating wave source).
type tstWaveForcing struct {
	pat   []complex128
	omega float64
}

func (f *tstWaveForcing) AddTendency(dq [2][]complex128, t float64) {
	c := complex(math.Cos(f.omega*t), 0)
	for p, z := range f.pat {
		dq[0][p] += c * z
	}
}

// tstForcedRun builds a forced–dissipative, baroclinically unstable model:
// shear, drag, hyperviscosity, a sponge band, a localised oscillating wave
// forcing and small random initial eddies.
func tstForcedRun(t testing.TB, nx, ny int) (*qg.Model, qg.Config) {
	t.Helper()
	cfg := tstConfig(nx, ny)
	cfg.U1, cfg.U2 = 12, 2
	cfg.Drag = 1 / (4 * day)
	cfg.ScaleSelective = qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 5e14, Order: 2}
	cfg.Sponge = qg.Sponge{Rate: 1 / (2 * day), Width: 2e6, X: 7e6}
	m := tstModel(t, cfg)
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	k := 2 * math.Pi * 4 / cfg.Lx
	src := tstField(cfg, func(x, y float64) float64 {
		dx, dy := qg.PeriodicDistance(x, 2e6, cfg.Lx), qg.PeriodicDistance(y, cfg.Ly/2, cfg.Ly)
		return 2e-10 * math.Exp(-(dx*dx+dy*dy)/(1e6*1e6)) * math.Cos(k*dx)
	})
	f := &tstWaveForcing{pat: make([]complex128, m.Grid().Len()), omega: 2 * math.Pi / (4 * day)}
	plan.Forward(f.pat, src)
	m.AddForcing(f)
	psi := tstRandomPsi(m.Grid(), rand.New(rand.NewPCG(11, 12)), 2e4, 6)
	tstSetPsi(t, m, plan, psi)
	return m, cfg
}

// The energy budget closes: over the averaging window of a forced–
// dissipative run, the change of total energy equals the time integral of
// the budget terms of the Series (the energy budget of the model) within 1 %; the drag term of the series matches the drag computed by
// the test from the sampled states, −r·W2⟨|∇ψ2|²⟩ (package qg), integrated
// by the trapezoidal rule, within 1 %. (Measured: 2e-6 and 6e-4.)
func TestEnergyBudgetCloses(t *testing.T) {
	m, cfg := tstForcedRun(t, 32, 32)
	g, ph := m.Grid(), m.Physics()
	a := tstNew(t, m, Options{Spinup: 5 * day})
	var dragNow []float64
	for range int(25 * day / cfg.Dt) {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
		psi2 := m.SpectralStreamfunction()[1]
		var d float64
		for p := range g.Len() {
			w := g.Weight(p)
			d += w * g.K2(p) * dotc(psi2[p], psi2[p])
		}
		dragNow = append(dragNow, -cfg.Drag*ph.W2*d)
	}
	s := a.Series()
	w := s.WindowStart
	if w == 0 || w >= len(s.Time)-1 {
		t.Fatalf("window starts at sample %d of %d", w, len(s.Time))
	}
	dE := s.KE[len(s.KE)-1] + s.APE[len(s.APE)-1] - s.KE[w] - s.APE[w]
	var budget, forcing, drag, dragRef float64
	for i := w + 1; i < len(s.Time); i++ {
		h := s.Time[i] - s.Time[i-1]
		for _, r := range s.Rates {
			budget += r[i] * h
		}
		forcing += s.Rates["injection"][i] * h
		drag += s.Rates["drag"][i] * h
		dragRef += 0.5 * (dragNow[i] + dragNow[i-1]) * h
	}
	t.Logf("ΔE = %.6g, budget %.6g, forcing %.3g, drag %.6g (from states %.6g) m² s⁻²", dE, budget, forcing, drag, dragRef)
	if !(math.Abs(dE) > 0.01*math.Abs(forcing)) || forcing == 0 {
		t.Fatalf("degenerate run: ΔE = %g, forcing work %g", dE, forcing)
	}
	if e := math.Abs(budget-dE) / math.Abs(dE); e > 0.01 {
		t.Errorf("budget %.6g vs ΔE %.6g: relative error %.3g", budget, dE, e)
	}
	if e := math.Abs(drag-dragRef) / math.Abs(dragRef); e > 0.01 {
		t.Errorf("drag %.6g vs %.6g from the states: relative error %.3g", drag, dragRef, e)
	}
	// The conversion from the imposed shear is W1F1(U1 − U2)⟨v(ψ1 − ψ2)⟩
	// (by hand from the shear term of package qg: ⟨ψ_n ∂x q_n⟩ = −F_n⟨v_n
	// (ψ_m − ψ_n)⟩, W1F1 = W2F2, and ⟨v1 τ⟩ = ⟨v2 τ⟩); over the window the
	// mean of ⟨vτ⟩ is the eddy heat flux plus the mean flow's ⟨v̄τ̄⟩.
	sum := a.Summary()
	f := a.Fields()
	vm, p1, p2 := tstGet(t, f, "v_mean1"), tstGet(t, f, "psi_mean1"), tstGet(t, f, "psi_mean2")
	var meanPart float64
	for i := range vm {
		meanPart += vm[i] * (p1[i] - p2[i]) / float64(len(vm))
	}
	conv := ph.W1 * ph.F1 * (cfg.U1 - cfg.U2) * (sum.HeatFlux + meanPart)
	t.Logf("shear conversion: ledger %.6g, from the heat flux %.6g (eddy part %.6g) m² s⁻³", sum.Energy.Rates["shear"], conv, ph.W1*ph.F1*(cfg.U1-cfg.U2)*sum.HeatFlux)
	if e := math.Abs(conv-sum.Energy.Rates["shear"]) / math.Abs(conv); e > 0.01 {
		t.Errorf("shear conversion from the heat flux %.6g vs ledger %.6g: relative error %.3g", conv, sum.Energy.Rates["shear"], e)
	}
	if !(sum.HeatFlux > 0) {
		t.Errorf("eddy heat flux %g: baroclinic eddies on a westerly shear carry heat poleward", sum.HeatFlux)
	}
	if e := sum.Energy; math.Abs(e.Change-dE) > 1e-12*math.Abs(dE) || math.Abs(e.Budget-budget) > 1e-9*math.Abs(budget) {
		t.Errorf("Summary energetics %+v disagree with the series (ΔE %g, budget %g)", e, dE, budget)
	}
}
