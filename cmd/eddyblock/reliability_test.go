package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// The test binary doubles as the program (cliVar) and as a busy loop
// (busyVar), so that the tests can send it signals and load the machine
// with other processes.
const (
	cliVar  = "EDDYBLOCK_TEST_AS_CLI"
	busyVar = "EDDYBLOCK_TEST_BUSY"
)

func TestMain(m *testing.M) {
	switch {
	case os.Getenv(cliVar) == "1":
		main()
		os.Exit(0)
	case os.Getenv(busyVar) == "1":
		x := 1.0
		for x > 0 {
			x = x*1.0000001 + 1e-9
		}
	}
	os.Exit(m.Run())
}

// cli returns a command running the program with args.
func cli(args ...string) *exec.Cmd {
	c := exec.Command(os.Args[0], args...)
	c.Env = append(os.Environ(), cliVar+"=1")
	return c
}

// busyProcesses starts n processes that spin until the test ends.
func busyProcesses(t *testing.T, n int) {
	t.Helper()
	for range n {
		c := exec.Command(os.Args[0], "-test.run=^$")
		c.Env = append(os.Environ(), busyVar+"=1")
		if err := c.Start(); err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { c.Process.Kill(); c.Wait() })
	}
}

// shortConfig writes a coarse, short version of the default experiment,
// with the settings given as "table.key = value" replacing or adding to
// its own ("block.dipole.height = 1500.0").
func shortConfig(t *testing.T, dir, name string, set ...string) string {
	t.Helper()
	keys := []string{
		"model.nx = 64", "model.ny = 32", "model.dt = 3600.0",
		"run.days = 4.0", "run.spin_up_days = 1.0", "run.report_days = 1.0", "run.sample_steps = 2",
	}
	keys = append(keys, set...)
	tables := map[string][]string{}
	var order []string
	seen := map[string]int{}
	for _, kv := range keys {
		k, v, _ := strings.Cut(kv, "=")
		k = strings.TrimSpace(k)
		dot := strings.LastIndex(k, ".")
		table, key := k[:dot], k[dot+1:]
		if _, ok := tables[table]; !ok {
			order = append(order, table)
		}
		line := key + " = " + strings.TrimSpace(v)
		if at, ok := seen[k]; ok {
			tables[table][at] = line
			continue
		}
		seen[k] = len(tables[table])
		tables[table] = append(tables[table], line)
	}
	var b strings.Builder
	for _, tb := range order {
		fmt.Fprintf(&b, "[%s]\n%s\n", tb, strings.Join(tables[tb], "\n"))
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func runCLI(args ...string) (string, error) {
	var out, errb bytes.Buffer
	err := run(args, &out, &errb)
	return out.String() + errb.String(), err
}

// TestRunsUnderLoadIdentical is the experiment that first showed the
// scheduling fault: a 128×64 version of the default experiment, run many
// times with 2 and 3 workers while two busy processes occupy the cores,
// must write the same summary.json, byte for byte, as a one-worker run.
func TestRunsUnderLoadIdentical(t *testing.T) {
	testenv.Long(t)
	dir := t.TempDir()
	cfg := filepath.Join(dir, "load.toml")
	os.WriteFile(cfg, []byte("[model]\nnx = 128\nny = 64\n[run]\ndays = 20\nspin_up_days = 5\n"), 0o644)
	ref := filepath.Join(dir, "ref")
	if out, err := runCLI("run", "-quiet", "-config", cfg, "-workers", "1", "-out", ref); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	want, err := os.ReadFile(filepath.Join(ref, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	busyProcesses(t, 2)
	runs := 0
	for _, w := range []string{"2", "3", "2", "3", "2", "3", "2", "3"} {
		out := filepath.Join(dir, fmt.Sprintf("run%d", runs))
		if o, err := runCLI("run", "-quiet", "-config", cfg, "-workers", w, "-out", out); err != nil {
			t.Fatalf("%v\n%s", err, o)
		}
		got, err := os.ReadFile(filepath.Join(out, "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("run %d with %s workers under load: summary.json differs from the one-worker run's", runs, w)
		}
		runs++
	}
	t.Logf("%d loaded runs of 1920 steps identical to the one-worker run", runs)
}

// TestRestartRefusesOtherConfiguration checks that a restart file is
// refused by a run whose configuration differs in anything that shapes the
// trajectory or the diagnostics, with the key named; only the run's length
// (and how it reports, and the number of workers) may change.
func TestRestartRefusesOtherConfiguration(t *testing.T) {
	dir := t.TempDir()
	base := shortConfig(t, dir, "base.toml")
	ck := filepath.Join(dir, "state.ckpt")
	if out, err := runCLI("run", "-quiet", "-config", base, "-days", "2", "-checkpoint", ck); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	for _, tc := range []struct {
		key string
		set []string
	}{
		{"model.u1", []string{"model.u1 = 17.0"}},
		{"block.dipole.height", []string{"block.dipole.height = 120.0"}},
		{"wavemaker.kind", []string{`wavemaker.kind = "white"`, "wavemaker.injection_rate = 1e-5",
			`wavemaker.band.kind = "total"`, "wavemaker.band.min_wavelength = 1.0e6", "wavemaker.band.max_wavelength = 2.5e6"}},
		{"wavemaker.train.frequency", []string{"wavemaker.train.frequency = 5.0e-5"}},
		{"run.sample_steps", []string{"run.sample_steps = 3"}},
		{"run.spin_up_days", []string{"run.spin_up_days = 0.5"}},
		{"model.scheme", []string{`model.scheme = "ab3"`}},
	} {
		cfg := shortConfig(t, dir, "other.toml", tc.set...)
		out, err := runCLI("run", "-quiet", "-config", cfg, "-restart", ck)
		if err == nil || !strings.Contains(err.Error(), tc.key) || !strings.Contains(err.Error(), "other settings") {
			t.Errorf("%s changed: got %v, want a refusal naming %s\n%s", tc.key, err, tc.key, out)
		}
		if strings.Contains(out, "day ") {
			t.Errorf("%s changed: the run stepped before refusing:\n%s", tc.key, out)
		}
	}
	// allowed: a longer run, another report interval, other workers, and a
	// key the configuration does not use (a wave train has no random seed)
	seed := shortConfig(t, dir, "seed.toml", "wavemaker.seed = 7")
	out, err := runCLI("run", "-quiet", "-config", seed, "-days", "3", "-workers", "2", "-restart", ck)
	if err != nil {
		t.Errorf("a longer run with 2 workers and an unused key changed: %v\n%s", err, out)
	}
}

// TestRestartAB3BitForBit checks through the program that a run with
// either scheme stopped and restarted from its checkpoint writes the same
// summary and series, byte for byte, as one that ran through, and that
// its time per step counts only the steps it took.
func TestRestartAB3BitForBit(t *testing.T) {
	for _, scheme := range []string{"rk4", "ab3"} {
		dir := t.TempDir()
		cfg := shortConfig(t, dir, "c.toml", fmt.Sprintf("model.scheme = %q", scheme))
		ck := filepath.Join(dir, "state.ckpt")
		if out, err := runCLI("run", "-quiet", "-config", cfg, "-days", "2", "-checkpoint", ck); err != nil {
			t.Fatalf("%v\n%s", err, out)
		}
		a, b := filepath.Join(dir, "a"), filepath.Join(dir, "b")
		out, err := runCLI("run", "-quiet", "-config", cfg, "-restart", ck, "-out", a)
		if err != nil {
			t.Fatalf("%v\n%s", err, out)
		}
		if !strings.Contains(out, "done: 48 steps") {
			t.Errorf("%s: the restarted run should report its own 48 steps:\n%s", scheme, out)
		}
		if out, err := runCLI("run", "-quiet", "-config", cfg, "-out", b); err != nil {
			t.Fatalf("%v\n%s", err, out)
		}
		for _, f := range []string{"summary.json", "series.json"} {
			x, _ := os.ReadFile(filepath.Join(a, f))
			y, _ := os.ReadFile(filepath.Join(b, f))
			if len(x) == 0 || !bytes.Equal(x, y) {
				t.Errorf("%s: %s of the restarted run differs from the uninterrupted run's", scheme, f)
			}
		}
	}
}

// TestOutputFaultsFoundBeforeRun checks that an -out that cannot be
// written and a -checkpoint that cannot be written are refused before the
// first step, naming the flag.
func TestOutputFaultsFoundBeforeRun(t *testing.T) {
	dir := t.TempDir()
	cfg := shortConfig(t, dir, "c.toml")
	file := filepath.Join(dir, "a-file")
	os.WriteFile(file, []byte("x"), 0o644)
	ro := readOnlyDir(t)
	for _, tc := range []struct {
		name string
		args []string
		want string
	}{
		{"out is a file", []string{"-out", file}, "-out"},
		{"out under a file", []string{"-out", filepath.Join(file, "sub")}, "-out"},
		{"out in a read-only place", []string{"-out", filepath.Join(ro, "out")}, "-out"},
		{"out a read-only directory", []string{"-out", ro}, "-out"},
		{"checkpoint in a missing directory", []string{"-checkpoint", filepath.Join(dir, "missing", "s.ckpt")}, "-checkpoint"},
		{"checkpoint is a directory", []string{"-checkpoint", dir}, "-checkpoint"},
		{"checkpoint in a read-only place", []string{"-checkpoint", filepath.Join(ro, "s.ckpt")}, "-checkpoint"},
	} {
		out, err := runCLI(append([]string{"run", "-config", cfg}, tc.args...)...)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want an error naming %s", tc.name, err, tc.want)
		}
		if strings.Contains(out, "day ") {
			t.Errorf("%s: the run stepped before the error:\n%s", tc.name, out)
		}
	}
	if b, _ := os.ReadFile(file); string(b) != "x" {
		t.Error("the file given as -out was changed")
	}
}

// readOnlyDir returns a directory the program cannot write in. Permission
// bits do not stop root, so as root it mounts a read-only file system there
// (skipping if it cannot).
func readOnlyDir(t *testing.T) string {
	t.Helper()
	d := filepath.Join(t.TempDir(), "ro")
	os.Mkdir(d, 0o555)
	if f, err := os.CreateTemp(d, "probe"); err != nil {
		return d // the permission bits hold
	} else {
		f.Close()
		os.Remove(f.Name())
	}
	if err := syscall.Mount("tmpfs", d, "tmpfs", syscall.MS_RDONLY, "size=1m"); err != nil {
		t.Skipf("cannot make a read-only directory as root here: %v", err)
	}
	t.Cleanup(func() { syscall.Unmount(d, 0) })
	return d
}

// TestOutputsReplacedAsWhole checks that a run's outputs replace an earlier
// run's as a set (no file of the old run left beside the new ones) and that
// a run that fails leaves the earlier outputs as they were.
func TestOutputsReplacedAsWhole(t *testing.T) {
	dir := t.TempDir()
	cfg := shortConfig(t, dir, "c.toml")
	out := filepath.Join(dir, "out")
	os.Mkdir(out, 0o755)
	os.WriteFile(filepath.Join(out, "summary.json"), []byte("old\n"), 0o644)
	os.WriteFile(filepath.Join(out, "stale.txt"), []byte("old\n"), 0o644)
	if o, err := runCLI("run", "-quiet", "-config", cfg, "-out", out); err != nil {
		t.Fatalf("%v\n%s", err, o)
	}
	names := dirNames(t, out)
	if strings.Join(names, " ") != "config.toml means.nc series.json series.nc snapshots.nc summary.json" {
		t.Errorf("outputs after the run: %v, want exactly the new set", names)
	}
	before := snapshotDir(t, out)
	// a run that fails at its first step (a CFL limit no flow meets)
	bad := shortConfig(t, dir, "bad.toml", "model.max_cfl = 0.05")
	if o, err := runCLI("run", "-quiet", "-config", bad, "-out", out); err == nil {
		t.Fatalf("a run over its CFL limit succeeded:\n%s", o)
	}
	if after := snapshotDir(t, out); after != before {
		t.Error("a failed run changed the earlier outputs")
	}
	if _, err := os.Stat(out + ".partial"); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the staging directory of the failed run is left behind: %v", err)
	}
}

func dirNames(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var n []string
	for _, e := range es {
		n = append(n, e.Name())
	}
	return n
}

func snapshotDir(t *testing.T, dir string) string {
	t.Helper()
	var b strings.Builder
	for _, n := range dirNames(t, dir) {
		c, _ := os.ReadFile(filepath.Join(dir, n))
		fmt.Fprintf(&b, "%s %x\n", n, c)
	}
	return b.String()
}

// TestBadFlagsRefused checks that flags are validated like configuration
// keys, with the flag named, and that a run shorter than its spin-up is
// refused instead of silently shortening the spin-up.
func TestBadFlagsRefused(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"-days", "-5"}, "-days -5"},
		{[]string{"-days", "NaN"}, "-days NaN"},
		{[]string{"-days", "+Inf"}, "-days +Inf"},
		{[]string{"-days", "0"}, "-days 0"},
		{[]string{"-workers", "-2"}, "-workers -2"},
		{[]string{"-workers", "0"}, "-workers 0"},
		{[]string{"-spinup", "-1"}, "-spinup -1"},
		{[]string{"-days", "5"}, "spin-up"}, // the default's spin-up is 30 days
		{[]string{"-days", "10", "-spinup", "10"}, "spin-up"},
		{[]string{"extra"}, "unexpected argument"},
		{[]string{"-out", ""}, "-out"},
	} {
		out, err := runCLI(append([]string{"run"}, tc.args...)...)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("run %v: got %v, want an error with %q", tc.args, err, tc.want)
		}
		if strings.Contains(out, "day ") {
			t.Errorf("run %v stepped:\n%s", tc.args, out)
		}
	}
}

// TestCheckRefusesCFLAtStepZero checks that `check` runs the checks of a
// run's first step: a block whose flow is over the CFL limit is refused by
// check as it would be by run.
func TestCheckRefusesCFLAtStepZero(t *testing.T) {
	dir := t.TempDir()
	// a 1500 m block on a 64×32 grid with dt = 1 h: winds of ~100 m/s
	cfg := shortConfig(t, dir, "c.toml", "block.dipole.height = 1500.0")
	if out, err := runCLI("check", cfg); err == nil || !strings.Contains(err.Error(), "CFL") {
		t.Errorf("check: got %v, want a CFL error\n%s", err, out)
	}
	if out, err := runCLI("run", "-config", cfg); err == nil || !strings.Contains(err.Error(), "CFL") || strings.Contains(out, "day ") {
		t.Errorf("run: got %v, want a CFL error before any step\n%s", err, out)
	}
}

// TestSignalStopsCleanly sends SIGTERM and SIGINT to a running program: it
// must finish its step, write the checkpoint, say where it stopped and how
// to resume, and exit with 143 or 130 (128 + the signal's number, the shell
// convention); the resumed run must end with the same outputs, byte for
// byte, as an uninterrupted one.
func TestSignalStopsCleanly(t *testing.T) {
	dir := t.TempDir()
	cfg := shortConfig(t, dir, "c.toml", "model.dt = 1800.0", "run.days = 60.0", "run.report_days = 0.5")
	ref := filepath.Join(dir, "ref")
	if o, err := runCLI("run", "-quiet", "-config", cfg, "-out", ref); err != nil {
		t.Fatalf("%v\n%s", err, o)
	}
	for _, sig := range []struct {
		s    syscall.Signal
		name string
		code int
	}{{syscall.SIGTERM, "SIGTERM", 143}, {syscall.SIGINT, "SIGINT", 130}} {
		ck := filepath.Join(dir, sig.name+".ckpt")
		out := filepath.Join(dir, sig.name+"-out")
		cmd := cli("run", "-config", cfg, "-checkpoint", ck, "-out", out)
		pr, pw := io.Pipe()
		cmd.Stdout, cmd.Stderr = pw, pw
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		var log bytes.Buffer
		lines := make(chan string, 1000)
		go func() {
			buf := make([]byte, 4096)
			for {
				n, err := pr.Read(buf)
				if n > 0 {
					lines <- string(buf[:n])
				}
				if err != nil {
					close(lines)
					return
				}
			}
		}()
		// wait for the second progress line, then signal
		deadline := time.After(60 * time.Second)
	wait:
		for {
			select {
			case s, ok := <-lines:
				if !ok {
					break wait
				}
				log.WriteString(s)
				if strings.Contains(log.String(), "day    1.0") {
					break wait
				}
			case <-deadline:
				t.Fatalf("no progress after 60 s:\n%s", log.String())
			}
		}
		cmd.Process.Signal(sig.s)
		err := cmd.Wait()
		pw.Close()
		for s := range lines {
			log.WriteString(s)
		}
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != sig.code {
			t.Errorf("%s: exit %v, want status %d\n%s", sig.name, err, sig.code, log.String())
		}
		text := log.String()
		for _, want := range []string{"stopped by " + sig.name + " at day", "checkpoint written to " + ck, "-restart " + ck} {
			if !strings.Contains(text, want) {
				t.Errorf("%s: output lacks %q:\n%s", sig.name, want, text)
			}
		}
		if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
			t.Errorf("%s: a stopped run wrote outputs", sig.name)
		}
		// resume as told
		if o, err := runCLI("run", "-quiet", "-config", cfg, "-restart", ck, "-out", out); err != nil {
			t.Fatalf("%s: resume: %v\n%s", sig.name, err, o)
		}
		for _, f := range []string{"summary.json", "series.json"} {
			a, _ := os.ReadFile(filepath.Join(out, f))
			b, _ := os.ReadFile(filepath.Join(ref, f))
			if len(a) == 0 || !bytes.Equal(a, b) {
				t.Errorf("%s: %s of the resumed run differs from the uninterrupted run's", sig.name, f)
			}
		}
	}
}
