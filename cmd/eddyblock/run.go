package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
)

// runFlags are the options of the run command.
type runFlags struct {
	config, out, ckpt, restart string
	days, spinup               float64
	workers                    int
	quiet, plot                bool
	set                        map[string]bool // the flags given on the command line
}

func parseRunFlags(args []string, stderr io.Writer) (*runFlags, error) {
	f := &runFlags{}
	fs := flag.NewFlagSet("run", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.StringVar(&f.config, "config", "", "TOML configuration file (default: the built-in experiment)")
	fs.Float64Var(&f.days, "days", 0, "length of the run in days (overrides run.days)")
	fs.Float64Var(&f.spinup, "spinup", 0, "days before the diagnostics start averaging (overrides run.spin_up_days)")
	fs.IntVar(&f.workers, "workers", 0, "goroutines inside a step (overrides model.workers)")
	fs.BoolVar(&f.quiet, "quiet", false, "print only the final summary")
	fs.StringVar(&f.out, "out", "", "directory for the outputs (JSON, TOML, NetCDF), replaced as a whole when the run ends")
	fs.BoolVar(&f.plot, "plot", false, "with -out, also write the figures (PNG) into DIR/figures")
	fs.StringVar(&f.ckpt, "checkpoint", "", "restart file, replaced atomically at every progress report and when the run is stopped")
	fs.StringVar(&f.restart, "restart", "", "continue from this restart file (written by -checkpoint with the same configuration)")
	if err := fs.Parse(args); err != nil {
		return nil, err
	}
	if fs.NArg() > 0 {
		return nil, fmt.Errorf("run: unexpected argument %q (options come as -name value)", fs.Arg(0))
	}
	f.set = map[string]bool{}
	fs.Visit(func(fl *flag.Flag) { f.set[fl.Name] = true })
	if f.set["days"] && !(f.days > 0 && !math.IsInf(f.days, 0)) {
		return nil, fmt.Errorf("-days %s: must be a finite number of days greater than zero", strconv.FormatFloat(f.days, 'g', -1, 64))
	}
	if f.set["spinup"] && !(f.spinup >= 0 && !math.IsInf(f.spinup, 0)) {
		return nil, fmt.Errorf("-spinup %s: must be a finite number of days, zero or more", strconv.FormatFloat(f.spinup, 'g', -1, 64))
	}
	if f.set["workers"] && f.workers < 1 {
		return nil, fmt.Errorf("-workers %d: must be at least 1", f.workers)
	}
	for _, name := range []string{"config", "out", "checkpoint", "restart"} {
		if v := fs.Lookup(name).Value.String(); f.set[name] && strings.TrimSpace(v) == "" {
			return nil, fmt.Errorf("-%s: empty path", name)
		}
	}
	if f.plot && f.out == "" {
		return nil, errors.New("-plot: the figures go into the output directory: give -out DIR too")
	}
	return f, nil
}

// configure applies the flags to the configuration. A run shorter than
// the spin-up is refused rather than shortened silently: the spin-up is
// part of the experiment's definition.
func (f *runFlags) configure(c *experiment.Config) error {
	if f.set["days"] {
		c.Run.Days = f.days
	}
	if f.set["spinup"] {
		c.Run.SpinUpDays = f.spinup
	}
	if f.set["workers"] {
		c.Model.Workers = f.workers
	}
	if c.Run.SpinUpDays >= c.Run.Days {
		return fmt.Errorf("the run would end (day %g) before its spin-up does (run.spin_up_days = %g), leaving nothing to average: "+
			"give a longer -days or a shorter -spinup", c.Run.Days, c.Run.SpinUpDays)
	}
	return nil
}

func cmdRun(args []string, stdout, stderr io.Writer) error {
	f, err := parseRunFlags(args, stderr)
	if err != nil {
		return err
	}
	c := experiment.Default()
	if f.config != "" {
		if c, err = experiment.Load(f.config); err != nil {
			return err
		}
	}
	if err := f.configure(&c); err != nil {
		return err
	}
	prog := newProgress(stdout, f.quiet)
	// Everything that can be checked before the first step is checked now:
	// the configuration, the initial state, the restart file, and where the
	// outputs and the checkpoint will go.
	r, err := output.Prepare(c, output.Options{
		Dir: f.out, Checkpoint: f.ckpt, Restart: f.restart, Plot: f.plot,
		Report: prog.report, OnStep: prog.step,
	})
	if err != nil {
		return flagError(err)
	}
	defer r.Close()
	e := r.Experiment()
	fmt.Fprintf(stdout, "experiment %q: %d×%d grid, %.0f km × %.0f km, dt = %g s, %g days (spin-up %g), %d worker(s)\n",
		c.Name, c.Model.Nx, c.Model.Ny, c.Model.Lx/1e3, c.Model.Ly/1e3, c.Model.Dt, c.Run.Days, c.Run.SpinUpDays, c.Model.Workers)
	if ck := r.Restarted(); ck != nil {
		fmt.Fprintf(stdout, "restarted from %s at day %.2f (step %d)\n", f.restart, ck.Time/86400, ck.Steps)
	}
	ctx, sig, stopSignals := signalContext()
	defer stopSignals()
	steps0, t0 := e.Model.Steps(), time.Now()
	prog.begin(e)
	err = r.Execute(ctx)
	prog.end()
	wall := time.Since(t0)
	steps := e.Model.Steps() - steps0
	if s := sig(); s != nil && errors.Is(err, context.Canceled) {
		return stopMessage(stdout, s, e, f, err)
	}
	if err != nil {
		return err
	}
	fmt.Fprintln(stdout)
	fmt.Fprintln(stdout, e.Summary())
	if f.out != "" {
		fmt.Fprintf(stdout, "wrote %s\n", f.out)
	}
	perStep := 0.0
	if steps > 0 {
		perStep = wall.Seconds() * 1e3 / float64(steps)
	}
	fmt.Fprintf(stdout, "done: %d steps in %.1f s (%.2f ms per step)\n", steps, wall.Seconds(), perStep)
	return nil
}

// flagError names the flag behind an error of output.Prepare.
func flagError(err error) error {
	msg := err.Error()
	switch {
	case strings.HasPrefix(msg, "output directory"):
		return fmt.Errorf("-out: %w", err)
	case strings.HasPrefix(msg, "checkpoint:"):
		return fmt.Errorf("-checkpoint: %w", err)
	}
	return err
}

// stopMessage reports a run stopped by a signal (Execute has written the
// checkpoint if one was asked for): the day it stopped at and how to resume
// it; it returns the error that sets the exit status.
func stopMessage(stdout io.Writer, s *stopped, e *experiment.Experiment, f *runFlags, err error) error {
	day := e.Model.Time() / 86400
	fmt.Fprintf(stdout, "\nstopped by %s at day %.3f (step %d) of %g; the outputs were not written\n", s.name, day, e.Model.Steps(), e.Config.Run.Days)
	if f.ckpt == "" {
		fmt.Fprintln(stdout, "no checkpoint was asked for (-checkpoint FILE), so the run cannot be resumed")
		return s
	}
	if err != context.Canceled { // Execute joined the checkpoint's error to it
		return errors.Join(s, fmt.Errorf("the checkpoint could not be written: %w", err))
	}
	fmt.Fprintf(stdout, "checkpoint written to %s; resume with:\n  %s\n", f.ckpt, resumeCommand(f))
	return s
}

// resumeCommand is the command line that continues a stopped run.
func resumeCommand(f *runFlags) string {
	parts := []string{"eddyblock", "run"}
	if f.config != "" {
		parts = append(parts, "-config", quote(f.config))
	}
	for _, name := range []string{"days", "spinup"} {
		if f.set[name] {
			v := f.days
			if name == "spinup" {
				v = f.spinup
			}
			parts = append(parts, "-"+name, strconv.FormatFloat(v, 'g', -1, 64))
		}
	}
	if f.set["workers"] {
		parts = append(parts, "-workers", strconv.Itoa(f.workers))
	}
	if f.out != "" {
		parts = append(parts, "-out", quote(f.out))
	}
	if f.plot {
		parts = append(parts, "-plot")
	}
	parts = append(parts, "-checkpoint", quote(f.ckpt), "-restart", quote(f.ckpt))
	return strings.Join(parts, " ")
}

// quote quotes a path for a POSIX shell when it needs it.
func quote(s string) string {
	if s != "" && strings.IndexFunc(s, func(r rune) bool {
		return !(r == '/' || r == '.' || r == '-' || r == '_' || r == '+' || r == ':' || r == ',' ||
			r >= '0' && r <= '9' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z')
	}) < 0 {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
