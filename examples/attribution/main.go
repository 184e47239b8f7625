// Attribution drives the building blocks of the attribution experiment
// from Go, on a coarse version of the built-in scenario (a heating anomaly
// at the centre of a forced block stirred by red-noise eddies): the two
// nonlinear runs with their Recorders, their mean-state forcings, the
// model linearised about the control's time mean, its responses to the
// anomaly alone and with the change in eddy forcing, and their scores
// against the nonlinear response. attribution.Run does all of this in one
// call (and eddyblock attribute from the command line); this program shows
// the pieces.
//
//	go run ./examples/attribution
package main

import (
	"fmt"
	"log"
	"sync"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/experiment"
)

func main() {
	c := attribution.Builtin()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600 // 312 km grid, 1 h steps
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 160, 40, 2
	if err := c.Validate(); err != nil {
		log.Fatal(err)
	}

	// (a) two nonlinear runs, the second with the anomaly, one per goroutine
	var means [2]*attribution.MeanForcing
	var anomaly [2][]complex128
	var wg sync.WaitGroup
	var errs [2]error
	for i := range 2 {
		e, err := experiment.New(c.Config)
		if err != nil {
			log.Fatal(err)
		}
		if i == 1 {
			if anomaly, err = c.Anomaly.Forcing(e.Model); err != nil {
				log.Fatal(err)
			}
			e.Model.AddForcing(attribution.SteadyTendency(anomaly))
		}
		rec, err := attribution.NewRecorder(e, 2)
		if err != nil {
			log.Fatal(err)
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			defer e.Close()
			for !e.Done() {
				if _, _, err := e.Advance(); err != nil {
					errs[i] = err
					return
				}
				rec.Observe()
			}
			means[i], errs[i] = rec.MeanForcing()
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			log.Fatal(err)
		}
	}
	ctl, pert := means[0], means[1]
	pv, _ := ctl.ResidualRatio()
	fmt.Printf("control's mean-state forcing: residual %.2f of H (trend and sampling error)\n", pv)

	// the nonlinear response and the change in eddy forcing
	g, ph, f0 := ctl.Grid(), c.Model.Physics(), c.Model.F0
	ns := g.Len()
	combine := func(a [2][]complex128, s float64, b [2][]complex128) [2][]complex128 { // a + s·b
		d := make2(ns)
		for n := range 2 {
			for p := range d[n] {
				d[n][p] = a[n][p] + complex(s, 0)*b[n][p]
			}
		}
		return d
	}
	a := attribution.Response{Q: combine(pert.Mean, -1, ctl.Mean), Psi: combine(pert.Psi, -1, ctl.Psi)}
	dC := combine(pert.Eddy, -1, ctl.Eddy)
	fPlusDC := combine(anomaly, 1, dC)

	// (b) and (c): the linear model about the control's time mean
	l, err := attribution.AboutMean(ctl)
	if err != nil {
		log.Fatal(err)
	}
	defer l.Close()
	inv := l.Model().Nonlinear().Inverter()
	for _, x := range []struct {
		name    string
		forcing [2][]complex128
	}{{"(b) linear, anomaly alone", anomaly}, {"(c) linear, anomaly + Δ eddy forcing", fPlusDC}} {
		r, err := l.Respond(x.forcing, c.Linear)
		if err != nil {
			log.Fatal(err) // an unstable time mean says so here
		}
		psi := make2(ns)
		inv.Invert(psi, r.Q)
		s := attribution.Compare(g, ph, f0, attribution.Response{Q: r.Q, Psi: psi}, a)
		fmt.Printf("%-38s pattern correlation with (a) %.3f, RMS difference %.2f m\n", x.name, s.Correlation, s.RMS)
	}
	fmt.Printf("(a) nonlinear response: RMS height %.2f m\n", attribution.RMSHeight(g, ph, f0, a.Psi))
}

func make2(n int) [2][]complex128 {
	return [2][]complex128{make([]complex128, n), make([]complex128, n)}
}
