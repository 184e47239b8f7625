package block

import (
	"errors"
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

func testConfig() qg.Config {
	c := qg.DefaultConfig() // 16 000 × 8 000 km, 128 × 64
	return c
}

func goodDipole() Config {
	return Config{Shape: DipoleShape, Mode: qg.Forced, Dipole: Dipole{
		X: 8e6, Y: 4e6, Radius: 8e5, Separation: 1.5e6, Height: 200,
	}}
}

func goodModon() Config {
	return Config{Shape: ModonShape, Mode: qg.Forced, Modon: Modon{
		X: 8e6, Y: 4e6, Radius: 1e6, Speed: 4,
	}}
}

// Each bad value is reported as a *qg.FieldError naming its key (project
// convention: config errors name the key).
func TestConfigValidate(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		key string
		mod func(*Config)
	}{
		{"block.shape", func(c *Config) { c.Shape = "ring" }},
		{"block.mode", func(c *Config) { c.Mode = "held" }},
		{"block.relax_time", func(c *Config) { c.Mode = qg.Relaxed }},
		{"block.relax_time", func(c *Config) { c.Mode, c.RelaxTime = qg.Relaxed, -3600 }},
		{"block.linear", func(c *Config) { c.Linear = true }},
		{"block.dipole.x", func(c *Config) { c.Dipole.X = -1 }},
		{"block.dipole.x", func(c *Config) { c.Dipole.X = 17e6 }},
		{"block.dipole.y", func(c *Config) { c.Dipole.Y = nan }},
		{"block.dipole.y", func(c *Config) { c.Dipole.Y = 9e6 }},
		{"block.dipole.radius", func(c *Config) { c.Dipole.Radius = -8e5 }},
		{"block.dipole.radius", func(c *Config) { c.Dipole.Radius = 0 }},
		{"block.dipole.radius", func(c *Config) { c.Dipole.Radius = nan }},
		{"block.dipole.radius", func(c *Config) { c.Dipole.Radius = 2.5e6 }},
		{"block.dipole.separation", func(c *Config) { c.Dipole.Separation = -1 }},
		{"block.dipole.separation", func(c *Config) { c.Dipole.Separation = 6e6 }},
		{"block.dipole.height", func(c *Config) { c.Dipole.Height = 0 }},
		{"block.dipole.height", func(c *Config) { c.Dipole.Height = -200 }},
		{"block.dipole.height", func(c *Config) { c.Dipole.Height = math.Inf(1) }},
		{"block.dipole.psi", func(c *Config) { c.Dipole.Psi = 2e7 }},
		{"block.dipole.psi", func(c *Config) { c.Dipole.Height, c.Dipole.Psi = 0, nan }},
		{"block.dipole.baroclinic", func(c *Config) { c.Dipole.Baroclinic = 2.5 }},
		{"block.dipole.baroclinic", func(c *Config) { c.Dipole.Baroclinic = -0.1 }},
	} {
		bc := goodDipole()
		c.mod(&bc)
		checkKey(t, bc, testConfig(), c.key)
	}
	for _, c := range []struct {
		key string
		mod func(*Config)
	}{
		{"block.modon.x", func(c *Config) { c.Modon.X = nan }},
		{"block.modon.y", func(c *Config) { c.Modon.Y = -4e6 }},
		{"block.modon.radius", func(c *Config) { c.Modon.Radius = 0 }},
		{"block.modon.radius", func(c *Config) { c.Modon.Radius = 3e6 }},
		{"block.modon.speed", func(c *Config) { c.Modon.Speed = -4 }},
		{"block.modon.speed", func(c *Config) { c.Modon.Speed = 0 }},
		{"block.modon.speed", func(c *Config) { c.Modon.Speed = 200 }}, // far field too wide
		{"block.modon.polarity", func(c *Config) { c.Modon.Polarity = "north" }},
		{"block.modon.height", func(c *Config) { c.Modon.Height = -1 }},
		{"block.modon.psi", func(c *Config) { c.Modon.Height, c.Modon.Psi = 100, 1e7 }},
		{"block.modon.baroclinic", func(c *Config) { c.Modon.Baroclinic = nan }},
	} {
		bc := goodModon()
		c.mod(&bc)
		checkKey(t, bc, testConfig(), c.key)
	}
	// The model configuration is validated too, with its own keys.
	cfg := testConfig()
	cfg.Lx = -1
	checkKey(t, goodDipole(), cfg, "lx")
	// And good configurations pass.
	for _, bc := range []Config{goodDipole(), goodModon()} {
		if err := bc.Validate(testConfig()); err != nil {
			t.Errorf("%s: unexpected error %v", bc.Shape, err)
		}
	}
}

func checkKey(t *testing.T, bc Config, cfg qg.Config, key string) {
	t.Helper()
	err := bc.Validate(cfg)
	var fe *qg.FieldError
	if !errors.As(err, &fe) {
		t.Errorf("%s: want a *qg.FieldError, got %v", key, err)
		return
	}
	if fe.Field != key {
		t.Errorf("want an error on %s, got %v", key, err)
	}
	if _, err := bc.Block(cfg); err == nil {
		t.Errorf("%s: Block accepted a configuration that Validate rejects", key)
	}
}

// The dipole's amplitude as a geopotential height, Z = f0 ψ / g (the
// geostrophic relation; g = 9.80665 m s⁻², standard gravity by definition,
// CGPM 1901): with well-separated lobes the high's centre has Z = Height in
// the upper layer, the low's −Height, and the lower layer carries
// (1 − baroclinic) of it.
func TestDipoleAmplitudeAndStructure(t *testing.T) {
	cfg := testConfig()
	cfg.Nx, cfg.Ny = 64, 32 // dx = dy = 250 km
	d := Dipole{X: 8e6, Y: 4e6, Radius: 5e5, Separation: 3e6, Height: 150, Baroclinic: 0.4}
	psi, err := d.Streamfunction(cfg)
	if err != nil {
		t.Fatal(err)
	}
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	at := func(f []float64, x, y float64) float64 {
		return f[int(math.Round(y/g.Dy))*g.Nx+int(math.Round(x/g.Dx))]
	}
	z := func(p float64) float64 { return cfg.F0 * p / qg.Gravity }
	// The other lobe's tail at 3000 km is exp(−36): negligible.
	if e := math.Abs(z(at(psi[0], 8e6, 5.5e6)) - 150); e > 1e-9 {
		t.Errorf("Z at the high = %.12g m, want 150", z(at(psi[0], 8e6, 5.5e6)))
	}
	if e := math.Abs(z(at(psi[0], 8e6, 2.5e6)) + 150); e > 1e-9 {
		t.Errorf("Z at the low = %.12g m, want −150", z(at(psi[0], 8e6, 2.5e6)))
	}
	if e := math.Abs(at(psi[1], 8e6, 5.5e6) - 0.6*at(psi[0], 8e6, 5.5e6)); e > 1e-9 {
		t.Errorf("lower layer ψ2/ψ1 = %.6g, want 0.6", at(psi[1], 8e6, 5.5e6)/at(psi[0], 8e6, 5.5e6))
	}
	// Easterly between the lobes: u = −∂ψ/∂y < 0 at the centre.
	if u := -(at(psi[0], 8e6, 4.25e6) - at(psi[0], 8e6, 3.75e6)) / 5e5; u >= 0 {
		t.Errorf("u at the centre %.3g, want easterly", u)
	}
	// The same amplitude as ψ gives the same field.
	d2 := d
	d2.Height, d2.Psi = 0, 150*qg.Gravity/cfg.F0
	psi2, _ := d2.Streamfunction(cfg)
	for i := range psi2[0] {
		if math.Abs(psi2[0][i]-psi[0][i]) > 1e-9*math.Abs(d2.Psi) {
			t.Fatalf("ψ amplitude and height amplitude disagree at point %d", i)
		}
	}
}

// Periodicity: a block centred on the western edge is the same field as one
// centred mid-domain, translated by half the domain (translation invariance
// of the doubly periodic domain, common practice), for both shapes.
func TestShapesArePeriodic(t *testing.T) {
	cfg := testConfig()
	cfg.Nx, cfg.Ny = 64, 32
	g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
	for _, shape := range []Shape{DipoleShape, ModonShape} {
		mid, edge := goodDipole(), goodDipole()
		if shape == ModonShape {
			mid, edge = goodModon(), goodModon()
		}
		edge.Dipole.X, edge.Dipole.Y = 0, cfg.Ly
		edge.Modon.X, edge.Modon.Y = 0, cfg.Ly
		bm, err := mid.Block(cfg)
		if err != nil {
			t.Fatal(err)
		}
		be, err := edge.Block(cfg)
		if err != nil {
			t.Fatal(err)
		}
		var mx float64
		for _, v := range bm.Psi[0] {
			mx = math.Max(mx, math.Abs(v))
		}
		for y := range g.Ny {
			for x := range g.Nx {
				a := bm.Psi[0][y*g.Nx+x]
				b := be.Psi[0][((y+g.Ny/2)%g.Ny)*g.Nx+(x+g.Nx/2)%g.Nx]
				if math.Abs(a-b) > 1e-12*mx {
					t.Fatalf("%s: the edge-centred block differs from the translated mid-domain one at (%d, %d): %.6g vs %.6g", shape, x, y, b, a)
				}
			}
		}
	}
}
