package attribution

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// MeanForcing is the mean-state forcing of a finished run and its split.
// Writing the model as ∂q/∂t = N(q) + F, with F the external forcings
// (the wave source, a forcing anomaly) and N everything else, the
// mean-state forcing H = −N(q̄) makes the time-mean state q̄ an exact steady
// state of the model without eddies. Averaging the run gives
// H = F̄ + C̄ + R: the time mean F̄ of the external deterministic forcings,
// the time-mean eddy PV flux convergence C̄ = −∇·(v′q′)‾, and a residual R
// that is the sampling error of the time means and the trend of the window
// (and the time mean of a stochastic source, whose expectation is zero).
//
// Fields are spectral PV tendencies (s⁻², both layers, in the layout of the
// run's qg.Grid, truncated to the retained modes) without their domain
// mean, which is dynamically inert.
type MeanForcing struct {
	// Config is the run's configuration.
	Config experiment.Config
	// StartDay and EndDay bound the averaging window; Samples is the
	// number of samples in it.
	StartDay, EndDay float64
	Samples          int
	// Psi is the time-mean streamfunction ψ̄ (m² s⁻¹, spectral) and Mean
	// its PV q̄ (s⁻¹, spectral).
	Psi, Mean [2][]complex128
	// H is the mean-state forcing −N(q̄); Eddy is C̄, External is F̄ and
	// Residual is H − F̄ − C̄.
	H, Eddy, External, Residual [2][]complex128
	// Stochastic is the part of External that is the realised time mean of
	// a red-noise wave source, and Trend the change of the PV over the
	// window divided by its length (s⁻²); both nil unless a Recorder
	// recorded them.
	Stochastic, Trend [2][]complex128

	grid   *qg.Grid
	ph     qg.Physics
	inv    *qg.Inverter
	steady *qg.SteadyForcing
}

// ErrFixedMode is returned (wrapped) for a run in the fixed block mode.
var ErrFixedMode = errors.New(`block.mode = "fixed": the model's state is the eddies alone and the block is held outside the model's equations, ` +
	`so the time-mean full flow is not a state of the model that a steady forcing can hold; use the forced, relaxed or free mode, or no block`)

// FromExperiment computes the mean-state forcing of a finished (or
// running, between steps) experiment from its diagnostics: ψ̄ and C̄ from
// e.Diag.Fields, F̄ as the mean of the model's deterministic forcings (the
// wave source's, and any the driver added, such as a forcing anomaly) at
// the sample times of the averaging window, and H from e.Model (which is
// left as it was).
func FromExperiment(e *experiment.Experiment) (*MeanForcing, error) {
	return fromExperiment(e, nil)
}

// recorded is what a Recorder adds to the diagnostics: the time-mean
// domain-mean PV, the realised mean of a red-noise source (nil without)
// and the trend.
type recorded struct {
	q0           [2]complex128
	stoch, trend [2][]complex128
}

func fromExperiment(e *experiment.Experiment, x *recorded) (*MeanForcing, error) {
	if e.HasBlock && e.Model.BlockMode() == qg.Fixed {
		return nil, fmt.Errorf("attribution: %w", ErrFixedMode)
	}
	if e.Diag.Samples() == 0 {
		return nil, errors.New("attribution: the run has no samples in its averaging window (it has not passed its spin-up)")
	}
	f := e.Diag.Fields()
	var psi, conv [2][]float64
	for n := range 2 {
		p, ok1 := f.Get(fmt.Sprintf("psi_mean%d", n+1))
		c, ok2 := f.Get(fmt.Sprintf("conv%d", n+1))
		if !ok1 || !ok2 {
			return nil, errors.New("attribution: the diagnostics lack psi_mean or conv")
		}
		psi[n], conv[n] = p.Data, c.Data
	}
	ser := e.Diag.Series()
	times := ser.Time[ser.WindowStart:]
	mf := &MeanForcing{Config: e.Config, Samples: e.Diag.Samples(), StartDay: times[0] / 86400, EndDay: times[len(times)-1] / 86400}
	if err := mf.compute(e.Model, psi, conv, times, x); err != nil {
		return nil, err
	}
	return mf, nil
}

// FromMeans computes the mean-state forcing of a finished run from its
// means.nc (written by eddyblock run -out or output.WriteMeans): the
// configuration from the global attribute configuration, ψ̄ from psi_mean,
// C̄ from conv, the averaging window from averaging_window_days and
// samples. F̄ is the mean of the configured wave source's deterministic
// forcing at the window's sample times, which the configuration gives; a
// forcing a Go driver added outside the configuration is not recorded in
// the file and ends up in the residual.
func FromMeans(path string) (*MeanForcing, error) {
	f, err := netcdf.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fail := func(format string, a ...any) error {
		return fmt.Errorf("attribution: %s: "+format, append([]any{path}, a...)...)
	}
	at, ok := f.Attr("configuration")
	toml, ok2 := at.Text()
	if !ok || !ok2 {
		return nil, fail("no configuration attribute (was it written by eddyblock?)")
	}
	c, err := experiment.Decode(strings.NewReader(toml), experiment.Default())
	if err != nil {
		return nil, fail("its configuration: %w", err)
	}
	if c.Block.Enabled() && c.Block.Mode == qg.Fixed {
		return nil, fail("%w", ErrFixedMode)
	}
	win, ok := f.Attr("averaging_window_days")
	w, ok2 := win.Float64s()
	if !ok || !ok2 || len(w) != 2 {
		return nil, fail("no averaging_window_days attribute of two values")
	}
	sa, ok := f.Attr("samples")
	s, ok2 := sa.Float64s()
	if !ok || !ok2 || len(s) != 1 || s[0] < 1 {
		return nil, fail("no samples attribute, or no samples")
	}
	nx, ny := c.Model.Nx, c.Model.Ny
	var psi, conv [2][]float64
	for _, v := range []struct {
		name string
		dst  *[2][]float64
	}{{"psi_mean", &psi}, {"conv", &conv}} {
		d, err := f.ReadFloat64(v.name)
		if err != nil {
			return nil, fail("%w", err)
		}
		if len(d) != 2*nx*ny {
			return nil, fail("%s has %d values, the configuration's grid needs 2×%d×%d", v.name, len(d), ny, nx)
		}
		v.dst[0], v.dst[1] = d[:nx*ny], d[nx*ny:]
	}
	times := sampleTimes(c)
	if len(times) != int(s[0]) {
		return nil, fail("%d samples recorded, but the configuration's run (run.days, run.spin_up_days, run.sample_steps) samples %d times", int(s[0]), len(times))
	}
	e, err := experiment.New(c)
	if err != nil {
		return nil, fail("its configuration: %w", err)
	}
	defer e.Close()
	mf := &MeanForcing{Config: c, Samples: len(times), StartDay: w[0], EndDay: w[1]}
	if err := mf.compute(e.Model, psi, conv, times, nil); err != nil {
		return nil, err
	}
	return mf, nil
}

// sampleTimes returns the model times (s) at which a run of c samples its
// averaging window, accumulated step by step as the model does.
func sampleTimes(c experiment.Config) []float64 {
	steps := int(math.Round(c.Run.Days * 86400 / c.Model.Dt))
	var ts []float64
	t := 0.0
	for n := 1; n <= steps; n++ {
		t += c.Model.Dt
		if n%c.Run.SampleSteps == 0 && t >= c.Run.SpinUpDays*86400 {
			ts = append(ts, t)
		}
	}
	return ts
}

// compute fills the fields from the gridded time-mean streamfunction and
// eddy flux convergence, on model m (a model of the run's configuration,
// with its block and forcings), and what a Recorder recorded (x, or nil).
func (mf *MeanForcing) compute(m *qg.Model, psi, conv [2][]float64, times []float64, x *recorded) error {
	g := m.Grid()
	mf.grid, mf.ph, mf.inv = g, m.Physics(), m.Inverter()
	ns := g.Len()
	pair := func() [2][]complex128 { return [2][]complex128{make([]complex128, ns), make([]complex128, ns)} }
	mf.Psi, mf.Mean, mf.Eddy, mf.External, mf.Residual = pair(), pair(), pair(), pair(), pair()
	for n := range 2 {
		if err := m.ToSpectral(mf.Psi[n], psi[n]); err != nil {
			return fmt.Errorf("attribution: time-mean streamfunction: %w", err)
		}
		if err := m.ToSpectral(mf.Eddy[n], conv[n]); err != nil {
			return fmt.Errorf("attribution: eddy flux convergence: %w", err)
		}
		mf.Psi[n][0], mf.Eddy[n][0] = 0, 0
	}
	m.Inverter().PV(mf.Mean, mf.Psi)
	buf := pair()
	for _, t := range times {
		if err := m.TermTendency(qg.TermInjection, buf, mf.Mean, t); err != nil {
			return fmt.Errorf("attribution: %w", err)
		}
		for n := range 2 {
			for p, z := range buf[n] {
				mf.External[n][p] += z
			}
		}
	}
	inv := complex(1/float64(len(times)), 0)
	for n := range 2 {
		for p := range ns {
			mf.External[n][p] *= inv
		}
	}
	// The domain mean of q̄ (which ψ̄ does not carry) is needed before H
	// is computed: as recorded, or from its balance (see meanPV).
	if x != nil {
		mf.Mean[0][0], mf.Mean[1][0] = x.q0[0], x.q0[1]
		mf.Trend = x.trend
		if x.stoch[0] != nil {
			mf.Stochastic = x.stoch
			mf.External = add(mf.External, x.stoch)
		}
	} else if err := mf.meanPV(m); err != nil {
		return err
	}
	sf, err := m.SteadyForcing(mf.Mean)
	if err != nil {
		return fmt.Errorf("attribution: %w", err)
	}
	mf.steady = sf
	mf.H = sf.Rate()
	for n := range 2 {
		mf.H[n][0], mf.External[n][0] = 0, 0
		for p := range ns {
			mf.Residual[n][p] = mf.H[n][p] - mf.External[n][p] - mf.Eddy[n][p]
		}
	}
	return nil
}

// meanPV sets the domain mean of q̄ in each layer. It has no flow and no
// other term acts on it, but the sponge (which relaxes q towards its
// target only in its band, and so turns a uniform PV into a forcing
// there) and the relaxed mode's relaxation damp it, and the sponge makes
// it from the PV in its band: time-averaged, its balance is
//
//	0 = ⟨−s(x)(q̄ − target)⟩ − q̄₀/τ_r + F̄₀,
//
// ⟨·⟩ the domain mean, q̄₀ the domain mean of q̄ and F̄₀ that of the
// external forcing. It is solved for q̄₀ (the time mean of the domain
// mean, up to its trend over the window, which the time means of the
// diagnostics do not record). Without a sponge or a relaxation q̄₀ has no
// effect and is left zero.
func (mf *MeanForcing) meanPV(m *qg.Model) error {
	g := m.Grid()
	rate := m.SpongeRate()
	var damp float64
	for _, s := range rate {
		damp += s / float64(len(rate))
	}
	if mf.Config.Block.Enabled() && mf.Config.Block.Mode == qg.Relaxed {
		damp += 1 / mf.Config.Block.RelaxTime
	}
	if damp == 0 {
		return nil
	}
	sp := pair(g.Len())
	if err := m.TermTendency(qg.TermSponge, sp, mf.Mean, 0); err != nil {
		return fmt.Errorf("attribution: %w", err)
	}
	for n := range 2 {
		mf.Mean[n][0] = (sp[n][0] + mf.External[n][0]) / complex(damp, 0)
	}
	return nil
}

// Grid returns the grid of the fields.
func (mf *MeanForcing) Grid() *qg.Grid { return mf.grid }

// Attach adds H to m — as the steady forcing that holds q̄ steady in the
// model as it is stepped (qg.SteadyForcing: the stepper's part at every
// stage, the split steps' part once per step) — so that m, started from
// Mean, stays there. m must be configured as the run's model (the number
// of workers may differ).
func (mf *MeanForcing) Attach(m *qg.Model) error { return mf.steady.Attach(m) }

// ResidualRatio returns ‖H − F̄ − C̄‖/‖H‖, the mass-weighted RMS of the
// residual over that of the mean-state forcing, measured on the PV
// tendencies (PV) and on the streamfunction tendencies they induce (psi),
// which weigh the large scales more.
func (mf *MeanForcing) ResidualRatio() (pv, psi float64) {
	pv = math.Sqrt(mf.grid.LayerProduct(mf.ph, mf.Residual, mf.Residual) / mf.grid.LayerProduct(mf.ph, mf.H, mf.H))
	r, h := invert(mf.inv, mf.Residual), invert(mf.inv, mf.H)
	psi = math.Sqrt(mf.grid.LayerProduct(mf.ph, r, r) / mf.grid.LayerProduct(mf.ph, h, h))
	return pv, psi
}

// fieldNames are the gridded fields of Fields, with their meanings and
// units: base name (layer 1 and 2 append 1 and 2), long name, units.
var fieldNames = [][3]string{
	{"psi_mean", "time-mean streamfunction", "m2 s-1"},
	{"q_mean", "time-mean PV anomaly (PV of the time-mean streamfunction)", "s-1"},
	{"mean_state_forcing", "mean-state forcing H = -N(q_mean), the steady PV forcing that holds the time mean steady without eddies", "s-2"},
	{"eddy_forcing", "time-mean eddy PV flux convergence", "s-2"},
	{"external_forcing", "time-mean external deterministic PV forcing (wave source, forcing anomaly)", "s-2"},
	{"residual_forcing", "mean-state forcing minus external and eddy forcing: sampling error and trend", "s-2"},
}

// Fields returns the fields on the grid, as diag.Fields: per layer n = 1, 2
// psi_mean n, q_mean n, mean_state_forcing n (H), eddy_forcing n (C̄),
// external_forcing n (F̄), residual_forcing n (R).
func (mf *MeanForcing) Fields() (diag.Fields, error) {
	g := mf.grid
	f := diag.Fields{Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}
	tg, err := newGridder(g)
	if err != nil {
		return f, err
	}
	src := [][2][]complex128{mf.Psi, mf.Mean, mf.H, mf.Eddy, mf.External, mf.Residual}
	for k, nm := range fieldNames {
		for n := range 2 {
			f.List = append(f.List, diag.Field{
				Name: fmt.Sprintf("%s%d", nm[0], n+1), Long: fmt.Sprintf("%s, layer %d", nm[1], n+1),
				Units: nm[2], Data: tg.grid(src[k][n]),
			})
		}
	}
	return f, nil
}
