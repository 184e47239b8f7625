package qg

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/team"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// A Forcing is a deterministic PV tendency, evaluated at every stage of the
// time stepper (for example a prescribed wave train).
type Forcing interface {
	// AddTendency adds the forcing's PV tendency at time t (s⁻², spectral,
	// in the Grid's layout and normalisation) to dq[0] (upper layer) and
	// dq[1] (lower layer).
	AddTendency(dq [2][]complex128, t float64)
}

// A Source is a stochastic PV source, applied once per step as an
// increment (for white noise, a Wiener increment scaled by √dt).
type Source interface {
	// Increment sets dq to the PV increment over the step [t, t+dt]
	// (s⁻¹, spectral, in the Grid's layout and normalisation). It is
	// called exactly once per step, in step order.
	Increment(dq [2][]complex128, t, dt float64)
}

// Model is the two-layer QG model: its configuration, its state (the
// spectral PV of both layers and the time) and the work buffers of a step.
type Model struct {
	cfg     Config
	ph      Physics
	g       *Grid
	inv     *Inverter
	plan    *fft.Plan2D
	workers int
	pair    *team.Team // runs the two layers' passes concurrently when workers >= 2
	closed  bool

	t     float64
	steps int
	q     [2][]complex128 // prognostic spectral PV (eddy PV in the fixed-block mode)
	psi   [2][]complex128 // its streamfunction, kept in step with q

	blk *blockState

	forcings []Forcing
	sources  []Source

	// time stepping
	qs, qs2   [2][]complex128 // stage values (RK4 alternates between them)
	acc, dq   [2][]complex128
	next      [2][]complex128 // the scheme's new state (acc or qs), before the split steps
	psiS      [2][]complex128
	hist      [3][2][]complex128 // AB3 tendencies, newest first
	histRates [3][NumTerms]float64
	nhist     int
	prev      [2][]complex128 // state before the step, restored on failure

	// tendency work
	lw    [2]layerWork
	u, v  [2][]float64
	qp    [2][]float64
	cfl   float64
	cflAt [3]float64 // layer, u, v at the CFL maximum
	fbuf  [2][]complex128

	hyper      []float64 // ν K^(2p) per mode, hyperviscosity
	filter     []float64 // exp(−λ(k) dt) per mode, cutoff filter
	sponge     []float64 // exp(−s(x) dt) per grid column, nil without a sponge
	spongeRate []float64

	ledger Ledger
}

// NewModel validates cfg and builds a model at rest at t = 0.
func NewModel(cfg Config) (*Model, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	g := NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	ph := cfg.Physics()
	m := &Model{cfg: cfg, ph: ph, g: g, inv: newInverter(g, ph), workers: cfg.Workers}
	if err := m.newLayerWork(); err != nil {
		return nil, fmt.Errorf("qg: transform: %w", err)
	}
	ns, np := g.Ny*g.Nkx, g.Nx*g.Ny
	spec := func() []complex128 { return make([]complex128, ns) }
	pair := func() [2][]complex128 { return [2][]complex128{spec(), spec()} }
	m.q, m.psi, m.qs, m.qs2, m.acc, m.dq, m.psiS, m.prev, m.fbuf = pair(), pair(), pair(), pair(), pair(), pair(), pair(), pair(), pair()
	for i := range m.hist {
		m.hist[i] = pair()
	}
	for n := range 2 {
		m.u[n], m.v[n], m.qp[n] = make([]float64, np), make([]float64, np), make([]float64, np)
	}
	m.setDissipation()
	m.setSponge()
	if err := m.checkLinearStability(); err != nil {
		return nil, err
	}
	return m, nil
}

// Config returns the model's configuration.
func (m *Model) Config() Config { return m.cfg }

// Grid returns the model's grid.
func (m *Model) Grid() *Grid { return m.g }

// Physics returns the derived layer parameters.
func (m *Model) Physics() Physics { return m.ph }

// Inverter returns the PV inversion of the model.
func (m *Model) Inverter() *Inverter { return m.inv }

// Time returns the model time, s.
func (m *Model) Time() float64 { return m.t }

// Steps returns the number of steps taken.
func (m *Model) Steps() int { return m.steps }

// CFL returns the CFL number, max over the grid of (|u|/dx + |v|/dy)·dt with
// the imposed flow and any fixed block included, at the start of the last
// step.
func (m *Model) CFL() float64 { return m.cfl }

// Ledger returns the energy added by each budget term since the last
// ResetLedger.
func (m *Model) Ledger() Ledger { return m.ledger }

// ResetLedger sets every budget term to zero.
func (m *Model) ResetLedger() { m.ledger = Ledger{} }

// SpectralPV returns the model's spectral PV (layers 1 and 2). The slices
// are the model's own: read them, do not keep them across steps.
func (m *Model) SpectralPV() [2][]complex128 { return m.q }

// SpectralStreamfunction returns the spectral streamfunction of the state,
// as SpectralPV does.
func (m *Model) SpectralStreamfunction() [2][]complex128 { return m.psi }

// Energy returns the kinetic and available potential energy of the state
// (of the eddies in the fixed-block mode), m² s⁻².
func (m *Model) Energy() (ke, ape float64) { return energy(m.g, m.ph, m.psi) }

// Enstrophy returns each layer's enstrophy ½⟨q_n²⟩ of the state, s⁻².
func (m *Model) Enstrophy() (z1, z2 float64) {
	return m.g.Inner(m.q[0], m.q[0]) / 2, m.g.Inner(m.q[1], m.q[1]) / 2
}

// AddForcing adds a deterministic PV forcing.
func (m *Model) AddForcing(f Forcing) { m.forcings = append(m.forcings, f) }

// AddSource adds a stochastic PV source.
func (m *Model) AddSource(s Source) { m.sources = append(m.sources, s) }

// SetSpectralPV sets the state from spectral PV, truncated to the retained
// modes, and restarts the AB3 history.
func (m *Model) SetSpectralPV(q [2][]complex128) error {
	ns := len(m.g.k2)
	for n := range 2 {
		if len(q[n]) != ns {
			return fmt.Errorf("qg: spectral PV of layer %d has %d points, the grid needs %d", n+1, len(q[n]), ns)
		}
		for p, z := range q[n] {
			if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
				return fmt.Errorf("qg: spectral PV of layer %d is not finite at point %d", n+1, p)
			}
		}
	}
	for n := range 2 {
		for p, z := range q[n] {
			m.q[n][p] = scale(m.g.keep[p], z)
		}
	}
	m.inv.Invert(m.psi, m.q)
	m.nhist = 0
	return nil
}

// SetPV sets the state from gridded PV q1, q2 (s⁻¹, Ny rows of Nx points).
func (m *Model) SetPV(q [2][]float64) error {
	var s [2][]complex128
	for n := range 2 {
		if err := m.checkPhys(q[n], fmt.Sprintf("PV of layer %d", n+1)); err != nil {
			return err
		}
		s[n] = make([]complex128, len(m.g.k2))
		m.plan.Forward(s[n], q[n])
	}
	return m.SetSpectralPV(s)
}

// SetStreamfunction sets the state from gridded streamfunctions (m² s⁻¹).
func (m *Model) SetStreamfunction(psi [2][]float64) error {
	var s, q [2][]complex128
	for n := range 2 {
		if err := m.checkPhys(psi[n], fmt.Sprintf("streamfunction of layer %d", n+1)); err != nil {
			return err
		}
		s[n] = make([]complex128, len(m.g.k2))
		q[n] = make([]complex128, len(m.g.k2))
		m.plan.Forward(s[n], psi[n])
	}
	m.inv.PV(q, s)
	return m.SetSpectralPV(q)
}

func (m *Model) checkPhys(f []float64, what string) error {
	if len(f) != m.g.Nx*m.g.Ny {
		return fmt.Errorf("qg: %s has %d points, the grid needs %d×%d = %d", what, len(f), m.g.Ny, m.g.Nx, m.g.Nx*m.g.Ny)
	}
	for i, v := range f {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("qg: %s is not finite at point (x=%d, y=%d)", what, i%m.g.Nx, i/m.g.Nx)
		}
	}
	return nil
}

// checkLinearStability checks dt against the imposed flow's advective CFL
// and against the fastest linear (Rossby-wave and advective) frequency on the
// retained modes, for the scheme's stability interval on the imaginary axis.
func (m *Model) checkLinearStability() error {
	c := &m.cfg
	umax := math.Max(math.Abs(c.U1), math.Abs(c.U2))
	if cfl := umax * c.Dt / m.g.Dx; cfl > c.MaxCFL {
		return &FieldError{Field: "dt", Value: c.Dt, Why: fmt.Sprintf("the imposed flow alone gives a CFL number %.3g over max_cfl = %g; dt must be below %.4g s", cfl, c.MaxCFL, c.MaxCFL*m.g.Dx/umax)}
	}
	var wmax float64
	for p, k2 := range m.g.k2 {
		if k2 == 0 || m.g.keep[p] == 0 {
			continue
		}
		k := m.g.k[p%m.g.Nkx]
		// dq_n/dt = −ik Σ B_nm q_m with B = diag(U) + diag(Qy)·A.
		b11 := c.U1 + m.ph.Q1y*m.inv.a11[p]
		b12 := m.ph.Q1y * m.inv.a12[p]
		b21 := m.ph.Q2y * m.inv.a21[p]
		b22 := c.U2 + m.ph.Q2y*m.inv.a22[p]
		tr, det := b11+b22, b11*b22-b12*b21
		disc := tr*tr/4 - det
		var lam float64
		if disc >= 0 {
			lam = math.Max(math.Abs(tr/2+math.Sqrt(disc)), math.Abs(tr/2-math.Sqrt(disc)))
		} else {
			lam = math.Sqrt(det) // |λ| of a complex pair
		}
		wmax = math.Max(wmax, k*lam)
	}
	limit := 2 * math.Sqrt2 // RK4 on the imaginary axis (common practice)
	if c.Scheme == AB3 {
		limit = 0.72 // AB3 on the imaginary axis, 0.7236 (from memory)
	}
	if wmax*c.Dt > limit {
		return &FieldError{Field: "dt", Value: c.Dt, Why: fmt.Sprintf("the fastest linear wave (ω = %.3g s⁻¹) is unstable with %s; dt must be below %.4g s", wmax, c.Scheme, limit/wmax)}
	}
	// Hyperviscosity is explicit: its fastest damping rate must lie in the
	// scheme's stability interval on the negative real axis.
	if m.hyper != nil {
		var hmax float64
		for _, h := range m.hyper {
			hmax = math.Max(hmax, h)
		}
		real := 2.785 // RK4 on the negative real axis (common practice)
		if c.Scheme == AB3 {
			real = 6.0 / 11 // AB3 on the negative real axis (from memory)
		}
		if hmax*c.Dt > real {
			return &FieldError{Field: "scale_selective.viscosity", Value: c.ScaleSelective.Viscosity, Why: fmt.Sprintf("the hyperviscous damping rate at the largest retained wavenumber, %.3g s⁻¹, is unstable with %s at dt = %g s; lower the viscosity below %.4g or dt below %.4g s", hmax, c.Scheme, c.Dt, c.ScaleSelective.Viscosity*real/(hmax*c.Dt), real/hmax)}
		}
	}
	return nil
}

// CheckTimeStep validates the configuration and checks its time step against
// the imposed flow's CFL number, the fastest linear wave and an explicit
// hyperviscosity, as NewModel does, without building a model.
func (c *Config) CheckTimeStep() error {
	if err := c.Validate(); err != nil {
		return err
	}
	g := NewGrid(c.Nx, c.Ny, c.Lx, c.Ly)
	ph := c.Physics()
	m := &Model{cfg: *c, ph: ph, g: g, inv: newInverter(g, ph)}
	m.setDissipation()
	return m.checkLinearStability()
}
