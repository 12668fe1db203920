package canopy

import "testing"

func TestClassifyRegime(t *testing.T) {
	// Thresholds: Nepf 2012, Annu. Rev. Fluid Mech. 44:123 (from memory):
	// sparse C_D a h < 0.1, transitional 0.1–0.23, dense > 0.23.
	for _, tc := range []struct {
		cdah float64
		want Regime
	}{
		{0, Sparse}, {0.05, Sparse}, {0.0999, Sparse},
		{0.1, Transitional}, {0.17, Transitional}, {0.23, Transitional},
		{0.2301, Dense}, {1, Dense}, {40, Dense},
	} {
		if got := ClassifyRegime(tc.cdah); got != tc.want {
			t.Errorf("C_D a h = %g: %v, want %v", tc.cdah, got, tc.want)
		}
	}
	for r, want := range map[Regime]string{Sparse: "sparse", Transitional: "transitional", Dense: "dense", Regime(9): "Regime(9)"} {
		if r.String() != want {
			t.Errorf("%d prints %q, want %q", int(r), r.String(), want)
		}
	}
}

func TestProfileRegime(t *testing.T) {
	// C_D a h for a block is C_D a0 h (derived); Nepf 2012 thresholds (from memory).
	for _, tc := range []struct {
		p    Profile
		cd   float64
		want Regime
	}{
		{Block(0.1, 0.5), 1, Sparse},       // 0.05
		{Block(0.1, 1), 1, Transitional},   // 0.1
		{Block(0.2, 1), 1.1, Transitional}, // 0.22
		{Block(0.2, 10), 1, Dense},         // 2
	} {
		c := &Canopy{Profile: tc.p}
		if got := c.Regime(tc.cd); got != tc.want {
			t.Errorf("h = %g, a = %g, C_D = %g: %v, want %v", tc.p.Z[0], tc.p.A[0], tc.cd, got, tc.want)
		}
	}
}
