//go:build fftw && cgo

package fft

/*
#cgo LDFLAGS: -lfftw3 -lm
#include <fftw3.h>
*/
import "C"

import (
	"fmt"
	"runtime"
	"sync"
	"unsafe"
)

// This file is the FFTW backend (build tag fftw, cgo, Debian's libfftw3-dev): the same API with the
// transforms done by FFTW 3's two-dimensional real plans. FFTW runs single-threaded here, whatever the
// number of workers, so the results are trivially the same for any workers; run independent plans in
// separate goroutines to use several cores.

// planner serialises FFTW's planner, which is not thread-safe.
var planner sync.Mutex

// Plan2D transforms an ny×nx real field stored row-major (x fastest, index y*nx+x) to and from
// ny×(nx/2+1) complex coefficients stored row-major (kx fastest, index j*(nx/2+1)+i), where
// i = 0..nx/2 is the zonal wavenumber index and j = 0..ny-1 the meridional one (j > ny/2 are negative).
//
// This is the FFTW backend. A Plan2D owns its buffers and is not safe for concurrent use; Forward and
// Inverse panic if a slice has the wrong length.
type Plan2D struct {
	nx, ny, workers int
	h, w            int
	nc              int // zonal wavenumbers covered (SetColumns)
	fftw            *fftwPlans
	re              []float64    // view of the FFTW real buffer, ny·nx
	co              []complex128 // view of the FFTW complex buffer, ny·(nx/2+1)
}

type fftwPlans struct {
	fwd, inv C.fftw_plan
	re       *C.double
	co       *C.fftw_complex
}

// NewPlan2D makes a plan for nx, ny powers of two, each >= 4. workers >= 1 is accepted for the API's
// sake; the FFTW backend computes on one thread.
func NewPlan2D(nx, ny, workers int) (*Plan2D, error) {
	if err := checkArgs(nx, ny, workers); err != nil {
		return nil, err
	}
	h := nx / 2
	w := h + 1
	f := &fftwPlans{
		re: (*C.double)(C.fftw_malloc(C.size_t(8 * nx * ny))),
		co: (*C.fftw_complex)(C.fftw_malloc(C.size_t(16 * ny * w))),
	}
	if f.re == nil || f.co == nil {
		return nil, fmt.Errorf("fft: fftw_malloc failed for %d×%d", nx, ny)
	}
	flags := C.uint(C.FFTW_MEASURE)
	if nx*ny > 1<<20 {
		flags = C.FFTW_ESTIMATE
	}
	planner.Lock()
	f.fwd = C.fftw_plan_dft_r2c_2d(C.int(ny), C.int(nx), f.re, f.co, flags)
	f.inv = C.fftw_plan_dft_c2r_2d(C.int(ny), C.int(nx), f.co, f.re, flags)
	planner.Unlock()
	if f.fwd == nil || f.inv == nil {
		return nil, fmt.Errorf("fft: FFTW could not plan a %d×%d transform", nx, ny)
	}
	p := &Plan2D{
		nx: nx, ny: ny, workers: workers, h: h, w: w, nc: w, fftw: f,
		re: unsafe.Slice((*float64)(unsafe.Pointer(f.re)), nx*ny),
		co: unsafe.Slice((*complex128)(unsafe.Pointer(f.co)), ny*w),
	}
	runtime.AddCleanup(p, func(f *fftwPlans) {
		planner.Lock()
		C.fftw_destroy_plan(f.fwd)
		C.fftw_destroy_plan(f.inv)
		planner.Unlock()
		C.fftw_free(unsafe.Pointer(f.re))
		C.fftw_free(unsafe.Pointer(f.co))
	}, f)
	return p, nil
}

// Nx returns the number of grid points along x.
func (p *Plan2D) Nx() int { return p.nx }

// Ny returns the number of grid points along y.
func (p *Plan2D) Ny() int { return p.ny }

// Close does nothing: the FFTW backend starts no goroutines. It is here so that code using either backend
// releases a plan the same way.
func (p *Plan2D) Close() {}

// Workers returns the number of workers the plan was made for.
func (p *Plan2D) Workers() int { return p.workers }

// SetColumns restricts the transforms to the zonal wavenumbers i < ncols (1 ≤ ncols ≤ nx/2+1; ncols =
// nx/2+1 restores the full transform): Inverse treats the coefficients of columns i ≥ ncols as zero (it
// does not read them), and Forward computes only the columns i < ncols and writes zeros in the others.
// The FFTW backend still does the full transform (it zeroes the columns); results are those of the full
// transform with the columns i ≥ ncols zeroed. It returns an error if ncols is out of range.
func (p *Plan2D) SetColumns(ncols int) error {
	if err := checkColumns(ncols, p.nx); err != nil {
		return err
	}
	p.nc = ncols
	return nil
}

// Columns returns the number of zonal wavenumbers the transforms cover (see SetColumns).
func (p *Plan2D) Columns() int { return p.nc }

// Forward computes dst[j*(nx/2+1)+i] = Σ_y Σ_x src[y*nx+x]·exp(−2πi(i·x/nx + j·y/ny)) (unnormalised).
// src is not modified. It panics unless len(src) = nx·ny and len(dst) = ny·(nx/2+1).
func (p *Plan2D) Forward(dst []complex128, src []float64) {
	if len(src) != p.nx*p.ny {
		panic(fmt.Sprintf("fft: Forward: len(src) = %d, want nx·ny = %d", len(src), p.nx*p.ny))
	}
	if len(dst) != p.ny*p.w {
		panic(fmt.Sprintf("fft: Forward: len(dst) = %d, want ny·(nx/2+1) = %d", len(dst), p.ny*p.w))
	}
	f := p.fftw
	in, out := (*C.double)(unsafe.Pointer(&src[0])), (*C.fftw_complex)(unsafe.Pointer(&dst[0]))
	if C.fftw_alignment_of(in) == C.fftw_alignment_of(f.re) && C.fftw_alignment_of((*C.double)(unsafe.Pointer(out))) == C.fftw_alignment_of((*C.double)(unsafe.Pointer(f.co))) {
		// FFTW may run the plan on other arrays of the same alignment; an out-of-place
		// real-to-complex transform leaves its input intact.
		C.fftw_execute_dft_r2c(f.fwd, in, out)
	} else {
		copy(p.re, src)
		C.fftw_execute(f.fwd)
		copy(dst, p.co)
	}
	if p.nc < p.w {
		for j := 0; j < p.ny; j++ {
			clear(dst[j*p.w+p.nc : j*p.w+p.w])
		}
	}
	runtime.KeepAlive(p)
}

// Inverse computes dst[y*nx+x] = (1/(nx·ny)) Σ_j Σ_i c[j][i]·exp(2πi(i·x/nx + j·y/ny)) over the full
// Hermitian spectrum, so Inverse(Forward(f)) = f; src is not modified. As in the pure-Go backend the
// result is the real part of that sum: the i = 0 and i = nx/2 columns are replaced by their Hermitian
// parts (c[j] + conj c[−j])/2 before FFTW's complex-to-real transform, which assumes Hermitian input.
// It panics unless len(src) = ny·(nx/2+1) and len(dst) = nx·ny.
func (p *Plan2D) Inverse(dst []float64, src []complex128) {
	if len(src) != p.ny*p.w {
		panic(fmt.Sprintf("fft: Inverse: len(src) = %d, want ny·(nx/2+1) = %d", len(src), p.ny*p.w))
	}
	if len(dst) != p.nx*p.ny {
		panic(fmt.Sprintf("fft: Inverse: len(dst) = %d, want nx·ny = %d", len(dst), p.nx*p.ny))
	}
	// The normalisation is applied to the coefficients, on their way into FFTW's buffer.
	sc := 1 / float64(p.nx*p.ny)
	co := p.co[:len(src)]
	for j := 0; j < p.ny; j++ {
		row, in := co[j*p.w:j*p.w+p.w], src[j*p.w:j*p.w+p.nc]
		for i, v := range in {
			row[i] = complex(sc*real(v), sc*imag(v))
		}
		clear(row[p.nc:])
	}
	for _, i := range [2]int{0, p.h} {
		for j := 0; j <= p.ny/2; j++ {
			m := (p.ny - j) % p.ny
			a, b := co[j*p.w+i], co[m*p.w+i]
			re, im := 0.5*(real(a)+real(b)), 0.5*(imag(a)-imag(b))
			co[j*p.w+i], co[m*p.w+i] = complex(re, im), complex(re, -im)
		}
	}
	f := p.fftw
	out := (*C.double)(unsafe.Pointer(&dst[0]))
	if C.fftw_alignment_of(out) == C.fftw_alignment_of(f.re) {
		C.fftw_execute_dft_c2r(f.inv, f.co, out) // complex-to-real destroys its input: our copy
	} else {
		C.fftw_execute(f.inv)
		copy(dst, p.re)
	}
	runtime.KeepAlive(p)
}
