package runs

import (
	"testing"

	"rollerbed/io/casefile"
)

// smallCanopyCase is a small canopy run, fast enough for the unit tests: a
// few hundred steps of a perturbed shear layer over a dense block canopy.
const smallCanopyCase = `
title = "test: small canopy"
[domain]
length = 0.4
depth = 0.2
nx = 32
nz = 24
[fluid]
viscosity = 1.0e-5
[bed]
condition = "no-slip"
[top]
condition = "free-slip"
[canopy]
height = 0.08
frontal_area = 15.0
drag_coefficient = 1.0
diameter = 0.004
[[scalar]]
name = "oxygen"
diffusivity = 1.76e-9
initial = 0.25
top = "fixed"
top_value = 0.25
bed = "mat"
bed_capacity = 1.0e-5
uptake = "hilpert"
capacity = 2.0e-5
[forcing]
bulk_velocity = 0.05
[initial]
profile = "drag-balanced"
perturbation = 0.002
perturbation_at = 0.08
perturbation_width = 0.03
seed = 3
[time]
duration = 4.0
spin_up = 1.0
[output]
profile_every = 0.5
snapshot_every = 1.0
checkpoint_every = 1.0
probes = 4
[numerics]
workers = 1
`

func parseSpec(t *testing.T, text string) *Spec {
	t.Helper()
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		t.Fatalf("test case does not parse: %v", err)
	}
	sp, err := FromCase(c, "")
	if err != nil {
		t.Fatal(err)
	}
	return sp
}
