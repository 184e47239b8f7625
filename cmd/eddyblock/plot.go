package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"path/filepath"

	"github.com/eddyblock/eddyblock/output"
)

// cmdPlot draws the standard figures of a finished run from its NetCDF
// files: eddyblock plot [-to DIR] RUNDIR.
func cmdPlot(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("plot", flag.ContinueOnError)
	fs.SetOutput(stderr)
	to := fs.String("to", "", "directory for the figures (default: RUNDIR/figures)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return errors.New("plot takes one output directory of a run (written by run -out)")
	}
	dir := fs.Arg(0)
	figs := *to
	if figs == "" {
		figs = filepath.Join(dir, output.FiguresDir)
	}
	if err := output.Plot(dir, figs); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote the figures of %s into %s\n", dir, figs)
	return nil
}
