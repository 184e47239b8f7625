package qg

import (
	"errors"
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/settings"
)

// A SteadyForcing is the forcing H = −N(q̄) that makes a given state q̄ an
// exact steady state of a model: N is the model's whole tendency but its
// external forcings (advection of q̄ by itself and by the imposed flow,
// β and the background PV gradients, drag, scale-selective dissipation,
// sponge, the block's maintenance). For the time mean of a statistically
// steady run, H holds the time-mean external forcing and the time-mean
// eddy PV flux convergence, up to sampling error and trend.
//
// H has two parts, so that q̄ is steady in the model as it is stepped and
// not only in the continuous equations: the negated tendency of the terms
// the time stepper integrates, added at every stage like a Forcing, and
// the change the split steps (cutoff filter, sponge) make to q̄ in one
// step, added back once per step after them like a Source.
type SteadyForcing struct {
	tendency [2][]complex128 // −N of the stepper's terms at q̄, s⁻²
	split    [2][]complex128 // q̄ − split steps(q̄), s⁻¹ per step
	dt       float64
	config   map[string]string
}

// SteadyForcing returns the forcing that holds the spectral PV q (both
// layers, in the Grid's layout; truncated to the retained modes) steady in
// this model. The model's external forcings and sources are left out of N
// whether attached or not, and its state is left as it was. It uses the
// model's work buffers, so it must not be called during a step.
func (m *Model) SteadyForcing(q [2][]complex128) (*SteadyForcing, error) {
	ns := m.g.Len()
	for n := range 2 {
		if len(q[n]) != ns {
			return nil, fmt.Errorf("qg: SteadyForcing: layer %d has %d coefficients, the grid needs %d", n+1, len(q[n]), ns)
		}
		for p, z := range q[n] {
			if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
				return nil, fmt.Errorf("qg: SteadyForcing: layer %d is not finite at point %d", n+1, p)
			}
		}
	}
	qb := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	for n := range 2 {
		for p, z := range q[n] {
			qb[n][p] = scale(m.g.keep[p], z)
		}
	}
	s := &SteadyForcing{dt: m.cfg.Dt, config: configSettings(m.cfg)}
	s.tendency = [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	var rates [NumTerms]float64
	m.tendency(s.tendency, qb, m.psiS, m.t, false, false, &rates, nil)
	for n := range 2 {
		for p, z := range s.tendency[n] {
			s.tendency[n][p] = -z
		}
	}
	// the split steps applied to q̄, on the model's state buffers, which are
	// restored afterwards
	saved := [2][]complex128{clone(m.q[0]), clone(m.q[1])}
	for n := range 2 {
		m.filterLayer(n, qb)
		if m.sponge != nil {
			m.spongeLayer(n)
		}
	}
	s.split = [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	for n := range 2 {
		for p := range qb[n] {
			s.split[n][p] = qb[n][p] - m.q[n][p]
		}
		copy(m.q[n], saved[n])
	}
	return s, nil
}

// Rate returns H as a PV tendency (s⁻², spectral, both layers): the
// stepper's part plus the split steps' part per unit time.
func (s *SteadyForcing) Rate() [2][]complex128 {
	var h [2][]complex128
	for n := range 2 {
		h[n] = make([]complex128, len(s.tendency[n]))
		for p := range h[n] {
			h[n][p] = s.tendency[n][p] + scale(1/s.dt, s.split[n][p])
		}
	}
	return h
}

// Attach adds the forcing to m, which must be configured as the model it
// was computed for (the number of workers may differ): its first part as a
// Forcing, its second as a Source. Their work is booked under
// TermInjection.
func (s *SteadyForcing) Attach(m *Model) error {
	if d := settings.Diff(s.config, configSettings(m.cfg)); len(d) > 0 {
		return errors.Join(errors.New("qg: SteadyForcing.Attach: the model is configured differently from the one the forcing was computed for"), &ConfigMismatch{d})
	}
	m.AddForcing(steadyTendency{s})
	m.AddSource(steadySplit{s})
	return nil
}

type steadyTendency struct{ s *SteadyForcing }

func (f steadyTendency) AddTendency(dq [2][]complex128, t float64) {
	for n := range 2 {
		for p, z := range f.s.tendency[n] {
			dq[n][p] += z
		}
	}
}

type steadySplit struct{ s *SteadyForcing }

func (f steadySplit) Increment(dq [2][]complex128, t, dt float64) {
	copy(dq[0], f.s.split[0])
	copy(dq[1], f.s.split[1])
}
