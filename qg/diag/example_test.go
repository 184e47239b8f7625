package diag_test

import (
	"fmt"
	"log"
	"math"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// An upper-layer wave source upstream of a block held by the forced mode;
// the diagnostics are sampled after every step once a 5-day spin-up is over.
func Example() {
	cfg := qg.DefaultConfig()
	cfg.Nx, cfg.Ny = 32, 16
	m, err := qg.NewModel(cfg)
	if err != nil {
		log.Fatal(err)
	}
	// a dipole block: a high north of a low, 1000 km apart, radius 700 km
	g := m.Grid()
	psi := make([]float64, g.Nx*g.Ny)
	for y := range g.Ny {
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), 10e6, g.Lx)
			dn := qg.PeriodicDistance(g.Y(y), 4.5e6, g.Ly)
			ds := qg.PeriodicDistance(g.Y(y), 3.5e6, g.Ly)
			psi[y*g.Nx+x] = 2e7 * (math.Exp(-(dx*dx+dn*dn)/4.9e11) - math.Exp(-(dx*dx+ds*ds)/4.9e11))
		}
	}
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{psi, psi}, Mode: qg.Forced}); err != nil {
		log.Fatal(err)
	}
	acc, err := diag.New(m, diag.Options{Spinup: 5 * 86400})
	if err != nil {
		log.Fatal(err)
	}
	for range 10 * 48 { // 10 days of 30-minute steps
		if err := m.Step(); err != nil {
			log.Fatal(err)
		}
		if err := acc.Sample(); err != nil {
			log.Fatal(err)
		}
	}
	s := acc.Summary()
	fmt.Println("samples in the window:", s.Samples)
	fmt.Println("block pattern:", s.HasPattern)
	// s.String() prints the report; s.Eddy.Rate, s.EddyVorticity.Rate,
	// s.EddyInterface.Baroclinic … are the numbers.
	f := acc.Fields()
	_, ok := f.Get("zt1")
	fmt.Println("height tendency field:", ok)
	// Output:
	// samples in the window: 241
	// block pattern: true
	// height tendency field: true
}
