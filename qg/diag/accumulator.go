package diag

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// Norm names the inner product of the projections on the block.
type Norm string

// Inner products.
const (
	// EnergyNorm is the two-layer energy inner product,
	// Σ_n (H_n/H)⟨∇a_n·∇b_n⟩ + (H1/H)F1⟨(a1 − a2)(b1 − b2)⟩ (the default).
	EnergyNorm Norm = "energy"
	// LayerNorm is the mass-weighted inner product Σ_n (H_n/H)⟨a_n b_n⟩.
	LayerNorm Norm = "layer"
)

// Options configures an Accumulator. The zero value is valid.
type Options struct {
	// Spinup is the model time (s) before which samples enter only the
	// time series, not the time means and statistics.
	Spinup float64 `json:"spinup_s"`
	// Norm is the inner product of the projections (default EnergyNorm).
	Norm Norm `json:"norm"`
	// Pattern is the pattern (m² s⁻¹, both layers, Ny rows of Nx points)
	// on which tendencies and the state are projected. The default is the
	// model's block ψ_B; without a block and without a pattern there are no
	// projections.
	Pattern [2][]float64 `json:"-"`
	// Transient, in the fixed mode, takes the eddies as departures from
	// their time mean (transient eddies) instead of the whole eddy state.
	Transient bool `json:"transient"`
	// Bins is the number of histogram bins of the block index (default 20).
	Bins int `json:"bins"`
}

// Accumulator accumulates the diagnostics of a qg.Model; see the package
// documentation.
type Accumulator struct {
	m    *qg.Model
	g    *qg.Grid
	ph   qg.Physics
	cfg  qg.Config
	opt  Options
	plan *fft.Plan2D
	mode qg.BlockMode
	raw  bool // eddies are the state itself (fixed mode without Transient)

	// projection pattern and block
	pat     [2][]complex128 // nil without a pattern
	patNorm float64
	blkPsi  [2][]complex128 // ψ_B (nil without a block)
	blkQ    [2][]complex128
	blkProj float64 // ⟨ψ_B, P⟩/⟨P, P⟩, added to the index in the fixed mode

	// work
	spec, spec2     []complex128
	psi, u, v, z, q [2][]float64
	tau             []float64

	// window accumulators (gridded): means and Welford co-moments
	n             int
	mPsi          [2][]float64
	cells         [2][]cell       // per grid point: means and co-moments of layer n
	sMean         [2][]complex128 // spectral mean ψ
	s11, s22, s12 []float64       // spectral Welford co-moments of ψ1, ψ2
	fMean         [2][]complex128 // mean deterministic forcing tendency
	fBuf          [2][]complex128
	first, last   [2][]complex128 // ψ at the first and last window samples
	tFirst, tLast float64

	// time series
	lastT      float64
	lastLedger qg.Ledger
	sampled    bool
	series     Series

	live *liveBuf // EddyField's work buffers, made at its first call
}

// New makes an Accumulator for model m. It reads the model's block (if
// any) and configuration now; call it after Model.SetBlock.
func New(m *qg.Model, opt Options) (*Accumulator, error) {
	if m == nil {
		return nil, fmt.Errorf("diag: New: nil model")
	}
	switch opt.Norm {
	case "":
		opt.Norm = EnergyNorm
	case EnergyNorm, LayerNorm:
	default:
		return nil, fmt.Errorf("diag: option Norm = %q: must be %q or %q", opt.Norm, EnergyNorm, LayerNorm)
	}
	if math.IsNaN(opt.Spinup) || math.IsInf(opt.Spinup, 0) || opt.Spinup < 0 {
		return nil, fmt.Errorf("diag: option Spinup = %g: must be a finite time ≥ 0 s", opt.Spinup)
	}
	switch {
	case opt.Bins == 0:
		opt.Bins = 20
	case opt.Bins < 0:
		return nil, fmt.Errorf("diag: option Bins = %d: must be ≥ 1", opt.Bins)
	}
	cfg := m.Config()
	// One worker: the diagnostics sample between the model's steps, on the
	// caller, so they use none of the model's goroutines and start none.
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		return nil, fmt.Errorf("diag: transform: %w", err)
	}
	g := m.Grid()
	a := &Accumulator{m: m, g: g, ph: m.Physics(), cfg: cfg, opt: opt, plan: plan, mode: m.BlockMode()}
	a.raw = a.mode == qg.Fixed && !opt.Transient
	ns, np := g.Len(), g.Nx*g.Ny
	a.spec, a.spec2 = make([]complex128, ns), make([]complex128, ns)
	if b, ok := m.BlockStreamfunction(); ok {
		a.blkPsi = clonePair(b)
		bq, _ := m.BlockPV()
		a.blkQ = clonePair(bq)
	}
	switch {
	case opt.Pattern[0] != nil || opt.Pattern[1] != nil:
		a.pat = [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		for n := range 2 {
			if len(opt.Pattern[n]) != np {
				return nil, fmt.Errorf("diag: option Pattern: layer %d has %d points, the grid needs %d×%d", n+1, len(opt.Pattern[n]), cfg.Ny, cfg.Nx)
			}
			for i, x := range opt.Pattern[n] {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					return nil, fmt.Errorf("diag: option Pattern: layer %d is not finite at (x=%d, y=%d)", n+1, i%cfg.Nx, i/cfg.Nx)
				}
			}
			plan.Forward(a.pat[n], opt.Pattern[n])
			for p := range ns {
				a.pat[n][p] *= complex(g.Keep(p), 0)
			}
			a.pat[n][0] = 0
		}
	case a.blkPsi[0] != nil:
		a.pat = a.blkPsi
	}
	if a.pat[0] != nil {
		a.patNorm = a.inner(a.pat, a.pat)
		if !(a.patNorm > 0) {
			return nil, fmt.Errorf("diag: the projection pattern (option Pattern or the block) is zero on the model's retained modes")
		}
		if a.mode == qg.Fixed {
			a.blkProj = a.inner(a.blkPsi, a.pat) / a.patNorm
		}
	}
	for n := range 2 {
		for _, f := range []*[]float64{&a.psi[n], &a.u[n], &a.v[n], &a.z[n], &a.q[n], &a.mPsi[n]} {
			*f = make([]float64, np)
		}
		a.cells[n] = make([]cell, np)
		a.sMean[n] = make([]complex128, ns)
		a.fMean[n] = make([]complex128, ns)
		a.fBuf[n] = make([]complex128, ns)
		a.first[n] = make([]complex128, ns)
		a.last[n] = make([]complex128, ns)
	}
	a.tau = make([]float64, np)
	a.s11, a.s22, a.s12 = make([]float64, ns), make([]float64, ns), make([]float64, ns)
	a.lastT = m.Time()
	a.lastLedger = m.Ledger()
	a.series.Rates = make(map[string][]float64, qg.NumTerms)
	return a, nil
}

func clonePair(x [2][]complex128) [2][]complex128 {
	return [2][]complex128{append([]complex128(nil), x[0]...), append([]complex128(nil), x[1]...)}
}

// Options returns the options in effect (defaults filled in).
func (a *Accumulator) Options() Options { return a.opt }

// Samples returns the number of samples in the averaging window.
func (a *Accumulator) Samples() int { return a.n }

// Sample reads the model's current state. It must be called between steps,
// at a model time later than the previous sample's.
func (a *Accumulator) Sample() error {
	m := a.m
	t := m.Time()
	if a.sampled && !(t > a.lastT) {
		return fmt.Errorf("diag: Sample at model time %g s, not after the previous sample at %g s", t, a.lastT)
	}
	psiS, qS := m.SpectralStreamfunction(), m.SpectralPV()
	a.record(t, psiS)
	a.sampled = true
	if t < a.opt.Spinup {
		return nil
	}
	a.n++
	if a.n == 1 {
		a.tFirst = t
		for n := range 2 {
			copy(a.first[n], psiS[n])
		}
	}
	a.tLast = t
	for n := range 2 {
		copy(a.last[n], psiS[n])
	}
	a.gridFields(psiS, qS)
	a.welford()
	a.spectral(psiS)
	if err := m.TermTendency(qg.TermInjection, a.fBuf, qS, t); err != nil {
		return fmt.Errorf("diag: Sample: %w", err)
	}
	inv := complex(1/float64(a.n), 0)
	for n := range 2 {
		for p, f := range a.fBuf[n] {
			a.fMean[n][p] += (f - a.fMean[n][p]) * inv
		}
	}
	return nil
}

// record appends the time series of one sample.
func (a *Accumulator) record(t float64, psi [2][]complex128) {
	m := a.m
	s := &a.series
	ke, ape := m.Energy()
	z1, z2 := m.Enstrophy()
	s.Time = append(s.Time, t)
	s.KE = append(s.KE, ke)
	s.APE = append(s.APE, ape)
	s.Enstrophy1 = append(s.Enstrophy1, z1)
	s.Enstrophy2 = append(s.Enstrophy2, z2)
	s.CFL = append(s.CFL, m.CFL())
	led := m.Ledger()
	dt := t - a.lastT
	for k := range qg.NumTerms {
		var r float64
		if dt > 0 {
			r = (led[k] - a.lastLedger[k]) / dt
		}
		name := qg.Term(k).String()
		s.Rates[name] = append(s.Rates[name], r)
	}
	if a.pat[0] != nil {
		s.Index = append(s.Index, a.inner(psi, a.pat)/a.patNorm+a.blkProj)
	}
	if t < a.opt.Spinup {
		s.WindowStart = len(s.Time)
	}
	a.lastT, a.lastLedger = t, led
}

// gridFields sets the gridded ψ, u, v, ζ, q of both layers and ψ1 − ψ2.
func (a *Accumulator) gridFields(psi, q [2][]complex128) {
	g := a.g
	for n := range 2 {
		a.plan.Inverse(a.psi[n], psi[n])
		// the domain mean of q (which a forcing may carry) is dynamically
		// inert and has no streamfunction: leave it out
		copy(a.spec, q[n])
		a.spec[0] = 0
		a.plan.Inverse(a.q[n], a.spec)
		g.Velocity(a.spec, a.spec2, psi[n])
		a.plan.Inverse(a.u[n], a.spec)
		a.plan.Inverse(a.v[n], a.spec2)
		for p, s := range psi[n] {
			a.spec[p] = complex(-g.K2(p), 0) * s
		}
		a.plan.Inverse(a.z[n], a.spec)
	}
	for i := range a.tau {
		a.tau[i] = a.psi[0][i] - a.psi[1][i]
	}
}

// cell holds the running means of u, v, ζ, q of one layer at one grid
// point and the Welford co-moments Σ(x − x̄_old)(y − ȳ_new) of u′u′, v′v′,
// u′v′, u′ζ′, v′ζ′, u′τ′, v′τ′, u′q′, v′q′ (τ = ψ1 − ψ2). One record per
// point keeps the update a single stream through memory.
type cell struct {
	mu, mv, mz, mq                     float64
	uu, vv, uv, uz, vz, ut, vt, uq, vq float64
}

// welford updates the gridded means and co-moments with the current sample
// (Welford 1962): x̄ ← x̄ + (x − x̄)/N, C_xy ← C_xy + (x − x̄_old)(y − ȳ_new).
// It overwrites a.tau with the departure of ψ1 − ψ2 from its new mean.
func (a *Accumulator) welford() {
	w := 1 / float64(a.n)
	np := len(a.tau)
	et := a.tau[:np]
	p1, p2 := a.psi[0][:np], a.psi[1][:np]
	mp1, mp2 := a.mPsi[0][:np], a.mPsi[1][:np]
	for i := range et {
		mp1[i] += (p1[i] - mp1[i]) * w
		mp2[i] += (p2[i] - mp2[i]) * w
		et[i] -= mp1[i] - mp2[i]
	}
	for n := range 2 {
		u, v, z, q := a.u[n][:np], a.v[n][:np], a.z[n][:np], a.q[n][:np]
		cs := a.cells[n][:np]
		for i := range cs {
			c := &cs[i]
			du, dv := u[i]-c.mu, v[i]-c.mv
			c.mu += du * w
			c.mv += dv * w
			c.mz += (z[i] - c.mz) * w
			c.mq += (q[i] - c.mq) * w
			eu, ev, ez, eq, e := u[i]-c.mu, v[i]-c.mv, z[i]-c.mz, q[i]-c.mq, et[i]
			c.uu += du * eu
			c.vv += dv * ev
			c.uv += du * ev
			c.uz += du * ez
			c.vz += dv * ez
			c.ut += du * e
			c.vt += dv * e
			c.uq += du * eq
			c.vq += dv * eq
		}
	}
}

// field returns one quantity of the cells of layer n as a new field.
func (a *Accumulator) field(n int, get func(c *cell) float64) []float64 {
	f := make([]float64, len(a.cells[n]))
	for i := range f {
		f[i] = get(&a.cells[n][i])
	}
	return f
}

// spectral updates the per-mode mean and co-moments of ψ (for the eddy
// spectra and the reference state).
func (a *Accumulator) spectral(psi [2][]complex128) {
	w := complex(1/float64(a.n), 0)
	for p := range a.g.Len() {
		keep := a.g.Keep(p)
		if keep == 0 {
			continue
		}
		x1, x2 := psi[0][p], psi[1][p]
		d1, d2 := x1-a.sMean[0][p], x2-a.sMean[1][p]
		a.sMean[0][p] += d1 * w
		a.sMean[1][p] += d2 * w
		e1, e2 := x1-a.sMean[0][p], x2-a.sMean[1][p]
		a.s11[p] += dotc(d1, e1)
		a.s22[p] += dotc(d2, e2)
		a.s12[p] += dotc(d1, e2)
	}
}

// inner is the configured inner product of two spectral streamfunction
// pairs, domain mean.
func (a *Accumulator) inner(x, y [2][]complex128) float64 {
	return innerProduct(a.g, a.ph, a.opt.Norm, x, y)
}

func innerProduct(g *qg.Grid, ph qg.Physics, norm Norm, x, y [2][]complex128) float64 {
	if norm == LayerNorm {
		return g.LayerProduct(ph, x, y)
	}
	k, p := g.EnergyProduct(ph, x, y)
	return k + p
}

// dotc returns Re(a·conj(b)).
func dotc(a, b complex128) float64 { return real(a)*real(b) + imag(a)*imag(b) }
