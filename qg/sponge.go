package qg

import "math"

// setSponge precomputes the sponge's damping rate s(x) and its exact
// per-step factor exp(−s(x)·dt) per grid column.
func (m *Model) setSponge() {
	sp := m.cfg.Sponge
	if sp.Rate == 0 {
		return
	}
	g := m.g
	m.spongeRate = make([]float64, g.Nx)
	m.sponge = make([]float64, g.Nx)
	half := sp.Width / 2
	for x := range g.Nx {
		d := PeriodicDistance(g.X(x), sp.X, g.Lx)
		var s float64
		if math.Abs(d) < half {
			s = sp.Rate * 0.5 * (1 + math.Cos(math.Pi*d/half))
		}
		m.spongeRate[x] = s
		m.sponge[x] = math.Exp(-s * m.cfg.Dt)
	}
}

// SpongeRate returns the sponge's damping rate s(x) per grid column (s⁻¹),
// or nil without a sponge.
func (m *Model) SpongeRate() []float64 { return m.spongeRate }

// spongeLayer relaxes layer n of the state towards its target (the block's
// PV in the forced and relaxed modes, zero otherwise) by the exact factor
// exp(−s(x)·dt) on the grid, and truncates it to the retained modes.
func (m *Model) spongeLayer(n int) {
	g := m.g
	nx := g.Nx
	target := m.blk != nil && (m.blk.mode == Forced || m.blk.mode == Relaxed)
	qp, plan := m.qp[n], m.lw[n].plan
	plan.Inverse(qp, m.q[n])
	for y := range g.Ny {
		row := qp[y*nx : (y+1)*nx]
		if target {
			qb := m.blk.qp[n][y*nx : (y+1)*nx]
			for x, f := range m.sponge {
				row[x] = qb[x] + f*(row[x]-qb[x])
			}
		} else {
			for x, f := range m.sponge {
				row[x] *= f
			}
		}
	}
	plan.Forward(m.q[n], qp)
	for p, keep := range g.keep {
		if keep == 0 {
			m.q[n][p] = 0
		}
	}
}
