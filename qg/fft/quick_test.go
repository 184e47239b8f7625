package fft

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

func TestQuickDFT(t *testing.T) {
	for _, sz := range [][2]int{{4, 8}, {8, 4}, {16, 16}} {
		nx, ny := sz[0], sz[1]
		r := rand.New(rand.NewPCG(1, 2))
		f := make([]float64, nx*ny)
		for k := range f {
			f[k] = r.NormFloat64()
		}
		p, err := NewPlan2D(nx, ny, 1)
		if err != nil {
			t.Fatal(err)
		}
		w := nx/2 + 1
		c := make([]complex128, ny*w)
		p.Forward(c, f)
		var maxe float64
		for j := 0; j < ny; j++ {
			for i := 0; i < w; i++ {
				var s complex128
				for y := 0; y < ny; y++ {
					for x := 0; x < nx; x++ {
						s += complex(f[y*nx+x], 0) * cmplx.Exp(complex(0, -2*math.Pi*(float64(i*x)/float64(nx)+float64(j*y)/float64(ny))))
					}
				}
				maxe = math.Max(maxe, cmplx.Abs(s-c[j*w+i]))
			}
		}
		g := make([]float64, nx*ny)
		p.Inverse(g, c)
		for k := range g {
			maxe = math.Max(maxe, math.Abs(g[k]-f[k]))
		}
		if maxe > 1e-10 {
			t.Errorf("%dx%d: err %g", nx, ny, maxe)
		}
	}
}
