package qg_test

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// spongePacket returns a small-amplitude wave packet in the upper-layer
// streamfunction: a carrier of wavelength lambda along x under a Gaussian
// envelope of e-folding half-width sigma centred at (x0, Ly/2).
func spongePacket(cfg qg.Config, amp, x0, sigma, lambda float64) [2][]float64 {
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	var psi [2][]float64
	psi[0] = make([]float64, cfg.Nx*cfg.Ny)
	psi[1] = make([]float64, cfg.Nx*cfg.Ny)
	k := 2 * math.Pi / lambda
	for y := range g.Ny {
		dy := qg.PeriodicDistance(g.Y(y), cfg.Ly/2, cfg.Ly)
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), x0, cfg.Lx)
			psi[0][y*g.Nx+x] = amp * math.Exp(-(dx*dx+dy*dy)/(sigma*sigma)) * math.Cos(k*dx)
		}
	}
	return psi
}

// spongeConfig: a uniform flow U1 = U2 = U (no shear, so no background PV
// gradient with β = 0), no drag and no dissipation: each layer's PV is
// carried along x at U, and a packet of small amplitude (its own velocities
// are 1e-3 of U) crosses the sponge unchanged but for the damping.
func spongeConfig(dt float64) qg.Config {
	cfg := qg.DefaultConfig() // 16 000 × 8 000 km
	cfg.Nx, cfg.Ny = 128, 64
	cfg.Beta, cfg.U1, cfg.U2, cfg.Drag = 0, 10, 10, 0
	cfg.ScaleSelective = qg.ScaleSelective{Kind: qg.NoScaleSelective}
	cfg.Sponge = qg.Sponge{Rate: 1 / 86400.0, Width: 3e6, X: 8e6}
	cfg.Dt = dt
	return cfg
}

func spongeEnergy(m *qg.Model) float64 {
	ke, ape := m.Energy()
	return ke + ape
}

// A wave packet carried through the sponge by the uniform flow loses its
// energy. Along a characteristic of ∂q/∂t + U ∂q/∂x = −s(x) q the PV decays
// by exp(−∫s dx / U) (method of characteristics, common practice), and for
// the raised-cosine band ∫s dx = Rate·Width/2; once every part of the packet
// has crossed the band, its PV, and hence its streamfunction, has been
// multiplied by that factor, so its energy by exp(−Rate·Width/U), here
// exp(−3.47) = 0.031: the packet must lose more than 95 % of its energy,
// and the loss must match the prediction.
func TestSpongeAbsorbsPacket(t *testing.T) {
	cfg := spongeConfig(3600)
	m, err := qg.NewModel(cfg)
	if err != nil {
		t.Fatal(err)
	}
	// Packet centred 4500 km west of the band's centre, ±1800 km wide
	// (3σ), so it starts clear of the band (west edge 6500 km).
	if err := m.SetStreamfunction(spongePacket(cfg, 1e3, 3.5e6, 6e5, 1.6e6)); err != nil {
		t.Fatal(err)
	}
	e0 := spongeEnergy(m)
	// Carry it 9000 km east: its trailing edge (centre − 3σ) then sits at
	// the band's east edge, 9500 km, and its leading edge (14 300 km) has
	// not come round to the band again.
	steps := int(math.Round(9e6 / cfg.U1 / cfg.Dt))
	if err := m.Run(steps); err != nil {
		t.Fatal(err)
	}
	e1 := spongeEnergy(m)
	want := math.Exp(-cfg.Sponge.Rate * cfg.Sponge.Width / cfg.U1)
	t.Logf("energy after crossing: %.4g of the initial (loss %.2f %%); characteristics predict %.4g", e1/e0, 100*(1-e1/e0), want)
	if e1/e0 > 0.05 {
		t.Errorf("the packet kept %.3g of its energy, want < 5 %%", e1/e0)
	}
	if math.Abs(math.Log(e1/e0)-math.Log(want)) > 0.01 {
		t.Errorf("energy ratio %.4g, characteristics predict %.4g", e1/e0, want)
	}
}

// The energy the ledger books to the sponge matches the change of the
// model's energy when the sponge is the only non-conservative term (the
// model's energy budget: the advection by the uniform flow and
// the packet's own advection do no work). With a short time step the
// time-stepping error of the advection (RK4's damping of order (ω dt)⁶ per
// step) is far below the tolerance, so the booking is checked to 1e-6.
func TestSpongeLedger(t *testing.T) {
	cfg := spongeConfig(600)
	m, err := qg.NewModel(cfg)
	if err != nil {
		t.Fatal(err)
	}
	// Start with the packet entering the band.
	if err := m.SetStreamfunction(spongePacket(cfg, 1e3, 6e6, 6e5, 1.6e6)); err != nil {
		t.Fatal(err)
	}
	e0 := spongeEnergy(m)
	m.ResetLedger()
	if err := m.Run(300); err != nil {
		t.Fatal(err)
	}
	de := spongeEnergy(m) - e0
	l := m.Ledger()
	sp := l[qg.TermSponge]
	t.Logf("ΔE = %.6g, sponge %.6g, all terms %.6g m² s⁻² (ΔE/E0 = %.3g; sponge vs ΔE mismatch %.2g relative)", de, sp, l.Sum(), de/e0, math.Abs(de-sp)/math.Abs(sp))
	if !(sp < 0) || -sp < 0.1*e0 {
		t.Fatalf("the sponge removed %.3g of E0 = %.3g; the check needs a substantial loss", -sp, e0)
	}
	if e := math.Abs(de-sp) / math.Abs(sp); e > 1e-6 {
		t.Errorf("ledger sponge term %.9g, energy change %.9g: relative mismatch %.2g > 1e-6", sp, de, e)
	}
	for term, v := range l {
		if qg.Term(term) != qg.TermSponge && math.Abs(v) > 1e-6*math.Abs(sp) {
			t.Errorf("term %v booked %.3g, want ≈ 0 (only the sponge acts)", qg.Term(term), v)
		}
	}
}
