package diag

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// benchSetup returns an n × n model with a fixed block and random eddies,
// and an Accumulator on it.
func benchSetup(b *testing.B, n int, opt Options) (*qg.Model, *Accumulator) {
	cfg := tstConfig(n, n)
	cfg.Dt = 600
	m := tstModel(b, cfg)
	dip := tstDipole(cfg, 2e7, 7e5, 1e6, 4e6, 4e6)
	if err := m.SetBlock(qg.Block{Psi: [2][]float64{dip, dip}, Mode: qg.Forced}); err != nil {
		b.Fatal(err)
	}
	plan, err := fft.NewPlan2D(n, n, 1)
	if err != nil {
		b.Fatal(err)
	}
	tstSetPsi(b, m, plan, tstRandomPsi(m.Grid(), rand.New(rand.NewPCG(1, 1)), 2, n/3))
	return m, tstNew(b, m, opt)
}

// BenchmarkSample measures one Sample (after the spin-up) at 128² and 256².
func BenchmarkSample(b *testing.B) {
	for _, n := range []int{128, 256} {
		b.Run(fmt.Sprintf("%d", n), func(b *testing.B) {
			m, a := benchSetup(b, n, Options{})
			t := 0.0
			b.ResetTimer()
			for range b.N {
				t += 1800
				b.StopTimer()
				setClock(b, m, t)
				b.StartTimer()
				if err := a.Sample(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkSummaryFields measures Summary and Fields at 128².
func BenchmarkSummaryFields(b *testing.B) {
	m, a := benchSetup(b, 128, Options{})
	for i := range 10 {
		b.StopTimer()
		setClock(b, m, float64(i+1)*1800)
		b.StartTimer()
		if err := a.Sample(); err != nil {
			b.Fatal(err)
		}
	}
	b.Run("Summary", func(b *testing.B) {
		for range b.N {
			_ = a.Summary()
		}
	})
	b.Run("Fields", func(b *testing.B) {
		for range b.N {
			_ = a.Fields()
		}
	})
}

// BenchmarkStep is the model's RK4 step at 128², for scale.
func BenchmarkStep128(b *testing.B) {
	m, _ := benchSetup(b, 128, Options{})
	b.ResetTimer()
	for range b.N {
		if err := m.Step(); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkEddyForcing measures the live convergence and height tendency at
// 128².
func BenchmarkEddyForcing(b *testing.B) {
	m, a := benchSetup(b, 128, Options{})
	for i := range 10 {
		b.StopTimer()
		setClock(b, m, float64(i+1)*1800)
		b.StartTimer()
		if err := a.Sample(); err != nil {
			b.Fatal(err)
		}
	}
	np := 128 * 128
	conv := [2][]float64{make([]float64, np), make([]float64, np)}
	zt := [2][]float64{make([]float64, np), make([]float64, np)}
	b.ResetTimer()
	for range b.N {
		if err := a.EddyForcing(conv, zt); err != nil {
			b.Fatal(err)
		}
	}
}
