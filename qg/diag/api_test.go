package diag

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// Bad options and out-of-order samples get errors naming the problem.
func TestOptionsAndSampleErrors(t *testing.T) {
	cfg := tstConfig(16, 16)
	m := tstModel(t, cfg)
	for _, c := range []struct {
		opt  Options
		want string
	}{
		{Options{Norm: "l2"}, "Norm"},
		{Options{Spinup: -1}, "Spinup"},
		{Options{Spinup: math.NaN()}, "Spinup"},
		{Options{Bins: -3}, "Bins"},
		{Options{Pattern: [2][]float64{make([]float64, 5), make([]float64, 5)}}, "Pattern"},
		{Options{Pattern: [2][]float64{make([]float64, 256), make([]float64, 256)}}, "zero"},
	} {
		_, err := New(m, c.opt)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(%+v): error %v, want one naming %q", c.opt, err, c.want)
		}
	}
	if _, err := New(nil, Options{}); err == nil {
		t.Error("New(nil): no error")
	}
	a := tstNew(t, m, Options{})
	if err := a.Sample(); err != nil {
		t.Fatal(err)
	}
	if err := a.Sample(); err == nil || !strings.Contains(err.Error(), "not after") {
		t.Errorf("a second sample at the same time: error %v", err)
	}
}

// A run without a block still gives fluxes, spectra and energetics, a
// Summary that encodes as JSON (no NaN or Inf) and prints; with a pattern
// given as an option, the projections are there.
func TestSummaryWithoutBlock(t *testing.T) {
	for _, withPattern := range []bool{false, true} {
		m, cfg := tstForcedRun(t, 16, 16)
		opt := Options{Spinup: 2 * day}
		if withPattern {
			d := tstDipole(cfg, 1e7, 1e6, 1.4e6, 4e6, 4e6)
			opt.Pattern = [2][]float64{d, d}
		}
		a := tstNew(t, m, opt)
		if s := a.Summary(); s.Samples != 0 || len(s.Notes) == 0 {
			t.Errorf("empty accumulator: %+v", s)
		}
		for range int(6 * day / cfg.Dt) {
			if err := m.Step(); err != nil {
				t.Fatal(err)
			}
			if err := a.Sample(); err != nil {
				t.Fatal(err)
			}
		}
		s := a.Summary()
		b, err := json.Marshal(s)
		if err != nil {
			t.Fatalf("json: %v", err)
		}
		var back Summary
		if err := json.Unmarshal(b, &back); err != nil || back.Samples != s.Samples || back.Eddy != s.Eddy {
			t.Errorf("JSON round trip: %v, %+v", err, back)
		}
		str := s.String()
		if s.HasPattern != withPattern || strings.Contains(str, "vorticity flux") != withPattern {
			t.Errorf("pattern %v: HasPattern %v, report:\n%s", withPattern, s.HasPattern, str)
		}
		if withPattern && (s.Eddy.Rate == 0 || s.Index.N != s.Samples) {
			t.Errorf("with a pattern: eddy rate %g, index samples %d of %d", s.Eddy.Rate, s.Index.N, s.Samples)
		}
		f := a.Fields()
		if _, ok := f.Get("conv1"); !ok || len(f.List) < 30 {
			t.Errorf("fields: %v", f.Names())
		}
		if got := len(a.Series().Time); got != int(6*day/cfg.Dt) {
			t.Errorf("series has %d samples", got)
		}
		if sp := a.Spectra(); tstSum(sp.KE[0]) == 0 {
			t.Error("empty eddy spectrum")
		}
	}
}

// The histogram of the Summary is that of the block index, and the episodes
// agree with Episodes on the series.
func TestSummaryIndexConsistent(t *testing.T) {
	m, cfg := tstForcedRun(t, 16, 16)
	d := tstDipole(cfg, 1e7, 1e6, 1.4e6, 4e6, 4e6)
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{d, d}, Mode: qg.Relaxed, RelaxTime: 5 * day}); err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{Spinup: day, Bins: 7})
	for range int(5 * day / cfg.Dt) {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
	}
	s := a.Summary()
	ser := a.Series()
	x := ser.Index[ser.WindowStart:]
	if len(x) != s.Samples || len(s.Index.Histogram.Counts) != 7 {
		t.Fatalf("window of %d samples, summary %d; %d bins", len(x), s.Samples, len(s.Index.Histogram.Counts))
	}
	if e := a.Episodes(s.Index.Threshold); len(e) != s.Index.Episodes {
		t.Errorf("Episodes: %d, summary %d", len(e), s.Index.Episodes)
	}
	if s.Maintenance == 0 {
		t.Error("relaxed mode: no maintenance")
	}
}

// EddyForcing gives the conv and zt fields of Fields.
func TestEddyForcingMatchesFields(t *testing.T) {
	m, cfg := tstForcedRun(t, 16, 16)
	a := tstNew(t, m, Options{})
	np := cfg.Nx * cfg.Ny
	conv := [2][]float64{make([]float64, np), make([]float64, np)}
	zt := [2][]float64{make([]float64, np), nil}
	for range 100 {
		if err := m.Step(); err != nil {
			t.Fatal(err)
		}
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
	}
	if err := a.EddyForcing(conv, zt); err != nil {
		t.Fatal(err)
	}
	f := a.Fields()
	for name, got := range map[string][]float64{"conv1": conv[0], "conv2": conv[1], "zt1": zt[0]} {
		want := tstGet(t, f, name)
		sc := tstMaxAbs(want)
		for i := range want {
			if sc == 0 || math.Abs(got[i]-want[i]) > 1e-12*sc {
				t.Fatalf("%s at %d: %g, Fields %g", name, i, got[i], want[i])
			}
		}
	}
	if err := a.EddyForcing([2][]float64{make([]float64, 3), nil}, [2][]float64{}); err == nil {
		t.Error("a wrong size: no error")
	}
}
