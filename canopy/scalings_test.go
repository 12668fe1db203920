package canopy

import (
	"math"
	"testing"
)

// TestPublishedScalings: the constants of the penetration depth
// δe C_D a = 0.23 (Nepf et al. 2007, Water Resour. Res. 43, W04422; from
// memory) and of the roller spacing Λx/Ls = 8.1 (Raupach, Finnigan &
// Brunet 1996, Boundary-Layer Meteorol. 78:351; from memory), and the
// dense-canopy limit C_D a h = 0.23 as the canopy whose predicted
// penetration reaches the bed (Nepf 2012, Annu. Rev. Fluid Mech. 44:123;
// from memory).
func TestPublishedScalings(t *testing.T) {
	if got := PredictedPenetrationDepth(1); got != 0.23 {
		t.Errorf("δe C_D a = %g, want 0.23", got)
	}
	if got := PredictedPenetrationDepth(8); math.Abs(got-0.02875) > 1e-15 {
		t.Errorf("δe at C_D a = 8 1/m: %g m, want 0.02875 m", got)
	}
	if got := PredictedRollerSpacing(1); got != 8.1 {
		t.Errorf("Λx/Ls = %g, want 8.1", got)
	}
	if got := PredictedRollerSpacing(0.02); math.Abs(got-0.162) > 1e-15 {
		t.Errorf("Λx at Ls = 0.02 m: %g m, want 0.162 m", got)
	}
	h := 0.5
	if got := PredictedPenetrationDepth(DenseLimit / h); math.Abs(got-h) > 1e-15 {
		t.Errorf("at the dense limit C_D a h = %g the predicted δe is %g m, want h = %g m", DenseLimit, got, h)
	}
}
