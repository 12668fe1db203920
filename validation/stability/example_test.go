package stability_test

import (
	"fmt"
	"log"
	"math"

	"rollerbed/validation/stability"
)

// The least-stable mode of plane Poiseuille flow at α = 1, Re = 10⁴, and the
// disturbance velocity it seeds.
func ExampleLeastStable() {
	m, err := stability.LeastStable(stability.Poiseuille(), 1, 1e4, 96)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("c = %.8f %+.8fi\n", real(m.C), imag(m.C))
	fmt.Printf("growth rate α c_i = %.8f\n", m.GrowthRate())
	u, _ := m.Velocity(0, m.YMax, 0)
	fmt.Printf("u'(0, YMax, 0) = %.3f\n", u)
	// Output:
	// c = 0.23752649 +0.00373967i
	// growth rate α c_i = 0.00373967
	// u'(0, YMax, 0) = 1.000
}

// The inviscid growth rate of the tanh mixing layer at its most unstable
// wavenumber.
func ExampleSolve() {
	s, err := stability.Solve(stability.Tanh(20), 0.4446, math.Inf(1), 96)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("α c_i = %.4f\n", s.Alpha*imag(s.C[0]))
	// Output:
	// α c_i = 0.1897
}
