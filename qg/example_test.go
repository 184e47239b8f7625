package qg_test

import (
	"bytes"
	"fmt"
	"log"
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

// smallConfig is a coarse 64 × 32 channel-sized domain with a subcritical
// shear, quick to step.
func smallConfig() qg.Config {
	c := qg.DefaultConfig()
	c.Nx, c.Ny = 64, 32
	c.Lx, c.Ly = 2e7, 1e7
	c.U1, c.U2 = 12, 4
	c.Dt = 3600
	return c
}

// A Model stepped for two days from a gridded streamfunction: a single
// Rossby wave in the upper layer. Its energy changes only through the
// drag, the shear and the filter, which the Ledger books by name.
func Example() {
	m, err := qg.NewModel(smallConfig())
	if err != nil {
		log.Fatal(err)
	}
	defer m.Close()
	g := m.Grid()
	psi := [2][]float64{make([]float64, g.Points()), make([]float64, g.Points())}
	for y := range g.Ny {
		for x := range g.Nx {
			// 1e7 m² s⁻¹: winds of a few m s⁻¹
			psi[0][y*g.Nx+x] = 1e7 * math.Sin(2*math.Pi*4*g.X(x)/g.Lx) * math.Sin(2*math.Pi*g.Y(y)/g.Ly)
		}
	}
	if err := m.SetStreamfunction(psi); err != nil {
		log.Fatal(err)
	}
	ke0, ape0 := m.Energy()
	if err := m.RunUntil(2 * 86400); err != nil {
		log.Fatal(err)
	}
	ke, ape := m.Energy()
	fmt.Printf("day %.0f after %d steps\n", m.Time()/86400, m.Steps())
	fmt.Printf("energy %.4f → %.4f m² s⁻²\n", ke0+ape0, ke+ape)
	l := m.Ledger()
	fmt.Printf("change %.4f = sum of the terms %.4f m² s⁻²\n", ke+ape-ke0-ape0, l.Sum())
	for _, t := range []qg.Term{qg.TermShear, qg.TermDrag, qg.TermScaleSelective} {
		fmt.Printf("  %s %+.4f\n", t, l[t])
	}
	// Output:
	// day 2 after 48 steps
	// energy 18.7146 → 18.6595 m² s⁻²
	// change -0.0551 = sum of the terms -0.0551 m² s⁻²
	//   shear -0.0550
	//   drag -0.0001
	//   scale_selective -0.0000

}

// A user's own forcing written on the grid: a steady patch of upper-layer
// PV forcing (a crude heating anomaly) at the domain's centre. The model
// transforms it, keeps the modes the 2/3 rule retains, and books its work
// under the "injection" term.
func ExampleModel_AddGridForcing() {
	m, err := qg.NewModel(smallConfig())
	if err != nil {
		log.Fatal(err)
	}
	defer m.Close()
	g := m.Grid()
	patch := make([]float64, g.Points())
	for y := range g.Ny {
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), g.Lx/2, g.Lx) / 1e6
			dy := qg.PeriodicDistance(g.Y(y), g.Ly/2, g.Ly) / 1e6
			patch[y*g.Nx+x] = -2e-10 * math.Exp(-dx*dx-dy*dy) // s⁻²
		}
	}
	m.AddGridForcing(qg.GridForcingFunc(func(dq [2][]float64, t float64) {
		for i, f := range patch {
			dq[0][i] += f
		}
	}))
	if err := m.RunUntil(5 * 86400); err != nil {
		log.Fatal(err)
	}
	z, err := m.Field(nil, qg.Height, 0)
	if err != nil {
		log.Fatal(err)
	}
	centre := z[(g.Ny/2)*g.Nx+g.Nx/2]
	fmt.Printf("upper-layer height at the centre after 5 days: %+.0f m\n", centre)
	fmt.Printf("work of the forcing booked as %q: %.2g m² s⁻²\n", qg.TermInjection, m.Ledger()[qg.TermInjection])
	// Output:
	// upper-layer height at the centre after 5 days: +135 m
	// work of the forcing booked as "injection": 4.7 m² s⁻²
}

// A checkpoint written and read back continues the run bit for bit, and
// is refused by a model configured differently.
func ExampleModel_Checkpoint() {
	run := func() *qg.Model {
		m, err := qg.NewModel(smallConfig())
		if err != nil {
			log.Fatal(err)
		}
		g := m.Grid()
		psi := [2][]float64{make([]float64, g.Points()), make([]float64, g.Points())}
		for i := range psi[0] {
			psi[0][i] = 1e6 * math.Sin(float64(i%g.Nx)*0.3) * math.Cos(float64(i/g.Nx)*0.2)
		}
		if err := m.SetStreamfunction(psi); err != nil {
			log.Fatal(err)
		}
		return m
	}
	a := run()
	defer a.Close()
	a.Run(10)
	var file bytes.Buffer // a file, in a real run: SaveCheckpoint and LoadCheckpoint
	if _, err := a.Checkpoint().WriteTo(&file); err != nil {
		log.Fatal(err)
	}
	a.Run(10)

	b := run()
	defer b.Close()
	c, err := qg.ReadCheckpoint(&file)
	if err != nil {
		log.Fatal(err)
	}
	if err := b.Restore(c); err != nil {
		log.Fatal(err)
	}
	b.Run(10)
	same := true
	for n := range 2 {
		for p, v := range a.SpectralPV()[n] {
			same = same && v == b.SpectralPV()[n][p]
		}
	}
	fmt.Println("restarted run identical:", same)

	other := smallConfig()
	other.U1 = 15
	o, _ := qg.NewModel(other)
	defer o.Close()
	fmt.Println(o.Restore(c) != nil)
	// Output:
	// restarted run identical: true
	// true
}
