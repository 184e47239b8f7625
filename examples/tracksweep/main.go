// Tracksweep runs the built-in stochastic storm track (experiment.StormTrack)
// at reduced resolution for several positions of the track relative to the
// block — from the block's axis
// to the branches of the split flow — one experiment per core, and prints
// what the eddies do to the block in each: the projection of their
// vorticity-flux and interface-flux tendencies on the block (day⁻¹, > 0
// reinforces), the pattern correlation and the mean block index.
//
//	go run ./examples/tracksweep
package main

import (
	"context"
	"fmt"
	"log"
	"runtime"
	"sync"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/wavemaker"
)

func main() {
	offsets := []float64{0, 1.5e6, 3e6} // storm-track distance from the block's axis, m
	results := make([]diag.Summary, len(offsets))
	errs := make([]error, len(offsets))
	sem := make(chan struct{}, runtime.NumCPU())
	var wg sync.WaitGroup
	for i, off := range offsets {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			c := experiment.StormTrack()
			c.Model.Nx, c.Model.Ny, c.Model.Dt = 128, 64, 1800 // 156 km grid
			c.Run.Days, c.Run.SpinUpDays = 60, 20
			c.Run.SampleSteps = 3
			yb := c.Block.Dipole.Y
			patch := wavemaker.PatchConfig{X: 7.5e6, WidthX: 1e6, WidthY: 7e5}
			if off == 0 {
				patch.Y = yb
				c.Wavemaker.Mask.Patches = []wavemaker.PatchConfig{patch}
			} else {
				north, south := patch, patch
				north.Y, south.Y = yb+off, yb-off
				c.Wavemaker.Mask.Patches = []wavemaker.PatchConfig{north, south}
			}
			e, err := experiment.New(c)
			if err == nil {
				err = e.Run(context.Background(), nil)
			}
			if err != nil {
				errs[i] = err
				return
			}
			results[i] = e.Summary()
		}()
	}
	wg.Wait()
	fmt.Println("track offset   vorticity flux   corr   interface flux   block index")
	for i, off := range offsets {
		if errs[i] != nil {
			log.Fatalf("offset %g km: %v", off/1e3, errs[i])
		}
		s := results[i]
		fmt.Printf("%7.0f km      %+8.4f /day   %+5.2f     %+8.4f /day       %.3f\n",
			off/1e3, s.EddyVorticity.Rate, s.EddyVorticity.Correlation, s.EddyInterface.Rate, s.Index.Mean)
	}
}
