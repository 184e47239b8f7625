package attribution

import (
	"fmt"
	"strings"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// Summary is the one-number answers of an attribution experiment.
type Summary struct {
	Experiment string  `json:"experiment"`
	Anomaly    Anomaly `json:"anomaly"`
	// AnomalyText describes the anomaly in words.
	AnomalyText string `json:"anomaly_text"`
	// Days is the length of each run, StartDay and EndDay bound the
	// averaging window and Samples is the number of samples in it.
	Days     float64 `json:"days"`
	StartDay float64 `json:"start_day"`
	EndDay   float64 `json:"end_day"`
	Samples  int     `json:"samples"`
	// Response is the mass-weighted RMS height of (a), m.
	Response float64 `json:"response_rms_m"`
	// Linear, LinearEddy and Closure score (b), (c) and the closure check
	// against (a).
	Linear     Score `json:"linear"`
	LinearEddy Score `json:"linear_with_eddy_feedback"`
	Closure    Score `json:"closure"`
	// Noise is the sampling noise of (a).
	Noise Noise `json:"sampling_noise"`
	// GapRMS and GapCorrelation are Result.Beyond's: how many times the
	// noise (c) is closer to (a) than (b) is.
	GapRMS         float64 `json:"gap_rms_in_noise"`
	GapCorrelation float64 `json:"gap_angle_in_noise"`
	// RMS of the forcings (mass-weighted, s⁻²): the anomaly, the change in
	// eddy forcing and the change in residual.
	Forcing        float64 `json:"forcing_rms"`
	EddyChange     float64 `json:"eddy_forcing_change_rms"`
	ResidualChange float64 `json:"residual_change_rms"`
	// ResidualRatio is ‖H − F̄ − C̄‖/‖H‖ of each run, on the PV tendencies
	// and on the streamfunction tendencies.
	ResidualRatio map[string][2]float64 `json:"residual_ratio_pv_psi"`
	// Solves records each linear solve: GMRES iterations (each of
	// linear.span_days) or days of time integration, and the last relative
	// residual or change.
	Solves [3]Solve `json:"linear_solves"`
}

// Solve records how one linear response was found.
type Solve struct {
	Iterations int     `json:"gmres_iterations"`
	Days       float64 `json:"integration_days"`
	Change     float64 `json:"relative_residual"`
}

// Summary returns the one-number answers.
func (r *Result) Summary() Summary {
	rc := r.Config.Run
	s := Summary{
		Experiment: r.Config.Name, Anomaly: r.Config.Anomaly, AnomalyText: r.Config.Anomaly.String(),
		Days: rc.Days, StartDay: r.Control.StartDay, EndDay: r.Control.EndDay, Samples: r.Control.Samples,
		Response: r.Noise.Response,
		Linear:   r.ScoreLinear, LinearEddy: r.ScoreLinearEddy, Closure: r.ScoreClosure, Noise: r.Noise,
		Forcing:        rmsPV(r.grid, r.ph, r.Forcing),
		EddyChange:     rmsPV(r.grid, r.ph, r.EddyChange),
		ResidualChange: rmsPV(r.grid, r.ph, r.ResidualChange),
		ResidualRatio:  map[string][2]float64{},
	}
	s.GapRMS, s.GapCorrelation = r.Beyond()
	for name, mf := range map[string]*MeanForcing{ControlRun: r.Control, AnomalyRun: r.Perturbed} {
		a, b := mf.ResidualRatio()
		s.ResidualRatio[name] = [2]float64{a, b}
	}
	for k, x := range r.Solves {
		s.Solves[k] = Solve{Iterations: x.Iterations, Days: x.Days, Change: x.Change}
	}
	return s
}

// String prints the summary as a short report.
func (s Summary) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "attribution %q: averaging days %.0f–%.0f of each run (%d samples)\n", s.Experiment, s.StartDay, s.EndDay, s.Samples)
	fmt.Fprintf(&b, "anomaly: %s\n", s.AnomalyText)
	fmt.Fprintf(&b, "forcings (RMS PV tendency): anomaly %.3g s⁻², change in eddy forcing %.3g s⁻², change in residual %.3g s⁻²\n",
		s.Forcing, s.EddyChange, s.ResidualChange)
	fmt.Fprintf(&b, "mean-state forcing, residual ‖H − F̄ − C̄‖/‖H‖ (PV / streamfunction tendency): control %.3f / %.3f, anomaly %.3f / %.3f\n",
		s.ResidualRatio[ControlRun][0], s.ResidualRatio[ControlRun][1], s.ResidualRatio[AnomalyRun][0], s.ResidualRatio[AnomalyRun][1])
	fmt.Fprintf(&b, "response (a), nonlinear: RMS height %.2f m (both layers, mass-weighted)\n", s.Response)
	fmt.Fprintf(&b, "                                        pattern corr.  RMS diff. (m)  | PV: corr.  RMS diff./RMS(a)\n")
	row := func(name string, sc Score) {
		fmt.Fprintf(&b, "  %-38s %8.3f %14.2f   | %9.3f %10.3f\n", name, sc.Correlation, sc.RMS, sc.CorrelationPV, sc.RMSPV/s.Noise.ResponsePV)
	}
	row("(b) linear, anomaly alone", s.Linear)
	row("(c) linear, anomaly + Δ eddy forcing", s.LinearEddy)
	row("closure: (c)'s forcing + Δ residual", s.Closure)
	row("(a) first half vs second half", s.Noise.Halves)
	fmt.Fprintf(&b, "sampling noise of (a), from %d segments: %.2f m RMS height (%.3f of the PV response's RMS)\n",
		s.Noise.Segments, s.Noise.RMS, s.Noise.RMSPV/s.Noise.ResponsePV)
	verdict := "closer to"
	if s.LinearEddy.RMS >= s.Linear.RMS || s.LinearEddy.Correlation <= s.Linear.Correlation {
		verdict = "NOT closer to"
	}
	fmt.Fprintf(&b, "(c) is %s (a) than (b) is: by %.2f m RMS = %.1f × the sampling noise; by %.1f × the noise in pattern correlation (angle)",
		verdict, s.Linear.RMS-s.LinearEddy.RMS, s.GapRMS, s.GapCorrelation)
	return b.String()
}

// Fields returns the result's fields on the grid, as diag.Fields. Per
// layer n = 1, 2 (suffix n), heights f0ψ/g in m and PV in s⁻¹:
//
//	height_nonlinear n, q_nonlinear n    (a), the difference of the runs' time means
//	height_linear n, q_linear n          (b), the linear response to the anomaly
//	height_linear_eddy n, q_linear_eddy n (c), the linear response to the anomaly plus ΔC̄
//	height_closure n                     the linear response to the anomaly plus ΔC̄ and ΔR
//	height_first_half n, height_second_half n   (a) from each half of the window
//	height_noise n                       half the difference of the halves
//	forcing_anomaly n                    the anomaly f, s⁻²
//	height_tendency_anomaly n            its height tendency f0 ψt/g, m day⁻¹
//	height_tendency_eddy_change n        that of ΔC̄, m day⁻¹
//	eddy_forcing_change n                ΔC̄, s⁻²
//	residual_change n                    ΔR, s⁻²
//	psi_basic n                          the control's time-mean streamfunction, m² s⁻¹
func (r *Result) Fields() (diag.Fields, error) {
	g := r.grid
	f := diag.Fields{Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}
	tg, err := newGridder(g)
	if err != nil {
		return f, err
	}
	zc := r.Config.Model.F0 / qg.Gravity
	scaled := func(x [2][]complex128, c float64) [2][]complex128 {
		y := pair(len(x[0]))
		for n := range 2 {
			for p, z := range x[n] {
				y[n][p] = z * complex(c, 0)
			}
		}
		return y
	}
	noise := scaled(sub(r.Halves[0].Psi, r.Halves[1].Psi), 0.5*zc)
	for _, v := range []struct {
		name, long, units string
		x                 [2][]complex128
	}{
		{"height_nonlinear", "(a) nonlinear response: difference of the time-mean geopotential heights of the anomaly and control runs", "m", scaled(r.Nonlinear.Psi, zc)},
		{"height_linear", "(b) linear response to the forcing anomaly, about the control's time mean", "m", scaled(r.Linear.Psi, zc)},
		{"height_linear_eddy", "(c) linear response to the forcing anomaly plus the change in time-mean eddy forcing", "m", scaled(r.LinearEddy.Psi, zc)},
		{"height_closure", "linear response to the anomaly plus the changes in eddy forcing and residual (closure check)", "m", scaled(r.Closure.Psi, zc)},
		{"height_first_half", "(a) from the first half of the averaging windows", "m", scaled(r.Halves[0].Psi, zc)},
		{"height_second_half", "(a) from the second half of the averaging windows", "m", scaled(r.Halves[1].Psi, zc)},
		{"height_noise", "half the difference of the halves' responses: the size of the sampling noise of (a)", "m", noise},
		{"q_nonlinear", "(a) nonlinear PV response", "s-1", noMean(r.Nonlinear.Q)},
		{"q_linear", "(b) linear PV response to the forcing anomaly", "s-1", noMean(r.Linear.Q)},
		{"q_linear_eddy", "(c) linear PV response to the anomaly plus the change in eddy forcing", "s-1", noMean(r.LinearEddy.Q)},
		{"forcing_anomaly", "steady PV forcing anomaly", "s-2", r.Forcing},
		{"height_tendency_anomaly", "height tendency f0 psi_t/g of the forcing anomaly", "m day-1", scaled(invert(r.inv, r.Forcing), zc*86400)},
		{"height_tendency_eddy_change", "height tendency f0 psi_t/g of the change in eddy forcing", "m day-1", scaled(invert(r.inv, r.EddyChange), zc*86400)},
		{"eddy_forcing_change", "change in time-mean eddy PV flux convergence, anomaly run minus control", "s-2", r.EddyChange},
		{"residual_change", "change in the residual of the mean-state forcing, anomaly run minus control", "s-2", r.ResidualChange},
		{"psi_basic", "control run's time-mean streamfunction (the linear model's basic state)", "m2 s-1", r.Control.Psi},
	} {
		for n := range 2 {
			f.List = append(f.List, diag.Field{
				Name: fmt.Sprintf("%s%d", v.name, n+1), Long: fmt.Sprintf("%s, layer %d", v.long, n+1),
				Units: v.units, Data: tg.grid(v.x[n]),
			})
		}
	}
	return f, nil
}
