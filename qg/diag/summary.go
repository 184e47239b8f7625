package diag

import (
	"fmt"
	"math"
	"strings"

	"github.com/eddyblock/eddyblock/qg"
)

// Summary holds the one-number answers of a run over the averaging window.
// Rates are in day⁻¹ (projections on the block pattern, see Projection),
// drifts in km day⁻¹, energies in m² s⁻² and energy rates in m² s⁻³ (W kg⁻¹).
type Summary struct {
	Mode       string  `json:"block_mode"` // the block mode, "" without a block
	Norm       Norm    `json:"norm"`
	Transient  bool    `json:"transient"`
	Samples    int     `json:"samples"`
	StartDay   float64 `json:"start_day"`
	EndDay     float64 `json:"end_day"`
	HasPattern bool    `json:"has_pattern"`
	// BlockHeight is the largest upper-layer height f0 P1/g of the
	// pattern, m; r·BlockHeight is a height tendency in m day⁻¹.
	BlockHeight float64 `json:"block_height_m"`

	Eddy          Projection `json:"eddy"`           // −∇·(u′q′)
	EddyVorticity Projection `json:"eddy_vorticity"` // −∇·(u′ζ′)
	EddyInterface Projection `json:"eddy_interface"` // −∇·(F_n u′(ψ_m − ψ_n)′)
	MeanFlow      Projection `json:"mean_flow"`      // −J(ψ̄, q̄) − U∂x q̄ − Q_y ∂x ψ̄
	Dissipation   Projection `json:"dissipation"`    // drag + scale-selective + sponge
	// Drag, ScaleSelective (filter or hyperviscosity) and Sponge are the
	// parts of Dissipation.Rate.
	Drag           float64 `json:"drag_per_day"`
	ScaleSelective float64 `json:"scale_selective_per_day"`
	Sponge         float64 `json:"sponge_per_day"`
	// Maintenance is the forced mode's steady forcing or the relaxed mode's
	// relaxation; Forcing the time mean of the deterministic qg.Forcings.
	Maintenance float64 `json:"maintenance_per_day"`
	Forcing     float64 `json:"forcing_per_day"`
	// Trend is the observed (P-projected) change of the flow over the
	// window; Residual = Trend − (Eddy + MeanFlow + Dissipation +
	// Maintenance + Forcing).
	Trend    float64 `json:"trend_per_day"`
	Residual float64 `json:"residual_per_day"`
	// EddyToDissipation is Eddy.Rate/|Dissipation.Rate|: 1 when the eddies
	// supply what dissipation removes.
	EddyToDissipation float64 `json:"eddy_to_dissipation"`

	// Domain means of the eddy kinetic energy per layer (m² s⁻²) and of
	// the heat flux v′(ψ1 − ψ2)′ (m³ s⁻²) and in K m s⁻¹.
	EKE       [2]float64 `json:"eke"`
	HeatFlux  float64    `json:"heat_flux"`
	HeatFluxK float64    `json:"heat_flux_k"`

	Energy Energetics `json:"energy"`
	Index  IndexStats `json:"index"`
	Notes  []string   `json:"notes,omitempty"`
}

// Energetics is the energy budget over the averaging window.
type Energetics struct {
	KE  float64 `json:"ke"`  // mean kinetic energy
	APE float64 `json:"ape"` // mean available potential energy
	// Rates is the mean rate of each qg.Term over the window.
	Rates map[string]float64 `json:"rates"`
	// Change is E(last) − E(first) and Budget the time integral of the
	// rates over the same interval; ClosureError is |Change − Budget|
	// divided by the larger of |Change| and half the sum of the terms'
	// absolute integrals (the energy throughput).
	Change       float64 `json:"change"`
	Budget       float64 `json:"budget"`
	ClosureError float64 `json:"closure_error"`
}

// Summary returns the one-number answers over the averaging window.
func (a *Accumulator) Summary() Summary {
	s := Summary{Mode: string(a.mode), Norm: a.opt.Norm, Transient: a.opt.Transient, Samples: a.n,
		HasPattern: a.pat[0] != nil}
	if a.n == 0 {
		s.Notes = append(s.Notes, "no samples in the averaging window")
		return s
	}
	s.StartDay, s.EndDay = a.tFirst/day, a.tLast/day
	an := a.analyse()

	// eddy kinetic energy and heat flux
	np := float64(len(a.tau))
	for n := range 2 {
		var e float64
		for i := range a.tau {
			e += 0.5 * (an.mom[n].uu[i] + an.mom[n].vv[i])
		}
		s.EKE[n] = e / np
	}
	hf := a.heatFlux(an)
	for _, v := range hf {
		s.HeatFlux += v
	}
	s.HeatFlux /= np
	s.HeatFluxK = s.HeatFlux * a.kelvinPerPsi()

	s.Energy = a.energetics()

	if a.pat[0] != nil {
		fit := func(x [2][]complex128) Projection { return Fit(a.g, a.ph, a.opt.Norm, x, a.pat) }
		rate := func(x [2][]complex128) float64 { return a.inner(x, a.pat) / a.patNorm * day }
		s.BlockHeight = a.patternHeight()
		s.Eddy, s.EddyVorticity, s.EddyInterface = fit(an.psit), fit(an.psitZ), fit(an.psit2)

		mf := a.termTendency(qg.TermShear, an.refQ)
		adv := [2][]complex128{make([]complex128, a.g.Len()), make([]complex128, a.g.Len())}
		for n := range 2 {
			if err := a.m.Advection(adv[n], an.refPsi[n], an.refQ[n], n); err != nil {
				panic("diag: " + err.Error()) // sizes are the grid's
			}
		}
		addTo(mf, adv)
		s.MeanFlow = fit(a.streamTendency(mf))

		drag := a.termTendency(qg.TermDrag, an.refQ)
		sel := a.termTendency(qg.TermScaleSelective, an.refQ)
		sp := a.termTendency(qg.TermSponge, an.refQ)
		s.Drag = rate(a.streamTendency(drag))
		s.ScaleSelective = rate(a.streamTendency(sel))
		s.Sponge = rate(a.streamTendency(sp))
		addTo(drag, sel)
		addTo(drag, sp)
		s.Dissipation = fit(a.streamTendency(drag))

		mt := a.termTendency(qg.TermMaintenance, an.refQ)
		s.Maintenance = rate(a.streamTendency(mt))
		s.Forcing = rate(a.streamTendency(a.fMean))

		if a.mode != qg.Fixed && a.tLast > a.tFirst {
			d := [2][]complex128{make([]complex128, a.g.Len()), make([]complex128, a.g.Len())}
			for n := range 2 {
				for p := range d[n] {
					d[n][p] = (a.last[n][p] - a.first[n][p]) / complex(a.tLast-a.tFirst, 0)
				}
			}
			s.Trend = rate(d)
		}
		s.Residual = s.Trend - (s.Eddy.Rate + s.MeanFlow.Rate + s.Dissipation.Rate + s.Maintenance + s.Forcing)
		if s.Dissipation.Rate != 0 {
			s.EddyToDissipation = s.Eddy.Rate / math.Abs(s.Dissipation.Rate)
		} else {
			s.Notes = append(s.Notes, "no dissipation acts on the block pattern: eddy_to_dissipation set to 0")
		}
		x, dt, uniform := a.window()
		if st, err := Statistics(x, dt, a.opt.Bins); err == nil {
			s.Index = st
			if !uniform {
				s.Index.Decorrelation, s.Index.IntegralTime = 0, 0
				s.Notes = append(s.Notes, "sampling was not uniform in time: decorrelation times not computed")
			}
		} else {
			s.Notes = append(s.Notes, "block index statistics: "+err.Error())
		}
	} else {
		s.Notes = append(s.Notes, "no block and no pattern: no projections")
	}
	if a.n < 2 {
		s.Notes = append(s.Notes, "one sample in the window: eddy statistics are zero")
	}
	if a.mode == qg.Fixed {
		s.Notes = append(s.Notes, "fixed mode: the block is held; the residual is the tendency the holding supplies")
	}
	return s
}

// energetics returns the energy budget over the window from the series.
func (a *Accumulator) energetics() Energetics {
	ser := &a.series
	w := ser.WindowStart
	t := ser.Time[w:]
	e := Energetics{Rates: make(map[string]float64, qg.NumTerms)}
	for i := w; i < len(ser.Time); i++ {
		e.KE += ser.KE[i]
		e.APE += ser.APE[i]
	}
	nw := float64(len(t))
	e.KE /= nw
	e.APE /= nw
	span := t[len(t)-1] - t[0]
	var abs float64
	for k := range qg.NumTerms {
		name := qg.Term(k).String()
		r := ser.Rates[name]
		var integ float64
		for i := w + 1; i < len(ser.Time); i++ {
			integ += r[i] * (ser.Time[i] - ser.Time[i-1])
		}
		if span > 0 {
			e.Rates[name] = integ / span
		}
		e.Budget += integ
		abs += math.Abs(integ)
	}
	last := len(ser.Time) - 1
	e.Change = ser.KE[last] + ser.APE[last] - ser.KE[w] - ser.APE[w]
	if den := math.Max(math.Abs(e.Change), abs/2); den > 0 {
		e.ClosureError = math.Abs(e.Change-e.Budget) / den
	}
	return e
}

// heatFlux returns the gridded heat flux v′(ψ1 − ψ2)′ with v the
// mass-weighted velocity, m³ s⁻².
func (a *Accumulator) heatFlux(an *analysis) []float64 {
	h := make([]float64, len(a.tau))
	for i := range h {
		h[i] = a.ph.W1*an.mom[0].vt[i] + a.ph.W2*an.mom[1].vt[i]
	}
	return h
}

// kelvinPerPsi converts ψ1 − ψ2 (m² s⁻¹) to the temperature between the
// layers' mid-levels, K: f0/(R_d ln(p2/p1)), p1 and p2 the middles of the
// layers of a 1000 hPa column divided in the ratio H1:H2.
func (a *Accumulator) kelvinPerPsi() float64 { return a.cfg.KelvinPerThickness() }

// patternHeight returns the largest |f0 P1/g| on the grid, m.
func (a *Accumulator) patternHeight() float64 {
	f := make([]float64, len(a.tau))
	a.plan.Inverse(f, a.pat[0])
	var mx float64
	for _, v := range f {
		mx = math.Max(mx, math.Abs(v))
	}
	return mx * a.cfg.F0 / qg.Gravity
}

// String prints a compact report.
func (s Summary) String() string {
	var b strings.Builder
	mode := s.Mode
	if mode == "" {
		mode = "none"
	}
	fmt.Fprintf(&b, "eddy–block diagnostics: block mode %s, %d samples, days %.1f–%.1f, %s inner product\n",
		mode, s.Samples, s.StartDay, s.EndDay, s.Norm)
	if s.HasPattern {
		fmt.Fprintf(&b, "projection on the block (day⁻¹, > 0 reinforces; block height %.0f m):\n", s.BlockHeight)
		fmt.Fprintf(&b, "  %-20s %9s %9s %9s %7s %8s %8s %7s\n", "", "rate", "barotr.", "barocl.", "corr", "east", "north", "unexpl")
		row := func(name string, p Projection) {
			fmt.Fprintf(&b, "  %-20s %+9.4f %+9.4f %+9.4f %+7.3f %+8.1f %+8.1f %7.3f\n", name, p.Rate, p.Barotropic, p.Baroclinic, p.Correlation, p.DriftEast, p.DriftNorth, p.Unexplained)
		}
		row("eddy PV flux", s.Eddy)
		row("  vorticity flux", s.EddyVorticity)
		row("  interface flux", s.EddyInterface)
		row("mean flow", s.MeanFlow)
		row("dissipation", s.Dissipation)
		fmt.Fprintf(&b, "  (drift columns in km day⁻¹)\n")
		fmt.Fprintf(&b, "  dissipation parts: drag %+.4f, scale_selective %+.4f, sponge %+.4f\n", s.Drag, s.ScaleSelective, s.Sponge)
		fmt.Fprintf(&b, "  maintenance %+.4f, forcing %+.4f, trend %+.4f, residual %+.4f\n", s.Maintenance, s.Forcing, s.Trend, s.Residual)
		fmt.Fprintf(&b, "  eddy/|dissipation| = %.3f; eddy height tendency %+.1f m day⁻¹ at the block's peak\n", s.EddyToDissipation, s.Eddy.Rate*s.BlockHeight)
		ix := s.Index
		fmt.Fprintf(&b, "block index: mean %.3f, std %.3f, skewness %+.2f, excess kurtosis %+.2f, decorrelation %.1f d (integral %.1f d); %d episodes above %.3f, mean %.1f d, longest %.1f d\n",
			ix.Mean, ix.Std, ix.Skewness, ix.Kurtosis, ix.Decorrelation, ix.IntegralTime, ix.Episodes, ix.Threshold, ix.MeanDuration, ix.MaxDuration)
	}
	fmt.Fprintf(&b, "eddy KE %.3g / %.3g m² s⁻² (layers 1/2); heat flux v′(ψ1−ψ2)′ %.3g m³ s⁻² = %.3g K m s⁻¹\n", s.EKE[0], s.EKE[1], s.HeatFlux, s.HeatFluxK)
	e := s.Energy
	fmt.Fprintf(&b, "energy: KE %.4g, APE %.4g m² s⁻²; change %.4g vs budget %.4g m² s⁻² (closure %.2g)\n", e.KE, e.APE, e.Change, e.Budget, e.ClosureError)
	fmt.Fprintf(&b, "  mean rates (m² s⁻³):")
	for k := range qg.NumTerms {
		name := qg.Term(k).String()
		if r := e.Rates[name]; r != 0 {
			fmt.Fprintf(&b, " %s %.3g", name, r)
		}
	}
	b.WriteString("\n")
	for _, n := range s.Notes {
		fmt.Fprintf(&b, "note: %s\n", n)
	}
	return b.String()
}
