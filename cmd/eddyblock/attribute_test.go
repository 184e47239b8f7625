package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/output"
)

// smallAttributionTOML is the built-in attribution experiment on a coarse
// grid for a few months.
const smallAttributionTOML = "[model]\nnx = 64\nny = 32\ndt = 3600.0\n[run]\ndays = 80.0\nspin_up_days = 30.0\nreport_days = 40.0\nsample_steps = 2\n"

// TestAttributeRefusesBadInput checks that bad flags and configurations
// are refused with a message naming what is wrong, before any run starts
// and without creating the output directory.
func TestAttributeRefusesBadInput(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	afile := write("afile", "x")
	out := filepath.Join(dir, "out")
	for _, tc := range []struct {
		name string
		args []string
		want string
	}{
		{"figures without a directory", []string{"-plot"}, "give -out DIR"},
		{"negative days", []string{"-days", "-1", "-out", out}, "-days -1"},
		{"anomaly outside the domain", []string{"-config", write("x.toml", "[anomaly]\nx = 3.0e7\n"), "-out", out}, "anomaly.x"},
		{"zero-size anomaly", []string{"-config", write("r.toml", "[anomaly]\nradius = 0.0\n"), "-out", out}, "anomaly.radius"},
		{"fixed block", []string{"-config", write("f.toml", "[block]\nmode = \"fixed\"\n"), "-out", out}, `block.mode = "fixed"`},
		{"relaxed block", []string{"-config", write("rel.toml", "[block]\nmode = \"relaxed\"\nrelax_time = 864000.0\n"), "-out", out}, "block.mode"},
		{"unknown key", []string{"-config", write("u.toml", "[anomaly]\nsize = 1.0\n"), "-out", out}, "unknown key anomaly.size"},
		{"spin-up past the end", []string{"-days", "50", "-spinup", "60", "-out", out}, "before their spin-up"},
		{"output is a file", []string{"-days", "50", "-spinup", "10", "-out", afile}, "not a directory"},
		{"-forcing with -days", []string{"-forcing", dir, "-days", "10"}, "-days does not go with -forcing"},
		{"-to without -forcing", []string{"-to", filepath.Join(dir, "h.nc")}, "-to goes with -forcing"},
		{"no means.nc", []string{"-forcing", dir}, "means.nc"},
		{"stray argument", []string{"now"}, `unexpected argument "now"`},
	} {
		var stdout, stderr bytes.Buffer
		err := cmdAttribute(tc.args, &stdout, &stderr)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want an error mentioning %q", tc.name, err, tc.want)
		}
		if strings.Contains(stdout.String(), "day ") {
			t.Errorf("%s: the runs started:\n%s", tc.name, stdout.String())
		}
		if _, err := os.Stat(out); err == nil {
			t.Fatalf("%s: the output directory was created", tc.name)
		}
	}
}

// TestAttributePrintConfig checks that the printed configuration loads
// back as the built-in one.
func TestAttributePrintConfig(t *testing.T) {
	var stdout, stderr bytes.Buffer
	if err := cmdAttribute([]string{"-print-config"}, &stdout, &stderr); err != nil {
		t.Fatal(err)
	}
	c, err := attribution.Decode(strings.NewReader(stdout.String()), attribution.Builtin())
	if err != nil {
		t.Fatalf("the printed configuration does not load: %v\n%s", err, stdout.String())
	}
	b := attribution.Builtin()
	if c.Anomaly != b.Anomaly || c.Model != b.Model || c.Run != b.Run || c.Sampling != b.Sampling || c.Name != b.Name {
		t.Errorf("the printed configuration loads as another one:\n%s", stdout.String())
	}
	for _, want := range []string{"[anomaly]", `kind = "heating"`, "[sampling]"} {
		if !strings.Contains(stdout.String(), want) {
			t.Errorf("the printed configuration lacks %q", want)
		}
	}
}

// TestAttributeRuns runs a short attribution experiment with its files and
// figures, then the mean-state forcing of a finished run from its files.
func TestAttributeRuns(t *testing.T) {
	dir := t.TempDir()
	cfg := filepath.Join(dir, "small.toml")
	if err := os.WriteFile(cfg, []byte(smallAttributionTOML), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "attr")
	var stdout, stderr bytes.Buffer
	if err := cmdAttribute([]string{"-config", cfg, "-out", out, "-plot"}, &stdout, &stderr); err != nil {
		t.Fatalf("%v\n%s", err, stderr.String())
	}
	for _, want := range []string{"control day   40.0", "anomaly day   80.0", "(b) linear, anomaly alone", "(c) linear, anomaly + Δ eddy forcing",
		"sampling noise of (a)", "wrote " + out, "done in"} {
		if !strings.Contains(stdout.String(), want) {
			t.Errorf("output lacks %q:\n%s", want, stdout.String())
		}
	}
	for _, f := range append([]string{output.AttributionFile, output.ControlForcingFile, output.AnomalyForcingFile, output.SummaryFile, output.ConfigFile},
		func() []string {
			var n []string
			for _, x := range output.AttributionFigureNames() {
				n = append(n, filepath.Join(output.FiguresDir, x))
			}
			return n
		}()...) {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	b, err := os.ReadFile(filepath.Join(out, output.SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	var s map[string]any
	if err := json.Unmarshal(b, &s); err != nil || s["experiment"] != attribution.BuiltinName {
		t.Errorf("summary.json: %v, experiment %v", err, s["experiment"])
	}

	// the mean-state forcing of a finished run, from its means.nc
	run := filepath.Join(dir, "run")
	short := filepath.Join(dir, "short.toml")
	os.WriteFile(short, []byte("[model]\nnx = 64\nny = 32\ndt = 3600.0\n[run]\ndays = 6.0\nspin_up_days = 2.0\nreport_days = 3.0\nsample_steps = 2\n"), 0o644)
	stdout.Reset()
	if err := run2(t, []string{"run", "-config", short, "-out", run}); err != nil {
		t.Fatal(err)
	}
	if err := cmdAttribute([]string{"-forcing", run}, &stdout, &stderr); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stdout.String(), "mean-state forcing of") || !strings.Contains(stdout.String(), "mean_forcing.nc") {
		t.Errorf("-forcing printed:\n%s", stdout.String())
	}
	if _, err := attribution.FromMeans(filepath.Join(run, output.MeansFile)); err != nil {
		t.Error(err)
	}
	if _, err := os.Stat(filepath.Join(run, "mean_forcing.nc")); err != nil {
		t.Error(err)
	}
}

// run2 runs the program's command line, discarding what it prints.
func run2(t *testing.T, args []string) error {
	t.Helper()
	var o, e bytes.Buffer
	err := run(args, &o, &e)
	if err != nil {
		t.Logf("%s\n%s", o.String(), e.String())
	}
	return err
}
