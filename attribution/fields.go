package attribution

import (
	"math"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// gridder transforms spectral fields of a grid to the grid, with a
// one-worker plan of its own (so that it needs no model and starts no
// goroutine).
type gridder struct {
	g    *qg.Grid
	plan *fft.Plan2D
}

func newGridder(g *qg.Grid) (*gridder, error) {
	p, err := fft.NewPlan2D(g.Nx, g.Ny, 1)
	if err != nil {
		return nil, err
	}
	return &gridder{g: g, plan: p}, nil
}

// grid returns the gridded field of the spectral s (Ny rows of Nx points).
func (t *gridder) grid(s []complex128) []float64 {
	x := make([]float64, t.g.Points())
	t.plan.Inverse(x, s)
	return x
}

// invert returns the streamfunction of the spectral PV pair q.
func invert(inv *qg.Inverter, q [2][]complex128) [2][]complex128 {
	psi := [2][]complex128{make([]complex128, len(q[0])), make([]complex128, len(q[1]))}
	inv.Invert(psi, q)
	return psi
}

// pair returns a new pair of spectral fields of length n.
func pair(n int) [2][]complex128 {
	return [2][]complex128{make([]complex128, n), make([]complex128, n)}
}

// sub returns a − b.
func sub(a, b [2][]complex128) [2][]complex128 {
	d := pair(len(a[0]))
	for n := range 2 {
		for p := range a[n] {
			d[n][p] = a[n][p] - b[n][p]
		}
	}
	return d
}

// add returns a + b.
func add(a, b [2][]complex128) [2][]complex128 {
	d := pair(len(a[0]))
	for n := range 2 {
		for p := range a[n] {
			d[n][p] = a[n][p] + b[n][p]
		}
	}
	return d
}

// Score compares a response with a reference response.
type Score struct {
	// Correlation is the pattern correlation ⟨a, b⟩/√(⟨a, a⟩⟨b, b⟩) of
	// the two streamfunctions in the mass-weighted inner product
	// Σ_n (H_n/H)⟨a_n b_n⟩ over the domain and both layers, and RMS the
	// mass-weighted RMS difference of their geopotential heights f0ψ/g, m.
	Correlation float64 `json:"pattern_correlation"`
	RMS         float64 `json:"rms_difference_m"`
	// CorrelationPV and RMSPV are the same for the PV (without its domain
	// mean), which weighs the smaller scales more; RMSPV in s⁻¹.
	CorrelationPV float64 `json:"pattern_correlation_pv"`
	RMSPV         float64 `json:"rms_difference_pv"`
}

// Compare scores the response a against the reference ref on grid g with
// physics ph and Coriolis parameter f0.
func Compare(g *qg.Grid, ph qg.Physics, f0 float64, a, ref Response) Score {
	c, r := compare(g, ph, a.Psi, ref.Psi)
	cq, rq := compare(g, ph, noMean(a.Q), noMean(ref.Q))
	return Score{Correlation: c, RMS: f0 / qg.Gravity * r, CorrelationPV: cq, RMSPV: rq}
}

// compare returns the pattern correlation and the RMS difference of a and
// b in the mass-weighted inner product.
func compare(g *qg.Grid, ph qg.Physics, a, b [2][]complex128) (corr, rms float64) {
	ab := g.LayerProduct(ph, a, b)
	aa := g.LayerProduct(ph, a, a)
	bb := g.LayerProduct(ph, b, b)
	d := sub(a, b)
	return ab / math.Sqrt(aa*bb), math.Sqrt(g.LayerProduct(ph, d, d))
}

// noMean returns a copy of q without its domain mean.
func noMean(q [2][]complex128) [2][]complex128 {
	c := clonePair(q)
	c[0][0], c[1][0] = 0, 0
	return c
}

// RMSHeight returns the mass-weighted RMS geopotential height f0ψ/g (m) of
// the spectral streamfunction a.
func RMSHeight(g *qg.Grid, ph qg.Physics, f0 float64, a [2][]complex128) float64 {
	return f0 / qg.Gravity * math.Sqrt(g.LayerProduct(ph, a, a))
}

// rmsPV returns the mass-weighted RMS of the PV q without its domain mean.
func rmsPV(g *qg.Grid, ph qg.Physics, q [2][]complex128) float64 {
	q = noMean(q)
	return math.Sqrt(g.LayerProduct(ph, q, q))
}
