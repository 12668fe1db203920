package runs

import (
	"slices"
	"testing"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
	"rollerbed/solver"
)

// TestCanopyDrag: the solver's drag holds the canopy's own arrays for each
// drag law, and the solver accepts it (derived: the drag laws of package
// canopy's doc).
func TestCanopyDrag(t *testing.T) {
	g, err := solver.NewGrid(16, 24, 1.2, 0.5, solver.Cluster{At: 0.2, AtFactor: 2, AtWidth: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	m := canopyMesh(g)
	el := canopy.Elements{Shape: canopy.Cylinder, Width: 0.01}
	for _, tc := range []struct {
		name string
		c    canopy.Canopy
	}{
		{"fixed", canopy.Canopy{Profile: canopy.Block(0.2, 30), Elements: el, CD: 1.1}},
		{"law", canopy.Canopy{Profile: canopy.Block(0.2, 30), Elements: el, Law: canopy.WhiteCylinder}},
		{"linear", canopy.Canopy{Profile: canopy.Block(0.2, 30), Patches: []canopy.Patch{{X0: 0.3, X1: 0.8}}, Elements: el, Linear: 4}},
	} {
		if err := tc.c.Validate(g.Lx, g.H); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		d := canopyDrag(&tc.c, m)
		var want solver.Drag
		switch tc.name {
		case "fixed":
			want = solver.Drag{HalfArea: tc.c.DragArea(m), CD: 1.1, Diameter: 0.01}
		case "law":
			want = solver.Drag{HalfArea: tc.c.DragArea(m), Diameter: 0.01}
		case "linear":
			want = solver.Drag{Linear: tc.c.LinearRate(m)}
		}
		if d.CD != want.CD || d.Diameter != want.Diameter || (d.Law == nil) != (tc.c.Law == nil) ||
			!slices.Equal(d.HalfArea, want.HalfArea) || !slices.Equal(d.Linear, want.Linear) {
			t.Errorf("%s: drag %+v, want %+v", tc.name, d, want)
		}
		if d.Law != nil && d.Law(500) != canopy.WhiteCylinder(500) {
			t.Errorf("%s: the drag law is not the canopy's", tc.name)
		}
		s, err := solver.New(solver.Config{Nx: g.Nx, Nz: g.Nz, Lx: g.Lx, H: g.H, Cluster: solver.Cluster{At: 0.2, AtFactor: 2, AtWidth: 0.05},
			Viscosity: 1e-6, CFL: 0.5, Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.FreeSlip}, Drag: d})
		if err != nil {
			t.Fatalf("%s: the solver refuses the drag: %v", tc.name, err)
		}
		s.Close()
	}
}

// TestFromCaseLinearDrag: drag_law = "linear" gives a canopy with the
// linear rate and no quadratic drag (common practice, no source).
func TestFromCaseLinearDrag(t *testing.T) {
	c, err := casefile.Parse(Demo())
	if err != nil {
		t.Fatal(err)
	}
	if c.Canopy == nil {
		t.Fatal("the demo has no canopy")
	}
	c.Canopy.DragLaw, c.Canopy.DragCoefficient, c.Canopy.LinearRate = casefile.DragLinear, 0, 2.5
	sp, err := FromCase(c, "")
	if err != nil {
		t.Fatal(err)
	}
	if cp := sp.Canopy; cp.Linear != 2.5 || cp.CD != 0 || cp.Law != nil {
		t.Errorf("canopy drag: Linear %g, CD %g, law set %t; want the linear rate alone", cp.Linear, cp.CD, cp.Law != nil)
	}
}
