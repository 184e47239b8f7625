package wavemaker

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// TestValidate checks that each bad value is refused with an error naming
// its key (the project's rule: configuration errors name the key; common
// practice). The domain is qg.DefaultConfig's: 16 000 km × 8000 km at
// 128 × 64, whose shortest retained wavelengths are 16e6/42 ≈ 381 km in x
// and 8e6/21 ≈ 381 km in y, and ≈ 269 km in total wavenumber (the corner).
func TestValidate(t *testing.T) {
	qc := qg.DefaultConfig()
	noise := DefaultConfig()
	red := DefaultConfig()
	red.Kind = Red
	train := DefaultConfig()
	train.Kind = WaveTrain
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		base Config
		edit func(c *Config)
		key  string
	}{
		{"unknown kind", noise, func(c *Config) { c.Kind = "blue" }, "wavemaker.kind"},
		{"empty kind", noise, func(c *Config) { c.Kind = "" }, "wavemaker.kind"},
		{"unknown vertical", noise, func(c *Config) { c.Vertical = "middle" }, "wavemaker.vertical"},
		{"unknown mask", noise, func(c *Config) { c.Mask.Kind = "circle" }, "wavemaker.mask.kind"},
		{"patch west of domain", noise, func(c *Config) { c.Mask.X = -1 }, "wavemaker.mask.x"},
		{"patch east of domain", noise, func(c *Config) { c.Mask.X = 2e7 }, "wavemaker.mask.x"},
		{"patch y NaN", noise, func(c *Config) { c.Mask.Y = nan }, "wavemaker.mask.y"},
		{"patch north of domain", noise, func(c *Config) { c.Mask.Y = 9e6 }, "wavemaker.mask.y"},
		{"zero width x", noise, func(c *Config) { c.Mask.WidthX = 0 }, "wavemaker.mask.width_x"},
		{"no patches", noise, func(c *Config) { c.Mask = MaskConfig{Kind: Patches} }, "wavemaker.mask.patches"},
		{"second patch outside", noise, func(c *Config) {
			c.Mask = MaskConfig{Kind: Patches, Patches: []PatchConfig{{1e6, 1e6, 5e5, 5e5}, {1e6, 9e6, 5e5, 5e5}}}
		}, "wavemaker.mask.patches[1].y"},
		{"second patch too wide", noise, func(c *Config) {
			c.Mask = MaskConfig{Kind: Patches, Patches: []PatchConfig{{1e6, 1e6, 5e5, 5e5}, {1e6, 2e6, 5e5, -1}}}
		}, "wavemaker.mask.patches[1].width_y"},
		{"wide patch x", noise, func(c *Config) { c.Mask.WidthX = 5e6 }, "wavemaker.mask.width_x"},
		{"negative width y", noise, func(c *Config) { c.Mask.WidthY = -1 }, "wavemaker.mask.width_y"},
		{"wide patch y", noise, func(c *Config) { c.Mask.WidthY = 3e6 }, "wavemaker.mask.width_y"},
		{"unknown band", noise, func(c *Config) { c.Band.Kind = "meridional" }, "wavemaker.band.kind"},
		{"zero min wavelength", noise, func(c *Config) { c.Band.MinWavelength = 0 }, "wavemaker.band.min_wavelength"},
		{"infinite max wavelength", noise, func(c *Config) { c.Band.MaxWavelength = inf }, "wavemaker.band.max_wavelength"},
		{"max below min", noise, func(c *Config) { c.Band.MaxWavelength = 1e6 }, "wavemaker.band.max_wavelength"},
		{"band too short", noise, func(c *Config) { c.Band.MinWavelength, c.Band.MaxWavelength = 1e5, 2.5e5 }, "wavemaker.band.max_wavelength"},
		{"band too long", noise, func(c *Config) { c.Band.MinWavelength, c.Band.MaxWavelength = 3e7, 4e7 }, "wavemaker.band.min_wavelength"},
		// 16e6/4.5 m falls between the zonal modes 4 and 5.
		{"band between modes", noise, func(c *Config) {
			c.Band = BandConfig{Kind: ZonalBand, MinWavelength: 16e6 / 4.6, MaxWavelength: 16e6 / 4.4}
		}, "wavemaker.band"},
		{"zero correlation time", red, func(c *Config) { c.CorrelationTime = 0 }, "wavemaker.correlation_time"},
		{"negative injection rate", noise, func(c *Config) { c.InjectionRate = -1e-5 }, "wavemaker.injection_rate"},
		{"NaN injection rate", red, func(c *Config) { c.InjectionRate = nan }, "wavemaker.injection_rate"},
		{"train wavelength NaN", train, func(c *Config) { c.Train.WavelengthX = nan }, "wavemaker.train.wavelength_x"},
		{"train without wavenumber", train, func(c *Config) { c.Train.WavelengthX, c.Train.WavelengthY = 0, 0 }, "wavemaker.train.wavelength_x"},
		{"train too short in x", train, func(c *Config) { c.Train.WavelengthX = 2e5 }, "wavemaker.train.wavelength_x"},
		{"train too short in y", train, func(c *Config) { c.Train.WavelengthY = -2e5 }, "wavemaker.train.wavelength_y"},
		{"train not periodic", train, func(c *Config) { c.Mask.Kind = NoMask; c.Train.WavelengthX = 3e6 }, "wavemaker.train.wavelength_x"},
		{"train y not periodic", train, func(c *Config) { c.Mask.Kind = NoMask; c.Train.WavelengthY = 3e6 }, "wavemaker.train.wavelength_y"},
		{"train frequency infinite", train, func(c *Config) { c.Train.Frequency = inf }, "wavemaker.train.frequency"},
		{"train zero amplitude", train, func(c *Config) { c.Train.Amplitude = 0 }, "wavemaker.train.amplitude"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			cfg := c.base
			c.edit(&cfg)
			err := cfg.ValidateFor(qc)
			var fe *qg.FieldError
			if !errors.As(err, &fe) {
				t.Fatalf("want a *qg.FieldError naming %s, got %v", c.key, err)
			}
			if fe.Field != c.key || !strings.Contains(err.Error(), c.key) {
				t.Errorf("error %q names %q, want %q", err, fe.Field, c.key)
			}
		})
	}
}

// TestValidateGood checks that valid configurations pass, including fields
// a kind does not use left at odd values.
func TestValidateGood(t *testing.T) {
	qc := qg.DefaultConfig()
	white := DefaultConfig()
	white.CorrelationTime = -1 // unused by white noise
	white.Train = TrainConfig{}
	train := DefaultConfig()
	train.Kind = WaveTrain
	train.Band = BandConfig{} // unused by the train
	train.InjectionRate = 0
	periodic := train
	periodic.Mask = MaskConfig{Kind: NoMask}
	periodic.Train.WavelengthX, periodic.Train.WavelengthY = 16e6/5, -8e6/3
	off := Config{Kind: Off}
	for i, c := range []Config{DefaultConfig(), white, train, periodic, off} {
		if err := c.ValidateFor(qc); err != nil {
			t.Errorf("case %d: %v", i, err)
		}
	}
}

// TestNew checks that New returns a source for the noises, a forcing for
// the train, and a no-op for "none", and refuses a bad configuration with a
// nil Maker.
func TestNew(t *testing.T) {
	m := newModel(t, qg.DefaultConfig())
	for _, c := range []struct {
		kind Kind
		ok   func(Maker) bool
	}{
		{White, func(w Maker) bool { _, ok := w.(qg.Source); return ok }},
		{Red, func(w Maker) bool { _, ok := w.(qg.Source); return ok }},
		{WaveTrain, func(w Maker) bool { _, ok := w.(qg.Forcing); return ok }},
		{Off, func(w Maker) bool { _, ok := w.(none); return ok }},
	} {
		cfg := DefaultConfig()
		cfg.Kind = c.kind
		w, err := New(cfg, m)
		if err != nil {
			t.Fatalf("%s: %v", c.kind, err)
		}
		if !c.ok(w) {
			t.Errorf("%s: New returned %T", c.kind, w)
		}
	}
	cfg := DefaultConfig()
	cfg.Band.MinWavelength = -1
	if w, err := New(cfg, m); err == nil || w != nil {
		t.Errorf("a bad band gave (%v, %v), want a nil Maker and an error", w, err)
	}
}
