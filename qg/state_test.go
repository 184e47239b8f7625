package qg

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// TestCheckStateCFL checks that CheckState finds a state whose CFL number is
// over the limit before any step, with the number Step would find: for a
// uniform flow U the CFL number is U·dt/dx (common practice), here made
// 1.5 by an upper-layer streamfunction ψ = −U y over a sine, in a model
// whose imposed flow alone is well within the limit.
func TestCheckStateCFL(t *testing.T) {
	m := benchModel(t, 32, 1, RK4)
	defer m.Close()
	if err := m.CheckState(); err != nil {
		t.Fatalf("a quiet state: %v", err)
	}
	g := m.Grid()
	c := m.Config()
	// ψ1 = −(A/l) sin(l y) gives u1 = A cos(l y), the largest |u| = A at
	// y = 0 exactly on the grid; v = 0.
	A := 1.5*g.Dx/c.Dt - c.U1 // the total u at y = 0 makes the CFL number 1.5
	l := 2 * math.Pi / g.Ly
	psi := [2][]float64{make([]float64, g.Nx*g.Ny), make([]float64, g.Nx*g.Ny)}
	for y := range g.Ny {
		for x := range g.Nx {
			psi[0][y*g.Nx+x] = -A / l * math.Sin(l*float64(y)*g.Dy)
		}
	}
	if err := m.SetStreamfunction(psi); err != nil {
		t.Fatal(err)
	}
	err := m.CheckState()
	var se *StepError
	if !errors.As(err, &se) || se.Field != "u1" || !strings.Contains(se.Why, "CFL number 1.5") {
		t.Fatalf("CheckState = %v, want a StepError on u1 with CFL number 1.5", err)
	}
	if err := m.Step(); err == nil || !strings.Contains(err.Error(), "CFL") {
		t.Errorf("Step after a failed CheckState = %v, want the CFL error too", err)
	}
}
