package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/sweep"
)

const sweepUsage = `usage:
  eddyblock sweep -file sweep.toml -out DIR [-jobs N] [-shard i/n|auto|auto/n] [-workers N] [-plot] [-quiet]
  eddyblock sweep -key K -values v1,v2,... [-config file.toml] [-out DIR] [-jobs N] [-member i] ...

A sweep file names configuration keys with lists of values ([vary], a
Cartesian product; [[vary_together]], lists varied together) on top of a
base configuration (base = "built-in name" or base_file = "file.toml") and
[fixed] keys; see the package documentation of sweep. Each member runs in
DIR/<index>_<key>=<value>,...; running the same sweep again skips finished
members and resumes interrupted ones. -shard i/n runs members i, i+n, i+2n,
... (0-based); -shard auto takes i from SLURM_ARRAY_TASK_ID and runs that
one member (submit with sbatch --array=0-(members-1)); -shard auto/n takes
the shard of n from it (sbatch --array=0-(n-1)).`

// sweepFlags are the options of the sweep command.
type sweepFlags struct {
	file, key, values, config, out, shard string
	jobs, workers, member                 int
	plot, quiet                           bool
	set                                   map[string]bool
}

func parseSweepFlags(args []string, stderr io.Writer) (*sweepFlags, error) {
	f := &sweepFlags{}
	fs := flag.NewFlagSet("sweep", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { fmt.Fprintln(stderr, sweepUsage); fs.PrintDefaults() }
	fs.StringVar(&f.file, "file", "", "sweep file (TOML)")
	fs.StringVar(&f.key, "key", "", "one configuration key to sweep, e.g. wavemaker.injection_rate (with -values)")
	fs.StringVar(&f.values, "values", "", "comma-separated values of -key, as written in a configuration file")
	fs.StringVar(&f.config, "config", "", "with -key: the base configuration file (default: the built-in experiment)")
	fs.StringVar(&f.out, "out", "", "sweep directory: one sub-directory per member (required with -file)")
	fs.IntVar(&f.jobs, "jobs", 0, "members run at the same time (default: cores, or $SLURM_CPUS_PER_TASK in a Slurm job, divided by the workers per member, at least 1)")
	fs.IntVar(&f.workers, "workers", 0, "goroutines inside each member's step (overrides model.workers)")
	fs.StringVar(&f.shard, "shard", "", "run members i, i+n, ... of the sweep: i/n (0-based), auto (i = $SLURM_ARRAY_TASK_ID, one member per task) or auto/n")
	fs.IntVar(&f.member, "member", -1, "run member i alone (0-based); the same as -shard i/(number of members)")
	fs.BoolVar(&f.plot, "plot", false, "also write each member's figures")
	fs.BoolVar(&f.quiet, "quiet", false, "print only the table of answers")
	if err := fs.Parse(args); err != nil {
		return nil, err
	}
	if fs.NArg() > 0 {
		return nil, fmt.Errorf("sweep: unexpected argument %q (options come as -name value)", fs.Arg(0))
	}
	f.set = map[string]bool{}
	fs.Visit(func(fl *flag.Flag) { f.set[fl.Name] = true })
	switch {
	case f.file != "" && (f.key != "" || f.values != ""):
		return nil, errors.New("sweep: give a sweep file (-file) or one key (-key and -values), not both")
	case f.file == "" && (f.key == "" || f.values == ""):
		return nil, errors.New("sweep: give a sweep file (-file sweep.toml) or one key with its values (-key K -values v1,v2)\n" + sweepUsage)
	case f.file != "" && f.config != "":
		return nil, errors.New("sweep: -config goes with -key; a sweep file names its base itself (base_file = \"file.toml\")")
	case f.file != "" && f.out == "":
		return nil, errors.New("sweep: -out DIR: a sweep file's members need a directory")
	case f.set["jobs"] && f.jobs < 1:
		return nil, fmt.Errorf("-jobs %d: must be at least 1", f.jobs)
	case f.set["workers"] && f.workers < 1:
		return nil, fmt.Errorf("-workers %d: must be at least 1", f.workers)
	case f.set["member"] && f.set["shard"]:
		return nil, errors.New("sweep: give -member or -shard, not both")
	case f.set["member"] && f.member < 0:
		return nil, fmt.Errorf("-member %d: must be 0 or more", f.member)
	}
	for _, name := range []string{"file", "config", "out"} {
		if v := fs.Lookup(name).Value.String(); f.set[name] && strings.TrimSpace(v) == "" {
			return nil, fmt.Errorf("-%s: empty path", name)
		}
	}
	return f, nil
}

// cmdSweep runs a sweep: the members of a sweep file, or of one key's
// values, in parallel, resumably, in a directory of their own each.
func cmdSweep(args []string, stdout, stderr io.Writer) error {
	f, err := parseSweepFlags(args, stderr)
	if err != nil {
		return err
	}
	var spec *sweep.Spec
	if f.file != "" {
		spec, err = sweep.Load(f.file)
	} else {
		spec, err = sweep.OneKey(f.config, f.key, strings.Split(f.values, ","))
	}
	if err != nil {
		return err
	}
	plan, err := spec.Expand()
	if err != nil {
		return err
	}
	n := len(plan.Members)
	var shard sweep.Shard
	switch {
	case f.set["member"]:
		if f.member >= n {
			return fmt.Errorf("-member %d: the sweep has %d members (0–%d)", f.member, n, n-1)
		}
		shard = sweep.Shard{Index: f.member, Count: n}
	default:
		if shard, err = sweep.ParseShard(f.shard, os.Getenv, n); err != nil {
			return fmt.Errorf("-shard: %w", err)
		}
		if id := os.Getenv(sweep.ArrayTaskVar); id != "" && f.shard == "" && !f.quiet {
			fmt.Fprintf(stderr, "note: %s=%s is set but -shard is not: this task runs every member that is not finished or running elsewhere (-shard auto runs member %s alone)\n",
				sweep.ArrayTaskVar, id, id)
		}
	}
	if shard.Count > n && shard.Index >= n {
		fmt.Fprintf(stdout, "%v of a sweep of %d members holds no member: nothing to do\n", shard, n)
		return nil
	}
	dir := f.out
	if dir == "" { // the one-key form without a directory keeps nothing
		tmp, err := os.MkdirTemp("", "eddyblock-sweep-")
		if err != nil {
			return err
		}
		defer os.RemoveAll(tmp)
		dir = tmp
	}
	workers := f.workers
	if workers == 0 {
		workers = plan.Base.Model.Workers
	}
	jobs := f.jobs
	if n, err := strconv.Atoi(os.Getenv("SLURM_CPUS_PER_TASK")); err == nil && n > 0 && !f.set["jobs"] {
		// inside a Slurm job: the cores allocated to the task
		jobs = max(1, n/max(1, workers))
	}
	ui := newSweepProgress(stdout, f.quiet)
	run, err := sweep.Prepare(plan, sweep.Options{
		Dir: dir, Jobs: jobs, Workers: f.workers, Shard: shard, Plot: f.plot,
		Event: ui.event, Report: ui.report, OnStep: ui.step,
	})
	if err != nil {
		var de *sweep.DirError
		var ce *sweep.ChangedError
		if errors.As(err, &de) || errors.As(err, &ce) {
			return fmt.Errorf("-out: %w", err)
		}
		return err
	}
	c := run.Counts()
	if !f.quiet {
		fmt.Fprintf(stdout, "sweep %q: %d members over %s; %v: %d to run, %d finished earlier; %d at a time × %d worker(s); directory %s\n",
			plan.Name, n, strings.Join(plan.Keys, ", "), shard, c.Left, c.Done, run.Jobs(), workers, f.out)
	}
	ctx, sig, stopSignals := signalContext()
	defer stopSignals()
	ui.begin(run)
	err = run.Execute(ctx)
	ui.end()
	if s := sig(); s != nil && errors.Is(err, context.Canceled) {
		stoppedN := 0
		for _, o := range run.Outcomes() {
			if o.Status == sweep.Stopped {
				stoppedN++
			}
		}
		fmt.Fprintf(stdout, "\nsweep stopped by %s: %d running member(s) wrote their checkpoints; run the same command again to resume\n", s.name, stoppedN)
		return s
	}
	if t, gerr := sweep.Gather(dir); gerr == nil {
		fmt.Fprintln(stdout)
		writeAnswerTable(stdout, t, shard)
	} else if err == nil {
		err = gerr
	}
	if f.out != "" && !f.quiet {
		fmt.Fprintf(stdout, "outputs in %s; eddyblock gather %s writes the table of every member\n", f.out, quote(f.out))
	}
	return err
}

// sweepProgress shows a sweep's progress: on a terminal a bar of the
// members' model time with the members done, running and left, the
// members' starts and ends printed above it; otherwise (a batch job's log)
// a line when a member starts or ends and each member's progress lines,
// prefixed with its name. -quiet shows neither.
type sweepProgress struct {
	w     io.Writer
	quiet bool
	tty   bool

	mu     sync.Mutex // guards what follows and the writes to w
	bar    *progressbar.ProgressBar
	counts sweep.Counts
	steps  atomic.Int64 // steps taken by every member, this run
	stop   chan struct{}
	done   chan struct{}
	total  int
}

func newSweepProgress(w io.Writer, quiet bool) *sweepProgress {
	p := &sweepProgress{w: w, quiet: quiet}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		p.tty = true
	}
	return p
}

// begin starts the bar: its length is the steps of every member to run.
func (p *sweepProgress) begin(r *sweep.Run) {
	p.counts = r.Counts()
	if p.quiet || !p.tty {
		return
	}
	for _, o := range r.Outcomes() {
		if o.Status == sweep.Pending {
			c := o.Member.Config
			p.total += int(c.Run.Days*86400/c.Model.Dt + 0.5)
		}
	}
	p.bar = progressbar.NewOptions(max(1, p.total),
		progressbar.OptionSetWriter(p.w),
		progressbar.OptionSetWidth(30),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionShowDescriptionAtLineEnd(),
		progressbar.OptionThrottle(200*time.Millisecond),
		progressbar.OptionClearOnFinish(),
	)
	p.describe()
	p.stop, p.done = make(chan struct{}), make(chan struct{})
	go func() {
		defer close(p.done)
		t := time.NewTicker(250 * time.Millisecond)
		defer t.Stop()
		for {
			select {
			case <-p.stop:
				return
			case <-t.C:
				p.mu.Lock()
				p.bar.Set(int(p.steps.Load()))
				p.mu.Unlock()
			}
		}
	}()
}

// describe sets the bar's text; p.mu is held.
func (p *sweepProgress) describe() {
	p.bar.Describe("members: " + countsText(p.counts))
}

// countsText says how many members are done, running and left.
func countsText(c sweep.Counts) string {
	d := fmt.Sprintf("%d done, %d running, %d left", c.Done, c.Running, c.Left)
	if c.Stopped > 0 {
		d += fmt.Sprintf(", %d stopped", c.Stopped)
	}
	if c.Failed > 0 {
		d += fmt.Sprintf(", %d failed", c.Failed)
	}
	if c.Elsewhere > 0 {
		d += fmt.Sprintf(", %d running elsewhere", c.Elsewhere)
	}
	return d
}

// event reports a member's start or end.
func (p *sweepProgress) event(ev sweep.Event) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.counts = ev.Counts
	m := ev.Member
	var line string
	switch ev.Status {
	case sweep.Running:
		line = fmt.Sprintf("member %d %s: started", m.Index, m.Name)
		if ev.StartDay > 0 {
			line = fmt.Sprintf("member %d %s: resumed from its checkpoint at day %.2f", m.Index, m.Name, ev.StartDay)
			// the steps taken before count as done
			c := m.Config
			p.steps.Add(int64(ev.StartDay*86400/c.Model.Dt + 0.5))
		}
	case sweep.Done:
		line = fmt.Sprintf("member %d %s: done in %.1f s", m.Index, m.Name, ev.Wall.Seconds())
		if ev.Err != nil {
			line += fmt.Sprintf(" (%v)", ev.Err)
		}
	case sweep.Finished:
		line = fmt.Sprintf("member %d %s: finished by another process", m.Index, m.Name)
	case sweep.Stopped:
		line = fmt.Sprintf("member %d %s: stopped at day %.2f, checkpoint written", m.Index, m.Name, ev.EndDay)
	case sweep.Failed:
		line = fmt.Sprintf("member %d %s: FAILED: %v", m.Index, m.Name, ev.Err)
	case sweep.Busy:
		line = fmt.Sprintf("member %d %s: being run by another process, passed over", m.Index, m.Name)
	}
	line += "  [" + countsText(ev.Counts) + "]"
	if p.bar != nil {
		p.bar.Clear()
		fmt.Fprintln(p.w, line)
		p.describe()
		p.bar.Set(int(p.steps.Load()))
		return
	}
	fmt.Fprintln(p.w, line)
}

// report prints a member's progress line (not on a terminal, where the
// bar stands for them).
func (p *sweepProgress) report(m sweep.Member, pr experiment.Progress) {
	if p.quiet || p.tty {
		return
	}
	fmt.Fprintf(p.w, "%s: %v\n", m.Name, pr)
}

// step counts a step of a member.
func (p *sweepProgress) step(sweep.Member, *experiment.Experiment) {
	if p.bar != nil {
		p.steps.Add(1)
	}
}

// end removes the bar.
func (p *sweepProgress) end() {
	if p.bar == nil {
		return
	}
	close(p.stop)
	<-p.done
	p.mu.Lock()
	defer p.mu.Unlock()
	p.bar.Finish()
	p.bar.Clear()
}
