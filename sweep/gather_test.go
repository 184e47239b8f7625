package sweep

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/output"
	"github.com/eddyblock/eddyblock/output/figure"
	"github.com/eddyblock/eddyblock/output/netcdf"
)

// gathered runs three of the four members of fourPlan (member 2 is left
// out) and returns the directory.
func gathered(t *testing.T) string {
	t.Helper()
	p := fourPlan(t)
	dir := t.TempDir()
	for _, i := range []int{0, 1, 3} {
		if _, err := execute(t, context.Background(), p, Options{Dir: dir, Shard: Shard{i, 4}}); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// summaryNumber reads a number from a member's summary.json by its JSON
// path, independently of the typed summary Gather decodes.
func summaryNumber(t *testing.T, file string, path ...string) float64 {
	t.Helper()
	b, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	var v any
	if err := json.Unmarshal(b, &v); err != nil {
		t.Fatal(err)
	}
	for _, p := range path {
		switch x := v.(type) {
		case map[string]any:
			v = x[p]
		case []any:
			i, _ := strconv.Atoi(p)
			v = x[i]
		}
	}
	f, ok := v.(float64)
	if !ok {
		t.Fatalf("%s: %v is not a number", strings.Join(path, "."), v)
	}
	return f
}

// TestGatherCSV checks the gathered table against the members' own
// summary.json files read as plain JSON, and that the member not run is
// listed with its state and empty answers rather than left out.
func TestGatherCSV(t *testing.T) {
	dir := gathered(t)
	tb, err := Gather(dir)
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := tb.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 5 {
		t.Fatalf("%d CSV lines, want a header and 4 members", len(recs))
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	// answers from their JSON paths in summary.json
	checks := map[string][]string{
		"eddy_per_day":                      {"eddy", "rate_per_day"},
		"eddy_vorticity_per_day":            {"eddy_vorticity", "rate_per_day"},
		"eddy_interface_per_day":            {"eddy_interface", "rate_per_day"},
		"eddy_interface_baroclinic_per_day": {"eddy_interface", "baroclinic_rate_per_day"},
		"eddy_correlation":                  {"eddy", "correlation"},
		"eddy_to_dissipation":               {"eddy_to_dissipation"},
		"block_index_mean":                  {"index", "mean"},
		"block_index_std":                   {"index", "std"},
		"eke_upper_m2_per_s2":               {"eke", "0"},
		"heat_flux_K_m_per_s":               {"heat_flux_k"},
		"injection_m2_per_s3":               {"energy", "rates", "injection"},
		"energy_closure_error":              {"energy", "closure_error"},
	}
	p := fourPlan(t)
	for i, rec := range recs[1:] {
		m := p.Members[i]
		if rec[col["member"]] != strconv.Itoa(i) || rec[col["name"]] != m.Name || rec[col["seed"]] != strconv.FormatUint(m.Seed, 10) {
			t.Errorf("line %d: member %s name %s seed %s", i+1, rec[col["member"]], rec[col["name"]], rec[col["seed"]])
		}
		rate, _ := strconv.ParseFloat(rec[col["wavemaker.injection_rate"]], 64)
		u1, _ := strconv.ParseFloat(rec[col["model.u1"]], 64)
		if rate != m.Config.Wavemaker.InjectionRate || u1 != m.Config.Model.U1 {
			t.Errorf("member %d: parameters %g, %g; its configuration has %g, %g", i, rate, u1, m.Config.Wavemaker.InjectionRate, m.Config.Model.U1)
		}
		if i == 2 {
			if rec[col["state"]] != StateNotRun || rec[col["eddy_per_day"]] != "" {
				t.Errorf("member 2 (not run): state %q, eddy_per_day %q", rec[col["state"]], rec[col["eddy_per_day"]])
			}
			continue
		}
		if rec[col["state"]] != StateDone {
			t.Errorf("member %d: state %q", i, rec[col["state"]])
		}
		sum := filepath.Join(dir, m.Name, output.SummaryFile)
		for name, path := range checks {
			got, err := strconv.ParseFloat(rec[col[name]], 64)
			if want := summaryNumber(t, sum, path...); err != nil || got != want {
				t.Errorf("member %d: %s = %q, summary.json has %v", i, name, rec[col[name]], want)
			}
		}
	}
	// the injected energy follows the swept rate (member 1: 5e-6,
	// member 3: 2e-5; Novikov 1965: the rate is set by the forcing's
	// covariance, within sampling noise over a short run)
	r1, _ := strconv.ParseFloat(recs[2][col["injection_m2_per_s3"]], 64)
	r3, _ := strconv.ParseFloat(recs[4][col["injection_m2_per_s3"]], 64)
	if !(r3 > 2*r1) {
		t.Errorf("injection rates %g and %g do not follow the swept 5e-6 and 2e-5", r1, r3)
	}
	if miss := tb.Missing(); len(miss) != 1 || miss[0].Index != 2 {
		t.Errorf("missing %+v, want member 2", miss)
	}
}

// TestGatherNetCDF writes the table as NetCDF and reads it back with the
// project's reader and, when installed, Unidata's ncdump (the reference
// reader of the format): dimensions, values, CF attributes, fill values for
// the member not run.
func TestGatherNetCDF(t *testing.T) {
	dir := gathered(t)
	tb, err := Gather(dir)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "table.nc")
	if err := tb.WriteNetCDF(path); err != nil {
		t.Fatal(err)
	}
	f, err := netcdf.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if d, ok := f.Dim("member"); !ok || d.Len != 4 {
		t.Errorf("member dimension %+v", d)
	}
	for name, want := range map[string]string{"Conventions": "CF-1.10", "comment": output.Caution} {
		if a, ok := f.Attr(name); !ok || a.Value != want {
			t.Errorf("global attribute %s = %v, want %q", name, a.Value, want)
		}
	}
	eddy, err := f.ReadFloat64("eddy_per_day")
	if err != nil {
		t.Fatal(err)
	}
	v, _ := f.Var("eddy_per_day")
	if a, _ := v.Attr("units"); a.Value != "day-1" {
		t.Errorf("eddy_per_day units %v", a.Value)
	}
	for i, r := range tb.Rows {
		want := r.Values[0]
		if !r.Done() {
			want = v.FillValue()
		}
		if eddy[i] != want {
			t.Errorf("member %d: eddy_per_day %v, want %v", i, eddy[i], want)
		}
	}
	u1, err := f.ReadFloat64("model_u1")
	if err != nil || u1[0] != 14 || u1[1] != 16 {
		t.Errorf("model_u1 %v, %v", u1, err)
	}
	state, err := f.ReadVar("state")
	if err != nil || !strings.Contains(string(state.([]byte)), StateNotRun) {
		t.Errorf("state %q, %v", state, err)
	}

	ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
	out, err := exec.Command(ncdump, path).CombinedOutput()
	if err != nil {
		t.Fatalf("ncdump: %v\n%s", err, out)
	}
	for _, w := range []string{"member = 4 ;", "double eddy_per_day(member) ;", `eddy_per_day:units = "day-1" ;`, "_FillValue", "not run"} {
		if !strings.Contains(string(out), w) {
			t.Errorf("ncdump output lacks %q", w)
		}
	}
}

// TestGatherFigure draws an answer against one parameter, one line per
// value of the other, and checks the lines, the PNG, and the refusals.
func TestGatherFigure(t *testing.T) {
	dir := gathered(t)
	tb, err := Gather(dir)
	if err != nil {
		t.Fatal(err)
	}
	fig, err := tb.Figure(PlotOptions{X: "model.u1", Y: "eddy_per_day", By: "wavemaker.injection_rate"})
	if err != nil {
		t.Fatal(err)
	}
	// member 2 (rate 2e-5, u1 14) is missing: the 2e-5 line has one point
	if len(fig.Lines) != 2 || len(fig.Lines[0].X) != 2 || len(fig.Lines[1].X) != 1 || fig.Lines[1].X[0] != 16 {
		t.Errorf("lines %+v", fig.Lines)
	}
	if fig.Lines[0].Label != "wavemaker.injection_rate = 5e-06" || fig.Lines[0].Y[1] != tb.Rows[1].Values[0] {
		t.Errorf("first line %+v", fig.Lines[0])
	}
	b, err := figure.PNG(fig, figure.Size{Width: 640, Height: 400})
	if err != nil {
		t.Fatal(err)
	}
	if img, err := png.Decode(bytes.NewReader(b)); err != nil || img.Bounds().Dx() != 640 || img.Bounds().Dy() != 400 {
		t.Errorf("PNG: %v", err)
	}
	for _, tc := range []struct {
		o    PlotOptions
		want string
	}{
		{PlotOptions{X: "model.u2", Y: "eddy_per_day"}, "-x"},
		{PlotOptions{X: "model.u1", Y: "eddy_rate"}, "-y"},
		{PlotOptions{X: "model.u1", Y: "eddy_per_day", By: "model.u1"}, "-by"},
		{PlotOptions{X: "model.u1", Y: "eddy_per_day"}, "-where"},
		{PlotOptions{X: "model.u1", Y: "eddy_per_day", Where: map[string]string{"model.dt": "1"}}, "not a varied key"},
	} {
		if _, err := tb.Figure(tc.o); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: %v, want an error saying %q", tc.o, err, tc.want)
		}
	}
	one, err := tb.Figure(PlotOptions{X: "model.u1", Y: "eddy_per_day", Where: map[string]string{"wavemaker.injection_rate": "5e-06"}})
	if err != nil || len(one.Lines) != 1 || len(one.Lines[0].X) != 2 || math.IsNaN(one.Lines[0].Y[0]) {
		t.Errorf("with -where: %v, %+v", err, one)
	}
}

// TestPrettyUnits checks the superscript form of UDUNITS-2 unit strings,
// whose integer exponents follow their symbols (UDUNITS-2 syntax).
func TestPrettyUnits(t *testing.T) {
	for in, want := range map[string]string{
		"m2 s-3": "m² s⁻³", "day-1": "day⁻¹", "K m s-1": "K m s⁻¹", "m": "m", "m-1 s-1": "m⁻¹ s⁻¹", "s10": "s¹⁰",
	} {
		if got := prettyUnits(in); got != want {
			t.Errorf("prettyUnits(%q) = %q, want %q", in, got, want)
		}
	}
	if got := withUnits("eddy_correlation", "1"); got != "eddy_correlation" {
		t.Errorf("a number without units labelled %q", got)
	}
}
