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
// # Files
//
// The layout follows the physics: config.go (parameters and validation),
// grid.go (wavenumbers and spectral operators), invert.go (PV inversion),
// tendency.go (advection, background flow, drag, dissipation, forcings),
// terms.go (the tendency of each term, for diagnostics), block.go (block
// modes), sponge.go, dissipation.go (filter and hyperviscosity), step.go
// (RK4 and AB3), energy.go (energy, enstrophy and the ledger), layers.go
// (the two layers computed concurrently), checkpoint.go (restart files) and
// model.go (the Model type that ties them together, CFL and finiteness
// checks).
//
// A Model is not safe for concurrent use; it uses Config.Workers goroutines
// internally and its results are bit-identical whatever the number of
// workers.
package qg
