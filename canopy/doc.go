// Package canopy describes the porous canopy layer of a rollerbed run: where
// the elements are (the frontal-area density a(x, z)), what they are
// (cylinders or flat blades, their width and solid volume fraction), and how
// they drag on the flow (a fixed drag coefficient or a drag-versus-Reynolds
// number law). It turns that description into the arrays the solver reads.
//
// All quantities are SI: heights and widths in m, a in 1/m (frontal area per
// unit volume, m²/m³), the frontal area index ∫a dz dimensionless, Reynolds
// numbers and drag coefficients dimensionless.
//
// # Geometry
//
// The density is separable: a(x, z) = C(x) · a(z). The vertical profile a(z)
// ([Profile]) is a uniform block ([Block]) or a piecewise-linear table of
// (z, a) points ([Table], [ReadProfile], [LoadProfile]), optionally with a
// smoothed top edge. The horizontal coverage C(x) is 1 everywhere, or the
// indicator of one or more streamwise patches [x0, x1) on the periodic
// domain ([Patch]), optionally with smoothed edges.
//
// # Elements and drag
//
// [Elements] gives the shape (cylinders of diameter d or blades of width b),
// from which follow the surface area per unit volume a_s = π a or 2 a and,
// for cylinders, the solid volume fraction φ = (π/4) a d. The canopy drag
// per unit fluid mass is −½ C_D a/(1 − φ) |u| u; C_D is fixed or given by a
// [DragLaw] such as [WhiteCylinder]. A linear drag −r u wherever a > 0
// ([Canopy].Linear, a Darcy–Brinkman layer) uses the canopy only to mark
// where the drag acts.
//
// # On the grid
//
// The grid methods take a [Mesh]: the domain size, the x cell centres and
// spacing and the z faces, nothing more, so the package does not depend on
// the solver (package runs describes the solver's grid as a Mesh and
// builds the solver's drag from these arrays). [Canopy.OnGrid] fills
// a(x, z) at the cell centres, averaged over each cell in z and in x, so
// the total frontal area on the mesh equals the exact one to round-off
// whatever the mesh. [Canopy.DragArea] gives ½ a/(1 − φ) for the quadratic
// drag, [Canopy.LinearRate] the rate of the linear one,
// [Canopy.SurfaceArea] the a_s field for scalar uptake.
//
// # Flexible blades
//
// A canopy of flat blades may carry [Flexible] settings (modulus, thickness,
// density: a small value that a group of elements can carry as well). The
// blades then bend with the flow, quasi-statically, through the
// reconfiguration law of Luhar & Nepf (2011): from the Cauchy number Ca
// and the buoyancy number B follow the effective length l_e/l
// ([EffectiveLength]) and the bent height h_d/l ([BentHeight]).
// [Bending] rewrites the solver's drag array in place, column by column,
// from the local speed: the rigid profile squeezed into the bent height,
// with the frontal area of the effective length. Stiff blades give the
// rigid arrays exactly.
//
// # Canopy-flow metrics and published scalings
//
// [MeasureShearLayer] takes the shear-layer metrics of a mean velocity
// profile (U at the top, the shear length, the momentum thickness) and
// [PenetrationDepth] the measured penetration of the stress into the
// canopy. [PredictedPenetrationDepth] (δe = 0.23/(C_D a), Nepf et al.
// 2007) and [PredictedRollerSpacing] (Λx = 8.1 Ls, Raupach, Finnigan &
// Brunet 1996) are the published scalings they are compared with; every
// other package takes the constants from these two. Generic time-series
// tools (spectra, quadrant shares, two-point correlation) live in package
// solver/stats.
//
// Call [Canopy.Validate] (with the domain length and depth) before any of the
// grid methods: user mistakes come back from it as errors that name the
// quantity, the value and the fix; the grid methods panic on a canopy that
// fails it, which is a programming error.
package canopy
