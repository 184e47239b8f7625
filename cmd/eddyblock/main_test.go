package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
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
	for _, want := range []string{"day    2.00", "day    4.00", "projection on the block", "done: 96 steps"} {
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
