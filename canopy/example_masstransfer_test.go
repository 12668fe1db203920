package canopy_test

import (
	"fmt"
	"log"

	"rollerbed/canopy"
)

// Oxygen uptake by a lab dowel canopy and by the bed under it, in fresh
// water at 20 °C. The surface capacities are made up for the demo.
func ExampleNewElementTransfer() {
	const (
		nu   = 1.0034e-6                   // m²/s, fresh water at 20 °C
		diff = canopy.OxygenDiffusivity20C // m²/s
		d    = 0.0064                      // m, dowel diameter
		ks   = 2e-5                        // m/s, surface uptake capacity (demo value)
	)
	e, err := canopy.NewElementTransfer("hilpert", d, nu, diff, 0, 0)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("Sc = %.0f\n", e.Schmidt())
	for _, u := range []float64{0, 0.01, 0.05, 0.2} { // local speed, m/s
		kbl := e.Velocity(u)
		fmt.Printf("|u| = %4.2f m/s: Re = %6.1f (in range %-5v) k_bl = %.2e m/s, k_e = %.2e m/s, %2.0f%% of the resistance in the boundary layer\n",
			u, e.Reynolds(u), e.InRange(u), kbl, canopy.SeriesVelocity(kbl, ks), 100*canopy.BoundaryLayerShare(kbl, ks))
	}

	ustar, sc := 0.004, e.Schmidt() // m/s, bed friction velocity
	kdbl := canopy.BedTransferVelocity(ustar, sc)
	fmt.Printf("bed: k_dbl = %.2e m/s (Shaw–Hanratty in range: %v), with a mat taking up at 1e-5 m/s: k_bed = %.2e m/s\n",
		kdbl, canopy.ShawHanrattyInRange(sc), canopy.SeriesVelocity(kdbl, 1e-5))

	_, err = canopy.NewElementTransfer("levich", d, nu, diff, 0, 0)
	fmt.Println(err)
	// Output:
	// Sc = 570
	// |u| = 0.00 m/s: Re =    0.0 (in range false) k_bl = 1.67e-06 m/s, k_e = 1.54e-06 m/s, 92% of the resistance in the boundary layer
	// |u| = 0.01 m/s: Re =   63.8 (in range true ) k_bl = 1.08e-05 m/s, k_e = 7.01e-06 m/s, 65% of the resistance in the boundary layer
	// |u| = 0.05 m/s: Re =  318.9 (in range true ) k_bl = 2.29e-05 m/s, k_e = 1.07e-05 m/s, 47% of the resistance in the boundary layer
	// |u| = 0.20 m/s: Re = 1275.7 (in range true ) k_bl = 4.36e-05 m/s, k_e = 1.37e-05 m/s, 31% of the resistance in the boundary layer
	// bed: k_dbl = 4.08e-06 m/s (Shaw–Hanratty in range: false), with a mat taking up at 1e-5 m/s: k_bed = 2.90e-06 m/s
	// canopy: element transfer law "levich" unknown: need one of "hilpert", "churchill-bernstein", "plate-laminar", "plate", "power-law"
}
