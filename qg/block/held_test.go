package block_test

import (
	"encoding/json"
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
)

// A modon-shaped block with the orientation of a block (high poleward),
// scaled to a 120 m high, in the default westerlies with shear, β, drag and
// the cutoff filter: it is not a free solution there (Haines & Marshall
// 1987, Q. J. R. Meteorol. Soc. 113, hold such a block with a steady
// forcing), and the forced mode keeps it exactly steady while the free
// mode lets it go (the control).
func TestModonBlockHeldByForcedMode(t *testing.T) {
	cfg := qg.DefaultConfig()
	bc := block.Config{Shape: block.ModonShape, Modon: block.Modon{
		X: 8e6, Y: 4e6, Radius: 1e6, Speed: 4, Height: 120,
	}}
	for _, mode := range []qg.BlockMode{qg.Forced, qg.Free} {
		bc.Mode = mode
		b, err := bc.Block(cfg)
		if err != nil {
			t.Fatal(err)
		}
		// The high is poleward, at the requested height.
		g := qg.NewGrid(cfg.Nx, cfg.Ny, cfg.Lx, cfg.Ly)
		var zmax, ymax float64
		for i, v := range b.Psi[0] {
			if z := cfg.F0 * v / qg.Gravity; z > zmax {
				zmax, ymax = z, g.Y(i/cfg.Nx)
			}
		}
		if ymax <= bc.Modon.Y || zmax > 120*(1+1e-9) || zmax < 115 {
			t.Errorf("the high peaks at %.4g m, y = %.0f km; want ≈ 120 m poleward of y_b", zmax, ymax/1e3)
		}
		m, err := qg.NewModel(cfg)
		if err != nil {
			t.Fatal(err)
		}
		if err := m.SetBlock(b); err != nil {
			t.Fatal(err)
		}
		qbv, _ := m.BlockPV()
		qb := [2][]complex128{append([]complex128(nil), qbv[0]...), append([]complex128(nil), qbv[1]...)}
		if err := m.Run(200); err != nil {
			t.Fatal(err)
		}
		var num, den float64
		for n := range 2 {
			d := make([]complex128, len(qb[n]))
			for p := range d {
				d[p] = m.SpectralPV()[n][p] - qb[n][p]
			}
			num += g.Inner(d, d)
			den += g.Inner(qb[n], qb[n])
		}
		drift := math.Sqrt(num / den)
		t.Logf("%s modon block after 200 steps: ‖q − q_B‖/‖q_B‖ = %.3g", mode, drift)
		if mode == qg.Forced && drift > 1e-9 {
			t.Errorf("forced modon block drifted by %.3g", drift)
		}
		if mode == qg.Free && drift < 1e-2 {
			t.Errorf("control: the free modon block drifted by only %.3g", drift)
		}
	}
}

// The configuration decodes from snake_case keys (encoding/json, the same
// tags serve TOML).
func TestConfigDecodesJSON(t *testing.T) {
	const doc = `{"shape": "dipole", "mode": "relaxed", "relax_time": 432000,
	  "dipole": {"x": 8e6, "y": 4e6, "radius": 8e5, "separation": 1.6e6, "height": 180, "baroclinic": 0.3},
	  "modon": {"x": 1, "y": 2, "radius": 3, "speed": 4, "polarity": "low_poleward", "psi": 5}}`
	var c block.Config
	if err := json.Unmarshal([]byte(doc), &c); err != nil {
		t.Fatal(err)
	}
	want := block.Config{Shape: block.DipoleShape, Mode: qg.Relaxed, RelaxTime: 432000,
		Dipole: block.Dipole{X: 8e6, Y: 4e6, Radius: 8e5, Separation: 1.6e6, Height: 180, Baroclinic: 0.3},
		Modon:  block.Modon{X: 1, Y: 2, Radius: 3, Speed: 4, Polarity: block.LowPoleward, Psi: 5}}
	if c != want {
		t.Errorf("decoded %+v, want %+v", c, want)
	}
	if err := c.Validate(qg.DefaultConfig()); err != nil {
		t.Errorf("valid decoded configuration rejected: %v", err)
	}
}
