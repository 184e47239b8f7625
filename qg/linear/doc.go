// Package linear is the two-layer model of package qg linearised about a
// basic state: the imposed flow of a qg.Config plus a streamfunction ψ̄ (a
// run's time mean, or a prescribed block), with the same drag,
// scale-selective dissipation and sponge. A perturbation q′ obeys
//
//	∂q′/∂t = L q′ + f,
//	L q′ = −J(ψ̄, q′) − J(ψ′, q̄) − U_n ∂x q′ − Q_ny ∂x ψ′ + drag + dissipation + sponge,
//
// the Jacobian of the model's tendency at ψ̄ (a constant forcing such as the
// forced block's maintenance drops out). It is built on the same operators
// as the nonlinear model — the fixed block mode with the eddy–eddy term
// left out — so there is no second copy of the physics.
//
// [Model.Integrate] finds the steady response to a steady forcing f by
// stepping from rest until the change per day is negligible, and stops
// with an *[UnstableError] when the response grows instead of settling (an
// unstable basic state has no response a time integration can reach).
// [Model.Solve] finds the same steady state faster, by GMRES on the fixed
// point of one time step, q = Φ(q) + b: it is the steady state of the model
// as stepped, so both routes agree to the solver's tolerance; the Ritz
// values of its Krylov space tell whether the basic state is unstable.
// [PVPatch] and [HeatingPatch] make the usual forcing anomalies.
package linear
