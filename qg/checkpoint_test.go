package qg

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCheckpointRestart checks that a run restarted from a checkpoint
// continues bit for bit (with RK4, whose steps do not depend on history);
// exact restarts are common practice for research models.
func TestCheckpointRestart(t *testing.T) {
	a := benchModel(t, 32, 1, RK4)
	if err := a.Run(5); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "state.ckpt")
	if err := SaveCheckpoint(path, a.Checkpoint()); err != nil {
		t.Fatal(err)
	}
	if err := a.Run(5); err != nil {
		t.Fatal(err)
	}
	b := benchModel(t, 32, 1, RK4)
	c, err := LoadCheckpoint(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := b.Restore(c); err != nil {
		t.Fatal(err)
	}
	if err := b.Run(5); err != nil {
		t.Fatal(err)
	}
	if a.Time() != b.Time() || a.Steps() != b.Steps() {
		t.Fatalf("time/steps differ: %v/%d vs %v/%d", a.Time(), a.Steps(), b.Time(), b.Steps())
	}
	qa, qb := a.SpectralPV(), b.SpectralPV()
	for n := range 2 {
		for p := range qa[n] {
			if qa[n][p] != qb[n][p] {
				t.Fatalf("layer %d point %d: %v vs %v", n+1, p, qa[n][p], qb[n][p])
			}
		}
	}
}

// TestCheckpointBadInput checks that damaged or mismatched checkpoints give
// errors and that a failed save leaves the old file intact (the design
// notes' requirement that the last good checkpoint survives a failure).
func TestCheckpointBadInput(t *testing.T) {
	if _, err := ReadCheckpoint(strings.NewReader("not a checkpoint\n")); err == nil {
		t.Error("bad header accepted")
	}
	m := benchModel(t, 32, 1, RK4)
	other := benchModel(t, 64, 1, RK4)
	if err := other.Restore(m.Checkpoint()); err == nil || !strings.Contains(err.Error(), "grid") {
		t.Errorf("grid mismatch: got %v", err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "state.ckpt")
	if err := SaveCheckpoint(path, m.Checkpoint()); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	if err := SaveCheckpoint(filepath.Join(dir, "missing", "x.ckpt"), m.Checkpoint()); err == nil {
		t.Error("save into a missing directory gave no error")
	}
	after, _ := os.ReadFile(path)
	if string(before) != string(after) {
		t.Error("existing checkpoint changed")
	}
}

// TestStepErrorRestoresState checks that a step stopped by the CFL monitor
// names the field and time and leaves the state as it was (the CFL number
// max(|u|/dx + |v|/dy)·dt is common practice; velocities of 10⁴ m/s on a
// 20 km grid with dt = 300 s give a CFL number far above 1 whatever the
// details).
func TestStepErrorRestoresState(t *testing.T) {
	m := benchModel(t, 32, 1, RK4)
	q := m.Checkpoint().Q
	for n := range 2 {
		for p := range q[n] {
			q[n][p] *= 1e3 // velocities of order 10⁴ m/s: far over the CFL limit
		}
	}
	m.SetSpectralPV(q)
	before := append([]complex128(nil), m.SpectralPV()[0]...)
	err := m.Step()
	se, ok := err.(*StepError)
	if !ok {
		t.Fatalf("got %v, want a *StepError", err)
	}
	if !strings.HasPrefix(se.Field, "u") || se.Time != 0 || !strings.Contains(se.Error(), "CFL") {
		t.Errorf("error %q does not name the velocity field, the time and the CFL", se)
	}
	for p, v := range m.SpectralPV()[0] {
		if v != before[p] {
			t.Fatal("state changed by a failed step")
		}
	}
	// A NaN cannot enter through SetSpectralPV.
	q = m.Checkpoint().Q
	q[1][5] = complex(math.NaN(), 0)
	if err := m.SetSpectralPV(q); err == nil || !strings.Contains(err.Error(), "layer 2") {
		t.Errorf("NaN PV: got %v", err)
	}
	for p, v := range m.SpectralPV()[0] {
		if v != before[p] {
			t.Fatal("state changed by a rejected SetSpectralPV")
		}
	}
}
