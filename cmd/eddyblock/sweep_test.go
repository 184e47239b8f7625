package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"

	"github.com/eddyblock/eddyblock/experiment"
)

// sweepFile writes a sweep file of four members (two source strengths ×
// two shears) of the stochastic experiment on a 64×32 grid, with more
// lines as the body's end.
func sweepFile(t *testing.T, dir string, days float64, more string) string {
	t.Helper()
	src := `name = "cli-test"
base = "storm-track-ending-at-block"
seed = 5
[fixed]
"model.nx" = 64
"model.ny" = 32
"model.dt" = 3600.0
"run.days" = ` + strconv.FormatFloat(days, 'f', 1, 64) + `
"run.spin_up_days" = 1.0
"run.report_days" = 1.0
"run.sample_steps" = 2
"run.snapshot_days" = 0.0
[vary]
"wavemaker.injection_rate" = [5e-6, 2e-5]
"model.u1" = [14.0, 16.0]
` + more
	p := filepath.Join(dir, "sweep.toml")
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestSweep runs the one-key form (a shorthand for a sweep file of one
// list) over a configuration file, and checks the members' outputs, that
// a bad value is refused naming the key, and that -member runs one member
// alone.
func TestSweep(t *testing.T) {
	dir := t.TempDir()
	// the stochastic built-in experiment, whose injection rate is swept,
	// coarse and short
	st := experiment.StormTrack()
	st.Model.Nx, st.Model.Ny, st.Model.Dt = 64, 32, 3600
	st.Run.Days, st.Run.SpinUpDays, st.Run.ReportDays, st.Run.SampleSteps, st.Run.SnapshotDays = 4, 1, 2, 1, 0
	cfg := filepath.Join(dir, "short.toml")
	os.WriteFile(cfg, []byte(st.TOML()), 0o644)
	out := filepath.Join(dir, "out")
	got, err := runCLI("sweep", "-config", cfg, "-key", "wavemaker.injection_rate", "-values", "1e-6,4e-6", "-jobs", "2", "-out", out)
	if err != nil {
		t.Fatalf("sweep: %v\n%s", err, got)
	}
	names := []string{"000_injection_rate=1e-06", "001_injection_rate=4e-06"}
	for _, m := range names {
		if !strings.Contains(got, m+" ") {
			t.Errorf("the table lacks %s:\n%s", m, got)
		}
	}
	// The injected energy scales with the set rate (Novikov 1965: the
	// injection rate is set by the forcing's covariance): the two
	// members' summaries must follow the swept values.
	var rates [2]float64
	for i, m := range names {
		b, err := os.ReadFile(filepath.Join(out, m, "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		var s map[string]any
		json.Unmarshal(b, &s)
		rates[i] = s["energy"].(map[string]any)["rates"].(map[string]any)["injection"].(float64)
	}
	if !(rates[1] > 2*rates[0]) {
		t.Errorf("injection rates %g and %g do not follow the swept values 1e-6 and 4e-6", rates[0], rates[1])
	}
	if _, err := runCLI("sweep", "-config", cfg, "-key", "wavemaker.injection_rate", "-values", "1e-6,-2"); err == nil || !strings.Contains(err.Error(), "wavemaker.injection_rate") {
		t.Errorf("bad value: got %v, want an error naming wavemaker.injection_rate", err)
	}
	one := filepath.Join(dir, "one")
	got, err = runCLI("sweep", "-config", cfg, "-key", "model.drag", "-values", "1e-6,2e-6", "-member", "1", "-out", one)
	if err != nil {
		t.Fatal(err)
	}
	ents, _ := os.ReadDir(one)
	var members []string
	for _, e := range ents {
		if e.IsDir() && !strings.HasPrefix(e.Name(), ".") {
			members = append(members, e.Name())
		}
	}
	if len(members) != 1 || members[0] != "001_drag=2e-06" {
		t.Errorf("-member 1 ran %v:\n%s", members, got)
	}
}

// TestSweepFileRefusedBeforeRun checks that a sweep file with an unknown
// key, an empty list or a value of the wrong type is refused naming the
// key, before anything runs or is written (common practice: bad input is
// found before any long work).
func TestSweepFileRefusedBeforeRun(t *testing.T) {
	for _, tc := range []struct{ body, key string }{
		{`"model.shear" = [1.0]`, "model.shear"},
		{`"block.dipole.height" = []`, "block.dipole.height"},
		{`"model.u2" = [4.0, "four"]`, "model.u2"},
	} {
		dir := t.TempDir()
		f := sweepFile(t, dir, 4, tc.body+"\n")
		out := filepath.Join(dir, "out")
		got, err := runCLI("sweep", "-file", f, "-out", out)
		if err == nil || !strings.Contains(err.Error(), tc.key) {
			t.Errorf("%s: got %v, want an error naming %s", tc.body, err, tc.key)
		}
		if strings.Contains(got, "started") {
			t.Errorf("%s: a member ran:\n%s", tc.body, got)
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("%s: the sweep directory was made", tc.body)
		}
	}
}

// TestSweepOutIsFile checks that -out naming a file is refused with a clear
// error before any member runs, and the file is left as it was.
func TestSweepOutIsFile(t *testing.T) {
	dir := t.TempDir()
	f := sweepFile(t, dir, 4, "")
	file := filepath.Join(dir, "results")
	os.WriteFile(file, []byte("keep me"), 0o644)
	got, err := runCLI("sweep", "-file", f, "-out", file)
	if err == nil || !strings.Contains(err.Error(), "-out") || !strings.Contains(err.Error(), "not a directory") {
		t.Errorf("got %v, want an error naming -out and saying it is not a directory", err)
	}
	if strings.Contains(got, "started") {
		t.Errorf("a member ran:\n%s", got)
	}
	if b, _ := os.ReadFile(file); string(b) != "keep me" {
		t.Error("the file was changed")
	}
}

// TestSweepSignalThenResume stops a 4-member sweep run by the program with
// SIGTERM (what a batch scheduler sends) while two members run, checks the
// exit status 143 (128 + SIGTERM's number, the shell's convention) and the
// checkpoints, runs the same command again, and checks that the stopped
// members resumed and that the gathered table equals an uninterrupted
// sweep's, byte for byte (the model is bit-reproducible; a restart
// continues a run bit for bit).
func TestSweepSignalThenResume(t *testing.T) {
	dir := t.TempDir()
	f := sweepFile(t, dir, 20, "")
	ref := filepath.Join(dir, "ref")
	if got, err := runCLI("sweep", "-quiet", "-file", f, "-out", ref, "-jobs", "2"); err != nil {
		t.Fatalf("%v\n%s", err, got)
	}

	out := filepath.Join(dir, "out")
	c := cli("sweep", "-file", f, "-out", out, "-jobs", "2")
	stdout, err := c.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	var errb bytes.Buffer
	c.Stderr = &errb
	if err := c.Start(); err != nil {
		t.Fatal(err)
	}
	var log strings.Builder
	sc := bufio.NewScanner(stdout)
	signalled := false
	for sc.Scan() {
		line := sc.Text()
		log.WriteString(line + "\n")
		// the first progress line of a member: it is past day 1 and
		// has written a checkpoint
		if !signalled && strings.Contains(line, ": day    2.0") {
			c.Process.Signal(syscall.SIGTERM)
			signalled = true
		}
	}
	err = c.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 143 {
		t.Fatalf("the stopped sweep exited with %v, want status 143\n%s%s", err, log.String(), errb.String())
	}
	if !strings.Contains(log.String(), "stopped by SIGTERM") || !strings.Contains(log.String(), "checkpoint written") {
		t.Errorf("the stopped sweep's output:\n%s", log.String())
	}
	ckpts, _ := filepath.Glob(filepath.Join(out, "*.partial", "restart.ckpt"))
	if len(ckpts) == 0 {
		t.Fatalf("no checkpoint left:\n%s", log.String())
	}

	got, err := runCLI("sweep", "-file", f, "-out", out, "-jobs", "2")
	if err != nil {
		t.Fatalf("resumed sweep: %v\n%s", err, got)
	}
	if n := strings.Count(got, "resumed from its checkpoint"); n != len(ckpts) {
		t.Errorf("%d members resumed, %d had checkpoints:\n%s", n, len(ckpts), got)
	}
	for _, d := range []string{ref, out} {
		if got, err := runGather(d, "-quiet"); err != nil {
			t.Fatalf("gather %s: %v\n%s", d, err, got)
		}
	}
	a, _ := os.ReadFile(filepath.Join(ref, gatheredCSV))
	b, _ := os.ReadFile(filepath.Join(out, gatheredCSV))
	if len(a) == 0 || !bytes.Equal(a, b) {
		t.Errorf("the resumed sweep's table differs from the uninterrupted one's:\n%s\nwant\n%s", b, a)
	}
}

func runGather(args ...string) (string, error) {
	var out, errb bytes.Buffer
	err := cmdGather(args, &out, &errb)
	return out.String() + errb.String(), err
}

// TestSweepShardAuto checks that -shard auto inside a Slurm job array runs
// the member whose index is the task's (sbatch(1): each task of an array
// gets its index in SLURM_ARRAY_TASK_ID), and that an index beyond the
// members is refused with the sbatch line to use.
func TestSweepShardAuto(t *testing.T) {
	dir := t.TempDir()
	f := sweepFile(t, dir, 4, "")
	out := filepath.Join(dir, "out")
	t.Setenv("SLURM_ARRAY_TASK_ID", "2")
	if got, err := runCLI("sweep", "-file", f, "-out", out, "-shard", "auto"); err != nil {
		t.Fatalf("%v\n%s", err, got)
	}
	done, _ := filepath.Glob(filepath.Join(out, "*", "summary.json"))
	if len(done) != 1 || !strings.Contains(done[0], "002_injection_rate=2e-05,u1=14") {
		t.Errorf("task 2 ran %v", done)
	}
	t.Setenv("SLURM_ARRAY_TASK_ID", "4")
	if _, err := runCLI("sweep", "-file", f, "-out", out, "-shard", "auto"); err == nil || !strings.Contains(err.Error(), "--array=0-3") {
		t.Errorf("task 4 of a 4-member sweep: %v, want an error giving --array=0-3", err)
	}
}

// TestGatherCommand runs gather on a sweep of which one member ran: it
// writes the CSV and NetCDF tables and the figure, lists the missing
// members, and refuses a bad -y before writing anything (common practice:
// bad input is refused before anything is written).
func TestGatherCommand(t *testing.T) {
	dir := t.TempDir()
	f := sweepFile(t, dir, 4, "")
	out := filepath.Join(dir, "out")
	if got, err := runCLI("sweep", "-quiet", "-file", f, "-out", out, "-shard", "1/4"); err != nil {
		t.Fatalf("%v\n%s", err, got)
	}
	if got, err := runGather(out, "-x", "model.u1", "-y", "eddy_rate"); err == nil || !strings.Contains(err.Error(), "eddy_rate") {
		t.Errorf("bad -y: %v\n%s", err, got)
	}
	if _, err := os.Stat(filepath.Join(out, gatheredCSV)); err == nil {
		t.Error("a bad -y wrote the table")
	}
	got, err := runGather(out, "-x", "model.u1", "-y", "eddy_per_day", "-by", "wavemaker.injection_rate")
	if err != nil {
		t.Fatalf("%v\n%s", err, got)
	}
	for _, w := range []string{"3 of 4 members missing", "member 0 000_injection_rate=5e-06,u1=14: not run", "001_injection_rate=5e-06,u1=16 "} {
		if !strings.Contains(got, w) {
			t.Errorf("gather output lacks %q:\n%s", w, got)
		}
	}
	csv, _ := os.ReadFile(filepath.Join(out, gatheredCSV))
	if lines := strings.Split(strings.TrimSpace(string(csv)), "\n"); len(lines) != 5 || !strings.Contains(lines[2], ",done,") {
		t.Errorf("gathered.csv:\n%s", csv)
	}
	for _, name := range []string{gatheredNC, "eddy_per_day_vs_model.u1_by_wavemaker.injection_rate.png"} {
		if st, err := os.Stat(filepath.Join(out, name)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", name, err)
		}
	}
	if _, err := runGather(filepath.Join(dir, "nowhere")); err == nil || !strings.Contains(err.Error(), "no sweep") {
		t.Errorf("gather of a directory without a sweep: %v", err)
	}
}
