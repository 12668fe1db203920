package canopy

// PredictedPenetrationDepth returns δe = 0.23/(C_D a) (m), how far below
// the canopy top the rollers reach in a dense canopy, for the canopy drag
// density cda = C_D a (1/m) (Nepf, Ghisalberti, White & Murphy 2007,
// "Retention time and dispersion associated with submerged aquatic
// canopies", Water Resour. Res. 43, W04422; Nepf 2012, Annu. Rev. Fluid
// Mech. 44:123; the constant from memory). In a sparse canopy, where this
// exceeds the canopy height h, the rollers reach the bed and δe = h. At
// cda = 1 it returns the dimensionless constant δe C_D a.
func PredictedPenetrationDepth(cda float64) float64 { return 0.23 / cda }

// PredictedRollerSpacing returns Λx = 8.1 Ls (m), the streamwise spacing of
// the canopy-top rollers for the shear length Ls = U(h)/U′(h) (m) (Raupach,
// Finnigan & Brunet 1996, "Coherent eddies and turbulence in vegetation
// canopies: the mixing-layer analogy", Boundary-Layer Meteorol. 78:351;
// from memory). At Ls = 1 it returns the ratio Λx/Ls.
func PredictedRollerSpacing(shearLength float64) float64 { return 8.1 * shearLength }
