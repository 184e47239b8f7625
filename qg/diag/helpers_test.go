package diag

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// Shared helpers of the tests. Names carry the prefix tst.

// tstConfig returns an inviscid configuration on an nx × ny grid of a
// 8000 km × 8000 km domain (Ld = 700 km, equal layers, RK4, one worker).
func tstConfig(nx, ny int) qg.Config {
	return qg.Config{
		Nx: nx, Ny: ny, Lx: 8e6, Ly: 8e6,
		F0: 1e-4, Beta: 1.6e-11, Ld: 7e5, Delta: 1,
		ScaleSelective: qg.ScaleSelective{Kind: qg.NoScaleSelective},
		Dt:             1800, Scheme: qg.RK4, MaxCFL: 1.5, Workers: 1,
	}
}

func tstModel(t testing.TB, cfg qg.Config) *qg.Model {
	t.Helper()
	m, err := qg.NewModel(cfg)
	if err != nil {
		t.Fatalf("NewModel: %v", err)
	}
	return m
}

func tstNew(t testing.TB, m *qg.Model, opt Options) *Accumulator {
	t.Helper()
	a, err := New(m, opt)
	if err != nil {
		t.Fatalf("New: %v", err)
	}
	return a
}

// tstField returns f(x, y) on the grid of cfg (x, y in m).
func tstField(cfg qg.Config, f func(x, y float64) float64) []float64 {
	out := make([]float64, cfg.Nx*cfg.Ny)
	dx, dy := cfg.Lx/float64(cfg.Nx), cfg.Ly/float64(cfg.Ny)
	for j := range cfg.Ny {
		for i := range cfg.Nx {
			out[j*cfg.Nx+i] = f(float64(i)*dx, float64(j)*dy)
		}
	}
	return out
}

// tstDipole returns a Gaussian dipole (a high north of a low) of amplitude
// amp (m² s⁻¹), radius r and separation d centred at (x0, y0), with periodic
// distances.
func tstDipole(cfg qg.Config, amp, r, d, x0, y0 float64) []float64 {
	return tstField(cfg, func(x, y float64) float64 {
		dx := qg.PeriodicDistance(x, x0, cfg.Lx)
		yn := qg.PeriodicDistance(y, y0+d/2, cfg.Ly)
		ys := qg.PeriodicDistance(y, y0-d/2, cfg.Ly)
		return amp * (math.Exp(-(dx*dx+yn*yn)/(r*r)) - math.Exp(-(dx*dx+ys*ys)/(r*r)))
	})
}

// tstRandomPsi returns a random band-limited streamfunction pair, spectral,
// with components of amplitude amp on the modes with |i|, |j| ≤ kmax.
func tstRandomPsi(g *qg.Grid, rng *rand.Rand, amp float64, kmax int) [2][]complex128 {
	var s [2][]complex128
	for n := range 2 {
		s[n] = make([]complex128, g.Len())
		for p := range s[n] {
			i, j := p%g.Nkx, p/g.Nkx
			jj := j
			if j > g.Ny/2 {
				jj = g.Ny - j
			}
			if i > kmax || jj > kmax || p == 0 || i == 0 {
				continue // i = 0 left out: its Hermitian symmetry is not imposed here
			}
			s[n][p] = complex(rng.NormFloat64(), rng.NormFloat64()) * complex(amp*float64(g.Nx*g.Ny), 0)
		}
	}
	return s
}

// tstSetPsi sets the model's state from spectral ψ via gridded fields.
func tstSetPsi(t testing.TB, m *qg.Model, plan *fft.Plan2D, psi [2][]complex128) {
	t.Helper()
	var f [2][]float64
	for n := range 2 {
		f[n] = make([]float64, plan.Nx()*plan.Ny())
		plan.Inverse(f[n], psi[n])
	}
	if err := m.SetStreamfunction(f); err != nil {
		t.Fatal(err)
	}
}

// tstMaxAbs returns max |x|.
func tstMaxAbs(x []float64) float64 {
	var m float64
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	return m
}

func tstGet(t testing.TB, f Fields, name string) []float64 {
	t.Helper()
	x, ok := f.Get(name)
	if !ok {
		t.Fatalf("field %q missing; have %v", name, f.Names())
	}
	return x.Data
}

// setClock sets the model's time, as a restart from a checkpoint would, so
// that a test can sample prescribed states at chosen times.
func setClock(tb testing.TB, m *qg.Model, t float64) {
	tb.Helper()
	c := m.Checkpoint()
	c.Time = t
	if err := m.Restore(c); err != nil {
		tb.Fatal(err)
	}
}
