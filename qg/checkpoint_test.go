package qg

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCheckpointRestart checks that a run restarted from a checkpoint
// continues bit for bit with either scheme — AB3's steps depend on its
// history of tendencies, which the checkpoint carries — and with another
// number of workers (exact restarts are common practice for research
// models).
func TestCheckpointRestart(t *testing.T) {
	for _, scheme := range []Scheme{RK4, AB3} {
		a := benchModel(t, 32, 1, scheme)
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
		b := benchModel(t, 32, 2, scheme)
		c, err := LoadCheckpoint(path)
		if err != nil {
			t.Fatal(err)
		}
		// AB3 combines the new tendency with the two before it
		if scheme == AB3 && len(c.History) != 2 {
			t.Errorf("AB3 checkpoint holds %d history tendencies, want 2", len(c.History))
		}
		if err := b.Restore(c); err != nil {
			t.Fatal(err)
		}
		if err := b.Run(5); err != nil {
			t.Fatal(err)
		}
		b.Close()
		if a.Time() != b.Time() || a.Steps() != b.Steps() {
			t.Fatalf("%s: time/steps differ: %v/%d vs %v/%d", scheme, a.Time(), a.Steps(), b.Time(), b.Steps())
		}
		if a.Ledger() != b.Ledger() {
			t.Errorf("%s: the energy books differ after the restart", scheme)
		}
		qa, qb := a.SpectralPV(), b.SpectralPV()
		for n := range 2 {
			for p := range qa[n] {
				if qa[n][p] != qb[n][p] {
					t.Fatalf("%s: layer %d point %d: %v vs %v", scheme, n+1, p, qa[n][p], qb[n][p])
				}
			}
		}
	}
}

// TestCheckpointRefusesOtherConfiguration checks that a checkpoint is
// refused by a model configured differently in anything but the number of
// workers, with an error naming each differing key.
func TestCheckpointRefusesOtherConfiguration(t *testing.T) {
	ck := benchModel(t, 32, 1, RK4).Checkpoint()
	for _, tc := range []struct {
		key    string
		change func(*Config)
	}{
		{"u1", func(c *Config) { c.U1 += 1 }},
		{"dt", func(c *Config) { c.Dt = 240 }},
		{"scheme", func(c *Config) { c.Scheme = AB3 }},
		{"sponge.rate", func(c *Config) { c.Sponge.Rate *= 2 }},
		{"scale_selective.filter_time", func(c *Config) { c.ScaleSelective.FilterTime *= 2 }},
	} {
		c := benchModel(t, 32, 1, RK4).Config()
		tc.change(&c)
		m, err := NewModel(c)
		if err != nil {
			t.Fatal(err)
		}
		err = m.Restore(ck)
		var mm *ConfigMismatch
		if !errors.As(err, &mm) || len(mm.Changes) != 1 || mm.Changes[0].Key != tc.key || !strings.Contains(err.Error(), tc.key) {
			t.Errorf("%s changed: Restore gave %v, want a *ConfigMismatch naming %s alone", tc.key, err, tc.key)
		}
	}
	c := benchModel(t, 32, 1, RK4).Config()
	c.Workers = 3
	m, err := NewModel(c)
	if err != nil {
		t.Fatal(err)
	}
	defer m.Close()
	if err := m.Restore(ck); err != nil {
		t.Errorf("another number of workers: %v, want the checkpoint accepted", err)
	}
}

// TestCheckpointFileFaults checks that a damaged, truncated or misplaced
// checkpoint file is refused with an error naming the file, that a flipped
// byte anywhere is caught by the checksum, and that files are written
// readable by all (mode 0644).
func TestCheckpointFileFaults(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "state.ckpt")
	m := benchModel(t, 32, 1, RK4)
	if err := SaveCheckpoint(path, m.Checkpoint()); err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if st.Mode().Perm() != 0o644 {
		t.Errorf("checkpoint mode %v, want -rw-r--r--", st.Mode().Perm())
	}
	good, _ := os.ReadFile(path)
	bad := filepath.Join(dir, "bad.ckpt")
	for _, at := range []int{len(checkpointMagic) + 10, len(good) / 2, len(good) - 40, len(good) - 1} {
		b := append([]byte(nil), good...)
		b[at] ^= 0x10
		os.WriteFile(bad, b, 0o644)
		if _, err := LoadCheckpoint(bad); err == nil || !strings.Contains(err.Error(), bad) || !strings.Contains(err.Error(), "checksum") {
			t.Errorf("byte %d flipped: got %v, want a checksum error naming %s", at, err, bad)
		}
	}
	for _, n := range []int{0, 10, len(checkpointMagic) + 5, len(good) - 1} {
		os.WriteFile(bad, good[:n], 0o644)
		if _, err := LoadCheckpoint(bad); err == nil || !strings.Contains(err.Error(), bad) {
			t.Errorf("truncated to %d bytes: got %v, want an error naming %s", n, err, bad)
		}
	}
	os.WriteFile(bad, []byte("eddyblock-checkpoint-1\nold"), 0o644)
	if _, err := LoadCheckpoint(bad); err == nil || !strings.Contains(err.Error(), "eddyblock-checkpoint-1") {
		t.Errorf("old format: got %v, want an error naming the format", err)
	}
	if _, err := LoadCheckpoint(dir); err == nil || !strings.Contains(err.Error(), dir) || !strings.Contains(err.Error(), "directory") {
		t.Errorf("a directory: got %v, want an error naming it as a directory", err)
	}
	if _, err := LoadCheckpoint(filepath.Join(dir, "missing.ckpt")); err == nil || !strings.Contains(err.Error(), "missing.ckpt") {
		t.Errorf("a missing file: got %v, want an error naming it", err)
	}
	if err := CheckWritable(dir); err == nil || !strings.Contains(err.Error(), "directory") {
		t.Errorf("CheckWritable of a directory: %v", err)
	}
	if err := CheckWritable(filepath.Join(dir, "missing", "x.ckpt")); err == nil {
		t.Error("CheckWritable in a missing directory: no error")
	}
	if err := CheckWritable(path); err != nil {
		t.Errorf("CheckWritable of a writable path: %v", err)
	}
	if after, _ := os.ReadFile(path); !bytes.Equal(after, good) {
		t.Error("CheckWritable changed the existing checkpoint")
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
