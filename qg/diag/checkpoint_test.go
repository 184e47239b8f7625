package diag

import (
	"bytes"
	"encoding/json"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// An accumulator restored from the state of another one, mid-run, goes on
// to the same summary and series, bit for bit, as the one that was not
// interrupted (restart files continue a run exactly, common practice);
// state from another grid or other options, or damaged data, is refused
// with an error naming the difference and leaves the accumulator as it was.
func TestAccumulatorStateRoundTrip(t *testing.T) {
	cfg := tstConfig(32, 32)
	cfg.U1, cfg.U2 = 12, 4 // baroclinically unstable: the state evolves
	run := func(m *qg.Model, a *Accumulator, steps int) {
		t.Helper()
		for range steps {
			if err := m.Step(); err != nil {
				t.Fatal(err)
			}
			if err := a.Sample(); err != nil {
				t.Fatal(err)
			}
		}
	}
	pat := tstDipole(cfg, 1e7, 1e6, 2e6, cfg.Lx/2, cfg.Ly/2)
	opt := Options{Spinup: 5 * cfg.Dt, Pattern: [2][]float64{pat, pat}}
	m := tstModel(t, cfg)
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	tstSetPsi(t, m, plan, tstRandomPsi(m.Grid(), rand.New(rand.NewPCG(1, 2)), 1e6, 5))
	a := tstNew(t, m, opt)
	run(m, a, 12)
	ck := m.Checkpoint()
	state, err := a.MarshalBinary()
	if err != nil {
		t.Fatal(err)
	}
	run(m, a, 12)

	m2 := tstModel(t, cfg)
	if err := m2.Restore(ck); err != nil {
		t.Fatal(err)
	}
	a2 := tstNew(t, m2, opt)
	if err := a2.UnmarshalBinary(state); err != nil {
		t.Fatal(err)
	}
	run(m2, a2, 12)
	want, _ := json.Marshal(struct {
		S Summary
		T Series
	}{a.Summary(), a.Series()})
	got, _ := json.Marshal(struct {
		S Summary
		T Series
	}{a2.Summary(), a2.Series()})
	if !bytes.Equal(got, want) {
		t.Errorf("restored accumulator's summary and series differ from the uninterrupted one's")
	}
	if s := a.Summary(); !(s.Index.Std > 0) || a.Samples() != 20 {
		t.Fatalf("the test run does not exercise the diagnostics: %d samples, index std %g", a.Samples(), s.Index.Std)
	}

	other := cfg
	other.Nx, other.Ny = 16, 16
	for _, c := range []struct {
		name string
		m    *qg.Model
		opt  Options
		data []byte
		want string
	}{
		{"grid", tstModel(t, other), Options{Spinup: opt.Spinup}, state, "grid"},
		{"spin-up", m2, Options{Pattern: opt.Pattern}, state, "spin-up"},
		{"norm", m2, Options{Spinup: opt.Spinup, Pattern: opt.Pattern, Norm: LayerNorm}, state, "norm"},
		{"transient", m2, Options{Spinup: opt.Spinup, Pattern: opt.Pattern, Transient: true}, state, "Transient"},
		{"damaged", m2, opt, state[:len(state)/2], "decoding"},
	} {
		b := tstNew(t, c.m, c.opt)
		before := b.Samples()
		err := b.UnmarshalBinary(c.data)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one naming %q", c.name, err, c.want)
		}
		if b.Samples() != before {
			t.Errorf("%s: a refused state changed the accumulator", c.name)
		}
	}
}
