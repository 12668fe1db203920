package runs

import (
	"fmt"

	"rollerbed/io/casefile"
	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// FromCase turns a parsed and validated case into a Spec.
func FromCase(c *casefile.Case) (*Spec, error) {
	b, err := transform.ParseBackend(c.Numerics.Transform)
	if err != nil {
		return nil, fmt.Errorf("numerics.transform = %q: %v", c.Numerics.Transform, err)
	}
	workers := c.Numerics.WorkerCount()
	cfg := solver.Config{
		Nx: c.Domain.Nx, Nz: c.Domain.Nz, Lx: c.Domain.Length, H: c.Domain.Depth,
		Cluster: solver.Cluster{
			Bed: c.Domain.Cluster.Bed, BedWidth: c.Domain.Cluster.BedWidth,
			At: c.Domain.Cluster.At, AtFactor: c.Domain.Cluster.AtFactor, AtWidth: c.Domain.Cluster.AtWidth,
		},
		Viscosity: c.Fluid.Viscosity,
		CFL:       c.Time.CFL,
		MaxStep:   c.Time.MaxStep,
		Backend:   b,
		Workers:   workers,
	}
	switch c.Bed.Condition {
	case casefile.NoSlip:
		cfg.Bed = solver.Wall{Kind: solver.NoSlip, Speed: c.Bed.Speed}
	case casefile.FreeSlip:
		cfg.Bed = solver.Wall{Kind: solver.FreeSlip}
	case casefile.Rough:
		cfg.Bed = solver.Wall{Kind: solver.Rough, Z0: c.Bed.Roughness}
	default:
		return nil, fmt.Errorf("bed.condition = %q: unknown condition", c.Bed.Condition)
	}
	switch c.Top.Condition {
	case casefile.NoSlip:
		cfg.Top = solver.Wall{Kind: solver.NoSlip, Speed: c.Top.Speed}
	case casefile.FreeSlip:
		cfg.Top = solver.Wall{Kind: solver.FreeSlip}
	default:
		return nil, fmt.Errorf("top.condition = %q: unknown condition", c.Top.Condition)
	}
	switch c.Forcing.Kind {
	case casefile.ForcingBulkVelocity:
		cfg.Forcing = solver.Forcing{Kind: solver.FixedBulk, Bulk: c.Forcing.BulkVelocity}
	default:
		cfg.Forcing = solver.Forcing{Kind: solver.FixedGradient, Gradient: c.Forcing.PressureGradient()}
	}
	sp := &Spec{
		Title:    c.Title,
		CaseText: c.Text,
		Solver:   cfg,
		Initial: Initial{
			Profile: c.Initial.Profile, Speed: c.Initial.Speed,
			Perturbation: c.Initial.Perturbation,
			At:           c.Initial.PerturbationAt, Width: c.Initial.PerturbationWidth,
			Seed: uint64(c.Initial.Seed),
		},
		Duration:     c.Time.Duration,
		FixedStep:    c.Time.FixedStep,
		ProfileEvery: c.Output.ProfileEvery,
	}
	return sp, nil
}
