package qg

import (
	"fmt"

	"github.com/eddyblock/eddyblock/internal/check"
)

// BlockMode says how a prescribed block is maintained.
type BlockMode string

// Block modes.
const (
	// Fixed: the block is a steady background; only the eddies evolve,
	// advected by and refracted on it:
	// ∂q′/∂t + J(ψ_B, q′) + J(ψ′, q_B) + J(ψ′, q′) + U∂x q′ + Q_y ∂x ψ′ = …
	Fixed BlockMode = "fixed"
	// Forced: the full flow evolves under a steady forcing that makes the
	// block an exact steady state in the absence of eddies.
	Forced BlockMode = "forced"
	// Relaxed: the full flow evolves with Newtonian relaxation −(q − q_B)/τ_r.
	Relaxed BlockMode = "relaxed"
	// Free: the block is the initial condition and nothing maintains it.
	Free BlockMode = "free"
)

// Block is a prescribed block for SetBlock.
type Block struct {
	// Psi is the block's streamfunction ψ_B in each layer (m² s⁻¹), Ny rows
	// of Nx points.
	Psi  [2][]float64
	Mode BlockMode
	// RelaxTime is τ_r (s) for the relaxed mode.
	RelaxTime float64
	// Linear drops the eddy–eddy term J(ψ′, q′) in the fixed mode, so the
	// eddies evolve linearly on the block.
	Linear bool
}

type blockState struct {
	mode   BlockMode
	linear bool
	tau    float64
	psi, q [2][]complex128 // spectral ψ_B and q_B
	// gridded u_B, v_B, q_B (fixed mode) and q_B (sponge target)
	u, v, qp [2][]float64
	force    [2][]complex128 // steady forcing G (forced mode)
}

// SetBlock prescribes a block and sets the state: to zero eddies in the
// fixed mode, to q_B otherwise. The block is band-limited to the modes the
// cutoff filter leaves untouched, so that the scale-selective dissipation
// does not act on it; this is exact in practice for blocks resolved by
// several grid lengths. In the forced mode the steady forcing
// G = −(tendency of the model at q = q_B) is computed here from the block's
// own advection, the imposed flow and background PV gradients, drag and
// hyperviscosity; Forcings and Sources (a wave source) are not balanced.
func (m *Model) SetBlock(b Block) error {
	switch b.Mode {
	case Fixed, Forced, Free:
	case Relaxed:
		if err := check.Positive("block.relax_time", b.RelaxTime); err != nil {
			return err
		}
	default:
		return &FieldError{Field: "block.mode", Value: string(b.Mode), Why: `must be "fixed", "forced", "relaxed" or "free"`}
	}
	ns, np := len(m.g.k2), m.g.Nx*m.g.Ny
	bs := &blockState{mode: b.Mode, linear: b.Linear, tau: b.RelaxTime}
	for n := range 2 {
		if err := m.checkPhys(b.Psi[n], fmt.Sprintf("block streamfunction of layer %d", n+1)); err != nil {
			return err
		}
		bs.psi[n] = make([]complex128, ns)
		bs.q[n] = make([]complex128, ns)
		m.plan.Forward(bs.psi[n], b.Psi[n])
		for p := range ns {
			keep := m.g.keep[p]
			if m.filter != nil && m.filter[p] != 1 {
				keep = 0
			}
			bs.psi[n][p] = scale(keep, bs.psi[n][p])
		}
	}
	bs.psi[0][0], bs.psi[1][0] = 0, 0
	m.inv.PV(bs.q, bs.psi)
	for n := range 2 {
		bs.qp[n] = make([]float64, np)
		m.plan.Inverse(bs.qp[n], bs.q[n])
		if b.Mode == Fixed {
			bs.u[n], bs.v[n] = make([]float64, np), make([]float64, np)
			m.velocity(&m.lw[0], bs.u[n], bs.v[n], bs.psi[n])
		}
	}
	m.blk = bs
	if b.Mode == Fixed {
		for n := range 2 {
			clear(m.q[n])
			clear(m.psi[n])
		}
	} else {
		for n := range 2 {
			copy(m.q[n], bs.q[n])
			copy(m.psi[n], bs.psi[n])
		}
	}
	m.nhist = 0
	if b.Mode == Forced {
		// The forcing is the negative of the model's own tendency at q_B.
		// The user's Forcings (a wave source) are left out: G balances only
		// the block's own advection, the background terms and dissipation.
		var rates [NumTerms]float64
		m.tendency(m.dq, m.q, m.psiS, m.t, false, false, &rates, nil) // bs.force is still nil
		bs.force = [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		for n := range 2 {
			for p := range ns {
				bs.force[n][p] = scale(-m.g.keep[p], m.dq[n][p])
			}
		}
	}
	return nil
}

// BlockStreamfunction returns the block's spectral streamfunction ψ_B as
// prescribed (band-limited), or false when no block is set.
func (m *Model) BlockStreamfunction() ([2][]complex128, bool) {
	if m.blk == nil {
		return [2][]complex128{}, false
	}
	return m.blk.psi, true
}

// BlockPV returns the block's spectral PV q_B, or false when no block is set.
func (m *Model) BlockPV() ([2][]complex128, bool) {
	if m.blk == nil {
		return [2][]complex128{}, false
	}
	return m.blk.q, true
}

// BlockMode returns the block mode, or "" when no block is set.
func (m *Model) BlockMode() BlockMode {
	if m.blk == nil {
		return ""
	}
	return m.blk.mode
}

// velocity sets gridded u = −∂yψ and v = ∂xψ from a spectral ψ on the
// retained modes, with the buffers and plan of lw. Only the retained modes
// of the velocity spectra are written (the others stay zero) and the plan
// reads only the retained columns.
func (m *Model) velocity(lw *layerWork, u, v []float64, psi []complex128) {
	m.g.velocityKept(lw.du, lw.dv, psi)
	lw.plan.Inverse(u, lw.du)
	lw.plan.Inverse(v, lw.dv)
}
