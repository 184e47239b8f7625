// Command eddyblock runs idealised eddy–block experiments with the two-layer
// QG model of package qg.
//
// Usage: see the usage text below (eddyblock help).
//
// A configuration file needs only the keys it changes; everything else keeps
// the built-in experiment's values.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/eddyblock/eddyblock/experiment"
)

func main() {
	err := run(os.Args[1:], os.Stdout, os.Stderr)
	if err == nil {
		return
	}
	fmt.Fprintln(os.Stderr, "eddyblock:", err)
	var stop *stopped
	if errors.As(err, &stop) {
		os.Exit(stop.exitCode())
	}
	os.Exit(1)
}

const usage = `usage:
  eddyblock run [-config file.toml] [-days N] [-spinup N] [-workers N] [-quiet]
                [-out DIR [-plot]] [-checkpoint file] [-restart file]
                                run an experiment (the built-in default without -config)
  eddyblock sweep -file sweep.toml -out DIR [-jobs N] [-shard i/n|auto]
                                run an experiment once per member of a sweep, resumably (eddyblock sweep -h)
  eddyblock gather DIR          one table (CSV, NetCDF) and a figure of a sweep's answers (eddyblock gather -h)
  eddyblock attribute [-config file.toml] [-out DIR [-plot]] [-print-config] [-forcing RUNDIR]
                                the attribution experiment: is a forced response the mean flow's or the eddies'?
                                (eddyblock attribute -h)
  eddyblock plot [-to DIR] RUNDIR
                                draw the figures of a run from its NetCDF files
  eddyblock serve [-port N]     build the browser demo and serve it on 127.0.0.1 (eddyblock serve -h)
  eddyblock site DIR            export the browser demo as a static folder anyone can host
  eddyblock config [name]       print a built-in experiment as TOML: wave-train-strained-by-block
                                (the default), storm-track-ending-at-block or white-noise-control
  eddyblock check file.toml     validate a configuration file as a run would, without running it`

func run(args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		return errors.New("no command\n" + usage)
	}
	switch args[0] {
	case "run":
		return cmdRun(args[1:], stdout, stderr)
	case "sweep":
		return cmdSweep(args[1:], stdout, stderr)
	case "gather":
		return cmdGather(args[1:], stdout, stderr)
	case "attribute":
		return cmdAttribute(args[1:], stdout, stderr)
	case "plot":
		return cmdPlot(args[1:], stdout, stderr)
	case "serve":
		return cmdServe(args[1:], stdout, stderr)
	case "site":
		return cmdSite(args[1:], stdout, stderr)
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
		fmt.Fprint(stdout, c.Documented())
		return nil
	case "check":
		if len(args) != 2 {
			return errors.New("check takes one configuration file\n" + usage)
		}
		c, err := experiment.Load(args[1])
		if err != nil {
			return err
		}
		// the checks a run makes before its first step: the model, the
		// block and the wave source built, the initial state finite and
		// within the CFL limit
		e, err := experiment.New(c)
		if err != nil {
			return fmt.Errorf("%s: %w", args[1], err)
		}
		e.Close()
		fmt.Fprintln(stdout, args[1]+": valid")
		return nil
	case "help", "-h", "-help", "--help":
		fmt.Fprintln(stdout, usage)
		return nil
	}
	return fmt.Errorf("unknown command %q\n%s", args[0], usage)
}
