package qg

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// Bad configurations must be rejected with a *FieldError naming the key as
// written in a configuration file (project rules: "config errors name the
// key").
func TestConfigValidate(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		edit func(c *Config)
		key  string // "" when the configuration is valid
	}{
		{"default", func(c *Config) {}, ""},
		{"hyperviscosity", func(c *Config) {
			c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Viscosity: 1e16, Order: 2}
		}, ""},
		{"no dissipation", func(c *Config) { c.ScaleSelective = ScaleSelective{Kind: NoScaleSelective} }, ""},
		{"ab3", func(c *Config) { c.Scheme = AB3 }, ""},
		{"sponge", func(c *Config) { c.Sponge = Sponge{Rate: 1e-5, Width: 2e6, X: 1e6} }, ""},

		{"nx zero", func(c *Config) { c.Nx = 0 }, "nx"},
		{"nx negative", func(c *Config) { c.Nx = -64 }, "nx"},
		{"nx not a power of two", func(c *Config) { c.Nx = 96 }, "nx"},
		{"nx too small", func(c *Config) { c.Nx = 4 }, "nx"},
		{"ny not a power of two", func(c *Config) { c.Ny = 100 }, "ny"},
		{"ny zero", func(c *Config) { c.Ny = 0 }, "ny"},
		{"lx zero", func(c *Config) { c.Lx = 0 }, "lx"},
		{"lx NaN", func(c *Config) { c.Lx = nan }, "lx"},
		{"ly negative", func(c *Config) { c.Ly = -1e6 }, "ly"},
		{"ly infinite", func(c *Config) { c.Ly = inf }, "ly"},
		{"f0 zero", func(c *Config) { c.F0 = 0 }, "f0"},
		{"beta NaN", func(c *Config) { c.Beta = nan }, "beta"},
		{"beta negative", func(c *Config) { c.Beta = -1e-11 }, "beta"},
		{"ld zero", func(c *Config) { c.Ld = 0 }, "ld"},
		{"ld NaN", func(c *Config) { c.Ld = nan }, "ld"},
		{"delta negative", func(c *Config) { c.Delta = -1 }, "delta"},
		{"u1 NaN", func(c *Config) { c.U1 = nan }, "u1"},
		{"u2 infinite", func(c *Config) { c.U2 = -inf }, "u2"},
		{"drag negative", func(c *Config) { c.Drag = -1e-6 }, "drag"},
		{"dt zero", func(c *Config) { c.Dt = 0 }, "dt"},
		{"dt NaN", func(c *Config) { c.Dt = nan }, "dt"},
		{"max_cfl zero", func(c *Config) { c.MaxCFL = 0 }, "max_cfl"},
		{"scheme unknown", func(c *Config) { c.Scheme = "leapfrog" }, "scheme"},
		{"scheme empty", func(c *Config) { c.Scheme = "" }, "scheme"},
		{"workers zero", func(c *Config) { c.Workers = 0 }, "workers"},
		{"scale_selective kind unknown", func(c *Config) { c.ScaleSelective.Kind = "smagorinsky" }, "scale_selective.kind"},
		{"scale_selective kind empty", func(c *Config) { c.ScaleSelective.Kind = "" }, "scale_selective.kind"},
		{"filter time zero", func(c *Config) { c.ScaleSelective.FilterTime = 0 }, "scale_selective.filter_time"},
		{"filter cutoff one", func(c *Config) { c.ScaleSelective.FilterCutoff = 1 }, "scale_selective.filter_cutoff"},
		{"filter cutoff NaN", func(c *Config) { c.ScaleSelective.FilterCutoff = nan }, "scale_selective.filter_cutoff"},
		{"filter order negative", func(c *Config) { c.ScaleSelective.FilterOrder = -2 }, "scale_selective.filter_order"},
		{"viscosity NaN", func(c *Config) {
			c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Viscosity: nan, Order: 2}
		}, "scale_selective.viscosity"},
		{"hyperviscosity order zero", func(c *Config) {
			c.ScaleSelective = ScaleSelective{Kind: Hyperviscosity, Viscosity: 1e16, Order: 0}
		}, "scale_selective.order"},
		{"sponge rate negative", func(c *Config) { c.Sponge.Rate = -1 }, "sponge.rate"},
		{"sponge width zero", func(c *Config) { c.Sponge = Sponge{Rate: 1e-5, Width: 0, X: 1e6} }, "sponge.width"},
		{"sponge wider than domain", func(c *Config) { c.Sponge = Sponge{Rate: 1e-5, Width: 2 * c.Lx, X: 1e6} }, "sponge.width"},
		{"sponge outside domain", func(c *Config) { c.Sponge = Sponge{Rate: 1e-5, Width: 1e6, X: -1} }, "sponge.x"},
	}
	for _, tc := range cases {
		c := DefaultConfig()
		tc.edit(&c)
		err := c.Validate()
		if tc.key == "" {
			if err != nil {
				t.Errorf("%s: valid configuration rejected: %v", tc.name, err)
			}
			continue
		}
		var fe *FieldError
		if !errors.As(err, &fe) {
			t.Errorf("%s: got error %v (%T), want a *FieldError for %q", tc.name, err, err, tc.key)
			continue
		}
		if fe.Field != tc.key {
			t.Errorf("%s: error names key %q, want %q (%v)", tc.name, fe.Field, tc.key, err)
		}
		if !strings.Contains(err.Error(), tc.key) {
			t.Errorf("%s: message %q does not name the key %q", tc.name, err.Error(), tc.key)
		}
		// NewModel must refuse it with the same error.
		if _, err := NewModel(c); !errors.As(err, &fe) || fe.Field != tc.key {
			t.Errorf("%s: NewModel returned %v, want a *FieldError for %q", tc.name, err, tc.key)
		}
	}
}

// NewModel checks dt against the imposed flow's CFL number and against the
// fastest linear wave on the retained modes, for the scheme's stability
// limit on the imaginary axis (RK4: 2√2, common practice; AB3: about 0.72,
// from memory).
func TestNewModelTimeStepLimits(t *testing.T) {
	// CFL of the imposed flow: U1 dt/dx = 50 × 30000 / 125000 = 12.
	c := DefaultConfig()
	c.U1, c.Dt = 50, 30000
	// Linear waves with no flow: the barotropic Rossby frequency of the
	// gravest zonal mode, β k/K² with k = 2π/Lx and l = 0, is β Lx/(2π) =
	// 1.6e-11 × 1.6e7 / 2π = 4.07e-5 s⁻¹ (Pedlosky 1987). dt = 1e5 s gives
	// ωdt = 4.1 > 2√2 for RK4; dt = 3e4 gives 1.22: fine for RK4, over 0.72
	// for AB3.
	rossby := DefaultConfig()
	rossby.U1, rossby.U2, rossby.Dt = 0, 0, 1e5
	rossby.MaxCFL = 1e9
	rk4ok := rossby
	rk4ok.Dt = 3e4
	ab3 := rk4ok
	ab3.Scheme = AB3
	for _, tc := range []struct {
		name string
		cfg  Config
		bad  bool
	}{
		{"imposed flow over max_cfl", c, true},
		{"Rossby wave unstable with RK4", rossby, true},
		{"Rossby wave stable with RK4", rk4ok, false},
		{"Rossby wave unstable with AB3", ab3, true},
	} {
		_, err := NewModel(tc.cfg)
		if !tc.bad {
			if err != nil {
				t.Errorf("%s: rejected: %v", tc.name, err)
			}
			continue
		}
		var fe *FieldError
		if !errors.As(err, &fe) || fe.Field != "dt" {
			t.Errorf("%s: NewModel returned %v, want a *FieldError for \"dt\"", tc.name, err)
		}
	}
}
