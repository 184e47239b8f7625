package fft

import (
	"fmt"
	"testing"
	"time"

	"gonum.org/v1/gonum/dsp/fourier"
)

func benchPlan(b *testing.B, inverse bool) {
	for _, n := range []int{128, 256, 512} {
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("n=%d/workers=%d", n, workers), func(b *testing.B) {
				p := mustPlan(b, n, n, workers)
				f := randomField(n, n, 1)
				c := make([]complex128, n*(n/2+1))
				p.Forward(c, f)
				b.ResetTimer()
				for b.Loop() {
					if inverse {
						p.Inverse(f, c)
					} else {
						p.Forward(c, f)
					}
				}
			})
		}
	}
}

func BenchmarkForward(b *testing.B) { benchPlan(b, false) }
func BenchmarkInverse(b *testing.B) { benchPlan(b, true) }

// BenchmarkGonumPlain is the baseline: gonum's dsp/fourier used plainly (real FFT per row, complex FFT
// per column through a gather buffer) for a 256² forward transform.
func BenchmarkGonumPlain(b *testing.B) {
	const n = 256
	w := n/2 + 1
	f := randomField(n, n, 1)
	out := make([]complex128, n*w)
	rows := fourier.NewFFT(n)
	cols := fourier.NewCmplxFFT(n)
	col := make([]complex128, n)
	b.Run("n=256/workers=1", func(b *testing.B) {
		for b.Loop() {
			for y := 0; y < n; y++ {
				rows.Coefficients(out[y*w:(y+1)*w], f[y*n:(y+1)*n])
			}
			for i := 0; i < w; i++ {
				for j := range col {
					col[j] = out[j*w+i]
				}
				cols.Coefficients(col, col)
				for j := range col {
					out[j*w+i] = col[j]
				}
			}
		}
	})
}

// benchColumns times the transforms of one worker with all nx/2+1 columns and with the imax+1 columns
// kept by the 2/3 rule (SetColumns).
func benchColumns(b *testing.B, inverse bool) {
	for _, n := range []int{256, 512} {
		for _, nc := range []int{n/2 + 1, keptColumns(n)} {
			b.Run(fmt.Sprintf("n=%d/ncols=%d", n, nc), func(b *testing.B) {
				p := mustPlan(b, n, n, 1)
				if err := p.SetColumns(nc); err != nil {
					b.Fatal(err)
				}
				f := randomField(n, n, 1)
				c := make([]complex128, n*(n/2+1))
				p.Forward(c, f)
				b.ResetTimer()
				for b.Loop() {
					if inverse {
						p.Inverse(f, c)
					} else {
						p.Forward(c, f)
					}
				}
			})
		}
	}
}

func BenchmarkForwardColumns(b *testing.B) { benchColumns(b, false) }
func BenchmarkInverseColumns(b *testing.B) { benchColumns(b, true) }

// BenchmarkColumnsInterleaved alternates the full and the pruned (2/3 rule) transform of one worker in
// each iteration and reports the time of each and their ratio, which a shared machine's load changes
// less than it changes separate runs. ns/op is the time of the pair.
func BenchmarkColumnsInterleaved(b *testing.B) {
	for _, dir := range []string{"Forward", "Inverse"} {
		for _, n := range []int{256, 512} {
			b.Run(fmt.Sprintf("%s/n=%d", dir, n), func(b *testing.B) {
				full, pr := mustPlan(b, n, n, 1), mustPlan(b, n, n, 1)
				if err := pr.SetColumns(keptColumns(n)); err != nil {
					b.Fatal(err)
				}
				f := randomField(n, n, 1)
				c := make([]complex128, n*(n/2+1))
				full.Forward(c, f)
				var tf, tp time.Duration
				b.ResetTimer()
				for b.Loop() {
					for k, p := range [2]*Plan2D{full, pr} {
						t0 := time.Now()
						if dir == "Inverse" {
							p.Inverse(f, c)
						} else {
							p.Forward(c, f)
						}
						if k == 0 {
							tf += time.Since(t0)
						} else {
							tp += time.Since(t0)
						}
					}
				}
				b.ReportMetric(float64(tf.Nanoseconds())/float64(b.N), "full-ns/op")
				b.ReportMetric(float64(tp.Nanoseconds())/float64(b.N), "pruned-ns/op")
				b.ReportMetric(float64(tf)/float64(tp), "speedup")
			})
		}
	}
}
