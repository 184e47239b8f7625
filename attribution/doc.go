// Package attribution splits the response of an eddying flow to a steady
// forcing anomaly into the mean flow's linear response and the part the
// eddies add, with the model of package qg.
//
// Write the model as ∂q/∂t = N(q) + F, N the whole tendency but the
// external forcings F (the wave source, a forcing anomaly). Averaging a
// statistically steady run gives 0 ≈ N(q̄) + F̄ + C̄, with C̄ = −∇·(v′q′)‾
// the time-mean eddy PV flux convergence (advection is quadratic in q).
// The mean-state forcing H = −N(q̄) ([MeanForcing]) makes the time mean an
// exact steady state of the model without eddies; it splits into
// H = F̄ + C̄ + R, the residual R being the sampling error and the trend of
// the time means. [FromExperiment] computes it from a finished run in
// memory, [FromMeans] from the means.nc file a run writes, and a
// [Recorder] adds what the diagnostics do not keep (the realised mean of a
// red-noise source, the domain-mean PV, the trend, the time means of
// segments of the window).
//
// The model linearised about a basic state ([Linear], built on package
// qg/linear: the same operators, drag, dissipation and sponge) gives the
// steady linear response to a steady forcing: about a run's time mean
// ([AboutMean]) or about the imposed flow plus the prescribed block
// ([AboutBlock]). The forcing is a field, or an [Anomaly]: a Gaussian patch
// of PV tendency or of heating.
//
// [Run] does the attribution experiment: (a) two nonlinear runs, control
// and with the anomaly f (on two goroutines), the difference Δq̄ of their
// time means and ΔC̄ of their eddy forcings; (b) the linear response to f
// about the control's time mean; (c) the linear response to f + ΔC̄. Since
// N(q̄ + Δq̄) − N(q̄) is L Δq̄ plus the response's interaction with itself,
// (c) would equal (a) but for that interaction and the change ΔR of the
// residual; a closure check, the response to f + ΔC̄ + ΔR, isolates the
// former. The [Result] scores (b), (c) and the closure against (a) by
// pattern correlation and RMS height difference ([Score]), and estimates
// the sampling noise of (a) from segments of the averaging windows
// ([Noise]), so that one can see whether (c) is closer to (a) than (a) is to
// itself. [Builtin] is an invented scenario that makes the point on a
// laptop in a minute or two.
//
// The fixed block mode is refused: its state is the eddies alone and the
// block is held outside the model's equations, so the time-mean full flow
// is not a state of the model. The relaxed mode has a mean-state forcing
// but no linear model (qg/linear has no relaxation term).
package attribution
