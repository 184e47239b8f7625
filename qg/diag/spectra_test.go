package diag

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg/fft"
)

func tstSum(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	return s
}

// Parseval's theorem: the spectra summed over the shells give the domain-mean
// energies of qg.Energy (KE = ½Σ W_n⟨|∇ψ_n|²⟩, APE = ½W1F1⟨(ψ1 − ψ2)²⟩,
// package qg), and the barotropic and baroclinic kinetic energies add up to
// the layers' (W1|a|² + W2|b|² = |W1a + W2b|² + W1W2|a − b|², by hand).
// The time-mean eddy spectra match the mean energy of the departures from
// the time mean, computed by the test with qg.Energy; a single mode of
// wavenumber 3·DK lands in shell 3.
func TestSpectraParseval(t *testing.T) {
	cfg := tstConfig(32, 32)
	cfg.Ly = 4e6 // a non-square domain: shells of 2π/Ly
	cfg.Delta = 0.5
	m := tstModel(t, cfg)
	g, ph := m.Grid(), m.Physics()
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{})
	rng := rand.New(rand.NewPCG(9, 10))
	const ns = 10
	var states [ns][2][]complex128
	for s := range ns {
		psi := tstRandomPsi(g, rng, 1e6, 10)
		tstSetPsi(t, m, plan, psi)
		setClock(t, m, float64(s))
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
		states[s] = clonePair(m.SpectralStreamfunction())
	}
	check := func(what string, sp Spectra, ke, ape float64) {
		t.Helper()
		gotKE := (ph.W1*tstSum(sp.KE[0]) + ph.W2*tstSum(sp.KE[1])) * sp.DK
		modes := (tstSum(sp.Barotropic) + tstSum(sp.BaroclinicKE)) * sp.DK
		gotAPE := tstSum(sp.APE) * sp.DK
		if math.Abs(gotKE-ke) > 1e-12*ke || math.Abs(modes-ke) > 1e-12*ke || math.Abs(gotAPE-ape) > 1e-12*ape {
			t.Errorf("%s: KE %.15g (modes %.15g) vs %.15g, APE %.15g vs %.15g", what, gotKE, modes, ke, gotAPE, ape)
		}
	}
	ke, ape := m.Energy()
	check("current state", SpectraOf(g, ph, m.SpectralStreamfunction()), ke, ape)

	mean := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	for s := range ns {
		addTo(mean, states[s])
	}
	var mke, mape float64
	for s := range ns {
		d := clonePair(states[s])
		for n := range 2 {
			for p := range d[n] {
				d[n][p] -= mean[n][p] / ns
			}
		}
		k, p := g.EnergyProduct(ph, d, d)
		mke += k / 2 / ns
		mape += p / 2 / ns
	}
	check("time-mean eddies", a.Spectra(), mke, mape)

	l := 2 * math.Pi * 3 / cfg.Ly // |k| = 3·DK: shell 3
	one := tstField(cfg, func(x, y float64) float64 { return 1e6 * math.Cos(l*y) })
	sp := SpectraOf(g, ph, tstSpectral(plan, g, [2][]float64{one, one}))
	top := tstMaxAbs(sp.KE[0])
	for b, v := range sp.KE[0] {
		if (b == 3) != (v > 1e-12*top) {
			t.Errorf("single mode at 3·DK: shell %d holds %g", b, v)
		}
	}
}
