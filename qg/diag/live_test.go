package diag

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// EddyField computes each eddy-forcing field alone: it must give the field
// of the same name from Fields (whose fluxes TestSplitAndTwoPassOnRandomFields
// checks against a two-pass computation), in the forced mode and in the
// fixed mode (whose eddy moments include the mean products); its vorticity
// and interface parts must add up to the whole convergence, since q′ = ζ′ +
// F_n(ψ_m − ψ_n)′ (the PV definition of package qg); and once its buffers
// exist it must not allocate.
func TestEddyField(t *testing.T) {
	for _, mode := range []qg.BlockMode{qg.Forced, qg.Fixed} {
		t.Run(string(mode), func(t *testing.T) {
			cfg := tstConfig(32, 16)
			cfg.Ly = 4e6
			m := tstModel(t, cfg)
			dip := tstDipole(cfg, 2e7, 7e5, 1e6, 4e6, 2e6)
			if err := m.SetBlock(qg.Block{Psi: [2][]float64{dip, dip}, Mode: mode}); err != nil {
				t.Fatal(err)
			}
			plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
			if err != nil {
				t.Fatal(err)
			}
			a := tstNew(t, m, Options{})
			np := cfg.Nx * cfg.Ny
			dst := make([]float64, np)
			if err := a.EddyField("zt1", dst); err != nil {
				t.Fatal(err)
			}
			rng := rand.New(rand.NewPCG(3, 4))
			base := tstRandomPsi(m.Grid(), rng, 3e6, 4)
			for s := range 12 {
				psi := tstRandomPsi(m.Grid(), rng, 1e6, 6)
				for n := range 2 {
					for p := range psi[n] {
						psi[n][p] += base[n][p]
					}
				}
				tstSetPsi(t, m, plan, psi)
				setClock(t, m, float64(s+1)*3600)
				if err := a.Sample(); err != nil {
					t.Fatal(err)
				}
			}
			f := a.Fields()
			// same computes one field with EddyField and compares it with
			// Fields' field of that name, to tol relative to its largest value
			same := func(name string, tol float64) []float64 {
				x := make([]float64, np)
				if err := a.EddyField(name, x); err != nil {
					t.Fatal(err)
				}
				want := tstGet(t, f, name)
				sc := tstMaxAbs(want)
				if sc == 0 {
					t.Fatalf("%s: degenerate test, the field is zero", name)
				}
				for i := range want {
					if math.Abs(x[i]-want[i]) > tol*sc {
						t.Fatalf("%s at %d: EddyField %.15g, Fields %.15g", name, i, x[i], want[i])
					}
				}
				return x
			}
			got := map[string][]float64{}
			for _, kind := range []string{"conv", "zt"} {
				for _, part := range []string{"", "_vort", "_interface"} {
					for _, L := range []string{"1", "2"} {
						got[kind+part+L] = same(kind+part+L, 1e-11)
					}
				}
			}
			// E-vectors and the mean streamfunction, for drawing the eddies
			// over the mean flow: the same as Fields' to rounding.
			for _, kind := range []string{"ex", "ey", "psi_mean"} {
				for _, L := range []string{"1", "2"} {
					same(kind+L, 1e-13)
				}
			}
			if n := testing.AllocsPerRun(5, func() {
				if err := a.EddyField("psi_mean1", dst); err != nil {
					t.Fatal(err)
				}
			}); n != 0 {
				t.Errorf("EddyField(psi_mean1) allocates %v times per call", n)
			}
			for _, kind := range []string{"conv", "zt"} {
				for _, L := range []string{"1", "2"} {
					c, cz, ci := got[kind+L], got[kind+"_vort"+L], got[kind+"_interface"+L]
					sc := tstMaxAbs(c)
					for i := range c {
						if math.Abs(cz[i]+ci[i]-c[i]) > 1e-11*sc {
							t.Fatalf("%s%s at %d: vorticity + interface parts %.15g, whole %.15g", kind, L, i, cz[i]+ci[i], c[i])
						}
					}
				}
			}
			if n := testing.AllocsPerRun(5, func() {
				if err := a.EddyField("zt_interface2", dst); err != nil {
					t.Fatal(err)
				}
			}); n != 0 {
				t.Errorf("EddyField allocates %v times per call", n)
			}
		})
	}
}

// Without samples EddyField gives zeros; a bad name or size is an error
// naming the problem.
func TestEddyFieldErrors(t *testing.T) {
	cfg := tstConfig(16, 16)
	m := tstModel(t, cfg)
	a := tstNew(t, m, Options{})
	dst := make([]float64, 16*16)
	for i := range dst {
		dst[i] = 1
	}
	if err := a.EddyField("conv_vort2", dst); err != nil {
		t.Fatal(err)
	}
	if tstMaxAbs(dst) != 0 {
		t.Errorf("without samples: max |field| = %g, want 0", tstMaxAbs(dst))
	}
	for _, c := range []struct {
		name string
		n    int
		want string
	}{
		{"conv3", 256, `"conv3"`},
		{"psit1", 256, `"psit1"`},
		{"zt_heat1", 256, `"zt_heat1"`},
		{"ex3", 256, `"ex3"`},
		{"psi_mean", 256, `"psi_mean"`},
		{"ez1", 256, `"ez1"`},
		{"", 256, `""`},
		{"conv1", 100, "100 points"},
	} {
		err := a.EddyField(c.name, make([]float64, c.n))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("EddyField(%q, %d points): error %v, want one containing %s", c.name, c.n, err, c.want)
		}
	}
}
