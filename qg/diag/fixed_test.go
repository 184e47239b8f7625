package diag

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// In the fixed mode the eddies are the model's state itself (package diag):
// the eddy PV flux is the plain time mean of u′q′ over the samples, which
// the test computes itself from the states it saw; with Options.Transient
// it is the mean product of the departures from the time mean (two-pass).
// The block is held, so the trend is zero, and the block index is
// 1 + ⟨ψ′, ψ_B⟩/⟨ψ_B, ψ_B⟩ (the full flow is ψ_B + ψ′).
func TestFixedModeEddies(t *testing.T) {
	m, cfg := tstForcedRun(t, 32, 32)
	g, ph := m.Grid(), m.Physics()
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	dip := tstDipole(cfg, 2e7, 7e5, 1e6, 4.5e6, cfg.Ly/2)
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{dip, dip}, Mode: qg.Fixed}); err != nil {
		t.Fatal(err)
	}
	raw := tstNew(t, m, Options{Spinup: 4 * day})
	tr := tstNew(t, m, Options{Spinup: 4 * day, Transient: true})
	np := cfg.Nx * cfg.Ny
	var us, qs [][]float64
	for range int(8 * day / cfg.Dt) {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if err := raw.Sample(); err != nil {
			t.Fatal(err)
		}
		if err := tr.Sample(); err != nil {
			t.Fatal(err)
		}
		if m.Time() >= 4*day {
			_, u, _, q := tstGridded(g, ph, plan, m.SpectralStreamfunction(), 0)
			us, qs = append(us, u), append(qs, q)
		}
	}
	ns := float64(len(us))
	prod, mu, mq := make([]float64, np), make([]float64, np), make([]float64, np)
	for s := range us {
		for i := range np {
			prod[i] += us[s][i] * qs[s][i] / ns
			mu[i] += us[s][i] / ns
			mq[i] += qs[s][i] / ns
		}
	}
	dep := make([]float64, np)
	for s := range us {
		for i := range np {
			dep[i] += (us[s][i] - mu[i]) * (qs[s][i] - mq[i]) / ns
		}
	}
	for _, c := range []struct {
		name string
		acc  *Accumulator
		want []float64
	}{{"state", raw, prod}, {"transient", tr, dep}} {
		got := tstGet(t, c.acc.Fields(), "uq1")
		sc := tstMaxAbs(c.want)
		if sc == 0 {
			t.Fatal("no eddies")
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-11*sc {
				t.Errorf("%s eddies: u′q′ at %d = %.12g, want %.12g", c.name, i, got[i], c.want[i])
				break
			}
		}
	}
	s := raw.Summary()
	if s.Trend != 0 || s.Mode != "fixed" {
		t.Errorf("fixed mode: trend %g, mode %q", s.Trend, s.Mode)
	}
	bpsi, _ := m.BlockStreamfunction()
	want := 1 + innerProduct(g, ph, EnergyNorm, m.SpectralStreamfunction(), bpsi)/innerProduct(g, ph, EnergyNorm, bpsi, bpsi)
	ser := raw.Series()
	if got := ser.Index[len(ser.Index)-1]; math.Abs(got-want) > 1e-12 {
		t.Errorf("block index %.15g, want %.15g", got, want)
	}
	if math.Abs(s.Eddy.Rate) == 0 || math.Abs(tr.Summary().Eddy.Rate-s.Eddy.Rate) == 0 {
		t.Errorf("eddy rates: state %g, transient %g: both should be non-zero and differ", s.Eddy.Rate, tr.Summary().Eddy.Rate)
	}
}

// The package's own flux-form Jacobian (used for the mean-flow advection of
// the reference state) agrees with the model's advection term,
// qg.Model.TermTendency(TermAdvection), on the same state.
func TestJacobianAgainstModel(t *testing.T) {
	cfg := tstConfig(32, 32)
	m := tstModel(t, cfg)
	dip := tstDipole(cfg, 2e7, 7e5, 1e6, 4e6, 4e6)
	low := make([]float64, len(dip))
	for i, v := range dip {
		low[i] = -0.3 * v
	}
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{dip, low}, Mode: qg.Free}); err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{})
	q, psi := clonePair(m.SpectralPV()), clonePair(m.SpectralStreamfunction())
	want := a.termTendency(qg.TermAdvection, q)
	for n := range 2 {
		got := make([]complex128, len(q[n]))
		if err := m.Advection(got, psi[n], q[n], n); err != nil {
			t.Fatal(err)
		}
		var sc, e float64
		for p := range got {
			sc = math.Max(sc, math.Hypot(real(want[n][p]), imag(want[n][p])))
			d := got[p] - want[n][p]
			e = math.Max(e, math.Hypot(real(d), imag(d)))
		}
		if sc == 0 || e > 1e-12*sc {
			t.Errorf("layer %d: max difference %.3g, scale %.3g", n+1, e, sc)
		}
	}
}
