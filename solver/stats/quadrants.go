package stats

// Quadrants holds the shares of the Reynolds stress ⟨u′w′⟩ at a point by
// quadrant of (u′, w′): Q1 outward interaction (+,+), Q2 ejection (−,+), Q3
// inward interaction (−,−), Q4 sweep (+,−). Shares are of the total
// ⟨u′w′⟩ and add up to 1.
type Quadrants struct {
	Q1, Q2, Q3, Q4 float64
}

// SweepEjectionRatio returns S4/S2, the stress carried by sweeps over that
// carried by ejections.
func (q Quadrants) SweepEjectionRatio() float64 { return q.Q4 / q.Q2 }

// QuadrantShares splits the stress of paired fluctuation samples (means
// removed here) by quadrant (Lu & Willmarth 1973, J. Fluid Mech. 60:481,
// quadrant analysis without a hole).
func QuadrantShares(u, w []float64) Quadrants {
	n := len(u)
	if n == 0 || len(w) != n {
		return Quadrants{}
	}
	var mu, mw float64
	for i := range u {
		mu += u[i]
		mw += w[i]
	}
	mu /= float64(n)
	mw /= float64(n)
	var s [4]float64
	total := 0.0
	for i := range u {
		a, b := u[i]-mu, w[i]-mw
		p := a * b
		total += p
		switch {
		case a >= 0 && b >= 0:
			s[0] += p
		case a < 0 && b >= 0:
			s[1] += p
		case a < 0 && b < 0:
			s[2] += p
		default:
			s[3] += p
		}
	}
	if total == 0 {
		return Quadrants{}
	}
	return Quadrants{s[0] / total, s[1] / total, s[2] / total, s[3] / total}
}
