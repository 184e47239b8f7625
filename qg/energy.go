package qg

import (
	"encoding/json"
	"fmt"
)

// Term names a term of the energy budget.
type Term int

// Energy budget terms. Each is booked as the energy it adds to the state
// (negative for a loss), per unit mass, m² s⁻². The names (String) are the
// same in the Ledger's JSON, the run's progress lines, the summaries and
// the output files.
const (
	// TermAdvection ("advection") is the work of the nonlinear advection.
	// It vanishes up to rounding for the full flow; in the fixed-block mode
	// it is the exchange of energy between the eddies and the prescribed
	// block.
	TermAdvection Term = iota
	// TermShear ("shear") is the work of the imposed flow and background PV
	// gradient: the conversion of the mean shear's available potential
	// energy into eddy energy (β alone does no work).
	TermShear
	// TermDrag ("drag") is the Ekman drag on the lower layer.
	TermDrag
	// TermScaleSelective ("scale_selective") is the loss to the
	// scale-selective dissipation: the cutoff filter or the
	// hyperviscosity, whichever the configuration's scale_selective.kind
	// chooses.
	TermScaleSelective
	// TermSponge ("sponge") is the loss to the sponge band.
	TermSponge
	// TermMaintenance ("maintenance") is the work of what maintains the
	// block: the steady forcing of the forced mode or the relaxation of the
	// relaxed mode.
	TermMaintenance
	// TermInjection ("injection") is the energy injected by the external
	// PV forcing: the wave source and any Forcing, GridForcing or Source
	// added to the model.
	TermInjection
	// NumTerms is the number of budget terms.
	NumTerms
)

var termNames = [NumTerms]string{
	"advection", "shear", "drag", "scale_selective", "sponge", "maintenance", "injection",
}

// Terms returns every budget term, in order.
func Terms() []Term {
	t := make([]Term, NumTerms)
	for i := range t {
		t[i] = Term(i)
	}
	return t
}

func (t Term) String() string {
	if t < 0 || t >= NumTerms {
		return fmt.Sprintf("Term(%d)", int(t))
	}
	return termNames[t]
}

// Ledger holds the energy each budget term has added since it was last
// reset, m² s⁻², indexed by Term. The sum over the terms equals the change
// of total energy up to the time-discretisation error of the scheme. It
// encodes to JSON as an object keyed by the terms' names.
type Ledger [NumTerms]float64

// Map returns the ledger keyed by the terms' names.
func (l Ledger) Map() map[string]float64 {
	m := make(map[string]float64, NumTerms)
	for i, v := range l {
		m[Term(i).String()] = v
	}
	return m
}

// MarshalJSON encodes the ledger as an object keyed by the terms' names.
func (l Ledger) MarshalJSON() ([]byte, error) { return json.Marshal(l.Map()) }

// UnmarshalJSON decodes an object written by MarshalJSON; an unknown name
// is an error.
func (l *Ledger) UnmarshalJSON(b []byte) error {
	var m map[string]float64
	if err := json.Unmarshal(b, &m); err != nil {
		return err
	}
	*l = Ledger{}
	for k, v := range m {
		t, ok := TermNamed(k)
		if !ok {
			return fmt.Errorf("qg: ledger: unknown budget term %q", k)
		}
		l[t] = v
	}
	return nil
}

// TermNamed returns the term with the given name.
func TermNamed(name string) (Term, bool) {
	for i, n := range termNames {
		if n == name {
			return Term(i), true
		}
	}
	return 0, false
}

// Sum returns the total over all terms.
func (l *Ledger) Sum() float64 {
	var s float64
	for _, v := range l {
		s += v
	}
	return s
}

// energy returns the kinetic and available potential energy per unit mass,
// domain mean, of spectral streamfunctions psi (m² s⁻²):
// KE = ½ Σ_n (H_n/H)⟨|∇ψ_n|²⟩, APE = ½ (H1/H) F1 ⟨(ψ1 − ψ2)²⟩.
func energy(g *Grid, ph Physics, psi [2][]complex128) (ke, ape float64) {
	k, p := g.EnergyProduct(ph, psi, psi)
	return k / 2, p / 2
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
