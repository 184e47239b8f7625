package attribution_test

import (
	"context"
	"fmt"
	"log"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/experiment"
)

// A forcing anomaly is checked against the model's domain and grid before
// any work; the error names the key.
func ExampleAnomaly_Validate() {
	c := attribution.Builtin()
	a := attribution.Anomaly{Kind: attribution.HeatingAnomaly, X: 2.5e7, Y: 5e6, Radius: 1e6, Amplitude: 1}
	fmt.Println(a.Validate(c.Model))
	// Output:
	// config: anomaly.x = 2.5e+07: must lie in the domain, 0 to model.lx = 2e+07 m
}

// The mean-state forcing of a finished run holds its time mean steady in
// the model without eddies.
func ExampleFromExperiment() {
	c := attribution.Builtin().Config // the built-in's control run, coarse and short
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays = 20, 5
	e, err := experiment.New(c)
	if err != nil {
		log.Fatal(err)
	}
	defer e.Close()
	if err := e.Run(context.Background(), nil); err != nil {
		log.Fatal(err)
	}
	mf, err := attribution.FromExperiment(e)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%d samples over days %.0f–%.0f\n", mf.Samples, mf.StartDay, mf.EndDay)

	// a model of the same configuration without the wave source, started
	// from the time mean and driven by H
	c.Wavemaker.Kind = "none"
	h, err := experiment.New(c)
	if err != nil {
		log.Fatal(err)
	}
	defer h.Close()
	if err := h.Model.SetSpectralPV(mf.Mean); err != nil {
		log.Fatal(err)
	}
	if err := mf.Attach(h.Model); err != nil {
		log.Fatal(err)
	}
	if err := h.Model.Run(240); err != nil {
		log.Fatal(err)
	}
	fmt.Println("state after 10 days equals the time mean:", same(h.Model.SpectralPV(), mf.Mean, 1e-9))
	// Output:
	// 61 samples over days 5–20
	// state after 10 days equals the time mean: true
}

// same reports whether a and b differ by less than tol relative to b.
func same(a, b [2][]complex128, tol float64) bool {
	var d, s float64
	for n := range 2 {
		for p := range a[n] {
			x := a[n][p] - b[n][p]
			d += real(x)*real(x) + imag(x)*imag(x)
			s += real(b[n][p])*real(b[n][p]) + imag(b[n][p])*imag(b[n][p])
		}
	}
	return d < tol*tol*s
}

// The attribution experiment on a coarse grid: (b) is the linear response
// to the anomaly about the control's time mean, (c) the linear response to
// the anomaly plus the change in time-mean eddy forcing.
func ExampleRun() {
	c := attribution.Builtin()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 120, 40, 2
	r, err := attribution.Run(context.Background(), c, attribution.Options{})
	if err != nil {
		log.Fatal(err)
	}
	s := r.Summary()
	fmt.Println("(c) closer to (a) than (b) in pattern correlation:", s.LinearEddy.Correlation > s.Linear.Correlation)
	fmt.Println("(c) closer to (a) than (b) in RMS height:", s.LinearEddy.RMS < s.Linear.RMS)
	// Output:
	// (c) closer to (a) than (b) in pattern correlation: true
	// (c) closer to (a) than (b) in RMS height: true
}
