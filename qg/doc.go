// Package qg is a doubly periodic two-layer quasi-geostrophic model solved
// pseudo-spectrally, built for idealised experiments on how transient eddies
// interact with a prescribed blocking anomaly.
//
// # Equations
//
// Layers n = 1 (upper) and 2 (lower) with depths H1, H2, δ = H1/H2 and
// deformation radius Ld; F1 = 1/(Ld²(1+δ)), F2 = δ·F1. The PV anomaly is
//
//	q1 = ∇²ψ1 + F1(ψ2 − ψ1),   q2 = ∇²ψ2 + F2(ψ1 − ψ2),
//
// and each layer obeys
//
//	∂q_n/∂t + J(ψ_n, q_n) + U_n ∂x q_n + Q_ny ∂x ψ_n = D_n + S_n + W_n + B_n
//
// with imposed zonal flows U1, U2, background PV gradients
// Q1y = β + F1(U1 − U2), Q2y = β − F2(U1 − U2), linear Ekman drag on the
// lower layer, a scale-selective dissipation (a spectral cutoff filter or a
// hyperviscosity), a sponge band, user forcings and the block's maintenance.
//
// # Numerics
//
// The prognostic variable is the spectral PV (unnormalised coefficients of
// the real-to-complex transform in package fft, layout [ky][kx]). The state is
// kept on the modes retained by the 2/3 rule, so the nonlinear term, computed
// in flux form J(ψ, q) = ∂x(uq) + ∂y(vq), is free of aliasing and the
// semi-discrete system conserves energy exactly and, when β = 0 and U = 0,
// each layer's enstrophy. Time stepping is classical RK4 or third-order
// Adams–Bashforth (started with two RK4 steps). The sponge, the cutoff filter
// and stochastic sources are applied once per step as exact split steps, and
// the energy each one removes or adds is booked in the Model's energy ledger,
// as is the work of every term of the tendency (quadrature of the stage
// values with the scheme's weights).
//
// # Use
//
// [NewModel] builds a [Model] from a [Config] ([DefaultConfig] is a
// 128 × 64 β-plane channel; a bad value is a *[FieldError] naming its key).
// Set the state on the grid with [Model.SetStreamfunction] or [Model.SetPV]
// (or spectrally with [Model.SetSpectralPV]), prescribe a block with
// [Model.SetBlock], add forcings ([Model.AddGridForcing] for one written on
// the grid, [Model.AddForcing] and [Model.AddSource] for spectral and
// stochastic ones), then [Model.Step], [Model.Run] or [Model.RunUntil]. A
// failed step returns a *[StepError] naming the field and the time, and
// leaves the state as it was.
//
// Read the state with [Model.Field] (ψ, q, u, v, height or vorticity of a
// layer, on the grid), [Model.SpectralPV] and [Model.SpectralStreamfunction];
// convert with [Model.ToGrid] and [Model.ToSpectral]; read [Model.Energy],
// [Model.Enstrophy], the CFL number and the energy [Ledger], whose [Term]s
// are named alike in every output of the project ("injection", "shear",
// "drag", "scale_selective", "sponge", "maintenance", "advection").
// [Model.TermTendency] evaluates one term of the equations on any state, and
// [Model.Advection] the flux-form Jacobian, for diagnostics.
// [Model.Checkpoint] and [Model.Restore] (with [SaveCheckpoint] and
// [LoadCheckpoint]) continue a run bit for bit and refuse a checkpoint of
// another configuration. [Model.Close] stops the model's goroutines.
//
// Spectral fields are the unnormalised coefficients of the forward real
// transform, Ny rows of Nx/2+1 zonal wavenumbers; a [Grid] gives the
// wavenumbers, the 2/3-rule mask and the quadrature weights, and the inner
// products the diagnostics use ([Grid.EnergyProduct], [Grid.LayerProduct]).
//
// # Files
//
// The layout follows the physics: config.go (parameters and validation),
// grid.go (wavenumbers), operators.go (velocity, flux convergence, energy
// inner products), invert.go (PV inversion), tendency.go (advection,
// background flow, drag, dissipation, forcings), terms.go (the tendency of
// each term, for diagnostics), block.go (block modes), sponge.go,
// dissipation.go (filter and hyperviscosity), step.go (RK4 and AB3, the
// checks of a step), energy.go (energy and the ledger), fields.go (fields on
// the grid, forcings written on the grid), layers.go (the two layers
// computed concurrently), checkpoint.go (restart files) and model.go (the
// Model type that ties them together).
//
// A Model is not safe for concurrent use; it uses Config.Workers goroutines
// internally and its results are bit-identical whatever the number of
// workers and however they are scheduled.
package qg
