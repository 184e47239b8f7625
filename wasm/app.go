package main

import (
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/palette"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// Timing of the work that is not done every frame.
const (
	// sampleHours is the model time between two samples of the running
	// mean (the diagnostics' Sample), h.
	sampleHours = 3
	// spinupDays is the model time a fresh run waits before it starts the
	// running mean, so that the waves' first arrival at the block does not
	// weigh on it, days.
	spinupDays = 5
	// summaryEvery is the wall time between two updates of the one-number
	// answers and the block index plot (the diagnostics' Summary, which
	// costs several steps).
	summaryEvery = time.Second
	// rateWindow is the wall time over which frames/s, steps/s and model
	// days/s are measured.
	rateWindow = time.Second
	// cflWarn is the fraction of the CFL limit above which the page warns.
	cflWarn = 0.8
	// vectorsEvery is the wall time between two updates of the E-vectors
	// and mean-streamfunction contours over the running mean: a running
	// mean changes slowly, and the arrows cost a full-resolution repaint.
	vectorsEvery = 250 * time.Millisecond
)

// App is the instrument without the browser: the experiment, the frame
// scheduler (steps, diagnostic samples, field refreshes), the status the
// page shows and the picture. It is not safe for concurrent use.
type App struct {
	set settings
	exp *experiment.Experiment
	g   *qg.Grid
	ph  qg.Physics

	plan     *fft.Plan2D // display transforms, on the caller
	spec     []complex128
	eddy     [2][]complex128 // ψ − ψ_B, for the eddy energy
	blockPsi [2][]complex128 // ψ_B as prescribed, spectral (nil without a block)
	blockQ   [2][]complex128
	blockGrd [2][]float64 // ψ_B and q_B of the fixed mode's display, gridded
	blockQG  [2][]float64
	live     []float64 // the live field, gridded
	mean     []float64 // the running-mean field, gridded
	outline  []palette.Segment
	veil     []float64 // sponge rate per grid column over its peak, 0…1

	// The E-vectors and the time-mean streamfunction of the shown layer,
	// drawn over the running mean when the arrows are on (see vectors.go).
	ex, ey, psiMean []float64
	contours        []palette.Segment
	vecMax          float64 // the largest |E| of the arrows drawn, m² s⁻²
	vecInterval     float64 // the contour interval of the mean ψ, m² s⁻¹
	vecSamples      int     // samples behind the arrows drawn
	vecAt           time.Time
	vecStale        bool

	paused      bool
	failure     error  // the StepError that stopped the model, nil while it can run
	lastError   string // the last error of any kind, "" when none yet
	meanNote    string // why the running mean was restarted, if it was
	meanName    string // the diagnostics' name of the running-mean field shown
	sampleEvery int    // steps between samples
	sinceSample int
	meanSamples int // samples behind the mean field shown
	meanStale   bool
	liveStale   bool
	eddyEnergy  float64

	answers    answers
	summaryAt  time.Time
	summaryN   int
	indexPlot  string
	liveHold   rangeHold
	meanHold   rangeHold
	rates      rateMeter
	frames     int
	firstFrame time.Time
	start      time.Time
	// liveVer, meanVer, overlayVer and vecVer are incremented when the
	// live field, the running-mean field, the overlay or the arrows over
	// the running mean must be repainted.
	liveVer, meanVer, overlayVer, vecVer int

	// workMs and paintMs are moving averages of the wall time of Frame and
	// Paint, ms: where a frame's time goes, for the speed harness.
	workMs, paintMs float64
}

// ema updates a moving average of durations in ms over about 20 frames.
func ema(avg float64, d time.Duration) float64 {
	ms := float64(d.Microseconds()) / 1000
	if avg == 0 {
		return ms
	}
	return avg + (ms-avg)/20
}

// newApp builds the instrument on the built-in scenario name at nx grid
// points along x.
func newApp(name string, nx int, now time.Time) (*App, error) {
	s, err := newSettings(name, nx)
	if err != nil {
		return nil, err
	}
	a := &App{start: now}
	if err := a.build(s, false); err != nil {
		return nil, err
	}
	return a, nil
}

// build makes the experiment of s. With carry, the eddies of the running
// model are carried over to the new one (which must be on the same grid)
// and the model time goes on; otherwise the new run starts at day 0. The
// running mean restarts either way. On error nothing changes.
func (a *App) build(s settings, carry bool) error {
	c := s.Config
	c.Run.SpinUpDays = spinupDays
	if carry {
		c.Run.SpinUpDays = 0
	}
	e, err := experiment.New(c)
	if err != nil {
		return err
	}
	m := e.Model
	if carry {
		if err := a.carryEddies(m); err != nil {
			e.Close()
			return err
		}
		if e.Diag, err = diag.New(m, diag.Options{Spinup: m.Time(), Norm: c.Diag.Norm, Transient: c.Diag.Transient}); err != nil {
			e.Close()
			return err
		}
	}
	g := m.Grid()
	plan, err := fft.NewPlan2D(g.Nx, g.Ny, 1)
	if err != nil {
		e.Close()
		return err
	}
	if a.exp != nil {
		a.exp.Close()
	}
	if a.plan != nil {
		a.plan.Close()
	}
	a.set, a.exp, a.g, a.ph, a.plan = s, e, g, m.Physics(), plan
	a.meanName = fmt.Sprintf("%s%d", s.Mean, s.Layer)
	ns, np := g.Len(), g.Points()
	a.spec = make([]complex128, ns)
	a.live, a.mean = make([]float64, np), make([]float64, np)
	a.ex, a.ey, a.psiMean = make([]float64, np), make([]float64, np), make([]float64, np)
	a.vecStale, a.vecSamples, a.vecMax, a.vecInterval, a.contours = true, 0, 0, 0, a.contours[:0]
	a.eddy = [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	a.blockPsi, a.blockQ, a.blockGrd, a.blockQG = [2][]complex128{}, [2][]complex128{}, [2][]float64{}, [2][]float64{}
	a.outline = a.outline[:0]
	if bp, ok := m.BlockStreamfunction(); ok {
		bq, _ := m.BlockPV()
		for n := range 2 {
			a.blockPsi[n] = append([]complex128(nil), bp[n]...)
			a.blockQ[n] = append([]complex128(nil), bq[n]...)
			a.blockGrd[n] = make([]float64, np)
			a.blockQG[n] = make([]float64, np)
			a.plan.Inverse(a.blockGrd[n], a.blockPsi[n])
			a.plan.Inverse(a.blockQG[n], a.blockQ[n])
		}
		a.outline = blockOutline(a.outline, palette.Grid{Values: a.blockGrd[0], Nx: g.Nx, Ny: g.Ny})
	}
	a.veil = make([]float64, g.Nx)
	if sr := m.SpongeRate(); sr != nil {
		peak := 0.0
		for _, r := range sr {
			peak = math.Max(peak, r)
		}
		for i, r := range sr {
			if peak > 0 {
				a.veil[i] = r / peak
			}
		}
	}
	a.sampleEvery = max(1, int(math.Round(sampleHours*3600/c.Model.Dt)))
	a.sinceSample = 0
	a.meanSamples = -1
	a.meanStale, a.liveStale = true, true
	a.failure = nil
	a.answers = answers{}
	a.summaryN = -1
	a.summaryAt = time.Time{}
	a.indexPlot = ""
	a.liveHold, a.meanHold = rangeHold{}, rangeHold{}
	a.updateEddyEnergy()
	a.liveVer++
	a.meanVer++
	a.overlayVer++
	a.vecVer++
	return nil
}

// carryEddies sets the state of the new model m to the eddies of the
// running model plus m's own block, at the running model's time, and
// checks the result as a step would.
func (a *App) carryEddies(m *qg.Model) error {
	old := a.exp.Model
	q := old.SpectralPV()
	ns := len(q[0])
	var nq [2][]complex128
	oldFixed, newFixed := old.BlockMode() == qg.Fixed, m.BlockMode() == qg.Fixed
	newB, hasNew := m.BlockPV()
	for n := range 2 {
		nq[n] = make([]complex128, ns)
		for p := range ns {
			e := q[n][p]
			if a.blockQ[n] != nil && !oldFixed {
				e -= a.blockQ[n][p]
			}
			if hasNew && !newFixed {
				e += newB[n][p]
			}
			nq[n][p] = e
		}
	}
	// the new model's own checkpoint with the carried state and time: its
	// configuration is the new one, its books and AB3 history start afresh
	ck := m.Checkpoint()
	ck.Q, ck.Time, ck.Steps = nq, old.Time(), 0
	ck.History, ck.HistoryRates = nil, nil
	if err := m.Restore(ck); err != nil {
		return err
	}
	if err := m.CheckState(); err != nil {
		return fmt.Errorf("the flow as it is now cannot run with the new settings: %w", err)
	}
	return nil
}

// Close stops the model's goroutines.
func (a *App) Close() {
	if a.exp != nil {
		a.exp.Close()
	}
	if a.plan != nil {
		a.plan.Close()
	}
}

// Set applies a control change. A value the control or the library
// refuses leaves everything as it was and returns the error, which the
// status shows too.
func (a *App) Set(name, value string) error {
	err := a.set1(name, value)
	if err != nil {
		a.lastError = err.Error()
	}
	return err
}

func (a *App) set1(name, value string) error {
	c, ok := findControl(name)
	if !ok {
		return fmt.Errorf("no control named %q", name)
	}
	s, err := c.apply(a.set, value)
	if err != nil {
		return err
	}
	switch c.Effect {
	case display:
		a.set = s
		a.meanName = fmt.Sprintf("%s%d", s.Mean, s.Layer)
		a.meanStale, a.liveStale, a.vecStale = true, true, true
		a.liveHold, a.meanHold = rangeHold{}, rangeHold{}
	case schedule:
		a.set = s
	case rebuild:
		if a.failure != nil {
			// the stopped model's flow cannot be trusted: start again
			if err := a.build(s, false); err != nil {
				return fmt.Errorf("%s = %s refused: %w", lower(c.Label), value, err)
			}
			a.meanNote = fmt.Sprintf("started again from day 0 after the model had stopped, with the new %s", lower(c.Label))
			return nil
		}
		if err := a.build(s, true); err != nil {
			return fmt.Errorf("%s = %s refused: %w", lower(c.Label), value, err)
		}
		a.meanNote = fmt.Sprintf("restarted at day %.1f: %s changed", a.exp.Model.Time()/86400, lower(c.Label))
	case restart:
		if err := a.build(s, false); err != nil {
			return fmt.Errorf("%s = %s refused: %w", lower(c.Label), value, err)
		}
		a.meanNote = ""
	}
	return nil
}

// Command runs one of the page's buttons: pause, resume, toggle (pause or
// resume), step (one step, then paused), reset (day 0 with the current
// settings) and clear (restart the running mean now).
func (a *App) Command(name string) error {
	switch name {
	case "pause":
		a.paused = true
	case "resume":
		a.paused = false
		if a.failure != nil {
			a.failure = nil // the next step shows whether it still fails
			a.overlayVer++
		}
	case "toggle":
		if a.paused || a.failure != nil {
			return a.Command("resume")
		}
		a.paused = true
	case "step":
		a.paused = true
		if a.failure != nil {
			a.failure = nil
			a.overlayVer++
		}
		a.advance(1)
	case "reset":
		if err := a.build(a.set, false); err != nil {
			a.lastError = err.Error()
			return err
		}
		a.meanNote = ""
	case "clear":
		c := a.exp.Config
		d, err := diag.New(a.exp.Model, diag.Options{Spinup: a.exp.Model.Time(), Norm: c.Diag.Norm, Transient: c.Diag.Transient})
		if err != nil {
			a.lastError = err.Error()
			return err
		}
		a.exp.Diag = d
		a.sinceSample = 0
		a.meanSamples, a.summaryN = -1, -1
		a.meanStale, a.vecStale = true, true
		a.answers, a.indexPlot = answers{}, ""
		a.meanHold = rangeHold{}
		a.meanNote = fmt.Sprintf("cleared at day %.1f", a.exp.Model.Time()/86400)
	default:
		return fmt.Errorf("no command %q (pause, resume, toggle, step, reset, clear)", name)
	}
	return nil
}

// Frame does one frame's work at wall time now: the steps of the frame
// (unless paused or stopped), a diagnostic sample every sampleEvery steps,
// the live and running-mean fields when they changed, the one-number
// answers once per summaryEvery, and the rate meters.
func (a *App) Frame(now time.Time) {
	t0 := time.Now()
	defer func() { a.workMs = ema(a.workMs, time.Since(t0)) }()
	if a.frames == 0 {
		a.firstFrame = now
	}
	a.frames++
	if !a.paused && a.failure == nil {
		a.advance(a.set.StepsPerFrame)
	}
	a.refresh(now)
	a.rates.add(now, a.exp.Model.Steps(), a.exp.Model.Time())
}

// advance takes up to n steps, sampling the diagnostics on schedule; a
// failed step stops the model and records the error.
func (a *App) advance(n int) {
	m := a.exp.Model
	for range n {
		if err := m.Step(); err != nil {
			a.stop(err)
			break
		}
		a.liveStale = true
		a.sinceSample++
		if a.sinceSample >= a.sampleEvery {
			a.sinceSample = 0
			if err := a.exp.Diag.Sample(); err != nil {
				a.stop(err)
				break
			}
		}
	}
	if a.liveStale {
		a.updateEddyEnergy()
	}
}

// stop pauses the model after a failure.
func (a *App) stop(err error) {
	a.failure = err
	a.overlayVer++ // the stopped model's frame
	a.lastError = err.Error()
	var se *qg.StepError
	if !errors.As(err, &se) {
		a.lastError = "diagnostics: " + a.lastError
	}
}

// refresh recomputes what changed: the live field, the running-mean field
// after new samples, and (at most once per summaryEvery) the answers.
func (a *App) refresh(now time.Time) {
	if a.liveStale {
		a.liveField()
		a.liveHold.update(maxAbs(a.live), now)
		a.liveStale = false
		a.liveVer++
	}
	d := a.exp.Diag
	if n := d.Samples(); a.meanStale || n != a.meanSamples {
		if err := d.EddyField(a.meanName, a.mean); err != nil {
			a.lastError = err.Error()
		}
		a.meanHold.update(maxAbs(a.mean), now)
		a.meanSamples, a.meanStale = n, false
		a.meanVer++
	}
	a.refreshVectors(now)
	if n := d.Samples(); n != a.summaryN && now.Sub(a.summaryAt) >= summaryEvery {
		a.summaryAt, a.summaryN = now, n
		a.answers = answersOf(d.Summary(), a.exp.HasBlock)
		if a.exp.HasBlock {
			sr := d.Series()
			a.indexPlot = indexSVG(sr.Time, sr.Index)
		}
	}
}

// liveField sets a.live to the selected field of the selected layer.
func (a *App) liveField() {
	m, n := a.exp.Model, a.set.Layer-1
	fixed := m.BlockMode() == qg.Fixed
	var src []complex128
	var block []float64
	switch a.set.Live {
	case "psi", "height":
		src = m.SpectralStreamfunction()[n]
		block = a.blockGrd[n]
	default:
		src = m.SpectralPV()[n]
		block = a.blockQG[n]
	}
	copy(a.spec, src)
	a.spec[0] = 0 // the domain mean of q is dynamically inert
	a.plan.Inverse(a.live, a.spec)
	if fixed && block != nil {
		for i, b := range block {
			a.live[i] += b
		}
	}
	switch a.set.Live {
	case "height":
		f := a.exp.Config.Model.F0 / qg.Gravity
		for i := range a.live {
			a.live[i] *= f
		}
	case "pv_total":
		qy := [2]float64{a.ph.Q1y, a.ph.Q2y}[n]
		g := a.g
		for j := range g.Ny {
			b := qy * (g.Y(j) - g.Ly/2)
			row := a.live[j*g.Nx : (j+1)*g.Nx]
			for i := range row {
				row[i] += b
			}
		}
	}
}

// updateEddyEnergy sets the energy of the eddies: of the flow minus the
// prescribed block (the model's state itself in the fixed mode), with the
// model's energy inner product (qg.Grid.EnergyProduct), m² s⁻².
func (a *App) updateEddyEnergy() {
	m := a.exp.Model
	psi := m.SpectralStreamfunction()
	fixed := m.BlockMode() == qg.Fixed
	for n := range 2 {
		copy(a.eddy[n], psi[n])
		if a.blockPsi[n] != nil && !fixed {
			for p, b := range a.blockPsi[n] {
				a.eddy[n][p] -= b
			}
		}
	}
	kin, pot := a.g.EnergyProduct(a.ph, a.eddy, a.eddy)
	a.eddyEnergy = (kin + pot) / 2
}

// blockOutline appends the contours of the block's upper-layer ψ_B at half
// the peak of each lobe.
func blockOutline(dst []palette.Segment, g palette.Grid) []palette.Segment {
	var hi, lo float64
	for _, v := range g.Values {
		hi, lo = math.Max(hi, v), math.Min(lo, v)
	}
	for _, level := range []float64{hi / 2, lo / 2} {
		if level == 0 {
			continue
		}
		if s, err := palette.Contour(dst, g, level, true); err == nil {
			dst = s
		}
	}
	return dst
}

// maxAbs returns the largest |v| over the finite values.
func maxAbs(x []float64) float64 {
	var m float64
	for _, v := range x {
		if a := math.Abs(v); a > m && !math.IsInf(a, 0) {
			m = a
		}
	}
	return m
}

// rangeHold keeps a colour range steady: it follows a growing field at
// once and a weakening one with an e-folding time of holdTime, so the
// colours do not flicker from frame to frame.
type rangeHold struct {
	m    float64
	last time.Time
}

const holdTime = 2 * time.Second

// update takes the field's current largest |value| at time now and returns
// the half-width of the symmetric range to show.
func (h *rangeHold) update(obs float64, now time.Time) float64 {
	if !(obs >= 0) || math.IsInf(obs, 0) {
		return h.m
	}
	switch {
	case h.last.IsZero() || obs >= h.m:
		h.m = obs
	default:
		dt := now.Sub(h.last).Seconds()
		h.m = obs + (h.m-obs)*math.Exp(-dt/holdTime.Seconds())
	}
	h.last = now
	return h.m
}

// rateMeter measures frames/s, steps/s and model days/s over the last
// rateWindow of wall time, in a fixed ring (no allocation per frame).
type rateMeter struct {
	t     [128]time.Time
	steps [128]int
	model [128]float64
	n, i  int
}

func (r *rateMeter) add(now time.Time, steps int, model float64) {
	r.t[r.i], r.steps[r.i], r.model[r.i] = now, steps, model
	r.i = (r.i + 1) % len(r.t)
	r.n = min(r.n+1, len(r.t))
}

// get returns frames/s, steps/s and model days per wall second; zeros
// until two frames have been seen.
func (r *rateMeter) get() (fps, sps, dps float64) {
	if r.n < 2 {
		return 0, 0, 0
	}
	last := (r.i - 1 + len(r.t)) % len(r.t)
	first := last
	for k := 1; k < r.n; k++ {
		j := (last - k + len(r.t)) % len(r.t)
		first = j
		if r.t[last].Sub(r.t[j]) >= rateWindow {
			break
		}
	}
	dt := r.t[last].Sub(r.t[first]).Seconds()
	if dt <= 0 {
		return 0, 0, 0
	}
	ds := r.steps[last] - r.steps[first]
	dm := r.model[last] - r.model[first]
	if ds < 0 || dm < 0 { // a restart within the window
		ds, dm = 0, 0
	}
	frames := float64((last - first + len(r.t)) % len(r.t))
	return frames / dt, float64(ds) / dt, dm / 86400 / dt
}
