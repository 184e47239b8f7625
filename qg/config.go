package qg

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/check"
)

// Scheme names a time-stepping scheme.
type Scheme string

// Time-stepping schemes.
const (
	RK4 Scheme = "rk4" // classical fourth-order Runge–Kutta
	AB3 Scheme = "ab3" // third-order Adams–Bashforth, started with two RK4 steps
)

// ScaleSelectiveKind names a scale-selective dissipation.
type ScaleSelectiveKind string

// Scale-selective dissipations.
const (
	// NoScaleSelective leaves the small scales undamped (inviscid runs).
	NoScaleSelective ScaleSelectiveKind = "none"
	// CutoffFilter damps modes above a cutoff wavenumber at a rate that rises
	// as a power of the distance to the cutoff, applied as an exact
	// per-step factor exp(−λ(k)dt); it is independent of dt.
	CutoffFilter ScaleSelectiveKind = "filter"
	// Hyperviscosity is the tendency −ν(−∇²)^p q on each layer's PV.
	Hyperviscosity ScaleSelectiveKind = "hyperviscosity"
)

// ScaleSelective configures the scale-selective dissipation, whose energy
// loss the Ledger books under TermScaleSelective.
type ScaleSelective struct {
	Kind ScaleSelectiveKind `toml:"kind" json:"kind"`
	// FilterTime is the e-folding time (s) of the filter at the largest
	// retained wavenumber.
	FilterTime float64 `toml:"filter_time" json:"filter_time"`
	// FilterCutoff is the cutoff as a fraction of the largest retained
	// wavenumber (0 < cutoff < 1); modes below it are untouched.
	FilterCutoff float64 `toml:"filter_cutoff" json:"filter_cutoff"`
	// FilterOrder is the power of the filter's rate profile.
	FilterOrder float64 `toml:"filter_order" json:"filter_order"`
	// Viscosity ν (m^(2p) s⁻¹) and Order p of the hyperviscosity.
	Viscosity float64 `toml:"viscosity" json:"viscosity"`
	Order     int     `toml:"order" json:"order"`
}

// Sponge configures a band of Newtonian damping, a function of x only,
// that absorbs eddies before they re-enter through the periodic boundary.
// The damping rate is Rate·½(1 + cos(π d/(Width/2))) within Width/2 of the
// band's centre X (d is the periodic distance) and zero elsewhere.
type Sponge struct {
	Rate  float64 `toml:"rate" json:"rate"`   // peak damping rate, s⁻¹ (0 disables the sponge)
	Width float64 `toml:"width" json:"width"` // full width of the band, m
	X     float64 `toml:"x" json:"x"`         // centre of the band, m from the western edge
}

// Config holds the model's parameters, all in SI units.
type Config struct {
	Nx int     `toml:"nx" json:"nx"` // grid points in x (power of two)
	Ny int     `toml:"ny" json:"ny"` // grid points in y (power of two)
	Lx float64 `toml:"lx" json:"lx"` // domain length in x, m
	Ly float64 `toml:"ly" json:"ly"` // domain length in y, m

	F0    float64 `toml:"f0" json:"f0"`       // Coriolis parameter, s⁻¹
	Beta  float64 `toml:"beta" json:"beta"`   // its meridional gradient, m⁻¹ s⁻¹
	Ld    float64 `toml:"ld" json:"ld"`       // deformation radius, m
	Delta float64 `toml:"delta" json:"delta"` // layer depth ratio H1/H2
	U1    float64 `toml:"u1" json:"u1"`       // imposed zonal flow, upper layer, m s⁻¹
	U2    float64 `toml:"u2" json:"u2"`       // imposed zonal flow, lower layer, m s⁻¹

	Drag           float64        `toml:"drag" json:"drag"` // linear Ekman drag rate on the lower layer, s⁻¹
	ScaleSelective ScaleSelective `toml:"scale_selective" json:"scale_selective"`
	Sponge         Sponge         `toml:"sponge" json:"sponge"`

	Dt      float64 `toml:"dt" json:"dt"`           // time step, s
	Scheme  Scheme  `toml:"scheme" json:"scheme"`   // "rk4" or "ab3"
	MaxCFL  float64 `toml:"max_cfl" json:"max_cfl"` // a run stops when the CFL number exceeds this
	Workers int     `toml:"workers" json:"workers"` // goroutines used inside a step (≥ 1)
}

// DefaultConfig returns a mid-latitude configuration: a 16 000 km × 8 000 km
// channel-like periodic domain at 128 × 64, f0 = 1e-4 s⁻¹, β = 1.6e-11, Ld = 700 km,
// equal layers, a weak shear U1 = 10, U2 = 4 m s⁻¹, Ekman drag of (5 days)⁻¹,
// a cutoff filter with a 1-hour e-folding at the grid scale, RK4 with dt = 30 min.
func DefaultConfig() Config {
	return Config{
		Nx: 128, Ny: 64,
		Lx: 16e6, Ly: 8e6,
		F0: 1e-4, Beta: 1.6e-11, Ld: 7e5, Delta: 1,
		U1: 10, U2: 4,
		Drag: 1 / (5 * 86400.0),
		ScaleSelective: ScaleSelective{
			Kind: CutoffFilter, FilterTime: 3600, FilterCutoff: 0.65, FilterOrder: 4,
		},
		Dt: 1800, Scheme: RK4, MaxCFL: 1.0, Workers: 1,
	}
}

// FieldError reports a configuration value that is out of range. Field is
// the configuration key, as written in a configuration file; every
// configuration of the project (model, block, wave source, experiment)
// reports its bad values with it.
type FieldError = check.FieldError

func isPow2(n int) bool { return n > 0 && n&(n-1) == 0 }

// Validate checks every field and returns the first problem found, as a
// *FieldError naming the key. It does not check dt against the flow; NewModel
// does that once the initial state is known.
func (c *Config) Validate() error {
	for _, g := range []struct {
		key string
		n   int
	}{{"nx", c.Nx}, {"ny", c.Ny}} {
		if g.n < 8 || !isPow2(g.n) {
			return &FieldError{Field: g.key, Value: g.n, Why: "grid size must be a power of two, at least 8"}
		}
		if g.n > 8192 {
			return &FieldError{Field: g.key, Value: g.n, Why: "grid size above 8192 is not supported"}
		}
	}
	checks := []error{
		check.Positive("lx", c.Lx), check.Positive("ly", c.Ly),
		check.Positive("f0", c.F0), check.NonNegative("beta", c.Beta),
		check.Positive("ld", c.Ld), check.Positive("delta", c.Delta),
		check.Finite("u1", c.U1), check.Finite("u2", c.U2),
		check.NonNegative("drag", c.Drag),
		check.Positive("dt", c.Dt), check.Positive("max_cfl", c.MaxCFL),
		check.NonNegative("sponge.rate", c.Sponge.Rate),
	}
	for _, err := range checks {
		if err != nil {
			return err
		}
	}
	switch c.Scheme {
	case RK4, AB3:
	default:
		return &FieldError{Field: "scheme", Value: string(c.Scheme), Why: `must be "rk4" or "ab3"`}
	}
	if c.Workers < 1 {
		return &FieldError{Field: "workers", Value: c.Workers, Why: "must be at least 1"}
	}
	d := c.ScaleSelective
	switch d.Kind {
	case NoScaleSelective:
	case CutoffFilter:
		if err := check.Positive("scale_selective.filter_time", d.FilterTime); err != nil {
			return err
		}
		if !(d.FilterCutoff > 0 && d.FilterCutoff < 1) {
			return &FieldError{Field: "scale_selective.filter_cutoff", Value: d.FilterCutoff, Why: "must lie strictly between 0 and 1"}
		}
		if err := check.Positive("scale_selective.filter_order", d.FilterOrder); err != nil {
			return err
		}
	case Hyperviscosity:
		if err := check.Positive("scale_selective.viscosity", d.Viscosity); err != nil {
			return err
		}
		if d.Order < 1 || d.Order > 8 {
			return &FieldError{Field: "scale_selective.order", Value: d.Order, Why: "must be an integer from 1 (Laplacian) to 8"}
		}
	default:
		return &FieldError{Field: "scale_selective.kind", Value: string(d.Kind), Why: `must be "none", "filter" or "hyperviscosity"`}
	}
	if c.Sponge.Rate > 0 {
		if err := check.Positive("sponge.width", c.Sponge.Width); err != nil {
			return err
		}
		if c.Sponge.Width > c.Lx {
			return &FieldError{Field: "sponge.width", Value: c.Sponge.Width, Why: fmt.Sprintf("must not exceed the domain length lx = %g m", c.Lx)}
		}
		if math.IsNaN(c.Sponge.X) || c.Sponge.X < 0 || c.Sponge.X > c.Lx {
			return &FieldError{Field: "sponge.x", Value: c.Sponge.X, Why: fmt.Sprintf("must lie in the domain, 0 to lx = %g m", c.Lx)}
		}
	}
	return nil
}

// Physics holds the derived layer parameters.
type Physics struct {
	F1, F2   float64 // inverse squared layer deformation radii, m⁻²
	W1, W2   float64 // layer weights H1/H and H2/H
	Q1y, Q2y float64 // background PV gradients, m⁻¹ s⁻¹
	U1, U2   float64 // imposed zonal flows, m s⁻¹
}

// GasConstant is the gas constant of dry air, J kg⁻¹ K⁻¹ (common
// practice).
const GasConstant = 287.04

// KelvinPerThickness converts the thickness streamfunction ψ1 − ψ2
// (m² s⁻¹) to the temperature between the layers' mid-levels (K), by the
// hydrostatic and geostrophic relations: f0/(R ln(p2/p1)), with p1 and p2
// the middles of the layers of a 1000 hPa column divided in the ratio
// H1:H2.
func (c *Config) KelvinPerThickness() float64 {
	pi := 1000 * c.Delta / (1 + c.Delta)
	p1, p2 := pi/2, (pi+1000)/2
	return c.F0 / (GasConstant * math.Log(p2/p1))
}

// Physics derives the layer parameters from the configuration.
func (c *Config) Physics() Physics {
	f1 := 1 / (c.Ld * c.Ld * (1 + c.Delta))
	f2 := c.Delta * f1
	return Physics{
		F1: f1, F2: f2,
		W1: c.Delta / (1 + c.Delta), W2: 1 / (1 + c.Delta),
		Q1y: c.Beta + f1*(c.U1-c.U2), Q2y: c.Beta - f2*(c.U1-c.U2),
		U1: c.U1, U2: c.U2,
	}
}

// Gravity is standard gravity, m s⁻², used to convert streamfunction to
// geopotential height, Z = f0 ψ / g.
const Gravity = 9.80665
