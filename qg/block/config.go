package block

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
)

// Shape names a block shape.
type Shape string

// Block shapes.
const (
	None        Shape = "none"   // no block (an empty Shape means the same)
	DipoleShape Shape = "dipole" // two Gaussian vortices, see Dipole
	ModonShape  Shape = "modon"  // the β-plane modon, see Modon
)

// Polarity says which way round a modon is.
type Polarity string

// Modon polarities.
const (
	// HighPoleward puts the high poleward of the centre and the low
	// equatorward, with easterlies between them: the orientation of a
	// block. It is the default. For f0 > 0 and β > 0 it is not a free
	// travelling solution; hold it with the forced mode.
	HighPoleward Polarity = "high_poleward"
	// LowPoleward is the exact Larichev–Reznik solution for f0 > 0, β > 0:
	// it travels east at Speed relative to the fluid, with westerlies
	// between its lobes.
	LowPoleward Polarity = "low_poleward"
)

// Modon configures a barotropic β-plane modon (Stern 1975; Larichev &
// Reznik 1976) centred at (X, Y); see the package documentation.
type Modon struct {
	X float64 `toml:"x" json:"x"` // centre, m from the western edge
	Y float64 `toml:"y" json:"y"` // centre, m from the southern edge
	// Radius is the radius a of the circle that separates the inner and
	// the outer solutions, m.
	Radius float64 `toml:"radius" json:"radius"`
	// Speed is the eastward speed c > 0 of the exact solution relative to
	// the fluid, m s⁻¹; it sets the outer decay rate p = √(β/c) and, unless
	// Height or Psi is given, the amplitude.
	Speed    float64  `toml:"speed" json:"speed"`
	Polarity Polarity `toml:"polarity" json:"polarity"` // "high_poleward" (default) or "low_poleward"
	// Height, if not zero, rescales the shape so that the high's peak
	// geopotential height in the upper layer is Height, m; Psi does the
	// same with the peak streamfunction, m² s⁻¹. A rescaled modon is no
	// longer an exact solution. Set at most one of them.
	Height float64 `toml:"height" json:"height"`
	Psi    float64 `toml:"psi" json:"psi"`
	// Baroclinic is the vertical structure factor, as in Dipole: ψ2 =
	// (1 − Baroclinic)·ψ1. Only 0 (barotropic, the default) gives the exact
	// solution of the two-layer model.
	Baroclinic float64 `toml:"baroclinic" json:"baroclinic"`
}

// Profile solves the modon for the β of cfg and returns it with its scale
// (sign and amplitude) applied. It validates m first.
func (m Modon) Profile(cfg qg.Config) (ModonProfile, error) {
	if err := m.validate("block.modon", cfg); err != nil {
		return ModonProfile{}, err
	}
	return m.profile(cfg)
}

func (m Modon) profile(cfg qg.Config) (ModonProfile, error) {
	p, err := SolveModon(m.Radius, m.Speed, cfg.Beta)
	if err != nil {
		return ModonProfile{}, err
	}
	s := 1.0
	if m.Polarity != LowPoleward {
		s = -1
	}
	switch {
	case m.Psi != 0:
		s *= m.Psi / p.Peak()
	case m.Height != 0:
		s *= qg.Gravity * m.Height / cfg.F0 / p.Peak()
	}
	p.Scale = s
	return p, nil
}

// Streamfunction returns the modon's ψ in both layers (m² s⁻¹) on the grid
// of cfg, Ny rows of Nx points. It validates m first.
func (m Modon) Streamfunction(cfg qg.Config) ([2][]float64, error) {
	p, err := m.Profile(cfg)
	if err != nil {
		return [2][]float64{}, err
	}
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	return layers(sample(g, m.X, m.Y, p.Psi), m.Baroclinic), nil
}

// Config is a block: its shape, its parameters and how the model maintains
// it. Keys are those of a [block] table in a configuration file.
type Config struct {
	Shape Shape        `toml:"shape" json:"shape"` // "none", "dipole" or "modon"
	Mode  qg.BlockMode `toml:"mode" json:"mode"`   // "fixed", "forced", "relaxed" or "free"
	// RelaxTime is the relaxation time τ_r of the relaxed mode, s.
	RelaxTime float64 `toml:"relax_time" json:"relax_time"`
	// Linear drops the eddy–eddy interaction in the fixed mode.
	Linear bool   `toml:"linear" json:"linear"`
	Dipole Dipole `toml:"dipole" json:"dipole"`
	Modon  Modon  `toml:"modon" json:"modon"`
}

// Enabled reports whether the configuration asks for a block (a Shape
// other than None or empty).
func (c Config) Enabled() bool { return c.Shape != None && c.Shape != "" }

// Validate checks the block against the model configuration cfg (which it
// validates too) and returns the first problem found, as a *qg.FieldError
// naming the key (e.g. "block.dipole.radius"). Without a block (Shape None)
// nothing else of the table is checked.
func (c Config) Validate(cfg qg.Config) error {
	if err := cfg.Validate(); err != nil {
		return err
	}
	if !c.Enabled() {
		return nil
	}
	switch c.Mode {
	case qg.Fixed, qg.Forced, qg.Free:
	case qg.Relaxed:
		if err := positive("block.relax_time", c.RelaxTime); err != nil {
			return err
		}
	default:
		return &qg.FieldError{Field: "block.mode", Value: string(c.Mode), Why: `must be "fixed", "forced", "relaxed" or "free"`}
	}
	if c.Linear && c.Mode != qg.Fixed {
		return &qg.FieldError{Field: "block.linear", Value: c.Linear, Why: fmt.Sprintf("linear eddies need mode = %q, not %q", qg.Fixed, c.Mode)}
	}
	switch c.Shape {
	case DipoleShape:
		return c.Dipole.validate("block.dipole", cfg)
	case ModonShape:
		return c.Modon.validate("block.modon", cfg)
	default:
		return &qg.FieldError{Field: "block.shape", Value: string(c.Shape), Why: `must be "none", "dipole" or "modon"`}
	}
}

// Block validates c and returns the qg.Block to pass to Model.SetBlock, with
// the shape gridded on the grid of cfg. Without a block it is an error.
func (c Config) Block(cfg qg.Config) (qg.Block, error) {
	if err := c.Validate(cfg); err != nil {
		return qg.Block{}, err
	}
	if !c.Enabled() {
		return qg.Block{}, &qg.FieldError{Field: "block.shape", Value: string(c.Shape), Why: "there is no block to build"}
	}
	var psi [2][]float64
	var err error
	if c.Shape == DipoleShape {
		psi, err = c.Dipole.Streamfunction(cfg)
	} else {
		psi, err = c.Modon.Streamfunction(cfg)
	}
	if err != nil {
		return qg.Block{}, err
	}
	return qg.Block{Psi: psi, Mode: c.Mode, RelaxTime: c.RelaxTime, Linear: c.Linear}, nil
}

func positive(key string, v float64) error { return check.Positive(key, v) }

func inDomain(key string, v, l float64, name string) error {
	return check.Within(key, v, 0, l, fmt.Sprintf("the domain, 0 to %s = %g m", name, l))
}

// amplitudeKeys checks an amplitude given as height or psi; required says
// whether one of them must be set.
func amplitudeKeys(prefix string, height, psi float64, required bool) error {
	for _, kv := range []struct {
		key string
		v   float64
	}{{prefix + ".height", height}, {prefix + ".psi", psi}} {
		if math.IsNaN(kv.v) || math.IsInf(kv.v, 0) || kv.v < 0 {
			return &qg.FieldError{Field: kv.key, Value: kv.v, Why: "must be a finite number, zero or greater (the high is poleward)"}
		}
	}
	if height != 0 && psi != 0 {
		return &qg.FieldError{Field: prefix + ".psi", Value: psi, Why: fmt.Sprintf("give the amplitude as height or as psi, not both (height = %g m)", height)}
	}
	if required && height == 0 && psi == 0 {
		return &qg.FieldError{Field: prefix + ".height", Value: height, Why: "the amplitude is missing: set height (m) or psi (m² s⁻¹) greater than zero"}
	}
	return nil
}

func baroclinicKey(key string, v float64) error {
	if math.IsNaN(v) || v < 0 || v > 2 {
		return &qg.FieldError{Field: key, Value: v, Why: "must lie in [0, 2] (0 barotropic, 1 upper layer only, 2 purely baroclinic)"}
	}
	return nil
}

// extent is the multiple of the Gaussian radius counted as the width of a
// lobe when checking that a dipole fits the domain (exp(−4) ≈ 2 % of the
// peak at 2R).
const extent = 4

func (d Dipole) validate(p string, cfg qg.Config) error {
	checks := []error{
		inDomain(p+".x", d.X, cfg.Lx, "lx"),
		inDomain(p+".y", d.Y, cfg.Ly, "ly"),
		positive(p+".radius", d.Radius),
		positive(p+".separation", d.Separation),
		amplitudeKeys(p, d.Height, d.Psi, true),
		baroclinicKey(p+".baroclinic", d.Baroclinic),
	}
	for _, err := range checks {
		if err != nil {
			return err
		}
	}
	if w := extent * d.Radius; w > cfg.Lx || w > cfg.Ly {
		return &qg.FieldError{Field: p + ".radius", Value: d.Radius, Why: fmt.Sprintf("a lobe %g radii wide (%g m) does not fit the domain %g × %g m", float64(extent), w, cfg.Lx, cfg.Ly)}
	}
	if h := d.Separation + extent*d.Radius; h > cfg.Ly {
		return &qg.FieldError{Field: p + ".separation", Value: d.Separation, Why: fmt.Sprintf("the dipole's meridional extent, separation + %g·radius = %g m, exceeds ly = %g m", float64(extent), h, cfg.Ly)}
	}
	return nil
}

// farField is the largest allowed ratio of the modon's outer field at half
// the shorter domain length to its value at r = a.
const farField = 0.05

func (m Modon) validate(p string, cfg qg.Config) error {
	checks := []error{
		inDomain(p+".x", m.X, cfg.Lx, "lx"),
		inDomain(p+".y", m.Y, cfg.Ly, "ly"),
		positive(p+".radius", m.Radius),
		positive(p+".speed", m.Speed),
		amplitudeKeys(p, m.Height, m.Psi, false),
		baroclinicKey(p+".baroclinic", m.Baroclinic),
	}
	for _, err := range checks {
		if err != nil {
			return err
		}
	}
	switch m.Polarity {
	case "", HighPoleward, LowPoleward:
	default:
		return &qg.FieldError{Field: p + ".polarity", Value: string(m.Polarity), Why: fmt.Sprintf("must be %q or %q", HighPoleward, LowPoleward)}
	}
	half := math.Min(cfg.Lx, cfg.Ly) / 2
	if 2*m.Radius > half {
		return &qg.FieldError{Field: p + ".radius", Value: m.Radius, Why: fmt.Sprintf("the modon's diameter %g m exceeds half the shorter domain length, %g m", 2*m.Radius, half)}
	}
	if cfg.Beta > 0 {
		pr := math.Sqrt(cfg.Beta / m.Speed)
		ratio := math.Exp(-pr*(half-m.Radius)) * besselKScaled(1, pr*half) / besselKScaled(1, pr*m.Radius)
		if ratio > farField {
			return &qg.FieldError{Field: p + ".speed", Value: m.Speed, Why: fmt.Sprintf("the outer field decays too slowly (e-folding √(c/β) = %.4g m): at half the shorter domain length it is still %.2g of its value at the radius; lower the speed or enlarge the domain", 1/pr, ratio)}
		}
	}
	return nil
}
