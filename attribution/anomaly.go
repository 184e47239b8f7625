package attribution

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/linear"
)

// AnomalyKind names the kind of a forcing anomaly.
type AnomalyKind string

// Forcing anomalies.
const (
	// PVAnomaly is a Gaussian patch of steady PV tendency on one layer:
	// Amplitude·exp(−r²/Radius²), s⁻².
	PVAnomaly AnomalyKind = "pv"
	// HeatingAnomaly is a Gaussian patch of steady heating of the air
	// between the layers, Amplitude·exp(−r²/Radius²) in K day⁻¹: PV
	// forcing −F1 τ̇ in the upper layer and +F2 τ̇ in the lower, τ̇ the
	// rate of change of the thickness ψ1 − ψ2 (see qg/linear.HeatingPatch).
	HeatingAnomaly AnomalyKind = "heating"
)

// Anomaly is a steady forcing anomaly: a Gaussian patch of PV tendency or
// of heating, centred at (X, Y), of e-folding radius Radius.
type Anomaly struct {
	Kind AnomalyKind `toml:"kind" json:"kind"`
	// X and Y place the patch's centre, m from the western and southern
	// edges.
	X float64 `toml:"x" json:"x"`
	Y float64 `toml:"y" json:"y"`
	// Radius is the patch's e-folding radius, m.
	Radius float64 `toml:"radius" json:"radius"`
	// Amplitude is the peak PV tendency (s⁻², kind "pv") or heating rate
	// (K day⁻¹, kind "heating"); positive heats.
	Amplitude float64 `toml:"amplitude" json:"amplitude"`
	// Layer is the layer a PV patch forces: 1 (upper) or 2 (lower).
	Layer int `toml:"layer" json:"layer"`
}

// Units returns the unit of the amplitude (UDUNITS-2).
func (a Anomaly) Units() string {
	if a.Kind == HeatingAnomaly {
		return "K day-1"
	}
	return "s-2"
}

// String describes the anomaly in one line.
func (a Anomaly) String() string {
	where := fmt.Sprintf("at x = %.0f km, y = %.0f km, radius %.0f km", a.X/1e3, a.Y/1e3, a.Radius/1e3)
	if a.Kind == HeatingAnomaly {
		return fmt.Sprintf("heating of %.3g K day⁻¹ between the layers %s", a.Amplitude, where)
	}
	return fmt.Sprintf("PV forcing of %.3g s⁻² in layer %d %s", a.Amplitude, a.Layer, where)
}

// Validate checks the anomaly against the model's configuration and
// returns the first problem as a *qg.FieldError naming the key
// (anomaly.x, …): the kind, the centre inside the domain, a radius that the
// grid resolves (at least one grid spacing) and that stays small at the
// periodic antipode (at most a quarter of the shorter side), a non-zero
// finite amplitude, and the layer of a PV patch.
func (a Anomaly) Validate(c qg.Config) error {
	switch a.Kind {
	case PVAnomaly, HeatingAnomaly:
	default:
		return &qg.FieldError{Field: "anomaly.kind", Value: string(a.Kind), Why: `must be "pv" or "heating"`}
	}
	for _, err := range []error{
		check.Within("anomaly.x", a.X, 0, c.Lx, fmt.Sprintf("the domain, 0 to model.lx = %g m", c.Lx)),
		check.Within("anomaly.y", a.Y, 0, c.Ly, fmt.Sprintf("the domain, 0 to model.ly = %g m", c.Ly)),
		check.Positive("anomaly.radius", a.Radius),
		check.Finite("anomaly.amplitude", a.Amplitude),
	} {
		if err != nil {
			return err
		}
	}
	if dx := math.Max(c.Lx/float64(c.Nx), c.Ly/float64(c.Ny)); a.Radius < dx {
		return &qg.FieldError{Field: "anomaly.radius", Value: a.Radius, Why: fmt.Sprintf("is smaller than the grid spacing (%g m): the grid cannot resolve the patch", dx)}
	}
	if q := math.Min(c.Lx, c.Ly) / 4; a.Radius > q {
		return &qg.FieldError{Field: "anomaly.radius", Value: a.Radius, Why: fmt.Sprintf("must be at most a quarter of the shorter side of the domain, %g m", q)}
	}
	if a.Amplitude == 0 {
		return &qg.FieldError{Field: "anomaly.amplitude", Value: a.Amplitude, Why: "must not be zero: a zero anomaly has no response to attribute"}
	}
	if a.Kind == PVAnomaly && a.Layer != 1 && a.Layer != 2 {
		return &qg.FieldError{Field: "anomaly.layer", Value: a.Layer, Why: "must be 1 (upper) or 2 (lower)"}
	}
	return nil
}

// Forcing returns the anomaly's PV forcing (s⁻², spectral, both layers, in
// the layout of m's grid, truncated to the retained modes), without its
// domain mean: a uniform PV tendency has no flow, but it would accumulate
// in the state without bound where nothing damps it, and the sponge, which
// damps it only in its band, would turn it into a spurious forcing there.
// m is any model on the grid of the configuration the anomaly was
// validated for; it must not be stepping.
func (a Anomaly) Forcing(m *qg.Model) ([2][]complex128, error) {
	if err := a.Validate(m.Config()); err != nil {
		return [2][]complex128{}, err
	}
	var f [2][]complex128
	var err error
	if a.Kind == HeatingAnomaly {
		f, err = linear.HeatingPatch(m, a.X, a.Y, a.Radius, a.Amplitude)
	} else {
		f, err = linear.PVPatch(m, a.X, a.Y, a.Radius, a.Amplitude, a.Layer-1)
	}
	if err != nil {
		return f, err
	}
	f[0][0], f[1][0] = 0, 0
	return f, nil
}

// SteadyTendency is a steady spectral PV forcing as a qg.Forcing, to add a
// forcing anomaly to a nonlinear model: AddTendency adds it at every stage.
type SteadyTendency [2][]complex128

// AddTendency adds the forcing to dq.
func (f SteadyTendency) AddTendency(dq [2][]complex128, t float64) {
	for n := range 2 {
		for p, z := range f[n] {
			dq[n][p] += z
		}
	}
}
