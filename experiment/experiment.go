package experiment

import (
	"context"
	"encoding"
	"errors"
	"fmt"
	"maps"
	"math"

	"github.com/eddyblock/eddyblock/internal/settings"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// Experiment is a configured model with its block, its wave source and its
// diagnostics, ready to run.
type Experiment struct {
	Config Config
	Model  *qg.Model
	Maker  wavemaker.Maker
	// Diag accumulates the diagnostics; Run samples it every
	// Config.Run.SampleSteps steps, averaging after the spin-up.
	Diag *diag.Accumulator
	// HasBlock reports whether a block is prescribed.
	HasBlock bool

	// the state at the last progress report
	lastLedger qg.Ledger
	lastTime   float64
	lastEnergy float64
}

// New validates c and builds the experiment at t = 0, checking the initial
// state as a step would (finite, CFL number within model.max_cfl). Call
// Close when done with it.
func New(c Config) (e *Experiment, err error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	m, err := qg.NewModel(c.Model)
	if err != nil {
		return nil, prefix("model.", err)
	}
	defer func() {
		if err != nil {
			m.Close()
		}
	}()
	e = &Experiment{Config: c, Model: m}
	if c.Block.Enabled() {
		b, err := c.Block.Block(c.Model)
		if err != nil {
			return nil, err
		}
		if err := m.SetBlock(b); err != nil {
			return nil, err
		}
		e.HasBlock = true
	}
	// the checks of a step's start, on the initial state: a block too
	// strong for the time step is refused now, not at the first step
	if err := m.CheckState(); err != nil {
		return nil, fmt.Errorf("experiment: initial state: %w", err)
	}
	mk, err := wavemaker.New(c.Wavemaker, m)
	if err != nil {
		return nil, err
	}
	mk.Attach(m)
	e.Maker = mk
	e.Diag, err = diag.New(m, diag.Options{Spinup: c.Run.SpinUpDays * 86400, Norm: c.Diag.Norm, Transient: c.Diag.Transient})
	ke, ape := m.Energy()
	e.lastEnergy = ke + ape
	if err != nil {
		return nil, err
	}
	return e, nil
}

// Close stops the goroutines of the experiment's model. The experiment's
// results can still be read; it cannot step again.
func (e *Experiment) Close() { e.Model.Close() }

// Progress is one line of a run's log.
type Progress struct {
	Day      float64 // model time, days
	KE, APE  float64 // energy of the state (eddies in the fixed mode), m² s⁻²
	CFL      float64
	Rates    qg.Ledger // mean rate of each budget term since the last report, m² s⁻³
	Residual float64   // d(KE+APE)/dt minus the sum of the rates, m² s⁻³
}

// ProgressUnits is the line a run prints before its progress lines, giving
// the units of their numbers.
const ProgressUnits = "progress: model day; KE, APE in m² s⁻²; CFL number; after the bar, the mean rate of each energy-budget term since the previous line, m² s⁻³"

// String prints the progress line: the model day, the energies (m² s⁻²),
// the CFL number, and after the bar the mean rate of each budget term since
// the last line (m² s⁻³), named as the qg.Terms are — injection by the
// external forcing (the wave source), conversion from the imposed shear,
// the block's maintenance, Ekman drag, scale-selective dissipation, the
// sponge — and the residual d(KE+APE)/dt − Σ rates of the books (the
// advection term, which only exchanges energy, is in the sum but not
// shown).
func (p Progress) String() string {
	r := &p.Rates
	return fmt.Sprintf("day %6.1f  KE %7.4g  APE %7.4g  CFL %5.3f | injection %9.3g  shear %9.3g  maintenance %9.3g  drag %9.3g  scale_selective %9.3g  sponge %9.3g  residual %8.2g",
		p.Day, p.KE, p.APE, p.CFL, r[qg.TermInjection], r[qg.TermShear], r[qg.TermMaintenance], r[qg.TermDrag],
		r[qg.TermScaleSelective], r[qg.TermSponge], p.Residual)
}

// StepsPerDay returns the number of steps in a day of model time, rounded.
func (e *Experiment) StepsPerDay() float64 { return 86400 / e.Config.Model.Dt }

// TotalSteps returns the number of steps of the whole run,
// Config.Run.Days rounded to whole steps.
func (e *Experiment) TotalSteps() int {
	return int(math.Round(e.Config.Run.Days * 86400 / e.Config.Model.Dt))
}

// Done reports whether the run has taken all its steps.
func (e *Experiment) Done() bool { return e.Model.Steps() >= e.TotalSteps() }

// Advance takes one time step and samples the diagnostics when
// Config.Run.SampleSteps says so. When a progress report is due (every
// Config.Run.ReportDays, and at the last step) it returns the Progress
// since the previous report and true. A failed step returns the model's
// *qg.StepError and leaves the experiment as it was before the step.
func (e *Experiment) Advance() (Progress, bool, error) {
	c := e.Config
	if err := e.Model.Step(); err != nil {
		return Progress{}, false, err
	}
	n := e.Model.Steps()
	if n%c.Run.SampleSteps == 0 {
		if err := e.Diag.Sample(); err != nil {
			return Progress{}, false, err
		}
	}
	every := max(1, int(math.Round(c.Run.ReportDays*86400/c.Model.Dt)))
	if n%every == 0 || n == e.TotalSteps() {
		return e.progress(), true, nil
	}
	return Progress{}, false, nil
}

// Run integrates to Config.Run.Days, calling report every ReportDays (if
// report is not nil). It stops early when ctx is cancelled (returning
// ctx.Err()) or when the model fails (a *qg.StepError).
func (e *Experiment) Run(ctx context.Context, report func(Progress)) error {
	for !e.Done() {
		if err := ctx.Err(); err != nil {
			return err
		}
		p, due, err := e.Advance()
		if err != nil {
			return err
		}
		if due && report != nil {
			report(p)
		}
	}
	return nil
}

// Summary returns the one-number answers of the run so far.
func (e *Experiment) Summary() diag.Summary { return e.Diag.Summary() }

// progress makes a Progress for the interval since the last one.
func (e *Experiment) progress() Progress {
	m := e.Model
	ke, ape := m.Energy()
	l := m.Ledger()
	span := m.Time() - e.lastTime
	p := Progress{Day: m.Time() / 86400, KE: ke, APE: ape, CFL: m.CFL()}
	var sum float64
	for i := range l {
		p.Rates[i] = (l[i] - e.lastLedger[i]) / span
		sum += p.Rates[i]
	}
	p.Residual = (ke+ape-e.lastEnergy)/span - sum
	e.lastLedger, e.lastTime, e.lastEnergy = l, m.Time(), ke+ape
	return p
}

// Checkpoint returns the restartable state of the run: the model's state,
// the wave source's random generator (so a restart draws the same forcing)
// and the diagnostics' running means and series (so a restarted run's
// summary is that of an uninterrupted one).
func (e *Experiment) Checkpoint() (*qg.Checkpoint, error) {
	c := e.Model.Checkpoint()
	if bm, ok := e.Maker.(encoding.BinaryMarshaler); ok {
		b, err := bm.MarshalBinary()
		if err != nil {
			return nil, err
		}
		c.Extra["wavemaker"] = b
	}
	b, err := e.Diag.MarshalBinary()
	if err != nil {
		return nil, err
	}
	c.Extra["diagnostics"] = b
	if c.Settings, err = e.Config.trajectorySettings(); err != nil {
		return nil, err
	}
	return c, nil
}

// freeKeys are the settings a restart may change: they do not change the
// trajectory or the diagnostics, only how long the run goes, how often it
// reports, what it is called and how many goroutines compute it.
var freeKeys = []string{"name", "run.days", "run.report_days", "model.workers"}

// trajectorySettings flattens the configuration to the keys a checkpoint
// records: the keys the configuration uses (Config.Used) less freeKeys. A
// key the choices leave unused is left out, so that the configuration a run
// writes (Documented, which omits those keys) restarts the run.
func (c Config) trajectorySettings() (map[string]string, error) {
	m, err := settings.Flatten(c, "")
	if err != nil {
		return nil, err
	}
	for k := range m {
		if _, known := KeyDocFor(k); known && !c.Used(k) {
			delete(m, k)
		}
	}
	for _, k := range freeKeys {
		delete(m, k)
	}
	return m, nil
}

// Restore continues the run from a checkpoint written by the same
// configuration.
func (e *Experiment) Restore(c *qg.Checkpoint) error {
	if c.Settings == nil {
		return errors.New("experiment: the checkpoint records no experiment settings (was it written by a model alone?)")
	}
	now, err := e.Config.trajectorySettings()
	if err != nil {
		return err
	}
	// A checkpoint written before the fingerprint left out the unused keys
	// holds them all; those this configuration does not use are dropped
	// (any key whose use differs between the two comes with a difference
	// in the key that decides its use, which is compared).
	was := maps.Clone(c.Settings)
	for k := range was {
		if _, known := KeyDocFor(k); known && !e.Config.Used(k) {
			delete(was, k)
		}
	}
	if d := settings.Diff(was, now); len(d) > 0 {
		return &qg.ConfigMismatch{Changes: d}
	}
	// The model compares its whole configuration with the checkpoint's.
	// Its keys that the configuration does not use (the filter's under a
	// hyperviscosity, the sponge's width without a sponge) may differ — a
	// configuration read back from its Documented TOML has the default's
	// values there — and the used ones matched above, so the model is
	// handed the checkpoint with its own configuration.
	mc := *c
	mc.Config = e.Model.Checkpoint().Config
	if err := e.Model.Restore(&mc); err != nil {
		return err
	}
	if bu, ok := e.Maker.(encoding.BinaryUnmarshaler); ok {
		b, ok := c.Extra["wavemaker"]
		if !ok {
			return errors.New("experiment: the checkpoint has no wave-source state")
		}
		if err := bu.UnmarshalBinary(b); err != nil {
			return err
		}
	}
	b, ok := c.Extra["diagnostics"]
	if !ok {
		return errors.New("experiment: the checkpoint has no diagnostics state")
	}
	if err := e.Diag.UnmarshalBinary(b); err != nil {
		return err
	}
	e.lastTime, e.lastLedger = c.Time, e.Model.Ledger()
	ke, ape := e.Model.Energy()
	e.lastEnergy = ke + ape
	return nil
}
