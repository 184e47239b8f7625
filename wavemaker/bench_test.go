package wavemaker

import (
	"fmt"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// BenchmarkIncrement measures one step of the noise (the normal deviates,
// the mask, one forward transform and the band) at 128² and 256², for white
// and red noise, on one worker.
func BenchmarkIncrement(b *testing.B) {
	for _, n := range []int{128, 256} {
		for _, kind := range []Kind{White, Red} {
			b.Run(fmt.Sprintf("%s/%d", kind, n), func(b *testing.B) {
				qc := qg.DefaultConfig()
				qc.Nx, qc.Ny, qc.Lx, qc.Ly = n, n, 16e6, 16e6
				m := newModel(b, qc)
				wc := DefaultConfig()
				wc.Kind = kind
				s := newNoise(b, wc, m)
				dq := pair(m.Grid().Len())
				b.ResetTimer()
				for i := 0; b.Loop(); i++ {
					s.Increment(dq, float64(i)*qc.Dt, qc.Dt)
				}
			})
		}
	}
}

// BenchmarkTrain measures one stage evaluation of the wave train at 256².
func BenchmarkTrain(b *testing.B) {
	qc := qg.DefaultConfig()
	qc.Nx, qc.Ny, qc.Lx, qc.Ly = 256, 256, 16e6, 16e6
	m := newModel(b, qc)
	wc := DefaultConfig()
	wc.Kind = WaveTrain
	tr, err := NewTrain(wc, m)
	if err != nil {
		b.Fatal(err)
	}
	dq := pair(m.Grid().Len())
	for i := 0; b.Loop(); i++ {
		tr.AddTendency(dq, float64(i)*60)
	}
}

// BenchmarkModelStep is the model's RK4 step at 128² and 256² without a
// wavemaker, for comparison with BenchmarkIncrement.
func BenchmarkModelStep(b *testing.B) {
	for _, n := range []int{128, 256} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			qc := qg.DefaultConfig()
			qc.Nx, qc.Ny, qc.Lx, qc.Ly = n, n, 16e6, 16e6
			qc.Dt = 600
			m := newModel(b, qc)
			for b.Loop() {
				if err := m.Step(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
