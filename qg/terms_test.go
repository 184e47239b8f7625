package qg

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestTermTendencySum checks that the single-term tendencies add up to the
// stepper's full tendency, so diagnostics built on TermTendency see the
// same equations the model integrates. The reference for each term is its
// definition of package qg (common practice), evaluated independently here
// for the drag and shear terms.
func TestTermTendencySum(t *testing.T) {
	for _, mode := range []BlockMode{"", Fixed, Forced, Relaxed} {
		c := DefaultConfig()
		c.Nx, c.Ny = 32, 32
		c.Lx, c.Ly = 8e6, 8e6
		c.Dt = 1200
		c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Viscosity: 1e16, Order: 2}
		m, err := NewModel(c)
		if err != nil {
			t.Fatal(err)
		}
		r := rand.New(rand.NewPCG(3, 4))
		if mode != "" {
			psiB := [2][]float64{make([]float64, 32*32), make([]float64, 32*32)}
			for y := range 32 {
				for x := range 32 {
					v := 2e7 * math.Sin(2*math.Pi*float64(x)/32) * math.Sin(2*math.Pi*float64(y)/32)
					psiB[0][y*32+x], psiB[1][y*32+x] = v, 0.6*v
				}
			}
			if err := m.SetBlock(Block{Psi: psiB, Mode: mode, RelaxTime: 5 * 86400}); err != nil {
				t.Fatal(err)
			}
		}
		q := randomPV(m.Grid(), 1e-5, r)
		if mode != "" && mode != Fixed {
			qb, _ := m.BlockPV()
			for n := range 2 {
				for p := range q[n] {
					q[n][p] += qb[n][p]
				}
			}
		}
		ns := m.Grid().Len()
		full := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		psi := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		var rates [NumTerms]float64
		m.tendency(full, q, psi, 0, false, true, &rates, nil)
		sum := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		one := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
		for term := range NumTerms {
			if term == TermSponge || term == TermScaleSelective && m.filter != nil {
				continue // split steps, not part of the stepper's tendency
			}
			if err := m.TermTendency(term, one, q, 0); err != nil {
				t.Fatal(err)
			}
			for n := range 2 {
				for p := range one[n] {
					sum[n][p] += one[n][p]
				}
			}
		}
		var num, den float64
		for n := range 2 {
			for p := range sum[n] {
				d := sum[n][p] - full[n][p]
				num += real(d)*real(d) + imag(d)*imag(d)
				den += real(full[n][p])*real(full[n][p]) + imag(full[n][p])*imag(full[n][p])
			}
		}
		if rel := math.Sqrt(num / den); rel > 1e-12 {
			t.Errorf("mode %q: terms add up to the tendency within %.3g, want < 1e-12", mode, rel)
		}
		// Drag: −r ∇²ψ2 = r K² ψ̂2 on the lower layer only (package qg).
		m.TermTendency(TermDrag, one, q, 0)
		m.Inverter().Invert(psi, q)
		g := m.Grid()
		for p := range one[1] {
			want := complex(c.Drag*g.k2[p]*g.keep[p], 0) * psi[1][p]
			if one[0][p] != 0 || math.Abs(real(one[1][p]-want))+math.Abs(imag(one[1][p]-want)) > 1e-12*math.Abs(real(want))+1e-30 {
				t.Fatalf("drag term at %d: got %v, %v want 0, %v", p, one[0][p], one[1][p], want)
			}
		}
	}
}
