package output

import (
	"bytes"
	"context"
	"encoding/json"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sync"
	"testing"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// smallAttribution returns the built-in attribution experiment run on a
// coarse grid for a few months (a few seconds), run once for all the tests
// that read its files.
var smallAttribution = func() func(t *testing.T) *attribution.Result {
	var once sync.Once
	var r *attribution.Result
	var err error
	return func(t *testing.T) *attribution.Result {
		t.Helper()
		once.Do(func() {
			c := attribution.Builtin()
			c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
			c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 80, 30, 2
			r, err = attribution.Run(context.Background(), c, attribution.Options{})
		})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
}()

// attributionDir writes a small attribution experiment with its figures
// into a new directory and returns the directory and the result.
func attributionDir(t *testing.T) (string, *attribution.Result) {
	t.Helper()
	r := smallAttribution(t)
	dir := filepath.Join(t.TempDir(), "attr")
	o, err := PrepareAttribution(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer o.Close()
	if err := o.Write(r, true); err != nil {
		t.Fatal(err)
	}
	return dir, r
}

// checkLayered checks that every per-layer field of f reads back from the
// (layer, y, x) variable of the file with its base name, value for value
// (double precision: exact), with its units and the CF attributes.
func checkLayered(t *testing.T, path string, f diag.Fields) {
	t.Helper()
	nc, err := netcdf.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer nc.Close()
	if a, ok := nc.Attr("Conventions"); !ok || a.Value != "CF-1.10" {
		t.Errorf("%s: Conventions %v", filepath.Base(path), a.Value)
	}
	if a, ok := nc.Attr("comment"); !ok || a.Value != Caution {
		t.Errorf("%s: no caution", filepath.Base(path))
	}
	if _, ok := nc.Attr("configuration"); !ok {
		t.Errorf("%s: no configuration", filepath.Base(path))
	}
	n := 0
	for _, x := range f.List {
		base, layer := splitLayer(x.Name)
		v, err := nc.ReadFloat64(base)
		if err != nil {
			t.Errorf("%s: %s: %v", filepath.Base(path), base, err)
			continue
		}
		np := len(x.Data)
		got := v[(layer-1)*np : layer*np]
		for i := range got {
			if got[i] != x.Data[i] {
				t.Fatalf("%s: %s at %d reads %v, the library has %v", filepath.Base(path), x.Name, i, got[i], x.Data[i])
			}
		}
		va, _ := nc.Var(base)
		if u, ok := va.Attr("units"); !ok || u.Value != x.Units {
			t.Errorf("%s: %s has units %v, want %q", filepath.Base(path), base, u.Value, x.Units)
		}
		n++
	}
	if n == 0 {
		t.Errorf("%s: no fields checked", filepath.Base(path))
	}
}

// TestAttributionFilesRoundTrip checks that every field of an attribution
// experiment's NetCDF files reads back as the library computed it
// (common practice: a lossless round trip), that the summary and the
// configuration read back, and that every figure decodes as PNG at its
// size.
func TestAttributionFilesRoundTrip(t *testing.T) {
	dir, r := attributionDir(t)
	f, err := r.Fields()
	if err != nil {
		t.Fatal(err)
	}
	checkLayered(t, filepath.Join(dir, AttributionFile), f)
	for _, x := range []struct {
		file string
		mf   *attribution.MeanForcing
	}{{ControlForcingFile, r.Control}, {AnomalyForcingFile, r.Perturbed}} {
		mf, err := x.mf.Fields()
		if err != nil {
			t.Fatal(err)
		}
		checkLayered(t, filepath.Join(dir, x.file), mf)
	}
	b, err := os.ReadFile(filepath.Join(dir, SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	var s attribution.Summary
	if err := json.Unmarshal(b, &s); err != nil {
		t.Fatal(err)
	}
	if want := r.Summary(); s.Linear != want.Linear || s.LinearEddy != want.LinearEddy || s.Noise.RMS != want.Noise.RMS {
		t.Errorf("summary.json reads %+v, the library has %+v", s, want)
	}
	c, err := attribution.Load(filepath.Join(dir, ConfigFile))
	if err != nil {
		t.Fatal(err)
	}
	if c.Anomaly != r.Config.Anomaly || c.Run != r.Config.Run || c.Model != r.Config.Model {
		t.Errorf("config.toml reads back as another configuration")
	}
	for _, name := range AttributionFigureNames() {
		fb, err := os.ReadFile(filepath.Join(dir, FiguresDir, name))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(bytes.NewReader(fb))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if w := img.Bounds().Dx(); w != panelsSize.Width && w != 1400 {
			t.Errorf("%s is %d pixels wide", name, w)
		}
	}
}

// TestAttributionNcdump runs Unidata's ncdump (Debian netcdf-bin) over the
// NetCDF files of an attribution experiment: the format (-k), the header
// (-h, CF-1.10) and all the data.
func TestAttributionNcdump(t *testing.T) {
	ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
	dir, _ := attributionDir(t)
	ncdumpEvery(t, ncdump, dir, AttributionFile, ControlForcingFile, AnomalyForcingFile)
}

// TestAttributionXarray opens the files with xarray through the netCDF4
// engine (Debian's python3-xarray and python3-netcdf4) and compares values
// it reads with the library's.
func TestAttributionXarray(t *testing.T) {
	py := testenv.File(t, "/usr/bin/python3", "Debian python3 with python3-xarray and python3-netcdf4")
	dir, r := attributionDir(t)
	script := `
import json, sys
try:
    import xarray as xr
    import netCDF4
except ImportError as err:
    print("MISSING", err); sys.exit(3)
d = sys.argv[1]
a = xr.open_dataset(d + "/attribution.nc", engine="netcdf4")
c = xr.open_dataset(d + "/control_forcing.nc", engine="netcdf4")
print(json.dumps({
  "b": float(a["height_linear"].sel(layer=1).isel(y=16, x=40)),
  "c": float(a["height_linear_eddy"].sel(layer=2).isel(y=10, x=20)),
  "h": float(c["mean_state_forcing"].sel(layer=1).isel(y=16, x=35)),
  "units": a["height_nonlinear"].attrs["units"],
  "corr": float(a.attrs["pattern_correlation_linear_eddy"]),
  "caution": c.attrs["comment"],
}))
`
	out, err := exec.Command(py, "-c", script, dir).CombinedOutput()
	if ee, ok := err.(*exec.ExitError); ok && ee.ExitCode() == 3 {
		if testenv.Full() {
			t.Fatalf("MISSING TOOL: %s", out)
		}
		t.Skipf("MISSING TOOL: %s", out)
	}
	if err != nil {
		t.Fatalf("python: %v\n%s", err, out)
	}
	var got struct {
		B, C, H, Corr  float64
		Units, Caution string
	}
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("python printed %s: %v", out, err)
	}
	f, _ := r.Fields()
	mf, _ := r.Control.Fields()
	g := r.Grid()
	at := func(fs diag.Fields, name string, y, x int) float64 { v, _ := fs.Get(name); return v.Data[y*g.Nx+x] }
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"height_linear, upper layer", got.B, at(f, "height_linear1", 16, 40)},
		{"height_linear_eddy, lower layer", got.C, at(f, "height_linear_eddy2", 10, 20)},
		{"mean_state_forcing, upper layer", got.H, at(mf, "mean_state_forcing1", 16, 35)},
		{"pattern correlation of (c)", got.Corr, r.ScoreLinearEddy.Correlation},
	} {
		if math.Abs(c.got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("xarray reads %s = %v, the library has %v", c.name, c.got, c.want)
		}
	}
	if got.Units != "m" || got.Caution != Caution {
		t.Errorf("xarray reads units %q, caution %q", got.Units, got.Caution)
	}
}

// TestAttributionKeepsRunsOnFailure checks that WriteRuns keeps the runs'
// files in the staging directory and leaves an existing output directory
// as it was.
func TestAttributionKeepsRunsOnFailure(t *testing.T) {
	r := smallAttribution(t)
	dir := filepath.Join(t.TempDir(), "attr")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	old := filepath.Join(dir, "previous.txt")
	if err := os.WriteFile(old, []byte("kept"), 0o644); err != nil {
		t.Fatal(err)
	}
	o, err := PrepareAttribution(dir)
	if err != nil {
		t.Fatal(err)
	}
	stage, err := o.WriteRuns(r)
	if err != nil {
		t.Fatal(err)
	}
	o.Close()
	for _, f := range []string{ControlForcingFile, AnomalyForcingFile, ConfigFile} {
		if _, err := os.Stat(filepath.Join(stage, f)); err != nil {
			t.Errorf("the staging directory lacks %s: %v", f, err)
		}
	}
	if b, err := os.ReadFile(old); err != nil || string(b) != "kept" {
		t.Errorf("the previous output directory was touched: %v", err)
	}
}
