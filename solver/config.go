package solver

import (
	"fmt"
	"math"

	"rollerbed/solver/transform"
)

// WallKind is the boundary condition for the streamwise velocity at the bed
// or the top. The wall-normal velocity is zero at both in every case.
type WallKind int

const (
	// NoSlip holds u at the wall speed; the wall shear uses a one-sided
	// second-order derivative through the two nearest centres.
	NoSlip WallKind = iota
	// FreeSlip sets the shear stress to zero (∂u/∂z = 0).
	FreeSlip
	// Rough is a rough-wall log-law model: the wall stress is
	// τ/ρ = (κ U₁ / ln(z₁/z0))², U₁ the velocity at the first centre z₁,
	// applied locally in x and implicitly in U₁. Bed only.
	Rough
)

// Karman is the von Kármán constant used by the log law and the mixing-length
// wall damping (0.41; common practice, no source).
const Karman = 0.41

func (k WallKind) String() string {
	switch k {
	case NoSlip:
		return "no-slip"
	case FreeSlip:
		return "free-slip"
	case Rough:
		return "rough"
	}
	return fmt.Sprintf("WallKind(%d)", int(k))
}

// Wall is a boundary of the slice.
type Wall struct {
	Kind WallKind
	// Speed is the tangential wall speed in m/s (NoSlip only).
	Speed float64
	// Amplitude (m/s) and Omega (rad/s) add an oscillation:
	// u_wall(t) = Speed + Amplitude·cos(Omega·t) (NoSlip only).
	Amplitude, Omega float64
	// Z0 is the roughness length in m (Rough only).
	Z0 float64
}

// SpeedAt returns the wall speed in m/s at time t in s.
func (w Wall) SpeedAt(t float64) float64 {
	if w.Kind != NoSlip {
		return 0
	}
	return w.Speed + w.Amplitude*math.Cos(w.Omega*t)
}

// ForcingKind selects how the mean pressure gradient Π is set.
type ForcingKind int

const (
	// FixedGradient drives the flow with a constant Π (m/s²); for an open
	// channel on a slope S, Π = g S.
	FixedGradient ForcingKind = iota
	// FixedBulk adjusts Π every stage so that the depth-mean velocity stays
	// at Forcing.Bulk.
	FixedBulk
)

// Forcing is the mean streamwise pressure gradient, a body force along +x.
// It may vary in time (forcing.go): a steady part (Gradient or Bulk), any
// number of oscillating parts, and a ramp from rest at the start. It acts
// on the streamwise momentum only and does not depend on the grid.
type Forcing struct {
	Kind     ForcingKind
	Gradient float64 // m/s², FixedGradient: the steady part of Π
	Bulk     float64 // m/s, FixedBulk: the steady part of the target
	// Waves are oscillating parts of Π (m/s²), FixedGradient only: the
	// pressure gradient under surface waves.
	Waves []Oscillation
	// Tides are oscillating parts of the bulk-velocity target (m/s),
	// FixedBulk only.
	Tides []Oscillation
	// OneWay holds the bulk target at |Bulk + Σ tides|: a tide that
	// slackens without reversing. The zero value lets it reverse.
	OneWay bool
	// Ramp is the duration in s of a smooth start-up (RampAt) that
	// multiplies the whole forcing; 0 for none.
	Ramp float64
}

// Config is everything the solver needs to build a run.
type Config struct {
	Nx, Nz int     // cells along x and z
	Lx, H  float64 // m, period along x and depth
	// Ny is the number of cells across the span (y, periodic over Ly, m).
	// Ny <= 1 is the x–z slice; a three-dimensional run needs an even
	// Ny >= 4 and Ly > 0.
	Ny      int
	Ly      float64
	Cluster Cluster // vertical clustering; zero value is a uniform grid

	Viscosity float64 // kinematic viscosity ν, m²/s
	Bed, Top  Wall
	Forcing   Forcing

	// CFL is the Courant number target: Δt·max(k_max|u| + |w|/Δz), with
	// k_max the highest retained wavenumber in x. RK3 is stable up to √3.
	CFL float64
	// MaxStep bounds the adaptive step in s; 0 means no bound.
	MaxStep float64

	// BodyForce, when set, adds a streamwise force per unit mass F(z)
	// (m/s², Nz values at the centres) to the mean pressure gradient, for
	// example −ν U″ to hold a base profile U(z) steady in a stability check.
	BodyForce []float64

	// Closure is the subgrid model; the zero value is a direct simulation.
	Closure Closure
	// Drag is the canopy drag; nil for none.
	Drag *Drag
	// Scalars are the passive scalars carried by the flow.
	Scalars []Scalar

	Backend transform.Backend
	// Workers is the number of goroutines sharing a step; 0 or 1 runs on
	// the calling goroutine only.
	Workers int
}

// DefaultCFL is the Courant number used when Config.CFL is zero
// (common practice, no source: half the RK3 limit leaves room for growth
// within a step).
const DefaultCFL = 0.5

func (c *Config) check() error {
	if err := c.checkSpan(); err != nil {
		return err
	}
	np := c.Nx * max(c.Ny, 1) // values in a level
	switch {
	case !(c.Viscosity > 0) || math.IsInf(c.Viscosity, 0):
		return fmt.Errorf("solver: viscosity %g m²/s: need a finite value > 0", c.Viscosity)
	case c.CFL < 0 || c.CFL > 1.7:
		return fmt.Errorf("solver: CFL %g: need 0 < CFL <= 1.7", c.CFL)
	case c.MaxStep < 0:
		return fmt.Errorf("solver: MaxStep %g s: need >= 0", c.MaxStep)
	case c.Top.Kind == Rough:
		return fmt.Errorf("solver: the rough-wall model is for the bed only")
	case c.Bed.Kind == Rough && !(c.Bed.Z0 > 0):
		return fmt.Errorf("solver: bed roughness z0 = %g m: need > 0", c.Bed.Z0)
	case c.Closure.Cs < 0 || c.Closure.Cs > 1:
		return fmt.Errorf("solver: Smagorinsky constant %g: need 0 <= Cs <= 1", c.Closure.Cs)
	case c.Drag != nil && c.Drag.HalfArea != nil && len(c.Drag.HalfArea) != np*c.Nz:
		return fmt.Errorf("solver: drag HalfArea has %d values, need %s = %d", len(c.Drag.HalfArea), c.pointsName(), np*c.Nz)
	case c.Drag != nil && c.Drag.Linear != nil && len(c.Drag.Linear) != np*c.Nz:
		return fmt.Errorf("solver: drag Linear has %d values, need %s = %d", len(c.Drag.Linear), c.pointsName(), np*c.Nz)
	case c.Drag != nil && c.Drag.Law != nil && !(c.Drag.Diameter > 0):
		return fmt.Errorf("solver: a Reynolds-number drag law needs the element diameter > 0")
	case c.BodyForce != nil && len(c.BodyForce) != c.Nz:
		return fmt.Errorf("solver: BodyForce has %d values, need Nz = %d", len(c.BodyForce), c.Nz)
	case c.Workers < 0:
		return fmt.Errorf("solver: workers %d: need >= 0", c.Workers)
	}
	return c.Forcing.check()
}
