package wavemaker

import "testing"

// TestNoiseStateRestart checks that a noise restored from MarshalBinary
// draws bit-identical increments to the one that wrote it, white and red
// (the restart requirement of a reproducible model, common practice).
func TestNoiseStateRestart(t *testing.T) {
	for _, kind := range []Kind{White, Red} {
		qc := testModelConfig(3600, 1)
		m := newModel(t, qc)
		wc := testNoiseConfig()
		wc.Kind, wc.CorrelationTime = kind, 6*3600
		a := newNoise(t, wc, m)
		ns := m.Grid().Len()
		da, db := pair(ns), pair(ns)
		for range 5 {
			a.Increment(da, 0, 3600)
		}
		state, err := a.MarshalBinary()
		if err != nil {
			t.Fatal(err)
		}
		b := newNoise(t, wc, m) // fresh, same seed: it would restart from the beginning
		if err := b.UnmarshalBinary(state); err != nil {
			t.Fatal(err)
		}
		for step := range 3 {
			a.Increment(da, 0, 3600)
			b.Increment(db, 0, 3600)
			for n := range 2 {
				for p := range da[n] {
					if da[n][p] != db[n][p] {
						t.Fatalf("%s: step %d after restart, layer %d mode %d: %v vs %v", kind, step, n+1, p, da[n][p], db[n][p])
					}
				}
			}
		}
		if err := b.UnmarshalBinary(state[:len(state)-3]); err == nil {
			t.Errorf("%s: truncated state accepted", kind)
		}
	}
}
