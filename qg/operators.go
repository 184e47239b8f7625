package qg

// The spectral operators shared by the model's tendencies and the
// diagnostics: each is written once, here.

// divergence returns −(i k fx + i l fy), the convergence of a flux whose
// components have spectral coefficients fx and fy at wavenumbers (k, l).
// With (fx, fy) = (uq, vq) it is the advective tendency −J(ψ, q) in flux
// form.
func divergence(k, l float64, fx, fy complex128) complex128 {
	return -(mulI(k, fx) + mulI(l, fy))
}

// Convergence sets dst to −∇·(fx, fy), truncated to the retained modes,
// for spectral flux components fx and fy. dst may alias fy.
func (g *Grid) Convergence(dst, fx, fy []complex128) {
	for p := range dst {
		dst[p] = scale(g.keep[p], divergence(g.k[p%g.Nkx], g.l[p/g.Nkx], fx[p], fy[p]))
	}
}

// Velocity sets the spectral velocity of a spectral streamfunction ψ:
// u = −∂ψ/∂y and v = ∂ψ/∂x, that is û = −i l ψ̂ and v̂ = i k ψ̂, on the
// retained modes (zero elsewhere).
func (g *Grid) Velocity(u, v, psi []complex128) {
	clear(u)
	clear(v)
	g.velocityKept(u, v, psi)
}

// velocityKept writes the velocity on the retained modes only, leaving the
// other coefficients of u and v as they are (the model keeps them zero).
func (g *Grid) velocityKept(u, v, psi []complex128) {
	nk, nc := g.Nkx, g.keptCols
	for _, j := range g.keptRows {
		uj, vj, pj := u[j*nk:j*nk+nc], v[j*nk:j*nk+nc], psi[j*nk:j*nk+nc]
		l := g.l[j]
		for i, z := range pj {
			uj[i] = mulI(-l, z)
			vj[i] = mulI(g.k[i], z)
		}
	}
}

// EnergyProduct returns the two parts of the two-layer energy inner
// product of spectral streamfunction pairs a and b, domain means: the
// kinetic part Σ_n (H_n/H)⟨∇a_n·∇b_n⟩ and the potential part
// (H1/H) F1 ⟨(a1 − a2)(b1 − b2)⟩. The energy of ψ is half the sum of
// both parts of (ψ, ψ).
func (g *Grid) EnergyProduct(ph Physics, a, b [2][]complex128) (kinetic, potential float64) {
	for p, w := range g.weight {
		if w == 0 {
			continue
		}
		a1, a2, b1, b2 := a[0][p], a[1][p], b[0][p], b[1][p]
		kinetic += w * g.k2[p] * (ph.W1*dot(a1, b1) + ph.W2*dot(a2, b2))
		potential += w * dot(a1-a2, b1-b2)
	}
	return kinetic, potential * ph.W1 * ph.F1
}

// LayerProduct returns the mass-weighted inner product
// Σ_n (H_n/H)⟨a_n b_n⟩ of spectral field pairs a and b, domain mean.
func (g *Grid) LayerProduct(ph Physics, a, b [2][]complex128) float64 {
	var s float64
	for p, w := range g.weight {
		if w == 0 {
			continue
		}
		s += w * (ph.W1*dot(a[0][p], b[0][p]) + ph.W2*dot(a[1][p], b[1][p]))
	}
	return s
}
