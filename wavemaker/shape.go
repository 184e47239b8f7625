package wavemaker

import (
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

// maskField returns the gridded mask m(x, y) (Ny rows of Nx points), the sum
// of the mask's Gaussian patches, or nil for NoMask (m = 1).
// Field returns the mask m(x, y) on grid g (Ny rows of Nx points, the sum
// of its Gaussian patches, 1 at a patch's centre), or nil without a mask:
// the region where the wave source acts, for maps and overlays.
func (mk MaskConfig) Field(g *qg.Grid) []float64 { return maskField(g, mk) }

func maskField(g *qg.Grid, mk MaskConfig) []float64 {
	ps, _ := mk.patches()
	if len(ps) == 0 {
		return nil
	}
	m := make([]float64, g.Nx*g.Ny)
	fx := make([]float64, g.Nx)
	for _, p := range ps {
		for x := range fx {
			d := qg.PeriodicDistance(g.X(x), p.X, g.Lx) / p.WidthX
			fx[x] = math.Exp(-d * d)
		}
		for y := range g.Ny {
			d := qg.PeriodicDistance(g.Y(y), p.Y, g.Ly) / p.WidthY
			fy := math.Exp(-d * d)
			row := m[y*g.Nx : (y+1)*g.Nx]
			for x := range row {
				row[x] += fy * fx[x]
			}
		}
	}
	return m
}

// meanSquare returns the domain mean of m², 1 for a nil mask.
func meanSquare(m []float64) float64 {
	if m == nil {
		return 1
	}
	var s float64
	for _, v := range m {
		s += v * v
	}
	return s / float64(len(m))
}

// bandModes returns the spectral indices of the modes in the band that the
// model retains, excluding the mean.
func bandModes(g *qg.Grid, b BandConfig) []int {
	// A small relative tolerance keeps modes whose wavelength equals a band
	// edge up to rounding.
	const tol = 1e-9
	lo, hi := 2*math.Pi/b.MaxWavelength*(1-tol), 2*math.Pi/b.MinWavelength*(1+tol)
	var modes []int
	for j := range g.Ny {
		for i := range g.Nkx {
			p := j*g.Nkx + i
			if g.Keep(p) == 0 || g.K2(p) == 0 {
				continue
			}
			var k float64
			switch b.Kind {
			case ZonalBand:
				k = g.K(i)
			default:
				k = math.Sqrt(g.K2(p))
			}
			if k >= lo && k <= hi {
				modes = append(modes, p)
			}
		}
	}
	return modes
}

// verticalVector returns (v1, v2), the PV of the forcing in each layer per
// unit of its scalar pattern.
func verticalVector(v Vertical, ph qg.Physics) [2]float64 {
	switch v {
	case Lower:
		return [2]float64{0, 1}
	case Barotropic:
		return [2]float64{1, 1}
	case Baroclinic:
		// H1ψ1 + H2ψ2 = 0 gives q2 = −δ q1, δ = H1/H2 = W1/W2.
		return [2]float64{1, -ph.W1 / ph.W2}
	default:
		return [2]float64{1, 0}
	}
}

// energyKernel returns, per spectral point, A_p = −Σ_n W_n Re(ψ̂_n v_n) for
// the PV (v1, v2) at that point: twice the energy of the response per unit
// squared PV amplitude, computed with the model's own inversion. It is zero
// at K = 0 and outside the retained modes.
func energyKernel(inv *qg.Inverter, ph qg.Physics, ns int, vec [2]float64) []float64 {
	var q, psi [2][]complex128
	for n := range 2 {
		q[n] = make([]complex128, ns)
		psi[n] = make([]complex128, ns)
		for p := range ns {
			q[n][p] = complex(vec[n], 0)
		}
	}
	inv.Invert(psi, q)
	a := make([]float64, ns)
	for p := range ns {
		a[p] = -(ph.W1*real(psi[0][p])*vec[0] + ph.W2*real(psi[1][p])*vec[1])
	}
	return a
}
