package casefile_test

import (
	"fmt"

	"rollerbed/io/casefile"
)

func ExampleParse() {
	text := `
title = "Flume at 10 °C"

[domain]
length = 1.0   # m
depth = 0.25   # m
nx = 128
nz = 48

[fluid]
preset = "freshwater-10C"

[forcing]
slope = 1.0e-4

[time]
duration = 30.0   # s
`
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s: %g m x %g m on %d x %d cells\n", c.Title, c.Domain.Length, c.Domain.Depth, c.Domain.Nx, c.Domain.Nz)
	fmt.Printf("viscosity %g m²/s, Π = %.4g m/s²\n", c.Fluid.Viscosity, c.Forcing.PressureGradient())
	fmt.Printf("bed %s, top %s, start from %s, profiles every %g s\n", c.Bed.Condition, c.Top.Condition, c.Initial.Profile, c.Output.ProfileEvery)
	// Output:
	// Flume at 10 °C: 1 m x 0.25 m on 128 x 48 cells
	// viscosity 1.3063e-06 m²/s, Π = 0.0009807 m/s²
	// bed no-slip, top free-slip, start from rest, profiles every 0.3 s
}

func ExampleParse_problems() {
	text := `
[domain]
length = 1.0
depth = 0.25
nx = 128
nzz = 48

[fluid]
viscosity = 1.0e-6

[forcing]
gradient = -1.0e-5

[time]
duration = 30.0
`
	_, err := casefile.Parse([]byte(text))
	fmt.Println(err)
	// Output:
	// case file line 2: domain.nz: missing; required: the number of cells along z, 8 to 8192; add e.g. nz = 64 under [domain]
	// case file line 6: domain.nzz = 48: unknown key in [domain]; did you mean domain.nz? (known here: length, depth, nx, nz, [cluster])
	// case file line 12: forcing.gradient = -1.0e-5: must be a finite number >= 0 (kinematic pressure gradient Π along +x, m/s²); 0 lets the flow decay; e.g. gradient = 1.0e-5
}
