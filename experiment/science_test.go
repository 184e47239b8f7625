package experiment

import (
	"context"
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// runExperiment runs c to its end and returns the summary.
func runExperiment(t *testing.T, c Config) (*Experiment, diag.Summary) {
	t.Helper()
	e, err := New(c)
	if err != nil {
		t.Fatal(err)
	}
	if err := e.Run(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	s := e.Summary()
	t.Logf("%s:\n%s", c.Name, s)
	return e, s
}

// fit projects the gridded streamfunction tendency named name (layers
// name1, name2 of the diagnostics' fields) on the block in the given inner
// product.
func fit(t *testing.T, e *Experiment, name string, norm diag.Norm) diag.Projection {
	t.Helper()
	f := e.Diag.Fields()
	m := e.Model
	g := m.Grid()
	plan, err := fft.NewPlan2D(g.Nx, g.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	var x [2][]complex128
	for n, suffix := range []string{"1", "2"} {
		fl, ok := f.Get(name + suffix)
		if !ok {
			t.Fatalf("no field %s%s", name, suffix)
		}
		x[n] = make([]complex128, g.Len())
		plan.Forward(x[n], fl.Data)
		for p := range x[n] {
			x[n][p] *= complex(g.Keep(p), 0)
		}
	}
	pb, _ := m.BlockStreamfunction()
	return diag.Fit(g, m.Physics(), norm, x, pb)
}

// checkBudget checks the energy budget of a finished experiment.
func checkBudget(t *testing.T, s diag.Summary) {
	t.Helper()
	// Energy budget of the model: every term is booked, so the
	// change of energy over the averaging window equals the time integral
	// of the budget terms; the ledger's quadrature is exact to the scheme's
	// O(dt⁴) error, so 1e-4 of the throughput is a loose bound.
	en := s.Energy
	if en.ClosureError > 1e-4 {
		t.Errorf("energy budget closes to %.3g of the throughput, want < 1e-4", en.ClosureError)
	}
	// Statistical steady state after the spin-up: the sources (injection
	// or the wave maker's work, conversion from the shear, work of the
	// block's steady forcing) balance the sinks (drag, scale-selective
	// dissipation, sponge) within 5 % (issue requirement; energy budget of
	// the model).
	var src, sink float64
	for name, r := range en.Rates {
		switch name {
		case qg.TermDrag.String(), qg.TermScaleSelective.String(), qg.TermSponge.String():
			sink += r
		default:
			src += r
		}
	}
	if imb := math.Abs(src+sink) / -sink; imb > 0.05 {
		t.Errorf("sources %.4g and sinks %.4g m² s⁻³ differ by %.1f %%, want < 5 %%", src, sink, 100*imb)
	}
	t.Logf("sources %.4g, sinks %.4g m² s⁻³ (imbalance %.2f %%), closure %.2g", src, sink, 100*math.Abs(src+sink)/-sink, en.ClosureError)
}

// TestDefaultExperiment runs the built-in experiment to its end and checks
// its energy budget and what its eddies do to the block.
func TestDefaultExperiment(t *testing.T) {
	testenv.Long(t) // runs the full default experiment (about two minutes)
	t.Parallel()
	c := Default()
	if c.Diag.Norm != diag.LayerNorm {
		t.Fatalf("the default experiment projects in the %q norm; the checks below are for the ψ inner product", c.Diag.Norm)
	}
	e, s := runExperiment(t, c)
	checkBudget(t, s)

	// A train of synoptic waves strained in the block's diffluent entrance
	// reinforces the block through its vorticity fluxes, with a forcing
	// pattern like the block's own (Shutts 1983, Q. J. R. Meteorol. Soc.
	// 109; the E-vector view: Hoskins, James & White 1983, J. Atmos. Sci.
	// 40): in the plain ψ inner product, the
	// projection is positive and the pattern correlation above 0.5 (issue
	// requirement), and the forced block's time mean is stronger than the
	// block as prescribed.
	if r := s.EddyVorticity.Rate; !(r > 0) {
		t.Errorf("vorticity-flux projection %+.4f day⁻¹: the eddies do not reinforce the block", r)
	}
	if c := s.EddyVorticity.Correlation; !(c > 0.5) {
		t.Errorf("vorticity-flux pattern correlation %+.3f, want > 0.5", c)
	}
	if m := s.Index.Mean; !(m > 1) {
		t.Errorf("mean block index %.3f, want > 1 (the eddies strengthen the forced block)", m)
	}
	// The interface (heat) fluxes act against the block's thermal anomaly,
	// the baroclinic part ψ1 − ψ2 of its pattern (Hoskins, James & White
	// 1983; Shutts 1983).
	if b := s.EddyInterface.Baroclinic; !(b < 0) {
		t.Errorf("interface-flux projection on the block's baroclinic part %+.4f day⁻¹, want < 0 (erosion of the thermal anomaly)", b)
	}
	// In the energy inner product, which weights the smaller scales more,
	// the vorticity-flux tendency reinforces the block too.
	checkEnergyFit(t, e)
}

// checkEnergyFit checks that the vorticity-flux tendency projects positively
// on the block in the energy inner product too, and logs its correlation.
func checkEnergyFit(t *testing.T, e *Experiment) {
	t.Helper()
	ep := fit(t, e, "psit_vort", diag.EnergyNorm)
	t.Logf("vorticity-flux tendency in the energy inner product: %+.4f day⁻¹, correlation %+.3f", ep.Rate, ep.Correlation)
	if !(ep.Rate > 0 && ep.Correlation > 0) {
		t.Errorf("in the energy inner product the vorticity-flux tendency projects %+.4f day⁻¹ (correlation %+.3f), want > 0", ep.Rate, ep.Correlation)
	}
}

// TestStochasticSourceErodes is the control of TestDefaultExperiment: the
// same place and the same mean power, but incoherent stirring (white noise
// over wavelengths of 1000–2500 km) instead of a coherent wave train. The
// stirred region's eddy-driven westerlies (the westerly acceleration of a
// stirred region on the β-plane, common practice; Hoskins, James & White
// 1983 for the E-vector view of the same fluxes) fill the easterlies
// between the lobes and erode the block.
func TestStochasticSourceErodes(t *testing.T) {
	testenv.Long(t) // runs a 60-day experiment
	t.Parallel()
	c := WhiteNoiseControl()
	c.Run.Days, c.Run.SpinUpDays = 60, 20
	_, s := runExperiment(t, c)
	if r := s.EddyVorticity.Rate; !(r < 0) {
		t.Errorf("vorticity-flux projection %+.4f day⁻¹, want < 0 (erosion)", r)
	}
	if m := s.Index.Mean; !(m < 1) {
		t.Errorf("mean block index %.3f, want < 1", m)
	}
}

// TestStormTrack runs the built-in stochastic storm track that ends at the
// block, running along the two branches of the split flow: its eddies
// reinforce the block through their vorticity fluxes, less cleanly than
// the wave train (their eddy-driven jets along each branch put a dipole
// across it, and only its inner half lies on a lobe), and their heat fluxes
// erode its thermal anomaly (Shutts 1983; Hoskins, James & White 1983).
func TestStormTrack(t *testing.T) {
	testenv.Long(t) // runs a 120-day experiment
	t.Parallel()
	e, s := runExperiment(t, StormTrack())
	checkBudget(t, s)
	if r, c := s.EddyVorticity.Rate, s.EddyVorticity.Correlation; !(r > 0 && c > 0) {
		t.Errorf("vorticity-flux projection %+.4f day⁻¹ (correlation %+.3f), want > 0", r, c)
	}
	if m := s.Index.Mean; !(m > 1) {
		t.Errorf("mean block index %.3f, want > 1", m)
	}
	if b := s.EddyInterface.Baroclinic; !(b < 0) {
		t.Errorf("interface-flux projection on the block's baroclinic part %+.4f day⁻¹, want < 0", b)
	}
	checkEnergyFit(t, e)
}
