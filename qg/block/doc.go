// Package block builds the prescribed blocks of eddyblock: gridded
// streamfunctions ψ_B for the two layers of a [qg.Grid], ready for
// [qg.Model.SetBlock], and the [Config] that names them: a Gaussian [Dipole]
// or a β-plane [Modon] (solved by [SolveModon]), or [None].
//
// # Coordinates and signs
//
// x points east and y north; f0 > 0 and β ≥ 0 (the northern hemisphere).
// A positive ψ is a high: the geopotential height is Z = f0 ψ / g with
// g = qg.Gravity, the flow is u = −∂ψ/∂y, v = ∂ψ/∂x and goes clockwise
// round a high. A block is a high poleward of a low, with easterlies
// between them. Shapes are centred at (x_b, y_b) and evaluated at the
// periodic displacement of each grid point (qg.PeriodicDistance), summed over
// the nearest image and its eight neighbours, so they are smooth across the
// boundaries of the doubly periodic domain.
//
// # Dipole
//
// Two Gaussian lobes of e-folding radius R whose centres are a distance d
// apart on the meridian through the centre:
//
//	ψ1 = A·[exp(−|r − r₊|²/R²) − exp(−|r − r₋|²/R²)],  r± = (x_b, y_b ± d/2),
//	ψ2 = (1 − b)·ψ1,
//
// with A given as ψ (m² s⁻¹) or as a height Z (m), A = g Z / f0, and b the
// baroclinic factor (0 barotropic, the default; 1 upper layer only; 2
// purely baroclinic).
//
// # Modon
//
// The barotropic modon of Stern (1975, J. Mar. Res. 33) and Larichev &
// Reznik (1976, Dokl. Akad. Nauk SSSR 231) is a steady solution of the
// barotropic vorticity equation on the β-plane, ∂ζ/∂t + J(ψ, ζ) + β ∂ψ/∂x = 0,
// that travels east at speed c > 0 relative to a fluid at rest,
// ψ = ψ(x − ct, y). In the moving frame J(ψ + cy, ζ + βy) = 0, so the
// absolute vorticity is a function of ψ + cy, chosen linear on each side of
// a circle of radius a: with polar coordinates (r, θ) about the centre, θ
// from the east (sin θ = (y − y_b)/r), and p = √(β/c),
//
//	outside, r ≥ a:  ζ + βy =  p²(ψ + cy),  ψ = −c a K1(p r)/K1(p a) · sin θ,
//	inside,  r < a:  ζ + βy = −κ²(ψ + cy),  ψ = [B J1(κ r) − c(1 + p²/κ²) r] · sin θ,
//	                 B = c a p² / (κ² J1(κ a)).
//
// Both sides make ψ + cy vanish on r = a (the circle is the separatrix of the
// moving-frame flow), so ψ and the vorticity (ζ = −βy on the circle from
// either relation) are continuous. Continuity of ∂ψ/∂r fixes κ through the
// matching condition
//
//	K2(pa) / (pa·K1(pa)) = −J2(κa) / (κa·J1(κa)),
//
// whose lowest root lies in (j1,1, j2,1) = (3.8317, 5.1356); it is found by
// bisection on a form without poles. The vorticity gradient, and so the PV
// gradient, jumps across r = a: that is the classical solution's one
// discontinuity. As pa → 0 (β = 0) κa → j1,1 and the modon becomes the
// Lamb–Chaplygin dipole, ψ = −c a² sin θ / r outside, B = 2c/(κ J0(κa))
// inside; SolveModon returns that limit for β = 0 (its far field decays only
// as 1/r, so it is not localised in a periodic domain).
//
// This exact solution has its low poleward and its high equatorward,
// westerlies between them, and travels east: Polarity "low_poleward". In
// the fluid at rest (U1 = U2 = 0) of the two-layer model a barotropic modon
// (ψ1 = ψ2) is an exact solution too, and it is the initial condition of the
// free mode. Its mirror image, Polarity "high_poleward" (the default), has
// the orientation of a block; for β > 0 it is not a free solution (it would
// have to travel west, inside the range of Rossby-wave speeds, and radiates),
// and no localised modon stands still in a uniform westerly either, so a
// modon-shaped block is held by the forced mode (Haines & Marshall 1987,
// Q. J. R. Meteorol. Soc. 113). Height or Psi rescale the shape to a given
// peak (a rescaled modon is not an exact solution).
//
// The modified Bessel functions K_ν are computed from the integral
// e^x K_ν(x) = ∫₀^∞ exp(−x(cosh t − 1)) cosh(νt) dt (DLMF 10.32.9) by the
// trapezoidal rule, which converges geometrically for this integrand;
// the package's tests check them against Abramowitz & Stegun (1964),
// Table 9.8, the Wronskian DLMF 10.28.2, the closed forms of K_{1/2} and
// K_{3/2} and gonum's Airy functions.
//
// # Configuration
//
// Config is the [block] table of a configuration file (keys shape, mode,
// relax_time, linear and the tables dipole and modon); Config.Validate
// checks it against the model's qg.Config and names the bad key in a
// *qg.FieldError, and Config.Block returns the qg.Block.
package block
