package output

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/output/netcdf"
)

// childVar makes the test binary run smallConfig into the directory it
// names, resumably (see TestKilledRunRestartsToSameBytes).
const childVar = "EDDYBLOCK_OUTPUT_CHILD"

func TestMain(m *testing.M) {
	if dir := os.Getenv(childVar); dir != "" {
		r, err := Prepare(smallConfig(1), Options{Dir: dir, Resume: true})
		if err == nil {
			err = r.Execute(context.Background())
			r.Close()
		}
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// smallConfig is the default experiment on a coarse grid for a few days,
// with a snapshot every snapSteps steps.
func smallConfig(snapSteps int) experiment.Config {
	c := experiment.Default()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.ReportDays, c.Run.SampleSteps = 6, 1, 0.5, 2
	c.Run.SnapshotDays = float64(snapSteps) * c.Model.Dt / 86400
	return c
}

// runTo runs c into dir and returns the finished experiment (closed).
func runTo(t *testing.T, c experiment.Config, dir string, plot bool) *experiment.Experiment {
	t.Helper()
	r, err := Prepare(c, Options{Dir: dir, Plot: plot})
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if err := r.Execute(context.Background()); err != nil {
		t.Fatal(err)
	}
	return r.Experiment()
}

// TestFilesHoldTheLibrarysValues reads every NetCDF file back with the
// package's reader and compares it with the values the library computed:
// means.nc with diag.Fields (exactly: both are float64), series.nc with
// diag.Series, the last record of snapshots.nc with the model's final
// state (rounded to float32, IEEE 754). The round trip through the
// reader is checked against the writer's input (common practice).
func TestFilesHoldTheLibrarysValues(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	e := runTo(t, smallConfig(12), dir, false)
	mf, err := netcdf.Open(filepath.Join(dir, MeansFile))
	if err != nil {
		t.Fatal(err)
	}
	defer mf.Close()
	fields := e.Diag.Fields()
	np := e.Model.Grid().Points()
	checked := 0
	for _, f := range fields.List {
		base, layer := splitLayer(f.Name)
		got, err := mf.ReadFloat64(base)
		if err != nil {
			t.Fatalf("means.nc: %v", err)
		}
		if layer > 0 {
			got = got[(layer-1)*np : layer*np]
		}
		for i := range f.Data {
			if got[i] != f.Data[i] {
				t.Fatalf("means.nc %s (layer %d) point %d: %v, diag.Fields has %v", base, layer, i, got[i], f.Data[i])
			}
		}
		v, _ := mf.Var(base)
		if u, _ := v.Attr("units"); u.Value != f.Units {
			t.Errorf("means.nc %s: units %v, want %q", base, u.Value, f.Units)
		}
		checked++
	}
	if checked < 40 {
		t.Errorf("compared %d fields, want every field of diag.Fields (over 40)", checked)
	}
	for _, name := range []string{"height_mean", "psi_block", "source_mask", "sponge_rate", "ke_spectrum"} {
		if _, ok := mf.Var(name); !ok {
			t.Errorf("means.nc lacks %s", name)
		}
	}
	if a, ok := mf.Attr("comment"); !ok || a.Value != Caution {
		t.Errorf("means.nc: comment %v, want the caution", a.Value)
	}
	if a, ok := mf.Attr("configuration"); !ok {
		t.Error("means.nc has no configuration attribute")
	} else if c, err := experiment.Decode(strings.NewReader(a.Value.(string)), experiment.Default()); err != nil || c.Model.Nx != 64 {
		t.Errorf("the configuration attribute does not read back: %v", err)
	}

	sf, err := netcdf.Open(filepath.Join(dir, SeriesNCFile))
	if err != nil {
		t.Fatal(err)
	}
	defer sf.Close()
	ser := e.Diag.Series()
	for name, want := range map[string][]float64{"time": ser.Day, "ke": ser.KE, "block_index": ser.Index, "rate_injection": ser.Rates["injection"]} {
		got, err := sf.ReadFloat64(name)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != len(want) {
			t.Fatalf("series.nc %s: %d values, want %d", name, len(got), len(want))
		}
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("series.nc %s[%d] = %v, want %v", name, i, got[i], want[i])
			}
		}
	}

	snap, err := netcdf.Open(filepath.Join(dir, SnapshotsFile))
	if err != nil {
		t.Fatal(err)
	}
	defer snap.Close()
	// 6 days of 24 steps, a snapshot every 12 steps and one at step 0
	if n := snap.NumRecs(); n != 6*24/12+1 {
		t.Errorf("snapshots.nc holds %d records, want %d", n, 6*24/12+1)
	}
	last := snap.NumRecs() - 1
	got, err := snap.ReadRecordFloat64("psi", last)
	if err != nil {
		t.Fatal(err)
	}
	psi := e.Model.Streamfunction()
	for n := range 2 {
		for i, v := range psi[n] {
			if got[n*np+i] != float64(float32(v)) {
				t.Fatalf("snapshots.nc last psi, layer %d point %d: %v, want float32(%v)", n+1, i, got[n*np+i], v)
			}
		}
	}
	tm, _ := snap.ReadRecordFloat64("time", last)
	if tm[0] != 6 {
		t.Errorf("last snapshot at day %v, want 6", tm[0])
	}
}

// TestNcdumpReadsEveryFile runs Unidata's ncdump (Debian netcdf-bin) over
// every NetCDF file of a run: the header (-h), the format (-k, the
// 64-bit offset variant of the classic format) and all the data.
func TestNcdumpReadsEveryFile(t *testing.T) {
	ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
	dir := filepath.Join(t.TempDir(), "out")
	runTo(t, smallConfig(12), dir, false)
	ncdumpEvery(t, ncdump, dir, MeansFile, SnapshotsFile, SeriesNCFile)
}

// ncdumpEvery runs ncdump -k, -h and with no option (all the data) over
// each named file in dir: each must be read, be the 64-bit offset format
// and declare the CF-1.10 conventions.
func ncdumpEvery(t *testing.T, ncdump, dir string, files ...string) {
	t.Helper()
	for _, f := range files {
		path := filepath.Join(dir, f)
		for _, args := range [][]string{{"-k"}, {"-h"}, {}} {
			out, err := exec.Command(ncdump, append(args, path)...).CombinedOutput()
			if err != nil {
				t.Fatalf("ncdump %v %s: %v\n%s", args, f, err, out)
			}
			if len(args) == 1 && args[0] == "-k" && strings.TrimSpace(string(out)) != "64-bit offset" {
				t.Errorf("ncdump -k %s: %q, want 64-bit offset", f, out)
			}
			if len(args) == 1 && args[0] == "-h" && !strings.Contains(string(out), `:Conventions = "CF-1.10"`) {
				t.Errorf("ncdump -h %s: no CF-1.10 Conventions attribute", f)
			}
		}
	}
}

// TestXarrayReadsEveryFile opens every NetCDF file with xarray through the
// netCDF4 engine (Debian's python3-xarray and python3-netcdf4, run by
// /usr/bin/python3) and compares values it reads with the library's.
func TestXarrayReadsEveryFile(t *testing.T) {
	py := testenv.File(t, "/usr/bin/python3", "Debian python3 with python3-xarray and python3-netcdf4")
	dir := filepath.Join(t.TempDir(), "out")
	e := runTo(t, smallConfig(12), dir, false)
	script := `
import json, sys
try:
    import xarray as xr
    import netCDF4
except ImportError as err:
    print("MISSING", err); sys.exit(3)
d = sys.argv[1]
m = xr.open_dataset(d + "/means.nc", engine="netcdf4")
s = xr.open_dataset(d + "/series.nc", engine="netcdf4")
p = xr.open_dataset(d + "/snapshots.nc", engine="netcdf4", decode_timedelta=False)
out = {
  "zt_upper": float(m["zt"].isel(layer=0, y=16, x=40)),
  "psi_block_lower": float(m["psi_block"].sel(layer=2).isel(y=20, x=35)),
  "psi_mean_units": m["psi_mean"].attrs["units"],
  "x_km": float(m["x_km"][10]),
  "caution": m.attrs["comment"],
  "ke_last": float(s["ke"][-1]),
  "n_snapshots": int(p.sizes["time"]),
  "snapshot_day": float(p["time"][-1]),
  "q_last": float(p["q"].isel(time=-1, layer=0, y=5, x=7)),
}
print(json.dumps(out))
`
	cmd := exec.Command(py, "-c", script, dir)
	out, err := cmd.CombinedOutput()
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
		ZtUpper, PsiBlockLower, XKm, KeLast, SnapshotDay, QLast float64
		PsiMeanUnits, Caution                                   string
		NSnapshots                                              int
	}
	dec := json.NewDecoder(bytes.NewReader(out))
	var raw map[string]any
	if err := dec.Decode(&raw); err != nil {
		t.Fatalf("python printed %s: %v", out, err)
	}
	got.ZtUpper, got.PsiBlockLower, got.XKm = raw["zt_upper"].(float64), raw["psi_block_lower"].(float64), raw["x_km"].(float64)
	got.KeLast, got.SnapshotDay, got.QLast = raw["ke_last"].(float64), raw["snapshot_day"].(float64), raw["q_last"].(float64)
	got.PsiMeanUnits, got.Caution = raw["psi_mean_units"].(string), raw["caution"].(string)
	got.NSnapshots = int(raw["n_snapshots"].(float64))

	f := e.Diag.Fields()
	g := e.Model.Grid()
	at := func(name string, y, x int) float64 { v, _ := f.Get(name); return v.Data[y*g.Nx+x] }
	b, _ := e.Model.BlockStreamfunction()
	bl := make([]float64, g.Points())
	e.Model.ToGrid(bl, b[1])
	q := e.Model.PV()
	ser := e.Diag.Series()
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"zt, upper layer", got.ZtUpper, at("zt1", 16, 40)},
		{"psi_block, lower layer", got.PsiBlockLower, bl[20*g.Nx+35]},
		{"x_km", got.XKm, g.X(10) / 1e3},
		{"ke, last sample", got.KeLast, ser.KE[len(ser.KE)-1]},
		{"last snapshot's day", got.SnapshotDay, 6},
		{"last snapshot's q (float32)", got.QLast, float64(float32(q[0][5*g.Nx+7]))},
	} {
		if math.Abs(c.got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("xarray reads %s = %v, the library has %v", c.name, c.got, c.want)
		}
	}
	if got.PsiMeanUnits != "m2 s-1" || got.Caution != Caution || got.NSnapshots != 13 {
		t.Errorf("xarray reads units %q, caution %q, %d snapshots", got.PsiMeanUnits, got.Caution, got.NSnapshots)
	}
}

// TestKilledRunRestartsToSameBytes kills a run with SIGKILL while it writes
// a snapshot at every step, checks that every file it left is readable by
// ncdump, resumes it from its checkpoint, and compares the finished files
// byte for byte with those of a run that was never interrupted (the model
// is deterministic, and the snapshot file is cut back to the checkpoint's
// time before the run continues).
func TestKilledRunRestartsToSameBytes(t *testing.T) {
	ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
	base := t.TempDir()
	ref := filepath.Join(base, "ref")
	r, err := Prepare(smallConfig(1), Options{Dir: ref, Resume: true})
	if err != nil {
		t.Fatal(err)
	}
	if err := r.Execute(context.Background()); err != nil {
		t.Fatal(err)
	}
	r.Close()

	killed := 0
	for attempt := range 6 {
		dir := filepath.Join(base, fmt.Sprintf("run%d", attempt))
		cmd := exec.Command(os.Args[0], "-test.run=^$")
		cmd.Env = append(os.Environ(), childVar+"="+dir)
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		// let it write a checkpoint and some more snapshots, then kill it
		ck := CheckpointIn(dir)
		deadline := time.Now().Add(30 * time.Second)
		for time.Now().Before(deadline) {
			if _, err := os.Stat(ck); err == nil {
				break
			}
			time.Sleep(2 * time.Millisecond)
		}
		time.Sleep(time.Duration(5+7*attempt) * time.Millisecond)
		cmd.Process.Signal(syscall.SIGKILL)
		err := cmd.Wait()
		if err == nil {
			continue // finished before the kill: try again
		}
		killed++
		stage := StagingDir(dir)
		if out, err := exec.Command(ncdump, filepath.Join(stage, SnapshotsFile)).CombinedOutput(); err != nil {
			t.Fatalf("attempt %d: ncdump of the killed run's snapshots.nc: %v\n%s", attempt, err, out[:min(len(out), 500)])
		}
		// resume as a re-run does
		cmd = exec.Command(os.Args[0], "-test.run=^$")
		cmd.Env = append(os.Environ(), childVar+"="+dir)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("attempt %d: resume: %v\n%s", attempt, err, out)
		}
		for _, f := range []string{SnapshotsFile, MeansFile, SeriesNCFile, SummaryFile, SeriesFile} {
			a, _ := os.ReadFile(filepath.Join(dir, f))
			b, _ := os.ReadFile(filepath.Join(ref, f))
			if len(a) == 0 || !bytes.Equal(a, b) {
				t.Errorf("attempt %d: %s of the resumed run differs from the uninterrupted run's (%d and %d bytes)", attempt, f, len(a), len(b))
			}
		}
	}
	if killed == 0 {
		t.Fatal("no run was killed before it finished")
	}
	t.Logf("%d runs killed while writing snapshots and resumed to the same bytes", killed)
}

// TestPlotWritesEveryFigure checks that every figure is written and
// decodes as a PNG of the promised size (the PNG specification, through
// image/png).
func TestPlotWritesEveryFigure(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	runTo(t, smallConfig(12), dir, true)
	sizes := map[string][2]int{
		"height.png": {figureSize.Width, figureSize.Height}, "eddy_forcing.png": {panelsSize.Width, panelsSize.Height},
		"evectors.png": {figureSize.Width, figureSize.Height}, "spectra.png": {lineSize.Width, lineSize.Height},
		"budget.png": {lineSize.Width, lineSize.Height}, "block_index.png": {lineSize.Width, lineSize.Height},
	}
	for _, name := range FigureNames() {
		f, err := os.Open(filepath.Join(dir, FiguresDir, name))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(f)
		f.Close()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if b := img.Bounds(); b.Dx() != sizes[name][0] || b.Dy() != sizes[name][1] {
			t.Errorf("%s is %d×%d, want %d×%d", name, b.Dx(), b.Dy(), sizes[name][0], sizes[name][1])
		}
	}
}

// TestRunWithoutBlock checks that a run without a block writes its files
// (no block outline, no block index figure).
func TestRunWithoutBlock(t *testing.T) {
	c := smallConfig(12)
	c.Block.Shape = "none"
	dir := filepath.Join(t.TempDir(), "out")
	runTo(t, c, dir, true)
	mf, err := netcdf.Open(filepath.Join(dir, MeansFile))
	if err != nil {
		t.Fatal(err)
	}
	defer mf.Close()
	if _, ok := mf.Var("psi_block"); ok {
		t.Error("means.nc of a run without a block has psi_block")
	}
	if _, err := os.Stat(filepath.Join(dir, FiguresDir, "block_index.png")); err == nil {
		t.Error("a run without a block drew a block index")
	}
	if _, err := os.Stat(filepath.Join(dir, FiguresDir, "height.png")); err != nil {
		t.Error(err)
	}
}
