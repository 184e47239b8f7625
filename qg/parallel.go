package qg

import "sync"

// forRows runs fn over [0, rows) split into at most workers contiguous
// ranges. Each index is handled by exactly one call, so element-wise work
// gives the same bits whatever the number of workers; reductions must be
// made per row and combined in row order by the caller.
func forRows(workers, rows int, fn func(lo, hi int)) {
	if workers <= 1 || rows < 2 {
		fn(0, rows)
		return
	}
	if workers > rows {
		workers = rows
	}
	var wg sync.WaitGroup
	for w := 1; w < workers; w++ {
		lo, hi := w*rows/workers, (w+1)*rows/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			fn(lo, hi)
		}()
	}
	fn(0, rows/workers)
	wg.Wait()
}

// scale returns a·z for real a without a full complex multiplication.
func scale(a float64, z complex128) complex128 { return complex(a*real(z), a*imag(z)) }

// mulI returns i·a·z.
func mulI(a float64, z complex128) complex128 { return complex(-a*imag(z), a*real(z)) }

// dot returns Re(conj(a)·b).
func dot(a, b complex128) float64 { return real(a)*real(b) + imag(a)*imag(b) }
