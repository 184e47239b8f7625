package sweep

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/internal/settings"
	"github.com/eddyblock/eddyblock/output"
)

// Options says where a sweep runs and how.
type Options struct {
	// Dir is the sweep directory: one output directory per member, named
	// by Member.Name, beside RecordFile and CopyFile.
	Dir string
	// Jobs is the number of members run at the same time; 0 means the
	// number of cores (runtime.NumCPU) divided by the workers of each
	// member, at least 1, so that a sweep does not oversubscribe the
	// machine.
	Jobs int
	// Workers, if not 0, sets model.workers of every member (it does
	// not change the results, and may differ between runs of a sweep).
	Workers int
	// Shard selects the members to run; the zero Shard runs every one.
	Shard Shard
	// Plot writes each member's figures beside its other files.
	Plot bool
	// Event, if not nil, is called when a member starts, ends or is
	// passed over. Calls are serialised.
	Event func(Event)
	// Report, if not nil, is called at every progress report of a
	// running member. Calls are serialised with each other and with
	// Event.
	Report func(Member, experiment.Progress)
	// OnStep, if not nil, is called after every step of a running member,
	// from the goroutine running it: calls for different members come
	// concurrently.
	OnStep func(Member, *experiment.Experiment)
}

// Status is what became of a member.
type Status int

const (
	Pending  Status = iota // not run: not reached, or the sweep was stopped first
	Running                // running now (in events only)
	Finished               // its outputs were there already: not run again
	Done                   // ran to its end
	Stopped                // stopped when the context was cancelled; its checkpoint was written
	Failed                 // failed; Err says why, and <name>.failed keeps it
	Busy                   // being run by another process (its lock is held)
)

var statusNames = [...]string{"pending", "running", "finished earlier", "done", "stopped", "failed", "run elsewhere"}

func (s Status) String() string {
	if int(s) < len(statusNames) {
		return statusNames[s]
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// Outcome is a member's fate in one Execute.
type Outcome struct {
	Member Member
	Status Status
	Err    error
	// StartDay is the model day the member started from (0, or its
	// checkpoint's); EndDay the day it reached.
	StartDay, EndDay float64
	Wall             time.Duration
}

// Counts are the numbers of a Run's members in each state.
type Counts struct {
	Done    int // finished earlier or now
	Running int
	Left    int // pending
	Stopped int // stopped with a checkpoint
	Failed  int
	// Elsewhere are members another process was running (their locks
	// were held): that process finishes them.
	Elsewhere int
}

// Event reports a change in a member's state.
type Event struct {
	Outcome
	// Counts are the Run's members by state after the change.
	Counts Counts
}

// Run is a sweep ready to run in its directory.
type Run struct {
	plan     *Plan
	opt      Options
	jobs     int
	selected []int // indices of the members of the shard
	outcomes []Outcome

	mu     sync.Mutex // serialises events and guards outcomes
	counts Counts
}

// Prepare checks, before anything runs, everything the sweep needs: that
// Dir is a directory (made if missing) that is empty or holds the same
// sweep (a ChangedError names each key and value that differs), that
// every member of the shard not finished yet builds (its configuration
// and initial state: experiment.New), then records the sweep in Dir.
// Members already finished (their outputs are in place: output.Finished)
// are not run again; interrupted ones continue from their checkpoints.
func Prepare(p *Plan, o Options) (*Run, error) {
	if strings.TrimSpace(o.Dir) == "" {
		return nil, errors.New("sweep: no directory (Options.Dir)")
	}
	if o.Jobs < 0 {
		return nil, fmt.Errorf("sweep: Jobs = %d, want 0 (automatic) or more", o.Jobs)
	}
	if o.Workers < 0 {
		return nil, fmt.Errorf("sweep: Workers = %d, want 0 (the configuration's) or more", o.Workers)
	}
	if o.Shard.Count > 1 && (o.Shard.Index < 0 || o.Shard.Index >= o.Shard.Count) {
		return nil, fmt.Errorf("sweep: %v: the index must be in 0–%d", o.Shard, o.Shard.Count-1)
	}
	if st, err := os.Stat(o.Dir); err == nil && !st.IsDir() {
		return nil, &DirError{o.Dir, errors.New("exists and is not a directory")}
	} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, &DirError{o.Dir, err}
	}
	rec, err := p.newRecord()
	if err != nil {
		return nil, err
	}
	// a directory of another sweep is refused before the members are built
	if old, err := readRecord(o.Dir); err == nil && old.PlanSHA256 != rec.PlanSHA256 {
		return nil, &ChangedError{o.Dir, settings.Diff(old.Identity, rec.Identity)}
	} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, &DirError{o.Dir, err}
	}
	r := &Run{plan: p, opt: o}
	perMember := o.Workers
	for _, m := range p.Members {
		if !o.Shard.Contains(m.Index) {
			continue
		}
		r.selected = append(r.selected, m.Index)
		out := Outcome{Member: m}
		if output.Finished(MemberDir(o.Dir, m)) {
			out.Status = Finished
			r.counts.Done++
		} else {
			c := r.config(m)
			e, err := experiment.New(c)
			if err != nil {
				return nil, fmt.Errorf("sweep: member %d (%s): %w", m.Index, m.Name, err)
			}
			e.Close()
			r.counts.Left++
			if o.Workers == 0 {
				perMember = max(perMember, c.Model.Workers)
			}
		}
		r.outcomes = append(r.outcomes, out)
	}
	r.jobs = o.Jobs
	if r.jobs == 0 {
		r.jobs = max(1, runtime.NumCPU()/max(1, perMember))
	}
	r.jobs = max(1, min(r.jobs, r.counts.Left))
	if err := claimDir(o.Dir, rec, p.Spec.Source()); err != nil {
		return nil, err
	}
	return r, nil
}

// MemberDir is the output directory of member m in the sweep directory dir.
func MemberDir(dir string, m Member) string { return filepath.Join(dir, m.Name) }

// config is the configuration member m runs with.
func (r *Run) config(m Member) experiment.Config {
	c := m.Config
	if r.opt.Workers > 0 {
		c.Model.Workers = r.opt.Workers
	}
	return c
}

// Jobs returns the number of members run at the same time (at most the
// number of members to run).
func (r *Run) Jobs() int { return r.jobs }

// Outcomes returns what became of each member of the shard, in order.
func (r *Run) Outcomes() []Outcome {
	r.mu.Lock()
	defer r.mu.Unlock()
	return append([]Outcome(nil), r.outcomes...)
}

// Counts returns the members of the shard by state.
func (r *Run) Counts() Counts {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.counts
}

// Execute runs the members of the shard that are not finished, Jobs at a
// time, each through output.Prepare with Resume (so that an interrupted
// member continues from the checkpoint in its staging directory) and
// output.Run.Execute. A member that fails does not stop the others; its
// error is kept in <name>.failed and it runs again the next time. A member
// another process is running (its lock is held) is passed over (Busy).
// When ctx is cancelled, running members write their checkpoints and
// stop, no other member starts, and Execute returns ctx's error. Otherwise
// the error is a *FailedError if a member failed, or nil.
func (r *Run) Execute(ctx context.Context) error {
	sem := make(chan struct{}, r.jobs)
	var wg sync.WaitGroup
loop:
	for k, out := range r.outcomes {
		if out.Status != Pending {
			continue
		}
		select {
		case sem <- struct{}{}:
		case <-ctx.Done():
			break loop
		}
		if ctx.Err() != nil {
			<-sem
			break
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer func() { <-sem }()
			r.runMember(ctx, k)
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return err
	}
	var bad []Outcome
	for _, out := range r.Outcomes() {
		if out.Status == Failed {
			bad = append(bad, out)
		}
	}
	if len(bad) > 0 {
		return &FailedError{Dir: r.opt.Dir, Members: bad, Of: len(r.outcomes)}
	}
	return nil
}

// update records a member's new state and reports it.
func (r *Run) update(k int, out Outcome) {
	r.mu.Lock()
	defer r.mu.Unlock()
	count := func(s Status, d int) {
		switch s {
		case Pending:
			r.counts.Left += d
		case Running:
			r.counts.Running += d
		case Finished, Done:
			r.counts.Done += d
		case Stopped:
			r.counts.Stopped += d
		case Busy:
			r.counts.Elsewhere += d
		default:
			r.counts.Failed += d
		}
	}
	count(r.outcomes[k].Status, -1)
	count(out.Status, +1)
	r.outcomes[k] = out
	if r.opt.Event != nil {
		r.opt.Event(Event{Outcome: out, Counts: r.counts})
	}
}

// runMember runs member k of the shard.
func (r *Run) runMember(ctx context.Context, k int) {
	m := r.outcomes[k].Member
	dir := MemberDir(r.opt.Dir, m)
	out := Outcome{Member: m}
	start := time.Now()
	fail := func(err error) {
		out.Status, out.Err, out.Wall = Failed, err, time.Since(start)
		os.WriteFile(filepath.Join(r.opt.Dir, m.Name+failedExt), []byte(err.Error()+"\n"), 0o644)
		r.update(k, out)
	}
	unlock, ok, err := lockMember(r.opt.Dir, m.Name)
	if err != nil {
		fail(err)
		return
	}
	if !ok {
		out.Status = Busy
		out.Err = errors.New("another process is running it (its lock is held)")
		r.update(k, out)
		return
	}
	defer unlock()
	if output.Finished(dir) { // finished by another process meanwhile
		out.Status = Finished
		r.update(k, out)
		return
	}
	c := r.config(m)
	// (A member killed after its last checkpoint, at its end, but before
	// its files were written resumes from that checkpoint and writes them.)
	os.Remove(filepath.Join(r.opt.Dir, m.Name+failedExt))
	run, err := output.Prepare(c, output.Options{
		Dir: dir, Resume: true, Plot: r.opt.Plot,
		Report: func(p experiment.Progress) {
			if r.opt.Report != nil {
				r.mu.Lock()
				r.opt.Report(m, p)
				r.mu.Unlock()
			}
		},
		OnStep: func(e *experiment.Experiment) {
			if r.opt.OnStep != nil {
				r.opt.OnStep(m, e)
			}
		},
	})
	if err != nil {
		fail(fmt.Errorf("%w (to start this member again from day 0, remove %s)", err, output.StagingDir(dir)))
		return
	}
	e := run.Experiment()
	out.StartDay = e.Model.Time() / 86400
	out.Status = Running
	r.update(k, out)
	err = run.Execute(ctx)
	run.Close()
	out.EndDay, out.Wall = e.Model.Time()/86400, time.Since(start)
	var ferr *output.FiguresError
	switch {
	case err == nil:
		out.Status = Done
	case errors.As(err, &ferr) && output.Finished(dir):
		out.Status, out.Err = Done, err
	case ctx.Err() != nil && errors.Is(err, ctx.Err()):
		out.Status, out.Err = Stopped, err
	default:
		fail(err)
		return
	}
	r.update(k, out)
}

// FailedError reports the members of a sweep that failed.
type FailedError struct {
	Dir     string
	Members []Outcome
	Of      int // members in the shard
}

func (e *FailedError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "sweep %s: %d of %d members failed (running the sweep again retries them):", e.Dir, len(e.Members), e.Of)
	for _, o := range e.Members {
		fmt.Fprintf(&b, "\n  member %d (%s): %v", o.Member.Index, o.Member.Name, o.Err)
	}
	return b.String()
}
