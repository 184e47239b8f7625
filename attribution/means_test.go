package attribution_test

import (
	"context"
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

// runToDir runs c with its files written into dir and returns the finished
// experiment (its model closed).
func runToDir(t *testing.T, c experiment.Config, dir string) *experiment.Experiment {
	t.Helper()
	r, err := output.Prepare(c, output.Options{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if err := r.Execute(context.Background()); err != nil {
		t.Fatal(err)
	}
	return r.Experiment()
}

// TestFromMeansMatchesMemory checks the route from a run's NetCDF means
// against the one from memory, on the deterministic wave-train experiment
// (whose F̄, the mean of the wave train at the window's sample times, the
// file route must rebuild from the configuration): every field agrees to
// 1e-10 relative (the file holds the diagnostics' fields in double
// precision; common practice: a round trip through a lossless format).
func TestFromMeansMatchesMemory(t *testing.T) {
	c := experiment.Default()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 20, 5, 2
	dir := filepath.Join(t.TempDir(), "run")
	e := runToDir(t, c, dir)
	mem, err := attribution.FromExperiment(e)
	if err != nil {
		t.Fatal(err)
	}
	file, err := attribution.FromMeans(filepath.Join(dir, output.MeansFile))
	if err != nil {
		t.Fatal(err)
	}
	if file.Samples != mem.Samples || file.StartDay != mem.StartDay || file.EndDay != mem.EndDay {
		t.Errorf("window: file %d samples, days %g–%g; memory %d, %g–%g", file.Samples, file.StartDay, file.EndDay, mem.Samples, mem.StartDay, mem.EndDay)
	}
	for _, f := range []struct {
		name string
		a, b [2][]complex128
	}{
		{"q̄", file.Mean, mem.Mean}, {"H", file.H, mem.H}, {"C̄", file.Eddy, mem.Eddy},
		{"F̄", file.External, mem.External}, {"R", file.Residual, mem.Residual},
	} {
		var d, s float64
		for n := range 2 {
			for p := range f.a[n] {
				x := f.a[n][p] - f.b[n][p]
				d += real(x)*real(x) + imag(x)*imag(x)
				s += real(f.b[n][p])*real(f.b[n][p]) + imag(f.b[n][p])*imag(f.b[n][p])
			}
		}
		if s == 0 {
			t.Fatalf("%s is zero: the check would prove nothing", f.name)
		}
		if r := math.Sqrt(d / s); r > 1e-10 {
			t.Errorf("%s from the file differs from memory by %.3g relative", f.name, r)
		}
	}
}

// TestFromMeansRefusesFixedMode checks that the means of a fixed-mode run
// are refused with the reason, and a file without a configuration with a
// message saying so.
func TestFromMeansRefusesFixedMode(t *testing.T) {
	c := experiment.Default()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 2, 1, 2
	c.Block.Mode = qg.Fixed
	dir := filepath.Join(t.TempDir(), "run")
	runToDir(t, c, dir)
	if _, err := attribution.FromMeans(filepath.Join(dir, output.MeansFile)); !errors.Is(err, attribution.ErrFixedMode) {
		t.Errorf("FromMeans of a fixed-mode run: %v, want ErrFixedMode", err)
	}
	bare := filepath.Join(t.TempDir(), "bare.nc")
	w, err := netcdf.Create(bare, netcdf.Header{Format: netcdf.Classic, Dims: []netcdf.Dim{{Name: "x", Len: 2}},
		Vars: []netcdf.Var{{Name: "x", Type: netcdf.Double, Dims: []string{"x"}}}})
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if _, err := attribution.FromMeans(bare); err == nil || !strings.Contains(err.Error(), "no configuration attribute") {
		t.Errorf("FromMeans of a file without a configuration: %v", err)
	}
}
