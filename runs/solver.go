package runs

import (
	"fmt"

	"rollerbed/canopy"
	"rollerbed/solver"
)

// canopyMesh describes the solver's grid to package canopy: a slab's
// mesh when the grid has more than one spanwise point.
func canopyMesh(g *solver.Grid) canopy.Mesh {
	m := canopy.Mesh{Lx: g.Lx, H: g.H, Dx: g.Dx, X: g.X, Zf: g.Zf}
	if g.Ny > 1 {
		m = m.SlabMesh(g.Ny, g.Ly)
	}
	return m
}

// canopyDrag returns the solver's drag for canopy c on mesh m: the linear
// rate where the canopy has elements when c.Linear is set, else
// HalfArea = ½ a/(1 − φ) (canopy.Canopy.DragArea) with the fixed C_D or
// the Reynolds-number law, and the element width as the diameter of the
// element Reynolds number. It panics when c fails Validate(m.Lx, m.H).
func canopyDrag(c *canopy.Canopy, m canopy.Mesh) *solver.Drag {
	if c.Linear > 0 {
		return &solver.Drag{Linear: c.LinearRate(m)}
	}
	d := &solver.Drag{HalfArea: c.DragArea(m), Diameter: c.Elements.Width}
	if c.Law != nil {
		d.Law = c.Law
	} else {
		d.CD = c.CD
	}
	return d
}

// NewSolver builds the solver of a spec (with the canopy drag on its grid)
// and sets its initial state.
func NewSolver(sp *Spec) (*solver.Solver, error) {
	cfg := sp.Solver
	if sp.Canopy != nil {
		g, err := solver.NewGrid(cfg.Nx, cfg.Nz, cfg.Lx, cfg.H, cfg.Cluster)
		if err != nil {
			return nil, err
		}
		if cfg.Ny > 1 {
			g.Ny, g.Ly = cfg.Ny, cfg.Ly
		}
		m := canopyMesh(g)
		cfg.Drag = canopyDrag(sp.Canopy, m)
		var as []float64
		cfg.Scalars = append([]solver.Scalar(nil), cfg.Scalars...)
		for i := range cfg.Scalars {
			if i < len(sp.ElementUptake) && sp.ElementUptake[i] {
				if as == nil {
					as = sp.Canopy.SurfaceArea(m)
				}
				cfg.Scalars[i].SurfaceArea = as
			}
		}
	}
	s, err := solver.New(cfg)
	if err != nil {
		return nil, err
	}
	in := sp.Initial
	var prof []float64
	switch in.Profile {
	case "", "rest":
	case "uniform":
		prof = make([]float64, s.Grid().Nz)
		for k := range prof {
			prof[k] = in.Speed
		}
	case "laminar":
		prof, _, err = s.LaminarProfile()
	case "drag-balanced":
		prof, _, err = s.DragBalancedProfile()
	default:
		err = fmt.Errorf("unknown profile")
	}
	if err != nil {
		s.Close()
		return nil, fmt.Errorf("initial.profile = %q: %w", in.Profile, err)
	}
	if prof != nil {
		s.SetMeanProfile(prof)
	}
	s.Perturb(in.Perturbation, in.At, in.Width, in.Seed)
	return s, nil
}
