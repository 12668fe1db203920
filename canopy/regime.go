package canopy

import "fmt"

// Regime is the flow regime of a submerged canopy, set by the
// dimensionless canopy drag C_D a h (Nepf 2012, Annu. Rev. Fluid Mech.
// 44:123; the thresholds from memory).
type Regime int

const (
	// Sparse: C_D a h < 0.1; the drag is too small to make an inflection
	// point, and the velocity profile stays boundary-layer-like.
	Sparse Regime = iota
	// Transitional: 0.1 <= C_D a h <= 0.23; a shear layer and rollers form
	// at the top and reach the bed.
	Transitional
	// Dense: C_D a h > 0.23; the rollers penetrate only part way, about
	// 0.23/(C_D a) below the top, and the lower canopy is shielded.
	Dense
)

// Thresholds on C_D a h between the regimes (dimensionless; Nepf 2012,
// from memory).
const (
	SparseLimit = 0.1
	DenseLimit  = 0.23
)

// String returns "sparse", "transitional" or "dense".
func (r Regime) String() string {
	switch r {
	case Sparse:
		return "sparse"
	case Transitional:
		return "transitional"
	case Dense:
		return "dense"
	}
	return fmt.Sprintf("Regime(%d)", int(r))
}

// ClassifyRegime returns the regime of a canopy with dimensionless drag
// cdah = C_D a h: sparse below 0.1, dense above 0.23, transitional between
// (both ends included).
func ClassifyRegime(cdah float64) Regime {
	switch {
	case cdah > DenseLimit:
		return Dense
	case cdah >= SparseLimit:
		return Transitional
	}
	return Sparse
}

// Regime returns the regime of the profile for drag coefficient cd, with
// C_D a h taken as cd·FrontalAreaIndex, which is C_D ā h for the mean
// density ā (exact for a block; for other profiles the mean density
// stands in for a, our choice, no source).
func (p Profile) Regime(cd float64) Regime {
	return ClassifyRegime(cd * p.FrontalAreaIndex())
}
