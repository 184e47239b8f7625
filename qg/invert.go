package qg

// Inverter solves the two-layer PV inversion in spectral space:
//
//	ψ̂1 = −((K² + F2) q̂1 + F1 q̂2)/D,  ψ̂2 = −(F2 q̂1 + (K² + F1) q̂2)/D,
//	D = K²(K² + F1 + F2),
//
// with ψ̂ = 0 at K = 0 and on the modes outside the 2/3 truncation.
type Inverter struct {
	a11, a12, a21, a22 []float64
	k2                 []float64
	f1, f2             float64
	keep               []float64
}

// newInverter precomputes the inversion coefficients on grid g.
func newInverter(g *Grid, ph Physics) *Inverter {
	n := len(g.k2)
	v := &Inverter{
		a11: make([]float64, n), a12: make([]float64, n),
		a21: make([]float64, n), a22: make([]float64, n),
		k2: g.k2, f1: ph.F1, f2: ph.F2, keep: g.keep,
	}
	for p, k2 := range g.k2 {
		if k2 == 0 || g.keep[p] == 0 {
			continue
		}
		d := k2 * (k2 + ph.F1 + ph.F2)
		v.a11[p] = -(k2 + ph.F2) / d
		v.a12[p] = -ph.F1 / d
		v.a21[p] = -ph.F2 / d
		v.a22[p] = -(k2 + ph.F1) / d
	}
	return v
}

// Invert sets psi from q on every spectral point. psi and q must not alias.
func (v *Inverter) Invert(psi, q [2][]complex128) { v.invertRange(psi, q, 0, len(v.k2)) }

// InvertLayer sets layer n's streamfunction dst (n = 0 upper, 1 lower) from
// the PV q of both layers, with the same arithmetic as Invert. dst must not
// alias q.
func (v *Inverter) InvertLayer(n int, dst []complex128, q [2][]complex128) {
	v.invertLayerRange(n, dst, q, 0, len(v.k2))
}

// invertRange sets psi from q on spectral points [lo, hi).
func (v *Inverter) invertRange(psi, q [2][]complex128, lo, hi int) {
	q1, q2 := q[0][lo:hi], q[1][lo:hi]
	p1, p2 := psi[0][lo:hi], psi[1][lo:hi]
	a11, a12, a21, a22 := v.a11[lo:hi], v.a12[lo:hi], v.a21[lo:hi], v.a22[lo:hi]
	for p := range q1 {
		x1, x2 := q1[p], q2[p]
		p1[p] = complex(a11[p], 0)*x1 + complex(a12[p], 0)*x2
		p2[p] = complex(a21[p], 0)*x1 + complex(a22[p], 0)*x2
	}
}

// invertLayerRange is InvertLayer on spectral points [lo, hi).
func (v *Inverter) invertLayerRange(n int, dst []complex128, q [2][]complex128, lo, hi int) {
	q1, q2, d := q[0][lo:hi], q[1][lo:hi], dst[lo:hi]
	b1, b2 := v.a11[lo:hi], v.a12[lo:hi]
	if n == 1 {
		b1, b2 = v.a21[lo:hi], v.a22[lo:hi]
	}
	for p := range q1 {
		d[p] = complex(b1[p], 0)*q1[p] + complex(b2[p], 0)*q2[p]
	}
}

// PV sets q from psi on every spectral point (the forward PV definition),
// truncated to the retained modes:
// q̂1 = −K²ψ̂1 + F1(ψ̂2 − ψ̂1), q̂2 = −K²ψ̂2 + F2(ψ̂1 − ψ̂2).
func (v *Inverter) PV(q, psi [2][]complex128) {
	for p, k2 := range v.k2 {
		s1, s2 := psi[0][p], psi[1][p]
		m := complex(v.keep[p], 0)
		q[0][p] = m * (complex(-k2, 0)*s1 + complex(v.f1, 0)*(s2-s1))
		q[1][p] = m * (complex(-k2, 0)*s2 + complex(v.f2, 0)*(s1-s2))
	}
}
