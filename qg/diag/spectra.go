package diag

import (
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

// Spectra are isotropic energy spectra: energy per unit total wavenumber
// (m³ s⁻²) in shells of width DK = 2π/min(Lx, Ly) centred on K (shell b holds
// the modes with (b − ½)DK ≤ |k| < (b + ½)DK). Summed times DK over the
// shells,
//
//	Σ (W1·KE[0] + W2·KE[1] + APE)·DK = total energy,
//	Barotropic + BaroclinicKE = W1·KE[0] + W2·KE[1],
//
// with W_n = H_n/H.
type Spectra struct {
	K  []float64 `json:"k"`  // shell centres, rad m⁻¹
	DK float64   `json:"dk"` // shell width, rad m⁻¹
	// KE is each layer's kinetic energy ½|∇ψ_n|² (not weighted by H_n/H).
	KE [2][]float64 `json:"ke"`
	// Barotropic is the kinetic energy ½|∇ψ_bt|² of the barotropic mode
	// ψ_bt = W1ψ1 + W2ψ2; BaroclinicKE is ½W1W2|∇(ψ1 − ψ2)|², the kinetic
	// energy of the baroclinic mode, and APE ½W1F1(ψ1 − ψ2)² its available
	// potential energy.
	Barotropic   []float64 `json:"barotropic"`
	BaroclinicKE []float64 `json:"baroclinic_ke"`
	APE          []float64 `json:"ape"`
}

// SpectraOf returns the spectra of the spectral streamfunctions psi (in the
// layout of g), for instance the model's current state.
func SpectraOf(g *qg.Grid, ph qg.Physics, psi [2][]complex128) Spectra {
	return spectra(g, ph, func(p int) (a11, a22, a12 float64) {
		x1, x2 := psi[0][p], psi[1][p]
		return dotc(x1, x1), dotc(x2, x2), dotc(x1, x2)
	})
}

// Spectra returns the time-mean spectra of the eddies over the averaging
// window (departures from the time mean; in the fixed mode the model's
// state, unless Options.Transient).
func (a *Accumulator) Spectra() Spectra {
	w := 0.0
	if a.n > 0 {
		w = 1 / float64(a.n)
	}
	return spectra(a.g, a.ph, func(p int) (a11, a22, a12 float64) {
		a11, a22, a12 = a.s11[p]*w, a.s22[p]*w, a.s12[p]*w
		if a.raw {
			x1, x2 := a.sMean[0][p], a.sMean[1][p]
			a11 += dotc(x1, x1)
			a22 += dotc(x2, x2)
			a12 += dotc(x1, x2)
		}
		return
	})
}

// spectra bins the per-mode second moments ⟨|ψ̂1|²⟩, ⟨|ψ̂2|²⟩, Re⟨ψ̂1 ψ̂2*⟩.
func spectra(g *qg.Grid, ph qg.Physics, mom func(p int) (a11, a22, a12 float64)) Spectra {
	dk := 2 * math.Pi / math.Min(g.Lx, g.Ly)
	var kmax float64
	for p := range g.Len() {
		k2 := g.K2(p)
		if g.Keep(p) != 0 {
			kmax = math.Max(kmax, math.Sqrt(k2))
		}
	}
	nb := int(math.Floor(kmax/dk+0.5)) + 1
	s := Spectra{K: make([]float64, nb), DK: dk, Barotropic: make([]float64, nb),
		BaroclinicKE: make([]float64, nb), APE: make([]float64, nb)}
	s.KE[0], s.KE[1] = make([]float64, nb), make([]float64, nb)
	for b := range s.K {
		s.K[b] = float64(b) * dk
	}
	w1, w2 := ph.W1, ph.W2
	for p := range g.Len() {
		wt := g.Weight(p)
		if wt == 0 || g.K2(p) == 0 {
			continue
		}
		k2 := g.K2(p)
		b := int(math.Floor(math.Sqrt(k2)/dk + 0.5))
		a11, a22, a12 := mom(p)
		tt := a11 + a22 - 2*a12                   // |ψ̂1 − ψ̂2|²
		bt := w1*w1*a11 + w2*w2*a22 + 2*w1*w2*a12 // |W1ψ̂1 + W2ψ̂2|²
		c := wt / 2 / dk
		s.KE[0][b] += c * k2 * a11
		s.KE[1][b] += c * k2 * a22
		s.Barotropic[b] += c * k2 * bt
		s.BaroclinicKE[b] += c * k2 * w1 * w2 * tt
		s.APE[b] += c * w1 * ph.F1 * tt
	}
	return s
}
