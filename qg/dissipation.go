package qg

import "math"

// setDissipation precomputes the hyperviscous rates ν K^(2p) or the cutoff
// filter's per-step factors exp(−λ(k)·dt), with
// λ(k) = (1/τ_f)·((κ − c)/(1 − c))^s for κ > c, where κ is the wavenumber
// in units of the largest retained one, κ² = (k·dx/(2π/3))² + (l·dy/(2π/3))²,
// c the cutoff, s the order and τ_f the e-folding time at κ = 1.
func (m *Model) setDissipation() {
	d := m.cfg.ScaleSelective
	g := m.g
	switch d.Kind {
	case Hyperviscosity:
		m.hyper = make([]float64, len(g.k2))
		for p, k2 := range g.k2 {
			m.hyper[p] = d.Viscosity * math.Pow(k2, float64(d.Order)) * g.keep[p]
		}
	case CutoffFilter:
		m.filter = make([]float64, len(g.k2))
		for p := range g.k2 {
			i, j := p%g.Nkx, p/g.Nkx
			kx := g.k[i] * g.Dx / (2 * math.Pi / 3)
			ky := g.l[j] * g.Dy / (2 * math.Pi / 3)
			kappa := math.Hypot(kx, ky)
			f := 1.0
			if kappa > d.FilterCutoff {
				lam := math.Pow((kappa-d.FilterCutoff)/(1-d.FilterCutoff), d.FilterOrder) / d.FilterTime
				f = math.Exp(-lam * m.cfg.Dt)
			}
			m.filter[p] = f * g.keep[p]
		}
	}
}

// filterLayer sets layer n of the state to the new state src filtered by
// the cutoff filter (copied without one), and returns the energy the filter
// changed in layer n, Σ_k (f_k² − 1)·E_n,k, which is exact; E_n,k =
// −½ W_n w_k Re(ψ̂_n conj q̂_n) with ψ̂_n inverted from src. It reads both
// layers of src and writes only layer n of the state.
func (m *Model) filterLayer(n int, src [2][]complex128) float64 {
	g := m.g
	nk := g.Nkx
	dst := m.q[n]
	if m.filter == nil {
		copy(dst, src[n])
		return 0
	}
	b1, b2, wn := m.layerInversion(n)
	rows := m.lw[n].rowSum
	for j := range g.Ny {
		var s float64
		for p := j * nk; p < (j+1)*nk; p++ {
			f, x := m.filter[p], src[n][p]
			if f == 1 {
				dst[p] = x
				continue
			}
			if w := g.weight[p]; w != 0 {
				pn := scale(b1[p], src[0][p]) + scale(b2[p], src[1][p])
				s += (f*f - 1) * (-0.5 * w * wn * dot(pn, x))
			}
			dst[p] = scale(f, x)
		}
		rows[j] = s
	}
	return sumRows(rows)
}
