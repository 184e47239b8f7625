// Package diag computes the diagnostics of an eddy–block experiment run
// with package qg: time means and eddy statistics after a spin-up, the eddy
// PV flux convergence and its split into a relative-vorticity part and an
// interface (thickness, heat) part, the streamfunction and height tendencies
// they induce, their projections on the block, E-vectors, energy budgets,
// spectra and a block index.
//
// # Use
//
// An [Accumulator], made by [New] with [Options], reads a running
// [qg.Model] without copying it:
//
//	acc, err := diag.New(m, diag.Options{Spinup: 50 * 86400})
//	for range steps {
//		m.Step()
//		acc.Sample()
//	}
//	s := acc.Summary()  // one-number answers, JSON-tagged; s.String() prints a report
//	f := acc.Fields()   // named gridded fields (means, fluxes, convergences, tendencies)
//	ts := acc.Series()  // energies, budget rates, CFL and block index per sample
//	sp := acc.Spectra() // time-mean isotropic eddy energy spectra
//	acc.EddyForcing(conv, dz) // cheap: just C_n and f0ψ_t/g, for a live display
//
// [Summary] holds the one-number answers ([Projection]s on the block, the
// [Energetics], the block index [IndexStats]); [Fields] the gridded ones,
// each a [Field] with its units; [Series] the time series; [Spectra] the
// spectra. [Fit], [Statistics] and [Episodes] do the same analyses on
// fields and series of the caller's own.
//
// Every call to Sample enters the time series; only samples taken at model
// time ≥ Options.Spinup enter the time means, eddy statistics and the
// statistics of the block index (the averaging window). Sampling should be
// uniform in time (the same number of steps between samples) for the
// decorrelation time of the block index to be meaningful.
//
// # Eddies and the reference state
//
// Flow = reference + eddies, exactly, in every mode:
//   - forced, relaxed and free modes (and runs without a block): the
//     reference is the time mean of the state over the window and the eddies
//     are departures from it (the time mean of the window, not a running
//     mean: Welford's update gives exactly that at the end);
//   - fixed mode: the reference is the prescribed block ψ_B and the eddies
//     are the model's state ψ′ itself, including any stationary part of it;
//     with Options.Transient the reference becomes ψ_B + mean(ψ′) and the
//     eddies the departures of ψ′ from its time mean.
//
// Second moments are accumulated with Welford's (1962) update,
// C_n = C_{n−1} + (x − x̄_{n−1})(y − ȳ_n), never as ⟨xy⟩ − ⟨x⟩⟨y⟩ of large
// sums (Chan, Golub & LeVeque 1983). Eddy fluxes are the means over the N
// samples, C/N.
//
// # Eddy forcing
//
// Per layer n (m the other layer, F_n the inverse squared deformation radius
// of the layer):
//
//	C_n = −∇·(u′q′)_n                   eddy PV flux convergence, s⁻²
//	    = −∇·(u′ζ′)_n                   relative-vorticity part
//	      − ∇·(F_n u′(ψ_m − ψ_n)′)      interface (thickness, heat) part
//
// both flux components included (q without its domain mean, which a
// forcing may carry and which is dynamically inert); the flux fields are differentiated
// spectrally and truncated to the model's retained modes. The induced
// streamfunction tendency ψ_t solves the PV inversion of (C_1, C_2) (package
// qg's Inverter), and the height tendency is f0 ψ_t / g, reported in
// m day⁻¹.
//
// # Projections on the block
//
// A tendency X (a pair of streamfunction tendencies) is projected on the
// block pattern P (ψ_B, or Options.Pattern) as r = ⟨X, P⟩/⟨P, P⟩, in day⁻¹;
// r > 0 reinforces the block. The inner product is by default the energy
// inner product of the two-layer model,
//
//	⟨a, b⟩_E = Σ_n (H_n/H)⟨∇a_n·∇b_n⟩ + (H1/H) F1 ⟨(a1 − a2)(b1 − b2)⟩,
//
// the one whose norm is the model's total energy (×2). It is chosen because
// (i) the rates of the different terms then add up in the block's energy
// budget, r_X = (work of term X on the block)/(2·E_B), so they can be
// compared and summed, (ii) ⟨X, P⟩_E = −Σ_n (H_n/H)⟨P_n·Q_n⟩ for the PV
// tendency Q of X, so it weighs what a term does to the block's PV where the
// block is, and (iii) it weighs the barotropic and the thermal (baroclinic)
// parts of the block by their energies, which is what the interface flux
// changes. Options.Norm = LayerNorm selects the plain mass-weighted inner
// product Σ_n (H_n/H)⟨a_n b_n⟩ instead, which emphasises the largest scales.
// The pattern correlation is ⟨X, P⟩/√(⟨X, X⟩⟨P, P⟩) in the same inner
// product.
//
// A tendency can also move the block: X is fitted by least squares on
// ψ_B, ∂xψ_B and ∂yψ_B; the coefficients b, c of the derivatives give the
// drift (a tendency −c_x ∂xψ_B moves the pattern east at c_x), reported in
// km day⁻¹, and the fraction of ⟨X, X⟩ that none of the three patterns
// explains is reported too. On a periodic domain ψ_B is orthogonal to its
// own derivatives in both inner products, so the fitted amplitude equals r.
//
// Each projection is also split between the barotropic part of the pattern,
// P_bt = (W1P1 + W2P2)(1, 1), and its baroclinic (thermal) part
// P_bc = P − P_bt, orthogonal in either inner product (Projection.Barotropic,
// Projection.Baroclinic). The interface part of the eddy forcing is purely
// baroclinic — its PV tendencies are −F1·D and F2·D for one divergence D,
// since J(ψ1, ψ1 − ψ2) = J(ψ2, ψ1 − ψ2), and W1F1 = W2F2 — so it acts only on
// the block's thermal anomaly and projects to zero on a barotropic block.
// "The vorticity flux reinforces the block and the interface flux erodes
// its thermal anomaly" (Shutts 1983; Hoskins, James & White 1983) reads
// Summary.EddyVorticity.Rate > 0 and Summary.EddyInterface.Baroclinic < 0,
// for a block with a baroclinic part.
//
// The projections are made for the eddy tendency and its two parts, for the
// block's dissipation (drag, the scale-selective dissipation and the sponge,
// evaluated on the reference state with qg.Model.TermTendency), for the
// mean-flow terms (advection of the reference state by itself, −J(ψ̄, q̄),
// and the imposed flow's terms, −U_n ∂x q̄_n − Q_ny ∂x ψ̄_n), for the
// maintenance (the forced mode's steady forcing, the relaxed mode's
// relaxation), for the time mean of the deterministic qg.Forcings, and for
// the observed trend (ψ_last − ψ_first)/(t_last − t_first) of the window.
// Outside the fixed mode these add up, to sampling error and the time mean
// of any stochastic source, to the trend; the difference is reported as the
// residual. In the fixed mode the block is held, the trend is zero and the
// residual is the tendency the holding supplies.
//
// # E-vectors and heat flux
//
// E = (v′² − u′², −u′v′) per layer (Hoskins, James & White 1983). The heat
// flux is v′(ψ1 − ψ2)′ with v the mass-weighted (barotropic) velocity; the
// divergence of u_n′(ψ1 − ψ2)′ is the same for either layer's velocity,
// since J(ψ1, ψ1 − ψ2) = J(ψ2, ψ1 − ψ2). It is also given in K m s⁻¹ through
// the hydrostatic relation between the layers, f0(ψ1 − ψ2) = R_d T ln(p2/p1),
// T the mean temperature between the layers' mid-levels p1 and p2, taken at
// the middle of each layer of a 1000 hPa column divided in the ratio H1:H2
// (250 and 750 hPa for equal layers).
//
// # Block index
//
// I(t) = ⟨Ψ(t), P⟩/⟨P, P⟩, Ψ the full flow (ψ_B + ψ′ in the fixed mode), so
// I = 1 for the block as prescribed. Its statistics over the window are the
// mean, the unbiased standard deviation, the adjusted skewness G1 and excess
// kurtosis G2 (Joanes & Gill 1998; the estimators of gonum/stat), a
// histogram, the decorrelation time — the e-folding time of the sample
// autocorrelation, the lag at which it first falls below 1/e, interpolated
// log-linearly between lags (exact for an AR(1) process, whose
// autocorrelation is φ^k) — the integral time scale Δt(½ + Σ_k ρ_k) summed
// up to the first negative ρ_k, for comparison, and the durations of the
// episodes above a threshold (mean + one standard deviation in the Summary,
// any threshold with Episodes).
//
// # Energetics
//
// Series records, per sample, the kinetic and available potential energy
// and enstrophies of the model state (of the eddies in the fixed mode) and
// each qg.Ledger term as a rate: its change since the previous sample over
// the interval. Do not call Model.ResetLedger while an Accumulator samples.
//
// An Accumulator is not safe for concurrent use, and Sample, Summary and
// Fields must not be called while the model steps.
package diag
