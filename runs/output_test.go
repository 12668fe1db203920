package runs

import (
	"strings"
	"testing"

	"rollerbed/canopy"
)

// TestCanopySummary: C_D a and the predicted penetration depth
// 0.23/(C_D a) (Nepf et al. 2007, through canopy.PredictedPenetrationDepth)
// are written for a uniform block with a fixed C_D only; every other
// canopy gets a note saying why not.
func TestCanopySummary(t *testing.T) {
	block := canopy.Block(0.12, 8)
	cases := []struct {
		name string
		cp   *canopy.Canopy
		cda  float64 // 0: none
		note string
	}{
		{"block, fixed C_D", &canopy.Canopy{Profile: block, CD: 1.2}, 1.2 * 8, ""},
		{"profile", &canopy.Canopy{Profile: canopy.Table([]float64{0.05, 0.12}, []float64{8, 4}), CD: 1.2}, 0, "not a uniform block"},
		{"cylinder law", &canopy.Canopy{Profile: block, Law: canopy.WhiteCylinder}, 0, `"cylinder" has no fixed C_D`},
		{"linear", &canopy.Canopy{Profile: block, Linear: 0.5}, 0, `"linear" has no fixed C_D`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := &run{sp: &Spec{Canopy: c.cp}}
			cs := r.canopySummary()
			if cs.Height != 0.12 {
				t.Errorf("height %g m, want 0.12 m", cs.Height)
			}
			if c.cda == 0 {
				if cs.DragDensity != nil || cs.PredictedPenetrationDepth != nil || !strings.Contains(cs.DragDensityNote, c.note) {
					t.Errorf("got %+v, want no C_D a and a note with %q", cs, c.note)
				}
				return
			}
			if cs.DragDensity == nil || *cs.DragDensity != c.cda || cs.PredictedPenetrationDepth == nil ||
				*cs.PredictedPenetrationDepth != canopy.PredictedPenetrationDepth(c.cda) || cs.DragDensityNote != "" {
				t.Errorf("got %+v, want C_D a = %g 1/m", cs, c.cda)
			}
		})
	}
	if (&run{sp: &Spec{}}).canopySummary() != nil {
		t.Error("a run without a canopy has a canopy summary")
	}
}
