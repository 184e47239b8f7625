package qg

import (
	"errors"
	"fmt"
	"math"
)

// StepError reports a step that failed: a non-finite field or a CFL number
// over the limit. The model's state is left as it was before the step.
type StepError struct {
	Time  float64 // model time at the start of the failed step, s
	Step  int     // index of the failed step
	Field string  // the offending field, e.g. "q1" or "u2"
	Why   string
}

func (e *StepError) Error() string {
	return fmt.Sprintf("qg: step %d at t = %.6g s (%.4g days): %s: %s", e.Step, e.Time, e.Time/86400, e.Field, e.Why)
}

// Step advances the model by one time step. On error (NaN/Inf, or a CFL
// number over Config.MaxCFL at the start of the step) the state and the
// energy ledger are restored to what they were before the step, and a
// *StepError names the time and the field.
func (m *Model) Step() error {
	if m.closed {
		return errors.New("qg: Step on a closed model")
	}
	for n := range 2 {
		copy(m.prev[n], m.q[n])
	}
	t0 := m.t
	led := m.ledger
	var err error
	switch {
	case m.cfg.Scheme == AB3 && m.nhist >= 2:
		err = m.stepAB3()
	default:
		err = m.stepRK4()
	}
	if err == nil {
		err = m.afterStep(m.next)
	}
	if err != nil {
		for n := range 2 {
			copy(m.q[n], m.prev[n])
		}
		m.inv.Invert(m.psi, m.q)
		m.nhist = 0
		m.t = t0
		m.ledger = led
		return err
	}
	m.steps++
	m.t = t0 + m.cfg.Dt
	return nil
}

// Run takes n steps, stopping at the first error.
func (m *Model) Run(n int) error {
	for range n {
		if err := m.Step(); err != nil {
			return err
		}
	}
	return nil
}

// RunUntil steps until the model time reaches t (s), rounded to a whole
// number of steps, stopping at the first error. A t before the model time
// is an error.
func (m *Model) RunUntil(t float64) error {
	if math.IsNaN(t) || math.IsInf(t, 0) || t < m.t-m.cfg.Dt/2 {
		return fmt.Errorf("qg: RunUntil(%g s): the model is at t = %g s and steps only forward", t, m.t)
	}
	return m.Run(int(math.Round((t - m.t) / m.cfg.Dt)))
}

// checkCFL is called after the first stage of a step.
func (m *Model) checkCFL() error {
	if m.cfl != m.cfl || math.IsInf(m.cfl, 0) {
		return &StepError{m.t, m.steps, fmt.Sprintf("u%d", int(m.cflAt[0])), "velocity is not finite"}
	}
	if m.cfl > m.cfg.MaxCFL {
		return &StepError{m.t, m.steps, fmt.Sprintf("u%d", int(m.cflAt[0])),
			fmt.Sprintf("CFL number %.3g exceeds max_cfl = %g (u = %.4g, v = %.4g m/s)", m.cfl, m.cfg.MaxCFL, m.cflAt[1], m.cflAt[2])}
	}
	return nil
}

// pushHist rotates the AB3 history so that slot 0 is free for the newest
// tendency, returning it.
func (m *Model) pushHist() [2][]complex128 {
	m.hist[0], m.hist[1], m.hist[2] = m.hist[2], m.hist[0], m.hist[1]
	m.histRates[0], m.histRates[1], m.histRates[2] = m.histRates[2], m.histRates[0], m.histRates[1]
	return m.hist[0]
}

// stepRK4 takes one classical RK4 step, keeping the first-stage tendency in
// the AB3 history. Each layer's update of the stage is done by the
// goroutine that computed its tendency; the stage values alternate between
// two buffers, so that no layer writes the state the other is still
// reading.
func (m *Model) stepRK4() error {
	dt := m.cfg.Dt
	q0, acc := m.q, m.acc
	for n := range 2 {
		copy(acc[n], q0[n])
	}
	stages := [4]struct{ c, b float64 }{{0, 1. / 6}, {0.5, 1. / 3}, {0.5, 1. / 3}, {1, 1. / 6}}
	next := [4]float64{0.5, 0.5, 1, 0}
	bufs := [2][2][]complex128{m.qs, m.qs2}
	var rates [NumTerms]float64
	var ledger Ledger
	g := m.g
	in := q0
	for s, st := range stages {
		k := m.dq
		if s == 0 {
			k = m.pushHist()
		}
		out := bufs[s%2]
		bdt, cdt := st.b*dt, next[s]*dt
		last := s == 3
		update := func(n int) {
			for _, j := range g.keptRows {
				a, b := j*g.Nkx, j*g.Nkx+g.keptCols
				kk, ac, qq, q00 := k[n][a:b], acc[n][a:b], out[n][a:b], q0[n][a:b]
				for p := range kk {
					ac[p] += scale(bdt, kk[p])
					if !last {
						qq[p] = q00[p] + scale(cdt, kk[p])
					}
				}
			}
		}
		m.tendency(k, in, m.psiS, m.t+st.c*dt, s == 0, true, &rates, update)
		if s == 0 {
			m.histRates[0] = rates
			if err := m.checkCFL(); err != nil {
				return err
			}
		}
		for i, r := range rates {
			ledger[i] += st.b * dt * r
		}
		in = out
	}
	m.next = acc
	for i := range ledger {
		m.ledger[i] += ledger[i]
	}
	if m.nhist < 3 {
		m.nhist++
	}
	return nil
}

// stepAB3 takes one third-order Adams–Bashforth step,
// q ← q + dt(23 f_n − 16 f_{n−1} + 5 f_{n−2})/12; the energy rates are
// extrapolated with the same weights.
func (m *Model) stepAB3() error {
	dt := m.cfg.Dt
	k := m.pushHist()
	c0, c1, c2 := 23*dt/12, -16*dt/12, 5*dt/12
	g := m.g
	out := m.qs
	update := func(n int) {
		for _, j := range g.keptRows {
			a, b := j*g.Nkx, j*g.Nkx+g.keptCols
			q, qn, f0, f1, f2 := m.q[n][a:b], out[n][a:b], m.hist[0][n][a:b], m.hist[1][n][a:b], m.hist[2][n][a:b]
			for p := range q {
				qn[p] = q[p] + (scale(c0, f0[p]) + scale(c1, f1[p]) + scale(c2, f2[p]))
			}
		}
	}
	var rates [NumTerms]float64
	m.tendency(k, m.q, m.psiS, m.t, true, true, &rates, update)
	m.histRates[0] = rates
	if err := m.checkCFL(); err != nil {
		return err
	}
	for i := range m.ledger {
		m.ledger[i] += c0*m.histRates[0][i] + c1*m.histRates[1][i] + c2*m.histRates[2][i]
	}
	m.next = out
	return nil
}

// afterStep sets the state from the scheme's new state src and applies the
// split steps (filter, sponge, sources), booking the energy each changed;
// then it restores the streamfunction and checks that the state is finite.
// The layers are processed concurrently where they are independent.
func (m *Model) afterStep(src [2][]complex128) error {
	var eFilter, eBefore, eAfter [2]float64
	var finite [2]bool
	sponge := m.sponge != nil
	m.eachLayer(func(n int) {
		eFilter[n] = m.filterLayer(n, src)
		if sponge {
			eBefore[n] = m.layerEnergy(n, src, m.filter, nil) // the filtered state, without reading the other layer's
			m.spongeLayer(n)
		}
	})
	m.ledger[TermScaleSelective] += eFilter[0] + eFilter[1]
	// the energy of the state, its finiteness and, once the state is
	// final, its streamfunction
	final := len(m.sources) == 0
	settle := func(n int) {
		var psi []complex128
		if final {
			psi = m.psi[n]
		}
		eAfter[n] = m.layerEnergy(n, m.q, nil, psi)
		var s float64
		for _, z := range m.q[n] {
			s += real(z)*real(z) + imag(z)*imag(z)
		}
		finite[n] = !math.IsNaN(s) && !math.IsInf(s, 0)
	}
	m.eachLayer(settle)
	if sponge {
		m.ledger[TermSponge] += (eAfter[0] + eAfter[1]) - (eBefore[0] + eBefore[1])
	}
	if len(m.sources) > 0 {
		e0 := eAfter[0] + eAfter[1]
		for _, s := range m.sources {
			for n := range 2 {
				clear(m.dq[n])
			}
			s.Increment(m.dq, m.t, m.cfg.Dt)
			for n := range 2 {
				for p, keep := range m.g.keep {
					m.q[n][p] += scale(keep, m.dq[n][p])
				}
			}
		}
		final = true
		m.eachLayer(settle)
		// E(q + Δq) − E(q) = −Σ_n W_n⟨(ψ_n + ½Δψ_n) Δq_n⟩: the midpoint
		// (Stratonovich) evaluation, exact for a quadratic energy.
		m.ledger[TermInjection] += (eAfter[0] + eAfter[1]) - e0
	}
	for n := range 2 {
		if !finite[n] {
			return &StepError{m.t, m.steps, fmt.Sprintf("q%d", n+1), "PV is not finite after the step"}
		}
	}
	return nil
}

// CheckState runs the checks of a step's start on the current state without
// stepping: the state must be finite and its CFL number (with the imposed
// flow and a fixed block) at most Config.MaxCFL. It returns a *StepError
// naming the field, as Step would, or nil. A run calls it before its first
// step, so that a configuration whose initial flow is already too fast is
// refused before any work.
func (m *Model) CheckState() error {
	for n := range 2 {
		for _, z := range m.q[n] {
			if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
				return &StepError{m.t, m.steps, fmt.Sprintf("q%d", n+1), "PV is not finite"}
			}
		}
	}
	g := m.g
	fixed := m.blk != nil && m.blk.mode == Fixed
	var cfl float64
	var at [3]float64
	for n := range 2 {
		u, v := m.u[n], m.v[n]
		m.velocity(&m.lw[n], u, v, m.psi[n])
		U := m.ph.U1
		if n == 1 {
			U = m.ph.U2
		}
		for i := range u {
			ut, vt := u[i]+U, v[i]
			if fixed {
				ut, vt = ut+m.blk.u[n][i], vt+m.blk.v[n][i]
			}
			if c := (math.Abs(ut)/g.Dx + math.Abs(vt)/g.Dy) * m.cfg.Dt; c > cfl || c != c {
				cfl, at = c, [3]float64{float64(n + 1), ut, vt}
				if c != c {
					break
				}
			}
		}
	}
	if cfl != cfl || math.IsInf(cfl, 0) {
		return &StepError{m.t, m.steps, fmt.Sprintf("u%d", int(at[0])), "velocity is not finite"}
	}
	if cfl > m.cfg.MaxCFL {
		return &StepError{m.t, m.steps, fmt.Sprintf("u%d", int(at[0])),
			fmt.Sprintf("CFL number %.3g of the state exceeds max_cfl = %g (u = %.4g, v = %.4g m/s)", cfl, m.cfg.MaxCFL, at[1], at[2])}
	}
	return nil
}
