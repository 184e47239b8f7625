// Sweep runs a small parameter sweep from Go, through package sweep: the
// built-in stochastic storm track (experiment.StormTrack) on a coarse grid,
// for three block strengths and two source strengths, every member in a
// directory of its own under a temporary directory (or the one given as
// the first argument, where running it again resumes or skips what is
// done), two members at a time. It prints what the eddies do to the block
// in each member: the projection of their vorticity-flux tendency on the
// block (day⁻¹, > 0 reinforces), its pattern correlation with the block,
// and the mean block index.
//
//	go run ./examples/sweep [dir]
package main

import (
	"context"
	"fmt"
	"log"
	"os"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/sweep"
)

func main() {
	base := experiment.StormTrack()
	base.Name = "block-strength"
	base.Model.Nx, base.Model.Ny, base.Model.Dt = 64, 32, 3600 // 312 km grid
	base.Run.Days, base.Run.SpinUpDays, base.Run.ReportDays = 30, 10, 10
	base.Run.SampleSteps, base.Run.SnapshotDays = 2, 0

	spec := &sweep.Spec{
		BaseConfig: &base,
		Seed:       2024,
		Vary: []sweep.List{
			{Key: "block.dipole.height", Values: []any{100.0, 150.0, 200.0}}, // m
			{Key: "wavemaker.injection_rate", Values: []any{5e-6, 1e-5}},     // m² s⁻³
		},
	}
	plan, err := spec.Expand() // every member validated before anything runs
	if err != nil {
		log.Fatal(err)
	}

	dir := ""
	if len(os.Args) > 1 {
		dir = os.Args[1]
	} else {
		if dir, err = os.MkdirTemp("", "block-strength-"); err != nil {
			log.Fatal(err)
		}
		defer os.RemoveAll(dir)
	}
	run, err := sweep.Prepare(plan, sweep.Options{
		Dir:  dir,
		Jobs: 2,
		Event: func(ev sweep.Event) {
			if ev.Status == sweep.Done {
				fmt.Printf("  %s done in %.1f s\n", ev.Member.Name, ev.Wall.Seconds())
			}
		},
	})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%d members in %s\n", len(plan.Members), dir)
	if err := run.Execute(context.Background()); err != nil {
		log.Fatal(err)
	}

	table, err := sweep.Gather(dir)
	if err != nil {
		log.Fatal(err)
	}
	col := map[string]int{}
	for i, a := range table.Answers {
		col[a.Name] = i
	}
	fmt.Println()
	fmt.Println("block height   source rate   vorticity flux    corr   block index")
	for _, r := range table.Rows {
		if !r.Done() {
			fmt.Printf("%s: %s\n", r.Name, r.State)
			continue
		}
		h, _ := sweep.Number(r.Params[0])
		rate, _ := sweep.Number(r.Params[1])
		fmt.Printf("%9.0f m   %8.0e m²/s³   %+9.4f /day   %+.2f   %11.3f\n", h, rate,
			r.Values[col["eddy_vorticity_per_day"]], r.Values[col["eddy_vorticity_correlation"]], r.Values[col["block_index_mean"]])
	}
	fmt.Printf("%d of %d members done\n", len(table.Rows)-len(table.Missing()), len(table.Rows))
}
