// Command eddyblock runs idealised eddy–block experiments with the two-layer
// QG model of package qg.
//
// Usage:
//
//	eddyblock run [-config file.toml] [-days N] [-workers N] [-quiet] [-out dir]
//	              [-checkpoint file] [-restart file]
//	eddyblock sweep -key K -values v1,v2,... [-config file.toml] [-jobs N] [-member i] [-out dir]
//	                          run once per value of a configuration key, in parallel
//	eddyblock config [name]   print a built-in experiment as TOML (the default, or storm-track-ending-at-block)
//	eddyblock check file.toml validate a configuration
//
// A configuration file needs only the keys it changes; everything else keeps
// the built-in experiment's values.
package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg"
)

func main() {
	if err := run(os.Args[1:], os.Stdout, os.Stderr); err != nil {
		fmt.Fprintln(os.Stderr, "eddyblock:", err)
		os.Exit(1)
	}
}

const usage = `usage:
  eddyblock run [-config file.toml] [-days N] [-workers N] [-quiet] [-out dir]
                [-checkpoint file] [-restart file]
  eddyblock sweep -key K -values v1,v2,... [-config file.toml] [-jobs N] [-member i] [-out dir]
  eddyblock config [name]       print a built-in experiment as TOML: the default
                                (wave-train-strained-by-block) or storm-track-ending-at-block
  eddyblock check file.toml     validate a configuration file`

func run(args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		return errors.New("no command\n" + usage)
	}
	switch args[0] {
	case "run":
		return cmdRun(args[1:], stdout, stderr)
	case "sweep":
		return cmdSweep(args[1:], stdout, stderr)
	case "config":
		c := experiment.Default()
		switch len(args) {
		case 1:
		case 2:
			var err error
			if c, err = experiment.Builtin(args[1]); err != nil {
				return err
			}
		default:
			return errors.New("config takes at most one built-in experiment's name\n" + usage)
		}
		fmt.Fprint(stdout, c.TOML())
		return nil
	case "check":
		if len(args) != 2 {
			return errors.New("check takes one configuration file\n" + usage)
		}
		if _, err := experiment.Load(args[1]); err != nil {
			return err
		}
		fmt.Fprintln(stdout, args[1]+": valid")
		return nil
	case "help", "-h", "-help", "--help":
		fmt.Fprintln(stdout, usage)
		return nil
	}
	return fmt.Errorf("unknown command %q\n%s", args[0], usage)
}

func cmdRun(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("run", flag.ContinueOnError)
	fs.SetOutput(stderr)
	cfgPath := fs.String("config", "", "TOML configuration file (default: the built-in experiment)")
	days := fs.Float64("days", 0, "length of the run in days (overrides run.days)")
	workers := fs.Int("workers", 0, "goroutines inside a step (overrides model.workers)")
	quiet := fs.Bool("quiet", false, "print only the final summary")
	out := fs.String("out", "", "directory for summary.json and series.json (created if missing)")
	ckpt := fs.String("checkpoint", "", "restart file, replaced atomically at every progress report")
	restart := fs.String("restart", "", "continue from this restart file (written by -checkpoint with the same configuration)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	c := experiment.Default()
	if *cfgPath != "" {
		var err error
		if c, err = experiment.Load(*cfgPath); err != nil {
			return err
		}
	}
	if *days > 0 {
		c.Run.Days = *days
		if c.Run.SpinUpDays >= c.Run.Days {
			c.Run.SpinUpDays = c.Run.Days / 4
		}
	}
	if *workers > 0 {
		c.Model.Workers = *workers
	}
	e, err := experiment.New(c)
	if err != nil {
		return err
	}
	if *restart != "" {
		c, err := qg.LoadCheckpoint(*restart)
		if err != nil {
			return err
		}
		if err := e.Restore(c); err != nil {
			return fmt.Errorf("%s: %w", *restart, err)
		}
		fmt.Fprintf(stdout, "restarted from %s at day %.2f\n", *restart, c.Time/86400)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	fmt.Fprintf(stdout, "experiment %q: %d×%d grid, %.0f km × %.0f km, dt = %g s, %g days (spin-up %g)\n",
		c.Name, c.Model.Nx, c.Model.Ny, c.Model.Lx/1e3, c.Model.Ly/1e3, c.Model.Dt, c.Run.Days, c.Run.SpinUpDays)
	t0 := time.Now()
	var saveErr error
	err = e.Run(ctx, func(p experiment.Progress) {
		if !*quiet {
			fmt.Fprintln(stdout, p)
		}
		if *ckpt != "" && saveErr == nil {
			c, err := e.Checkpoint()
			if err == nil {
				err = qg.SaveCheckpoint(*ckpt, c)
			}
			saveErr = err
		}
	})
	if err == nil {
		err = saveErr
	}
	wall := time.Since(t0)
	if err != nil {
		return err
	}
	fmt.Fprintln(stdout)
	fmt.Fprintln(stdout, e.Summary())
	if *out != "" {
		if err := writeOutputs(*out, e); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "wrote %s\n", *out)
	}
	fmt.Fprintf(stdout, "done: %d steps in %.1f s (%.2f ms per step)\n", e.Model.Steps(), wall.Seconds(), wall.Seconds()*1e3/float64(e.Model.Steps()))
	return nil
}

// writeOutputs writes the run's summary, time series and configuration as
// JSON files in dir, each through a temporary file renamed into place, so
// an existing output is replaced only by a complete one.
func writeOutputs(dir string, e *experiment.Experiment) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	for name, v := range map[string]any{
		"summary.json": e.Summary(),
		"series.json":  e.Diag.Series(),
		"config.json":  e.Config,
	} {
		b, err := json.MarshalIndent(v, "", "  ")
		if err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
		path := filepath.Join(dir, name)
		tmp := path + ".tmp"
		if err := os.WriteFile(tmp, append(b, '\n'), 0o644); err != nil {
			return err
		}
		if err := os.Rename(tmp, path); err != nil {
			os.Remove(tmp)
			return err
		}
	}
	return nil
}
