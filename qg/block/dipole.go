package block

import (
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

// Dipole is a block made of two Gaussian vortices on a meridian: a high
// (ψ > 0, an anticyclone for f0 > 0) at (X, Y + Separation/2) and a low
// (ψ < 0) at (X, Y − Separation/2),
//
//	ψ1(x, y) = A·[exp(−r₊²/R²) − exp(−r₋²/R²)],  ψ2 = (1 − Baroclinic)·ψ1,
//
// r± the periodic distances to the two centres, R = Radius, A = Psi, or
// A = g·Height/f0 when the amplitude is given as a geopotential height.
// Between the lobes the flow is easterly, as in a blocked flow.
type Dipole struct {
	X float64 `toml:"x" json:"x"` // centre x_b, m from the western edge
	Y float64 `toml:"y" json:"y"` // centre y_b, m from the southern edge
	// Radius is the Gaussian e-folding radius R of each lobe, m.
	Radius float64 `toml:"radius" json:"radius"`
	// Separation is the distance d between the centres of the high and
	// the low, m.
	Separation float64 `toml:"separation" json:"separation"`
	// Height is the amplitude A as a geopotential height of each lobe in
	// the upper layer, m (Z = f0 ψ / g). Set Height or Psi, not both.
	Height float64 `toml:"height" json:"height"`
	// Psi is the amplitude A as a streamfunction, m² s⁻¹.
	Psi float64 `toml:"psi" json:"psi"`
	// Baroclinic sets the vertical structure: the lower layer's ψ is
	// (1 − Baroclinic) times the upper layer's. 0 (the default) is
	// barotropic, 1 confines the block to the upper layer, 2 makes it
	// purely baroclinic (ψ2 = −ψ1). It must lie in [0, 2].
	Baroclinic float64 `toml:"baroclinic" json:"baroclinic"`
}

// amplitude returns A in m² s⁻¹.
func (d Dipole) amplitude(f0 float64) float64 {
	if d.Psi != 0 {
		return d.Psi
	}
	return qg.Gravity * d.Height / f0
}

// shape returns the upper-layer ψ at displacement (dx, dy) from the centre,
// for amplitude A.
func (d Dipole) shape(A, dx, dy float64) float64 {
	r2 := d.Radius * d.Radius
	yn, ys := dy-d.Separation/2, dy+d.Separation/2
	return A * (math.Exp(-(dx*dx+yn*yn)/r2) - math.Exp(-(dx*dx+ys*ys)/r2))
}

// Streamfunction returns the dipole's ψ in both layers (m² s⁻¹) on the grid
// of cfg, Ny rows of Nx points. It validates d first.
func (d Dipole) Streamfunction(cfg qg.Config) ([2][]float64, error) {
	if err := d.validate("block.dipole", cfg); err != nil {
		return [2][]float64{}, err
	}
	A := d.amplitude(cfg.F0)
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	psi1 := sample(g, d.X, d.Y, func(dx, dy float64) float64 { return d.shape(A, dx, dy) })
	return layers(psi1, d.Baroclinic), nil
}

// sample evaluates f at the displacement of every grid point from the
// centre (x0, y0), summed over the nearest periodic image (found with
// qg.PeriodicDistance) and its eight neighbours, so that the field is smooth
// across the boundaries to the accuracy of the farthest images' tails.
func sample(g *qg.Grid, x0, y0 float64, f func(dx, dy float64) float64) []float64 {
	out := make([]float64, g.Nx*g.Ny)
	for y := range g.Ny {
		dy0 := qg.PeriodicDistance(g.Y(y), y0, g.Ly)
		for x := range g.Nx {
			dx0 := qg.PeriodicDistance(g.X(x), x0, g.Lx)
			var s float64
			for iy := -1; iy <= 1; iy++ {
				for ix := -1; ix <= 1; ix++ {
					s += f(dx0+float64(ix)*g.Lx, dy0+float64(iy)*g.Ly)
				}
			}
			out[y*g.Nx+x] = s
		}
	}
	return out
}

// layers returns ψ1 and ψ2 = (1 − baroclinic)·ψ1.
func layers(psi1 []float64, baroclinic float64) [2][]float64 {
	psi2 := make([]float64, len(psi1))
	f := 1 - baroclinic
	for i, v := range psi1 {
		psi2[i] = f * v
	}
	return [2][]float64{psi1, psi2}
}
