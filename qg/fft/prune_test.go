package fft

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// keptColumns returns imax+1 for the 2/3 rule: the zonal indices i with 3i < nx are kept (Orszag's
// two-thirds dealiasing rule, common practice).
func keptColumns(nx int) int { return (nx-1)/3 + 1 }

// zeroColumnsFrom returns a copy of the ny×(nx/2+1) spectrum c with the columns i >= ncols set to zero.
func zeroColumnsFrom(c []complex128, w, ncols int) []complex128 {
	out := append([]complex128(nil), c...)
	for k := range out {
		if k%w >= ncols {
			out[k] = 0
		}
	}
	return out
}

// pruneCases are the column counts tested for a grid nx wide, in an order that both lowers and raises
// the count on one plan (the plan keeps state between calls that SetColumns must reset).
func pruneCases(nx int) []int {
	w := nx/2 + 1
	return []int{w, keptColumns(nx), 1, nx / 2, keptColumns(nx), w, nx / 2, 1}
}

// TestSetColumnsMatchesZeroedFull: a pruned Inverse equals the full Inverse of the same spectrum with the
// columns i >= ncols zeroed, and a pruned Forward equals the full Forward with those columns then set to
// zero, value for value. The pruned Inverse gets NaN in the pruned columns, which must not be read; the
// pruned Forward's output starts as NaN, which must all be overwritten. The pruned Inverse of a
// Hermitian spectrum is also checked against gonum's 1-D transforms (reference library).
func TestSetColumnsMatchesZeroedFull(t *testing.T) {
	for _, sz := range [][2]int{{4, 4}, {8, 4}, {4, 16}, {16, 16}, {32, 8}, {8, 64}, {64, 64}, {128, 32}, {256, 256}, {16, 256}} {
		nx, ny := sz[0], sz[1]
		w := nx/2 + 1
		for _, workers := range []int{1, 3} {
			full := mustPlan(t, nx, ny, workers)
			pr := mustPlan(t, nx, ny, workers)
			f := randomField(nx, ny, 21)
			spec := gonumForward(randomField(nx, ny, 22), nx, ny) // Hermitian in columns 0 and nx/2
			for _, nc := range pruneCases(nx) {
				name := fmt.Sprintf("%dx%d workers=%d ncols=%d", nx, ny, workers, nc)
				if err := pr.SetColumns(nc); err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				if got := pr.Columns(); got != nc {
					t.Fatalf("%s: Columns() = %d", name, got)
				}

				// Inverse.
				zeroed := zeroColumnsFrom(spec, w, nc)
				in := append([]complex128(nil), spec...)
				for k := range in {
					if k%w >= nc {
						in[k] = complex(math.NaN(), math.NaN())
					}
				}
				want := make([]float64, nx*ny)
				full.Inverse(want, zeroed)
				got := make([]float64, nx*ny)
				pr.Inverse(got, in)
				for k := range got {
					if got[k] != want[k] {
						t.Fatalf("%s: Inverse differs from the full one at %d: %v vs %v", name, k, got[k], want[k])
					}
				}
				if e := relErrReal(got, gonumInverse(zeroed, nx, ny)); e > 1e-12 {
					t.Errorf("%s: Inverse relative error against gonum %g > 1e-12", name, e)
				}

				// Forward.
				cw := make([]complex128, ny*w)
				full.Forward(cw, f)
				cw = zeroColumnsFrom(cw, w, nc)
				cg := make([]complex128, ny*w)
				for k := range cg {
					cg[k] = complex(math.NaN(), math.NaN())
				}
				pr.Forward(cg, f)
				for k := range cg {
					if cg[k] != cw[k] {
						t.Fatalf("%s: Forward differs from the zeroed full one at j=%d i=%d: %v vs %v", name, k/w, k%w, cg[k], cw[k])
					}
				}
			}
		}
	}
}

// TestSetColumnsWorkersBitIdentical: pruned results must not depend on the number of goroutines
// (package qg: results do not depend on the number of workers).
func TestSetColumnsWorkersBitIdentical(t *testing.T) {
	for _, sz := range [][2]int{{8, 32}, {64, 8}, {128, 64}, {256, 256}} {
		nx, ny := sz[0], sz[1]
		w := nx/2 + 1
		f := randomField(nx, ny, 23)
		for _, nc := range []int{1, keptColumns(nx), nx / 2} {
			var c1 []complex128
			var g1 []float64
			for _, workers := range []int{1, 2, 3, 4, 7} {
				p := mustPlan(t, nx, ny, workers)
				if err := p.SetColumns(nc); err != nil {
					t.Fatal(err)
				}
				c := make([]complex128, ny*w)
				g := make([]float64, nx*ny)
				p.Forward(c, f)
				p.Inverse(g, c)
				if workers == 1 {
					c1, g1 = c, g
					continue
				}
				for k := range c {
					if c[k] != c1[k] {
						t.Fatalf("%dx%d ncols=%d workers=%d: Forward differs at %d", nx, ny, nc, workers, k)
					}
				}
				for k := range g {
					if g[k] != g1[k] {
						t.Fatalf("%dx%d ncols=%d workers=%d: Inverse differs at %d", nx, ny, nc, workers, k)
					}
				}
			}
		}
	}
}

// TestSetColumnsRoundTrip: for a field whose spectrum has only zonal wavenumbers i < ncols, the pruned
// Forward and Inverse still invert each other (definition of the DFT pair).
func TestSetColumnsRoundTrip(t *testing.T) {
	nx, ny := 64, 32
	w := nx/2 + 1
	nc := keptColumns(nx)
	full := mustPlan(t, nx, ny, 1)
	c := make([]complex128, ny*w)
	full.Forward(c, randomField(nx, ny, 24))
	f := make([]float64, nx*ny)
	full.Inverse(f, zeroColumnsFrom(c, w, nc)) // a field with i < nc only
	p := mustPlan(t, nx, ny, 2)
	if err := p.SetColumns(nc); err != nil {
		t.Fatal(err)
	}
	g := make([]float64, nx*ny)
	p.Forward(c, f)
	p.Inverse(g, c)
	if e := relErrReal(g, f); e > 1e-14 {
		t.Errorf("pruned round trip relative error %g > 1e-14", e)
	}
}

func TestSetColumnsNoAllocations(t *testing.T) {
	nx, ny := 64, 64
	for _, workers := range []int{1, 2} {
		p := mustPlan(t, nx, ny, workers)
		if err := p.SetColumns(keptColumns(nx)); err != nil {
			t.Fatal(err)
		}
		f := randomField(nx, ny, 25)
		c := make([]complex128, ny*(nx/2+1))
		if n := testing.AllocsPerRun(10, func() { p.Forward(c, f); p.Inverse(f, c) }); n != 0 {
			t.Errorf("workers=%d: %v allocations per pruned Forward+Inverse, want 0", workers, n)
		}
	}
}

func TestSetColumnsBad(t *testing.T) {
	p := mustPlan(t, 16, 8, 1)
	if err := p.SetColumns(5); err != nil {
		t.Fatal(err)
	}
	for _, nc := range []int{0, -3, 10, 100} {
		err := p.SetColumns(nc)
		if err == nil {
			t.Errorf("SetColumns(%d): no error", nc)
			continue
		}
		if want := fmt.Sprintf("ncols = %d", nc); !strings.Contains(err.Error(), want) {
			t.Errorf("SetColumns(%d): error %q does not name %q", nc, err, want)
		}
		if got := p.Columns(); got != 5 {
			t.Errorf("SetColumns(%d) failed but changed Columns() to %d", nc, got)
		}
	}
}
