package attribution

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/linear"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// TestAnomalyValidate checks that each bad anomaly is refused with the key
// that is wrong (common practice: validation names the bad key).
func TestAnomalyValidate(t *testing.T) {
	m := smallConfig().Model // 20 000 km × 10 000 km at 64 × 32: 312.5 km spacing
	good := Anomaly{Kind: PVAnomaly, X: 5e6, Y: 5e6, Radius: 8e5, Amplitude: 1e-11, Layer: 1}
	if err := good.Validate(m); err != nil {
		t.Fatalf("a good anomaly: %v", err)
	}
	for _, tc := range []struct {
		name string
		edit func(a *Anomaly)
		key  string
	}{
		{"unknown kind", func(a *Anomaly) { a.Kind = "cooling" }, "anomaly.kind"},
		{"east of the domain", func(a *Anomaly) { a.X = 2.5e7 }, "anomaly.x"},
		{"south of the domain", func(a *Anomaly) { a.Y = -1 }, "anomaly.y"},
		{"x not a number", func(a *Anomaly) { a.X = math.NaN() }, "anomaly.x"},
		{"zero-size patch", func(a *Anomaly) { a.Radius = 0 }, "anomaly.radius"},
		{"patch below the grid spacing", func(a *Anomaly) { a.Radius = 2e5 }, "anomaly.radius"},
		{"patch over a quarter of the domain", func(a *Anomaly) { a.Radius = 3e6 }, "anomaly.radius"},
		{"zero amplitude", func(a *Anomaly) { a.Amplitude = 0 }, "anomaly.amplitude"},
		{"infinite amplitude", func(a *Anomaly) { a.Amplitude = math.Inf(1) }, "anomaly.amplitude"},
		{"layer 3", func(a *Anomaly) { a.Layer = 3 }, "anomaly.layer"},
	} {
		a := good
		tc.edit(&a)
		err := a.Validate(m)
		var fe *qg.FieldError
		if !errors.As(err, &fe) || fe.Field != tc.key {
			t.Errorf("%s: %v, want a *qg.FieldError for %s", tc.name, err, tc.key)
		}
	}
	// a heating patch needs no layer
	h := good
	h.Kind, h.Layer = HeatingAnomaly, 0
	if err := h.Validate(m); err != nil {
		t.Errorf("a heating patch without a layer: %v", err)
	}
}

// TestRunRefusesBadInput checks that Run refuses, before any step, a
// configuration the method cannot use, naming why.
func TestRunRefusesBadInput(t *testing.T) {
	for _, tc := range []struct {
		name  string
		edit  func(c *Config)
		key   string
		fixed bool
	}{
		{"anomaly outside the domain", func(c *Config) { c.Anomaly.X = -5e6 }, "anomaly.x", false},
		{"zero-size anomaly", func(c *Config) { c.Anomaly.Radius = 0 }, "anomaly.radius", false},
		{"fixed block", func(c *Config) { c.Block.Mode = qg.Fixed }, "", true},
		{"relaxed block", func(c *Config) { c.Block.Mode, c.Block.RelaxTime = qg.Relaxed, 864000 }, "block.mode", false},
		{"odd number of segments", func(c *Config) { c.Sampling.Segments = 3 }, "sampling.segments", false},
		{"more segments than samples", func(c *Config) { c.Sampling.Segments = 1000 }, "sampling.segments", false},
		{"bad linear tolerance", func(c *Config) { c.Linear.Tol = 2 }, "linear.tol", false},
		{"bad experiment key", func(c *Config) { c.Model.Dt = -1 }, "model.dt", false},
	} {
		c := smallConfig()
		tc.edit(&c)
		r, err := Run(context.Background(), c, Options{})
		if r != nil {
			t.Errorf("%s: a result came back", tc.name)
		}
		if tc.fixed {
			if !errors.Is(err, ErrFixedMode) {
				t.Errorf("%s: %v, want ErrFixedMode", tc.name, err)
			}
			continue
		}
		var fe *qg.FieldError
		if !errors.As(err, &fe) || fe.Field != tc.key {
			t.Errorf("%s: %v, want a *qg.FieldError for %s", tc.name, err, tc.key)
		}
	}
}

// TestRunUnstableMeanState checks the honest stop on an unstable time-mean
// state: the block in weak westerlies without shear (U1 = U2 = 10 m s⁻¹,
// where the dipole's own flow reverses the westerlies between its lobes)
// gives a time mean on which a perturbation grows (measured by GMRES's
// Ritz values: about 0.14 day⁻¹). Run in sequential mode stops after the
// control run with the linear model's *linear.UnstableError, before the
// anomaly run, and returns what it has.
func TestRunUnstableMeanState(t *testing.T) {
	c := smallConfig()
	c.Model.U1, c.Model.U2 = 10, 10
	c.Run.Days, c.Run.SpinUpDays = 40, 20
	var days []float64
	r, err := Run(context.Background(), c, Options{Sequential: true, Report: func(run string, p experiment.Progress) {
		if run == AnomalyRun {
			days = append(days, p.Day)
		}
	}})
	var ue *linear.UnstableError
	if !errors.As(err, &ue) || !(ue.GrowthRate > 0) {
		t.Fatalf("Run on an unstable mean state: %v, want a *linear.UnstableError", err)
	}
	t.Log(err)
	if r == nil || r.Control == nil || r.Perturbed != nil {
		t.Errorf("the partial result should hold the control's mean-state forcing and nothing of the anomaly run")
	}
	if len(days) > 0 {
		t.Errorf("the anomaly run stepped to day %g after the control's mean state was found unstable", days[len(days)-1])
	}
}

// TestRunSmall runs the attribution experiment on a coarse grid and checks
// what holds whatever the scenario: the results are the same to the last
// bit run in parallel and in sequence (the project's rule: results do not
// depend on scheduling); (a) is the sample-weighted mean of its halves'
// responses (time means are linear: exact to rounding); and the
// closure check — the linear response to f + ΔC̄ + ΔR, which differs from
// (a) only by the response's interaction with itself, N(q̄ + Δ) − N(q̄) =
// LΔ − J(Δψ, Δq) (the Taylor expansion of a quadratic, common practice) —
// matches (a) closely for this small anomaly (pattern correlation above
// 0.99; measured 0.999).
func TestRunSmall(t *testing.T) {
	c := smallConfig()
	par, err := Run(context.Background(), c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	seq, err := Run(context.Background(), c, Options{Sequential: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, x := range []struct {
		name string
		a, b [2][]complex128
	}{
		{"(a)", par.Nonlinear.Q, seq.Nonlinear.Q}, {"(b)", par.Linear.Q, seq.Linear.Q},
		{"(c)", par.LinearEddy.Q, seq.LinearEddy.Q}, {"ΔC̄", par.EddyChange, seq.EddyChange},
	} {
		for n := range 2 {
			for p := range x.a[n] {
				if x.a[n][p] != x.b[n][p] {
					t.Fatalf("%s differs between the parallel and the sequential runs at layer %d, point %d", x.name, n+1, p)
				}
			}
		}
	}
	s := par.Summary()
	t.Logf("\n%s", s)
	mean := pair(len(par.Nonlinear.Psi[0]))
	w := par.HalfSamples
	for n := range 2 {
		for p := range mean[n] {
			mean[n][p] = (complex(float64(w[0]), 0)*par.Halves[0].Psi[n][p] + complex(float64(w[1]), 0)*par.Halves[1].Psi[n][p]) / complex(float64(w[0]+w[1]), 0)
		}
	}
	if d := relChange(mean, par.Nonlinear.Psi); d > 1e-12 {
		t.Errorf("the mean of the halves' responses differs from (a) by %.3g", d)
	}
	if s.Closure.Correlation < 0.99 {
		t.Errorf("closure check: pattern correlation %.4f with (a), want above 0.99", s.Closure.Correlation)
	}
	if s.Noise.RMS <= 0 || s.Noise.Segments != 4 {
		t.Errorf("sampling noise %+v", s.Noise)
	}
}

// TestBuiltinAttribution runs the built-in experiment (about a minute and a
// half on two cores) and checks the point it is made for: the linear
// response with the change in eddy forcing (c) is closer to the nonlinear
// response (a) than the linear response to the anomaly alone (b), in
// pattern correlation and in RMS, by more than the sampling noise of (a)
// (Result.Beyond, in units of the noise), and the closure check matches
// (a). Measured: (b) 0.986 / 0.69 m, (c) 1.000 / 0.12 m, noise 0.23 m,
// gap 2.5 noises.
func TestBuiltinAttribution(t *testing.T) {
	testenv.Long(t)
	r, err := Run(context.Background(), Builtin(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	s := r.Summary()
	t.Logf("\n%s", s)
	if !(s.LinearEddy.Correlation > s.Linear.Correlation) {
		t.Errorf("pattern correlation with (a): (c) %.4f, (b) %.4f: (c) should be closer", s.LinearEddy.Correlation, s.Linear.Correlation)
	}
	if !(s.LinearEddy.RMS < s.Linear.RMS) {
		t.Errorf("RMS difference from (a): (c) %.3f m, (b) %.3f m: (c) should be closer", s.LinearEddy.RMS, s.Linear.RMS)
	}
	if s.GapRMS < 1 || s.GapCorrelation < 1 {
		t.Errorf("(c) is closer to (a) than (b) by %.2f noises in RMS and %.2f in pattern correlation: want more than the sampling noise",
			s.GapRMS, s.GapCorrelation)
	}
	if s.Closure.Correlation < 0.99 {
		t.Errorf("closure check: pattern correlation %.4f with (a), want above 0.99", s.Closure.Correlation)
	}
}

// TestDecode checks a configuration file that mixes the experiment's keys
// with the attribution tables: both parts are read, a key neither knows is
// refused by name, and an array of patches replaces the base's as a whole
// without changing the base (common practice for TOML overlays: an array
// of tables in the document is the whole array).
func TestDecode(t *testing.T) {
	base := Builtin()
	c, err := Decode(strings.NewReader("[model]\nu1 = 20.0\n[anomaly]\namplitude = 2.0\n[sampling]\nsegments = 6\n"), base)
	if err != nil {
		t.Fatal(err)
	}
	if c.Model.U1 != 20 || c.Anomaly.Amplitude != 2 || c.Sampling.Segments != 6 {
		t.Errorf("decoded u1 %g, amplitude %g, segments %d; want 20, 2, 6", c.Model.U1, c.Anomaly.Amplitude, c.Sampling.Segments)
	}
	if c.Anomaly.Radius != base.Anomaly.Radius || c.Model.U2 != base.Model.U2 {
		t.Error("keys the file leaves out did not keep the base's values")
	}
	for _, tc := range []struct{ doc, want string }{
		{"[anomaly]\nradiuss = 1.0e6\n", "anomaly.radiuss"},
		{"[modle]\nnx = 64\n", "modle"},
		{"[model]\nnx = 64\nshear = 3.0\n", "model.shear"},
		{"[sampling]\nsegments = 3\n", "sampling.segments"},
		{"[model]\nu1 = \"fast\"\n", "u1"},
	} {
		if _, err := Decode(strings.NewReader(tc.doc), base); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want one naming %s", tc.doc, err, tc.want)
		}
	}

	base.Wavemaker.Mask = wavemaker.MaskConfig{Kind: wavemaker.Patches, Patches: []wavemaker.PatchConfig{
		{X: 8e6, Y: 4e6, WidthX: 1e6, WidthY: 1e6},
		{X: 8e6, Y: 6e6, WidthX: 1e6, WidthY: 1e6},
	}}
	before := base.Wavemaker.Mask.Patches[0]
	doc := "[[wavemaker.mask.patches]]\nx = 7.0e6\ny = 5.0e6\nwidth_x = 1.0e6\n"
	if _, err := Decode(strings.NewReader(doc), base); err == nil {
		t.Error("a patch without width_y was accepted (it would have inherited the base's)")
	}
	c, err = Decode(strings.NewReader(doc+"width_y = 2.0e6\n"), base)
	if err != nil {
		t.Fatal(err)
	}
	if p := c.Wavemaker.Mask.Patches; len(p) != 1 || p[0].X != 7e6 || p[0].WidthY != 2e6 {
		t.Errorf("decoded patches %+v, want the file's one patch", p)
	}
	if len(base.Wavemaker.Mask.Patches) != 2 || base.Wavemaker.Mask.Patches[0] != before {
		t.Error("Decode changed the base's patches")
	}
}
