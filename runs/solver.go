package runs

import (
	"fmt"

	"rollerbed/solver"
)

// NewSolver builds the solver of a spec (with the canopy drag on its grid)
// and sets its initial state.
func NewSolver(sp *Spec) (*solver.Solver, error) {
	cfg := sp.Solver
	if sp.Canopy != nil {
		g, err := solver.NewGrid(cfg.Nx, cfg.Nz, cfg.Lx, cfg.H, cfg.Cluster)
		if err != nil {
			return nil, err
		}
		cfg.Drag = sp.Canopy.Drag(g)
		var as []float64
		cfg.Scalars = append([]solver.Scalar(nil), cfg.Scalars...)
		for i := range cfg.Scalars {
			if i < len(sp.ElementUptake) && sp.ElementUptake[i] {
				if as == nil {
					as = sp.Canopy.SurfaceArea(g)
				}
				cfg.Scalars[i].SurfaceArea = as
			}
		}
		if sp.LinearDrag > 0 {
			a := sp.Canopy.OnGrid(g)
			lin := make([]float64, len(a))
			for i, v := range a {
				if v > 0 {
					lin[i] = sp.LinearDrag
				}
			}
			cfg.Drag = &solver.Drag{Linear: lin}
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
