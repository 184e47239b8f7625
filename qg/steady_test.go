package qg

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSteadyForcingHoldsState checks the defining property of the
// mean-state forcing H = −N(q̄) (common practice in the attribution of
// eddy feedbacks: the forcing that makes a time-mean state an exact steady
// state of the model without eddies): a model started from q̄ and driven
// by H does not move — relative change below 1e-9 over 1000 steps — with
// every term active (nonlinear advection, shear, β, drag, the cutoff
// filter or hyperviscosity, the sponge, a forced block), with RK4 and AB3
// and with one or two workers. Without H the same state moves at once.
func TestSteadyForcingHoldsState(t *testing.T) {
	for _, tc := range []struct {
		name    string
		scheme  Scheme
		kind    ScaleSelectiveKind
		workers int
	}{
		{"rk4+filter", RK4, CutoffFilter, 1},
		{"ab3+filter", AB3, CutoffFilter, 2},
		{"rk4+hyperviscosity", RK4, Hyperviscosity, 2},
	} {
		m := benchModel(t, 32, tc.workers, tc.scheme)
		c := m.Config()
		if tc.kind == Hyperviscosity {
			c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Viscosity: 5e12, Order: 2}
		}
		c.Drag = 1 / (4 * 86400.0)
		m, err := NewModel(c)
		if err != nil {
			t.Fatal(err)
		}
		// a forced block, then a state that is the block plus small-scale
		// noise (the filter and the sponge act on it)
		g := m.Grid()
		blk := [2][]float64{make([]float64, g.Points()), make([]float64, g.Points())}
		for y := range g.Ny {
			for x := range g.Nx {
				d := math.Hypot(PeriodicDistance(g.X(x), g.Lx/2, g.Lx), PeriodicDistance(g.Y(y), g.Ly/2, g.Ly)) / (g.Lx / 8)
				blk[0][y*g.Nx+x] = 1e6 * math.Exp(-d*d)
				blk[1][y*g.Nx+x] = 6e5 * math.Exp(-d*d)
			}
		}
		if err := m.SetBlock(Block{Psi: blk, Mode: Forced}); err != nil {
			t.Fatal(err)
		}
		q := m.Checkpoint().Q
		noise := randomPV(g, 2e-6, rand.New(rand.NewPCG(3, 4)))
		for n := range 2 {
			for p := range q[n] {
				q[n][p] += noise[n][p]
			}
		}
		if err := m.SetSpectralPV(q); err != nil {
			t.Fatal(err)
		}
		q0 := m.Checkpoint().Q
		sf, err := m.SteadyForcing(q0)
		if err != nil {
			t.Fatal(err)
		}
		if d := relDiff(m.SpectralPV(), q0); d != 0 {
			t.Fatalf("%s: SteadyForcing changed the model's state (%.3g)", tc.name, d)
		}
		// without H the state moves
		free := m.Checkpoint()
		if err := m.Run(10); err != nil {
			t.Fatal(err)
		}
		if d := relDiff(m.SpectralPV(), q0); d < 1e-6 {
			t.Fatalf("%s: the state without H moved by only %.3g: the test would prove nothing", tc.name, d)
		}
		if err := m.Restore(free); err != nil {
			t.Fatal(err)
		}
		if err := sf.Attach(m); err != nil {
			t.Fatal(err)
		}
		if err := m.Run(1000); err != nil {
			t.Fatal(err)
		}
		if d := relDiff(m.SpectralPV(), q0); d > 1e-9 {
			t.Errorf("%s: relative change %.3g over 1000 steps with H, want < 1e-9", tc.name, d)
		} else {
			t.Logf("%s: relative change %.2g over 1000 steps", tc.name, d)
		}
		m.Close()
	}
}

// TestSteadyForcingRefusesOtherModel checks Attach against a model of
// another configuration.
func TestSteadyForcingRefusesOtherModel(t *testing.T) {
	m := benchModel(t, 32, 1, RK4)
	sf, err := m.SteadyForcing(m.Checkpoint().Q)
	if err != nil {
		t.Fatal(err)
	}
	c := m.Config()
	c.Drag *= 2
	o, err := NewModel(c)
	if err != nil {
		t.Fatal(err)
	}
	if err := sf.Attach(o); err == nil {
		t.Error("a steady forcing attached to a model with another drag")
	}
}

// relDiff is ‖a − b‖/‖b‖ over both layers.
func relDiff(a, b [2][]complex128) float64 {
	var num, den float64
	for n := range 2 {
		for p := range a[n] {
			d := a[n][p] - b[n][p]
			num += real(d)*real(d) + imag(d)*imag(d)
			den += real(b[n][p])*real(b[n][p]) + imag(b[n][p])*imag(b[n][p])
		}
	}
	return math.Sqrt(num / den)
}
