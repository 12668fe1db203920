// Package stability solves the temporal linear stability problem of a
// parallel shear flow U(y) between two walls, to validate the flow solver
// against exact and published growth rates and to seed it with eigenmodes.
//
// # Problem
//
// A two-dimensional disturbance with stream function
//
//	ψ(x, y, t) = Re[φ(y) exp(iα(x − ct))],   u' = ∂ψ/∂y,  v' = −∂ψ/∂x,
//
// with real wavenumber α > 0 and complex phase speed c = c_r + i c_i, grows
// like exp(α c_i t) when c_i > 0. φ satisfies the Orr–Sommerfeld equation
//
//	(U − c)(φ'' − α²φ) − U''φ = (φ'''' − 2α²φ'' + α⁴φ)/(iαRe)
//
// with φ = 0 and either φ' = 0 (NoSlip) or φ″ = 0 (FreeSlip) at each wall,
// or, for Re = +Inf, the Rayleigh equation (U − c)(φ″ − α²φ) − U″φ = 0 with
// φ = 0 at the walls. All quantities are in the units of the Profile: for
// Poiseuille the channel half-width and centre-line speed, for Tanh the
// half-thickness δ and the free-stream speed U0 of U = U0 tanh(y/δ).
//
// # Method
//
// φ is represented by its values at the n+1 Chebyshev–Gauss–Lobatto points
// ξ_j = cos(πj/n), mapped to [Y1, Y2] affinely or by a sinh map that
// clusters points at mid-height (Profile.Stretch). Derivatives come from the
// collocation differentiation matrices of Weideman & Reddy (2000, ACM TOMS
// 26:465) and the chain rule for the map. The two conditions at each wall
// are eliminated: φ = 0 removes the wall nodes, and the derivative condition
// is solved for the nodes next to the walls, the equation being collocated
// at the remaining interior nodes. So the generalised eigenproblem A x = c B x
// has a regular B and no spurious eigenvalues from boundary rows.
//
// The whole spectrum (Solve) comes from the standard problem B⁻¹A x = c x
// handed to gonum's mat.Eigen, through the real 2m×2m embedding of the
// complex matrix when it is complex (the viscous case): the embedding has the
// eigenvalues of the matrix and their conjugates, and the eigenvectors tell
// which is which. One mode (Spectrum.Mode, LeastStable) is then refined by
// shift-and-invert inverse iteration and Rayleigh-quotient iteration with a
// complex LU factorisation, to the rounding level of the discrete problem
// (about 1e-11 in c). Its eigenfunction is kept as a Chebyshev series and
// evaluated anywhere in [Y1, Y2] by Clenshaw's recurrence (Mode.Eval).
//
// # Accuracy
//
// The package tests record the resolution needed: plane Poiseuille flow at
// α = 1, Re = 10⁴ needs n ≈ 80 for c to 1e-10; the tanh mixing layer with
// the default stretch of Tanh converges to about 1e-11 in α c_i by n = 80 for
// walls up to ±20δ (inviscid and Re ≥ 1000). Near a neutral point of the
// inviscid problem (c_i → 0) the critical layer sharpens and much larger n is
// needed.
//
// All functions are safe for concurrent use.
package stability
