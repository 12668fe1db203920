package runs

import (
	"fmt"
	"time"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// FromCase turns a parsed and validated case into a Spec. dir is the folder
// of the case file, against which relative file names in it are resolved
// ("" for the working folder).
func FromCase(c *casefile.Case, dir string) (*Spec, error) {
	b, err := transform.ParseBackend(c.Numerics.Transform)
	if err != nil {
		return nil, fmt.Errorf("numerics.transform = %q: %v", c.Numerics.Transform, err)
	}
	cfg := solver.Config{
		Nx: c.Domain.Nx, Nz: c.Domain.Nz, Lx: c.Domain.Length, H: c.Domain.Depth,
		Ny: c.Domain.Ny, Ly: c.Domain.Width,
		Cluster: solver.Cluster{
			Bed: c.Domain.Cluster.Bed, BedWidth: c.Domain.Cluster.BedWidth,
			At: c.Domain.Cluster.At, AtFactor: c.Domain.Cluster.AtFactor, AtWidth: c.Domain.Cluster.AtWidth,
		},
		Viscosity: c.Fluid.Viscosity,
		CFL:       c.Time.CFL,
		MaxStep:   c.Time.MaxStep,
		Backend:   b,
		Workers:   c.Numerics.WorkerCount(),
	}
	if c.Turbulence.Closure == casefile.ClosureSmagorinsky {
		cfg.Closure = solver.Closure{Cs: c.Turbulence.Smagorinsky}
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
	oscillationsFromCase(&cfg.Forcing, c.Forcing)
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
		Duration:  c.Time.Duration,
		FixedStep: c.Time.FixedStep,
		SpinUp:    c.Time.SpinUp,
		Output: Output{
			ProfileEvery:    c.Output.ProfileEvery,
			SnapshotEvery:   c.Output.SnapshotEvery,
			Fields:          c.Output.Fields,
			Compress:        c.Output.Compression,
			CheckpointEvery: c.Output.CheckpointEvery,
			CheckpointWall:  time.Duration(c.Output.CheckpointWallMinutes * float64(time.Minute)),
			Probes:          c.Output.Probes,
			PhaseBins:       c.Output.PhaseBins,
		},
		FluidDensity: c.Fluid.Density,
	}
	for i, sc := range c.Scalars {
		ss, et, err := scalarFromCase(c, i, sc)
		if err != nil {
			return nil, err
		}
		sp.Solver.Scalars = append(sp.Solver.Scalars, ss)
		sp.ElementUptake = append(sp.ElementUptake, sc.Uptake != "" && sc.Uptake != casefile.UptakeNone)
		sp.Transfer = append(sp.Transfer, et)
	}
	if c.Canopy != nil {
		cp, err := canopyFromCase(c.Canopy, dir)
		if err != nil {
			return nil, err
		}
		if err := cp.ValidateSlab(cfg.Lx, c.Domain.Width, cfg.H); err != nil {
			key := "[canopy]"
			switch {
			case c.Canopy.ProfileFile != "":
				key = fmt.Sprintf("canopy.profile_file = %q", c.Canopy.ProfileFile)
			case len(c.Canopy.Profile) > 0:
				key = "canopy.profile"
			}
			return nil, fmt.Errorf("%s: %w", key, err)
		}
		sp.Canopy = cp
	}
	return sp, nil
}

func canopyFromCase(cc *casefile.Canopy, dir string) (*canopy.Canopy, error) {
	var prof canopy.Profile
	switch {
	case cc.ProfileFile != "":
		p, err := canopy.LoadProfile(casefile.ResolvePath(cc.ProfileFile, dir))
		if err != nil {
			return nil, fmt.Errorf("canopy.profile_file = %q: %w", cc.ProfileFile, err)
		}
		prof = p
	case len(cc.Profile) > 0:
		z := make([]float64, len(cc.Profile))
		a := make([]float64, len(cc.Profile))
		for i, row := range cc.Profile {
			z[i], a[i] = row[0], row[1]
		}
		prof = canopy.Table(z, a)
	default:
		prof = canopy.Block(cc.Height, cc.FrontalArea)
	}
	prof.Edge = cc.EdgeWidth
	shape, err := canopy.ParseShape(cc.Shape)
	if err != nil {
		return nil, fmt.Errorf("canopy.shape = %q: %w", cc.Shape, err)
	}
	cp := &canopy.Canopy{Profile: prof, Elements: canopy.Elements{Shape: shape, Width: cc.Diameter}}
	if cc.Flexible() {
		cp.Flexible = &canopy.Flexible{Modulus: cc.BladeModulus, Thickness: cc.BladeThickness, Density: cc.BladeDensity}
	}
	if cc.SolidFraction > 0 {
		phi := cc.SolidFraction
		cp.Elements.SolidFraction = &phi
	}
	for _, p := range cc.Patches {
		cp.Patches = append(cp.Patches, canopy.Patch{X0: p.Start, X1: p.End, Y0: p.SpanStart, Y1: p.SpanEnd})
		cp.PatchEdge = max(cp.PatchEdge, p.EdgeWidth)
	}
	switch cc.DragLaw {
	case "", casefile.DragFixed:
		cp.CD = cc.DragCoefficient
	case casefile.DragCylinder:
		cp.Law = canopy.WhiteCylinder
	case casefile.DragLinear:
		cp.Linear = cc.LinearRate
	default:
		return nil, fmt.Errorf("canopy.drag_law = %q: unknown law", cc.DragLaw)
	}
	return cp, nil
}

// scalarFromCase maps scalar i of a case onto the solver's scalar and its
// element transfer law.
func scalarFromCase(c *casefile.Case, i int, sc casefile.Scalar) (solver.Scalar, canopy.ElementTransfer, error) {
	key := fmt.Sprintf("scalar[%d]", i)
	nu := c.Fluid.Viscosity
	ss := solver.Scalar{
		Name: sc.Name, Diffusivity: sc.Diffusivity, TurbulentSchmidt: sc.TurbulentSchmidt,
		Initial: sc.Initial, Source: sc.Source, SurfaceValue: sc.SurfaceConcentration,
	}
	switch sc.Top {
	case casefile.ScalarFixed, "":
		ss.Top = solver.ScalarBoundary{Kind: solver.FixedValue, Value: sc.TopValue}
	case casefile.ScalarFlux:
		ss.Top = solver.ScalarBoundary{Kind: solver.FixedFlux, Value: sc.TopValue}
	case casefile.ScalarNoFlux:
	default:
		return ss, canopy.ElementTransfer{}, fmt.Errorf("%s.top = %q: unknown condition", key, sc.Top)
	}
	schmidt := nu / sc.Diffusivity
	switch sc.Bed {
	case casefile.ScalarNoFlux, "":
	case casefile.ScalarMat:
		kplus := canopy.ShawHanratty(schmidt)
		ss.Bed = solver.ScalarBoundary{Kind: solver.Transfer, Capacity: sc.BedCapacity,
			Velocity: func(ustar float64) float64 { return ustar * kplus }}
	case casefile.ScalarFlux:
		ss.Bed = solver.ScalarBoundary{Kind: solver.FixedFlux, Value: -sc.BedValue}
	case casefile.ScalarFixed:
		ss.Bed = solver.ScalarBoundary{Kind: solver.FixedValue, Value: sc.BedValue}
	default:
		return ss, canopy.ElementTransfer{}, fmt.Errorf("%s.bed = %q: unknown condition", key, sc.Bed)
	}
	var et canopy.ElementTransfer
	if sc.Uptake != "" && sc.Uptake != casefile.UptakeNone {
		if c.Canopy == nil {
			return ss, et, fmt.Errorf("%s.uptake = %q needs a [canopy]", key, sc.Uptake)
		}
		var err error
		et, err = canopy.NewElementTransfer(sc.Uptake, c.Canopy.Diameter, nu, sc.Diffusivity, sc.PowerAlpha, sc.PowerExponent)
		if err != nil {
			return ss, et, fmt.Errorf("%s.uptake = %q: %w", key, sc.Uptake, err)
		}
		ss.ElementVelocity = et.Velocity
		ss.Capacity = sc.Capacity
	}
	return ss, et, nil
}
