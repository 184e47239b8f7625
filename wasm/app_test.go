package main

import (
	"errors"
	"image/color"
	"math"
	"os"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/palette"
	"github.com/eddyblock/eddyblock/qg"
)

// clock is a fake wall clock for the frame scheduler: each frame is 1/60 s.
type clock struct{ t time.Time }

func (c *clock) next() time.Time {
	c.t = c.t.Add(time.Second / 60)
	return c.t
}

func newTestApp(t *testing.T, scenario string, nx int) (*App, *clock) {
	t.Helper()
	c := &clock{t: time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC)}
	a, err := newApp(scenario, nx, c.t)
	if err != nil {
		t.Fatalf("newApp(%q, %d): %v", scenario, nx, err)
	}
	t.Cleanup(a.Close)
	return a, c
}

// runDays runs frames until the model has advanced by days, or fails the
// test after a bound on the frames.
func runDays(t *testing.T, a *App, c *clock, days float64) {
	t.Helper()
	end := a.exp.Model.Time() + days*86400
	for i := 0; a.exp.Model.Time() < end; i++ {
		if i > 100000 {
			t.Fatalf("no progress: model day %g", a.exp.Model.Time()/86400)
		}
		a.Frame(c.next())
		if a.failure != nil {
			t.Fatalf("the model stopped at day %.2f: %v", a.exp.Model.Time()/86400, a.failure)
		}
	}
}

// Page units convert to the library's SI units (common practice: 1 km =
// 10³ m, 1 h = 3600 s, 1 day = 86 400 s; day⁻¹ to s⁻¹ divides by 86 400),
// and read back as typed.
func TestControlUnits(t *testing.T) {
	s, err := newSettings("wave-train-strained-by-block", 64)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, value string
		got         func(s settings) float64
		want        float64
	}{
		{"train_wavelength", "1800", func(s settings) float64 { return s.Config.Wavemaker.Train.WavelengthX }, 1.8e6},
		{"train_amplitude", "2.5", func(s settings) float64 { return s.Config.Wavemaker.Train.Amplitude }, 2.5e-10},
		{"noise_rate", "20", func(s settings) float64 { return s.Config.Wavemaker.InjectionRate }, 2e-5},
		{"correlation", "12", func(s settings) float64 { return s.Config.Wavemaker.CorrelationTime }, 43200},
		{"drag", "0.25", func(s settings) float64 { return s.Config.Model.Drag }, 0.25 / 86400},
		{"relax_time", "4", func(s settings) float64 { return s.Config.Block.RelaxTime }, 4 * 86400},
		{"shear", "10", func(s settings) float64 { return s.Config.Model.U1 - s.Config.Model.U2 }, 10},
		{"block_height", "90", func(s settings) float64 { return s.Config.Block.Dipole.Height }, 90},
		{"source_x", "6000", func(s settings) float64 { return s.Config.Wavemaker.Mask.X }, 6e6},
		{"source_y", "4000", func(s settings) float64 { return s.Config.Wavemaker.Mask.Y }, 4e6},
	} {
		ctl, ok := findControl(c.name)
		if !ok {
			t.Fatalf("no control %q", c.name)
		}
		n, err := ctl.apply(s, c.value)
		if err != nil {
			t.Errorf("%s = %s: %v", c.name, c.value, err)
			continue
		}
		if got := c.got(n); math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("%s = %s: %g in SI, want %g", c.name, c.value, got, c.want)
		}
		if back := ctl.get(&n); back != c.value {
			t.Errorf("%s = %s reads back as %q", c.name, c.value, back)
		}
	}
	// the storm track's two patches move together, keeping their spacing
	st, err := newSettings("storm-track-ending-at-block", 64)
	if err != nil {
		t.Fatal(err)
	}
	ctl, _ := findControl("source_y")
	n, err := ctl.apply(st, "5500")
	if err != nil {
		t.Fatal(err)
	}
	p0, p1 := st.Config.Wavemaker.Mask.Patches, n.Config.Wavemaker.Mask.Patches
	if p1[0].Y-p1[1].Y != p0[0].Y-p0[1].Y || (p1[0].Y+p1[1].Y)/2 != 5.5e6 {
		t.Errorf("moving the storm track: patches at y = %g, %g (were %g, %g), want their mean at 5500 km", p1[0].Y, p1[1].Y, p0[0].Y, p0[1].Y)
	}
	if p0[0].Y != 8e6 {
		t.Errorf("applying to a copy changed the original's patches")
	}
}

// Values the controls cannot read are refused naming the control; the
// settings are not changed.
func TestControlRefusesUnreadable(t *testing.T) {
	s, _ := newSettings("wave-train-strained-by-block", 64)
	for _, c := range []struct{ name, value, want string }{
		{"shear", "ten", "not a number"},
		{"drag", "NaN", "not a number"},
		{"steps", "2.5", "whole number"},
		{"steps", "0", "whole number"},
		{"steps", "1000", "whole number"},
		{"scenario", "no-such", "is not one of"},
		{"grid", "100", "is not one of"},
		{"block", "maybe", "is not one of"},
	} {
		ctl, ok := findControl(c.name)
		if !ok {
			t.Fatalf("no control %q", c.name)
		}
		n, err := ctl.apply(s, c.value)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s = %q: error %v, want one containing %q", c.name, c.value, err, c.want)
		}
		if n.StepsPerFrame != s.StepsPerFrame || n.Config.Model.U1 != s.Config.Model.U1 {
			t.Errorf("%s = %q: a refused value changed the settings", c.name, c.value)
		}
	}
}

// A value the library refuses shows the library's error (a *qg.FieldError
// naming the configuration key) and leaves the running model as it was: the
// same model keeps stepping.
func TestRefusedValueKeepsModel(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 0.5)
	before, day := a.exp.Model, a.exp.Model.Time()
	err := a.Set("train_wavelength", "-100")
	var fe *qg.FieldError
	if !errors.As(err, &fe) || !strings.Contains(err.Error(), "wavemaker.train") {
		t.Fatalf("negative wavelength: error %v, want the library's FieldError naming wavemaker.train…", err)
	}
	st := a.Status()
	if st.LastError != err.Error() || st.Settings["train_wavelength"] != "1500" {
		t.Errorf("status after a refused value: lastError %q, wavelength %q", st.LastError, st.Settings["train_wavelength"])
	}
	if a.exp.Model != before {
		t.Fatalf("a refused value replaced the model")
	}
	runDays(t, a, c, 0.25)
	if a.exp.Model.Time() <= day || a.Status().State != "running" {
		t.Errorf("the model did not keep running after a refused value")
	}
}

// Physics changes carry the eddies over: the flow minus the block is the
// same before and after a change of the shear (which leaves the block as it
// is), so its energy is unchanged (the energy of a state does not depend on
// the imposed flow, DESIGN §2), the model time goes on and the running mean
// restarts.
func TestRebuildCarriesEddies(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 8)
	e0, t0 := a.eddyEnergy, a.exp.Model.Time()
	if e0 <= 0 || a.exp.Diag.Samples() == 0 {
		t.Fatalf("degenerate test: eddy energy %g, samples %d", e0, a.exp.Diag.Samples())
	}
	if err := a.Set("shear", "11"); err != nil {
		t.Fatal(err)
	}
	if d := math.Abs(a.eddyEnergy-e0) / e0; d > 1e-12 {
		t.Errorf("eddy energy %g after the change, %g before (relative change %g)", a.eddyEnergy, e0, d)
	}
	if a.exp.Model.Time() != t0 || a.exp.Diag.Samples() != 0 {
		t.Errorf("after a physics change: day %g (was %g), samples %d (want 0)", a.exp.Model.Time()/86400, t0/86400, a.exp.Diag.Samples())
	}
	if !strings.Contains(a.Status().Text["note"], "shear") {
		t.Errorf("the page does not say why the mean restarted: %q", a.Status().Text["note"])
	}
	// the block's amplitude: the eddies stay, the block changes
	if err := a.Set("block_height", "100"); err != nil {
		t.Fatal(err)
	}
	if d := math.Abs(a.eddyEnergy-e0) / e0; d > 1e-12 {
		t.Errorf("eddy energy %g after a new block amplitude, %g before", a.eddyEnergy, e0)
	}
	runDays(t, a, c, 0.5)
}

// With the wave source switched off the eddies decay: nothing injects
// energy, while the lower layer's Ekman drag and the sponge remove it (the
// model's energy budget, DESIGN §2); the shear is subcritical (U1 − U2 =
// 12 m s⁻¹ < 2βLd² ≈ 15.7 m s⁻¹, Phillips 1954), so no instability makes up
// for them.
func TestStrengthZeroDecays(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 12)
	e0 := a.eddyEnergy
	if err := a.Set("train_amplitude", "0"); err != nil {
		t.Fatal(err)
	}
	runDays(t, a, c, 10)
	t.Logf("eddy energy %.4g m² s⁻² at the switch, %.4g ten days later", e0, a.eddyEnergy)
	if !(a.eddyEnergy < 0.5*e0) {
		t.Errorf("eddy energy %g ten days after the source stopped, %g when it stopped: not decaying", a.eddyEnergy, e0)
	}
}

// A scenario switch starts again from day 0 with an empty running mean;
// clear empties the mean and keeps the model time.
func TestScenarioSwitchAndClear(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 6)
	if a.exp.Diag.Samples() == 0 {
		t.Fatal("degenerate test: no samples after 6 days")
	}
	day := a.exp.Model.Time()
	if err := a.Command("clear"); err != nil {
		t.Fatal(err)
	}
	if a.exp.Diag.Samples() != 0 || a.exp.Model.Time() != day {
		t.Errorf("clear: %d samples, day %g (was %g)", a.exp.Diag.Samples(), a.exp.Model.Time()/86400, day/86400)
	}
	runDays(t, a, c, 1)
	if a.exp.Diag.Samples() == 0 {
		t.Errorf("no samples after clear and a day")
	}
	if err := a.Set("scenario", "storm-track-ending-at-block"); err != nil {
		t.Fatal(err)
	}
	st := a.Status()
	if st.Day != 0 || st.Samples != 0 || st.Scenario != "storm-track-ending-at-block" || st.Settings["source"] != "white" {
		t.Errorf("after the switch: day %g, samples %d, scenario %q, source %q", st.Day, st.Samples, st.Scenario, st.Settings["source"])
	}
	if st.Grid != "64×32" {
		t.Errorf("the switch changed the grid to %s", st.Grid)
	}
}

// A forced blow-up (a wave train far too strong for the time step) stops
// the model with the library's StepError; the model stays stopped, its
// state is the last good one, and the page says so.
func TestBlowUpStops(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	if err := a.Set("train_amplitude", "1e5"); err != nil {
		t.Fatal(err)
	}
	for i := 0; a.failure == nil; i++ {
		if i > 20000 {
			t.Fatalf("no failure after %d frames (day %g)", i, a.exp.Model.Time()/86400)
		}
		a.Frame(c.next())
	}
	var se *qg.StepError
	if !errors.As(a.failure, &se) {
		t.Fatalf("stopped by %v, want a *qg.StepError", a.failure)
	}
	st := a.Status()
	if st.State != "stopped" || st.Failure != se.Error() || len(st.Warnings) == 0 || !strings.Contains(st.Warnings[0], se.Error()) {
		t.Errorf("status after the failure: state %q, failure %q, warnings %q", st.State, st.Failure, st.Warnings)
	}
	day := a.exp.Model.Time()
	for range 10 {
		a.Frame(c.next())
	}
	if a.exp.Model.Time() != day {
		t.Errorf("a stopped model advanced from day %g to %g", day/86400, a.exp.Model.Time()/86400)
	}
	if math.IsNaN(a.eddyEnergy) || math.IsInf(a.eddyEnergy, 0) {
		t.Errorf("the last good state is not finite: eddy energy %g", a.eddyEnergy)
	}
	// a change of the physics while stopped starts again from day 0
	if err := a.Set("train_amplitude", "5"); err != nil {
		t.Fatal(err)
	}
	if st := a.Status(); st.State != "running" || st.Day != 0 {
		t.Errorf("after a change while stopped: state %q, day %g; want running from day 0", st.State, st.Day)
	}
	runDays(t, a, c, 0.5)
}

// pause, step and resume.
func TestPauseStep(t *testing.T) {
	a, c := newTestApp(t, "white-noise-control", 64)
	a.Frame(c.next())
	if err := a.Command("pause"); err != nil {
		t.Fatal(err)
	}
	n := a.exp.Model.Steps()
	a.Frame(c.next())
	if a.exp.Model.Steps() != n {
		t.Errorf("paused model stepped")
	}
	if err := a.Command("step"); err != nil {
		t.Fatal(err)
	}
	if a.exp.Model.Steps() != n+1 || a.Status().State != "paused" {
		t.Errorf("step: %d steps (want %d), state %q", a.exp.Model.Steps(), n+1, a.Status().State)
	}
	if err := a.Command("toggle"); err != nil {
		t.Fatal(err)
	}
	a.Frame(c.next())
	if a.exp.Model.Steps() <= n+1 {
		t.Errorf("resumed model did not step")
	}
	if err := a.Command("launch"); err == nil {
		t.Errorf("unknown command accepted")
	}
}

// The running-mean panel shows the diagnostics' own field: after samples,
// it is EddyField's field of the chosen name, and the one-number answers
// are Summary's.
func TestMeanFieldAndAnswers(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 9)
	if err := a.Set("mean", "zt_vort"); err != nil {
		t.Fatal(err)
	}
	a.Frame(c.t.Add(2 * time.Second))
	f := a.exp.Diag.Fields()
	want, ok := f.Get("zt_vort1")
	if !ok {
		t.Fatal("no zt_vort1 in Fields")
	}
	sc := maxAbs(want.Data)
	for i := range want.Data {
		if math.Abs(a.mean[i]-want.Data[i]) > 1e-9*sc {
			t.Fatalf("mean panel at %d: %g, Fields' zt_vort1 %g", i, a.mean[i], want.Data[i])
		}
	}
	s := a.exp.Diag.Summary()
	st := a.Status()
	if !st.Answers.Valid || st.Answers.VortRate != s.EddyVorticity.Rate || st.Answers.EddyToDiss != s.EddyToDissipation {
		t.Errorf("answers %+v, Summary's vorticity rate %g, eddy/dissipation %g", st.Answers, s.EddyVorticity.Rate, s.EddyToDissipation)
	}
	if !strings.Contains(st.IndexPlot, "<polyline") {
		t.Errorf("no block index plot")
	}
}

// The frame path — samples, field refreshes, painting the fields —
// allocates nothing of its own once warm: a frame of one step allocates no
// more than the model's step itself, apart from the diagnostics' growing
// time series.
func TestFrameAllocations(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 6)
	a.set.StepsPerFrame = 1
	fw, fh := a.FieldSize()
	pix := make([]byte, 4*fw*fh)
	var pt painter
	a.PaintField(&pt, 0, pix)
	now := c.t
	frame := testing.AllocsPerRun(24, func() {
		a.Frame(now) // the same instant: no Summary is due
		a.PaintField(&pt, 0, pix)
		a.PaintField(&pt, 1, pix)
	})
	step := testing.AllocsPerRun(24, func() {
		if err := a.exp.Model.Step(); err != nil {
			t.Fatal(err)
		}
	})
	t.Logf("a frame of one step allocates %.2f times, the model's step %.2f times", frame, step)
	// Sample appends one value to each of the series' slices every
	// sampleEvery steps; amortised, well under one allocation per frame
	if frame-step >= 1 {
		t.Errorf("a frame allocates %.2f times beyond the model's step", frame-step)
	}
}

// The rate meter counts frames, steps and model time over the last second
// of wall time (exact arithmetic on a fake clock).
func TestRateMeter(t *testing.T) {
	var r rateMeter
	t0 := time.Unix(0, 0)
	for i := range 121 {
		r.add(t0.Add(time.Duration(i)*time.Second/60), 2*i, float64(i)*1800)
	}
	fps, sps, dps := r.get()
	if math.Abs(fps-60) > 1e-9 || math.Abs(sps-120) > 1e-9 || math.Abs(dps-60*1800.0/86400) > 1e-9 {
		t.Errorf("rates %g frames/s, %g steps/s, %g days/s; want 60, 120, %g", fps, sps, dps, 60*1800.0/86400)
	}
}

// The colour range follows a growing field at once and a weakening one
// with an e-folding time of holdTime (the exponential relaxation
// m(t) = obs + (m0 − obs) e^(−t/τ)).
func TestRangeHold(t *testing.T) {
	var h rangeHold
	t0 := time.Unix(0, 0)
	if got := h.update(2, t0); got != 2 {
		t.Errorf("first value: %g", got)
	}
	if got := h.update(3, t0.Add(time.Second)); got != 3 {
		t.Errorf("growing: %g, want 3", got)
	}
	got := h.update(1, t0.Add(time.Second+holdTime))
	if want := 1 + 2/math.E; math.Abs(got-want) > 1e-12 {
		t.Errorf("after one hold time: %g, want %g", got, want)
	}
}

// Number formats of the readouts.
func TestSci(t *testing.T) {
	for _, c := range []struct {
		v      float64
		digits int
		want   string
	}{
		{3.14159e-5, 2, "3.1×10⁻⁵"},
		{-2.5e-10, 2, "-2.5×10⁻¹⁰"},
		{9.999e-6, 2, "1.0×10⁻⁵"},
		{12.34, 3, "12.3"},
		{1.5e7, 2, "1.5×10⁷"},
		{0, 2, "0"},
	} {
		if got := sci(c.v, c.digits); got != c.want {
			t.Errorf("sci(%g, %d) = %q, want %q", c.v, c.digits, got, c.want)
		}
	}
	if lo, hi := rangeText(2.5e-10); lo != "−2.5×10⁻¹⁰" || hi != "+2.5×10⁻¹⁰" {
		t.Errorf("range labels %q, %q", lo, hi)
	}
	if lo, _ := rangeText(0); lo != "no data yet" {
		t.Errorf("empty range labelled %q", lo)
	}
}

// The layout keeps the domain's aspect ratio, puts the panels side by side
// within the picture and each colour bar under its panel.
func TestLayout(t *testing.T) {
	for _, c := range []struct{ w, h int }{{1000, 264}, {1366, 360}, {800, 600}, {300, 50}} {
		l := makeLayout(c.w, c.h, 2)
		for k := range 2 {
			p, b := l.Panel[k], l.Bar[k]
			if p.Empty() || b.Empty() || p.Max.X > c.w || b.Max.Y > c.h || p.Min.X < 0 || p.Min.Y < 0 {
				t.Errorf("%d×%d: panel %d %v, bar %v", c.w, c.h, k, p, b)
			}
			if r := float64(p.Dx()) / float64(p.Dy()); math.Abs(r-2) > 2.0/float64(p.Dy())+0.02 {
				t.Errorf("%d×%d: panel %d aspect %g, want 2", c.w, c.h, k, r)
			}
			if b.Min.Y < p.Max.Y || b.Min.X != p.Min.X || b.Dx() != p.Dx() {
				t.Errorf("%d×%d: bar %v not under panel %v", c.w, c.h, b, p)
			}
		}
		if l.Panel[0].Max.X >= l.Panel[1].Min.X {
			t.Errorf("%d×%d: panels overlap", c.w, c.h)
		}
	}
}

// The pictures: each field image shows its field on the signed scale
// (many colours, its largest value in the scale's colour for it, within
// the range shown); the overlay
// is transparent over most of the fields, with the block's dark outline and
// the sponge's veil, and its colour bars run through the signed scale.
func TestPaint(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 7)
	a.Frame(c.t.Add(2 * time.Second))
	fw, fh := a.FieldSize()
	if fw != fieldScale*64 || fh != fieldScale*32 {
		t.Fatalf("field size %d×%d", fw, fh)
	}
	s := palette.Signed()
	var pt painter
	for k := range 2 {
		pix := make([]byte, 4*fw*fh)
		a.PaintField(&pt, k, pix)
		colours := map[[3]byte]bool{}
		for i := 0; i < len(pix); i += 4 {
			colours[[3]byte{pix[i], pix[i+1], pix[i+2]}] = true
		}
		if len(colours) < 100 {
			t.Errorf("field %d: %d colours", k, len(colours))
		}
	}
	// a smooth field of known values: each pixel shows the scale's colour
	// of the bilinear interpolation (done here, independently) of the
	// periodic grid at the pixel's centre, north up
	nx, ny := 64, 32
	for j := range ny {
		for i := range nx {
			a.live[j*nx+i] = math.Sin(2*math.Pi*float64(i)/float64(nx)) * math.Cos(2*math.Pi*float64(j)/float64(ny))
		}
	}
	a.liveHold.m = 1
	fpix := make([]byte, 4*fw*fh)
	a.PaintField(&pt, 0, fpix)
	val := func(i, j int) float64 { return a.live[((j+ny)%ny)*nx+(i+nx)%nx] }
	for _, p := range [][2]int{{0, 0}, {5, 7}, {31, 40}, {127, 63}, {64, 1}} {
		px, py := p[0], p[1]
		x := -0.5 + (float64(px)+0.5)/float64(fw)*float64(nx)
		y := -0.5 + (float64(fh-py)-0.5)/float64(fh)*float64(ny)
		i0, j0 := int(math.Floor(x)), int(math.Floor(y))
		fx, fy := x-float64(i0), y-float64(j0)
		v := (1-fx)*(1-fy)*val(i0, j0) + fx*(1-fy)*val(i0+1, j0) + (1-fx)*fy*val(i0, j0+1) + fx*fy*val(i0+1, j0+1)
		want := s.Value(v, palette.Range{Lo: -1, Hi: 1})
		o := 4 * (py*fw + px)
		if d := colourDistance([3]byte{fpix[o], fpix[o+1], fpix[o+2]}, want); d > 4 {
			t.Errorf("smooth field, pixel (%d, %d): %v, want the scale's %v for %g", px, py, fpix[o:o+3], want, v)
		}
	}
	const w, h = 1000, 264
	pix := make([]byte, 4*w*h)
	a.PaintOverlay(pix, w, h)
	l := a.Layout(w, h)
	at := func(x, y int) [4]byte { o := 4 * (y*w + x); return [4]byte{pix[o], pix[o+1], pix[o+2], pix[o+3]} }
	bar := l.Bar[0]
	y := (bar.Min.Y + bar.Max.Y) / 2
	for _, f := range []float64{0.1, 0.3, 0.7, 0.9} {
		x := bar.Min.X + int(f*float64(bar.Dx()))
		want := s.At((float64(x-bar.Min.X) + 0.5) / float64(bar.Dx()))
		if got := at(x, y); got != [4]byte{want.R, want.G, want.B, 255} {
			t.Errorf("colour bar at %.0f %%: %v, want the scale's %v", 100*f, got, want)
		}
	}
	for k := range 2 {
		clearPx, dark, veiled := 0, 0, 0
		p := l.Panel[k]
		for y := p.Min.Y + 3; y < p.Max.Y-3; y++ {
			for x := p.Min.X + 3; x < p.Max.X-3; x++ {
				c := at(x, y)
				switch {
				case c[3] == 0:
					clearPx++
				case c[3] == 255 && int(c[0])+int(c[1])+int(c[2]) < 200:
					dark++
				case c[0] == c[3] && c[1] == c[3] && c[2] == c[3]:
					veiled++ // premultiplied white
				}
			}
		}
		n := (p.Dx() - 6) * (p.Dy() - 6)
		if clearPx < n/2 || dark < 50 || veiled < n/10 {
			t.Errorf("overlay over panel %d: %d of %d pixels clear, %d dark outline pixels, %d veiled", k, clearPx, n, dark, veiled)
		}
	}
}

// colourDistance is the Euclidean distance of two sRGB colours, 0–441.
func colourDistance(a [3]byte, b color.RGBA) float64 {
	dr, dg, db := float64(a[0])-float64(b.R), float64(a[1])-float64(b.G), float64(a[2])-float64(b.B)
	return math.Sqrt(dr*dr + dg*dg + db*db)
}

// The page's controls and readouts are the program's: every data-control
// of index.html names a control, every data-readout a key of Status.Text,
// and every control has a place on the page.
func TestPageMatchesProgram(t *testing.T) {
	b, err := os.ReadFile("../index.html")
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	a, _ := newTestApp(t, experiment.Default().Name, 64)
	st := a.Status()
	onPage := map[string]bool{}
	for _, m := range regexp.MustCompile(`data-control="([a-z_0-9]+)"`).FindAllStringSubmatch(page, -1) {
		onPage[m[1]] = true
		if _, ok := findControl(m[1]); !ok {
			t.Errorf("index.html has a control %q the program does not know", m[1])
		}
	}
	for _, c := range controls() {
		if !onPage[c.Name] {
			t.Errorf("control %q (%s) is not on the page", c.Name, c.Label)
		}
	}
	for _, m := range regexp.MustCompile(`data-readout="([^"]+)"`).FindAllStringSubmatch(page, -1) {
		if _, ok := st.Text[m[1]]; !ok {
			t.Errorf("index.html shows a readout %q the status does not have", m[1])
		}
	}
	for _, m := range regexp.MustCompile(`data-show="([^":]+):([^"]+)"`).FindAllStringSubmatch(page, -1) {
		if _, ok := st.Settings[m[1]]; !ok {
			t.Errorf("index.html shows or hides by %q, which is not a control", m[1])
		}
	}
	for _, cmd := range regexp.MustCompile(`data-command="([^"]+)"`).FindAllStringSubmatch(page, -1) {
		if cmd[1] == "reset" {
			continue // a reset rebuilds the model: tested above
		}
		if err := a.Command(cmd[1]); err != nil {
			t.Errorf("index.html's button %q: %v", cmd[1], err)
		}
	}
}
