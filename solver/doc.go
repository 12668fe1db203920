// Package solver integrates the incompressible Navier–Stokes equations in a
// vertical x–z slice: x periodic (streamwise), z from the bed (z = 0) to the
// top of the domain (z = H), with the drag of a porous canopy and passive
// scalars that the canopy elements and the bed take up. With Config.Ny > 1
// it runs a box instead, periodic across the span y as well (width
// Config.Ly), with the same numerics in x and y (span.go); the slice is the
// default and the case Ny = 1.
//
// All quantities are SI: lengths in m, velocities in m/s, the kinematic
// pressure p in m²/s² (pressure divided by density), the forcing Π in m/s².
//
// # Equations
//
// Constant density, velocity u = (u, w) (u = (u, v, w) in a box), strain
// rate S, and for each
// passive scalar c ([Scalar], in any concentration unit):
//
//	∂u/∂t + ∇·(u u) = −∇p + Π e_x + ∇·(2 ν_e S) − r u,    ∇·u = 0
//	∂c/∂t + ∇·(u c) = ∇·((D + ν_t/Sc_t) ∇c) − a_s k_e (c − c_w) + S
//
// where
//
//   - Π is the mean streamwise pressure gradient ([Forcing]): fixed (g S
//     for an open channel on a slope S), or adjusted every stage to hold a
//     bulk velocity. Either may vary in time: oscillating parts of Π
//     (waves) or of the bulk target (tides), and a smooth ramp from rest
//     at the start (forcing.go).
//   - ν_e = ν + ν_t with the Smagorinsky closure ([Closure]):
//     ν_t = ℓ² |S|, |S| = (2 S_ij S_ij)^½, Δ = (Δx Δz)^½ ((Δx Δy Δz)^⅓ in
//     a box) and the wall
//     damping 1/ℓ² = 1/(C_s Δ)² + 1/(κ (z + z0))² (Mason & Thomson 1992,
//     J. Fluid Mech. 242:51), z the distance to the nearest no-slip or
//     rough wall.
//   - r is the local canopy drag rate ([Drag]), acting on every component,
//     with |u| the speed of all of them:
//     r = C_D · ½ a/(1 − φ) · |u| for the quadratic drag of elements with
//     frontal area a per unit volume (1/m) and solid fraction φ, C_D fixed
//     or a function of the element Reynolds number |u| d/ν; or a fixed
//     rate where the canopy stands (a Darcy–Brinkman layer). Package canopy
//     makes the arrays.
//   - D is the scalar's diffusivity, Sc_t the turbulent Schmidt number of
//     the subgrid flux, S a uniform source, a_s the element surface area
//     per unit volume (π a for cylinders, 2 a for flat blades) and c_w the
//     concentration at the surface; 1/k_e = 1/k_bl + 1/k_s puts the
//     boundary-layer transfer velocity k_bl = Sh D/d (a Sherwood
//     correlation in the element Reynolds number and Sc = ν/D) in series
//     with the surface's own uptake capacity k_s (m/s).
//   - A mat on the bed ([Transfer]) takes up k_bed (c₁ − c_w), c₁ at the
//     first centre, with 1/k_bed = 1/k_dbl + 1/k_s,bed and k_dbl from the
//     local friction velocity through a wall mass-transfer correlation for
//     high Schmidt numbers (package canopy gives both correlations).
//
// # Numerics
//
//   - x: Fourier pseudo-spectral with real transforms (package transform:
//     FFTW through cgo, or gonum's pure-Go transforms that the tests hold
//     FFTW against), products dealiased by the 2/3 rule: after every stage
//     only the modes |m| < Nx/3 survive. In a box the same holds across the
//     span: two-dimensional transforms over the (x, y) planes of all
//     levels, the 2/3 rule in both directions, the horizontal flux
//     divergence i k_x F̂_x + i k_y F̂_y formed in spectral space.
//   - z: second-order conservative finite differences on a staggered grid.
//     u, p (and scalars) live at cell centres Zc[k], k = 0..Nz−1; w lives at
//     the faces Zf[j], j = 0..Nz, with w = 0 at the bed and the top. The grid
//     may be stretched by a smooth mapping that clusters cells at the bed and
//     around one chosen height (the canopy top), so the scheme stays second
//     order ([Cluster]).
//   - time: the low-storage three-stage IMEX Runge–Kutta scheme of Spalart,
//     Moser & Rogers (1991, J. Comput. Phys. 96:297), explicit for advection
//     and horizontal diffusion, Crank–Nicolson-like implicit for vertical
//     diffusion (one tridiagonal solve per column, tridiagonal.go). The
//     canopy drag and the uptake sinks are point-implicit, so that a dense
//     canopy does not throttle the step. The adaptive step keeps the
//     advective Courant number at Config.CFL and the explicit horizontal
//     diffusion stable ([Solver.NextStep]).
//   - pressure: every stage ends with an exact discrete projection: per
//     Fourier mode one tridiagonal solve in z with Neumann conditions
//     (projection.go), so the discrete divergence after each stage is
//     round-off; in a box one solve per kept wavenumber pair (k_x, k_y),
//     with k_x² + k_y² in the operator (spanprojection.go). The pressure is
//     carried incrementally, which keeps the scheme second order in time
//     along walls.
//   - boundaries: the bed is no-slip (with an optional oscillating speed),
//     free-slip, or a rough wall with a local log-law stress from the
//     roughness length z0; the top is free-slip (an open channel) or a
//     no-slip lid ([WallKind]). Scalars take a fixed value, a fixed flux,
//     no flux, or (at the bed) the mat's uptake ([ScalarBoundaryKind]).
//   - initial state: rest, the discrete laminar profile
//     ([Solver.LaminarProfile]) or a drag-balanced mixing-length profile
//     ([Solver.DragBalancedProfile]), plus seeded divergence-free
//     perturbations in the shear layer ([Solver.Perturb]), of all three
//     components in a box. A rough bed's log-law stress acts along the
//     horizontal velocity in a box, τ/ρ = C |u_h| (u, v).
//
// A run is reproducible bit for bit on one machine: FFTW plans with
// FFTW_ESTIMATE (the same plan in every process), the seed fixes the
// perturbations, and the saved state ([Solver.Save]) holds everything a
// step reads, the x-derivatives included, so a resumed run continues to the
// numbers of an uninterrupted one.
//
// Fields are stored row by row: level k of a centre field is
// f[k*Nx : (k+1)*Nx], level j of a face field is f[j*Nx : (j+1)*Nx], and
// point i of a row sits at x = i·Lx/Nx. In a box a level is a plane of
// Ny·Nx values: point (i, j) of level k is f[(k*Ny + j)*Nx + i], at
// x = i·Lx/Nx, y = j·Ly/Ny; u, v, p and the scalars sit at the centres, w
// at the faces, and per-point canopy arrays hold one plane per level.
//
// # Parallel work
//
// The step loop allocates nothing; work is shared by a crew of persistent
// worker goroutines (crew.go) that split rows, columns or Fourier modes
// between barriers (in a box, the projection splits the kept spanwise rows
// of the spectral planes). The flux phase splits levels by their cost (levels with
// canopy drag cost about twice as much); the implicit vertical solves split
// columns in blocks of 256 that stay in cache while a block is eliminated
// upwards and substituted back down.
//
// The forward elimination of the implicit solves (one kernel shared by u,
// w and the scalars) is written twice: in Go (tridiagonal.go) and, when cgo
// is on, in C (tridiagonal_cgo.go), which gcc vectorises across the columns
// of a block; the C kernel keeps the Go kernel's order of operations and
// does not fuse multiply-adds, and TestEliminationKernelsAgree holds the
// two to 1e-13. With CGO_ENABLED=0 the Go kernel runs.
package solver
