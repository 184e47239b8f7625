package qg

import "math"

// tendency sets dq to the PV tendency of the state q at time t and psi to
// its streamfunction, and stores in rates the energy rate (m² s⁻³) of each
// term of the tendency. On the first stage of a step (first) it also finds
// the CFL number of q; external includes the external forcings (the
// Forcings and GridForcings added to the model). The nonlinear term is computed in flux form,
// J(ψ, q) = ∂x(uq) + ∂y(vq), from gridded u, v, q and truncated by the 2/3
// rule; every other term is exact in spectral space.
//
// If update is not nil, update(n) is called once for each layer n as soon
// as dq[n] is complete (by the goroutine that computed it when the layers
// run concurrently), so that a time stepper's update of a layer is done
// where its tendency is still in cache. update(n) may touch only layer n's
// data and must not write q.
func (m *Model) tendency(dq, q, psi [2][]complex128, t float64, first, external bool, rates *[NumTerms]float64, update func(n int)) {
	g := m.g
	nk, nx := g.Nkx, g.Nx
	rows, nc := g.keptRows, g.keptCols
	fixed := m.blk != nil && m.blk.mode == Fixed
	relaxed := m.blk != nil && m.blk.mode == Relaxed
	var force [2][]complex128
	if m.blk != nil && m.blk.force[0] != nil {
		force = m.blk.force
	}
	idx, idy := 1/g.Dx, 1/g.Dy
	// The forcings do not depend on the state: evaluate them first, so that
	// each layer adds its part in its own pass.
	var ext [2][]complex128
	if external && len(m.forcings) > 0 {
		ext = m.fbuf
		for n := range 2 {
			clear(ext[n])
		}
		for _, f := range m.forcings {
			f.AddTendency(ext, t)
		}
	}
	m.eachLayer(func(n int) {
		lw := &m.lw[n]
		// Each layer inverts its own streamfunction from the PV of both:
		// the layers' data then stay with the core that works on them.
		for _, j := range rows {
			m.inv.invertLayerRange(n, psi[n], q, j*nk, j*nk+nc)
		}
		for j := range lw.rowRates {
			lw.rowRates[j] = [NumTerms]float64{}
		}
		m.velocity(lw, m.u[n], m.v[n], psi[n])
		lw.plan.Inverse(m.qp[n], q[n])
		u, v, qg, fu, fv := m.u[n], m.v[n], m.qp[n], lw.fu, lw.fv
		U := m.ph.U1
		if n == 1 {
			U = m.ph.U2
		}
		for y := range g.Ny {
			r := y * nx
			uu, vv, qq := u[r:r+nx], v[r:r+nx], qg[r:r+nx]
			var ub, vb, qb []float64
			if fixed {
				ub, vb, qb = m.blk.u[n][r:r+nx], m.blk.v[n][r:r+nx], m.blk.qp[n][r:r+nx]
			}
			m.fluxRow(fu[r:r+nx], fv[r:r+nx], uu, vv, qq, ub, vb, qb)
			if !first {
				continue
			}
			var cmax, cu, cv float64
			for x := range uu {
				ut, vt := uu[x]+U, vv[x]
				if fixed {
					ut, vt = ut+ub[x], vt+vb[x]
				}
				if c := math.Abs(ut)*idx + math.Abs(vt)*idy; c > cmax || c != c {
					cmax, cu, cv = c, ut, vt
				}
			}
			lw.rowCFL[y] = cmax
			lw.rowCFLAt[y] = [3]float64{float64(n + 1), cu, cv}
		}
		fuh, fvh := lw.a, lw.b
		lw.plan.Forward(fuh, fu)
		lw.plan.Forward(fvh, fv)

		w := m.ph.W1
		qy := m.ph.Q1y
		drag := 0.0
		if n == 1 {
			w, qy, drag = m.ph.W2, m.ph.Q2y, m.cfg.Drag
		}
		qn, pn, dn := q[n], psi[n], dq[n]
		var qb, fn, xn []complex128
		if ext[n] != nil {
			xn = ext[n]
		}
		if relaxed {
			qb = m.blk.q[n]
		}
		if force[n] != nil {
			fn = force[n]
		}
		hyper := m.hyper
		for _, j := range rows {
			l := g.l[j]
			var rAdv, rShear, rDrag, rHyp, rRel, rG, rF float64
			for i := range nc {
				p := j*nk + i
				keep := g.keep[p]
				if keep == 0 {
					dn[p] = 0
					continue
				}
				k := g.k[i]
				ps, qq := pn[p], qn[p]
				adv := divergence(k, l, fuh[p], fvh[p])
				shear := -(mulI(k*U, qq) + mulI(k*qy, ps))
				tot := adv + shear
				wp := g.weight[p]
				rAdv += wp * dot(ps, adv)
				rShear += wp * dot(ps, shear)
				if drag != 0 {
					d := scale(drag*g.k2[p], ps)
					tot += d
					rDrag += wp * dot(ps, d)
				}
				if hyper != nil {
					h := scale(-hyper[p], qq)
					tot += h
					rHyp += wp * dot(ps, h)
				}
				if qb != nil {
					rl := scale(-1/m.blk.tau, qq-qb[p])
					tot += rl
					rRel += wp * dot(ps, rl)
				}
				if fn != nil {
					tot += fn[p]
					rG += wp * dot(ps, fn[p])
				}
				if xn != nil {
					tot += xn[p]
					rF += wp * dot(ps, xn[p])
				}
				dn[p] = tot
			}
			rr := &lw.rowRates[j]
			rr[TermAdvection] = -w * rAdv
			rr[TermShear] = -w * rShear
			rr[TermDrag] = -w * rDrag
			rr[TermScaleSelective] = -w * rHyp
			rr[TermMaintenance] = -w * (rRel + rG) // one of the two is zero
			rr[TermInjection] = -w * rF
		}
		if first {
			lw.cfl, lw.cflAt = 0, [3]float64{}
			for y, c := range lw.rowCFL {
				if c > lw.cfl || c != c {
					lw.cfl, lw.cflAt = c, lw.rowCFLAt[y]
					if c != c {
						break
					}
				}
			}
		}
		if update != nil {
			update(n)
		}
	})
	*rates = [NumTerms]float64{}
	r0, r1 := m.lw[0].rowRates, m.lw[1].rowRates
	for j := range r0 {
		for k := range rates {
			rates[k] += r0[j][k] + r1[j][k]
		}
	}
	if first {
		a, b := &m.lw[0], &m.lw[1]
		m.cfl, m.cflAt = a.cfl, a.cflAt
		if b.cfl > a.cfl || (b.cfl != b.cfl && a.cfl == a.cfl) {
			m.cfl, m.cflAt = b.cfl, b.cflAt
		}
		m.cfl *= m.cfg.Dt
	}
}

// fluxRow sets the gridded PV fluxes (fu, fv) = (uq, vq) of one row. With a
// fixed block (ub, vb, qb not nil) the state is the eddy field and the
// fluxes are (u_B + u)(q_B + q) − u_B q_B, or u_B q + u q_B when the block
// mode is linear: the block's own flux u_B q_B is held, not advected.
func (m *Model) fluxRow(fu, fv, u, v, q, ub, vb, qb []float64) {
	switch {
	case ub == nil:
		for x := range u {
			fu[x] = u[x] * q[x]
			fv[x] = v[x] * q[x]
		}
	case m.blk.linear:
		for x := range u {
			fu[x] = ub[x]*q[x] + u[x]*qb[x]
			fv[x] = vb[x]*q[x] + v[x]*qb[x]
		}
	default:
		for x := range u {
			ut, vt, qt := u[x]+ub[x], v[x]+vb[x], q[x]+qb[x]
			fu[x] = ut*qt - ub[x]*qb[x]
			fv[x] = vt*qt - vb[x]*qb[x]
		}
	}
}
