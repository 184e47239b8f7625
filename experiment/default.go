package experiment

import (
	"eddyblock/qg"
	"eddyblock/qg/block"
	"eddyblock/wavemaker"
)

// Default returns the built-in experiment, an invented mid-latitude
// scenario: a 20 000 km × 10 000 km doubly periodic β-plane at 256 × 128
// (78 km grid), two equal layers with Ld = 700 km and a weak, subcritical
// shear (U1 = 12, U2 = 6 m s⁻¹, against the two-layer critical shear
// 2βLd² ≈ 15.7 m s⁻¹, so eddies come from the wave source, not from
// baroclinic instability); a white-noise storm-track source in the upper
// layer on a patch 6000 km upstream of a warm blocking dipole (a high
// poleward, a low equatorward, 150 m lobes of 1000 km radius 2000 km apart,
// 40 % weaker in the lower layer) held by the forced mode; and a sponge band at the western edge, upstream of the
// source, that absorbs the eddies leaving the block region.
func Default() Config {
	m := qg.DefaultConfig()
	m.Nx, m.Ny = 256, 128
	m.Lx, m.Ly = 20e6, 10e6
	m.F0, m.Beta = 1e-4, 1.6e-11
	m.Ld, m.Delta = 7e5, 1
	m.U1, m.U2 = 12, 6
	m.Drag = 1 / (5 * 86400.0)
	m.Dissipation = qg.Dissipation{Kind: qg.CutoffFilter, FilterTime: 3 * 3600, FilterCutoff: 0.65, FilterOrder: 4}
	m.Sponge = qg.Sponge{Rate: 1 / (0.5 * 86400), Width: 3e6, X: 1.5e6}
	m.Dt = 900
	m.Scheme = qg.RK4
	m.MaxCFL = 1
	m.Workers = 1
	return Config{
		Name:  "storm-track-into-block",
		Model: m,
		Block: block.Config{
			Shape: block.DipoleShape,
			Mode:  qg.Forced,
			Dipole: block.Dipole{
				X: 11e6, Y: 5e6, Radius: 1e6, Separation: 2e6, Height: 150, Baroclinic: 0.4,
			},
		},
		Wavemaker: wavemaker.Config{
			Kind:          wavemaker.White,
			Mask:          wavemaker.MaskConfig{Kind: wavemaker.Patch, X: 5e6, Y: 5e6, WidthX: 1e6, WidthY: 7e5},
			Band:          wavemaker.BandConfig{Kind: wavemaker.TotalBand, MinWavelength: 2e6, MaxWavelength: 5e6},
			Vertical:      wavemaker.Upper,
			InjectionRate: 2e-5,
			Seed:          1,
		},
		Run: RunConfig{Days: 120, SpinUpDays: 30, ReportDays: 5, SampleSteps: 6},
	}
}
