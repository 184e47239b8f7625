package sweep

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
)

// four is a sweep of four members (two source strengths × two shears) of
// the stochastic experiment, 64×32 for 8 days, reporting every day.
const four = small + `
"run.days" = 8.0
[vary]
"wavemaker.injection_rate" = [5e-6, 2e-5]
"model.u1" = [14.0, 16.0]
`

// fourPlan returns the plan of four (with run.days replaced, as [fixed]
// may not give a key twice).
func fourPlan(t *testing.T) *Plan {
	t.Helper()
	src := strings.Replace(four, "\"run.days\" = 4.0\n", "", 1)
	p, err := parse(t, src).Expand()
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// execute prepares and runs a plan in dir.
func execute(t *testing.T, ctx context.Context, p *Plan, o Options) (*Run, error) {
	t.Helper()
	r, err := Prepare(p, o)
	if err != nil {
		t.Fatal(err)
	}
	return r, r.Execute(ctx)
}

// csvOf gathers dir as CSV.
func csvOf(t *testing.T, dir string) string {
	t.Helper()
	tb, err := Gather(dir)
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := tb.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// TestInterruptedSweepResumesToSameTable stops a 4-member sweep while two
// members run (the context is cancelled after some of their steps, as
// SIGTERM does in the program), runs it again, and checks that the members
// that were stopped resumed from their checkpoints and that the gathered
// table is the same, byte for byte, as an uninterrupted sweep's (common
// practice: a restart continues a run bit for bit; the model is
// bit-reproducible).
func TestInterruptedSweepResumesToSameTable(t *testing.T) {
	p := fourPlan(t)
	ref := t.TempDir()
	if _, err := execute(t, context.Background(), p, Options{Dir: ref, Jobs: 2}); err != nil {
		t.Fatal(err)
	}
	want := csvOf(t, ref)
	if strings.Count(want, ",done,") != 4 {
		t.Fatalf("reference sweep not complete:\n%s", want)
	}

	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	var steps [4]atomic.Int64
	r, err := execute(t, ctx, p, Options{Dir: dir, Jobs: 2, OnStep: func(m Member, e *experiment.Experiment) {
		// members 0 and 1 run at once; stop both once each is past
		// day 1 (24 steps), mid-run
		steps[m.Index].Add(1)
		if steps[0].Load() >= 30 && steps[1].Load() >= 30 {
			cancel()
		}
	}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("interrupted sweep returned %v, want context.Canceled", err)
	}
	var stopped []int
	for _, o := range r.Outcomes() {
		switch o.Status {
		case Stopped:
			stopped = append(stopped, o.Member.Index)
			if _, err := os.Stat(output.CheckpointIn(MemberDir(dir, o.Member))); err != nil {
				t.Errorf("stopped member %d left no checkpoint: %v", o.Member.Index, err)
			}
		case Pending:
		default:
			t.Errorf("member %d: %v after the interruption (%v)", o.Member.Index, o.Status, o.Err)
		}
	}
	if len(stopped) != 2 {
		t.Fatalf("%d members stopped, want the 2 running ones", len(stopped))
	}
	if tb, err := Gather(dir); err != nil || len(tb.Missing()) != 4 || tb.Rows[stopped[0]].State != StateInterrupted || tb.Rows[3].State != StateNotRun {
		t.Errorf("gather of the interrupted sweep: %v; rows %+v", err, tb.Rows)
	}

	r, err = execute(t, context.Background(), p, Options{Dir: dir, Jobs: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range r.Outcomes() {
		wasStopped := o.Member.Index == stopped[0] || o.Member.Index == stopped[1]
		if o.Status != Done || (wasStopped && !(o.StartDay >= 1)) || (!wasStopped && o.StartDay != 0) {
			t.Errorf("member %d: %v from day %g (stopped before: %v)", o.Member.Index, o.Status, o.StartDay, wasStopped)
		}
	}
	if got := csvOf(t, dir); got != want {
		t.Errorf("resumed sweep's table differs from the uninterrupted one's:\n%s\nwant\n%s", got, want)
	}

	// a third run finds everything finished and runs nothing
	var started atomic.Int64
	r, err = execute(t, context.Background(), p, Options{Dir: dir, Event: func(ev Event) {
		if ev.Status == Running {
			started.Add(1)
		}
	}})
	if err != nil || started.Load() != 0 || r.Counts().Done != 4 {
		t.Errorf("re-run of a finished sweep: %v, %d members started, counts %+v", err, started.Load(), r.Counts())
	}
}

// TestShardsRunEveryMemberOnce runs a sweep as three shards, one after the
// other in the same directory, and checks that each member ran in exactly
// one shard and that the table is complete.
func TestShardsRunEveryMemberOnce(t *testing.T) {
	p := fourPlan(t)
	dir := t.TempDir()
	ran := map[int]int{}
	for i := range 3 {
		r, err := execute(t, context.Background(), p, Options{Dir: dir, Shard: Shard{i, 3}})
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range r.Outcomes() {
			if o.Status != Done {
				t.Errorf("shard %d: member %d %v", i, o.Member.Index, o.Status)
			}
			ran[o.Member.Index]++
		}
	}
	for m := range 4 {
		if ran[m] != 1 {
			t.Errorf("member %d ran %d times", m, ran[m])
		}
	}
	if tb, err := Gather(dir); err != nil || len(tb.Missing()) != 0 {
		t.Errorf("gather: %v, missing %v", err, tb.Missing())
	}
}

// TestConcurrentProcessesRunEachMemberOnce runs the same sweep twice at
// once in one directory (as two tasks of a job array without -shard
// would): each member runs in one of them only, the other passing it over
// (its lock is held) or finding it finished.
func TestConcurrentProcessesRunEachMemberOnce(t *testing.T) {
	p := fourPlan(t)
	dir := t.TempDir()
	var wg sync.WaitGroup
	runs := make([]*Run, 2)
	for k := range runs {
		r, err := Prepare(p, Options{Dir: dir, Jobs: 1})
		if err != nil {
			t.Fatal(err)
		}
		runs[k] = r
	}
	for _, r := range runs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var fe *FailedError
			if err := r.Execute(context.Background()); err != nil && !errors.As(err, &fe) {
				t.Error(err)
			}
		}()
	}
	wg.Wait()
	for m := range 4 {
		done := 0
		for _, r := range runs {
			switch s := r.Outcomes()[m].Status; s {
			case Done:
				done++
			case Busy, Finished:
			default:
				t.Errorf("member %d: %v", m, s)
			}
		}
		if done != 1 {
			t.Errorf("member %d ran %d times", m, done)
		}
	}
	if tb, err := Gather(dir); err != nil || len(tb.Missing()) != 0 {
		t.Errorf("gather: %v, missing %v", err, tb.Missing())
	}
}

// TestChangedSweepRefused checks that a sweep directory is not reused by a
// different sweep, with every differing key and both values named, while
// the same sweep written differently (comments, integer for float, other
// workers) is accepted; and that nothing is run or written first.
func TestChangedSweepRefused(t *testing.T) {
	dir := t.TempDir()
	base := small + `
[vary]
"model.u1" = [14.0, 16.0]
`
	p, err := parse(t, base).Expand()
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Prepare(p, Options{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	record, _ := os.ReadFile(filepath.Join(dir, RecordFile))
	for _, tc := range []struct {
		src  string
		want []string
	}{
		{strings.Replace(base, "[14.0, 16.0]", "[14.0, 18.0]", 1), []string{"vary.model.u1", "[14.0, 16.0] → [14.0, 18.0]"}},
		{strings.Replace(base, "seed = 11", "seed = 12", 1), []string{"seed: 11 → 12"}},
		{strings.Replace(base, `"model.dt" = 3600.0`, `"model.dt" = 1800.0`, 1), []string{"base.model.dt: 3600 → 1800"}},
		{strings.Replace(base, `"model.u1" = [14.0, 16.0]`, `"model.u2" = [4.0, 5.0]`, 1), []string{"vary.model.u1: [14.0, 16.0] → (absent)", "vary.model.u2: (absent) → [4.0, 5.0]"}},
	} {
		q, err := parse(t, tc.src).Expand()
		if err != nil {
			t.Fatal(err)
		}
		_, err = Prepare(q, Options{Dir: dir})
		var ce *ChangedError
		if !errors.As(err, &ce) {
			t.Errorf("changed sweep: %v, want a ChangedError", err)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("error lacks %q:\n%v", w, err)
			}
		}
	}
	same := "# the same members\n" + strings.Replace(base, "[14.0, 16.0]", "[14, 16]", 1)
	q, err := parse(t, same).Expand()
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Prepare(q, Options{Dir: dir, Workers: 2}); err != nil {
		t.Errorf("the same sweep written differently, with 2 workers: %v", err)
	}
	if now, _ := os.ReadFile(filepath.Join(dir, RecordFile)); !bytes.Equal(now, record) {
		t.Error("the record changed")
	}
	ents, _ := os.ReadDir(dir)
	for _, e := range ents {
		if e.Name() != RecordFile && e.Name() != CopyFile {
			t.Errorf("%s was written before any member ran", e.Name())
		}
	}
}

// TestBadDirectoryRefusedBeforeRun checks that a sweep directory that is a
// file, or a directory holding other files, is refused by Prepare with a
// clear error, before any member is built or anything written.
func TestBadDirectoryRefusedBeforeRun(t *testing.T) {
	p := fourPlan(t)
	tmp := t.TempDir()
	file := filepath.Join(tmp, "a-file")
	os.WriteFile(file, []byte("data"), 0o644)
	_, err := Prepare(p, Options{Dir: file})
	var de *DirError
	if !errors.As(err, &de) || !strings.Contains(err.Error(), "not a directory") {
		t.Errorf("a file as the directory: %v", err)
	}
	if b, _ := os.ReadFile(file); string(b) != "data" {
		t.Error("the file was changed")
	}
	other := filepath.Join(tmp, "other")
	os.Mkdir(other, 0o755)
	os.WriteFile(filepath.Join(other, "notes.txt"), []byte("mine"), 0o644)
	if _, err := Prepare(p, Options{Dir: other}); !errors.As(err, &de) || !strings.Contains(err.Error(), "not empty") {
		t.Errorf("a directory of other files: %v", err)
	}
	if ents, _ := os.ReadDir(other); len(ents) != 1 {
		t.Errorf("%d entries in the refused directory, want its 1 file", len(ents))
	}
}

// TestWorkersDoNotChangeResults runs one member with 1 and 2 workers per
// step through the sweep runner and compares the tables (the model is
// bit-identical for any number of workers; see qg's
// TestWorkersBitIdentical).
func TestWorkersDoNotChangeResults(t *testing.T) {
	p := fourPlan(t)
	a, b := t.TempDir(), t.TempDir()
	if _, err := execute(t, context.Background(), p, Options{Dir: a, Shard: Shard{1, 4}, Workers: 1}); err != nil {
		t.Fatal(err)
	}
	if _, err := execute(t, context.Background(), p, Options{Dir: b, Shard: Shard{1, 4}, Workers: 2}); err != nil {
		t.Fatal(err)
	}
	if csvOf(t, a) != csvOf(t, b) {
		t.Error("the tables differ between 1 and 2 workers")
	}
}

// TestFailedMemberKeptAndRetried runs a sweep in which one member stops
// with an error (its CFL number passes model.max_cfl = 0.36 on day 2, an
// error qg's step check raises): the other member finishes, Execute
// returns a *FailedError naming the failed one, the error is kept beside
// it and shown by Gather, and running the sweep again tries it again while
// the finished member is not run again.
func TestFailedMemberKeptAndRetried(t *testing.T) {
	p, err := parse(t, small+`
[vary]
"model.max_cfl" = [1.0, 0.36]
`).Expand()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	_, err = execute(t, context.Background(), p, Options{Dir: dir})
	var fe *FailedError
	if !errors.As(err, &fe) || len(fe.Members) != 1 || fe.Members[0].Member.Index != 1 || !strings.Contains(err.Error(), "CFL") {
		t.Fatalf("got %v, want a FailedError naming member 1 and the CFL number", err)
	}
	tb, err := Gather(dir)
	if err != nil {
		t.Fatal(err)
	}
	if tb.Rows[0].State != StateDone || tb.Rows[1].State != StateFailed || !strings.Contains(tb.Rows[1].Note, "max_cfl") {
		t.Errorf("gathered states %q, %q (note %q)", tb.Rows[0].State, tb.Rows[1].State, tb.Rows[1].Note)
	}
	var started []int
	_, err = execute(t, context.Background(), p, Options{Dir: dir, Event: func(ev Event) {
		if ev.Status == Running {
			started = append(started, ev.Member.Index)
		}
	}})
	if !errors.As(err, &fe) || len(started) != 1 || started[0] != 1 {
		t.Errorf("second run: %v, members started %v; want member 1 alone, failing again", err, started)
	}
}

// TestMemberKilledAfterItsLastCheckpoint leaves a member as a process
// killed after its last checkpoint (at the run's end) but before its files
// were written would: a staging directory whose checkpoint is at the end.
// The sweep resumes it from that checkpoint, which has nothing left to
// integrate, writes its files, and gets the same answers.
func TestMemberKilledAfterItsLastCheckpoint(t *testing.T) {
	p := fourPlan(t)
	ref := t.TempDir()
	if _, err := execute(t, context.Background(), p, Options{Dir: ref, Shard: Shard{0, 4}}); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if _, err := Prepare(p, Options{Dir: dir, Shard: Shard{0, 4}}); err != nil {
		t.Fatal(err)
	}
	m := p.Members[0]
	ck := output.CheckpointIn(MemberDir(dir, m))
	os.MkdirAll(filepath.Dir(ck), 0o755)
	r, err := output.Prepare(m.Config, output.Options{Checkpoint: ck})
	if err != nil {
		t.Fatal(err)
	}
	if err := r.Execute(context.Background()); err != nil {
		t.Fatal(err)
	}
	r.Close()
	run, err := execute(t, context.Background(), p, Options{Dir: dir, Shard: Shard{0, 4}})
	if err != nil {
		t.Fatal(err)
	}
	if o := run.Outcomes()[0]; o.Status != Done || o.StartDay != m.Config.Run.Days {
		t.Errorf("member 0: %v from day %g, want done from its end, day %g", o.Status, o.StartDay, m.Config.Run.Days)
	}
	if a, b := csvOf(t, ref), csvOf(t, dir); a != b {
		t.Errorf("tables differ:\n%s\n%s", a, b)
	}
}

// TestSimultaneousClaims prepares the same sweep in a new directory from
// eight goroutines at once, as the tasks of a job array starting together
// do: every one succeeds, and one record is written, whole.
func TestSimultaneousClaims(t *testing.T) {
	p := fourPlan(t)
	dir := filepath.Join(t.TempDir(), "new")
	var wg sync.WaitGroup
	errs := make([]error, 8)
	for i := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			_, errs[i] = Prepare(p, Options{Dir: dir, Shard: Shard{i % 4, 4}})
		}()
	}
	wg.Wait()
	for i, err := range errs {
		if err != nil {
			t.Errorf("claim %d: %v", i, err)
		}
	}
	rec, err := readRecord(dir)
	if err != nil || len(rec.Members) != 4 {
		t.Fatalf("record: %v", err)
	}
	ents, _ := os.ReadDir(dir)
	for _, e := range ents {
		if e.Name() != RecordFile && e.Name() != CopyFile {
			t.Errorf("left behind: %s", e.Name())
		}
	}
}
