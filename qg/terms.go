package qg

import (
	"fmt"
	"math"
)

// TermTendency sets dst to the PV tendency (s⁻², spectral) that a single
// term of the model's equations gives for an arbitrary spectral PV state q at
// time t. It serves diagnostics, e.g. the tendency of the block's dissipation
// or of the mean-flow terms evaluated on a time-mean state. The terms are:
//
//   - TermAdvection: −J(ψ, q); in the fixed mode, q is the eddy PV and the
//     term is −[J(ψ_B, q) + J(ψ, q_B) + J(ψ, q)] (without the last part
//     when Block.Linear);
//   - TermShear: −U_n ∂x q_n − Q_ny ∂x ψ_n;
//   - TermDrag: −r_ek ∇²ψ2 on the lower layer;
//   - TermScaleSelective: the hyperviscosity −ν(−∇²)^p q, or the cutoff
//     filter's equivalent rate −λ(k) q̂;
//   - TermSponge: −s(x)(q − target), the target being q_B in the forced and
//     relaxed modes and zero otherwise;
//   - TermMaintenance: the steady forcing G of the forced mode, or the
//     relaxation −(q − q_B)/τ_r of the relaxed mode;
//   - TermInjection: the sum of the deterministic Forcings and GridForcings
//     at time t (the stochastic Sources have no tendency of their own; their
//     mean is zero).
//
// Terms that are not active in the model's configuration give zero. It
// uses the model's work buffers, so it must not be called during a step.
func (m *Model) TermTendency(term Term, dst, q [2][]complex128, t float64) error {
	g := m.g
	ns := len(g.k2)
	for n := range 2 {
		if len(dst[n]) != ns || len(q[n]) != ns {
			return fmt.Errorf("qg: TermTendency: layer %d has %d and %d points, the grid needs %d", n+1, len(dst[n]), len(q[n]), ns)
		}
		clear(dst[n])
	}
	psi := m.psiS
	m.inv.Invert(psi, q)
	blk := m.blk
	switch term {
	case TermAdvection:
		for n := range 2 {
			m.advection(dst[n], n, psi[n], q[n], true)
		}
	case TermShear:
		qy := [2]float64{m.ph.Q1y, m.ph.Q2y}
		us := [2]float64{m.ph.U1, m.ph.U2}
		for n := range 2 {
			for p := range ns {
				k := g.k[p%g.Nkx] * g.keep[p]
				dst[n][p] = -(mulI(k*us[n], q[n][p]) + mulI(k*qy[n], psi[n][p]))
			}
		}
	case TermDrag:
		for p := range ns {
			dst[1][p] = scale(m.cfg.Drag*g.k2[p]*g.keep[p], psi[1][p])
		}
	case TermScaleSelective:
		if m.hyper != nil {
			for n := range 2 {
				for p := range ns {
					dst[n][p] = scale(-m.hyper[p], q[n][p])
				}
			}
		}
		if m.filter != nil {
			for n := range 2 {
				for p := range ns {
					if f := m.filter[p]; f > 0 && f < 1 {
						// λ = −ln(f)/dt recovers the filter's rate exactly.
						dst[n][p] = scale(lnRate(f, m.cfg.Dt), q[n][p])
					}
				}
			}
		}
	case TermSponge:
		if m.sponge != nil {
			target := blk != nil && (blk.mode == Forced || blk.mode == Relaxed)
			for n := range 2 {
				m.plan.Inverse(m.qp[n], q[n])
				qp := m.qp[n]
				for y := range g.Ny {
					for x := range g.Nx {
						i := y*g.Nx + x
						d := qp[i]
						if target {
							d -= blk.qp[n][i]
						}
						m.lw[0].fu[i] = -m.spongeRate[x] * d
					}
				}
				m.plan.Forward(dst[n], m.lw[0].fu)
				for p := range ns {
					dst[n][p] = scale(g.keep[p], dst[n][p])
				}
			}
		}
	case TermMaintenance:
		if blk != nil && blk.mode == Relaxed {
			for n := range 2 {
				for p := range ns {
					dst[n][p] = scale(-1/blk.tau, q[n][p]-blk.q[n][p])
				}
			}
		}
		if blk != nil && blk.force[0] != nil {
			for n := range 2 {
				copy(dst[n], blk.force[n])
			}
		}
	case TermInjection:
		for _, f := range m.forcings {
			f.AddTendency(dst, t)
		}
		for n := range 2 {
			for p := range ns {
				dst[n][p] = scale(g.keep[p], dst[n][p])
			}
		}
	default:
		return fmt.Errorf("qg: TermTendency: unknown term %d", int(term))
	}
	return nil
}

// lnRate returns the rate −ln(f)/dt as a negative tendency coefficient.
func lnRate(f, dt float64) float64 { return math.Log(f) / dt }

// Advection sets dst to the advective PV tendency −J(ψ, q) = −∇·(u q) of
// spectral ψ and q of layer n (0 upper, 1 lower), computed as the model's
// stepper computes it: the velocity and q on the grid, their products, and
// the convergence of the product, truncated to the retained modes. The
// fixed mode's block is not added (ψ and q are taken as the whole flow). It
// uses the model's work buffers, so it must not be called during a step.
func (m *Model) Advection(dst, psi, q []complex128, n int) error {
	ns := m.g.Len()
	if len(dst) != ns || len(psi) != ns || len(q) != ns {
		return fmt.Errorf("qg: Advection: %d, %d and %d coefficients, the grid needs %d", len(dst), len(psi), len(q), ns)
	}
	if n != 0 && n != 1 {
		return fmt.Errorf("qg: Advection: layer %d, want 0 (upper) or 1 (lower)", n)
	}
	m.advection(dst, n, psi, q, false)
	return nil
}

// advection sets dst to the advective PV tendency of layer n, in flux form
// and truncated, including the fixed block's background when withBlock is
// set and the block is fixed.
func (m *Model) advection(dst []complex128, n int, psi, q []complex128, withBlock bool) {
	g := m.g
	lw := &m.lw[0]
	u, v, qg, fu, fv := m.u[n], m.v[n], m.qp[n], lw.fu, lw.fv
	m.velocity(lw, u, v, psi)
	m.plan.Inverse(qg, q)
	b := m.blk
	nx := g.Nx
	for r := 0; r < len(u); r += nx {
		var ub, vb, qb []float64
		if withBlock && b != nil && b.mode == Fixed {
			ub, vb, qb = b.u[n][r:r+nx], b.v[n][r:r+nx], b.qp[n][r:r+nx]
		}
		m.fluxRow(fu[r:r+nx], fv[r:r+nx], u[r:r+nx], v[r:r+nx], qg[r:r+nx], ub, vb, qb)
	}
	m.plan.Forward(lw.a, fu)
	m.plan.Forward(lw.b, fv)
	g.Convergence(dst, lw.a, lw.b)
}
