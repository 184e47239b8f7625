package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// TestCommands runs the program's commands on a short, coarse experiment.
func TestCommands(t *testing.T) {
	dir := t.TempDir()
	cfg := filepath.Join(dir, "short.toml")
	os.WriteFile(cfg, []byte("name = \"short\"\n[model]\nnx = 64\nny = 32\ndt = 3600.0\n[run]\ndays = 4.0\nspin_up_days = 1.0\nreport_days = 2.0\nsample_steps = 2\n"), 0o644)
	var out, errb bytes.Buffer
	if err := run([]string{"run", "-config", cfg, "-out", filepath.Join(dir, "out")}, &out, &errb); err != nil {
		t.Fatalf("run: %v\n%s", err, errb.String())
	}
	for _, want := range []string{"day    2.0", "day    4.0", "projection on the block", "done: 96 steps"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("output lacks %q:\n%s", want, out.String())
		}
	}
	b, err := os.ReadFile(filepath.Join(dir, "out", "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var s map[string]any
	if err := json.Unmarshal(b, &s); err != nil || s["block_mode"] != "forced" {
		t.Errorf("summary.json: %v, block_mode %v", err, s["block_mode"])
	}

	out.Reset()
	if err := run([]string{"config"}, &out, &errb); err != nil || !strings.Contains(out.String(), "[wavemaker]") {
		t.Errorf("config: %v\n%s", err, out.String())
	}
	if err := run([]string{"check", cfg}, &out, &errb); err != nil {
		t.Errorf("check of a valid file: %v", err)
	}
	bad := filepath.Join(dir, "bad.toml")
	os.WriteFile(bad, []byte("[model]\nlx = -1.0\n"), 0o644)
	if err := run([]string{"check", bad}, &out, &errb); err == nil || !strings.Contains(err.Error(), "model.lx") {
		t.Errorf("check of a bad file: got %v, want an error naming model.lx", err)
	}
	if err := run([]string{"fly"}, &out, &errb); err == nil {
		t.Error("unknown command accepted")
	}
}

// TestCheckpointRestart checks that a run stopped at day 2 and restarted
// from its checkpoint ends in the same state, with the same diagnostics, as
// an uninterrupted run (restart files must continue a run bit for bit,
// common practice).
func TestCheckpointRestart(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, days float64) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(fmt.Sprintf("[model]\nnx = 64\nny = 32\ndt = 3600.0\n[run]\ndays = %g\nspin_up_days = 1.0\nreport_days = 2.0\n", days)), 0o644)
		return p
	}
	short, long := write("short.toml", 2), write("long.toml", 4)
	var out, errb bytes.Buffer
	ck := filepath.Join(dir, "state.ckpt")
	if err := run([]string{"run", "-quiet", "-config", short, "-checkpoint", ck}, &out, &errb); err != nil {
		t.Fatal(err)
	}
	endA := filepath.Join(dir, "a.ckpt")
	outA, outB := filepath.Join(dir, "outA"), filepath.Join(dir, "outB")
	if err := run([]string{"run", "-quiet", "-config", long, "-restart", ck, "-checkpoint", endA, "-out", outA}, &out, &errb); err != nil {
		t.Fatal(err)
	}
	endB := filepath.Join(dir, "b.ckpt")
	if err := run([]string{"run", "-quiet", "-config", long, "-checkpoint", endB, "-out", outB}, &out, &errb); err != nil {
		t.Fatal(err)
	}
	// the diagnostics continue too: the summaries and the series (which
	// span the spin-up at day 1, before the restart) are the same bytes
	for _, f := range []string{"summary.json", "series.json"} {
		a, errA := os.ReadFile(filepath.Join(outA, f))
		b, errB := os.ReadFile(filepath.Join(outB, f))
		if errA != nil || errB != nil {
			t.Fatal(errA, errB)
		}
		if !bytes.Equal(a, b) {
			t.Errorf("%s of the restarted run differs from the uninterrupted run's", f)
		}
	}
	a, errA := qg.LoadCheckpoint(endA)
	b, errB := qg.LoadCheckpoint(endB)
	if errA != nil || errB != nil {
		t.Fatal(errA, errB)
	}
	if a.Time != 4*86400 || a.Time != b.Time {
		t.Fatalf("end times %g and %g, want %g", a.Time, b.Time, 4*86400.0)
	}
	for n := range 2 {
		for p := range a.Q[n] {
			if a.Q[n][p] != b.Q[n][p] {
				t.Fatalf("restarted run differs at layer %d mode %d: %v vs %v", n+1, p, a.Q[n][p], b.Q[n][p])
			}
		}
	}
	if err := run([]string{"run", "-config", long, "-restart", filepath.Join(dir, "missing.ckpt")}, &out, &errb); err == nil {
		t.Error("missing restart file accepted")
	}
}
