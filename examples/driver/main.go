// Driver is a researcher's own experiment driver, using only the public
// API: a two-layer model in westerlies, a steady upper-layer PV forcing
// written on the grid (a patch standing for a heating anomaly), ten days of
// integration, and the height response read back on the grid.
//
// It is also what the project's tests build in a module of its own outside
// the repository, to prove that a driver can depend on the module:
//
//	go run ./examples/driver
package main

import (
	"fmt"
	"log"
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

func main() {
	cfg := qg.DefaultConfig() // 128 × 64 on a 16 000 km × 8 000 km β-plane
	cfg.U1, cfg.U2 = 10, 4    // subcritical shear: no baroclinic instability
	m, err := qg.NewModel(cfg)
	if err != nil {
		log.Fatal(err) // a *qg.FieldError names the bad key
	}
	defer m.Close()

	// −2·10⁻¹⁰ s⁻² of upper-layer PV on a Gaussian patch 800 km wide,
	// a quarter of the way along the domain.
	g := m.Grid()
	patch := make([]float64, g.Points())
	for y := range g.Ny {
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), g.Lx/4, g.Lx) / 8e5
			dy := qg.PeriodicDistance(g.Y(y), g.Ly/2, g.Ly) / 8e5
			patch[y*g.Nx+x] = -2e-10 * math.Exp(-dx*dx-dy*dy)
		}
	}
	m.AddGridForcing(qg.GridForcingFunc(func(dq [2][]float64, t float64) {
		for i, f := range patch {
			dq[0][i] += f
		}
	}))

	if err := m.RunUntil(10 * 86400); err != nil {
		log.Fatal(err) // a *qg.StepError names the field and the time
	}
	z, err := m.Field(nil, qg.Height, 0)
	if err != nil {
		log.Fatal(err)
	}
	hi, at := math.Inf(-1), 0
	for i, v := range z {
		if v > hi {
			hi, at = v, i
		}
	}
	ke, ape := m.Energy()
	fmt.Printf("day %.0f: upper-layer height peaks at %+.0f m, %.0f km east of the patch\n",
		m.Time()/86400, hi, qg.PeriodicDistance(g.X(at%g.Nx), g.Lx/4, g.Lx)/1e3)
	fmt.Printf("energy %.3g m² s⁻², injected by the forcing %.3g m² s⁻²\n", ke+ape, m.Ledger()[qg.TermInjection])
}
