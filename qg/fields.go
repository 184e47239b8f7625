package qg

import (
	"fmt"
	"math"
)

// A Quantity names a gridded field of the model's state, per layer.
type Quantity int

// Quantities of the state. In the fixed-block mode they are the eddies'
// (the state is the departure from the prescribed block).
const (
	Psi       Quantity = iota // streamfunction ψ, m² s⁻¹
	PV                        // PV anomaly q (without the background gradient), s⁻¹
	U                         // zonal velocity u = −∂ψ/∂y (without the imposed flow), m s⁻¹
	V                         // meridional velocity v = ∂ψ/∂x, m s⁻¹
	Height                    // geopotential height anomaly Z = f0 ψ/g, m
	Vorticity                 // relative vorticity ζ = ∇²ψ, s⁻¹
	numQuantities
)

var quantityNames = [numQuantities][2]string{
	{"psi", "m2 s-1"}, {"q", "s-1"}, {"u", "m s-1"}, {"v", "m s-1"}, {"height", "m"}, {"vorticity", "s-1"},
}

// String returns the quantity's short name: psi, q, u, v, height or
// vorticity.
func (q Quantity) String() string {
	if q < 0 || q >= numQuantities {
		return fmt.Sprintf("Quantity(%d)", int(q))
	}
	return quantityNames[q][0]
}

// Units returns the quantity's units as a UDUNITS string.
func (q Quantity) Units() string {
	if q < 0 || q >= numQuantities {
		return ""
	}
	return quantityNames[q][1]
}

// Field sets dst (Ny rows of Nx points, x fastest) to quantity q of layer
// n (0 upper, 1 lower) of the current state and returns it; with a nil dst
// it allocates one. The model must not be stepping.
func (m *Model) Field(dst []float64, q Quantity, n int) ([]float64, error) {
	if n != 0 && n != 1 {
		return nil, fmt.Errorf("qg: Field: layer %d, want 0 (upper) or 1 (lower)", n)
	}
	if q < 0 || q >= numQuantities {
		return nil, fmt.Errorf("qg: Field: unknown quantity %d", int(q))
	}
	if dst == nil {
		dst = make([]float64, m.g.Points())
	}
	if len(dst) != m.g.Points() {
		return nil, fmt.Errorf("qg: Field: dst has %d points, the grid needs %d×%d = %d", len(dst), m.g.Ny, m.g.Nx, m.g.Points())
	}
	g := m.g
	lw := &m.lw[0]
	s := lw.a
	switch q {
	case Psi:
		copy(s, m.psi[n])
	case PV:
		copy(s, m.q[n])
	case U:
		for p := range s {
			s[p] = mulI(-g.l[p/g.Nkx], m.psi[n][p])
		}
	case V:
		for p := range s {
			s[p] = mulI(g.k[p%g.Nkx], m.psi[n][p])
		}
	case Height:
		c := m.cfg.F0 / Gravity
		for p := range s {
			s[p] = scale(c, m.psi[n][p])
		}
	case Vorticity:
		for p := range s {
			s[p] = scale(-g.k2[p], m.psi[n][p])
		}
	}
	m.plan.Inverse(dst, s)
	return dst, nil
}

// PV returns the gridded PV of both layers (s⁻¹), newly allocated; in the
// fixed-block mode the eddy PV.
func (m *Model) PV() [2][]float64 {
	a, _ := m.Field(nil, PV, 0)
	b, _ := m.Field(nil, PV, 1)
	return [2][]float64{a, b}
}

// Streamfunction returns the gridded streamfunction of both layers
// (m² s⁻¹), newly allocated; in the fixed-block mode that of the eddies.
func (m *Model) Streamfunction() [2][]float64 {
	a, _ := m.Field(nil, Psi, 0)
	b, _ := m.Field(nil, Psi, 1)
	return [2][]float64{a, b}
}

// ToGrid sets dst (Ny rows of Nx points) to the field whose spectral
// coefficients, in the model's layout (see Grid), are s. Like every
// transform of the model it ignores the zonal wavenumbers beyond those the
// 2/3 rule retains. The model must not be stepping.
func (m *Model) ToGrid(dst []float64, s []complex128) error {
	if len(dst) != m.g.Points() || len(s) != m.g.Len() {
		return fmt.Errorf("qg: ToGrid: %d grid points and %d coefficients, the grid needs %d and %d", len(dst), len(s), m.g.Points(), m.g.Len())
	}
	m.plan.Inverse(dst, s)
	return nil
}

// ToSpectral sets dst to the spectral coefficients of the gridded field f
// (Ny rows of Nx points), in the model's layout and truncated to the modes
// the 2/3 rule retains, so that it can be added to a PV tendency or used as
// a state. f must be finite. The model must not be stepping.
func (m *Model) ToSpectral(dst []complex128, f []float64) error {
	if len(dst) != m.g.Len() || len(f) != m.g.Points() {
		return fmt.Errorf("qg: ToSpectral: %d coefficients and %d grid points, the grid needs %d and %d", len(dst), len(f), m.g.Len(), m.g.Points())
	}
	for i, v := range f {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("qg: ToSpectral: the field is not finite at (x=%d, y=%d)", i%m.g.Nx, i/m.g.Nx)
		}
	}
	m.plan.Forward(dst, f)
	for p, keep := range m.g.keep {
		if keep == 0 {
			dst[p] = 0
		}
	}
	return nil
}

// A GridForcing is a deterministic PV forcing written on the grid, for
// forcings that are easier to state at each point than per wavenumber (a
// heating patch, a localised wave maker). The model transforms it and keeps
// the modes the 2/3 rule retains.
type GridForcing interface {
	// AddGridTendency adds the forcing's PV tendency at model time t
	// (s⁻², Ny rows of Nx points, x fastest) to dq[0] (upper layer) and
	// dq[1] (lower layer). dq arrives zeroed.
	AddGridTendency(dq [2][]float64, t float64)
}

// GridForcingFunc adapts a function to a GridForcing.
type GridForcingFunc func(dq [2][]float64, t float64)

// AddGridTendency calls f(dq, t).
func (f GridForcingFunc) AddGridTendency(dq [2][]float64, t float64) { f(dq, t) }

// AddGridForcing adds a deterministic PV forcing written on the grid. It is
// evaluated like a Forcing, at every stage of the time stepper, and its
// work is booked under TermInjection.
func (m *Model) AddGridForcing(f GridForcing) {
	np, ns := m.g.Points(), m.g.Len()
	gf := &gridForcing{f: f, m: m, spec: make([]complex128, ns)}
	gf.buf = [2][]float64{make([]float64, np), make([]float64, np)}
	m.AddForcing(gf)
}

// gridForcing is a GridForcing seen as a Forcing.
type gridForcing struct {
	f    GridForcing
	m    *Model
	buf  [2][]float64
	spec []complex128
}

func (g *gridForcing) AddTendency(dq [2][]complex128, t float64) {
	clear(g.buf[0])
	clear(g.buf[1])
	g.f.AddGridTendency(g.buf, t)
	keep := g.m.g.keep
	for n := range 2 {
		g.m.plan.Forward(g.spec, g.buf[n])
		for p, k := range keep {
			if k != 0 {
				dq[n][p] += g.spec[p]
			}
		}
	}
}
