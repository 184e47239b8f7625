package wavemaker

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// Train is a deterministic localised wave train (a qg.Forcing): the PV
// tendency W_n = v_n · A · m(x, y) · cos(kx + ly − ωt), truncated to the
// modes the model retains. Since cos(θ − ωt) = cos θ cos ωt + sin θ sin ωt,
// the spectra C and S of m·cos θ and m·sin θ are computed once, and each
// stage costs only W = A(C cos ωt + S sin ωt): no transform.
type Train struct {
	amp, omega, k, l float64
	vec              [2]float64
	modes            []int        // retained modes where C or S is nonzero
	c, s             []complex128 // spectra of m cos θ and m sin θ, on modes
}

// NewTrain builds the wave train of cfg (Kind WaveTrain) for model m.
func NewTrain(cfg Config, m *qg.Model) (*Train, error) {
	if cfg.Kind != WaveTrain {
		return nil, fieldErr("kind", string(cfg.Kind), `NewTrain needs "wavetrain"`)
	}
	if err := cfg.ValidateFor(m.Config()); err != nil {
		return nil, err
	}
	g := m.Grid()
	plan, err := fft.NewPlan2D(g.Nx, g.Ny, 1)
	if err != nil {
		return nil, fmt.Errorf("wavemaker: transform: %w", err)
	}
	tr := &Train{
		amp: cfg.Train.Amplitude, omega: cfg.Train.Frequency,
		k: waveNumber(cfg.Train.WavelengthX), l: waveNumber(cfg.Train.WavelengthY),
		vec: verticalVector(cfg.Vertical, m.Physics()),
	}
	mask := maskField(g, cfg.Mask)
	cosF, sinF := make([]float64, g.Nx*g.Ny), make([]float64, g.Nx*g.Ny)
	for y := range g.Ny {
		for x := range g.Nx {
			p := y*g.Nx + x
			th := tr.k*g.X(x) + tr.l*g.Y(y)
			sn, cs := math.Sincos(th)
			w := 1.0
			if mask != nil {
				w = mask[p]
			}
			cosF[p], sinF[p] = w*cs, w*sn
		}
	}
	cs, sn := make([]complex128, g.Ny*g.Nkx), make([]complex128, g.Ny*g.Nkx)
	plan.Forward(cs, cosF)
	plan.Forward(sn, sinF)
	for p := range g.Len() {
		keep := g.Keep(p)
		if keep == 0 || (cs[p] == 0 && sn[p] == 0) {
			continue
		}
		tr.modes = append(tr.modes, p)
		tr.c = append(tr.c, cs[p])
		tr.s = append(tr.s, sn[p])
	}
	return tr, nil
}

// Attach adds the train to the model's deterministic forcings.
func (tr *Train) Attach(m *qg.Model) { m.AddForcing(tr) }

// Wavenumber returns the train's (k, l), rad m⁻¹, and frequency ω, rad s⁻¹.
func (tr *Train) Wavenumber() (k, l, omega float64) { return tr.k, tr.l, tr.omega }

// AddTendency adds the train's PV tendency at time t to dq (qg.Forcing).
func (tr *Train) AddTendency(dq [2][]complex128, t float64) {
	sn, cs := math.Sincos(tr.omega * t)
	a0, a1 := tr.amp*tr.vec[0], tr.amp*tr.vec[1]
	for i, p := range tr.modes {
		z := complex(cs, 0)*tr.c[i] + complex(sn, 0)*tr.s[i]
		if a0 != 0 {
			dq[0][p] += complex(a0*real(z), a0*imag(z))
		}
		if a1 != 0 {
			dq[1][p] += complex(a1*real(z), a1*imag(z))
		}
	}
}
