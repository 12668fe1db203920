package runs

import (
	"strings"
	"testing"

	"rollerbed/io/runfolder"
	"rollerbed/solver"
)

// TestSpinUpWarning: a bulk velocity that rises during the statistics
// (0.067 → 0.127 m/s, as a user saw) is flagged; a steady one, or too few
// rows, is not; under a held bulk velocity the gradient is judged
// (thresholds: common practice, no source).
func TestSpinUpWarning(t *testing.T) {
	rising := &timeSeries{t: []float64{0, 10, 20, 30, 40, 50, 60, 70, 80}, bulk: []float64{0.01, 0.05, 0.067, 0.07, 0.077, 0.09, 0.1, 0.12, 0.127}, grad: make([]float64, 9)}
	if w := spinUpWarning(rising, 20, solver.FixedGradient); !strings.Contains(w, "bulk velocity changed from") || !strings.Contains(w, "time.spin_up") {
		t.Errorf("rising bulk velocity: %q", w)
	}
	steady := &timeSeries{t: rising.t, bulk: []float64{0.01, 0.05, 0.1, 0.1, 0.101, 0.099, 0.1, 0.1, 0.1}, grad: make([]float64, 9)}
	if w := spinUpWarning(steady, 20, solver.FixedGradient); w != "" {
		t.Errorf("steady bulk velocity: %q", w)
	}
	if w := spinUpWarning(rising, 60, solver.FixedGradient); w != "" {
		t.Errorf("three rows after the spin-up: %q", w)
	}
	held := &timeSeries{t: rising.t, bulk: make([]float64, 9), grad: []float64{9, 9, 4, 4, 3, 3, 2, 2, 1}}
	if w := spinUpWarning(held, 20, solver.FixedBulk); !strings.Contains(w, "pressure gradient changed") {
		t.Errorf("falling gradient under a held bulk velocity: %q", w)
	}
}

// TestBoxWarning: rollers spaced more than half the domain length are
// flagged, from the frequency or else from the correlation.
func TestBoxWarning(t *testing.T) {
	v := func(x float64) *float64 { return &x }
	for _, c := range []struct {
		f    runfolder.FlowSummary
		want string
	}{
		{runfolder.FlowSummary{RollerSpacing: v(1.0)}, "from the roller frequency"},
		{runfolder.FlowSummary{RollerSpacingCorrelation: v(0.95)}, "from the correlation"},
		{runfolder.FlowSummary{RollerSpacing: v(0.3), RollerSpacingCorrelation: v(1.1)}, ""},
		{runfolder.FlowSummary{}, ""},
	} {
		w := boxWarning(&c.f, 1.2)
		if (c.want == "") != (w == "") || !strings.Contains(w, c.want) {
			t.Errorf("%+v: %q, want %q", c.f, w, c.want)
		}
	}
}
