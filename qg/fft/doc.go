// Package fft provides the two-dimensional real Fourier transform of the quasi-geostrophic solver: a
// pure-Go (WebAssembly-safe) transform of doubly periodic fields whose sides are powers of two.
//
// # Conventions
//
// A real field f on an nx×ny grid is stored row-major with x fastest: f[y*nx+x]. Its spectrum is kept
// as the half plane of non-negative zonal wavenumbers, ny×(nx/2+1) complex coefficients stored row-major
// with the zonal index fastest: c[j*(nx/2+1)+i], i = 0..nx/2 the zonal wavenumber and j = 0..ny−1 the
// meridional one, j > ny/2 standing for the negative wavenumber j−ny. The coefficients with i > nx/2
// follow from Hermitian symmetry, c(−i, −j) = conj c(i, j).
//
// Forward is unnormalised and Inverse carries the factor 1/(nx·ny):
//
//	Forward:  c[j][i] = Σ_y Σ_x f[y][x]·exp(−2πi(i·x/nx + j·y/ny))
//	Inverse:  f[y][x] = (1/(nx·ny)) Σ_j Σ_i c[j][i]·exp(+2πi(i·x/nx + j·y/ny))  (full Hermitian spectrum)
//
// so Inverse(Forward(f)) = f to rounding. Inverse returns the real part of its sum: the imaginary
// parts that a real field cannot have (those of the self-conjugate entries of the i = 0 and i = nx/2
// columns) are ignored, which is the same as replacing those two columns by their Hermitian parts
// (c[j] + conj c[−j])/2. Neither transform modifies its source.
//
// A Plan2D holds the twiddle factors and its scratch buffers, so Forward and Inverse do not allocate
// (apart from the goroutines of a plan with more than one worker). A plan is not safe for concurrent
// use; the slices passed to Forward and Inverse must have the documented lengths (they panic otherwise).
// Results are bit-identical for any number of workers: every coefficient is computed by the same
// sequence of floating-point operations whichever goroutine computes it.
//
// # Algorithm
//
// Forward: each row of nx reals is read as nx/2 complex numbers z[m] = f[2m] + i·f[2m+1] and
// transformed with a complex FFT of length nx/2; the standard post-processing
// X[k] = (Z[k] + conj Z[nx/2−k])/2 + exp(−2πik/nx)·(Z[k] − conj Z[nx/2−k])/(2i) gives the nx/2+1
// coefficients of the real row. The columns are then transformed with complex FFTs of length ny; the
// columns i = 0 and i = nx/2 are real after the zonal pass and are transformed together as one complex
// column. Inverse runs the same steps backwards.
//
// All one-dimensional transforms are radix-4 Stockham autosort FFTs (one radix-2 pass when the length is
// an odd power of two) with twiddles precomputed in the plan. They are batched: a block of 16 rows (or
// 16 columns) is transformed together, stored with the batch index fastest in a worker-private buffer
// that stays in cache, so the innermost loop runs over contiguous memory with the twiddles of the
// butterfly held in registers. The first zonal stage reads the field directly and the last inverse
// zonal stage writes it; the first and last meridional stages read and write the spectrum's columns
// directly. With several workers the rows, then the columns, are split between goroutines; each
// transform has one synchronisation point between the zonal and the meridional pass.
//
// # Performance
//
// Measured on a 2-core AMD EPYC virtual machine (Go 1.26, GOAMD64=v1), single worker, minimum over
// repeated runs; FFTW 3.3.10 on the same machine does a real 2-D transform in 0.023 ms (128²),
// 0.10 ms (256²) and 0.50 ms (512²), gonum's dsp/fourier used plainly in about 1.5–1.8 ms (256²):
// see the benchmarks BenchmarkForward, BenchmarkInverse and BenchmarkGonumPlain and the README.
package fft
