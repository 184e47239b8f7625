package fft

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

var sizes = [][2]int{ // {nx, ny}
	{4, 4}, {4, 8}, {8, 4}, {8, 8}, {16, 64}, {64, 16}, {32, 8}, {8, 128}, {128, 128}, {256, 256}, {512, 64}, {64, 512},
}

func randomField(nx, ny int, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 7))
	f := make([]float64, nx*ny)
	for k := range f {
		f[k] = r.NormFloat64()
	}
	return f
}

// mustPlan makes a plan that is closed when the test ends (so that the
// helper goroutines of one test do not linger into the next's goroutine
// counts).
func mustPlan(t testing.TB, nx, ny, workers int) *Plan2D {
	t.Helper()
	p, err := NewPlan2D(nx, ny, workers)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(p.Close)
	return p
}

// relErr returns max|got−want| / max|want|.
func relErr(got, want []complex128) float64 {
	var e, m float64
	for k := range want {
		e = math.Max(e, cmplx.Abs(got[k]-want[k]))
		m = math.Max(m, cmplx.Abs(want[k]))
	}
	return e / m
}

func relErrReal(got, want []float64) float64 {
	var e, m float64
	for k := range want {
		e = math.Max(e, math.Abs(got[k]-want[k]))
		m = math.Max(m, math.Abs(want[k]))
	}
	return e / m
}

// gonumForward builds the 2-D half spectrum from gonum's 1-D transforms (reference library
// gonum.org/v1/gonum/dsp/fourier): real FFT of each row, then complex FFT of each column.
func gonumForward(f []float64, nx, ny int) []complex128 {
	w := nx/2 + 1
	out := make([]complex128, ny*w)
	rows := fourier.NewFFT(nx)
	for y := 0; y < ny; y++ {
		rows.Coefficients(out[y*w:(y+1)*w], f[y*nx:(y+1)*nx])
	}
	cols := fourier.NewCmplxFFT(ny)
	col := make([]complex128, ny)
	for i := 0; i < w; i++ {
		for j := range col {
			col[j] = out[j*w+i]
		}
		cols.Coefficients(col, col)
		for j := range col {
			out[j*w+i] = col[j]
		}
	}
	return out
}

// gonumInverse is the normalised inverse built from gonum's 1-D transforms (complex inverse of each
// column, real inverse of each row, divided by nx·ny).
func gonumInverse(c []complex128, nx, ny int) []float64 {
	w := nx/2 + 1
	tmp := make([]complex128, ny*w)
	cols := fourier.NewCmplxFFT(ny)
	col := make([]complex128, ny)
	for i := 0; i < w; i++ {
		for j := range col {
			col[j] = c[j*w+i]
		}
		cols.Sequence(col, col)
		for j := range col {
			tmp[j*w+i] = col[j]
		}
	}
	out := make([]float64, nx*ny)
	rows := fourier.NewFFT(nx)
	for y := 0; y < ny; y++ {
		rows.Sequence(out[y*nx:(y+1)*nx], tmp[y*w:(y+1)*w])
	}
	for k := range out {
		out[k] /= float64(nx * ny)
	}
	return out
}

// directForward is the defining double sum of the 2-D DFT, O(N²), with the phase reduced modulo the
// period in integers so the exponentials are accurate (textbook definition of the DFT).
func directForward(f []float64, nx, ny int) []complex128 {
	w := nx/2 + 1
	out := make([]complex128, ny*w)
	for j := 0; j < ny; j++ {
		for i := 0; i < w; i++ {
			var s complex128
			for y := 0; y < ny; y++ {
				for x := 0; x < nx; x++ {
					// phase = 2π (i·x/nx + j·y/ny) = 2π·((i·x·ny + j·y·nx) mod (nx·ny))/(nx·ny)
					ph := (i*x*ny + j*y*nx) % (nx * ny)
					sin, cos := math.Sincos(-2 * math.Pi * float64(ph) / float64(nx*ny))
					s += complex(f[y*nx+x]*cos, f[y*nx+x]*sin)
				}
			}
			out[j*w+i] = s
		}
	}
	return out
}

// directInverse is Re of the normalised inverse double sum over the full spectrum, the columns
// 0 < i < nx/2 extended by Hermitian symmetry c[j][nx−i] = conj(c[−j][i]) (textbook definition).
func directInverse(c []complex128, nx, ny int) []float64 {
	w := nx/2 + 1
	coef := func(j, i int) complex128 {
		if i < w {
			return c[j*w+i]
		}
		return cmplx.Conj(c[((ny-j)%ny)*w+nx-i])
	}
	out := make([]float64, nx*ny)
	for y := 0; y < ny; y++ {
		for x := 0; x < nx; x++ {
			var s complex128
			for j := 0; j < ny; j++ {
				for i := 0; i < nx; i++ {
					ph := (i*x*ny + j*y*nx) % (nx * ny)
					sin, cos := math.Sincos(2 * math.Pi * float64(ph) / float64(nx*ny))
					s += coef(j, i) * complex(cos, sin)
				}
			}
			out[y*nx+x] = real(s) / float64(nx*ny)
		}
	}
	return out
}

func TestForwardAgainstGonum(t *testing.T) {
	for _, sz := range sizes {
		nx, ny := sz[0], sz[1]
		t.Run(fmt.Sprintf("%dx%d", nx, ny), func(t *testing.T) {
			f := randomField(nx, ny, 1)
			p := mustPlan(t, nx, ny, 1)
			got := make([]complex128, ny*(nx/2+1))
			p.Forward(got, f)
			if e := relErr(got, gonumForward(f, nx, ny)); e > 1e-12 {
				t.Errorf("relative error against gonum %g > 1e-12", e)
			}
		})
	}
}

func TestInverseAgainstGonum(t *testing.T) {
	for _, sz := range sizes {
		nx, ny := sz[0], sz[1]
		t.Run(fmt.Sprintf("%dx%d", nx, ny), func(t *testing.T) {
			c := gonumForward(randomField(nx, ny, 2), nx, ny)
			p := mustPlan(t, nx, ny, 1)
			got := make([]float64, nx*ny)
			p.Inverse(got, c)
			if e := relErrReal(got, gonumInverse(c, nx, ny)); e > 1e-12 {
				t.Errorf("relative error against gonum %g > 1e-12", e)
			}
		})
	}
}

func TestAgainstDirectDFT(t *testing.T) {
	for _, sz := range [][2]int{{4, 4}, {4, 8}, {8, 4}, {8, 16}, {16, 8}, {32, 16}} {
		nx, ny := sz[0], sz[1]
		t.Run(fmt.Sprintf("%dx%d", nx, ny), func(t *testing.T) {
			f := randomField(nx, ny, 3)
			p := mustPlan(t, nx, ny, 1)
			c := make([]complex128, ny*(nx/2+1))
			p.Forward(c, f)
			if e := relErr(c, directForward(f, nx, ny)); e > 1e-12 {
				t.Errorf("Forward: relative error against direct DFT %g > 1e-12", e)
			}
			// A random spectrum, not Hermitian in its i = 0 and i = nx/2 columns: Inverse must give
			// the real part of the full Hermitian sum.
			r := rand.New(rand.NewPCG(4, 5))
			for k := range c {
				c[k] = complex(r.NormFloat64(), r.NormFloat64())
			}
			g := make([]float64, nx*ny)
			p.Inverse(g, c)
			if e := relErrReal(g, directInverse(c, nx, ny)); e > 1e-12 {
				t.Errorf("Inverse: relative error against direct DFT %g > 1e-12", e)
			}
		})
	}
}

// TestSelfConjugateColumns checks the documented handling of the i = 0 and i = nx/2 columns: the inverse
// of a spectrum equals the inverse of the spectrum with those columns replaced by their Hermitian parts
// (Hermitian symmetry of the DFT of real data, common practice).
func TestSelfConjugateColumns(t *testing.T) {
	nx, ny := 16, 8
	w := nx/2 + 1
	p := mustPlan(t, nx, ny, 1)
	r := rand.New(rand.NewPCG(6, 7))
	c := make([]complex128, ny*w)
	for k := range c {
		c[k] = complex(r.NormFloat64(), r.NormFloat64())
	}
	herm := append([]complex128(nil), c...)
	for _, i := range []int{0, nx / 2} {
		for j := 0; j < ny; j++ {
			herm[j*w+i] = (c[j*w+i] + cmplx.Conj(c[((ny-j)%ny)*w+i])) / 2
		}
	}
	if imag(herm[0]) != 0 {
		t.Fatalf("Hermitian part of c[0][0] has imaginary part %g", imag(herm[0]))
	}
	g1 := make([]float64, nx*ny)
	g2 := make([]float64, nx*ny)
	p.Inverse(g1, c)
	p.Inverse(g2, herm)
	if e := relErrReal(g1, g2); e > 1e-14 {
		t.Errorf("inverse of spectrum and of its Hermitian projection differ: %g", e)
	}
	if e := relErrReal(g2, gonumInverse(herm, nx, ny)); e > 1e-12 {
		t.Errorf("against gonum: %g", e)
	}
}

func TestRoundTrip(t *testing.T) {
	for _, sz := range sizes {
		nx, ny := sz[0], sz[1]
		t.Run(fmt.Sprintf("%dx%d", nx, ny), func(t *testing.T) {
			f := randomField(nx, ny, 8)
			p := mustPlan(t, nx, ny, 2)
			c := make([]complex128, ny*(nx/2+1))
			g := make([]float64, nx*ny)
			p.Forward(c, f)
			p.Inverse(g, c)
			if e := relErrReal(g, f); e > 1e-13 {
				t.Errorf("Inverse(Forward(f)) differs from f by %g > 1e-13", e)
			}
		})
	}
}

// TestLinearity: F(αf + βg) = αF(f) + βF(g) (linearity of the DFT, common practice).
func TestLinearity(t *testing.T) {
	nx, ny := 32, 16
	w := nx/2 + 1
	p := mustPlan(t, nx, ny, 1)
	f, g := randomField(nx, ny, 9), randomField(nx, ny, 10)
	const alpha, beta = 1.7, -0.3
	h := make([]float64, nx*ny)
	for k := range h {
		h[k] = alpha*f[k] + beta*g[k]
	}
	cf, cg, ch := make([]complex128, ny*w), make([]complex128, ny*w), make([]complex128, ny*w)
	p.Forward(cf, f)
	p.Forward(cg, g)
	p.Forward(ch, h)
	want := make([]complex128, ny*w)
	for k := range want {
		want[k] = complex(alpha, 0)*cf[k] + complex(beta, 0)*cg[k]
	}
	if e := relErr(ch, want); e > 1e-13 {
		t.Errorf("Forward not linear: %g", e)
	}
	hi := make([]float64, nx*ny)
	p.Inverse(hi, want)
	if e := relErrReal(hi, h); e > 1e-13 {
		t.Errorf("Inverse not linear: %g", e)
	}
}

// TestParseval: Σ f² = (1/(nx·ny)) Σ over the full spectrum |c|², the half spectrum counting the columns
// 0 < i < nx/2 twice (Parseval's theorem for the DFT).
func TestParseval(t *testing.T) {
	for _, sz := range [][2]int{{8, 4}, {64, 16}, {128, 128}} {
		nx, ny := sz[0], sz[1]
		w := nx/2 + 1
		f := randomField(nx, ny, 11)
		p := mustPlan(t, nx, ny, 1)
		c := make([]complex128, ny*w)
		p.Forward(c, f)
		var ef, ec float64
		for _, v := range f {
			ef += v * v
		}
		for j := 0; j < ny; j++ {
			for i := 0; i < w; i++ {
				m := 2.0
				if i == 0 || i == nx/2 {
					m = 1
				}
				v := c[j*w+i]
				ec += m * (real(v)*real(v) + imag(v)*imag(v))
			}
		}
		ec /= float64(nx * ny)
		if math.Abs(ec-ef) > 1e-12*ef {
			t.Errorf("%dx%d: Parseval: Σf² = %.15g, spectrum sum = %.15g", nx, ny, ef, ec)
		}
	}
}

func TestSourceUnmodified(t *testing.T) {
	nx, ny := 32, 64
	w := nx/2 + 1
	p := mustPlan(t, nx, ny, 2)
	f := randomField(nx, ny, 12)
	f0 := append([]float64(nil), f...)
	c := make([]complex128, ny*w)
	p.Forward(c, f)
	for k := range f {
		if f[k] != f0[k] {
			t.Fatalf("Forward modified src[%d]", k)
		}
	}
	c0 := append([]complex128(nil), c...)
	g := make([]float64, nx*ny)
	p.Inverse(g, c)
	for k := range c {
		if c[k] != c0[k] {
			t.Fatalf("Inverse modified src[%d]", k)
		}
	}
}

// TestWorkersBitIdentical: results must not depend on the number of goroutines (package qg: results do not depend on the number of workers).
func TestWorkersBitIdentical(t *testing.T) {
	for _, sz := range [][2]int{{4, 4}, {8, 32}, {64, 8}, {128, 64}, {256, 256}} {
		nx, ny := sz[0], sz[1]
		w := nx/2 + 1
		f := randomField(nx, ny, 13)
		var c1 []complex128
		var g1 []float64
		for _, workers := range []int{1, 2, 3, 4, 7} {
			p := mustPlan(t, nx, ny, workers)
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
					t.Fatalf("%dx%d workers=%d: Forward differs at %d: %v vs %v", nx, ny, workers, k, c[k], c1[k])
				}
			}
			for k := range g {
				if g[k] != g1[k] {
					t.Fatalf("%dx%d workers=%d: Inverse differs at %d", nx, ny, workers, k)
				}
			}
		}
	}
}

// TestPlanReuse: a plan gives the same answer when used repeatedly (no state leaks between calls).
func TestPlanReuse(t *testing.T) {
	nx, ny := 64, 32
	w := nx/2 + 1
	p := mustPlan(t, nx, ny, 2)
	f, g := randomField(nx, ny, 14), randomField(nx, ny, 15)
	c1, c2 := make([]complex128, ny*w), make([]complex128, ny*w)
	p.Forward(c1, f)
	p.Forward(c2, g)
	p.Forward(c2, f)
	for k := range c1 {
		if c1[k] != c2[k] {
			t.Fatalf("second Forward differs at %d", k)
		}
	}
}

func TestBadSizes(t *testing.T) {
	for _, tc := range []struct {
		nx, ny, workers int
		want            string
	}{
		{0, 8, 1, "nx = 0"},
		{2, 8, 1, "nx = 2"},
		{12, 8, 1, "nx = 12"},
		{-4, 8, 1, "nx = -4"},
		{8, 3, 1, "ny = 3"},
		{8, 96, 1, "ny = 96"},
		{8, 8, 0, "workers = 0"},
		{8, 8, 1000, "workers = 1000"},
		{4, 1 << 20, 2, "ny = 1048576"}, // once accepted, then Forward never returned
		{1 << 14, 1 << 14, 1, "points"},
	} {
		_, err := NewPlan2D(tc.nx, tc.ny, tc.workers)
		if err == nil {
			t.Errorf("NewPlan2D(%d, %d, %d): no error", tc.nx, tc.ny, tc.workers)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("NewPlan2D(%d, %d, %d): error %q does not name %q", tc.nx, tc.ny, tc.workers, err, tc.want)
		}
	}
}

func TestBadLengthsPanic(t *testing.T) {
	p := mustPlan(t, 8, 4, 1)
	for name, call := range map[string]func(){
		"Forward src": func() { p.Forward(make([]complex128, 20), make([]float64, 31)) },
		"Forward dst": func() { p.Forward(make([]complex128, 19), make([]float64, 32)) },
		"Inverse src": func() { p.Inverse(make([]float64, 32), make([]complex128, 21)) },
		"Inverse dst": func() { p.Inverse(make([]float64, 33), make([]complex128, 20)) },
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: wrong length did not panic", name)
				}
			}()
			call()
		}()
	}
}

func TestNoAllocations(t *testing.T) {
	nx, ny := 64, 64
	for _, workers := range []int{1, 2} {
		p := mustPlan(t, nx, ny, workers)
		f := randomField(nx, ny, 16)
		c := make([]complex128, ny*(nx/2+1))
		if n := testing.AllocsPerRun(10, func() { p.Forward(c, f); p.Inverse(f, c) }); n != 0 {
			t.Errorf("workers=%d: %v allocations per Forward+Inverse, want 0", workers, n)
		}
	}
}

// TestBatchAgainstGonum checks the one-dimensional batched kernels (radix 2, 4 and 8 stages, both stage
// plans) for every length 2..1024 against gonum's complex FFT (reference library), forward and inverse
// (gonum's Sequence is the unnormalised inverse), with input and output row strides wider than the batch.
func TestBatchAgainstGonum(t *testing.T) {
	r := rand.New(rand.NewPCG(20, 21))
	for n := 2; n <= 1024; n *= 2 {
		for _, only4 := range []bool{false, true} {
			b := newBatch(n, only4)
			const l, bi, bo, ld = 5, 7, 9, 6
			in := make([]complex128, n*bi)
			for k := range in {
				in[k] = complex(r.NormFloat64(), r.NormFloat64())
			}
			ref := fourier.NewCmplxFFT(n)
			for _, inverse := range []bool{false, true} {
				out := make([]complex128, n*bo)
				b.run(out, in, make([]complex128, n*ld), make([]complex128, n*ld), bi, bo, ld, l, inverse)
				for q := 0; q < l; q++ {
					seq := make([]complex128, n)
					for t := range seq {
						seq[t] = in[q+bi*t]
					}
					var want []complex128
					if inverse {
						want = ref.Sequence(nil, seq)
					} else {
						want = ref.Coefficients(nil, seq)
					}
					got := make([]complex128, n)
					for t := range got {
						got[t] = out[q+bo*t]
					}
					if e := relErr(got, want); e > 1e-13 {
						t.Errorf("n=%d only4=%v inverse=%v sequence %d: relative error %g", n, only4, inverse, q, e)
					}
				}
			}
		}
	}
}

// TestRadicesLast4 checks the stage plans of the zonal transforms: the radices multiply to n and the
// last one is 4 whenever n >= 4, n != 8 (so the post-processing can be fused with it).
func TestRadicesLast4(t *testing.T) {
	for n := 2; n <= 1<<14; n *= 2 {
		rs := radicesLast4(n)
		prod := 1
		for _, r := range rs {
			prod *= r
		}
		if prod != n || (n >= 4 && n != 8 && rs[len(rs)-1] != 4) {
			t.Errorf("n=%d: radices %v", n, rs)
		}
	}
}
