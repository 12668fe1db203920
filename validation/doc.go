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
//   - womersley-channel: laminar channel flow between no-slip walls under
//     an oscillating pressure gradient, and under a tidal bulk-velocity
//     target, against the plane form of Womersley's profile (Womersley
//     1955, J. Physiol. 127:553, pipe form; plane form derived) at
//     Womersley number 4, within twice an a-priori error estimate and
//     converging at order 2 ± 0.2 in z.
//   - wave-canopy: oscillatory flow through a uniform rigid (emergent)
//     canopy: the in-canopy attenuation max|U_c|/max|U_∞| against the
//     canopy-flow model of Lowe, Koseff & Monismith (2005, J. Geophys. Res.
//     110, C10016; model form from memory) integrated as an ordinary
//     differential equation (1e-4), and its inertia-dominated (α → 1) and
//     drag-dominated (α → √(L/A_∞)) limits within 5 %.
//   - blade-reconfiguration: the effective-length and bent-height laws of
//     flexible blades (Luhar & Nepf 2011, Limnol. Oceanogr. 56:2003; 2013,
//     Adv. Water Resour. 51:305; fits from memory) against the quasi-static
//     blade model they were fitted to, solved here, for Ca from 0.3 to 300
//     and B = 0 and 1, within 10 % (largest difference found 4.4 %).
//   - brinkman-layer: a uniform linear-drag (Darcy–Brinkman) layer under
//     clear fluid, open (free-slip top) and closed (no-slip lid) channel:
//     the steady two-layer profile, cosh/sinh in the layer and a parabola
//     above, matched in U and ν dU/dz (Neale & Nader 1974, Can. J. Chem.
//     Eng. 52:475; form from memory, solution derived in brinkman.go),
//     within 1e-3 of the peak velocity on the checked grid and converging
//     at order 2 ± 0.2 with the layer top on a face.
//   - drag-balance: an emergent canopy filling the depth under a fixed
//     gradient: the interior velocity within 1 % of √(2Π(1 − φ)/(C_D a))
//     (Nepf 2012, Annu. Rev. Fluid Mech. 44:123), reached from rest with
//     fixed steps of 20 drag times 1/(C_D a U) (the point-implicit drag);
//     the laminar bed layer against its closed form
//     U∞[3 tanh²(z/L + ζ0) − 2] (derived), converging at order 2.
//   - ts-wave: plane Poiseuille flow at Re = 10⁴, α = 1 seeded with the
//     least-stable Orr–Sommerfeld mode of package stability; the disturbance
//     energy grows at 2αc_i = 2 × 0.00373967 and travels at
//     c_r = 0.23752649 (Orszag 1971, J. Fluid Mech. 50:689), checked to 2 %
//     and 0.1 %, and halving the step moves the rate by less than 0.5 %.
//   - kelvin-helmholtz: the tanh mixing layer at Re = U0δ/ν = 1000 in one
//     most-unstable wavelength (αδ = 0.4446, Michalke 1964, J. Fluid Mech.
//     19:543) between free-slip walls at ±10δ, held steady by a body force,
//     seeded with its Orr–Sommerfeld mode: the energy growth rate within
//     3 % of 2αc_i of package stability for the same walls and Re
//     (α c_i = 0.18802), converging at order 2; the Orr–Sommerfeld rate at
//     Re = 10⁶ within 0.5 % of Michalke's inviscid 0.1897.
//   - spanwise-box: the three-dimensional mode of the solver (Ny > 1): a
//     y-invariant perturbed channel with closure and drag follows the slice
//     to 1e-12 with v = 0; an oblique Fourier mode between free-slip walls
//     decays at ν (k_x² + k_y² + (π/H)²) (derived) within 1e-3 at Nz = 32,
//     converging at order 2; the divergence after a step, the two backends
//     and one or three workers agree to round-off.
//   - oblique-ts-wave, oblique-kelvin-helmholtz: the same flows in a
//     spanwise-periodic box (Ny = 4), seeded with the oblique wave
//     (α, β) = α̃ (0.8, 0.6) of the same α̃ (1 and 0.4446/δ) at Re/0.8, so
//     that by Squire's theorem (Squire 1933, Proc. R. Soc. A 142:621) it
//     has the phase speed of the slice cases' two-dimensional mode: the
//     energy growth rate 2αc_i within 2 % and 3 %, the phase speed within
//     0.1 % of the velocity scale. The seed carries the wall-normal
//     vorticity the mode forces (oblique.go), so the growth is exponential
//     from the start.
//   - canopy-shear-layer: a validation case. LES (Smagorinsky, Cs = 0.2) of
//     a flume over a dense submerged canopy of dowels (C_D a h = 1), with
//     ±40 % bands on three published scalings: the penetration depth
//     δe C_D a = 0.23 (Nepf et al. 2007, Water Resour. Res. 43), the roller
//     spacing Λx = 8.1 Ls (Raupach, Finnigan & Brunet 1996,
//     Boundary-Layer Meteorol. 78:351) and the roller frequency
//     f θ/Ū = 0.032 (Ho & Huerre 1984, Annu. Rev. Fluid Mech. 16:365). See
//     below for what it measures.
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
// Orr–Sommerfeld eigenvalues, the drag balance) get a tolerance that the
// case justifies, and the canopy validation case a ±40 % band on
// laboratory and field scalings.
//
// # Running
//
// The default sizes are short (about a minute on two cores, the
// canopy-shear-layer case being most of it):
//
//	go test ./validation/
//
// The fuller sizes refine every case (ten to fifteen minutes on two
// cores, the canopy-shear-layer case most of it):
//
//	go test ./validation/ -full -timeout 60m
//
// With -keep DIR each case writes DIR/<case>/: CSV tables of the measured
// against the exact profiles or time series, and checks.json with its
// checks. From code, Run(names, Options{Keep: dir}) does the same.
//
// # What the canopy validation case measures
//
// A two-dimensional slice keeps the rollers more coherent than real
// three-dimensional flow, and they merge into larger ones (the inverse
// cascade of 2-D flow) until the depth and the domain stop them. At the
// default size, when the case was set up (FFTW backend, seed 1):
// δe C_D a = 0.25 (+9 % against 0.23), f θ/Ū = 0.030 (−8 % against
// 0.032), but Λx/Ls = Ū/(f Ls) = 40, five times 8.1, so that check fails:
// the rollers are about 1.3–2 m apart (two or three in the 4 m domain,
// about 30–50 Ls, 5–9 vorticity thicknesses), they travel at close to Ū
// (about three times U(h), from the phase speed of the dominant mode), and
// the sharp top of the dowel canopy makes Ls = U(h)/U′(h) small (0.04 m,
// 0.2 h). Even with U(h) as the convection speed the ratio is 12, outside
// the band. Over longer runs the slice keeps drifting: the flow above the
// canopy speeds up and U(h) and the mean in-canopy velocity fall under the
// strong 2-D sweeps. The fuller size (288×96, 480 s after 60 s) gave
// δe C_D a = 0.22, f θ/Ū = 0.027 and Λx/Ls = 66 over its whole averaging
// time, with δe C_D a = 0.24 in its first half and 0.15 in its second; the
// case keeps the metrics of each half of its averaging time in
// summary.csv to show that spread.
//
// # Time accuracy
//
// The time scheme is second order in the step everywhere, along no-slip
// walls with a wall-parallel pressure gradient included (the pressure is
// carried through the implicit vertical diffusion), so the ts-wave and
// kelvin-helmholtz cases step at the advective limit (CFL 0.5) and check
// that doubling the step moves the growth rate by less than a quarter of
// its tolerance (0.02 % and 0.0002 % measured).
package validation
