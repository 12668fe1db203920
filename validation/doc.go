// Package validation holds the verification and validation cases of
// rollerbed. Each case runs the solver on a problem with a known answer and
// returns Checks: the measured quantity, the reference value, the tolerance,
// whether the measurement met it, and the published source of the reference
// (or "derived", or "common practice, no source"). The same cases serve
// `go test` and `rollerbed verify`.
//
// # Cases
//
// In the order of Cases:
//
//   - projection: random, already-solenoidal and stepped fields on a grid
//     clustered at the bed and a canopy-top height; the discrete divergence
//     after the projection stays at round-off (derived from the
//     construction of the exact discrete projection).
//   - vortex-decay: the Taylor–Green vortex array between free-slip walls
//     decays as exp(−ν(kx²+kz²)t) (Taylor & Green 1937, Proc. R. Soc. A
//     158:499; wall form derived); amplitude within 1e-3 and second-order
//     convergence over three grids.
//   - open-channel-startup, closed-channel-startup: start-up from rest under
//     a fixed pressure gradient against the Fourier-series transient, and the
//     parabolic steady state (White, Viscous Fluid Flow; Schlichting &
//     Gersten, Boundary-Layer Theory; series derived). On a uniform grid the
//     solver's LaminarProfile is the parabola to round-off, and a run started
//     from it stays steady to round-off on uniform and clustered grids.
//   - couette: the linear steady state on uniform and clustered grids and the
//     start-up series (same sources).
//   - stokes-second: the oscillating bed, U e^(−ηz) cos(ωt − ηz) with
//     η = √(ω/2ν), on bed-clustered and uniform grids (same sources).
//   - ts-wave: plane Poiseuille flow at Re = 10⁴, α = 1 seeded with the
//     least-stable Orr–Sommerfeld mode of package stability; the disturbance
//     energy grows at 2αc_i = 2 × 0.00373967 and travels at
//     c_r = 0.23752649 (Orszag 1971, J. Fluid Mech. 50:689), checked to 2 %
//     and 0.1 %.
//   - backends: one step of a perturbed shear flow with the FFTW and the
//     gonum transforms, and with one and several workers, agrees to
//     round-off.
//
// # Tolerances
//
// Three kinds of reference appear. Properties that hold exactly for the
// discrete scheme (divergence after projection, discrete steady states that
// are exact for the scheme, backend agreement) are held to 1e-12 of the
// field's own scale. Exact solutions that the second-order scheme only
// approaches are held to twice an a-priori estimate of its error on the
// grid used (derived in the case files: the error of the three-point
// operator on each Fourier mode of the series, or on the damped Stokes
// wave), or to the tolerance the case states, and their observed order of
// convergence under refinement to 2 ± 0.2. Published numbers (the
// Orr–Sommerfeld eigenvalue) get a tolerance that the case justifies.
//
// # Running
//
// The default sizes are short (about a minute on two cores, the ts-wave
// case being most of it):
//
//	go test ./validation/
//
// The fuller sizes refine every case (a few minutes on two cores):
//
//	go test ./validation/ -full -timeout 60m
//
// With -keep DIR each case writes DIR/<case>/: CSV tables of the measured
// against the exact profiles or time series, and checks.json with its
// checks. From code, Run(names, Options{Keep: dir}) does the same.
//
// # A limit of the solver these cases expose
//
// In flows with a pressure gradient along a no-slip wall (the TS wave; a
// vortex between no-slip walls) the solver's time error is first order in
// the step, not second: the pressure-free predictor with implicit vertical
// diffusion leaves an O(Δt) splitting error at the walls. With free-slip
// walls, or without a wall-parallel pressure gradient (the channel, Couette
// and Stokes cases), it is second order. The ts-wave case therefore fixes a
// step well below the advective limit and checks that halving it changes
// the growth rate by less than 0.5 %.
package validation
