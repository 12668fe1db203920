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
	// case file line 6: domain.nzz = 48: unknown key in [domain]; did you mean domain.nz? (known here: length, depth, nx, nz, width, ny, [cluster])
	// case file line 12: forcing.gradient = -1.0e-5: must be a finite number >= 0 (kinematic pressure gradient Π along +x, m/s²); 0 lets the flow decay; e.g. gradient = 1.0e-5
}

func ExampleParse_canopy() {
	text := `
[domain]
length = 2.0
depth = 0.5
nx = 256
nz = 64

[fluid]
preset = "seawater-20C"

[canopy]
height = 0.25         # m
frontal_area = 4.0    # 1/m
shape = "blade"

[[canopy.patch]]      # wraps around the end of the slice
start = 1.5
end = 0.5

[forcing]
slope = 1.0e-4

[initial]
profile = "drag-balanced"

[time]
duration = 600.0
spin_up = 120.0
`
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		fmt.Println(err)
		return
	}
	k := c.Canopy
	fmt.Printf("%s canopy %g m tall, a = %g 1/m, C_D = %g (%s law)\n", k.Shape, k.Height, k.FrontalArea, k.DragCoefficient, k.DragLaw)
	fmt.Printf("patch from x = %g m to %g m, %g m long\n", k.Patches[0].Start, k.Patches[0].End, k.Patches[0].Length(c.Domain.Length))
	fmt.Printf("closure %s, C_s = %g; statistics from t = %g s\n", c.Turbulence.Closure, c.Turbulence.Smagorinsky, c.Time.SpinUp)
	// Output:
	// blade canopy 0.25 m tall, a = 4 1/m, C_D = 1 (fixed law)
	// patch from x = 1.5 m to 0.5 m, 1 m long
	// closure smagorinsky, C_s = 0.2; statistics from t = 120 s
}

func ExampleParse_scalars() {
	text := `
[domain]
length = 2.0
depth = 0.5
nx = 256
nz = 64

[fluid]
preset = "seawater-20C"

[bed]
condition = "rough"
roughness = 0.0005

[canopy]
height = 0.25
frontal_area = 4.0
shape = "blade"
diameter = 0.005      # blade width, m

[forcing]
slope = 1.0e-4

[time]
duration = 600.0

[[scalar]]
name = "oxygen"       # mol/m³
diffusivity = 1.76e-9 # m²/s
initial = 0.23
uptake = "plate-laminar"
capacity = 1.0e-5     # m/s
bed = "mat"
bed_capacity = inf    # a perfect sink: the boundary layer alone limits uptake
`
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		fmt.Println(err)
		return
	}
	s := c.Scalars[0]
	fmt.Printf("%s: D = %g m²/s, Sc = %.0f, Sc_t = %g\n", s.Name, s.Diffusivity, s.Schmidt, s.TurbulentSchmidt)
	fmt.Printf("top %s at %g, bed %s with k_s,bed = %g m/s, blades %s with k_s = %g m/s\n", s.Top, s.TopValue, s.Bed, s.BedCapacity, s.Uptake, s.Capacity)
	fmt.Println("snapshot fields:", c.Output.Fields)
	// Output:
	// oxygen: D = 1.76e-09 m²/s, Sc = 597, Sc_t = 1
	// top fixed at 0.23, bed mat with k_s,bed = +Inf m/s, blades plate-laminar with k_s = 1e-05 m/s
	// snapshot fields: [u w p vorticity nu_t oxygen]
}
