package experiment_test

import (
	"context"
	"fmt"
	"log"

	"github.com/eddyblock/eddyblock/experiment"
)

// The default experiment on a coarse grid for a few days: its one-number
// answers are read from the summary. (The real default runs 120 days at
// 256 × 128; `eddyblock run` prints the same summary.)
func Example() {
	c := experiment.Default()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 8, 2, 2
	e, err := experiment.New(c)
	if err != nil {
		log.Fatal(err) // a *qg.FieldError names a bad key
	}
	defer e.Close()
	if err := e.Run(context.Background(), nil); err != nil {
		log.Fatal(err)
	}
	s := e.Summary()
	fmt.Printf("%d samples, days %.0f–%.0f\n", s.Samples, s.StartDay, s.EndDay)
	fmt.Printf("vorticity-flux projection on the block %+.3f day⁻¹ (pattern correlation %+.2f)\n",
		s.EddyVorticity.Rate, s.EddyVorticity.Correlation)
	fmt.Printf("eddy/|dissipation| %.2f, energy books closed to %.0e\n", s.EddyToDissipation, s.Energy.ClosureError)
	// Output:
	// 73 samples, days 2–8
	// vorticity-flux projection on the block +0.031 day⁻¹ (pattern correlation +0.66)
	// eddy/|dissipation| 0.45, energy books closed to 2e-06
}
