package stability

import (
	"fmt"
	"math"
)

// NeutralRe returns the Reynolds number re in [reLo, reHi] at which the
// least-stable mode of profile p at wavenumber alpha is neutral (c_i = 0),
// with the Chebyshev degree n of Solve. The growth rate must change sign
// between reLo and reHi (0 < reLo < reHi < ∞); the root is found by the
// Illinois variant of regula falsi to a relative tolerance of 1e-10 in re.
//
// At α = α_c the neutral Re is the critical Reynolds number, the minimum of
// the neutral curve over α (for Poiseuille flow Re_c ≈ 5772.22 at
// α_c ≈ 1.02056).
func NeutralRe(p Profile, alpha, reLo, reHi float64, n int) (float64, error) {
	if !(reLo > 0) || !(reHi > reLo) || math.IsInf(reHi, 0) {
		return 0, fmt.Errorf("stability: need 0 < reLo < reHi < Inf, got [%g, %g]", reLo, reHi)
	}
	ci := func(re float64) (float64, error) {
		m, err := LeastStable(p, alpha, re, n)
		if err != nil {
			return 0, err
		}
		return imag(m.C), nil
	}
	a, b := reLo, reHi
	fa, err := ci(a)
	if err != nil {
		return 0, err
	}
	fb, err := ci(b)
	if err != nil {
		return 0, err
	}
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	if (fa > 0) == (fb > 0) {
		return 0, fmt.Errorf("stability: c_i does not change sign between Re = %g (%g) and Re = %g (%g)", a, fa, b, fb)
	}
	side := 0
	for it := 0; it < 100; it++ {
		c := (a*fb - b*fa) / (fb - fa)
		fc, err := ci(c)
		if err != nil {
			return 0, err
		}
		if fc == 0 || math.Abs(b-a) <= 1e-10*c {
			return c, nil
		}
		if (fc > 0) == (fb > 0) {
			b, fb = c, fc
			if side == -1 {
				fa /= 2
			}
			side = -1
		} else {
			a, fa = c, fc
			if side == 1 {
				fb /= 2
			}
			side = 1
		}
		// Stop when the step no longer moves the estimate.
		if next := (a*fb - b*fa) / (fb - fa); math.Abs(next-c) <= 1e-10*c {
			return next, nil
		}
	}
	return 0, fmt.Errorf("stability: neutral Re search in [%g, %g] did not converge", reLo, reHi)
}
