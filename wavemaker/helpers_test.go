package wavemaker

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// testModelConfig is a small, calm model: 32 × 32 on an 8000 km square, no
// imposed flow, Laplacian viscosity that damps the longest band wave (2700
// km) at rate 1/dampDays per day, so that the flow reaches a statistical
// steady state within days and the injection rate can be measured over a
// few months of model time.
func testModelConfig(dt, dampDays float64) qg.Config {
	qc := qg.DefaultConfig()
	qc.Nx, qc.Ny, qc.Lx, qc.Ly = 32, 32, 8e6, 8e6
	qc.U1, qc.U2 = 0, 0
	qc.Drag = 0
	k := 2 * math.Pi / 2.7e6
	qc.ScaleSelective = qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 1 / (dampDays * 86400 * k * k), Order: 1}
	qc.Dt = dt
	return qc
}

// testNoiseConfig is white noise in the band 500–2700 km over the whole
// domain, in the upper layer.
func testNoiseConfig() Config {
	c := DefaultConfig()
	c.Kind = White
	c.Mask = MaskConfig{Kind: NoMask}
	c.Band = BandConfig{Kind: TotalBand, MinWavelength: 5e5, MaxWavelength: 2.7e6}
	c.Vertical = Upper
	c.InjectionRate = 1e-5
	c.Seed = 7
	return c
}

func newModel(t testing.TB, qc qg.Config) *qg.Model {
	t.Helper()
	m, err := qg.NewModel(qc)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func newNoise(t testing.TB, c Config, m *qg.Model) *Noise {
	t.Helper()
	s, err := NewNoise(c, m)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func pair(n int) [2][]complex128 {
	return [2][]complex128{make([]complex128, n), make([]complex128, n)}
}

// incrementEnergy returns E(Δq) = E(q + Δq) − E(q) at q = 0, computed with
// the model's inversion and qg.Energy.
func incrementEnergy(m *qg.Model, dq, psi [2][]complex128) float64 {
	m.Inverter().Invert(psi, dq)
	k, p := m.Grid().EnergyProduct(m.Physics(), psi, psi)
	ke, ape := k/2, p/2
	return ke + ape
}

// meanSE returns the mean of xs and its standard error from batch means
// (nb batches), which allows for serial correlation.
func meanSE(xs []float64, nb int) (mean, se float64) {
	per := len(xs) / nb
	bm := make([]float64, nb)
	for b := range nb {
		var w welford
		for _, x := range xs[b*per : (b+1)*per] {
			w.add(x)
		}
		bm[b] = w.mean
	}
	var w welford
	for _, x := range bm {
		w.add(x)
	}
	return w.mean, math.Sqrt(w.variance() / float64(nb))
}

// welford accumulates a mean and variance stably (Welford 1962,
// Technometrics 4).
type welford struct {
	n       float64
	mean, m float64
}

func (w *welford) add(x float64) {
	w.n++
	d := x - w.mean
	w.mean += d / w.n
	w.m += d * (x - w.mean)
}

func (w *welford) variance() float64 { return w.m / (w.n - 1) }

// coMoment accumulates the correlation of pairs (x, y) stably, with
// Welford's update extended to the co-moment.
type coMoment struct {
	n             float64
	mx, my        float64
	cxx, cyy, cxy float64
}

func (c *coMoment) add(x, y float64) {
	c.n++
	dx := x - c.mx
	c.mx += dx / c.n
	dy := y - c.my
	c.my += dy / c.n
	c.cxx += dx * (x - c.mx)
	c.cyy += dy * (y - c.my)
	c.cxy += dx * (y - c.my)
}

func (c *coMoment) corr() float64 { return c.cxy / math.Sqrt(c.cxx*c.cyy) }

// toGrid returns the gridded field of spectral coefficients s.
func toGrid(tb testing.TB, m *qg.Model, s []complex128) []float64 {
	tb.Helper()
	f := make([]float64, m.Grid().Points())
	if err := m.ToGrid(f, s); err != nil {
		tb.Fatal(err)
	}
	return f
}
