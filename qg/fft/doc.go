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
// A Plan2D holds the twiddle factors and its scratch buffers, so Forward and Inverse do not allocate.
// A plan is not safe for concurrent use (give each goroutine its own); the slices passed to Forward and
// Inverse must have the documented lengths (they panic otherwise). Results are bit-identical for any
// number of workers: every coefficient is computed by the same sequence of floating-point operations
// whichever goroutine computes it.
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
// The one-dimensional transforms are Stockham autosort FFTs (no bit reversal) built from radix-8 and
// radix-4 stages, with twiddles precomputed in the plan. They are batched: a chunk of 16 rows (or 16
// columns) is transformed together, stored with the batch index fastest in a worker-private buffer
// that stays in cache, so the innermost loop runs over contiguous memory with the butterfly's twiddles
// held in registers. The first zonal stage reads the field directly, the post-processing is fused with
// the last zonal stage (the pre-processing with the first inverse one), the last inverse zonal stage
// writes the field, and the first and last meridional stages read and write whole columns of the
// spectrum directly. Strides of the work arrays are padded off powers of two to avoid cache set
// conflicts.
//
// With workers > 1 each transform runs in phases (rows, columns, and for Forward the last meridional
// stage by blocks of rows); a phase is a list of chunks that the caller and workers−1 persistent helper
// goroutines take from a shared counter. The helpers poll for about a millisecond after each phase and
// then sleep; they end when the plan is garbage collected. Chunks of columns are cut at whole cache
// lines, so no two workers write the same line.
//
// # Column pruning
//
// A model that keeps only the zonal wavenumbers i < ncols (the 2/3 rule keeps i with 3i < nx) calls
// Plan2D.SetColumns(ncols): Inverse then treats the columns i ≥ ncols as zero without reading them, and
// Forward writes zeros there, so the meridional pass transforms only the first ncols columns (the
// columns 0 and nx/2 are still paired when nx/2 is kept). The zonal pass is unchanged: every zonal
// coefficient kept depends on all the others through the real-to-complex post-processing. Results are
// the same, value for value, as those of the full transform with the pruned columns zeroed. With the
// 2/3 rule this saves a third of the meridional pass: on one worker, Forward and Inverse at 256² and
// 512² ran 1.12–1.28 times as fast (mostly 1.14–1.17; BenchmarkColumnsInterleaved, loaded machine).
// The FFTW backend accepts SetColumns but does the full transform and zeroes the columns.
//
// # Performance
//
// Measured with go test -bench on a shared 2-core AMD EPYC (Zen 5) virtual machine, Go 1.26,
// GOAMD64=v1 (no FMA); FFTW 3.3.10 on the same machine does a real 2-D transform in 0.023 ms (128²),
// 0.10 ms (256²) and 0.50 ms (512²).
//
//	size   Forward, 1 worker   Inverse, 1 worker   ratio to FFTW
//	128²   0.061–0.067 ms      0.063 ms            2.7–2.9
//	256²   0.28–0.30 ms        0.29 ms             2.8–3.0
//	512²   1.39–1.63 ms        1.44–1.52 ms        2.8–3.3
//
// gonum's dsp/fourier used plainly (real FFT per row, complex FFT per gathered column) takes 1.45 ms at
// 256², five times as long. With 2 workers the speed-up on that machine depended on the moment: in
// good periods 1.7–2.1 (Forward 256² in 0.15 ms, Inverse 256² in 0.16 ms, 512² in 0.72/0.81 ms), in
// others none or a slow-down, because a two-dimensional transform must move half of its data between
// the cores between the row and the column pass, and moving cache lines between the two virtual
// cores was as slow there as doing the work (a pure exchange test ran at 0.4× on two cores, against
// 1.95× for compute-bound and 1.8× for private-memory tasks). Where several fields are transformed at a
// time, one single-worker plan per goroutine avoids that exchange.
package fft
