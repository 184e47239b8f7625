package diag

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// tstGridded returns gridded ψ, u, v, q of layer n for spectral ψ, computed
// independently of the package: spectral derivatives from the domain's
// wavenumbers and the PV definition of package qg, q1 = ∇²ψ1 + F1(ψ2 − ψ1).
func tstGridded(g *qg.Grid, ph qg.Physics, plan *fft.Plan2D, psi [2][]complex128, n int) (p, u, v, q []float64) {
	ns, np := g.Len(), g.Nx*g.Ny
	s := make([]complex128, ns)
	out := func(f func(i, j int, z complex128) complex128) []float64 {
		for idx := range s {
			s[idx] = f(idx%g.Nkx, idx/g.Nkx, psi[n][idx])
		}
		x := make([]float64, np)
		plan.Inverse(x, s)
		return x
	}
	kx := func(i int) float64 { return 2 * math.Pi * float64(i) / g.Lx }
	ly := func(j int) float64 {
		if j > g.Ny/2 {
			j -= g.Ny
		}
		return 2 * math.Pi * float64(j) / g.Ly
	}
	p = out(func(i, j int, z complex128) complex128 { return z })
	u = out(func(i, j int, z complex128) complex128 { return complex(0, -ly(j)) * z })
	v = out(func(i, j int, z complex128) complex128 { return complex(0, kx(i)) * z })
	lap := out(func(i, j int, z complex128) complex128 { return complex(-(kx(i)*kx(i)+ly(j)*ly(j)), 0) * z })
	other := make([]float64, np)
	plan.Inverse(other, psi[1-n])
	F := ph.F1
	if n == 1 {
		F = ph.F2
	}
	q = make([]float64, np)
	for i := range q {
		q[i] = lap[i] + F*(other[i]-p[i])
	}
	return
}

// On random fields: (i) the eddy fluxes agree with a two-pass computation
// (the mean first, then the mean product of departures: the independent
// reference of Chan, Golub & LeVeque 1983) from fields built by the test
// itself; (ii) the relative-vorticity and interface parts of the PV flux
// convergence add up to the total, which the Accumulator takes from the
// model's own PV (so the sum is a check, not an identity of the code);
// (iii) the PV of ψ_t is the convergence (the inversion of package qg).
func TestSplitAndTwoPassOnRandomFields(t *testing.T) {
	cfg := tstConfig(32, 32)
	m := tstModel(t, cfg)
	g, ph := m.Grid(), m.Physics()
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{})
	rng := rand.New(rand.NewPCG(1, 2))
	const ns = 40
	np := cfg.Nx * cfg.Ny
	// a large steady part plus fluctuations, so that the means matter
	base := tstRandomPsi(g, rng, 5e6, 6)
	var us, vs, qs [ns][2][]float64
	for s := range ns {
		psi := tstRandomPsi(g, rng, 1e6, 8)
		for n := range 2 {
			for p := range psi[n] {
				psi[n][p] += base[n][p]
			}
		}
		tstSetPsi(t, m, plan, psi)
		setClock(t, m, float64(s)*3600)
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
		got := m.SpectralStreamfunction()
		for n := range 2 {
			_, us[s][n], vs[s][n], qs[s][n] = tstGridded(g, ph, plan, got, n)
		}
	}
	f := a.Fields()
	for n := range 2 {
		// two-pass reference of u′q′ and v′q′
		mu, mv, mq := make([]float64, np), make([]float64, np), make([]float64, np)
		for s := range ns {
			for i := range np {
				mu[i] += us[s][n][i] / ns
				mv[i] += vs[s][n][i] / ns
				mq[i] += qs[s][n][i] / ns
			}
		}
		uq, vq := make([]float64, np), make([]float64, np)
		for s := range ns {
			for i := range np {
				uq[i] += (us[s][n][i] - mu[i]) * (qs[s][n][i] - mq[i]) / ns
				vq[i] += (vs[s][n][i] - mv[i]) * (qs[s][n][i] - mq[i]) / ns
			}
		}
		L := string(rune('1' + n))
		for name, want := range map[string][]float64{"uq" + L: uq, "vq" + L: vq, "u_mean" + L: mu, "q_mean" + L: mq} {
			got := tstGet(t, f, name)
			sc := tstMaxAbs(want)
			for i := range want {
				if math.Abs(got[i]-want[i]) > 1e-12*sc {
					t.Fatalf("%s at %d: %.15g, two-pass %.15g", name, i, got[i], want[i])
				}
			}
		}
		// the split
		c, cz, ci := tstGet(t, f, "conv"+L), tstGet(t, f, "conv_vort"+L), tstGet(t, f, "conv_interface"+L)
		sc := tstMaxAbs(c)
		if sc == 0 || tstMaxAbs(cz) < 1e-3*sc || tstMaxAbs(ci) < 1e-3*sc {
			t.Fatalf("layer %s: degenerate test, max |C| = %g, |C_vort| = %g, |C_int| = %g", L, sc, tstMaxAbs(cz), tstMaxAbs(ci))
		}
		for i := range c {
			if math.Abs(cz[i]+ci[i]-c[i]) > 1e-12*sc {
				t.Fatalf("layer %s at %d: C_vort + C_int = %.15g, C = %.15g", L, i, cz[i]+ci[i], c[i])
			}
		}
	}
	// (iii) q(ψ_t) = C, with q(ψ) = ∇²ψ_n + F_n(ψ_m − ψ_n) on the grid
	an := a.analyse()
	for n := range 2 {
		_, _, _, qt := tstGridded(g, ph, plan, an.psit, n)
		c := tstGet(t, f, "conv"+string(rune('1'+n)))
		sc := tstMaxAbs(c)
		for i := range c {
			if math.Abs(qt[i]-c[i]) > 1e-10*sc {
				t.Fatalf("layer %d at %d: PV of ψ_t %.12g, C %.12g", n+1, i, qt[i], c[i])
			}
		}
	}
}

// Welford's update (Welford 1962) of the gridded means and co-moments agrees
// with the two-pass computation (Chan, Golub & LeVeque 1983) to 1e-12
// relative over a long series whose mean is large compared with its
// fluctuations — the case where ⟨xy⟩ − ⟨x⟩⟨y⟩ of large sums loses digits.
func TestWelfordAgainstTwoPass(t *testing.T) {
	cfg := tstConfig(8, 8)
	m := tstModel(t, cfg)
	g := m.Grid()
	plan, err := fft.NewPlan2D(cfg.Nx, cfg.Ny, 1)
	if err != nil {
		t.Fatal(err)
	}
	a := tstNew(t, m, Options{})
	rng := rand.New(rand.NewPCG(3, 4))
	const ns = 20000
	np := cfg.Nx * cfg.Ny
	base := tstRandomPsi(g, rng, 1e8, 2)
	us := make([][]float64, ns)
	ps := make([][]float64, ns)
	for s := range ns {
		psi := tstRandomPsi(g, rng, 1e6, 2)
		for n := range 2 {
			for p := range psi[n] {
				psi[n][p] += base[n][p]
			}
		}
		tstSetPsi(t, m, plan, psi)
		setClock(t, m, float64(s))
		if err := a.Sample(); err != nil {
			t.Fatal(err)
		}
		got := m.SpectralStreamfunction()
		p1, u1, _, _ := tstGridded(g, m.Physics(), plan, got, 0)
		p2, _, _, _ := tstGridded(g, m.Physics(), plan, got, 1)
		us[s] = u1
		ps[s] = make([]float64, np)
		for i := range np {
			ps[s][i] = p1[i] - p2[i]
		}
	}
	mu, mt := make([]float64, np), make([]float64, np)
	for s := range ns {
		for i := range np {
			mu[i] += us[s][i]
			mt[i] += ps[s][i]
		}
	}
	uu, ut := make([]float64, np), make([]float64, np)
	var naiveErr float64
	for i := range np {
		var s2 float64
		for s := range ns {
			s2 += us[s][i] * us[s][i]
		}
		mu[i] /= ns
		mt[i] /= ns
		for s := range ns {
			uu[i] += (us[s][i] - mu[i]) * (us[s][i] - mu[i]) / ns
			ut[i] += (us[s][i] - mu[i]) * (ps[s][i] - mt[i]) / ns
		}
		naiveErr = math.Max(naiveErr, math.Abs(s2/ns-mu[i]*mu[i]-uu[i])/uu[i])
	}
	// the regime is a real test: the large-sum formula misses 1e-12 here
	// (measured ~8e-10, against ~1e-14 for Welford's update)
	if naiveErr < 1e-11 {
		t.Fatalf("the synthetic series is too benign: ⟨u²⟩ − ⟨u⟩² is accurate to %.2g", naiveErr)
	}
	mom := a.moments(0)
	for i := range np {
		if e := math.Abs(a.cells[0][i].mu-mu[i]) / tstMaxAbs(mu); e > 1e-12 {
			t.Errorf("mean u at %d: relative difference %.2g", i, e)
		}
		if e := math.Abs(mom.uu[i]-uu[i]) / uu[i]; e > 1e-12 {
			t.Errorf("u′u′ at %d: relative difference %.2g", i, e)
		}
		if e := math.Abs(mom.ut[i]-ut[i]) / tstMaxAbs(ut); e > 1e-12 {
			t.Errorf("u′(ψ1−ψ2)′ at %d: relative difference %.2g", i, e)
		}
	}
}
