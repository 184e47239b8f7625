package attribution

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"sync"

	"github.com/BurntSushi/toml"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/linear"
)

// Config is an attribution experiment: the control run (a whole
// experiment configuration, whose keys it shares at the top level of a
// configuration file), the forcing anomaly added to it in the second run
// (the anomaly table), the bounds of the linear solves (the linear table)
// and the estimate of the sampling noise (the sampling table).
type Config struct {
	experiment.Config
	Anomaly  Anomaly       `toml:"anomaly" json:"anomaly"`
	Linear   LinearOptions `toml:"linear" json:"linear"`
	Sampling Sampling      `toml:"sampling" json:"sampling"`
}

// Sampling says how the sampling noise of the nonlinear response is
// estimated.
type Sampling struct {
	// Segments is the number of consecutive segments of equal length the
	// averaging window is cut into (an even number, at least 2; 0 takes
	// the default, 4): the response of each segment's time means gives the
	// standard error of the whole window's by the method of batch means,
	// and the first and second halves of the segments the halves' agreement.
	Segments int `toml:"segments" json:"segments"`
}

func (s Sampling) segments() int {
	if s.Segments == 0 {
		return 4
	}
	return s.Segments
}

// Validate checks the number of segments.
func (s Sampling) Validate() error {
	if n := s.Segments; n != 0 && (n < 2 || n%2 != 0) {
		return &qg.FieldError{Field: "sampling.segments", Value: n, Why: "must be an even number, at least 2 (0 takes the default, 4)"}
	}
	return nil
}

// Validate checks the whole configuration, as a *qg.FieldError naming the
// key where there is one: the experiment, the anomaly against the model's
// domain and grid, the linear options, and a block mode the method can use
// (not fixed: the time mean is not a state of the model; not relaxed: the
// linear model has no relaxation).
func (c *Config) Validate() error {
	if err := c.Config.Validate(); err != nil {
		return err
	}
	if err := linearMode(c.Config); err != nil {
		return err
	}
	if err := c.Anomaly.Validate(c.Model); err != nil {
		return err
	}
	if err := c.Sampling.Validate(); err != nil {
		return err
	}
	if n, k := len(sampleTimes(c.Config)), c.Sampling.segments(); n < 2*k {
		return &qg.FieldError{Field: "sampling.segments", Value: k, Why: fmt.Sprintf("the averaging window has only %d samples: fewer than two per segment", n)}
	}
	return c.Linear.Validate()
}

// TOML returns the configuration as a TOML document: the experiment's
// documented keys (experiment.Config.Documented) followed by the anomaly,
// linear and sampling tables.
func (c Config) TOML() string {
	var b bytes.Buffer
	b.WriteString(c.Config.Documented())
	b.WriteString("\n")
	b.WriteString(c.ExtraTOML())
	return b.String()
}

// ExtraTOML returns the anomaly, linear and sampling tables alone, as
// TOML.
func (c Config) ExtraTOML() string {
	var b bytes.Buffer
	enc := toml.NewEncoder(&b)
	if err := enc.Encode(tables{c.Anomaly, c.Linear, c.Sampling}); err != nil {
		panic(err) // plain numbers and strings
	}
	return b.String()
}

// Decode reads a TOML configuration on top of base (keys it does not set
// keep base's values) and validates it. A key it does not know is an error
// naming it.
func Decode(r io.Reader, base Config) (Config, error) {
	t := tables{base.Anomaly, base.Linear, base.Sampling}
	ec, err := experiment.DecodeWith(r, base.Config, &t)
	if err != nil {
		return Config{}, err
	}
	c := Config{Config: ec, Anomaly: t.Anomaly, Linear: t.Linear, Sampling: t.Sampling}
	if err := c.Validate(); err != nil {
		return Config{}, err
	}
	return c, nil
}

// tables are the attribution experiment's own tables of a configuration
// file.
type tables struct {
	Anomaly  Anomaly       `toml:"anomaly"`
	Linear   LinearOptions `toml:"linear"`
	Sampling Sampling      `toml:"sampling"`
}

// Load reads a TOML configuration file on top of the built-in attribution
// experiment (Builtin).
func Load(path string) (Config, error) {
	f, err := os.Open(path)
	if err != nil {
		return Config{}, fmt.Errorf("config: %w", err)
	}
	defer f.Close()
	c, err := Decode(f, Builtin())
	if err != nil {
		return Config{}, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

// Options configure Run.
type Options struct {
	// Sequential runs the control and the perturbed run one after the
	// other instead of at the same time on two goroutines. The results are
	// the same.
	Sequential bool
	// Report, if not nil, is called at every progress report of each run
	// ("control" or "anomaly"), never concurrently.
	Report func(run string, p experiment.Progress)
}

// Runs are the names of the two nonlinear runs, as Report and the output
// files give them.
const (
	ControlRun = "control"
	AnomalyRun = "anomaly"
)

// Result is the outcome of an attribution experiment. Responses are
// spectral (both layers, the layout of Grid), as PV (s⁻¹) and as
// streamfunction (m² s⁻¹).
type Result struct {
	Config Config
	// Control and Perturbed are the mean-state forcings of the two runs
	// and their splits.
	Control, Perturbed *MeanForcing
	// Forcing is the anomaly f (s⁻²); EddyChange is ΔC̄, the change in the
	// time-mean eddy PV flux convergence between the runs, and
	// ResidualChange ΔR the change in the residual of the mean-state
	// forcing (s⁻²).
	Forcing, EddyChange, ResidualChange [2][]complex128
	// Nonlinear is (a), the difference of the time means of the runs;
	// Linear is (b), the linear response to f about the control's time
	// mean; LinearEddy is (c), the linear response to f + ΔC̄. Halves are
	// (a) from the first and from the second halves of the averaging
	// windows. Closure is the linear response to f + ΔC̄ + ΔR, which
	// differs from (a) only by the response's interaction with itself
	// (the quadratic term of the advection): a check of the whole chain.
	Nonlinear, Linear, LinearEddy, Closure Response
	Halves                                 [2]Response
	// HalfSamples is the number of samples of each half.
	HalfSamples [2]int
	// Scores of (b), (c) and the closure against (a), and the sampling
	// noise of (a).
	ScoreLinear, ScoreLinearEddy, ScoreClosure Score
	Noise                                      Noise
	// Solves record how (b), (c) and the closure were found.
	Solves [3]linear.Response

	grid *qg.Grid
	ph   qg.Physics
	inv  *qg.Inverter
}

// Response is a response field as PV (s⁻¹) and streamfunction (m² s⁻¹),
// spectral.
type Response struct {
	Q, Psi [2][]complex128
}

// Noise is the sampling noise of the nonlinear response (a), estimated by
// the method of batch means: the window is cut into K consecutive segments
// of equal length, a_k is the difference of the two runs' time means over
// segment k, and (a) is their mean; if the segments are independent the
// sampling error of (a) has the RMS √(Σ_k‖a_k − (a)‖²/(K(K − 1))). With K = 2
// this is ‖a₁ − a₂‖/2.
type Noise struct {
	// Segments is K.
	Segments int `json:"segments"`
	// Halves compares the responses of the first and second halves of
	// the window with each other: how far (a) is from itself.
	Halves Score `json:"halves"`
	// RMS is the estimated sampling error of (a) as a height, m, and
	// RMSPV as PV, s⁻¹; Response and ResponsePV are the RMS of (a)
	// itself.
	RMS        float64 `json:"rms_m"`
	Response   float64 `json:"response_rms_m"`
	RMSPV      float64 `json:"rms_pv"`
	ResponsePV float64 `json:"response_rms_pv"`
}

// Grid returns the grid of the result's fields.
func (r *Result) Grid() *qg.Grid { return r.grid }

// Physics returns the derived layer parameters of the model.
func (r *Result) Physics() qg.Physics { return r.ph }

// Beyond reports whether (c) is closer to (a) than (b) is by more than the
// sampling noise of (a), in RMS height difference and in pattern
// correlation, and by how many times the noise: the RMS gap
// ‖b − a‖ − ‖c − a‖ over the noise's RMS, and the gap of the angles
// arccos(correlation) over the noise's angle arcsin(RMS/‖a‖).
//
// Replacing (a) by its noise-free value would move each RMS distance to it
// by at most the noise (triangle inequality), and each angle by at most the
// noise's angle: a gap of more than one noise says the improvement is
// larger than the noise; a gap of more than two guarantees that (c) is
// closer than (b) to the noise-free response too, if the noise estimate is
// right (it comes from a few segments and is itself uncertain).
func (r *Result) Beyond() (rms, correlation float64) {
	n := r.Noise
	rms = (r.ScoreLinear.RMS - r.ScoreLinearEddy.RMS) / n.RMS
	theta := math.Asin(math.Min(1, n.RMS/n.Response))
	correlation = (math.Acos(clamp(r.ScoreLinear.Correlation)) - math.Acos(clamp(r.ScoreLinearEddy.Correlation))) / theta
	return rms, correlation
}

func clamp(x float64) float64 { return math.Max(-1, math.Min(1, x)) }

// Run runs the attribution experiment: (a) the control run and the run with
// the forcing anomaly (at the same time on two goroutines unless
// o.Sequential), their mean-state forcings, the difference of their time
// means and of their time-mean eddy forcing; (b) the linear response to the
// anomaly about the control's time mean; (c) the linear response to the
// anomaly plus the change in eddy forcing; the scores of (b) and (c)
// against (a) and the sampling noise of (a) from segments of the runs'
// averaging windows.
//
// Everything that can be checked before the runs is checked first (the
// configuration, both runs' initial states, the anomaly, the linear
// model). An unstable time-mean state is found only once the control run
// is done: then the error is the linear model's *linear.UnstableError,
// wrapped, and the partial Result is returned with it (the control's
// mean-state forcing, and the anomaly run's and (a) unless o.Sequential,
// which stops before the anomaly run).
func Run(ctx context.Context, c Config, o Options) (*Result, error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	// the linear model can be built for this configuration
	probe, err := AboutBlock(c.Config)
	if err != nil {
		return nil, fmt.Errorf("attribution: linear model: %w", err)
	}
	probe.Close()
	var es [2]*experiment.Experiment
	defer func() {
		for _, e := range es {
			if e != nil {
				e.Close()
			}
		}
	}()
	for i := range es {
		if es[i], err = experiment.New(c.Config); err != nil {
			return nil, err
		}
	}
	f, err := c.Anomaly.Forcing(es[1].Model)
	if err != nil {
		return nil, err
	}
	es[1].Model.AddForcing(SteadyTendency(f))

	ns := es[0].Model.Grid().Len()
	var recs [2]*Recorder
	for i, e := range es {
		if recs[i], err = NewRecorder(e, c.Sampling.segments()); err != nil {
			return nil, err
		}
	}
	names := [2]string{ControlRun, AnomalyRun}
	var mu sync.Mutex
	run := func(ctx context.Context, i int) error {
		e := es[i]
		for !e.Done() {
			if err := ctx.Err(); err != nil {
				return err
			}
			p, due, err := e.Advance()
			if err != nil {
				return fmt.Errorf("%s run: %w", names[i], err)
			}
			recs[i].Observe()
			if due && o.Report != nil {
				mu.Lock()
				o.Report(names[i], p)
				mu.Unlock()
			}
		}
		return nil
	}
	r := &Result{Config: c, Forcing: f, grid: es[0].Model.Grid(), ph: es[0].Model.Physics(), inv: es[0].Model.Inverter()}
	var solved [3]linear.Response
	var serrs [3]error
	var forcings [3][2][]complex128
	forcings[0] = f
	what := [3]string{"the anomaly", "the anomaly plus the change in eddy forcing", "the anomaly plus the changes in eddy forcing and residual"}
	// solve finds the linear response k about the control's time mean,
	// with a linear model of its own
	solve := func(k int) {
		l, err := AboutMean(r.Control)
		if err != nil {
			serrs[k] = fmt.Errorf("attribution: linear model about the control's time mean: %w", err)
			return
		}
		defer l.Close()
		if solved[k], err = l.Respond(forcings[k], c.Linear); err != nil {
			serrs[k] = fmt.Errorf("attribution: linear response to %s about the control's time mean: %w", what[k], err)
		}
	}
	if o.Sequential {
		// the control first, and the linear response (b) about its time
		// mean at once: an unstable mean state stops the experiment
		// before the second run
		if err := run(ctx, 0); err != nil {
			return nil, err
		}
		if r.Control, err = recs[0].MeanForcing(); err != nil {
			return nil, fmt.Errorf("control run: %w", err)
		}
		if solve(0); serrs[0] != nil {
			return r, serrs[0]
		}
		if err := run(ctx, 1); err != nil {
			return nil, err
		}
	} else {
		ctx2, cancel := context.WithCancel(ctx)
		var wg sync.WaitGroup
		var errs [2]error
		for i := range es {
			wg.Add(1)
			go func() {
				defer wg.Done()
				if errs[i] = run(ctx2, i); errs[i] != nil {
					cancel()
				}
			}()
		}
		wg.Wait()
		cancel()
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		if err := errors.Join(errs[0], errs[1]); err != nil {
			return nil, err
		}
		if r.Control, err = recs[0].MeanForcing(); err != nil {
			return nil, fmt.Errorf("control run: %w", err)
		}
	}
	if r.Perturbed, err = recs[1].MeanForcing(); err != nil {
		return r, fmt.Errorf("anomaly run: %w", err)
	}
	inv := r.inv
	response := func(psi [2][]complex128) Response {
		q := pair(ns)
		inv.PV(q, psi)
		return Response{Q: q, Psi: psi}
	}
	r.EddyChange = sub(r.Perturbed.Eddy, r.Control.Eddy)
	r.ResidualChange = sub(r.Perturbed.Residual, r.Control.Residual)
	r.Nonlinear = response(sub(r.Perturbed.Psi, r.Control.Psi))
	r.Nonlinear.Q[0][0] = r.Perturbed.Mean[0][0] - r.Control.Mean[0][0]
	r.Nonlinear.Q[1][0] = r.Perturbed.Mean[1][0] - r.Control.Mean[1][0]
	sc, sa := recs[0].Segments(), recs[1].Segments()
	f0 := c.Model.F0
	r.Noise = sampling(r.grid, r.ph, f0, inv, sc, sa, r.Nonlinear)
	hc, nc := recs[0].Halves()
	ha, _ := recs[1].Halves()
	r.HalfSamples = nc
	for k := range 2 {
		r.Halves[k] = response(sub(ha[k], hc[k]))
	}
	r.Noise.Halves = Compare(r.grid, r.ph, f0, r.Halves[0], r.Halves[1])

	forcings[1] = add(f, r.EddyChange)
	forcings[2] = add(forcings[1], r.ResidualChange)
	if o.Sequential {
		for k := 1; k < 3; k++ {
			if solve(k); serrs[k] != nil {
				return r, serrs[k]
			}
		}
	} else {
		// (b) and (c) on two goroutines, then the closure check
		var wg sync.WaitGroup
		for k := range 2 {
			wg.Add(1)
			go func() { defer wg.Done(); solve(k) }()
		}
		wg.Wait()
		for k := range 2 {
			if serrs[k] != nil {
				return r, serrs[k] // the first: an unstable state fails both alike
			}
		}
		if solve(2); serrs[2] != nil {
			return r, serrs[2]
		}
	}
	r.Solves = solved
	for k, dst := range []*Response{&r.Linear, &r.LinearEddy, &r.Closure} {
		*dst = Response{Q: solved[k].Q, Psi: invert(inv, solved[k].Q)}
	}
	r.ScoreLinear = Compare(r.grid, r.ph, f0, r.Linear, r.Nonlinear)
	r.ScoreLinearEddy = Compare(r.grid, r.ph, f0, r.LinearEddy, r.Nonlinear)
	r.ScoreClosure = Compare(r.grid, r.ph, f0, r.Closure, r.Nonlinear)
	return r, nil
}

// sampling estimates the sampling noise of the response a from the
// segments' time-mean streamfunctions of the control (sc) and anomaly (sa)
// runs (Halves is left to the caller).
func sampling(g *qg.Grid, ph qg.Physics, f0 float64, inv *qg.Inverter, sc, sa [][2][]complex128, a Response) Noise {
	k := len(sc)
	mean := pair(len(a.Psi[0]))
	seg := make([][2][]complex128, k)
	for i := range k {
		seg[i] = sub(sa[i], sc[i])
		mean = add(mean, seg[i])
	}
	for n := range 2 {
		for p := range mean[n] {
			mean[n][p] /= complex(float64(k), 0)
		}
	}
	var ss, sq float64
	q := pair(len(a.Psi[0]))
	for i := range k {
		d := sub(seg[i], mean)
		ss += g.LayerProduct(ph, d, d)
		inv.PV(q, d)
		sq += g.LayerProduct(ph, q, q)
	}
	w := float64(k * (k - 1))
	return Noise{Segments: k,
		RMS: f0 / qg.Gravity * math.Sqrt(ss/w), Response: RMSHeight(g, ph, f0, a.Psi),
		RMSPV: math.Sqrt(sq / w), ResponsePV: rmsPV(g, ph, a.Q)}
}
