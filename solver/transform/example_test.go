//go:build cgo

package transform_test

import (
	"fmt"
	"math"

	"rollerbed/solver/transform"
)

// Example transforms one row holding 2 cos(2π·3 j/N) + 0.5 with the default
// FFTW backend; by the package convention c_3 = 1 and c_0 = 0.5.
func Example() {
	const n, rows, parts = 32, 1, 1
	p, err := transform.New(transform.FFTW, n, rows, parts)
	if err != nil {
		fmt.Println(err)
		return
	}
	defer p.Close()

	x := p.Real()
	for j := range n {
		x[j] = 2*math.Cos(2*math.Pi*3*float64(j)/n) + 0.5
	}
	p.Forward()
	c := p.Spec()
	fmt.Printf("c_0 = %.6f\n", real(c[0]))
	fmt.Printf("c_3 = %.6f, |Im c_3| < 1e-12: %v\n", real(c[3]), math.Abs(imag(c[3])) < 1e-12)

	p.Inverse()
	fmt.Printf("x_0 after the round trip = %.6f\n", x[0])
	// Output:
	// c_0 = 0.500000
	// c_3 = 1.000000, |Im c_3| < 1e-12: true
	// x_0 after the round trip = 2.500000
}
