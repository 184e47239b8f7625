package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// Status is the read-only state the page shows and the tests read: every
// number is the model's or the diagnostics' own, Text holds the same
// numbers formatted with their units for the page's readouts (keyed by the
// page's data-readout names), and Settings the value of every control in
// the page's units.
type Status struct {
	Day            float64 `json:"day"`            // model time, days
	Steps          int     `json:"steps"`          // steps of the running model since it was built
	EddyEnergy     float64 `json:"eddyEnergy"`     // energy of the flow minus the prescribed block, m² s⁻²
	CFL            float64 `json:"cfl"`            // the model's CFL number at the last step
	MaxCFL         float64 `json:"maxCfl"`         // its limit
	State          string  `json:"state"`          // "running", "paused" or "stopped"
	Failure        string  `json:"failure"`        // the failed step's error while stopped
	LastError      string  `json:"lastError"`      // the last error of any kind ("" if none)
	FPS            float64 `json:"fps"`            // frames per second of wall time
	StepsPerSecond float64 `json:"stepsPerSecond"` // model steps per second of wall time
	DaysPerSecond  float64 `json:"daysPerSecond"`  // model days per second of wall time
	Frames         int     `json:"frames"`         // frames drawn since the page loaded
	FirstFrameMs   float64 `json:"firstFrameMs"`   // wall time from the program's start to its first frame, ms
	// FirstFrameAt is the page's clock (performance.now, ms since the
	// frame's document started loading) at the first frame drawn; set by
	// the browser glue, 0 natively.
	FirstFrameAt  float64 `json:"firstFrameAt"`
	WorkMs        float64 `json:"workMs"`      // wall time of a frame's model work (steps, samples, fields), ms, moving average
	PaintMs       float64 `json:"paintMs"`     // wall time of painting one field image, ms, moving average
	Samples       int     `json:"samples"`     // samples in the running mean
	MeanFromDay   float64 `json:"meanFromDay"` // the running mean's first sample, days (0 without samples)
	Scenario      string  `json:"scenario"`
	Grid          string  `json:"grid"`
	Dt            float64 `json:"dt"` // time step, s
	StepsPerFrame int     `json:"stepsPerFrame"`
	Answers       answers `json:"answers"`
	// LiveRange and MeanRange are the half-widths of the symmetric colour
	// ranges of the two panels, in their fields' units.
	LiveRange float64           `json:"liveRange"`
	MeanRange float64           `json:"meanRange"`
	Warnings  []string          `json:"warnings"`
	Settings  map[string]string `json:"settings"`
	Text      map[string]string `json:"text"`
	IndexPlot string            `json:"indexPlot"` // SVG of the block index since the running mean started
}

// answers are the one-number answers of the running mean (diag.Summary).
type answers struct {
	Valid         bool     `json:"valid"`
	Samples       int      `json:"samples"`
	StartDay      float64  `json:"startDay"`
	EndDay        float64  `json:"endDay"`
	VortRate      float64  `json:"vorticityRate"`        // eddy vorticity-flux projection on the block, day⁻¹
	VortCorr      float64  `json:"vorticityCorrelation"` // its pattern correlation
	EddyRate      float64  `json:"eddyRate"`             // whole eddy PV-flux projection, day⁻¹
	InterfaceRate float64  `json:"interfaceRate"`        // interface (heat) flux projection, day⁻¹
	EddyToDiss    float64  `json:"eddyToDissipation"`    // eddy/|dissipation|
	IndexMean     float64  `json:"indexMean"`            // mean block index
	Notes         []string `json:"notes"`
}

// answersOf picks the page's answers from a diagnostics summary.
func answersOf(s diag.Summary, hasBlock bool) answers {
	a := answers{Samples: s.Samples, StartDay: s.StartDay, EndDay: s.EndDay, Notes: s.Notes}
	if !s.HasPattern || s.Samples < 2 {
		return a
	}
	a.Valid = true
	a.VortRate, a.VortCorr = s.EddyVorticity.Rate, s.EddyVorticity.Correlation
	a.EddyRate, a.InterfaceRate = s.Eddy.Rate, s.EddyInterface.Rate
	a.EddyToDiss, a.IndexMean = s.EddyToDissipation, s.Index.Mean
	return a
}

// Status returns the instrument's state.
func (a *App) Status() Status {
	m := a.exp.Model
	cfg := m.Config()
	fps, sps, dps := a.rates.get()
	st := Status{
		Day: m.Time() / 86400, Steps: m.Steps(), EddyEnergy: a.eddyEnergy, CFL: m.CFL(), MaxCFL: cfg.MaxCFL,
		LastError: a.lastError, FPS: fps, WorkMs: a.workMs, PaintMs: a.paintMs, StepsPerSecond: sps, DaysPerSecond: dps, Frames: a.frames,
		Samples: a.exp.Diag.Samples(), Scenario: a.set.Scenario, Grid: fmt.Sprintf("%d×%d", cfg.Nx, cfg.Ny),
		Dt: cfg.Dt, StepsPerFrame: a.set.StepsPerFrame, Answers: a.answers,
		LiveRange: a.liveHold.m, MeanRange: a.meanHold.m, IndexPlot: a.indexPlot,
		Settings: map[string]string{}, Text: map[string]string{}, Warnings: []string{},
	}
	if a.frames > 0 {
		st.FirstFrameMs = float64(a.firstFrame.Sub(a.start).Microseconds()) / 1000
	}
	switch {
	case a.failure != nil:
		st.State, st.Failure = "stopped", a.failure.Error()
	case a.paused:
		st.State = "paused"
	default:
		st.State = "running"
	}
	if a.answers.Samples > 0 {
		st.MeanFromDay = a.answers.StartDay
	}
	for _, c := range controls() {
		st.Settings[c.Name] = c.get(&a.set)
	}
	// the kind of source whose parameters the page shows (also while off)
	st.Settings["source_params"] = string(a.set.sourceKind)

	// warnings: what the page cannot vouch for
	if a.failure != nil {
		st.Warnings = append(st.Warnings, "The model stopped: "+a.failure.Error()+". Its state can no longer be trusted: press Reset (key r) to start again from day 0; a change of the physics now also starts again from day 0.")
	}
	if st.CFL > cflWarn*st.MaxCFL && a.failure == nil {
		st.Warnings = append(st.Warnings, fmt.Sprintf("The CFL number is %.2f, close to its limit %.2g: the model will stop if the flow grows further.", st.CFL, st.MaxCFL))
	}

	t := st.Text
	t["day"] = fmt.Sprintf("%.2f", st.Day)
	t["state"] = map[string]string{"running": "running", "paused": "paused", "stopped": "STOPPED: the last step failed"}[st.State]
	t["fps"] = fmt.Sprintf("%.0f", fps)
	t["sps"] = fmt.Sprintf("%.0f", sps)
	t["dps"] = fmt.Sprintf("%.2f", dps)
	t["energy"] = sci(st.EddyEnergy, 3) + " m² s⁻²"
	t["cfl"] = fmt.Sprintf("%.2f (limit %.2g)", st.CFL, st.MaxCFL)
	t["grid"] = fmt.Sprintf("%s, dt = %.0f min, %s, %d step(s) per frame, sample every %d steps", st.Grid, cfg.Dt/60, schemeName(cfg.Scheme), st.StepsPerFrame, a.sampleEvery)
	t["error"] = st.LastError
	t["note"] = a.meanNote
	if st.Samples > 0 {
		t["window"] = fmt.Sprintf("%d samples, days %.1f–%.1f", st.Samples, a.answers.StartDay, st.Day)
		if a.answers.Samples > 0 {
			t["window"] = fmt.Sprintf("%d samples, days %.1f–%.1f", st.Samples, a.answers.StartDay, a.answers.EndDay)
		}
	} else {
		sp := a.exp.Diag.Options().Spinup / 86400
		t["window"] = fmt.Sprintf("starts at day %.1f", sp)
	}
	ans := a.answers
	dash := "—"
	for _, k := range []string{"vort_rate", "vort_corr", "eddy_diss", "eddy_rate", "interface_rate", "index_mean"} {
		t[k] = dash
	}
	if ans.Valid {
		t["vort_rate"] = fmt.Sprintf("%+.4f day⁻¹", ans.VortRate)
		t["vort_corr"] = fmt.Sprintf("%+.2f", ans.VortCorr)
		t["eddy_diss"] = fmt.Sprintf("%.2f", ans.EddyToDiss)
		t["eddy_rate"] = fmt.Sprintf("%+.4f day⁻¹", ans.EddyRate)
		t["interface_rate"] = fmt.Sprintf("%+.4f day⁻¹", ans.InterfaceRate)
		t["index_mean"] = fmt.Sprintf("%.3f", ans.IndexMean)
	} else if !a.exp.HasBlock {
		t["vort_rate"] = "no block: nothing to project on"
	}
	layer := map[int]string{1: "upper layer", 2: "lower layer"}[a.set.Layer]
	lt, lu := liveLabel(a.set.Live, a.exp.Model.BlockMode() == qg.Fixed)
	t["live_title"] = lt + ", " + layer
	t["live_units"] = lu
	t["live_lo"], t["live_hi"] = rangeText(st.LiveRange)
	mt, mu := meanLabel(a.set.Mean)
	t["mean_title"] = mt + ", " + layer + ", running mean"
	t["mean_units"] = mu
	t["mean_lo"], t["mean_hi"] = rangeText(st.MeanRange)
	t["arrows"] = a.vectorsText()
	return st
}

// rangeText returns the labels of the ends of a colour bar over [−m, m]:
// "no data yet" for an empty field.
func rangeText(m float64) (lo, hi string) {
	if !(m > 0) {
		return "no data yet", ""
	}
	return "−" + sci(m, 2), "+" + sci(m, 2)
}

// liveLabel returns the name and units of a live field.
func liveLabel(name string, fixed bool) (string, string) {
	var t, u string
	switch name {
	case "pv_total":
		t, u = "PV with the background gradient Q_y(y − L_y/2)", "s⁻¹"
	case "psi":
		t, u = "streamfunction ψ", "m² s⁻¹"
	case "height":
		t, u = "height f0ψ/g", "m"
	default:
		t, u = "PV anomaly q", "s⁻¹"
	}
	if fixed {
		t += " (block + eddies)"
	}
	return t, u
}

// meanLabel returns the name and units of a running-mean field.
func meanLabel(name string) (string, string) {
	switch name {
	case "conv_vort":
		return "Eddy vorticity-flux convergence −∇·(u′ζ′)", "s⁻²"
	case "conv_interface":
		return "Eddy interface (heat) flux convergence", "s⁻²"
	case "zt":
		return "Eddy height tendency f0ψ_t/g", "m day⁻¹"
	case "zt_vort":
		return "Height tendency of the vorticity fluxes", "m day⁻¹"
	case "zt_interface":
		return "Height tendency of the interface (heat) fluxes", "m day⁻¹"
	}
	return "Eddy PV flux convergence −∇·(u′q′)", "s⁻²"
}

func schemeName(s qg.Scheme) string {
	if s == qg.AB3 {
		return "Adams–Bashforth 3"
	}
	return "Runge–Kutta 4"
}

// lower puts the first letter of s in lower case.
func lower(s string) string {
	if s == "" {
		return s
	}
	return strings.ToLower(s[:1]) + s[1:]
}

// superscript writes an integer in superscript digits (10⁻⁵).
func superscript(n int) string {
	var b strings.Builder
	for _, r := range strconv.Itoa(n) {
		if r == '-' {
			b.WriteRune('⁻')
			continue
		}
		b.WriteRune([]rune("⁰¹²³⁴⁵⁶⁷⁸⁹")[r-'0'])
	}
	return b.String()
}

// sci prints v with digits significant digits: plainly between 0.01 and
// 10⁴, otherwise as a × 10ⁿ.
func sci(v float64, digits int) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', digits, 64)
	}
	a := math.Abs(v)
	if a >= 0.01 && a < 1e4 {
		return strconv.FormatFloat(v, 'g', digits, 64)
	}
	e := int(math.Floor(math.Log10(a)))
	m := v / math.Pow(10, float64(e))
	if math.Abs(m) >= 9.995 && digits <= 3 { // rounding carried into the next power
		m /= 10
		e++
	}
	return strconv.FormatFloat(m, 'f', digits-1, 64) + "×10" + superscript(e)
}

// indexSVG draws the block index against model time as a small SVG plot
// (the page inserts it as it is): the series, a dashed line at 1 (the
// block as prescribed) and the ranges of both axes.
func indexSVG(t, x []float64) string {
	if len(t) < 2 || len(x) != len(t) {
		return ""
	}
	const w, h, left, right, top, bottom = 320.0, 96.0, 40.0, 314.0, 8.0, 78.0
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	lo, hi = math.Min(lo, 1), math.Max(hi, 1)
	pad := 0.05 * (hi - lo)
	if pad == 0 {
		pad = 0.01
	}
	lo, hi = lo-pad, hi+pad
	t0, t1 := t[0], t[len(t)-1]
	px := func(v float64) float64 { return left + (v-t0)/(t1-t0)*(right-left) }
	py := func(v float64) float64 { return bottom - (v-lo)/(hi-lo)*(bottom-top) }
	var b strings.Builder
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %g %g" role="img" aria-label="block index from day %.1f to %.1f, between %.3f and %.3f">`, w, h, t0/86400, t1/86400, lo, hi)
	fmt.Fprintf(&b, `<rect x="%g" y="%g" width="%g" height="%g" fill="none" stroke="#999" stroke-width="0.5"/>`, left, top, right-left, bottom-top)
	fmt.Fprintf(&b, `<line x1="%g" x2="%g" y1="%.2f" y2="%.2f" stroke="#777" stroke-dasharray="3 2" stroke-width="0.7"/>`, left, right, py(1), py(1))
	b.WriteString(`<polyline fill="none" stroke="#222" stroke-width="1.2" points="`)
	step := max(1, len(t)/300)
	for i := 0; i < len(t); i += step {
		fmt.Fprintf(&b, "%.1f,%.2f ", px(t[i]), py(x[i]))
	}
	fmt.Fprintf(&b, "%.1f,%.2f", px(t[len(t)-1]), py(x[len(x)-1]))
	b.WriteString(`"/>`)
	text := func(x, y float64, anchor, s string) {
		fmt.Fprintf(&b, `<text x="%g" y="%g" font-size="9" text-anchor="%s" fill="#333">%s</text>`, x, y, anchor, s)
	}
	text(left-3, top+7, "end", fmt.Sprintf("%.3f", hi))
	text(left-3, bottom, "end", fmt.Sprintf("%.3f", lo))
	text(left-3, py(1)+3, "end", "1")
	text(left, h-4, "start", fmt.Sprintf("day %.1f", t0/86400))
	text(right, h-4, "end", fmt.Sprintf("day %.1f", t1/86400))
	b.WriteString(`</svg>`)
	return b.String()
}
