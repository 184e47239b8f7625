// Package wavemaker provides the PV sources that feed eddies into the
// two-layer model of package qg: stochastic noise, white or red in time,
// localised by a spatial mask and confined to a wavenumber band, with a set
// vertical structure and a strength given as a target energy injection
// rate ε (m² s⁻³); and a deterministic localised wave train of set
// wavenumber and frequency for clean linear experiments.
//
// # Use
//
// Build a [Maker] for a model from a [Config] with [New] and attach it:
//
//	w, err := wavemaker.New(cfg, model) // checks cfg against the model's grid
//	if err != nil { … }                 // a *qg.FieldError naming e.g. "wavemaker.band.min_wavelength"
//	w.Attach(model)                     // as a qg.Source (noise) or a qg.Forcing (wave train)
//
// [NewNoise] and [NewTrain] return the concrete types, [Noise] and [Train]. The model books the
// noise's injection and the train's work in Ledger[qg.TermInjection].
//
// # The noise
//
// Each step the noise draws a unit Gaussian field ξ on the Nx × Ny grid (M =
// Nx·Ny values, row by row, west to east, from a PCG generator seeded with
// Config.Seed), multiplies it by the mask m(x, y), transforms it once (an
// unnormalised forward transform x̂ = Σ m ξ e^{−ik·x}), keeps the modes P of
// the band that the model retains, and gives both layers the same pattern
// times the vertical vector v = (v1, v2):
//
//	upper (1, 0), lower (0, 1), barotropic (1, 1) (ψ1 = ψ2),
//	baroclinic (1, −δ), δ = H1/H2 (then H1ψ1 + H2ψ2 = 0).
//
// Because the field is real and made on the grid, its coefficients are
// Hermitian (x̂(−k) = conj x̂(k), which matters on the i = 0 column, where
// the grid stores both ±l), and for every mode
//
//	E|x̂_p|² = Σ_x m(x)² = M⟨m²⟩,
//
// the diagonal of the multiplication operator by m in the Fourier basis:
// the mask correlates the modes but leaves each one's variance at the
// domain mean of m².
//
// # Normalisation (white noise)
//
// The increment over a step is Δq_n = √dt·σ·v_n·P x̂. The model's energy is
// quadratic, E(q) = −½ Σ_n W_n⟨ψ_n q_n⟩ (W_n = H_n/H), and it books E(q + Δq) −
// E(q) = −Σ_n W_n⟨(ψ_n + ½Δψ_n)Δq_n⟩, the midpoint (Stratonovich) work. Δq is
// independent of q and has zero mean, so the cross term vanishes on average
// and (Novikov 1965, Sov. Phys. JETP 20, 1290: the mean work of a Gaussian
// white force is fixed by its covariance)
//
//	E[ΔE] = E[E(Δq)] = ½ σ² dt · M⟨m²⟩ · Σ_{p in band} Weight_p · A_p,
//
// where Weight_p is qg.Grid.Weight (Hermitian multiplicity / M²) and
//
//	A_p = −Σ_n W_n v_n ψ̂_n(p),  ψ̂ = inversion of the PV v at mode p,
//
// is twice the energy per unit squared PV amplitude at that mode; in closed
// form (D = K²(K² + F1 + F2)): upper W1(K² + F2)/D, lower W2(K² + F1)/D,
// barotropic 1/K², baroclinic δ/(K² + F1 + F2). With S = M⟨m²⟩Σ Weight·A the
// choice
//
//	σ² = 2ε / S
//
// makes the expected injection rate exactly ε, whatever dt, the mask, the
// band, the vertical structure or the flow. The kernel is computed with the
// model's own inversion (qg.Model.Inverter), so it is the model's energy
// that is normalised.
//
// # Red noise
//
// Red noise is a forcing F (a PV tendency) that is an Ornstein–Uhlenbeck
// process of correlation time τ at every grid point, masked, band-passed and
// structured as above: F(t) = σ_r v P·FFT(m φ(t)), with φ of unit variance
// and covariance e^{−|s|/τ}. Each step updates φ exactly (a = e^{−dt/τ},
// φ ← aφ + √(1 − a²)ξ) jointly with its integral over the step, which is what
// the increment is: Δq = ∫F dt. The pair is Gaussian with known moments
// (Gillespie 1996, Phys. Rev. E 54, 2084) and is drawn from two unit normals
// per point, so the increments are exact for any dt/τ. In the limit τ → 0
// the integral tends to white noise of intensity 2σ_r²τ, and
//
//	σ_r² = ε / (τ S)
//
// gives the rate ε in that limit. For a finite τ the injection depends on
// the flow, because the forcing works against the response it has built:
// in a linear flow in which mode p decays at rate λ_p the rate is
// ε Σ_p w_p/(1 + λ_p τ), with w_p the white-noise share of mode p. For
// example, with the configuration of the package tests (band 500–2700 km,
// viscous damping of 1/day at 2700 km, about 30/day at 500 km, β = 0) the
// measured rates over 100 days were 0.66ε, 0.24ε and 0.080ε for τ = 3 h,
// 1 day and 4 days, against 0.65ε, 0.233ε and 0.078ε from linear response.
// Tendency returns the current F.
//
// # Wave train
//
// The train is the PV tendency v_n·A·m(x, y)·cos(kx + ly − ωt), with k, l
// given as wavelengths, ω in rad s⁻¹ and the amplitude A as a PV tendency
// (s⁻²) at the mask's peak in the layer with v_n = 1. It is deterministic,
// smooth in time and evaluated at every stage of the time stepper; its
// spectra are precomputed, so a stage costs no transform. Its work depends
// on the flow and is booked by the model.
//
// # Cost and reproducibility
//
// A noise step costs M normal deviates (2M for red noise) and one forward
// transform of size Nx × Ny, whatever the vertical structure. The same seed
// gives bit-identical increments (with the same Go release: math/rand/v2's
// PCG and NormFloat64), on any number of workers and on js/wasm; different
// seeds give different ones. A Noise or Train is not safe for concurrent
// use: the model calls it from its own goroutine.
package wavemaker
