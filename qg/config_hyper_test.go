package qg

import (
	"errors"
	"testing"
)

// TestHyperviscosityTimeStepLimit checks that an explicit hyperviscosity
// whose grid-scale damping rate is outside RK4's stability interval on the
// negative real axis (|λ|dt ≤ 2.785, common practice) is refused at
// NewModel, naming the viscosity, and that a stable one is accepted.
func TestHyperviscosityTimeStepLimit(t *testing.T) {
	c := DefaultConfig()
	c.Nx, c.Ny, c.Lx, c.Ly = 64, 64, 8e6, 8e6
	c.Dt = 3600
	c.U1, c.U2 = 0, 0
	kmax := 2 * 3.141592653589793 * 21 / 8e6 // largest retained wavenumber on an axis, index 21 of 64
	k2max := 2 * kmax * kmax                 // the corner of the retained square
	for _, tc := range []struct {
		rate float64 // ν K_max⁴ dt
		ok   bool
	}{{2.0, true}, {3.5, false}} {
		c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Order: 2, Viscosity: tc.rate / (k2max * k2max * c.Dt)}
		_, err := NewModel(c)
		var fe *FieldError
		if tc.ok && err != nil {
			t.Errorf("rate·dt = %g: unexpected error %v", tc.rate, err)
		}
		if !tc.ok && (!errors.As(err, &fe) || fe.Field != "scale_selective.viscosity") {
			t.Errorf("rate·dt = %g: got %v, want a FieldError for dissipation.viscosity", tc.rate, err)
		}
	}
}
