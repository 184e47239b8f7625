package block_test

import (
	"fmt"
	"log"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
)

// A dipole block of 200 m held by the forced mode in the default westerlies.
func Example() {
	cfg := qg.DefaultConfig()
	bc := block.Config{
		Shape: block.DipoleShape,
		Mode:  qg.Forced,
		Dipole: block.Dipole{
			X: 8e6, Y: 4e6, // centre of the 16 000 × 8 000 km domain
			Radius: 8e5, Separation: 1.6e6,
			Height:     200, // m, upper layer
			Baroclinic: 0.3, // lower layer at 70 %
		},
	}
	b, err := bc.Block(cfg)
	if err != nil {
		log.Fatal(err)
	}
	m, err := qg.NewModel(cfg)
	if err != nil {
		log.Fatal(err)
	}
	if err := m.SetBlock(b); err != nil {
		log.Fatal(err)
	}
	if err := m.Run(48); err != nil {
		log.Fatal(err)
	}
	fmt.Println(m.BlockMode(), m.Steps())

	// A bad key is named.
	bc.Dipole.Radius = -1
	fmt.Println(bc.Validate(cfg))
	// Output:
	// forced 48
	// config: block.dipole.radius = -1: must be a finite number greater than zero
}

// The modon solved for a radius of 1000 km and a speed of 4 m/s on a
// β-plane with β = 1.6e-11 m⁻¹ s⁻¹.
func ExampleSolveModon() {
	m, err := block.SolveModon(1e6, 4, 1.6e-11)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("pa = %.3f, κa = %.4f\n", m.P*m.Radius, m.Kappa*m.Radius)
	// Output:
	// pa = 2.000, κa = 4.0732
}
