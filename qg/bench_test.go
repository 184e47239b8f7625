package qg

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// benchModel returns a model at n×n on a 4-Ld-resolving domain, filled with
// a random, band-limited state (so the step does the work of a real run).
func benchModel(tb testing.TB, n, workers int, scheme Scheme) *Model {
	c := DefaultConfig()
	c.Nx, c.Ny = n, n
	c.Lx, c.Ly = 2e4*float64(n), 2e4*float64(n) // dx = 20 km
	c.Dt = 300
	c.Scheme = scheme
	c.Workers = workers
	c.Sponge = Sponge{Rate: 1 / 86400.0, Width: c.Lx / 8, X: c.Lx / 16}
	m, err := NewModel(c)
	if err != nil {
		tb.Fatal(err)
	}
	if err := m.SetSpectralPV(randomPV(m.Grid(), 1e-6, rand.New(rand.NewPCG(7, uint64(n))))); err != nil {
		tb.Fatal(err)
	}
	return m
}

// randomPV returns a random spectral PV with rms amplitude about amp (s⁻¹)
// on the large scales (a red spectrum over the retained modes).
func randomPV(g *Grid, amp float64, r *rand.Rand) [2][]complex128 {
	var q [2][]complex128
	scale := amp * float64(g.Nx*g.Ny) / 8
	k0 := 2 * 3.14159 / (g.Lx / 8)
	for n := range 2 {
		q[n] = make([]complex128, len(g.k2))
		for p, k2 := range g.k2 {
			if g.keep[p] == 0 || k2 == 0 {
				continue
			}
			a := scale / (1 + k2/(k0*k0))
			q[n][p] = complex(a*r.NormFloat64(), a*r.NormFloat64())
		}
		// the i = 0 column of a real field is Hermitian in l
		for j := 1; j < g.Ny/2; j++ {
			q[n][(g.Ny-j)*g.Nkx] = complex(real(q[n][j*g.Nkx]), -imag(q[n][j*g.Nkx]))
		}
		q[n][0] = 0
	}
	return q
}

// BenchmarkStep times one time step of the full model (tendency with the
// flux-form advection, filter, sponge) for each scheme, size and worker count.
func BenchmarkStep(b *testing.B) {
	for _, scheme := range []Scheme{RK4, AB3} {
		for _, n := range []int{128, 256, 512} {
			for _, w := range []int{1, 2} {
				b.Run(fmt.Sprintf("%s/n=%d/workers=%d", scheme, n, w), func(b *testing.B) {
					m := benchModel(b, n, w, scheme)
					for range 3 { // get AB3 past its RK4 start
						if err := m.Step(); err != nil {
							b.Fatal(err)
						}
					}
					b.ReportAllocs()
					b.ResetTimer()
					for b.Loop() {
						if err := m.Step(); err != nil {
							b.Fatal(err)
						}
					}
				})
			}
		}
	}
}
