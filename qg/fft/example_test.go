package fft_test

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/qg/fft"
)

// The wave cos(2π(3x/nx + y/ny)) on a 16×8 grid has the two coefficients nx·ny/2 at (i, j) = (3, 1) and
// (−3, −1); the half spectrum stores only the first, the second being its complex conjugate.
func Example() {
	const nx, ny = 16, 8
	p, err := fft.NewPlan2D(nx, ny, 2)
	if err != nil {
		fmt.Println(err)
		return
	}
	defer p.Close() // stops the plan's helper goroutine
	f := make([]float64, nx*ny)
	for y := 0; y < ny; y++ {
		for x := 0; x < nx; x++ {
			f[y*nx+x] = math.Cos(2 * math.Pi * (3*float64(x)/nx + float64(y)/ny))
		}
	}
	c := make([]complex128, ny*(nx/2+1))
	p.Forward(c, f)
	w := nx/2 + 1
	for j := 0; j < ny; j++ {
		for i := 0; i < w; i++ {
			if v := c[j*w+i]; math.Hypot(real(v), imag(v)) > 1e-9 {
				fmt.Printf("c[j=%d][i=%d] = %.3f, |imag| < 1e-9: %v\n", j, i, real(v), math.Abs(imag(v)) < 1e-9)
			}
		}
	}
	g := make([]float64, nx*ny)
	p.Inverse(g, c)
	var maxErr float64
	for k := range f {
		maxErr = math.Max(maxErr, math.Abs(g[k]-f[k]))
	}
	fmt.Println("round trip exact to 1e-14:", maxErr < 1e-14)

	_, err = fft.NewPlan2D(48, 8, 1)
	fmt.Println(err)
	// Output:
	// c[j=1][i=3] = 64.000, |imag| < 1e-9: true
	// round trip exact to 1e-14: true
	// fft: nx = 48 is not a power of two between 4 and 65536
}

// With the spectrum truncated by the 2/3 rule (zonal indices i with 3i < nx, here i ≤ 5 of 0..8), the
// transforms can skip the columns i > 5: Forward writes zeros there, and Inverse does not read them.
func ExamplePlan2D_SetColumns() {
	const nx, ny = 16, 8
	p, err := fft.NewPlan2D(nx, ny, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := p.SetColumns((nx-1)/3 + 1); err != nil {
		fmt.Println(err)
		return
	}
	f := make([]float64, nx*ny)
	for y := 0; y < ny; y++ {
		for x := 0; x < nx; x++ {
			f[y*nx+x] = math.Cos(2*math.Pi*3*float64(x)/nx) + math.Cos(2*math.Pi*7*float64(x)/nx)
		}
	}
	c := make([]complex128, ny*(nx/2+1))
	p.Forward(c, f)
	w := nx/2 + 1
	for k, v := range c {
		if math.Hypot(real(v), imag(v)) > 1e-9 {
			fmt.Printf("c[j=%d][i=%d] = %.3f\n", k/w, k%w, real(v))
		}
	}
	p.Inverse(f, c)
	var maxErr float64
	for y := 0; y < ny; y++ {
		for x := 0; x < nx; x++ {
			maxErr = math.Max(maxErr, math.Abs(f[y*nx+x]-math.Cos(2*math.Pi*3*float64(x)/nx)))
		}
	}
	fmt.Println("only the wave i = 3 is left, to 1e-14:", maxErr < 1e-14)
	fmt.Println(p.SetColumns(10))
	// Output:
	// c[j=0][i=3] = 64.000
	// only the wave i = 3 is left, to 1e-14: true
	// fft: SetColumns: ncols = 10, want 1 <= ncols <= nx/2+1 = 9
}
