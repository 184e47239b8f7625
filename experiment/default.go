package experiment

import (
	"eddyblock/qg"
	"eddyblock/qg/block"
	"eddyblock/wavemaker"
)

// Default returns the built-in experiment, an invented mid-latitude
// scenario: a 20 000 km × 10 000 km doubly periodic β-plane at 256 × 128
// (78 km grid), two equal layers with Ld = 700 km and a subcritical shear
// (U1 = 16, U2 = 4 m s⁻¹, against the two-layer critical shear
// 2βLd² ≈ 15.7 m s⁻¹ for U1 − U2, so eddies grow only transiently and come
// from the wave source, not from baroclinic instability). A warm blocking
// dipole (a high poleward, a low equatorward: 150 m lobes of 1500 km radius
// 3000 km apart, 40 % weaker in the lower layer) is held by the forced mode
// at x = 11 000 km. A storm track of synoptic eddies ends at the block: a
// white-noise source (wavelengths 1000–2500 km, barotropic, 10⁻⁵ m² s⁻³ in
// all) 3500 km upstream of the block, split in two patches on the two
// branches of the flow that splits around it (the latitude of each lobe's
// far flank), and a sponge band 6000 km wide from 3000 km downstream of the
// block to the western edge, which absorbs the eddies that have passed the
// block before they wrap around to the source.
//
// A storm track aimed at the block's centre instead (one patch on the
// block's axis) erodes the block in this model: its eddy-driven westerlies
// fill the easterlies between the lobes (see the README).
func Default() Config {
	m := qg.DefaultConfig()
	m.Nx, m.Ny = 256, 128
	m.Lx, m.Ly = 20e6, 10e6
	m.F0, m.Beta = 1e-4, 1.6e-11
	m.Ld, m.Delta = 7e5, 1
	m.U1, m.U2 = 16, 4
	m.Drag = 1 / (5 * 86400.0)
	m.Dissipation = qg.Dissipation{Kind: qg.CutoffFilter, FilterTime: 3 * 3600, FilterCutoff: 0.65, FilterOrder: 4}
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
		Run: RunConfig{Days: 120, SpinUpDays: 30, ReportDays: 10, SampleSteps: 6},
	}
}
