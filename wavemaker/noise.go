package wavemaker

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// pcgStream is the second word of the PCG state; the Config's seed is the
// first. Any fixed constant serves (this one is our own choice).
const pcgStream = 0x5eed_b10c_ed_d1e5

// Noise is a stochastic PV source, white or red in time (a qg.Source). Each
// step it draws a unit Gaussian field on the grid in a fixed order (row by
// row, west to east), multiplies it by the mask, transforms it once, keeps
// the modes of the band and scales it by the vertical structure and by the
// amplitude that gives the target injection rate.
type Noise struct {
	kind   Kind
	tau    float64
	eps    float64
	g      *qg.Grid
	plan   *fft.Plan2D
	rng    *rand.Rand
	pcg    *rand.PCG // rng's source, kept for checkpoints
	mask   []float64 // nil for no mask
	modes  []int     // spectral indices of the band, retained modes only
	vec    [2]float64
	kernel float64 // S = M⟨m²⟩ Σ_band Weight·A: the expected 2E per unit raw variance
	sigma  float64 // white: Δq = √dt·σ·(…); red: the OU's stationary amplitude

	buf  []float64
	spec []complex128

	// red noise
	f       []float64 // OU state per grid point, unit stationary variance
	started bool
	ou      ouStep
}

// NewNoise builds white or red noise (cfg.Kind White or Red) for model m.
func NewNoise(cfg Config, m *qg.Model) (*Noise, error) {
	if cfg.Kind != White && cfg.Kind != Red {
		return nil, fieldErr("kind", string(cfg.Kind), `NewNoise needs "white" or "red"`)
	}
	if err := cfg.ValidateFor(m.Config()); err != nil {
		return nil, err
	}
	g := m.Grid()
	// One worker: the source runs on the caller between the model's steps,
	// so it uses none of the model's goroutines and starts none of its own.
	plan, err := fft.NewPlan2D(g.Nx, g.Ny, 1)
	if err != nil {
		return nil, fmt.Errorf("wavemaker: transform: %w", err)
	}
	ph := m.Physics()
	pcg := rand.NewPCG(cfg.Seed, pcgStream)
	s := &Noise{
		kind: cfg.Kind, tau: cfg.CorrelationTime, eps: cfg.InjectionRate,
		g: g, plan: plan,
		rng:   rand.New(pcg),
		pcg:   pcg,
		mask:  maskField(g, cfg.Mask),
		modes: bandModes(g, cfg.Band),
		vec:   verticalVector(cfg.Vertical, ph),
		buf:   make([]float64, g.Nx*g.Ny),
		spec:  make([]complex128, g.Ny*g.Nkx),
	}
	a := energyKernel(m.Inverter(), ph, g.Len(), s.vec)
	var sum float64
	for _, p := range s.modes {
		sum += g.Weight(p) * a[p]
	}
	s.kernel = float64(g.Nx*g.Ny) * meanSquare(s.mask) * sum
	if !(s.kernel > 0) {
		return nil, fieldErr("band", cfg.Band.Kind, "the band forces no energy with vertical structure %q", cfg.Vertical)
	}
	switch s.kind {
	case White:
		s.sigma = math.Sqrt(2 * s.eps / s.kernel)
	case Red:
		s.sigma = math.Sqrt(s.eps / (s.tau * s.kernel))
		s.f = make([]float64, len(s.buf))
	}
	return s, nil
}

// Attach adds the noise to the model's stochastic sources.
func (s *Noise) Attach(m *qg.Model) { m.AddSource(s) }

// InjectionRate returns the target rate ε, m² s⁻³.
func (s *Noise) InjectionRate() float64 { return s.eps }

// Modes returns the number of retained modes in the band (each stored
// coefficient counted once).
func (s *Noise) Modes() int { return len(s.modes) }

// Increment sets dq to the PV increment over [t, t + dt] (qg.Source). White
// noise draws M = Nx·Ny unit normals per call; red noise draws M at its
// first call (the stationary initial state) and 2M per call after that.
func (s *Noise) Increment(dq [2][]complex128, t, dt float64) {
	var amp float64
	switch s.kind {
	case White:
		for p := range s.buf {
			s.buf[p] = s.rng.NormFloat64()
		}
		amp = s.sigma * math.Sqrt(dt)
	case Red:
		s.advance(dt)
		amp = s.sigma
	}
	s.emit(dq, amp)
}

// advance takes the OU state over a step and leaves its integral over the
// step in buf.
func (s *Noise) advance(dt float64) {
	if !s.started {
		for p := range s.f {
			s.f[p] = s.rng.NormFloat64()
		}
		s.started = true
	}
	if s.ou.dt != dt {
		s.ou = newOUStep(dt, s.tau)
	}
	o := s.ou
	for p, f := range s.f {
		x1 := s.rng.NormFloat64()
		x2 := s.rng.NormFloat64()
		s.buf[p] = o.cI*f + o.sI*x1
		s.f[p] = o.a*f + o.g1*x1 + o.g2*x2
	}
}

// emit masks buf, transforms it, and sets dq to amp times its band modes
// times the vertical structure.
func (s *Noise) emit(dq [2][]complex128, amp float64) {
	if s.mask != nil {
		for p, m := range s.mask {
			s.buf[p] *= m
		}
	}
	s.plan.Forward(s.spec, s.buf)
	clear(dq[0])
	clear(dq[1])
	c0, c1 := amp*s.vec[0], amp*s.vec[1]
	for _, p := range s.modes {
		z := s.spec[p]
		dq[0][p] = complex(c0*real(z), c0*imag(z))
		dq[1][p] = complex(c1*real(z), c1*imag(z))
	}
}

// Tendency sets dst to the current PV tendency of red noise (s⁻², spectral,
// in the Grid's layout), the forcing whose integral over each step the
// increments are, and reports true; for white noise, which has no
// pointwise value, it reports false and leaves dst alone. It costs one
// transform and draws no random numbers (before the first step it reports
// the zero field).
func (s *Noise) Tendency(dst [2][]complex128) bool {
	if s.kind != Red {
		return false
	}
	copy(s.buf, s.f)
	s.emit(dst, s.sigma)
	return true
}

// MarshalBinary returns the noise's state — its random generator and, for
// red noise, the Ornstein–Uhlenbeck field — so that a run restarted from a
// checkpoint draws the same increments as the run that wrote it.
func (s *Noise) MarshalBinary() ([]byte, error) {
	g, err := s.pcg.MarshalBinary()
	if err != nil {
		return nil, err
	}
	b := binary.LittleEndian.AppendUint32(nil, uint32(len(g)))
	b = append(b, g...)
	started := byte(0)
	if s.started {
		started = 1
	}
	b = append(b, started)
	b = binary.LittleEndian.AppendUint32(b, uint32(len(s.f)))
	for _, v := range s.f {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
	}
	return b, nil
}

// UnmarshalBinary restores a state written by MarshalBinary for the same
// configuration and grid.
func (s *Noise) UnmarshalBinary(b []byte) error {
	bad := errors.New("wavemaker: noise state: truncated or for another grid")
	if len(b) < 4 {
		return bad
	}
	n := int(binary.LittleEndian.Uint32(b))
	b = b[4:]
	if len(b) < n+5 {
		return bad
	}
	if err := s.pcg.UnmarshalBinary(b[:n]); err != nil {
		return fmt.Errorf("wavemaker: noise state: %w", err)
	}
	b = b[n:]
	started := b[0] == 1
	nf := int(binary.LittleEndian.Uint32(b[1:]))
	b = b[5:]
	if len(b) != 8*nf || (nf != 0 && nf != s.g.Nx*s.g.Ny) {
		return bad
	}
	if nf == 0 {
		s.f = nil
	} else {
		s.f = make([]float64, nf)
		for i := range s.f {
			s.f[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
		}
	}
	s.started = started
	return nil
}
