package diag

import (
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// sampleWave feeds the accumulator nph states of the wave
// ψ_n = amp[n]·cos(kx + ly − ωt) at times spread evenly over one period.
func sampleWave(t *testing.T, m *qg.Model, a *Accumulator, cfg qg.Config, k, l, omega float64, amp [2]float64, nph int) {
	t.Helper()
	period := 2 * math.Pi / math.Abs(omega)
	for s := range nph {
		ts := float64(s) * period / float64(nph)
		var psi [2][]float64
		for n := range 2 {
			psi[n] = tstField(cfg, func(x, y float64) float64 { return amp[n] * math.Cos(k*x+l*y-omega*ts) })
		}
		if err := m.SetStreamfunction(psi); err != nil {
			t.Fatal(err)
		}
		setClock(t, m, ts)
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
	}
}

// A plane Rossby wave on a uniform flow carries no PV flux convergence: its
// PV varies in phase with its streamfunction in each layer, so u′q′ is along
// the phase lines and ∇·(u′q′) = u′·∇q′ = 0 (by hand; a single plane Rossby
// wave is an exact nonlinear solution, Pedlosky 1987). The frequencies are
// the two-layer Rossby dispersion relations of the barotropic and
// baroclinic modes for δ = 1 (Pedlosky 1987, from memory); the zero
// convergence holds for any frequency.
func TestPlaneRossbyWaveNoConvergence(t *testing.T) {
	cfg := tstConfig(32, 32)
	cfg.U1, cfg.U2 = 8, 8
	m := tstModel(t, cfg)
	ph := m.Physics()
	k, l := 2*math.Pi*3/cfg.Lx, 2*math.Pi*2/cfg.Ly
	k2 := k*k + l*l
	F := ph.F1 // = F2 for δ = 1
	for _, tc := range []struct {
		name  string
		amp   [2]float64
		omega float64
	}{
		{"barotropic", [2]float64{2e7, 2e7}, cfg.U1*k - cfg.Beta*k/k2},
		{"baroclinic", [2]float64{2e7, -2e7}, cfg.U1*k - cfg.Beta*k/(k2+2*F)},
		{"upper layer only (not a normal mode; still one plane wave)", [2]float64{2e7, 0}, cfg.U1*k - cfg.Beta*k/k2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := tstModel(t, cfg)
			a := tstNew(t, m, Options{})
			sampleWave(t, m, a, cfg, k, l, tc.omega, tc.amp, 12)
			f := a.Fields()
			A := math.Max(math.Abs(tc.amp[0]), math.Abs(tc.amp[1]))
			scale := k2 * (k2 + 2*F) * A * A // |∇|·|u′|·|q′|
			for _, name := range []string{"conv1", "conv2", "conv_vort1", "conv_vort2", "conv_interface1", "conv_interface2"} {
				if got := tstMaxAbs(tstGet(t, f, name)); got > 1e-12*scale {
					t.Errorf("%s: max |C| = %.3g, want 0 (scale %.3g)", name, got, scale)
				}
			}
			// the eddy KE is not zero: the test has eddies (½K²A²/2 per layer)
			if got, want := tstMaxAbs(tstGet(t, f, "eke1")), 0.25*k2*tc.amp[0]*tc.amp[0]; math.Abs(got-want) > 1e-10*want {
				t.Errorf("eke1 = %.6g, want ¼K²A² = %.6g", got, want)
			}
		})
	}
}

// A plane wave ψ′ = A cos(kx + ly − ωt) has, averaged over a period,
// u′² = l²A²/2, v′² = k²A²/2, u′v′ = −klA²/2 (by hand, u′ = −ψ′_y = lA sin θ,
// v′ = ψ′_x = −kA sin θ). With kl > 0 its phase lines run NW–SE, leaning
// against a shear ∂ū/∂y > 0: the momentum flux is southward (u′v′ < 0) and
// the E-vector E = (v′² − u′², −u′v′) = (A²/2)(k² − l², kl) (Hoskins, James
// & White 1983) points east for a meridionally elongated eddy (k > |l|) and
// north; the opposite tilt flips E_y and u′v′.
func TestTiltedWaveMomentumFluxAndEVector(t *testing.T) {
	cfg := tstConfig(32, 32)
	const A = 1.5e7
	for _, tc := range []struct {
		name string
		i, j int
	}{
		{"NW-SE tilt, against a positive shear", 3, 1},
		{"SW-NE tilt, with a positive shear", 3, -1},
		{"zonally elongated", 1, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := tstModel(t, cfg)
			a := tstNew(t, m, Options{})
			k, l := 2*math.Pi*float64(tc.i)/cfg.Lx, 2*math.Pi*float64(tc.j)/cfg.Ly
			omega := -cfg.Beta * k / (k*k + l*l)
			sampleWave(t, m, a, cfg, k, l, omega, [2]float64{A, A}, 8)
			f := a.Fields()
			want := map[string]float64{
				"uv1": -k * l * A * A / 2,
				"ex1": (k*k - l*l) * A * A / 2,
				"ey1": k * l * A * A / 2,
				"ex2": (k*k - l*l) * A * A / 2,
			}
			tol := 1e-10 * (k*k + l*l) * A * A
			for name, w := range want {
				x := tstGet(t, f, name)
				for i, v := range x {
					if math.Abs(v-w) > tol {
						t.Fatalf("%s at point %d = %.8g, want %.8g (hand formula)", name, i, v, w)
					}
				}
			}
			// the live route a display uses gives the same hand values
			live := make([]float64, cfg.Nx*cfg.Ny)
			for _, name := range []string{"ex1", "ey1", "ex2"} {
				if err := a.EddyField(name, live); err != nil {
					t.Fatal(err)
				}
				for i, v := range live {
					if math.Abs(v-want[name]) > tol {
						t.Fatalf("EddyField %s at point %d = %.8g, want %.8g (hand formula)", name, i, v, want[name])
					}
				}
			}
			ey := tstGet(t, f, "ey1")[0]
			if tc.j > 0 && !(ey > 0) || tc.j < 0 && !(ey < 0) {
				t.Errorf("E_y = %g has the wrong sign for the tilt", ey)
			}
		})
	}
}
