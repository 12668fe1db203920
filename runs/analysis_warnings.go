package runs

import (
	"fmt"
	"math"

	"rollerbed/io/runfolder"
	"rollerbed/solver"
)

// Thresholds of the warnings on a run's statistics (common practice, no
// source).
const (
	// spinUpDrift is the largest change, relative to its mean, of the
	// quantity the forcing does not hold between the first and the last
	// third of the statistics period before a run counts as still spinning
	// up.
	spinUpDrift = 0.10
	// spinUpRows is the fewest time-series rows after the spin-up that the
	// drift is judged on.
	spinUpRows = 6
	// boxFraction is the share of the domain length above which the
	// measured roller spacing is set by the box rather than by the flow.
	boxFraction = 0.5
)

// spinUpWarning says when the flow was still spinning up while statistics
// were gathered: the quantity the forcing leaves free (the bulk velocity
// under a fixed pressure gradient, the gradient under a held bulk
// velocity) changed by more than spinUpDrift between the first and the
// last third of the rows after spinUp. It returns "" otherwise.
func spinUpWarning(ts *timeSeries, spinUp float64, forcing solver.ForcingKind) string {
	name, unit, v := "bulk velocity", "m/s", ts.bulk
	if forcing == solver.FixedBulk {
		name, unit, v = "pressure gradient", "m/s²", ts.grad
	}
	k0 := 0
	for k0 < len(ts.t) && ts.t[k0] < spinUp {
		k0++
	}
	n := len(ts.t) - k0
	if n < spinUpRows {
		return ""
	}
	third := n / 3
	mean := func(a []float64) float64 {
		s := 0.0
		for _, x := range a {
			s += x
		}
		return s / float64(len(a))
	}
	first, last, all := mean(v[k0:k0+third]), mean(v[len(v)-third:]), mean(v[k0:])
	if !(math.Abs(all) > 0) || math.Abs(last-first) <= spinUpDrift*math.Abs(all) {
		return ""
	}
	return fmt.Sprintf("the %s changed from %.3g to %.3g %s (%+.0f %%) between the first and the last third of the statistics (t ≥ %.4g s): the flow was still spinning up, so the means mix two states; raise time.spin_up (to about %.4g s, where the last third began) and time.duration",
		name, first, last, unit, 100*(last-first)/math.Abs(all), spinUp, ts.t[len(ts.t)-third])
}

// boxWarning says when the measured roller spacing is close to the domain
// length lx (m): then the box, not the flow, sets the rollers' size, and
// their spacing, frequency and the mixing they bring depend on
// domain.length. It returns "" otherwise.
func boxWarning(f *runfolder.FlowSummary, lx float64) string {
	spacing, how := f.RollerSpacing, "from the roller frequency"
	if spacing == nil {
		spacing, how = f.RollerSpacingCorrelation, "from the correlation of w along the canopy top"
	}
	if spacing == nil || *spacing <= boxFraction*lx {
		return ""
	}
	return fmt.Sprintf("the measured roller spacing (%.3g m, %s) is %.0f %% of the domain length %.3g m: the rollers are as long as the box allows, so their spacing, frequency and the mixing they bring depend on domain.length; run a longer domain (e.g. domain.length = %.3g m, with domain.nx raised to keep Δx) to see whether they keep growing",
		*spacing, how, 100**spacing/lx, lx, 4**spacing)
}
