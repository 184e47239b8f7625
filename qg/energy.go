package qg

import "fmt"

// Term names a term of the energy budget.
type Term int

// Energy budget terms. Each is booked as the energy it adds to the state
// (negative for a loss), per unit mass, m² s⁻².
const (
	// TermAdvection is the work of the nonlinear advection. It vanishes up
	// to rounding for the full flow; in the fixed-block mode it is the
	// exchange of energy between the eddies and the prescribed block.
	TermAdvection Term = iota
	// TermShear is the work of the imposed flow and background PV gradient:
	// the conversion of the mean shear's available potential energy into
	// eddy energy (β alone does no work).
	TermShear
	// TermDrag is the Ekman drag on the lower layer.
	TermDrag
	// TermHyperviscosity is the hyperviscous dissipation.
	TermHyperviscosity
	// TermFilter is the loss to the cutoff filter.
	TermFilter
	// TermSponge is the loss to the sponge band.
	TermSponge
	// TermRelaxation is the work of the relaxation towards the block.
	TermRelaxation
	// TermBlockForcing is the work of the steady forcing that holds the
	// block in the forced mode.
	TermBlockForcing
	// TermForcing is the work of the deterministic Forcing hooks.
	TermForcing
	// TermSource is the energy injected by the stochastic Sources.
	TermSource
	// NumTerms is the number of budget terms.
	NumTerms
)

var termNames = [NumTerms]string{
	"advection", "shear", "drag", "hyperviscosity", "filter", "sponge",
	"relaxation", "block_forcing", "forcing", "source",
}

func (t Term) String() string {
	if t < 0 || t >= NumTerms {
		return fmt.Sprintf("Term(%d)", int(t))
	}
	return termNames[t]
}

// Ledger holds the energy each budget term has added since it was last
// reset, m² s⁻². The sum over the terms equals the change of total energy
// up to the time-discretisation error of the scheme.
type Ledger [NumTerms]float64

// Sum returns the total over all terms.
func (l *Ledger) Sum() float64 {
	var s float64
	for _, v := range l {
		s += v
	}
	return s
}

// Energy returns the kinetic and available potential energy per unit mass,
// domain mean, of spectral streamfunctions psi (m² s⁻²):
// KE = ½ Σ_n (H_n/H)⟨|∇ψ_n|²⟩, APE = ½ (H1/H) F1 ⟨(ψ1 − ψ2)²⟩.
func Energy(g *Grid, ph Physics, psi [2][]complex128) (ke, ape float64) {
	for p, k2 := range g.k2 {
		w := g.weight[p]
		if w == 0 {
			continue
		}
		a, b := psi[0][p], psi[1][p]
		ke += w * k2 * (ph.W1*dot(a, a) + ph.W2*dot(b, b))
		d := a - b
		ape += w * dot(d, d)
	}
	return ke / 2, ape * ph.W1 * ph.F1 / 2
}

// Enstrophy returns each layer's enstrophy ½⟨q_n²⟩ of spectral PV q, s⁻².
func Enstrophy(g *Grid, q [2][]complex128) (z1, z2 float64) {
	return g.Inner(q[0], q[0]) / 2, g.Inner(q[1], q[1]) / 2
}

// layerInversion returns the coefficients of layer n's inversion,
// ψ̂_n = b1·q̂1 + b2·q̂2, and the layer's mass weight W_n.
func (m *Model) layerInversion(n int) (b1, b2 []float64, wn float64) {
	if n == 1 {
		return m.inv.a21, m.inv.a22, m.ph.W2
	}
	return m.inv.a11, m.inv.a12, m.ph.W1
}

// layerEnergy returns layer n's part of the energy, −½ W_n ⟨ψ_n q_n⟩, of
// the spectral PV q multiplied mode by mode by the factors f (q itself if
// f is nil), with ψ_n inverted inline. If psi is not nil, it also stores
// ψ_n there. It reads both layers of q and writes only psi and layer n's
// row sums, so the two layers may be done concurrently.
func (m *Model) layerEnergy(n int, q [2][]complex128, f []float64, psi []complex128) float64 {
	g := m.g
	nk := g.Nkx
	b1, b2, wn := m.layerInversion(n)
	rows := m.lw[n].rowSum
	for j := range g.Ny {
		var s float64
		for p := j * nk; p < (j+1)*nk; p++ {
			w := g.weight[p]
			if w == 0 && psi == nil {
				continue
			}
			x1, x2 := q[0][p], q[1][p]
			if f != nil && f[p] != 1 {
				x1, x2 = scale(f[p], x1), scale(f[p], x2)
			}
			pn := scale(b1[p], x1) + scale(b2[p], x2)
			if psi != nil {
				psi[p] = pn
			}
			if w != 0 {
				xn := x1
				if n == 1 {
					xn = x2
				}
				s += w * dot(pn, xn)
			}
		}
		rows[j] = s
	}
	return -0.5 * wn * sumRows(rows)
}

// sumRows returns the sum of per-row partial sums, in row order.
func sumRows(rows []float64) float64 {
	var s float64
	for _, r := range rows {
		s += r
	}
	return s
}
