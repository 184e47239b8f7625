package qg

import (
	"math"
	"testing"
)

// TestWorkersBitIdentical checks that the state after a number of steps is
// bit-for-bit the same whatever the number of workers (the design notes'
// reproducibility requirement; the reference is the one-worker run, which
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
