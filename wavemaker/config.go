package wavemaker

import (
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
)

// Kind selects what the wavemaker does.
type Kind string

// Wavemaker kinds.
const (
	// Off: no wavemaker.
	Off Kind = "none"
	// White: Gaussian noise, white in time (a Wiener increment per step).
	White Kind = "white"
	// Red: Gaussian noise, red in time (an Ornstein–Uhlenbeck process with
	// correlation time CorrelationTime, integrated exactly over each step).
	Red Kind = "red"
	// WaveTrain: a deterministic localised wave train of set wavenumber and
	// frequency, a smooth PV tendency evaluated at every stage.
	WaveTrain Kind = "wavetrain"
)

// MaskKind selects the spatial mask.
type MaskKind string

// Spatial masks.
const (
	// NoMask: the forcing covers the whole domain (m = 1).
	NoMask MaskKind = "none"
	// Patch: a Gaussian patch m = exp(−(dx/wx)² − (dy/wy)²), with dx, dy
	// the periodic distances to the centre.
	Patch MaskKind = "patch"
	// Patches: a sum of Gaussian patches, each as in Patch, listed in
	// MaskConfig.Patches (for example a storm track split in two branches).
	Patches MaskKind = "patches"
)

// BandKind selects how the wavenumber band is measured.
type BandKind string

// Wavenumber bands.
const (
	// TotalBand selects modes by total wavenumber K = √(k² + l²).
	TotalBand BandKind = "total"
	// ZonalBand selects modes by zonal wavenumber |k| (any l).
	ZonalBand BandKind = "zonal"
)

// Vertical is the vertical structure of the forcing.
type Vertical string

// Vertical structures. Each is a fixed vector (v1, v2) multiplying the same
// scalar PV pattern in the two layers.
const (
	// Upper forces the upper layer only: (1, 0).
	Upper Vertical = "upper"
	// Lower forces the lower layer only: (0, 1).
	Lower Vertical = "lower"
	// Barotropic forces the same streamfunction in both layers, ψ1 = ψ2:
	// equal PV, (1, 1).
	Barotropic Vertical = "barotropic"
	// Baroclinic forces the mode with no depth-integrated flow,
	// H1ψ1 + H2ψ2 = 0: q2 = −δ q1, (1, −δ) with δ = H1/H2.
	Baroclinic Vertical = "baroclinic"
)

// MaskConfig is the spatial mask.
type MaskConfig struct {
	Kind MaskKind `toml:"kind" json:"kind"`
	// X, Y: the patch centre, m from the western and southern edges.
	X float64 `toml:"x" json:"x"`
	Y float64 `toml:"y" json:"y"`
	// WidthX, WidthY: the patch's e-folding half-widths, m. Each must be
	// at most a quarter of the domain length, so that the patch is small
	// at the periodic antipode (m ≤ e⁻⁴ there).
	WidthX float64 `toml:"width_x" json:"width_x"`
	WidthY float64 `toml:"width_y" json:"width_y"`
	// Patches lists the patches of the mask kind "patches".
	Patches []PatchConfig `toml:"patches" json:"patches,omitempty"`
}

// PatchConfig is one Gaussian patch of a "patches" mask.
type PatchConfig struct {
	X      float64 `toml:"x" json:"x"`             // centre, m from the western edge
	Y      float64 `toml:"y" json:"y"`             // centre, m from the southern edge
	WidthX float64 `toml:"width_x" json:"width_x"` // e-folding half-width in x, m
	WidthY float64 `toml:"width_y" json:"width_y"` // e-folding half-width in y, m
}

// patches returns the mask's patches: the single patch of kind "patch", the
// list of kind "patches", none otherwise, with the keys that name them.
func (mk MaskConfig) patches() ([]PatchConfig, []string) {
	switch mk.Kind {
	case Patch:
		return []PatchConfig{{mk.X, mk.Y, mk.WidthX, mk.WidthY}}, []string{"mask."}
	case Patches:
		keys := make([]string, len(mk.Patches))
		for i := range keys {
			keys[i] = fmt.Sprintf("mask.patches[%d].", i)
		}
		return mk.Patches, keys
	}
	return nil, nil
}

// BandConfig is the wavenumber band of the noise, as a range of wavelengths.
// A mode is forced when its wavelength 2π/K (TotalBand) or 2π/|k|
// (ZonalBand) lies in [MinWavelength, MaxWavelength]. The mean (K = 0) is
// never forced.
type BandConfig struct {
	Kind          BandKind `toml:"kind" json:"kind"`
	MinWavelength float64  `toml:"min_wavelength" json:"min_wavelength"` // m
	MaxWavelength float64  `toml:"max_wavelength" json:"max_wavelength"` // m
}

// TrainConfig is the deterministic wave train, a PV tendency
//
//	W_n = v_n · A · m(x, y) · cos(kx + ly − ωt),
//
// with k = 2π/WavelengthX, l = 2π/WavelengthY (a zero wavelength means a zero
// wavenumber; a negative one a negative wavenumber), truncated to the modes
// the model retains.
type TrainConfig struct {
	WavelengthX float64 `toml:"wavelength_x" json:"wavelength_x"` // m
	WavelengthY float64 `toml:"wavelength_y" json:"wavelength_y"` // m
	// Frequency is ω, rad s⁻¹; ω/k > 0 moves the phase lines east.
	Frequency float64 `toml:"frequency" json:"frequency"`
	// Amplitude A is the peak PV tendency (at the mask's peak, for the upper
	// layer or the layer forced), s⁻².
	Amplitude float64 `toml:"amplitude" json:"amplitude"`
}

// Config configures a wavemaker. All quantities are SI. Fields a kind does
// not use are ignored (and not validated): the band, injection rate and seed
// for the wave train, the train for the noises, the correlation time for
// white noise.
type Config struct {
	Kind Kind       `toml:"kind" json:"kind"`
	Mask MaskConfig `toml:"mask" json:"mask"`
	Band BandConfig `toml:"band" json:"band"`
	// CorrelationTime τ of red noise, s.
	CorrelationTime float64  `toml:"correlation_time" json:"correlation_time"`
	Vertical        Vertical `toml:"vertical" json:"vertical"`
	// InjectionRate is the target energy injection rate ε of the noise,
	// m² s⁻³ (per unit mass, domain mean). For white noise it is the exact
	// expected rate; for red noise it is the rate in the limit of short
	// correlation time (see the package documentation).
	InjectionRate float64     `toml:"injection_rate" json:"injection_rate"`
	Seed          uint64      `toml:"seed" json:"seed"`
	Train         TrainConfig `toml:"train" json:"train"`
}

// DefaultConfig returns white noise in the upper layer on a patch upstream
// in the domain of qg.DefaultConfig (centre 4000 km east, 4000 km north,
// half-widths 1500 km × 1000 km), in the synoptic band of wavelengths
// 1500–5000 km, injecting 5 × 10⁻⁵ m² s⁻³. The values are illustrative.
func DefaultConfig() Config {
	return Config{
		Kind: White,
		Mask: MaskConfig{Kind: Patch, X: 4e6, Y: 4e6, WidthX: 1.5e6, WidthY: 1e6},
		Band: BandConfig{Kind: TotalBand, MinWavelength: 1.5e6, MaxWavelength: 5e6},
		// Used only by kind red.
		CorrelationTime: 2 * 86400,
		Vertical:        Upper,
		InjectionRate:   5e-5,
		Seed:            1,
		Train:           TrainConfig{WavelengthX: 4e6, WavelengthY: 0, Frequency: 2 * math.Pi / (4 * 86400), Amplitude: 1e-10},
	}
}

// prefix is the table the wavemaker's keys live under in a configuration
// file.
const prefix = "wavemaker."

func fieldErr(key string, v any, format string, args ...any) error {
	return &qg.FieldError{Field: prefix + key, Value: v, Why: fmt.Sprintf(format, args...)}
}

func isFinite(v float64) bool { return check.IsFinite(v) }

func positive(key string, v float64) error { return check.Positive(prefix+key, v) }

// Validate checks the configuration on its own and returns the first
// problem found as a *qg.FieldError naming the key (for example
// "wavemaker.band.min_wavelength"). ValidateFor also checks it against a
// model's domain and grid.
func (c *Config) Validate() error {
	switch c.Kind {
	case Off:
		return nil
	case White, Red, WaveTrain:
	default:
		return fieldErr("kind", string(c.Kind), `must be "white", "red", "wavetrain" or "none"`)
	}
	switch c.Vertical {
	case Upper, Lower, Barotropic, Baroclinic:
	default:
		return fieldErr("vertical", string(c.Vertical), `must be "upper", "lower", "barotropic" or "baroclinic"`)
	}
	if c.Seed > math.MaxInt64 {
		return fieldErr("seed", c.Seed, "must be from 0 to 2⁶³ − 1 (a negative number in a file reads as a huge one)")
	}
	mk := c.Mask
	switch mk.Kind {
	case NoMask:
	case Patch, Patches:
		if mk.Kind == Patches && len(mk.Patches) == 0 {
			return fieldErr("mask.patches", 0, `a mask of kind "patches" needs at least one patch`)
		}
		ps, keys := mk.patches()
		for i, p := range ps {
			for _, f := range []struct {
				key string
				v   float64
			}{{keys[i] + "x", p.X}, {keys[i] + "y", p.Y}} {
				if !isFinite(f.v) || f.v < 0 {
					return fieldErr(f.key, f.v, "the patch centre must be a finite coordinate in the domain, 0 or greater")
				}
			}
			if err := positive(keys[i]+"width_x", p.WidthX); err != nil {
				return err
			}
			if err := positive(keys[i]+"width_y", p.WidthY); err != nil {
				return err
			}
		}
	default:
		return fieldErr("mask.kind", string(mk.Kind), `must be "none", "patch" or "patches"`)
	}
	if c.Kind == WaveTrain {
		tr := c.Train
		if !isFinite(tr.WavelengthX) {
			return fieldErr("train.wavelength_x", tr.WavelengthX, "must be a finite number (0 for a zero zonal wavenumber)")
		}
		if !isFinite(tr.WavelengthY) {
			return fieldErr("train.wavelength_y", tr.WavelengthY, "must be a finite number (0 for a zero meridional wavenumber)")
		}
		if tr.WavelengthX == 0 && tr.WavelengthY == 0 {
			return fieldErr("train.wavelength_x", tr.WavelengthX, "wavelength_x and wavelength_y are both zero: the train needs a nonzero wavenumber")
		}
		if !isFinite(tr.Frequency) {
			return fieldErr("train.frequency", tr.Frequency, "must be a finite angular frequency, rad s⁻¹")
		}
		return positive("train.amplitude", tr.Amplitude)
	}
	// Noise.
	b := c.Band
	switch b.Kind {
	case TotalBand, ZonalBand:
	default:
		return fieldErr("band.kind", string(b.Kind), `must be "total" or "zonal"`)
	}
	if err := positive("band.min_wavelength", b.MinWavelength); err != nil {
		return err
	}
	if err := positive("band.max_wavelength", b.MaxWavelength); err != nil {
		return err
	}
	if b.MaxWavelength < b.MinWavelength {
		return fieldErr("band.max_wavelength", b.MaxWavelength, "must not be below band.min_wavelength = %g m", b.MinWavelength)
	}
	if c.Kind == Red {
		if err := positive("correlation_time", c.CorrelationTime); err != nil {
			return err
		}
	}
	return positive("injection_rate", c.InjectionRate)
}

// ValidateFor checks the configuration as Validate does and then against
// the domain and grid of the model configuration qc: the patch must lie in
// the domain and be narrow enough, the band must hold at least one mode the
// model retains, and the wave train's wavenumber must be resolved (and, with
// no mask, fit the periodic domain).
func (c *Config) ValidateFor(qc qg.Config) error {
	if err := c.Validate(); err != nil {
		return err
	}
	if c.Kind == Off {
		return nil
	}
	if err := qc.Validate(); err != nil {
		return fmt.Errorf("wavemaker: the model configuration is invalid: %w", err)
	}
	ps, keys := c.Mask.patches()
	for i, p := range ps {
		if p.X > qc.Lx {
			return fieldErr(keys[i]+"x", p.X, "the patch centre lies outside the domain, 0 to lx = %g m", qc.Lx)
		}
		if p.Y > qc.Ly {
			return fieldErr(keys[i]+"y", p.Y, "the patch centre lies outside the domain, 0 to ly = %g m", qc.Ly)
		}
		if p.WidthX > qc.Lx/4 {
			return fieldErr(keys[i]+"width_x", p.WidthX, "must be at most a quarter of the domain length lx = %g m", qc.Lx)
		}
		if p.WidthY > qc.Ly/4 {
			return fieldErr(keys[i]+"width_y", p.WidthY, "must be at most a quarter of the domain length ly = %g m", qc.Ly)
		}
	}
	g := qg.NewGrid(qc.Nx, qc.Ny, qc.Lx, qc.Ly)
	if c.Kind == WaveTrain {
		return c.checkTrain(g)
	}
	if n := len(bandModes(g, c.Band)); n == 0 {
		return c.emptyBand(g)
	}
	return nil
}

// emptyBand explains why the band holds no retained mode, naming the key to
// change.
func (c *Config) emptyBand(g *qg.Grid) error {
	b := c.Band
	kmax, lmax := g.MaxKeptK()
	var shortest, longest float64
	switch b.Kind {
	case ZonalBand:
		shortest, longest = 2*math.Pi/kmax, g.Lx
	default:
		shortest, longest = 2*math.Pi/math.Hypot(kmax, lmax), math.Max(g.Lx, g.Ly)
	}
	if b.MaxWavelength < shortest {
		return fieldErr("band.max_wavelength", b.MaxWavelength,
			"the band holds no resolved mode: its longest wavelength is below the shortest the model retains, %.4g m", shortest)
	}
	if b.MinWavelength > longest {
		return fieldErr("band.min_wavelength", b.MinWavelength,
			"the band holds no resolved mode: its shortest wavelength exceeds the longest of the domain, %.4g m", longest)
	}
	return fieldErr("band", fmt.Sprintf("%s %g–%g m", b.Kind, b.MinWavelength, b.MaxWavelength),
		"the band holds no retained mode of the %d×%d grid: widen it", g.Nx, g.Ny)
}

// checkTrain checks that the wave train's wavenumbers are resolved and,
// without a mask, periodic in the domain.
func (c *Config) checkTrain(g *qg.Grid) error {
	tr := c.Train
	kmax, lmax := g.MaxKeptK()
	k, l := waveNumber(tr.WavelengthX), waveNumber(tr.WavelengthY)
	if math.Abs(k) > kmax {
		return fieldErr("train.wavelength_x", tr.WavelengthX, "shorter than the shortest zonal wavelength the model retains, %.4g m", 2*math.Pi/kmax)
	}
	if math.Abs(l) > lmax {
		return fieldErr("train.wavelength_y", tr.WavelengthY, "shorter than the shortest meridional wavelength the model retains, %.4g m", 2*math.Pi/lmax)
	}
	if c.Mask.Kind == NoMask {
		for _, f := range []struct {
			key  string
			w, L float64
		}{{"train.wavelength_x", tr.WavelengthX, g.Lx}, {"train.wavelength_y", tr.WavelengthY, g.Ly}} {
			if f.w == 0 {
				continue
			}
			r := f.L / math.Abs(f.w)
			if math.Abs(r-math.Round(r)) > 1e-6*r {
				return fieldErr(f.key, f.w, "without a mask the train must be periodic: the domain length %g m holds %.6g wavelengths, not a whole number", f.L, r)
			}
		}
	}
	return nil
}

// waveNumber returns 2π/λ, or 0 for λ = 0.
func waveNumber(lambda float64) float64 {
	if lambda == 0 {
		return 0
	}
	return 2 * math.Pi / lambda
}
