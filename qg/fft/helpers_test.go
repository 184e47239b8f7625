//go:build !fftw || !cgo

package fft

import (
	"runtime"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// TestCloseStopsHelpers: Close ends the helper goroutines of a plan at once.
func TestCloseStopsHelpers(t *testing.T) {
	base := testenv.Baseline()
	p := mustPlan(t, 16, 16, 4)
	f := randomField(16, 16, 17)
	c := make([]complex128, 16*9)
	p.Forward(c, f)
	if n := runtime.NumGoroutine(); n < base+3 {
		t.Errorf("%d goroutines with a 4-worker plan, want at least %d", n, base+3)
	}
	p.Close()
	p.Close()
	// p stays reachable until after the count, so only Close can have
	// stopped its helpers (not the collector).
	n := testenv.Goroutines(base)
	runtime.KeepAlive(p)
	if n > base {
		t.Errorf("%d goroutines after Close, want %d", n, base)
	}
}

// TestHelpersStop: the helper goroutines of a plan end once the plan is unreachable.
func TestHelpersStop(t *testing.T) {
	base := testenv.Baseline()
	func() {
		p, err := NewPlan2D(16, 16, 4) // not mustPlan: this plan must become unreachable
		if err != nil {
			t.Fatal(err)
		}
		f := randomField(16, 16, 17)
		c := make([]complex128, 16*9)
		p.Forward(c, f)
		if n := runtime.NumGoroutine(); n < base+3 {
			t.Errorf("%d goroutines with a 4-worker plan, want at least %d", n, base+3)
		}
	}()
	deadline := time.Now().Add(5 * time.Second)
	for runtime.NumGoroutine() > base && time.Now().Before(deadline) {
		runtime.GC()
		time.Sleep(10 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > base {
		t.Errorf("%d goroutines after the plan was dropped, want %d", n, base)
	}
}

// TestWorkersBitIdenticalUnderLoad repeats transforms with 2 and 3 workers
// while busy goroutines compete for the threads, and with one thread for
// all, comparing each result bit for bit with a one-worker plan's: a
// hand-off that let a phase start before the previous one ended would
// show here (the results must not depend on scheduling; package qg).
func TestWorkersBitIdenticalUnderLoad(t *testing.T) {
	nx, ny := 64, 32
	w := nx/2 + 1
	f := randomField(nx, ny, 21)
	ref := mustPlan(t, nx, ny, 1)
	c1, g1 := make([]complex128, ny*w), make([]float64, nx*ny)
	ref.Forward(c1, f)
	ref.Inverse(g1, c1)
	for _, procs := range []int{1, 2} {
		prev := runtime.GOMAXPROCS(procs)
		// With one thread the workers already compete for it; with two,
		// busy goroutines take the threads away at random.
		stop := func() {}
		if procs > 1 {
			stop = testenv.Busy(2)
		}
		reps := 200
		for _, workers := range []int{2, 3} {
			p := mustPlan(t, nx, ny, workers)
			c, g := make([]complex128, ny*w), make([]float64, nx*ny)
			for rep := range reps {
				clear(c)
				clear(g)
				p.Forward(c, f)
				p.Inverse(g, c)
				for k := range c {
					if c[k] != c1[k] {
						t.Fatalf("GOMAXPROCS=%d workers=%d repetition %d: Forward differs at %d", procs, workers, rep, k)
					}
				}
				for k := range g {
					if g[k] != g1[k] {
						t.Fatalf("GOMAXPROCS=%d workers=%d repetition %d: Inverse differs at %d", procs, workers, rep, k)
					}
				}
			}
			p.Close()
		}
		stop()
		runtime.GOMAXPROCS(prev)
	}
}
