package linear

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// uniformConfig is a small β-plane with the imposed flow (u1, u2), Ekman
// drag and no other dissipation, no sponge.
func uniformConfig(u1, u2 float64) qg.Config {
	return qg.Config{
		Nx: 32, Ny: 16, Lx: 1.6e7, Ly: 8e6,
		F0: 1e-4, Beta: 1.6e-11, Ld: 7e5, Delta: 1,
		U1: u1, U2: u2, Drag: 1 / (4 * 86400.0),
		ScaleSelective: qg.ScaleSelective{Kind: qg.NoScaleSelective},
		Dt:             3600, Scheme: qg.RK4, MaxCFL: 1, Workers: 1,
	}
}

// cosForcing returns the spectral coefficients of the gridded forcing
// a_n cos(k x + l y + φ_n) of mode (i, j) in both layers.
func cosForcing(t *testing.T, l *Model, i, j int, a [2]float64, phase [2]float64) [2][]complex128 {
	t.Helper()
	g := l.Grid()
	k, ll := 2*math.Pi*float64(i)/g.Lx, 2*math.Pi*float64(j)/g.Ly
	var q [2][]complex128
	for n := range 2 {
		f := make([]float64, g.Points())
		for y := range g.Ny {
			for x := range g.Nx {
				f[y*g.Nx+x] = a[n] * math.Cos(k*g.X(x)+ll*g.Y(y)+phase[n])
			}
		}
		q[n] = make([]complex128, g.Len())
		if err := l.Nonlinear().ToSpectral(q[n], f); err != nil {
			t.Fatal(err)
		}
	}
	return q
}

// closedForm solves the linearised two-layer equations for one wavevector
// (k, l) in a uniform flow with drag, independently of the model's code:
// with q̂ = P ψ̂, P = [[−K² − F1, F1], [F2, −K² − F2]] (the PV definition,
// package qg), the steady state of
//
//	∂t q̂_n = −ik U_n q̂_n − ik Q_ny ψ̂_n + δ_n2 r K² ψ̂_2 + f̂_n
//
// (Q1y = β + F1(U1 − U2), Q2y = β − F2(U1 − U2); the drag −r∇²ψ2) is the
// 2 × 2 complex system (−ik diag(U) P − ik diag(Qy) + diag(0, rK²)) ψ̂ = −f̂,
// solved by Cramer's rule; it returns q̂ = P ψ̂.
func closedForm(c qg.Config, k, l float64, f [2]complex128) [2]complex128 {
	f1 := 1 / (c.Ld * c.Ld * (1 + c.Delta))
	f2 := c.Delta * f1
	k2 := k*k + l*l
	q1y, q2y := c.Beta+f1*(c.U1-c.U2), c.Beta-f2*(c.U1-c.U2)
	ik := complex(0, k)
	p := [2][2]complex128{{complex(-k2-f1, 0), complex(f1, 0)}, {complex(f2, 0), complex(-k2-f2, 0)}}
	u := [2]complex128{complex(c.U1, 0), complex(c.U2, 0)}
	qy := [2]complex128{complex(q1y, 0), complex(q2y, 0)}
	var m [2][2]complex128
	for a := range 2 {
		for b := range 2 {
			m[a][b] = -ik * u[a] * p[a][b]
		}
		m[a][a] -= ik * qy[a]
	}
	m[1][1] += complex(c.Drag*k2, 0)
	det := m[0][0]*m[1][1] - m[0][1]*m[1][0]
	r := [2]complex128{-f[0], -f[1]}
	psi := [2]complex128{(r[0]*m[1][1] - m[0][1]*r[1]) / det, (m[0][0]*r[1] - r[0]*m[1][0]) / det}
	return [2]complex128{p[0][0]*psi[0] + p[0][1]*psi[1], p[1][0]*psi[0] + p[1][1]*psi[1]}
}

// TestSteadyResponseMatchesClosedForm checks both routes — time
// integration and GMRES — against the closed-form steady response of the
// linearised two-layer QG equations to a single-wavenumber forcing in a
// uniform sheared flow with drag, to 1e-8 relative, and that no other
// mode responds.
func TestSteadyResponseMatchesClosedForm(t *testing.T) {
	// No shear: with Ekman drag on the lower layer any shear is (weakly)
	// unstable (Holopainen 1961, from memory), and no time integration
	// would settle. β and the drag make every mode a damped Rossby wave.
	c := uniformConfig(10, 10)
	c.Drag = 1 / (2 * 86400.0)
	l, err := New(c, [2][]float64{})
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	g := l.Grid()
	for _, md := range [][2]int{{3, 2}, {2, 0}, {1, -1}} {
		i, j := md[0], md[1]
		f := cosForcing(t, l, i, j, [2]float64{1e-11, -4e-12}, [2]float64{0.3, 1.1})
		jj := j
		if jj < 0 {
			jj += g.Ny
		}
		p := jj*g.Nkx + i
		want := closedForm(c, g.K(i), g.L(jj), [2]complex128{f[0][p], f[1][p]})
		for _, route := range []string{"integration", "gmres"} {
			var r Response
			var err error
			if route == "integration" {
				r, err = l.Integrate(f, Options{Tol: 1e-10})
			} else {
				r, err = l.Solve(f, Options{Tol: 1e-12})
			}
			if err != nil {
				t.Fatalf("mode (%d,%d), %s: %v", i, j, route, err)
			}
			for n := range 2 {
				if e := cmplx.Abs(r.Q[n][p]-want[n]) / cmplx.Abs(want[n]); e > 1e-8 {
					t.Errorf("mode (%d,%d), %s, layer %d: response %v, closed form %v (relative error %.2g)", i, j, route, n+1, r.Q[n][p], want[n], e)
				}
				for o, z := range r.Q[n] {
					if o != p && cmplx.Abs(z) > 1e-10*cmplx.Abs(want[n]) {
						t.Fatalf("mode (%d,%d), %s: mode %d of layer %d responds (%v)", i, j, route, o, n+1, z)
					}
				}
			}
			t.Logf("mode (%d,%d), %s: %g days, %d iterations", i, j, route, r.Days, r.Iterations)
		}
	}
}

// TestResponseIsLinear checks linearity to 1e-10: the response to 2f is
// twice the response to f, and the response to f + g is the sum of theirs
// (common practice: the defining property of a linear model), about a
// non-uniform basic state (a block-like dipole) with a sponge and a
// filter.
func TestResponseIsLinear(t *testing.T) {
	c := uniformConfig(8, 8)
	c.Drag = 1 / 86400.0
	c.Sponge = qg.Sponge{Rate: 2 / 86400.0, Width: 4e6, X: 1.4e7}
	c.ScaleSelective = qg.ScaleSelective{Kind: qg.CutoffFilter, FilterTime: 6 * 3600, FilterCutoff: 0.65, FilterOrder: 4}
	probe, err := New(c, [2][]float64{})
	if err != nil {
		t.Fatal(err)
	}
	g := probe.Grid()
	probe.Close()
	basic := dipoleBasic(g)
	l, err := New(c, basic)
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	f, err := l.PVPatch(4e6, 4e6, 8e5, 1e-11, 0)
	if err != nil {
		t.Fatal(err)
	}
	h, err := l.HeatingPatch(6e6, 5e6, 1e6, 1)
	if err != nil {
		t.Fatal(err)
	}
	scale2 := func(x [2][]complex128, a float64) [2][]complex128 {
		y := clonePair(x)
		for n := range 2 {
			for p := range y[n] {
				y[n][p] *= complex(a, 0)
			}
		}
		return y
	}
	sum := clonePair(f)
	for n := range 2 {
		for p := range sum[n] {
			sum[n][p] += h[n][p]
		}
	}
	for _, route := range []string{"integration", "gmres"} {
		solve := func(x [2][]complex128) [2][]complex128 {
			var r Response
			var err error
			if route == "integration" {
				r, err = l.Integrate(x, Options{Tol: 1e-11})
			} else {
				r, err = l.Solve(x, Options{Tol: 1e-11})
			}
			if err != nil {
				t.Fatalf("%s: %v", route, err)
			}
			return r.Q
		}
		rf, rh, r2f, rs := solve(f), solve(h), solve(scale2(f, 2)), solve(sum)
		if d, s := diffNorm(r2f, scale2(rf, 2)); d > 1e-10*s {
			t.Errorf("%s: response to 2f differs from twice the response to f by %.2g relative", route, d/s)
		}
		both := clonePair(rf)
		for n := range 2 {
			for p := range both[n] {
				both[n][p] += rh[n][p]
			}
		}
		if d, s := diffNorm(rs, both); d > 1e-10*s {
			t.Errorf("%s: response to f + g differs from the sum of the responses by %.2g relative", route, d/s)
		} else {
			t.Logf("%s: 2f: %.2g, f + g: %.2g relative", route, func() float64 { d, s := diffNorm(r2f, scale2(rf, 2)); return d / s }(), d/s)
		}
	}
}

// phillipsSigma is the growth rate k·Im c of the two-layer baroclinic
// instability for equal layers (Phillips 1954, Tellus 6; Vallis 2017,
// Atmospheric and Oceanic Fluid Dynamics, ch. 9), with F = 1/(2Ld²) and
// Um, Us the mean and half-difference of U1 and U2.
func phillipsSigma(c qg.Config, k, l float64) float64 {
	f := 1 / (2 * c.Ld * c.Ld)
	k2 := k*k + l*l
	um, us := (c.U1+c.U2)/2, (c.U1-c.U2)/2
	disc := c.Beta*c.Beta*f*f/(k2*k2*(k2+2*f)*(k2+2*f)) - us*us*(2*f-k2)/(k2+2*f)
	_ = um
	if disc >= 0 {
		return 0
	}
	return k * math.Sqrt(-disc)
}

// TestUnstableBasicStateStops checks the linear model on a uniform flow
// sheared beyond the critical value: a single free mode grows at the
// Phillips rate (within 1 %), the time integration stops with an
// *UnstableError whose growth rate is that of the unstable modes (80 to
// 101 % of the fastest Phillips rate on the grid), and GMRES says the
// basic state is unstable from the Ritz values of its first Krylov space.
func TestUnstableBasicStateStops(t *testing.T) {
	c := uniformConfig(25, -5) // Us = 15 m s⁻¹ > βLd² = 7.8 m s⁻¹
	c.Drag = 0
	l, err := New(c, [2][]float64{})
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	g := l.Grid()
	var smax float64
	var i, j int // the fastest-growing mode
	for jj := range g.Ny {
		for ii := 1; ii < g.KeptCols(); ii++ {
			if s := phillipsSigma(c, g.K(ii), g.L(jj)); g.Keep(jj*g.Nkx+ii) == 1 && s > smax {
				smax, i, j = s, ii, jj
			}
		}
	}
	if smax <= 0 {
		t.Fatal("setup: no unstable mode")
	}
	m := l.Nonlinear()
	want := smax
	q := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	q[0][j*g.Nkx+i] = complex(1e-13*float64(g.Points()), 0) // a PV of 1e-13 s⁻¹: far from any CFL limit
	if err := m.SetSpectralPV(q); err != nil {
		t.Fatal(err)
	}
	for n := range 2 {
		clear(l.force[n])
	}
	amp := func() float64 {
		a := m.SpectralPV()
		return math.Hypot(cmplx.Abs(a[0][j*g.Nkx+i]), cmplx.Abs(a[1][j*g.Nkx+i]))
	}
	if err := m.RunUntil(10 / want); err != nil {
		t.Fatal(err)
	}
	a0, t0 := amp(), m.Time()
	if err := m.RunUntil(t0 + 4/want); err != nil {
		t.Fatal(err)
	}
	got := math.Log(amp()/a0) / (m.Time() - t0)
	if e := math.Abs(got-want) / want; e > 0.01 {
		t.Errorf("free mode (%d,%d) grows at %.5g s⁻¹, Phillips gives %.5g (error %.2g)", i, j, got, want, e)
	}

	f, err := l.PVPatch(8e6, 4e6, 1.5e6, 1e-11, 0)
	if err != nil {
		t.Fatal(err)
	}
	_, err = l.Integrate(f, Options{})
	var ue *UnstableError
	if !errors.As(err, &ue) || ue.Route != "integration" {
		t.Fatalf("integration on an unstable state: %v, want an *UnstableError", err)
	}
	// the measured rate is that of the unstable modes the forcing excites,
	// which after two weeks are not yet all outgrown by the fastest one
	if r := ue.GrowthRate / (smax * 86400); r < 0.8 || r > 1.01 {
		t.Errorf("integration stopped with growth %.4g day⁻¹, want 80–101 %% of the fastest Phillips rate %.4g", ue.GrowthRate, smax*86400)
	}
	t.Logf("integration: %v", err)
	_, err = l.Solve(f, Options{})
	if !errors.As(err, &ue) || ue.Route != "gmres" || !(ue.GrowthRate > 0) {
		t.Errorf("GMRES on an unstable state: %v, want an *UnstableError", err)
	} else {
		t.Logf("gmres: %v (fastest Phillips mode %.4g day⁻¹)", err, smax*86400)
	}
}

// TestSolveOverSpan checks GMRES on the fixed point of several time steps
// (Options.Span): against the same closed-form steady response of the
// linearised two-layer QG equations as TestSteadyResponseMatchesClosedForm,
// to 1e-8 relative, and, about a non-uniform basic state with a sponge and
// a filter (TestResponseIsLinear's), against the one-step route (common
// practice: the steady state is the fixed point of any number of steps).
func TestSolveOverSpan(t *testing.T) {
	c := uniformConfig(10, 10)
	c.Drag = 1 / (2 * 86400.0)
	l, err := New(c, [2][]float64{})
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	g := l.Grid()
	i, j := 3, 2
	f := cosForcing(t, l, i, j, [2]float64{1e-11, -4e-12}, [2]float64{0.3, 1.1})
	p := j*g.Nkx + i
	want := closedForm(c, g.K(i), g.L(j), [2]complex128{f[0][p], f[1][p]})
	r, err := l.Solve(f, Options{Tol: 1e-12, Span: 24})
	if err != nil {
		t.Fatal(err)
	}
	for n := range 2 {
		if e := cmplx.Abs(r.Q[n][p]-want[n]) / cmplx.Abs(want[n]); e > 1e-8 {
			t.Errorf("layer %d: response %v, closed form %v (relative error %.2g)", n+1, r.Q[n][p], want[n], e)
		}
	}

	c = uniformConfig(8, 8)
	c.Drag = 1 / 86400.0
	c.Sponge = qg.Sponge{Rate: 2 / 86400.0, Width: 4e6, X: 1.4e7}
	c.ScaleSelective = qg.ScaleSelective{Kind: qg.CutoffFilter, FilterTime: 6 * 3600, FilterCutoff: 0.65, FilterOrder: 4}
	basic := dipoleBasic(g)
	b, err := New(c, basic)
	if err != nil {
		t.Fatal(err)
	}
	defer b.Close()
	h, err := b.HeatingPatch(6e6, 5e6, 1e6, 1)
	if err != nil {
		t.Fatal(err)
	}
	var q [2][2][]complex128
	for k, span := range []int{1, 24} {
		r, err := b.Solve(h, Options{Tol: 1e-11, Span: span})
		if err != nil {
			t.Fatalf("span %d: %v", span, err)
		}
		q[k] = r.Q
		t.Logf("span %d: %d iterations, %d steps", span, r.Iterations, r.Iterations*span)
	}
	if d, s := diffNorm(q[1], q[0]); d > 1e-8*s {
		t.Errorf("the response over a span of 24 steps differs from the one-step route by %.2g relative", d/s)
	}
}

// dipoleBasic is a basic-state streamfunction with a dipole of Gaussian
// lobes (3e6 m² s⁻¹, e-folding 1000 km) centred at x = 8000 km, a high at
// y = 5000 km over a low at 3000 km, 0.6 times as strong in the lower
// layer.
func dipoleBasic(g *qg.Grid) [2][]float64 {
	basic := [2][]float64{make([]float64, g.Points()), make([]float64, g.Points())}
	for y := range g.Ny {
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), 8e6, g.Lx) / 1e6
			dyh := qg.PeriodicDistance(g.Y(y), 5e6, g.Ly) / 1e6
			dyl := qg.PeriodicDistance(g.Y(y), 3e6, g.Ly) / 1e6
			v := 3e6 * (math.Exp(-dx*dx-dyh*dyh) - math.Exp(-dx*dx-dyl*dyl))
			basic[0][y*g.Nx+x], basic[1][y*g.Nx+x] = v, 0.6*v
		}
	}
	return basic
}
