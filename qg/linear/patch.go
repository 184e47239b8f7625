package linear

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
)

// gaussian returns exp(−r²/R²) around (x0, y0) on the grid, periodic.
func gaussian(g *qg.Grid, x0, y0, radius float64) []float64 {
	f := make([]float64, g.Points())
	for y := range g.Ny {
		dy := qg.PeriodicDistance(g.Y(y), y0, g.Ly) / radius
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), x0, g.Lx) / radius
			f[y*g.Nx+x] = math.Exp(-dx*dx - dy*dy)
		}
	}
	return f
}

func checkPatch(g *qg.Grid, x, y, radius, amplitude float64) error {
	for _, err := range []error{
		check.Within("x", x, 0, g.Lx, fmt.Sprintf("the domain, 0 to lx = %g m", g.Lx)),
		check.Within("y", y, 0, g.Ly, fmt.Sprintf("the domain, 0 to ly = %g m", g.Ly)),
		check.Positive("radius", radius),
		check.Finite("amplitude", amplitude),
	} {
		if err != nil {
			return err
		}
	}
	if radius > math.Min(g.Lx, g.Ly)/4 {
		return &check.FieldError{Field: "radius", Value: radius, Why: fmt.Sprintf("must be at most a quarter of the shorter side of the domain, %g m", math.Min(g.Lx, g.Ly)/4)}
	}
	return nil
}

// PVPatch returns a steady PV forcing (s⁻², spectral) on one layer (0 upper,
// 1 lower): a Gaussian patch amplitude·exp(−r²/radius²) centred at (x, y) m,
// truncated to the modes the model retains.
func (l *Model) PVPatch(x, y, radius, amplitude float64, layer int) ([2][]complex128, error) {
	return PVPatch(l.m, x, y, radius, amplitude, layer)
}

// HeatingPatch returns the steady PV forcing of a heating patch on this
// model's grid (see the function HeatingPatch).
func (l *Model) HeatingPatch(x, y, radius, heating float64) ([2][]complex128, error) {
	return HeatingPatch(l.m, x, y, radius, heating)
}

// PVPatch returns a steady PV forcing (s⁻², spectral, in the layout of m's
// grid) on one layer (0 upper, 1 lower): a Gaussian patch
// amplitude·exp(−r²/radius²) centred at (x, y) m, truncated to the modes
// the model retains. m may be any model of the grid: the linear model's
// own (Model.Nonlinear) or a nonlinear run's, so that both are driven by
// the same forcing. It uses m's transform, so m must not be stepping.
func PVPatch(m *qg.Model, x, y, radius, amplitude float64, layer int) ([2][]complex128, error) {
	g := m.Grid()
	if err := checkPatch(g, x, y, radius, amplitude); err != nil {
		return [2][]complex128{}, err
	}
	if layer != 0 && layer != 1 {
		return [2][]complex128{}, &check.FieldError{Field: "layer", Value: layer, Why: "must be 0 (upper) or 1 (lower)"}
	}
	f := gaussian(g, x, y, radius)
	for i := range f {
		f[i] *= amplitude
	}
	q := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	if err := m.ToSpectral(q[layer], f); err != nil {
		return [2][]complex128{}, err
	}
	return q, nil
}

// HeatingPatch returns the steady PV forcing (s⁻², spectral, in the layout
// of m's grid) of a heating of the air between the layers: a Gaussian
// patch of heating rate heating·exp(−r²/radius²) (K day⁻¹) centred at
// (x, y) m. Heating raises the thickness ψ1 − ψ2 at the rate
// τ̇ = heating/KelvinPerThickness, which by the PV definitions
// (q1 ∋ F1(ψ2 − ψ1), q2 ∋ F2(ψ1 − ψ2)) is the PV forcing −F1 τ̇ in the
// upper layer and +F2 τ̇ in the lower: cyclonic below the heating and
// anticyclonic above it. As for PVPatch, m is any model of the grid.
func HeatingPatch(m *qg.Model, x, y, radius, heating float64) ([2][]complex128, error) {
	g := m.Grid()
	if err := checkPatch(g, x, y, radius, heating); err != nil {
		return [2][]complex128{}, err
	}
	cfg := m.Config()
	ph := m.Physics()
	tau := heating / 86400 / cfg.KelvinPerThickness() // m² s⁻² per unit shape
	f := gaussian(g, x, y, radius)
	q := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	if err := m.ToSpectral(q[0], f); err != nil {
		return [2][]complex128{}, err
	}
	copy(q[1], q[0])
	for p := range q[0] {
		q[0][p] *= complex(-ph.F1*tau, 0)
		q[1][p] *= complex(ph.F2*tau, 0)
	}
	return q, nil
}
