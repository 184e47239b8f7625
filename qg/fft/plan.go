package fft

import (
	"fmt"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Plan2D transforms an ny×nx real field stored row-major (x fastest, index y*nx+x) to and from
// ny×(nx/2+1) complex coefficients stored row-major (kx fastest, index j*(nx/2+1)+i), where
// i = 0..nx/2 is the zonal wavenumber index and j = 0..ny-1 the meridional one (j > ny/2 are negative).
//
// A Plan2D is not safe for concurrent use: it owns its scratch buffers.
type Plan2D struct {
	nx, ny, workers int
	rows            *fourier.FFT
	cols            *fourier.CmplxFFT
	col             []complex128
	row             []float64
}

// NewPlan2D makes a plan for nx, ny powers of two, each >= 4.
// workers >= 1 is the number of goroutines a transform may use.
func NewPlan2D(nx, ny, workers int) (*Plan2D, error) {
	if err := checkSize("nx", nx); err != nil {
		return nil, err
	}
	if err := checkSize("ny", ny); err != nil {
		return nil, err
	}
	if workers < 1 {
		return nil, fmt.Errorf("fft: workers = %d, want >= 1", workers)
	}
	return &Plan2D{
		nx: nx, ny: ny, workers: workers,
		rows: fourier.NewFFT(nx),
		cols: fourier.NewCmplxFFT(ny),
		col:  make([]complex128, ny),
		row:  make([]float64, nx),
	}, nil
}

func checkSize(name string, n int) error {
	if n < 4 || n&(n-1) != 0 {
		return fmt.Errorf("fft: %s = %d is not a power of two >= 4", name, n)
	}
	return nil
}

// Nx returns the number of grid points along x.
func (p *Plan2D) Nx() int { return p.nx }

// Ny returns the number of grid points along y.
func (p *Plan2D) Ny() int { return p.ny }

// Workers returns the number of goroutines a transform may use.
func (p *Plan2D) Workers() int { return p.workers }

// Forward computes the unnormalised forward transform of src into dst.
func (p *Plan2D) Forward(dst []complex128, src []float64) {
	nx, ny, w := p.nx, p.ny, p.nx/2+1
	if len(src) != nx*ny || len(dst) != ny*w {
		panic("fft: bad slice length")
	}
	for y := 0; y < ny; y++ {
		p.rows.Coefficients(dst[y*w:(y+1)*w], src[y*nx:(y+1)*nx])
	}
	for i := 0; i < w; i++ {
		for j := 0; j < ny; j++ {
			p.col[j] = dst[j*w+i]
		}
		p.cols.Coefficients(p.col, p.col)
		for j := 0; j < ny; j++ {
			dst[j*w+i] = p.col[j]
		}
	}
}

// Inverse computes the normalised inverse transform of src into dst.
func (p *Plan2D) Inverse(dst []float64, src []complex128) {
	nx, ny, w := p.nx, p.ny, p.nx/2+1
	if len(dst) != nx*ny || len(src) != ny*w {
		panic("fft: bad slice length")
	}
	tmp := make([]complex128, ny*w)
	for i := 0; i < w; i++ {
		for j := 0; j < ny; j++ {
			p.col[j] = src[j*w+i]
		}
		p.cols.Sequence(p.col, p.col)
		for j := 0; j < ny; j++ {
			tmp[j*w+i] = complex(real(p.col[j]), 0)
			if i != 0 && i != nx/2 {
				tmp[j*w+i] = p.col[j]
			}
		}
	}
	s := 1 / float64(nx*ny)
	for y := 0; y < ny; y++ {
		p.rows.Sequence(dst[y*nx:(y+1)*nx], tmp[y*w:(y+1)*w])
		for x := y * nx; x < (y+1)*nx; x++ {
			dst[x] *= s
		}
	}
}
