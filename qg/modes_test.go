package qg_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// modeDipole returns a barotropic-plus-baroclinic Gaussian dipole on the
// grid of cfg (a high poleward of a low, amplitude A in m² s⁻¹, lower layer
// at ratio r), summed over the nearest periodic images. It is built here,
// independently of package block, so that these tests of the core do not
// depend on it.
func modeDipole(cfg qg.Config, A, R, d, r float64) [2][]float64 {
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	var psi [2][]float64
	psi[0] = make([]float64, cfg.Nx*cfg.Ny)
	psi[1] = make([]float64, cfg.Nx*cfg.Ny)
	for y := range g.Ny {
		dy := qg.PeriodicDistance(g.Y(y), cfg.Ly/2, cfg.Ly)
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), cfg.Lx/2, cfg.Lx)
			v := A * (math.Exp(-(dx*dx+(dy-d/2)*(dy-d/2))/(R*R)) - math.Exp(-(dx*dx+(dy+d/2)*(dy+d/2))/(R*R)))
			psi[0][y*g.Nx+x] = v
			psi[1][y*g.Nx+x] = r * v
		}
	}
	return psi
}

// modeNorm returns ‖a − b‖/‖b‖ over both layers, with the grid's inner
// product (a nil a is read as zero).
func modeNorm(g *qg.Grid, a, b [2][]complex128) float64 {
	var num, den float64
	for n := range 2 {
		d := make([]complex128, len(b[n]))
		for p := range d {
			if a[n] != nil {
				d[p] = a[n][p]
			}
			d[p] -= b[n][p]
		}
		num += g.Inner(d, d)
		den += g.Inner(b[n], b[n])
	}
	return math.Sqrt(num / den)
}

func modeCopy(s [2][]complex128) [2][]complex128 {
	return [2][]complex128{append([]complex128(nil), s[0]...), append([]complex128(nil), s[1]...)}
}

// The forced mode holds the block as an exact steady state: its forcing is
// the model's own tendency at q_B negated (common practice in prescribed-
// block experiments, e.g. Haines & Marshall 1987, Q. J. R. Meteorol. Soc.
// 113). This is a real check and not a tautology: the forcing is computed
// once, at SetBlock, while the run re-evaluates the tendency at every stage
// of RK4 (four stages) and of AB3 (with its three-level history and
// weights 23, −16, 5 that must sum to 12), and then applies the split steps —
// the cutoff filter, which must leave the band-limited block untouched, and
// the sponge, whose target must be q_B in this mode — and the inversion
// after the step. Any inconsistency between those paths (a stage time, a
// missing term in G, a filter acting on the block, a sponge relaxing to
// zero) moves q away from q_B by far more than rounding. A free run of the
// same block is the control: it drifts by orders of magnitude more.
func TestForcedModeIsSteady(t *testing.T) {
	for _, c := range []struct {
		name   string
		scheme qg.Scheme
		diss   qg.ScaleSelective
	}{
		{"rk4+filter", qg.RK4, qg.ScaleSelective{Kind: qg.CutoffFilter, FilterTime: 3600, FilterCutoff: 0.65, FilterOrder: 4}},
		{"ab3+filter", qg.AB3, qg.ScaleSelective{Kind: qg.CutoffFilter, FilterTime: 3600, FilterCutoff: 0.65, FilterOrder: 4}},
		{"rk4+hyperviscosity", qg.RK4, qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 1e16, Order: 2}},
	} {
		t.Run(c.name, func(t *testing.T) {
			cfg := qg.DefaultConfig() // β, U1 = 10 ≠ U2 = 4 m/s, Ekman drag
			cfg.Nx, cfg.Ny = 64, 32
			cfg.ScaleSelective = c.diss
			cfg.Scheme = c.scheme
			cfg.Dt = 1800
			cfg.Sponge = qg.Sponge{Rate: 1 / 86400.0, Width: 3e6, X: 2e6}
			psi := modeDipole(cfg, 2e7, 8e5, 1.6e6, 0.7)
			drift := func(mode qg.BlockMode) float64 {
				m, err := qg.NewModel(cfg)
				if err != nil {
					t.Fatal(err)
				}
				if err := m.SetBlock(qg.Block{Psi: psi, Mode: mode}); err != nil {
					t.Fatal(err)
				}
				qb, _ := m.BlockPV()
				if err := m.Run(1000); err != nil {
					t.Fatal(err)
				}
				return modeNorm(m.Grid(), m.SpectralPV(), qb)
			}
			forced, free := drift(qg.Forced), drift(qg.Free)
			t.Logf("after 1000 steps: forced ‖q − q_B‖/‖q_B‖ = %.3g, free (control) %.3g", forced, free)
			if forced > 1e-9 {
				t.Errorf("forced block drifted: ‖q − q_B‖/‖q_B‖ = %.3g, want < 1e-9", forced)
			}
			if free < 1e-3 {
				t.Errorf("control: the free block changed by only %.3g; the forced check cannot discriminate", free)
			}
		})
	}
}

// In the relaxed mode a departure from the block decays as exp(−t/τ_r)
// (Newtonian relaxation, the definition of the mode). To see the relaxation
// alone, the configuration removes everything else that could evolve the
// departure: β = 0, U1 = U2 = 0, no drag, no dissipation, no sponge, and the
// "block" is an axisymmetric barotropic Gaussian vortex. For such a vortex
// q = ∇²ψ is a function of r only, so J(ψ, q) = 0: it is a steady solution
// of the inviscid equations, and so is any multiple of it. Starting from
// q = (1 + ε)q_B, the state stays (1 + ε(t))q_B with dε/dt = −ε/τ_r exactly
// (the nonlinear term vanishes for every multiple), up to the vortex's
// departure from axisymmetry on the grid and from its periodic images
// (R = Lx/16 makes those negligible).
func TestRelaxedModeEFolding(t *testing.T) {
	cfg := qg.DefaultConfig()
	cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly = 64, 64, 8e6, 8e6
	cfg.Beta, cfg.U1, cfg.U2, cfg.Drag = 0, 0, 0, 0
	cfg.ScaleSelective = qg.ScaleSelective{Kind: qg.NoScaleSelective}
	cfg.Dt = 3600
	tau := 3 * 86400.0
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	var psi [2][]float64
	psi[0] = make([]float64, cfg.Nx*cfg.Ny)
	R := cfg.Lx / 16
	for y := range g.Ny {
		dy := qg.PeriodicDistance(g.Y(y), cfg.Ly/2, cfg.Ly)
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), cfg.Lx/2, cfg.Lx)
			psi[0][y*g.Nx+x] = 5e6 * math.Exp(-(dx*dx+dy*dy)/(R*R))
		}
	}
	psi[1] = append([]float64(nil), psi[0]...)
	m, err := qg.NewModel(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if err := m.SetBlock(qg.Block{Psi: psi, Mode: qg.Relaxed, RelaxTime: tau}); err != nil {
		t.Fatal(err)
	}
	qbv, _ := m.BlockPV()
	qb := modeCopy(qbv)
	const eps0 = 0.3
	q0 := modeCopy(qb)
	for n := range 2 {
		for p := range q0[n] {
			q0[n][p] *= 1 + eps0
		}
	}
	if err := m.SetSpectralPV(q0); err != nil {
		t.Fatal(err)
	}
	// ε(t) = ⟨q − q_B, q_B⟩/⟨q_B, q_B⟩.
	eps := func() float64 {
		q := m.SpectralPV()
		var num, den float64
		for n := range 2 {
			d := make([]complex128, len(q[n]))
			for p := range d {
				d[p] = q[n][p] - qb[n][p]
			}
			num += g.Inner(d, qb[n])
			den += g.Inner(qb[n], qb[n])
		}
		return num / den
	}
	steps := int(2 * tau / cfg.Dt)
	if err := m.Run(steps); err != nil {
		t.Fatal(err)
	}
	e := eps()
	got := -m.Time() / math.Log(e/eps0)
	// The departure keeps the shape of the vortex: the part of q − q_B
	// orthogonal to q_B stays small.
	q := m.SpectralPV()
	var perp, den float64
	for n := range 2 {
		d := make([]complex128, len(q[n]))
		for p := range d {
			d[p] = q[n][p] - complex(1+e, 0)*qb[n][p]
		}
		perp += g.Inner(d, d)
		den += g.Inner(qb[n], qb[n])
	}
	t.Logf("relaxed mode: ε(%g τ) = %.5g, e-folding time %.5g days (τ_r = %g days, error %.2g %%); shape departure %.2g",
		m.Time()/tau, e, got/86400, tau/86400, 100*(got-tau)/tau, math.Sqrt(perp/den))
	// The brief asks for 5 %; RK4's error for a linear decay with
	// dt/τ_r = 1/72 is of order (dt/τ_r)⁴/120, so a much tighter bound holds.
	if math.Abs(got-tau)/tau > 1e-4 {
		t.Errorf("e-folding time %.7g s, want τ_r = %g s within 0.01 %%", got, tau)
	}
	if math.Sqrt(perp/den) > 1e-3*eps0 {
		t.Errorf("the perturbation changed shape: orthogonal part %.2g of ‖q_B‖", math.Sqrt(perp/den))
	}
}

// modeEddies returns a smooth random eddy streamfunction (random phases on
// wavenumbers 2–6 in each direction) with a given peak amplitude.
func modeEddies(cfg qg.Config, amp float64, seed uint64) [2][]float64 {
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	r := rand.New(rand.NewPCG(seed, 7))
	var psi [2][]float64
	for n := range 2 {
		psi[n] = make([]float64, cfg.Nx*cfg.Ny)
		for i := 2; i <= 6; i++ {
			for j := -6; j <= 6; j++ {
				a, ph := r.Float64(), 2*math.Pi*r.Float64()
				k, l := 2*math.Pi*float64(i)/cfg.Lx, 2*math.Pi*float64(j)/cfg.Ly
				for y := range g.Ny {
					for x := range g.Nx {
						psi[n][y*g.Nx+x] += a * math.Cos(k*g.X(x)+l*g.Y(y)+ph)
					}
				}
			}
		}
	}
	var mx float64
	for n := range 2 {
		for _, v := range psi[n] {
			mx = math.Max(mx, math.Abs(v))
		}
	}
	for n := range 2 {
		for i := range psi[n] {
			psi[n][i] *= amp / mx
		}
	}
	return psi
}

// In the fixed mode the block is a steady background and only the eddies
// evolve. With Linear the eddy–eddy term J(ψ′, q′) is dropped, so the eddy
// evolution is a linear map of the initial eddies (every remaining term —
// J(ψ_B, q′), J(ψ′, q_B), the imposed flow, β, drag, filter, sponge towards
// zero — is linear in the eddies): doubling the initial eddies doubles the
// eddy field after N steps, to rounding (superposition, the definition of
// linearity). Without Linear the eddy–eddy term makes the doubled run
// differ from twice the single one by much more than rounding.
func TestFixedModeLinearity(t *testing.T) {
	cfg := qg.DefaultConfig()
	cfg.Nx, cfg.Ny = 64, 32
	cfg.Sponge = qg.Sponge{Rate: 1 / 86400.0, Width: 3e6, X: 2e6}
	block := modeDipole(cfg, 2e7, 8e5, 1.6e6, 0.7)
	eddies := modeEddies(cfg, 1e7, 1) // strong eddies: half the block's amplitude
	other := modeEddies(cfg, 1e7, 2)
	run := func(linear bool, fa, fb float64) (*qg.Model, [2][]complex128) {
		m, err := qg.NewModel(cfg)
		if err != nil {
			t.Fatal(err)
		}
		if err := m.SetBlock(qg.Block{Psi: block, Mode: qg.Fixed, Linear: linear}); err != nil {
			t.Fatal(err)
		}
		var e [2][]float64
		for n := range 2 {
			e[n] = make([]float64, len(eddies[n]))
			for i, v := range eddies[n] {
				e[n][i] = fa*v + fb*other[n][i]
			}
		}
		if err := m.SetStreamfunction(e); err != nil {
			t.Fatal(err)
		}
		if err := m.Run(120); err != nil {
			t.Fatal(err)
		}
		return m, modeCopy(m.SpectralStreamfunction())
	}
	for _, linear := range []bool{true, false} {
		m, one := run(linear, 1, 0)
		_, two := run(linear, 2, 0)
		_, b := run(linear, 0, 1)
		_, ab := run(linear, 1, 1)
		sum := modeCopy(one)
		for n := range 2 {
			for p := range one[n] {
				one[n][p] *= 2
				sum[n][p] += b[n][p]
			}
		}
		// Doubling is exact in binary floating point for a linear
		// algorithm (every operation commutes with a power-of-two scale),
		// so with Linear the difference is expected to be zero or rounding;
		// superposition of two different fields checks linearity where
		// rounding does enter.
		dev := modeNorm(m.Grid(), two, one)
		sup := modeNorm(m.Grid(), ab, sum)
		t.Logf("linear = %v after 120 steps: ‖ψ′(2a) − 2ψ′(a)‖/‖2ψ′(a)‖ = %.3g, ‖ψ′(a+b) − ψ′(a) − ψ′(b)‖/‖ψ′(a) + ψ′(b)‖ = %.3g", linear, dev, sup)
		if linear && (dev > 1e-12 || sup > 1e-10) {
			t.Errorf("linear eddies: doubling changed the response by %.3g relative, superposition by %.3g; want rounding only", dev, sup)
		}
		if !linear && (dev < 1e-3 || sup < 1e-3) {
			t.Errorf("nonlinear eddies: the response is linear to %.3g (doubling), %.3g (superposition); the eddy–eddy term seems missing", dev, sup)
		}
	}
	// A block alone (zero eddies) is not touched in the fixed mode, even
	// though it is not a steady solution: the eddies stay exactly zero.
	m, err := qg.NewModel(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if err := m.SetBlock(qg.Block{Psi: block, Mode: qg.Fixed}); err != nil {
		t.Fatal(err)
	}
	if err := m.Run(20); err != nil {
		t.Fatal(err)
	}
	for n := range 2 {
		for p, z := range m.SpectralPV()[n] {
			if z != 0 {
				t.Fatalf("fixed block without eddies: eddy PV of layer %d became %v at %d", n+1, z, p)
			}
		}
	}
}

// modeWaveForcing is a deterministic oscillating PV forcing on one Fourier
// mode of the upper layer, W = a·cos(ωt)·(mode).
type modeWaveForcing struct {
	p     int
	a, om float64
}

func (f modeWaveForcing) AddTendency(dq [2][]complex128, t float64) {
	dq[0][f.p] += complex(f.a*math.Cos(f.om*t), 0)
}

// The forced mode's steady forcing balances only the block's own dynamics
// (package qg, block modes: "G balances the block's own advection, the background terms
// and dissipation"), not a user Forcing such as a wave source: otherwise a
// time-dependent W(t) would be replaced by W(t) − W(t₀), a steady spurious
// forcing. So the run must not depend on whether the Forcing was added
// before or after SetBlock (common practice: the maintenance forcing is
// diagnosed without the eddy source).
func TestForcedModeLeavesUserForcingsOut(t *testing.T) {
	cfg := qg.DefaultConfig()
	cfg.Nx, cfg.Ny = 64, 32
	psi := modeDipole(cfg, 2e7, 8e5, 1.6e6, 0.7)
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	f := modeWaveForcing{p: 3*g.Nkx + 5, a: 1e-10 * float64(cfg.Nx*cfg.Ny), om: 2 * math.Pi / (2 * 86400)}
	run := func(before bool) [2][]complex128 {
		m, err := qg.NewModel(cfg)
		if err != nil {
			t.Fatal(err)
		}
		if before {
			m.AddForcing(f)
		}
		if err := m.SetBlock(qg.Block{Psi: psi, Mode: qg.Forced}); err != nil {
			t.Fatal(err)
		}
		if !before {
			m.AddForcing(f)
		}
		if err := m.Run(100); err != nil {
			t.Fatal(err)
		}
		return modeCopy(m.SpectralPV())
	}
	a, b := run(true), run(false)
	if d := modeNorm(g, a, b); d > 1e-12 {
		t.Errorf("forced mode: adding the Forcing before SetBlock changes the run by %.3g relative", d)
	}
}
