// Spinup drives the two-layer model directly from Go: a baroclinically
// unstable shear (above the two-layer critical value 2βLd²) seeded with
// small random eddies, printing the energy, the CFL number and the energy
// budget every ten days while the eddies grow and equilibrate against the
// Ekman drag.
//
//	go run ./examples/spinup
package main

import (
	"fmt"
	"log"
	"math/rand/v2"

	"github.com/eddyblock/eddyblock/qg"
)

func main() {
	c := qg.DefaultConfig() // 128 × 64 on 16 000 km × 8 000 km
	c.U1, c.U2 = 20, 0      // shear 20 m/s, above 2βLd² ≈ 15.7 m/s
	c.Dt = 600
	c.Drag = 1 / (3 * 86400.0)
	m, err := qg.NewModel(c)
	if err != nil {
		log.Fatal(err)
	}

	// Small random streamfunction eddies, 1 m²/s² of energy or so.
	r := rand.New(rand.NewPCG(1, 2))
	g := m.Grid()
	var psi [2][]float64
	for n := range 2 {
		psi[n] = make([]float64, g.Nx*g.Ny)
		for i := range psi[n] {
			psi[n][i] = 1e5 * r.NormFloat64()
		}
	}
	if err := m.SetStreamfunction(psi); err != nil {
		log.Fatal(err)
	}

	perDay := int(86400 / c.Dt)
	for day := 10; day <= 100; day += 10 {
		if err := m.Run(10 * perDay); err != nil {
			log.Fatal(err)
		}
		ke, ape := m.Energy()
		l := m.Ledger()
		fmt.Printf("day %3d  KE %8.3g  APE %8.3g m²/s²  CFL %.2f  shear %9.3g  drag %9.3g  scale_selective %9.3g m²/s²\n",
			day, ke, ape, m.CFL(), l[qg.TermShear], l[qg.TermDrag], l[qg.TermScaleSelective])
	}
}
