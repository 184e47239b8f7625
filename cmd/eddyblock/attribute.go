package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
)

const attributeUsage = `usage:
  eddyblock attribute [-config file.toml] [-days N] [-spinup N] [-out DIR [-plot]] [-sequential] [-quiet]
        run the attribution experiment (the built-in one without -config): a control run and a run
        with the forcing anomaly, their mean difference (a); the linear response to the anomaly about
        the control's time mean (b); the linear response to the anomaly plus the change in time-mean
        eddy forcing (c); scores of (b) and (c) against (a) and the sampling noise of (a)
  eddyblock attribute -print-config [-config file.toml]
        print the configuration (the built-in one without -config) as TOML: an experiment's keys and
        the [anomaly], [linear] and [sampling] tables
  eddyblock attribute -forcing RUNDIR [-to FILE]
        the mean-state forcing of a finished run from RUNDIR/means.nc (written by eddyblock run -out),
        written to FILE (default RUNDIR/mean_forcing.nc)`

// cmdAttribute runs the attribution experiment, prints a configuration, or
// computes the mean-state forcing of a finished run.
func cmdAttribute(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("attribute", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { fmt.Fprintln(stderr, attributeUsage) }
	config := fs.String("config", "", "TOML configuration file (default: the built-in attribution experiment)")
	days := fs.Float64("days", 0, "length of each run in days (overrides run.days)")
	spinup := fs.Float64("spinup", 0, "days before the time means start (overrides run.spin_up_days)")
	out := fs.String("out", "", "directory for the outputs (NetCDF, JSON, TOML), replaced as a whole when the experiment ends")
	plot := fs.Bool("plot", false, "with -out, also write the figures (PNG) into DIR/figures")
	sequential := fs.Bool("sequential", false, "run the two nonlinear runs one after the other instead of on two goroutines")
	quiet := fs.Bool("quiet", false, "print only the final summary")
	printConfig := fs.Bool("print-config", false, "print the configuration as TOML and exit")
	forcing := fs.String("forcing", "", "compute the mean-state forcing of the finished run in this directory and exit")
	to := fs.String("to", "", "with -forcing, the NetCDF file to write (default RUNDIR/mean_forcing.nc)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("attribute: unexpected argument %q (options come as -name value)\n%s", fs.Arg(0), attributeUsage)
	}
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	for _, name := range []string{"config", "out", "forcing", "to"} {
		if v := fs.Lookup(name).Value.String(); set[name] && strings.TrimSpace(v) == "" {
			return fmt.Errorf("-%s: empty path", name)
		}
	}
	if set["days"] && !(*days > 0 && !math.IsInf(*days, 0)) {
		return fmt.Errorf("-days %s: must be a finite number of days greater than zero", strconv.FormatFloat(*days, 'g', -1, 64))
	}
	if set["spinup"] && !(*spinup >= 0 && !math.IsInf(*spinup, 0)) {
		return fmt.Errorf("-spinup %s: must be a finite number of days, zero or more", strconv.FormatFloat(*spinup, 'g', -1, 64))
	}
	if *plot && *out == "" {
		return errors.New("-plot: the figures go into the output directory: give -out DIR too")
	}
	if *forcing != "" {
		for _, name := range []string{"config", "days", "spinup", "out", "plot", "sequential", "print-config"} {
			if set[name] {
				return fmt.Errorf("-%s does not go with -forcing, which reads everything from the run's files", name)
			}
		}
		return meanForcingOf(*forcing, *to, stdout)
	}
	if set["to"] {
		return errors.New("-to goes with -forcing RUNDIR")
	}

	c := attribution.Builtin()
	if *config != "" {
		var err error
		if c, err = attribution.Load(*config); err != nil {
			return err
		}
	}
	if set["days"] {
		c.Run.Days = *days
	}
	if set["spinup"] {
		c.Run.SpinUpDays = *spinup
	}
	if c.Run.SpinUpDays >= c.Run.Days {
		return fmt.Errorf("the runs would end (day %g) before their spin-up does (run.spin_up_days = %g), leaving nothing to average: "+
			"give a longer -days or a shorter -spinup", c.Run.Days, c.Run.SpinUpDays)
	}
	if err := c.Validate(); err != nil {
		return err
	}
	if *printConfig {
		fmt.Fprint(stdout, c.TOML())
		return nil
	}

	// everything that can be checked before the runs is checked now: the
	// configuration above, the output directory here, the runs' initial
	// states and the linear model in attribution.Run before its first step
	var od *output.AttributionOutput
	if *out != "" {
		var err error
		if od, err = output.PrepareAttribution(*out); err != nil {
			return err
		}
		defer od.Close()
	}
	m := c.Model
	fmt.Fprintf(stdout, "attribution %q: %d×%d grid, %.0f km × %.0f km, dt = %g s; two runs of %g days (time means after day %g)\n",
		c.Name, m.Nx, m.Ny, m.Lx/1e3, m.Ly/1e3, m.Dt, c.Run.Days, c.Run.SpinUpDays)
	fmt.Fprintf(stdout, "anomaly: %s\n", c.Anomaly)
	if !*quiet {
		fmt.Fprintln(stdout, experiment.ProgressUnits)
	}
	ctx, sig, stopSignals := signalContext()
	defer stopSignals()
	t0 := time.Now()
	var tRuns time.Duration
	r, err := attribution.Run(ctx, c, attribution.Options{
		Sequential: *sequential,
		Report: func(run string, p experiment.Progress) {
			if p.Day >= c.Run.Days-1e-9 {
				tRuns = time.Since(t0)
			}
			if !*quiet {
				fmt.Fprintf(stdout, "%-7s %s\n", run, p)
			}
		},
	})
	wall := time.Since(t0)
	if s := sig(); s != nil && errors.Is(err, context.Canceled) {
		fmt.Fprintf(stdout, "stopped by %s after %.1f s; nothing was written\n", s.name, wall.Seconds())
		return s
	}
	if err != nil {
		if r != nil && r.Control != nil && od != nil {
			// the runs finished and the linear step failed: keep the runs
			if dir, werr := od.WriteRuns(r); werr == nil {
				return fmt.Errorf("%w\n(the runs' mean-state forcings are kept in %s; %s was left as it was)", err, dir, *out)
			}
		}
		return err
	}
	fmt.Fprintln(stdout)
	fmt.Fprintln(stdout, r.Summary())
	if od != nil {
		if err := od.Write(r, *plot); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "wrote %s\n", *out)
	}
	fmt.Fprintf(stdout, "done in %.1f s (nonlinear runs %.1f s, linear responses %.1f s)\n", wall.Seconds(), tRuns.Seconds(), (wall - tRuns).Seconds())
	return nil
}

// meanForcingOf writes the mean-state forcing of the finished run in dir.
func meanForcingOf(dir, to string, stdout io.Writer) error {
	mf, err := attribution.FromMeans(filepath.Join(dir, output.MeansFile))
	if err != nil {
		return err
	}
	if to == "" {
		to = filepath.Join(dir, "mean_forcing.nc")
	}
	if err := output.WriteMeanForcing(to, mf); err != nil {
		return err
	}
	pv, psi := mf.ResidualRatio()
	fmt.Fprintf(stdout, "mean-state forcing of %q over days %.1f–%.1f (%d samples): residual ‖H − F̄ − C̄‖/‖H‖ = %.3f (PV), %.3f (streamfunction tendency)\n",
		mf.Config.Name, mf.StartDay, mf.EndDay, mf.Samples, pv, psi)
	fmt.Fprintf(stdout, "wrote %s\n", to)
	return nil
}
