// Spinup drives the two-layer model directly from Go: a baroclinically
// unstable shear (a little above the two-layer critical value 2βLd²)
// seeded with small random eddies, printing the energy, the CFL number and
// the energy ledger (the energy each term has brought in or taken out since
// the start) every twenty days while the eddies grow and equilibrate
// against the Ekman drag, then how well the last sixty days balance.
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
	c.U1, c.U2 = 17, 0      // shear 17 m/s, above 2βLd² ≈ 15.7 m/s
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
	const every, days, settled = 20, 200, 140
	var e0, in0, out0 float64
	var lo, hi float64
	for day := every; day <= days; day += every {
		if err := m.Run(every * perDay); err != nil {
			log.Fatal(err)
		}
		ke, ape := m.Energy()
		l := m.Ledger()
		fmt.Printf("day %3d  KE %8.3g  APE %8.3g m²/s²  CFL %.2f  ledger: shear %+9.3g  drag %+9.3g  scale_selective %+9.3g m²/s²\n",
			day, ke, ape, m.CFL(), l[qg.TermShear], l[qg.TermDrag], l[qg.TermScaleSelective])
		e, in, out := ke+ape, l[qg.TermShear], l[qg.TermDrag]+l[qg.TermScaleSelective]
		switch {
		case day == settled:
			e0, in0, out0, lo, hi = e, in, out, e, e
		case day > settled:
			lo, hi = min(lo, e), max(hi, e)
		}
		if day == days {
			fmt.Printf("days %d–%d: energy %.3g–%.3g m²/s² (%+.3g overall); the shear brought in %.3g m²/s², drag and scale-selective dissipation took out %.3g\n",
				settled, days, lo, hi, e-e0, in-in0, -(out - out0))
		}
	}
}
