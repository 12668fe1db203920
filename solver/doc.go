// Package solver integrates the incompressible Navier–Stokes equations in a
// vertical x–z slice: x periodic (streamwise), z from the bed (z = 0) to the
// top of the domain (z = H).
//
// Discretisation (see DESIGN.md, "Numerics"):
//
//   - x: Fourier pseudo-spectral with real transforms (package transform),
//     products dealiased by the 2/3 rule: after every stage only the modes
//     |m| < Nx/3 survive.
//   - z: second-order conservative finite differences on a staggered grid.
//     u, p (and scalars) live at cell centres Zc[k], k = 0..Nz−1; w lives at
//     the faces Zf[j], j = 0..Nz, with w = 0 at the bed and the top. The grid
//     may be stretched by a smooth mapping that clusters cells at the bed and
//     around one chosen height.
//   - time: the low-storage three-stage IMEX Runge–Kutta scheme of Spalart,
//     Moser & Rogers (1991, J. Comput. Phys. 96:297), explicit for advection
//     and horizontal diffusion, Crank–Nicolson-like implicit for vertical
//     diffusion. Every stage ends with an exact discrete projection: per
//     Fourier mode one tridiagonal solve in z with Neumann conditions, so the
//     discrete divergence after each stage is round-off.
//
// All quantities are SI: lengths in m, velocities in m/s, the kinematic
// pressure p in m²/s² (pressure divided by density), the forcing Π in m/s².
//
// Fields are stored row by row: level k of a centre field is
// f[k*Nx : (k+1)*Nx], level j of a face field is f[j*Nx : (j+1)*Nx], and
// point i of a row sits at x = i·Lx/Nx.
//
// The step loop allocates nothing; work is shared by persistent worker
// goroutines that split rows, columns or Fourier modes between barriers.
// The flux phase splits levels by their cost (levels with canopy drag cost
// about twice as much), the implicit tridiagonal solves split columns in blocks of
// 256 that stay in cache while a block is eliminated upwards and
// substituted back down.
//
// The forward elimination of the implicit sweeps (one kernel shared by u,
// w and the scalars) is written twice: in Go (sweep.go) and, when cgo is
// on, in C (sweep_cgo.go), which gcc vectorises across the columns of a
// block; the C kernel keeps the Go kernel's order of operations and does not
// fuse multiply-adds, and TestEliminationKernelsAgree holds the two to 1e-13.
// With CGO_ENABLED=0 the Go kernel runs.
package solver
