package runs

import (
	"math"
	"time"

	"rollerbed/solver"
)

// Estimate holds the derived numbers `rollerbed check` prints.
type Estimate struct {
	Dx, DzMin, DzMax float64 // m
	SpacingRatio     float64 // largest ratio of neighbouring cell heights
	KeptModes        int     // Fourier modes kept by the 2/3 rule
	VelocityScale    float64 // m/s, the velocity the step is sized for
	Reynolds         float64 // VelocityScale·H/ν
	Step             float64 // s, step the Courant limit allows at VelocityScale
	Steps            int     // Duration / Step
	StepCost         time.Duration
	WallTime         time.Duration
	MemoryBytes      int64
	OutputBytes      int64
}

// EstimateRun derives grid and cost numbers for a spec. It builds the solver
// and times a few steps on this machine, so it takes a moment for large
// grids.
func EstimateRun(sp *Spec) (*Estimate, error) {
	s, err := NewSolver(sp)
	if err != nil {
		return nil, err
	}
	defer s.Close()
	g := s.Grid()
	c := s.Config()
	e := &Estimate{Dx: g.Dx, DzMin: g.MinDz(), SpacingRatio: g.MaxSpacingRatio(), KeptModes: g.KeptModes()}
	for _, d := range g.Dz {
		e.DzMax = math.Max(e.DzMax, d)
	}
	e.VelocityScale = velocityScale(s, sp)
	e.Reynolds = e.VelocityScale * c.H / c.Viscosity

	kmax := g.Wavenumber(g.KeptModes())
	dt := math.Inf(1)
	if e.VelocityScale > 0 {
		dt = c.CFL / (kmax * e.VelocityScale)
	}
	dt = math.Min(dt, 1/(c.Viscosity*kmax*kmax))
	if c.MaxStep > 0 {
		dt = math.Min(dt, c.MaxStep)
	}
	if sp.FixedStep > 0 {
		dt = sp.FixedStep
	}
	e.Step = dt
	e.Steps = int(math.Ceil(sp.Duration / dt))

	// Time a few steps after a warm-up one.
	const probe = 3
	if err := s.StepBy(dt); err == nil {
		t0 := time.Now()
		for range probe {
			if s.StepBy(dt) != nil {
				break
			}
		}
		e.StepCost = time.Since(t0) / probe
	}
	e.WallTime = time.Duration(e.Steps) * e.StepCost

	cells := int64(g.Nx) * int64(g.Nz)
	// Three transform plans of 2Nz+1 rows (real + complex), twelve work
	// fields and the projection factors.
	e.MemoryBytes = 3*(2*cells)*(8+16/2) + 12*cells*8 + cells*16
	out := sp.Output
	rows := int64(100)
	if out.ProfileEvery > 0 {
		rows = int64(math.Ceil(sp.Duration/out.ProfileEvery)) + 1
	}
	// Snapshots: each field Nz·Nx float64 (deflate typically saves a
	// quarter to a half of it; the estimate assumes none). Checkpoints: two
	// kept, each about eight fields; probes: two series per probe per step.
	snaps := int64(2)
	if out.SnapshotEvery > 0 {
		snaps = int64(math.Ceil(sp.Duration/out.SnapshotEvery)) + 1
	}
	nf := int64(max(len(out.Fields), 1))
	e.OutputBytes = snaps*nf*cells*8 + 2*8*cells*8 + rows*5*24 +
		int64(e.Steps)*int64(2*max(out.Probes, 1)+1)*24 + int64(len(sp.CaseText)) + 64<<10
	return e, nil
}

// velocityScale is the velocity the flow is expected to reach: the larger of
// the initial state's largest speed and the forcing's scale. For a fixed
// gradient Π the forcing scale is the smaller of the laminar centre-line
// speed and 16 u*, u* = √(Π H) (a log-law estimate with ln(H/z0)/κ ≈ 16;
// common practice, no source).
func velocityScale(s *solver.Solver, sp *Spec) float64 {
	v := 0.0
	for _, u := range s.U() {
		v = math.Max(v, math.Abs(u))
	}
	c := s.Config()
	switch c.Forcing.Kind {
	case solver.FixedBulk:
		v = math.Max(v, 1.2*math.Abs(c.Forcing.Bulk))
	case solver.FixedGradient:
		f := 16 * math.Sqrt(math.Abs(c.Forcing.Gradient)*c.H)
		if prof, _, err := s.LaminarProfile(); err == nil {
			lam := 0.0
			for _, u := range prof {
				lam = math.Max(lam, math.Abs(u))
			}
			f = math.Min(f, lam)
		}
		v = math.Max(v, f)
	}
	for _, w := range []solver.Wall{c.Bed, c.Top} {
		v = math.Max(v, math.Abs(w.Speed)+math.Abs(w.Amplitude))
	}
	return v
}
