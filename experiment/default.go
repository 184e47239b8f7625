package experiment

import (
	"fmt"
	"strings"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// Default returns the built-in experiment, an invented mid-latitude
// scenario in which a train of synoptic waves runs into a blocking dipole
// and is strained by it: a 20 000 km × 10 000 km doubly periodic β-plane at
// 256 × 128 (78 km grid), two equal layers with Ld = 700 km and a
// subcritical shear (U1 = 16, U2 = 4 m s⁻¹, against the two-layer critical
// shear 2βLd² ≈ 15.7 m s⁻¹ for U1 − U2, so eddies grow only transiently and
// come from the wave source, not from baroclinic instability). A warm
// blocking dipole (a high poleward, a low equatorward: 150 m lobes of
// 1500 km radius 3000 km apart, 40 % weaker in the lower layer) is held by
// the forced mode at x = 11 000 km. A barotropic wave maker 2500 km upstream
// of the block, on its axis and 2500 km wide, forces meridionally uniform
// waves of 1500 km wavelength travelling east at 10 m s⁻¹ (period 1.7
// days); the block's diffluent entrance squeezes them zonally and stretches
// them meridionally. A sponge band 6000 km wide from 3000 km downstream of
// the block to the western edge absorbs the eddies that have passed the
// block before they wrap around. The eddies' projections on the block use
// the plain mass-weighted ψ inner product.
//
// In the same place a stochastic source (white noise over a broad band of
// scales) erodes the block instead, and so does a stochastic storm track
// aimed at the block's centre; one that runs along the two branches of the
// split flow is StormTrack. See the README for what each does to the block.
func Default() Config {
	c := StormTrack()
	c.Name = "wave-train-strained-by-block"
	c.Wavemaker = wavemaker.Config{
		Kind:     wavemaker.WaveTrain,
		Mask:     wavemaker.MaskConfig{Kind: wavemaker.Patch, X: 8.5e6, Y: 5e6, WidthX: 1e6, WidthY: 2.5e6},
		Vertical: wavemaker.Barotropic,
		Train:    wavemaker.TrainConfig{WavelengthX: 1.5e6, Frequency: 4.2e-5, Amplitude: 5e-10},
		Seed:     1,
	}
	return c
}

// StormTrack returns a built-in experiment with a stochastic storm track
// that ends at the block: Default's model, block and sponge, with white-noise
// synoptic eddies (wavelengths 1000–2500 km, barotropic, 10⁻⁵ m² s⁻³ in all)
// injected 3500 km upstream of the block in two patches on the two branches
// of the flow that splits around it (the latitude of each lobe's far flank).
func StormTrack() Config {
	m := qg.DefaultConfig()
	m.Nx, m.Ny = 256, 128
	m.Lx, m.Ly = 20e6, 10e6
	m.F0, m.Beta = 1e-4, 1.6e-11
	m.Ld, m.Delta = 7e5, 1
	m.U1, m.U2 = 16, 4
	m.Drag = 1 / (5 * 86400.0)
	m.ScaleSelective = qg.ScaleSelective{Kind: qg.CutoffFilter, FilterTime: 3 * 3600, FilterCutoff: 0.65, FilterOrder: 4}
	m.Sponge = qg.Sponge{Rate: 1 / (0.5 * 86400), Width: 6e6, X: 17e6}
	m.Dt = 900
	m.Scheme = qg.RK4
	m.MaxCFL = 1
	m.Workers = 1
	return Config{
		Name:  "storm-track-ending-at-block",
		Model: m,
		Block: block.Config{
			Shape: block.DipoleShape,
			Mode:  qg.Forced,
			Dipole: block.Dipole{
				X: 11e6, Y: 5e6, Radius: 1.5e6, Separation: 3e6, Height: 150, Baroclinic: 0.4,
			},
		},
		Wavemaker: wavemaker.Config{
			Kind: wavemaker.White,
			Mask: wavemaker.MaskConfig{Kind: wavemaker.Patches, Patches: []wavemaker.PatchConfig{
				{X: 7.5e6, Y: 8e6, WidthX: 1e6, WidthY: 7e5},
				{X: 7.5e6, Y: 2e6, WidthX: 1e6, WidthY: 7e5},
			}},
			Band:          wavemaker.BandConfig{Kind: wavemaker.TotalBand, MinWavelength: 1e6, MaxWavelength: 2.5e6},
			Vertical:      wavemaker.Barotropic,
			InjectionRate: 1e-5,
			Seed:          1,
		},
		Run:  RunConfig{Days: 120, SpinUpDays: 30, ReportDays: 10, SampleSteps: 6, SnapshotDays: 2},
		Diag: DiagConfig{Norm: diag.LayerNorm},
	}
}

// Builtin returns the built-in experiment of the given name: Default's or
// StormTrack's (their Name fields).
func Builtin(name string) (Config, error) {
	var names []string
	for _, c := range Builtins() {
		if c.Name == name {
			return c, nil
		}
		names = append(names, fmt.Sprintf("%q", c.Name))
	}
	return Config{}, fmt.Errorf("experiment: no built-in experiment %q (there are %s)", name, strings.Join(names, ", "))
}

// Builtins returns every built-in experiment: Default, StormTrack and
// WhiteNoiseControl.
func Builtins() []Config { return []Config{Default(), StormTrack(), WhiteNoiseControl()} }

// WhiteNoiseControl returns the control of the default experiment: the
// same model, block, place and size of the wave source, but incoherent
// stirring — white noise over wavelengths of 1000–2500 km injecting
// 10⁻⁵ m² s⁻³ — instead of a coherent wave train. It erodes the block.
func WhiteNoiseControl() Config {
	c := Default()
	c.Name = "white-noise-control"
	c.Wavemaker.Kind = wavemaker.White
	c.Wavemaker.Band = wavemaker.BandConfig{Kind: wavemaker.TotalBand, MinWavelength: 1e6, MaxWavelength: 2.5e6}
	c.Wavemaker.InjectionRate = 1e-5
	return c
}
