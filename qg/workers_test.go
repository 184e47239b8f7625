package qg

import (
	"math"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// TestWorkersBitIdentical checks that the state after a number of steps is
// bit-for-bit the same whatever the number of workers (package qg's
// reproducibility contract; the reference is the one-worker run, which
// has no concurrency at all).
func TestWorkersBitIdentical(t *testing.T) {
	for _, scheme := range []Scheme{RK4, AB3} {
		var ref [2][]complex128
		var refLedger Ledger
		for _, w := range []int{1, 2, 3, 4} {
			m := benchModel(t, 64, w, scheme)
			if err := m.Run(20); err != nil {
				t.Fatal(err)
			}
			q := m.SpectralPV()
			if ref[0] == nil {
				ref = [2][]complex128{append([]complex128(nil), q[0]...), append([]complex128(nil), q[1]...)}
				refLedger = m.Ledger()
				continue
			}
			// the energy books too: every reduction is summed in the same order
			if l := m.Ledger(); l != refLedger {
				t.Fatalf("%s, %d workers: energy ledger %v differs from 1 worker's %v", scheme, w, l, refLedger)
			}
			for n := range 2 {
				for p := range q[n] {
					a, b := q[n][p], ref[n][p]
					if math.Float64bits(real(a)) != math.Float64bits(real(b)) || math.Float64bits(imag(a)) != math.Float64bits(imag(b)) {
						t.Fatalf("%s, %d workers: layer %d point %d differs from 1 worker: %v vs %v", scheme, w, n+1, p, a, b)
					}
				}
			}
		}
	}
}

// TestWorkersBitIdenticalUnderLoad repeats short runs with 2 and 3 workers
// while the threads are scarce — one thread for all goroutines, or two
// threads shared with busy goroutines — and compares each final state and
// energy ledger bit for bit with a one-worker run (which has no concurrency
// at all). A hand-off that let a pass begin before the previous one ended,
// or let the caller go on before the partner finished, changes the bits
// (package qg's reproducibility contract).
func TestWorkersBitIdenticalUnderLoad(t *testing.T) {
	const steps = 30
	type result struct {
		q      [2][]complex128
		ledger Ledger
	}
	runOnce := func(scheme Scheme, workers int) result {
		m := benchModel(t, 32, workers, scheme)
		defer m.Close()
		if err := m.Run(steps); err != nil {
			t.Fatal(err)
		}
		q := m.SpectralPV()
		return result{[2][]complex128{slices.Clone(q[0]), slices.Clone(q[1])}, m.Ledger()}
	}
	runs := 0
	for _, scheme := range []Scheme{RK4, AB3} {
		ref := runOnce(scheme, 1)
		for _, procs := range []int{1, 2} {
			prev := runtime.GOMAXPROCS(procs)
			stop := func() {}
			if procs > 1 {
				stop = testenv.Busy(2)
			}
			for _, workers := range []int{2, 3} {
				for rep := range 8 {
					got := runOnce(scheme, workers)
					runs++
					if got.ledger != ref.ledger {
						t.Errorf("%s, GOMAXPROCS=%d, %d workers, run %d: energy ledger differs from one worker's", scheme, procs, workers, rep)
					}
					for n := range 2 {
						for p := range got.q[n] {
							if math.Float64bits(real(got.q[n][p])) != math.Float64bits(real(ref.q[n][p])) ||
								math.Float64bits(imag(got.q[n][p])) != math.Float64bits(imag(ref.q[n][p])) {
								t.Fatalf("%s, GOMAXPROCS=%d, %d workers, run %d: layer %d point %d differs from one worker's", scheme, procs, workers, rep, n+1, p)
							}
						}
					}
				}
			}
			stop()
			runtime.GOMAXPROCS(prev)
		}
	}
	t.Logf("%d runs of %d steps compared bit for bit", runs, steps)
}

// TestCloseStopsGoroutines checks that a model's goroutines end with Close
// and that a closed model refuses to step.
func TestCloseStopsGoroutines(t *testing.T) {
	before := testenv.Baseline()
	for _, w := range []int{1, 2, 3, 4} {
		m := benchModel(t, 32, w, RK4)
		if err := m.Run(2); err != nil {
			t.Fatal(err)
		}
		m.Close()
		m.Close()
		if err := m.Step(); err == nil || !strings.Contains(err.Error(), "closed") {
			t.Errorf("%d workers: Step after Close gave %v, want an error saying the model is closed", w, err)
		}
	}
	if n := testenv.Goroutines(before); n > before {
		t.Errorf("%d goroutines left after Close", n-before)
	}
}
