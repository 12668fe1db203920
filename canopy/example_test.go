package canopy_test

import (
	"fmt"
	"log"
	"strings"

	"rollerbed/canopy"
)

// A seagrass-like meadow of flat blades in two patches, put on a mesh of
// 64 × 48 cells.
func ExampleCanopy_OnGrid() {
	c := &canopy.Canopy{
		Profile:  canopy.Block(0.25, 8), // h = 0.25 m, a = 8 1/m
		Patches:  []canopy.Patch{{X0: 0.5, X1: 1.5}, {X0: 3.5, X1: 0.5}},
		Elements: canopy.Elements{Shape: canopy.Blade, Width: 0.008},
		CD:       1,
	}
	m := canopy.UniformMesh(64, 48, 4, 1)
	if err := c.Validate(m.Lx, m.H); err != nil {
		log.Fatal(err)
	}
	a := c.OnGrid(m)
	total := 0.0
	for k := range len(m.Zf) - 1 {
		for i := range m.X {
			total += a[k*len(m.X)+i] * m.Dx * (m.Zf[k+1] - m.Zf[k])
		}
	}
	fmt.Printf("frontal area index %.3g in a patch, %.3g m² of frontal area per m of span\n", c.FrontalAreaIndex(), total)
	fmt.Printf("covered %.0f%% of the bed; C_D a h = %.2g: %v\n", 100*c.CoveredFraction(m.Lx), c.CD*c.FrontalAreaIndex(), c.Regime(c.CD))
	fmt.Printf("drag length 1/(C_D a) = %.3g m\n", c.DragLength(c.CD))
	// Output:
	// frontal area index 2 in a patch, 4 m² of frontal area per m of span
	// covered 50% of the bed; C_D a h = 2: dense
	// drag length 1/(C_D a) = 0.125 m
}

// Reading a measured profile from a table, then smoothing its top.
func ExampleReadProfile() {
	table := `# stems and blades
z [m], a [1/m]
0.05, 12
0.30, 20
0.40, 4
`
	p, err := canopy.ReadProfile(strings.NewReader(table))
	if err != nil {
		log.Fatal(err)
	}
	p.Edge = 0.02 // m
	if err := p.Validate(1.2); err != nil {
		log.Fatal(err)
	}
	fmt.Printf("h = %g m, ∫a dz = %.3g, a(0) = %g 1/m, a(h) = %g 1/m\n", p.Height(), p.FrontalAreaIndex(), p.At(0), p.At(p.Height()))
	// Output:
	// h = 0.4 m, ∫a dz = 5.8, a(0) = 12 1/m, a(h) = 2 1/m
}

// The drag law the solver evaluates at each cell, and its clamped ends.
func ExampleWhiteCylinder() {
	for _, re := range []float64{0, 1, 100, 1e4, 1e6} {
		fmt.Printf("Re = %-6g C_D = %.3f\n", re, canopy.WhiteCylinder(re))
	}
	// Output:
	// Re = 0      C_D = 11.000
	// Re = 1      C_D = 11.000
	// Re = 100    C_D = 1.464
	// Re = 10000  C_D = 1.022
	// Re = 1e+06  C_D = 1.003
}

// The drag area ½ a/(1 − φ) of dowels, with a Reynolds-number drag law.
func ExampleCanopy_DragArea() {
	c := &canopy.Canopy{
		Profile:  canopy.Block(0.1, 40),
		Elements: canopy.Elements{Shape: canopy.Cylinder, Width: 0.00635},
		Law:      canopy.WhiteCylinder,
	}
	m := canopy.UniformMesh(16, 20, 1, 0.4)
	if err := c.Validate(m.Lx, m.H); err != nil {
		log.Fatal(err)
	}
	d := c.DragArea(m)
	fmt.Printf("φ = %.3f, ½ a/(1 − φ) = %.2f 1/m in the canopy, C_D(Re 500) = %.2f\n",
		c.SolidFraction(), d[0], c.Law(500))
	// Output:
	// φ = 0.199, ½ a/(1 − φ) = 24.98 1/m in the canopy, C_D(Re 500) = 1.16
}
