package diag

import (
	"github.com/eddyblock/eddyblock/qg"
)

// eddyMoments holds the gridded eddy second moments of one layer, m s⁻¹
// times the other variable's unit: u′u′, v′v′, u′v′, u′ζ′, v′ζ′,
// u′(ψ1 − ψ2)′, v′(ψ1 − ψ2)′, u′q′, v′q′.
type eddyMoments struct {
	uu, vv, uv, uz, vz, ut, vt, uq, vq []float64
}

// analysis is everything derived from the accumulators at one time.
type analysis struct {
	mom                [2]eddyMoments
	conv, convZ, conv2 [2][]complex128 // C, its vorticity part and interface part (spectral PV tendencies)
	psit, psitZ, psit2 [2][]complex128 // their streamfunction tendencies
	refPsi, refQ       [2][]complex128 // the reference state
}

// moments returns the eddy second moments of layer n: the co-moments over N
// (departures from the window mean), plus the products of the means when
// the eddies are the state itself (fixed mode).
func (a *Accumulator) moments(n int) eddyMoments {
	np := len(a.tau)
	w := 1 / float64(a.n)
	var mo eddyMoments
	for _, f := range []*[]float64{&mo.uu, &mo.vv, &mo.uv, &mo.uz, &mo.vz, &mo.ut, &mo.vt, &mo.uq, &mo.vq} {
		*f = make([]float64, np)
	}
	mp1, mp2 := a.mPsi[0], a.mPsi[1]
	for i := range np {
		c := &a.cells[n][i]
		mo.uu[i], mo.vv[i], mo.uv[i] = c.uu*w, c.vv*w, c.uv*w
		mo.uz[i], mo.vz[i] = c.uz*w, c.vz*w
		mo.ut[i], mo.vt[i] = c.ut*w, c.vt*w
		mo.uq[i], mo.vq[i] = c.uq*w, c.vq*w
		if a.raw {
			mt := mp1[i] - mp2[i]
			mo.uu[i] += c.mu * c.mu
			mo.vv[i] += c.mv * c.mv
			mo.uv[i] += c.mu * c.mv
			mo.uz[i] += c.mu * c.mz
			mo.vz[i] += c.mv * c.mz
			mo.ut[i] += c.mu * mt
			mo.vt[i] += c.mv * mt
			mo.uq[i] += c.mu * c.mq
			mo.vq[i] += c.mv * c.mq
		}
	}
	return mo
}

// convergence sets dst to −∇·(fx, fy), spectral, truncated to the retained
// modes.
func (a *Accumulator) convergence(dst []complex128, fx, fy []float64) {
	fxh := make([]complex128, len(dst))
	a.plan.Forward(fxh, fx)
	a.plan.Forward(dst, fy)
	a.g.Convergence(dst, fxh, dst)
}

// analyse derives the eddy fluxes, their convergences and the tendencies
// they induce, and the reference state.
func (a *Accumulator) analyse() *analysis {
	ns := a.g.Len()
	an := &analysis{}
	pair := func() [2][]complex128 { return [2][]complex128{make([]complex128, ns), make([]complex128, ns)} }
	an.conv, an.convZ, an.conv2 = pair(), pair(), pair()
	an.psit, an.psitZ, an.psit2 = pair(), pair(), pair()
	f := [2]float64{-a.ph.F1, a.ph.F2} // F_n (ψ_m − ψ_n) = ∓F_n (ψ1 − ψ2)
	for n := range 2 {
		mo := a.moments(n)
		an.mom[n] = mo
		a.convergence(an.conv[n], mo.uq, mo.vq)
		a.convergence(an.convZ[n], mo.uz, mo.vz)
		a.convergence(an.conv2[n], mo.ut, mo.vt)
		for p := range an.conv2[n] {
			an.conv2[n][p] *= complex(f[n], 0)
		}
	}
	inv := a.m.Inverter()
	inv.Invert(an.psit, an.conv)
	inv.Invert(an.psitZ, an.convZ)
	inv.Invert(an.psit2, an.conv2)

	an.refPsi, an.refQ = pair(), pair()
	switch {
	case a.raw:
		copy(an.refPsi[0], a.blkPsi[0])
		copy(an.refPsi[1], a.blkPsi[1])
	case a.mode == qg.Fixed:
		for n := range 2 {
			for p := range ns {
				an.refPsi[n][p] = a.blkPsi[n][p] + a.sMean[n][p]
			}
		}
	default:
		copy(an.refPsi[0], a.sMean[0])
		copy(an.refPsi[1], a.sMean[1])
	}
	inv.PV(an.refQ, an.refPsi)
	return an
}

// termTendency returns the streamfunction tendency of one model term on the
// reference PV state.
func (a *Accumulator) termTendency(term qg.Term, refQ [2][]complex128) [2][]complex128 {
	ns := a.g.Len()
	dq := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	if err := a.m.TermTendency(term, dq, refQ, a.tLast); err != nil {
		panic("diag: " + err.Error()) // only a size mismatch, not possible here
	}
	return dq
}

// streamTendency inverts a PV tendency.
func (a *Accumulator) streamTendency(dq [2][]complex128) [2][]complex128 {
	ns := a.g.Len()
	ps := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	a.m.Inverter().Invert(ps, dq)
	return ps
}

// addTo adds y into x.
func addTo(x, y [2][]complex128) {
	for n := range 2 {
		for p := range x[n] {
			x[n][p] += y[n][p]
		}
	}
}
