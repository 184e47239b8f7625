package wavemaker_test

import (
	"fmt"
	"log"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// Example forces a model with white noise on an upstream patch and
// compares the energy the model books for the source with the target rate.
func Example() {
	qc := qg.DefaultConfig()
	qc.Nx, qc.Ny = 64, 32
	qc.U1, qc.U2 = 8, 8 // a uniform westerly: no baroclinic instability
	model, err := qg.NewModel(qc)
	if err != nil {
		log.Fatal(err)
	}
	cfg := wavemaker.DefaultConfig() // white noise, upper layer, patch at (4000 km, 4000 km)
	cfg.Seed = 2028
	w, err := wavemaker.New(cfg, model)
	if err != nil {
		log.Fatal(err)
	}
	w.Attach(model)

	days := 60.0
	if err := model.Run(int(days * 86400 / qc.Dt)); err != nil {
		log.Fatal(err)
	}
	rate := model.Ledger()[qg.TermInjection] / model.Time()
	// The expected rate is exactly the target; one run scatters about it
	// (here by a few per cent over 60 days; weakly damped eddies on a small
	// patch make the scatter larger over shorter runs).
	fmt.Printf("target %.0e m² s⁻³, injected %.1f × target\n", cfg.InjectionRate, rate/cfg.InjectionRate)
	// Output:
	// target 5e-05 m² s⁻³, injected 1.0 × target
}

// ExampleNewTrain builds a wave train of 4000 km zonal wavelength with a
// period of 4 days on a patch and prints its wavenumber and period.
func ExampleNewTrain() {
	qc := qg.DefaultConfig()
	model, err := qg.NewModel(qc)
	if err != nil {
		log.Fatal(err)
	}
	cfg := wavemaker.DefaultConfig()
	cfg.Kind = wavemaker.WaveTrain
	tr, err := wavemaker.NewTrain(cfg, model)
	if err != nil {
		log.Fatal(err)
	}
	tr.Attach(model)
	k, l, omega := tr.Wavenumber()
	fmt.Printf("k = %.3g rad/m, l = %g, period %.3g days\n", k, l, 2*3.141592653589793/omega/86400)
	// Output:
	// k = 1.57e-06 rad/m, l = 0, period 4 days
}
