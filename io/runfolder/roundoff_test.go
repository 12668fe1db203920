package runfolder

import (
	"testing"
)

// No ratio is taken to a first value that is round-off next to the scale
// of its quantity, nor for keys that measure round-off; real values keep
// theirs. The values are those of two runs of the project's examples.
func TestRatiosLeaveOutRoundOff(t *testing.T) {
	runs := [2]*Summary{{}, {}}
	for i, v := range []struct{ uptake, supply, inCanopy, above, div, imbalance float64 }{
		{7.37261e-06, 1.45452e-22, 8.5419e-26, 1.23612e-05, 3.17683e-16, 2.12639e-16},
		{7.37258e-06, 1.53346e-22, 7.68237e-26, 1.23614e-05, 2.98571e-16, 2.88669e-17},
	} {
		runs[i].Run.Nx = 32 * (i + 1)
		runs[i].Flow.MaxDivergence = v.div
		runs[i].Scalars = map[string]ScalarSummary{"oxygen": {
			ElementUptake: v.uptake, TotalUptake: v.uptake, TopSupply: v.supply,
			MeanInCanopy: Num(v.inCanopy), MeanAbove: Num(v.above), Imbalance: v.imbalance,
		}}
	}
	dirs := []string{t.TempDir(), t.TempDir()}
	for i, s := range runs {
		if err := s.Write(dirs[i]); err != nil {
			t.Fatal(err)
		}
	}
	c, err := Compare(dirs)
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]*float64{}
	for _, r := range c.Rows {
		got[r.Key] = r.RatioToFirst[1]
	}
	for _, tc := range []struct {
		key   string
		ratio float64 // 0: none
	}{
		{"run.nx", 2},
		{"scalars.oxygen.element_uptake_per_bed_area", 7.37258e-06 / 7.37261e-06},
		{"scalars.oxygen.top_supply_per_bed_area", 0}, // 2e-17 of the uptake
		{"scalars.oxygen.mean_above_canopy", 1.23614e-05 / 1.23612e-05},
		{"scalars.oxygen.mean_in_canopy", 0},            // 7e-21 of the concentration above
		{"scalars.oxygen.bed_uptake_per_bed_area", 0},   // zero
		{"flow.max_divergence", 0},                      // round-off by design
		{"scalars.oxygen.budget_relative_imbalance", 0}, // round-off by design
	} {
		r, ok := got[tc.key]
		switch {
		case !ok:
			t.Errorf("%s: no row", tc.key)
		case tc.ratio == 0 && r != nil:
			t.Errorf("%s: ratio %v, want none", tc.key, *r)
		case tc.ratio != 0 && (r == nil || *r != tc.ratio):
			t.Errorf("%s: ratio %v, want %v", tc.key, r, tc.ratio)
		}
	}
}
