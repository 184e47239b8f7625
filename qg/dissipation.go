package qg

import "math"

// setDissipation precomputes the hyperviscous rates ν K^(2p) or the cutoff
// filter's per-step factors exp(−λ(k)·dt), with
// λ(k) = (1/τ_f)·((κ − c)/(1 − c))^s for κ > c, where κ is the wavenumber
// in units of the largest retained one, κ² = (k·dx/(2π/3))² + (l·dy/(2π/3))²,
// c the cutoff, s the order and τ_f the e-folding time at κ = 1.
func (m *Model) setDissipation() {
	d := m.cfg.Dissipation
	g := m.g
	switch d.Kind {
	case Hyperviscosity:
		m.hyper = make([]float64, len(g.K2))
		for p, k2 := range g.K2 {
			m.hyper[p] = d.Viscosity * math.Pow(k2, float64(d.Order)) * g.Keep[p]
		}
	case CutoffFilter:
		m.filter = make([]float64, len(g.K2))
		for p := range g.K2 {
			i, j := p%g.Nkx, p/g.Nkx
			kx := g.K[i] * g.Dx / (2 * math.Pi / 3)
			ky := g.L[j] * g.Dy / (2 * math.Pi / 3)
			kappa := math.Hypot(kx, ky)
			f := 1.0
			if kappa > d.FilterCutoff {
				lam := math.Pow((kappa-d.FilterCutoff)/(1-d.FilterCutoff), d.FilterOrder) / d.FilterTime
				f = math.Exp(-lam * m.cfg.Dt)
			}
			m.filter[p] = f * g.Keep[p]
		}
	}
}

// applyFilter multiplies the state by the filter factors and returns the
// energy this changed, Σ_k (f_k² − 1)·E_k, which is exact.
func (m *Model) applyFilter() float64 {
	g, v := m.g, m.inv
	nk := g.Nkx
	rows := m.rowSum
	forRows(m.workers, g.Ny, func(lo, hi int) {
		for j := lo; j < hi; j++ {
			var s float64
			for p := j * nk; p < (j+1)*nk; p++ {
				f := m.filter[p]
				if f == 1 {
					continue
				}
				x1, x2 := m.q[0][p], m.q[1][p]
				if w := g.Weight[p]; w != 0 {
					p1 := scale(v.a11[p], x1) + scale(v.a12[p], x2)
					p2 := scale(v.a21[p], x1) + scale(v.a22[p], x2)
					e := -0.5 * w * (m.ph.W1*dot(p1, x1) + m.ph.W2*dot(p2, x2))
					s += (f*f - 1) * e
				}
				m.q[0][p] = scale(f, x1)
				m.q[1][p] = scale(f, x2)
			}
			rows[j] = s
		}
	})
	var s float64
	for _, r := range rows {
		s += r
	}
	return s
}
