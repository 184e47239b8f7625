package wavemaker

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// TestEnergyKernelClosedForm checks the energy kernel computed through the
// model's inversion against the closed forms that follow from the
// two-layer inversion (package qg, as in Vallis 2017, Atmospheric and
// Oceanic Fluid Dynamics, §5.3) worked by hand: with D = K²(K² + F1 + F2),
// upper W1(K² + F2)/D, lower W2(K² + F1)/D, barotropic 1/K² (ψ1 = ψ2 = −q/K²),
// baroclinic δ/(K² + F1 + F2) (ψ1 = −q1/(K² + F1 + F2), ψ2 = −δψ1).
func TestEnergyKernelClosedForm(t *testing.T) {
	qc := testModelConfig(3600, 1)
	qc.Delta = 0.5 // unequal layers, so that W1 ≠ W2 and F1 ≠ F2
	m := newModel(t, qc)
	g, ph := m.Grid(), m.Physics()
	for _, v := range []Vertical{Upper, Lower, Barotropic, Baroclinic} {
		a := energyKernel(m.Inverter(), ph, g.Len(), verticalVector(v, ph))
		for p := range g.Len() {
			k2 := g.K2(p)
			if k2 == 0 || g.Keep(p) == 0 {
				if a[p] != 0 {
					t.Fatalf("%s: kernel %g at a mode without energy (p = %d)", v, a[p], p)
				}
				continue
			}
			d := k2 * (k2 + ph.F1 + ph.F2)
			var want float64
			switch v {
			case Upper:
				want = ph.W1 * (k2 + ph.F2) / d
			case Lower:
				want = ph.W2 * (k2 + ph.F1) / d
			case Barotropic:
				want = 1 / k2
			case Baroclinic:
				want = qc.Delta / (k2 + ph.F1 + ph.F2)
			}
			if math.Abs(a[p]-want) > 1e-12*want {
				t.Fatalf("%s: kernel at p = %d is %.15g, closed form %.15g", v, p, a[p], want)
			}
		}
	}
}

// TestWhiteNormalisation draws many increments at q = 0 and checks that
// the sample mean of E(q + Δq) − E(q) = E(Δq) is ε·dt: the exact expected
// injection of white noise from its covariance (Novikov 1965, Sov. Phys.
// JETP 20, 1290), here ½σ²dt·M⟨m²⟩·Σ_band Weight·A. The check is a Monte
// Carlo one: the mean must lie within 3 standard errors, and the standard
// error must be small enough (< 2 %) for the check to mean something.
func TestWhiteNormalisation(t *testing.T) {
	patch := MaskConfig{Kind: Patch, X: 3e6, Y: 5e6, WidthX: 2e6, WidthY: 1.5e6}
	cases := []struct {
		vert Vertical
		mask MaskConfig
		band BandConfig
		dt   float64
		seed uint64
	}{
		{Upper, MaskConfig{Kind: NoMask}, BandConfig{TotalBand, 5e5, 2.7e6}, 3600, 1},
		{Upper, MaskConfig{Kind: NoMask}, BandConfig{TotalBand, 5e5, 2.7e6}, 300, 2},
		{Lower, patch, BandConfig{TotalBand, 5e5, 2.7e6}, 3600, 3},
		{Barotropic, patch, BandConfig{ZonalBand, 8e5, 4e6}, 1800, 4},
		{Baroclinic, patch, BandConfig{TotalBand, 1e6, 8e6}, 3600, 5},
		// Two patches (a storm track split in two branches): the same
		// covariance formula with ⟨m²⟩ of the summed mask.
		{Upper, MaskConfig{Kind: Patches, Patches: []PatchConfig{{3e6, 2e6, 1.5e6, 1e6}, {3e6, 6e6, 1.5e6, 1e6}}}, BandConfig{TotalBand, 5e5, 2.7e6}, 3600, 6},
	}
	for _, c := range cases {
		t.Run(fmt.Sprintf("%s/%s/%s/dt=%g", c.vert, c.mask.Kind, c.band.Kind, c.dt), func(t *testing.T) {
			qc := testModelConfig(c.dt, 1)
			qc.Delta = 0.7
			m := newModel(t, qc)
			wc := testNoiseConfig()
			wc.Vertical, wc.Mask, wc.Band, wc.Seed = c.vert, c.mask, c.band, c.seed
			s := newNoise(t, wc, m)
			ns := m.Grid().Len()
			dq, psi := pair(ns), pair(ns)
			const n = 3000
			var w welford
			for range n {
				s.Increment(dq, 0, c.dt)
				w.add(incrementEnergy(m, dq, psi))
			}
			want := wc.InjectionRate * c.dt
			se := math.Sqrt(w.variance() / n)
			t.Logf("%d modes: mean E(Δq)/(ε dt) = %.4f ± %.4f", s.Modes(), w.mean/want, se/want)
			if se > 0.02*want {
				t.Fatalf("standard error %.3g of the mean is over 2%% of ε dt = %.3g: the check has no power", se, want)
			}
			if math.Abs(w.mean-want) > 3*se {
				t.Errorf("mean E(Δq) = %.6g, want ε dt = %.6g within 3 standard errors (%.3g)", w.mean, want, se)
			}
		})
	}
}

// runInjection runs the model with the noise attached for the given number
// of days after a spin-up of 5 days and returns the measured injection rate
// Ledger[TermInjection]/elapsed time with its standard error from 20 batch
// means.
func runInjection(t *testing.T, qc qg.Config, wc Config, days float64) (rate, se float64) {
	t.Helper()
	m := newModel(t, qc)
	s := newNoise(t, wc, m)
	s.Attach(m)
	if err := m.Run(int(5 * 86400 / qc.Dt)); err != nil {
		t.Fatal(err)
	}
	const nb = 20
	per := int(days * 86400 / qc.Dt / nb)
	rates := make([]float64, nb)
	for b := range rates {
		m.ResetLedger()
		if err := m.Run(per); err != nil {
			t.Fatal(err)
		}
		rates[b] = m.Ledger()[qg.TermInjection] / (float64(per) * qc.Dt)
	}
	return meanSE(rates, nb)
}

// TestWhiteInjectionRate measures the injection the model books for white
// noise, the midpoint (Stratonovich) −Σ W_n⟨(ψ + ½Δψ)Δq⟩ = E(q + Δq) − E(q)
// per step, averaged over 100 days of a damped, forced flow. Its expectation
// is ε whatever the flow and the time step (Novikov 1965, Sov. Phys. JETP
// 20, 1290: the work of a white-in-time force is set by its covariance
// alone); the tolerance is 3 % and the batch-means standard error must be
// under 1 % for the check to have power.
func TestWhiteInjectionRate(t *testing.T) {
	patch := MaskConfig{Kind: Patch, X: 3e6, Y: 5e6, WidthX: 2e6, WidthY: 2e6}
	for _, c := range []struct {
		dt   float64
		mask MaskConfig
	}{
		{3600, MaskConfig{Kind: NoMask}},
		{1800, MaskConfig{Kind: NoMask}},
		{3600, patch},
	} {
		t.Run(fmt.Sprintf("dt=%g/%s", c.dt, c.mask.Kind), func(t *testing.T) {
			wc := testNoiseConfig()
			wc.Mask = c.mask
			rate, se := runInjection(t, testModelConfig(c.dt, 0.5), wc, 100)
			eps := wc.InjectionRate
			t.Logf("measured/ε = %.4f ± %.4f", rate/eps, se/eps)
			if se > 0.01*eps {
				t.Fatalf("standard error %.3g is over 1%% of ε: the check has no power", se)
			}
			if math.Abs(rate-eps) > 0.03*eps {
				t.Errorf("injection rate %.5g m² s⁻³, want ε = %.5g within 3%%", rate, eps)
			}
		})
	}
}

// TestRedAutocorrelation checks that the red noise's PV tendency has the
// autocorrelation of an Ornstein–Uhlenbeck process, e^{−|s|/τ} (Uhlenbeck &
// Ornstein 1930, Phys. Rev. 36, 823): at lag τ, e⁻¹ within 5 %, pooled over
// the band modes of a masked field. It also checks the lag-one correlation
// of the increments, which tests the joint update of the process and its
// integral: for I_k = ∫ F over step k, Cov(I_0, I_1)/Var I =
// (1 − a)²/(2(h − 1 + a)), a = e^{−h}, h = dt/τ, from the covariance
// e^{−|s|/τ} integrated over two adjacent steps (Gillespie 1996, Phys.
// Rev. E 54, 2084).
func TestRedAutocorrelation(t *testing.T) {
	const dt, tau = 3600.0, 6 * 3600.0
	lag := int(math.Round(tau / dt))
	m := newModel(t, testModelConfig(dt, 1))
	wc := testNoiseConfig()
	wc.Kind, wc.CorrelationTime = Red, tau
	wc.Mask = MaskConfig{Kind: Patch, X: 4e6, Y: 2e6, WidthX: 1.5e6, WidthY: 2e6}
	s := newNoise(t, wc, m)
	ns := m.Grid().Len()
	dq := pair(ns)
	hist := make([][]complex128, lag+1) // tendencies at the last lag+1 steps
	for i := range hist {
		hist[i] = make([]complex128, len(s.modes))
	}
	prevInc := make([]complex128, len(s.modes))
	var cf, ci coMoment
	const steps = 3000 // 500 correlation times
	for k := range steps {
		s.Increment(dq, float64(k)*dt, dt)
		for i, p := range s.modes {
			if k > 0 {
				ci.add(real(prevInc[i]), real(dq[0][p]))
				ci.add(imag(prevInc[i]), imag(dq[0][p]))
			}
			prevInc[i] = dq[0][p]
		}
		f := pair(ns)
		s.Tendency(f)
		cur := hist[k%(lag+1)]
		for i, p := range s.modes {
			cur[i] = f[0][p]
		}
		if k >= lag {
			old := hist[(k-lag)%(lag+1)]
			for i := range cur {
				cf.add(real(old[i]), real(cur[i]))
				cf.add(imag(old[i]), imag(cur[i]))
			}
		}
	}
	rho := cf.corr()
	t.Logf("tendency autocorrelation at lag τ: %.4f (e⁻¹ = %.4f)", rho, math.Exp(-1))
	if math.Abs(rho-math.Exp(-1)) > 0.05*math.Exp(-1) {
		t.Errorf("autocorrelation at lag τ = %.4f, want e⁻¹ = %.4f within 5%%", rho, math.Exp(-1))
	}
	h := dt / tau
	a := math.Exp(-h)
	want := (1 - a) * (1 - a) / (2 * (h - 1 + a))
	r1 := ci.corr()
	t.Logf("increment lag-one correlation: %.4f (exact %.4f)", r1, want)
	if math.Abs(r1-want) > 0.03*want {
		t.Errorf("increment lag-one correlation %.4f, want %.4f within 3%%", r1, want)
	}
}

// TestRedNormalisation checks the stationary variance of the red noise's
// increments: E(Δq) at q = 0 has mean ε τ (h − 1 + e^{−h}), h = dt/τ, since
// the integral over dt of a process with covariance σ²e^{−|s|/τ} has
// variance 2σ²τ²(h − 1 + e^{−h}) (Papoulis, Probability, Random Variables
// and Stochastic Processes, the variance of an integrated stationary
// process) and σ² = ε/(τS) is the normalisation that gives ε in the white
// limit (intensity 2σ²τ). Monte Carlo, within 3 standard errors, for a short
// and a long correlation time.
func TestRedNormalisation(t *testing.T) {
	const dt = 3600.0
	for _, tau := range []float64{600, 86400} {
		t.Run(fmt.Sprintf("tau=%g", tau), func(t *testing.T) {
			m := newModel(t, testModelConfig(dt, 1))
			wc := testNoiseConfig()
			wc.Kind, wc.CorrelationTime = Red, tau
			s := newNoise(t, wc, m)
			ns := m.Grid().Len()
			dq, psi := pair(ns), pair(ns)
			const n = 10000
			xs := make([]float64, n)
			for k := range xs {
				s.Increment(dq, float64(k)*dt, dt)
				xs[k] = incrementEnergy(m, dq, psi)
			}
			mean, se := meanSE(xs, 50) // batches of 200 steps ≫ τ: nearly independent
			h := dt / tau
			want := wc.InjectionRate * tau * (h - 1 + math.Exp(-h))
			t.Logf("mean E(Δq) / exact = %.4f ± %.4f", mean/want, se/want)
			if se > 0.02*want {
				t.Fatalf("standard error %.3g over 2%% of %.3g: no power", se, want)
			}
			if math.Abs(mean-want) > 3*se {
				t.Errorf("mean E(Δq) = %.5g, want %.5g within 3 standard errors (%.3g)", mean, want, se)
			}
		})
	}
}

// TestOUIntegralVar checks the series used at small h against the closed
// form 2h − 3 + 4e^{−h} − e^{−2h} (Gillespie 1996, Phys. Rev. E 54, 2084)
// where the closed form is still accurate, and its leading term 2h³/3 at
// small h.
func TestOUIntegralVar(t *testing.T) {
	for _, h := range []float64{0.05, 0.1, 0.2, 0.3, 0.4, 0.49} {
		closed := 2*h - 3 + 4*math.Exp(-h) - math.Exp(-2*h)
		if got := ouIntegralVar(h); math.Abs(got-closed) > 1e-12*closed/(h*h*h) {
			t.Errorf("h = %g: series %.15g, closed form %.15g", h, got, closed)
		}
	}
	h := 1e-6
	if got, want := ouIntegralVar(h), 2*h*h*h/3; math.Abs(got-want) > 1e-5*want {
		t.Errorf("h = %g: %.15g, leading term 2h³/3 = %.15g", h, got, want)
	}
}

// TestSeed checks reproducibility (package wavemaker: random numbers from seeded
// generators in a fixed order): the same seed gives bit-identical increments,
// another seed different ones; for white and red noise.
func TestSeed(t *testing.T) {
	for _, kind := range []Kind{White, Red} {
		m := newModel(t, testModelConfig(3600, 1))
		ns := m.Grid().Len()
		draw := func(seed uint64) [][2][]complex128 {
			wc := testNoiseConfig()
			wc.Kind, wc.CorrelationTime, wc.Seed = kind, 86400, seed
			wc.Mask = MaskConfig{Kind: Patch, X: 1e6, Y: 7e6, WidthX: 1e6, WidthY: 1e6}
			s := newNoise(t, wc, m)
			var out [][2][]complex128
			for k := range 3 {
				dq := pair(ns)
				s.Increment(dq, float64(k)*3600, 3600)
				out = append(out, dq)
			}
			return out
		}
		a, b, c := draw(42), draw(42), draw(43)
		same, differ := true, true
		for k := range a {
			for n := range 2 {
				for p := range a[k][n] {
					if a[k][n][p] != b[k][n][p] {
						same = false
					}
					if a[k][n][p] != 0 && a[k][n][p] == c[k][n][p] {
						differ = false
					}
				}
			}
		}
		if !same {
			t.Errorf("%s: the same seed gave different increments", kind)
		}
		if !differ {
			t.Errorf("%s: seeds 42 and 43 gave an equal coefficient", kind)
		}
	}
}

// TestModelRunReproducible checks that two model runs with the same seed
// end bit-identical (package qg: results do not depend on the number of workers), with different worker counts.
func TestModelRunReproducible(t *testing.T) {
	run := func(workers int) [2][]float64 {
		qc := testModelConfig(3600, 1)
		qc.Workers = workers
		m := newModel(t, qc)
		wc := testNoiseConfig()
		wc.Kind, wc.CorrelationTime = Red, 86400
		s := newNoise(t, wc, m)
		s.Attach(m)
		if err := m.Run(20); err != nil {
			t.Fatal(err)
		}
		return m.PV()
	}
	a, b := run(1), run(2)
	for n := range 2 {
		for p := range a[n] {
			if a[n][p] != b[n][p] {
				t.Fatalf("layer %d point %d: %v with 1 worker, %v with 2", n+1, p, a[n][p], b[n][p])
			}
		}
	}
}

// TestRedInjectionLinearResponse measures the injection rate of red noise
// in a linear, damped flow (β = 0, no imposed flow, a weak forcing so that
// advection is negligible, Laplacian viscosity damping each mode's PV at
// λ = νK²). Unlike white noise, red noise does work that depends on the
// flow's response. With the split step of the model (deterministic step
// with RK4 factor d = 1 − z + z²/2 − z³/6 + z⁴/24, z = λdt, then the
// increment I) the state before each increment is Σ_{j≥1} d^j I_{−j}, so
// with Cov(I_0, I_j) = σ²τ²(1 − a)²a^{j−1} and Var I = 2σ²τ²(h − 1 + a),
// a = e^{−h}, h = dt/τ (Gillespie 1996, Phys. Rev. E 54, 2084), each mode
// takes per step
//
//	σ²τ²[(1 − a)² d/(1 − a d) + h − 1 + a] · Weight·A·M⟨m²⟩,
//
// which tends to ε·Σ w_p/(1 + λ_p τ) as dt → 0 (linear response; our own
// derivation). The measured rate must match the discrete value within 4 %.
func TestRedInjectionLinearResponse(t *testing.T) {
	const dt, tau = 3600.0, 86400.0
	qc := testModelConfig(dt, 1)
	qc.Beta = 0
	wc := testNoiseConfig()
	wc.Kind, wc.CorrelationTime = Red, tau
	wc.InjectionRate = 1e-8 // u ~ 1 cm/s: advection is negligible
	rate, se := runInjection(t, qc, wc, 200)

	m := newModel(t, qc)
	s := newNoise(t, wc, m)
	g := m.Grid()
	a := energyKernel(m.Inverter(), m.Physics(), g.Len(), s.vec)
	nu := qc.ScaleSelective.Viscosity
	h := dt / tau
	aa := math.Exp(-h)
	var disc, cont, den float64
	for _, p := range s.modes {
		w := g.Weight(p) * a[p]
		z := nu * g.K2(p) * dt
		d := 1 - z + z*z/2 - z*z*z/6 + z*z*z*z/24
		disc += w * tau * ((1-aa)*(1-aa)*d/(1-d*aa) + h - 1 + aa) / dt
		cont += w / (1 + nu*g.K2(p)*tau)
		den += w
	}
	want := wc.InjectionRate * disc / den
	t.Logf("measured/ε = %.4f ± %.4f; linear response: discrete %.4f, continuous %.4f",
		rate/wc.InjectionRate, se/wc.InjectionRate, disc/den, cont/den)
	if se > 0.015*want {
		t.Fatalf("standard error %.3g is over 1.5%% of the expected %.3g: no power", se, want)
	}
	if math.Abs(rate-want) > 0.04*want {
		t.Errorf("red-noise injection %.5g m² s⁻³, linear response %.5g: off by more than 4%%", rate, want)
	}
}

// TestIncrementIsRealBandLimited checks that an increment is the transform
// of a real field confined to the band: its i = 0 column is Hermitian,
// dq(0, −l) = conj dq(0, l) (the DFT of a real sequence; Bracewell, The
// Fourier Transform and Its Applications), so a round trip through the grid
// returns it unchanged; and it is nonzero exactly on the retained modes of
// the band (wavelengths 800–4000 km in total wavenumber here).
func TestIncrementIsRealBandLimited(t *testing.T) {
	m := newModel(t, testModelConfig(3600, 1))
	g := m.Grid()
	wc := testNoiseConfig()
	wc.Band = BandConfig{Kind: TotalBand, MinWavelength: 8e5, MaxWavelength: 4e6}
	wc.Mask = MaskConfig{Kind: Patch, X: 2e6, Y: 6e6, WidthX: 1.5e6, WidthY: 1e6}
	wc.Vertical = Barotropic
	s := newNoise(t, wc, m)
	dq := pair(g.Len())
	s.Increment(dq, 0, 3600)
	back := make([]complex128, g.Len())
	grid := toGrid(t, m, dq[0])
	if err := m.ToSpectral(back, grid); err != nil {
		t.Fatal(err)
	}
	var scale float64
	for _, z := range dq[0] {
		scale = math.Max(scale, cmplx.Abs(z))
	}
	for p, z := range dq[0] {
		i, j := p%g.Nkx, p/g.Nkx
		lambda := 2 * math.Pi / math.Sqrt(g.K2(p))
		in := g.Keep(p) == 1 && g.K2(p) > 0 && lambda >= 8e5*(1-1e-9) && lambda <= 4e6*(1+1e-9)
		if in != (z != 0) {
			t.Fatalf("mode (i, j) = (%d, %d), wavelength %.4g m: coefficient %v, in band %v", i, j, lambda, z, in)
		}
		if dq[1][p] != z {
			t.Fatalf("barotropic increment differs between the layers at (%d, %d)", i, j)
		}
		if cmplx.Abs(back[p]-z) > 1e-12*scale {
			t.Fatalf("mode (%d, %d): %v after a round trip through the grid, %v before: not a real field", i, j, back[p], z)
		}
		if i == 0 {
			jm := (g.Ny - j) % g.Ny
			if cmplx.Abs(dq[0][jm*g.Nkx]-cmplx.Conj(z)) > 1e-12*scale {
				t.Fatalf("i = 0 column not Hermitian at j = %d", j)
			}
		}
	}
}
