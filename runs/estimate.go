package runs

import (
	"fmt"
	"math"
	"slices"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/io/diskspace"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// Estimate holds the derived numbers `rollerbed check` prints.
type Estimate struct {
	Dx, DzMin, DzMax float64 // m
	Dy               float64 // m, across the span of a slab; 0 for the slice
	KeptModesY       int     // spanwise Fourier modes kept by the 2/3 rule in a slab
	SpacingRatio     float64 // largest ratio of neighbouring cell heights
	KeptModes        int     // Fourier modes kept by the 2/3 rule
	VelocityScale    float64 // m/s, the velocity the step is sized for
	Reynolds         float64 // VelocityScale·H/ν
	// Step is the fixed step of the case, or the step the Courant limit
	// allows at VelocityScale (s).
	Step float64
	// Courant is the Courant number of Step at VelocityScale, in the
	// definition of time.cfl.
	Courant float64
	Steps   int64 // Duration / Step, rounded up
	// StepCost is the wall time of one step on this machine: measured on
	// the case's own grid when CostMeasured, else measured on a grid with
	// fewer columns and scaled by N log N.
	StepCost     time.Duration
	CostMeasured bool
	WallTime     time.Duration
	MemoryBytes  int64 // peak resident memory of the run
	OutputBytes  int64 // the run folder at the end, uncompressed
}

// Limits of what one run may ask (common practice, no source).
const (
	// MaxSteps is the most steps a run may take: about a month at the
	// 2.5 ms a step of the smallest useful grids take on two cores.
	MaxSteps = 1_000_000_000
	// measureCells is the largest grid (cells) whose step cost EstimateRun
	// measures on the grid itself; larger grids are timed on fewer columns.
	measureCells = 1 << 20
	// longRun is the wall time beyond which a run gets a warning.
	longRun = 7 * 24 * time.Hour
)

// Peak resident memory of a run, as fitted to the high-water mark (VmHWM)
// of one-worker runs of a canopy case at 256×64, 512×128 and 1024×256 cells
// with none and two scalars on the development machine (measured, no
// source): a fixed part for the program, the Go runtime and FFTW, and a
// part per cell and per cell and scalar.
const (
	memoryFixed          = 34 << 20 // bytes
	memoryPerCell        = 261      // bytes
	memoryPerScalarCell  = 81       // bytes
	memoryWorkerFraction = 0.05     // extra per additional worker, of the per-cell part
)

// Peak resident memory of a slab, fitted the same way to the high-water
// mark (maximum resident set of /usr/bin/time) of two-worker runs of the
// roller-breakup example at 64×16×32, 64×32×40, 128×32×48 and 128×64×48
// cells, and at 64×32×40 and 128×32×48 with two scalars, on the
// development machine (measured, no source; the fit is within 3 % of each
// run). The per-cell parts are for one worker, as above: a slab keeps v,
// the y-derivatives, two-dimensional transform buffers and the dispersive
// sums on every point, about 2.7 times a slice's bytes per cell.
const (
	memorySlabFixed         = 40 << 20 // bytes
	memorySlabPerCell       = 695      // bytes
	memorySlabPerScalarCell = 221      // bytes
)

// memoryModel returns the fitted parts of the memory formula for a slice
// or, with ny > 1, a slab.
func memoryModel(ny int) (fixed int64, perCell, perScalarCell float64) {
	if ny > 1 {
		return memorySlabFixed, memorySlabPerCell, memorySlabPerScalarCell
	}
	return memoryFixed, memoryPerCell, memoryPerScalarCell
}

// Cells returns the number of cells of the spec's grid: Nx·Nz in the
// slice, Nx·Ny·Nz in a slab.
func Cells(c solver.Config) float64 {
	return float64(c.Nx) * float64(max(c.Ny, 1)) * float64(c.Nz)
}

// MemoryBytes returns the expected peak resident memory of a run of the
// spec (bytes), from the formulas fitted above; no solver is built.
func MemoryBytes(sp *Spec) int64 {
	c := sp.Solver
	cells := Cells(c)
	fixed, cellBytes, scalarBytes := memoryModel(c.Ny)
	perCell := cellBytes + scalarBytes*float64(len(c.Scalars))
	perCell *= 1 + memoryWorkerFraction*float64(max(c.Workers, 1)-1)
	return fixed + int64(math.Min(cells*perCell, math.MaxInt64/2))
}

// CheckMemory refuses, from the formula alone and before anything is
// allocated, a run whose expected peak memory exceeds 90 % of this
// machine's: a *casefile.Errors naming the grid keys and the fix.
func CheckMemory(sp *Spec) error {
	need := MemoryBytes(sp)
	if total, ok := physicalMemory(); ok && float64(need) > 0.9*float64(total) {
		return &casefile.Errors{Problems: []*casefile.Problem{memoryProblem(sp.Solver, need, total)}}
	}
	return nil
}

// memoryProblem is the refusal of a grid that needs need bytes on a
// machine of total bytes.
func memoryProblem(c solver.Config, need, total int64) *casefile.Problem {
	fixed, cellBytes, scalarBytes := memoryModel(c.Ny)
	most := 0.9 * float64(total-fixed) / (cellBytes + scalarBytes*float64(len(c.Scalars)))
	if c.Ny > 1 {
		return &casefile.Problem{Key: "domain.ny", Value: fmt.Sprintf("%d (with domain.nx = %d, domain.nz = %d)", c.Ny, c.Nx, c.Nz),
			Msg: fmt.Sprintf("the slab needs about %s of memory, more than this machine has (%s); use fewer cells (domain.nx × domain.ny × domain.nz at most about %.3g, e.g. domain.ny = %d), run the x–z slice (leave out domain.width and domain.ny), or use a larger machine",
				diskspace.Format(need), diskspace.Format(total), most, max(casefile.MinNy, evenFloor(most/float64(c.Nx)/float64(c.Nz))))}
	}
	return &casefile.Problem{Key: "domain.nx", Value: fmt.Sprintf("%d (with domain.nz = %d)", c.Nx, c.Nz),
		Msg: fmt.Sprintf("the run needs about %s of memory, more than this machine has (%s); use fewer cells (domain.nx × domain.nz at most about %.3g) or a larger machine",
			diskspace.Format(need), diskspace.Format(total), most)}
}

// evenFloor returns the largest even integer at most v (0 for v < 2).
func evenFloor(v float64) int {
	if !(v >= 2) {
		return 0
	}
	n := int(math.Min(v, math.MaxInt32))
	return n - n%2
}

// EstimateRun derives grid, step, cost, memory and output numbers for a
// spec. It first checks from formulas alone that the run fits this machine
// and the limits above, and returns *casefile.Errors naming the keys and
// the fix when it does not, without building anything large. Only then does
// it build the solver (on fewer columns when the grid is large) to find the
// velocity scale and to time a few steps.
func EstimateRun(sp *Spec) (*Estimate, error) {
	c := sp.Solver
	g, err := solver.NewGrid(c.Nx, c.Nz, c.Lx, c.H, c.Cluster)
	if err != nil {
		return nil, err
	}
	e := &Estimate{Dx: g.Dx, DzMin: g.MinDz(), SpacingRatio: g.MaxSpacingRatio(), KeptModes: g.KeptModes(),
		MemoryBytes: MemoryBytes(sp)}
	for _, d := range g.Dz {
		e.DzMax = math.Max(e.DzMax, d)
	}
	if c.Ny > 1 {
		e.Dy, e.KeptModesY = c.Ly/float64(c.Ny), (c.Ny-1)/3
	}
	var ps []*casefile.Problem
	if c.Bed.Kind == solver.Rough && !(c.Bed.Z0 < g.Zc[0]) {
		ps = append(ps, &casefile.Problem{Key: "bed.roughness", Value: fmt.Sprint(c.Bed.Z0),
			Msg: fmt.Sprintf("must be below the first cell centre of this grid, z = %.3g m (the log law starts above z0); use a smaller bed.roughness, or fewer cells near the bed (domain.nz = %d or less, or a smaller domain.cluster.bed)",
				g.Zc[0], roughFit(c.Nz, g.Zc[0], c.Bed.Z0))})
	}
	if total, ok := physicalMemory(); ok && float64(e.MemoryBytes) > 0.9*float64(total) {
		ps = append(ps, memoryProblem(c, e.MemoryBytes, total))
	}
	if len(ps) > 0 {
		return e, &casefile.Errors{Problems: ps}
	}

	// The velocity scale from the initial state and the forcing, on the
	// case's grid or, when it is large, on fewer columns of the same rows.
	small := *sp
	small.Solver.Workers = c.Workers
	if c.Ny > 1 && Cells(c) > measureCells {
		// A slab is timed on fewer points of each plane: first fewer
		// spanwise rows, then fewer columns.
		small.Solver.Ny = min(c.Ny, max(casefile.MinNy, evenCeil(measureCells/float64(c.Nz)/float64(c.Nx))))
		small.Solver.Ly = c.Ly * float64(small.Solver.Ny) / float64(c.Ny)
		if Cells(small.Solver) > measureCells {
			small.Solver.Nx = min(c.Nx, max(8, evenCeil(measureCells/float64(c.Nz)/float64(small.Solver.Ny))))
		}
	} else if float64(c.Nx)*float64(c.Nz) > measureCells {
		small.Solver.Nx = max(8, evenCeil(measureCells/float64(c.Nz)/4))
		small.Solver.Nx = min(small.Solver.Nx, c.Nx)
	}
	s, err := NewSolver(&small)
	if err != nil {
		return nil, err
	}
	defer s.Close()
	e.VelocityScale = velocityScale(s, sp)
	e.Reynolds = e.VelocityScale * c.H / c.Viscosity

	kmax := g.Wavenumber(g.KeptModes())
	rate := kmax * e.VelocityScale // 1/s, the Courant rate of Config.CFL
	dt := math.Inf(1)
	if rate > 0 {
		dt = c.CFL / rate
	}
	dt = math.Min(dt, 1/(c.Viscosity*kmax*kmax))
	if c.MaxStep > 0 {
		dt = math.Min(dt, c.MaxStep)
	}
	if sp.FixedStep > 0 {
		dt = sp.FixedStep
	}
	e.Step, e.Courant = dt, dt*rate
	if !(dt > 0) || math.IsInf(dt, 0) {
		return e, &casefile.Errors{Problems: []*casefile.Problem{{Key: "domain.length", Value: fmt.Sprint(c.Lx),
			Msg: fmt.Sprintf("gives Δx = %.3g m, on which no step of finite size is stable (%.3g s); give the length in metres", g.Dx, dt)}}}
	}
	steps := math.Ceil(sp.Duration / dt)
	if steps > MaxSteps {
		return e, &casefile.Errors{Problems: []*casefile.Problem{{Key: "time.duration", Value: fmt.Sprint(sp.Duration),
			Msg: fmt.Sprintf("needs about %.3g steps of %.3g s, more than the %d one run may take; shorten time.duration (at most about %.3g s at this step), or coarsen the grid", steps, dt, MaxSteps, MaxSteps*dt)}}}
	}
	e.Steps = int64(steps)

	// Time steps after two warm-up ones, with the statistics a run
	// gathers at every step, for about timingBudget of wall time, and take
	// the median: on a shared machine single steps are slowed at random.
	// Then scale to the case's grid.
	e.StepCost = medianStepCost(s, sp, dt)
	e.CostMeasured = small.Solver.Nx == c.Nx && small.Solver.Ny == c.Ny
	switch {
	case e.CostMeasured:
	case c.Ny > 1:
		// A slab's step is dominated by its two-dimensional transforms of
		// every plane, N log N in the points of a plane N = Nx·Ny.
		n := float64(c.Nx) * float64(c.Ny)
		m := float64(small.Solver.Nx) * float64(small.Solver.Ny)
		e.StepCost = time.Duration(float64(e.StepCost) * n * math.Log2(n) / (m * math.Log2(m)))
	default:
		n, m := float64(c.Nx), float64(small.Solver.Nx)
		e.StepCost = time.Duration(float64(e.StepCost) * n * math.Log2(n) / (m * math.Log2(m)))
	}
	e.WallTime = time.Duration(math.Min(float64(e.Steps)*float64(e.StepCost), math.MaxInt64))

	cells := int64(c.Nx) * int64(c.Nz)
	volumes := int64(0) // a slab's three-dimensional fields per snapshot
	if c.Ny > 1 {
		volumes = int64(Cells(c))
	}
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
	// A slab's snapshot also holds each field in three dimensions, v, the
	// Q criterion and the velocity vector; its checkpoints are three-
	// dimensional with v and the y-derivatives.
	e.OutputBytes = snaps*nf*cells*8 + snaps*(nf+5)*volumes*8 + 2*13*volumes*8 + 2*8*cells*8 + rows*5*24 +
		e.Steps*int64(2*max(out.Probes, 1)+1)*24 + int64(len(sp.CaseText)) + 64<<10
	return e, nil
}

// timingBudget is the wall time EstimateRun spends timing steps, at most
// timedSteps steps and at least three.
const (
	timingBudget = 300 * time.Millisecond
	timedSteps   = 50
)

// medianStepCost returns the median wall time of steps of dt on s, each
// with the running statistics a run of sp gathers, after two warm-up
// steps; 0 when a step fails.
func medianStepCost(s *solver.Solver, sp *Spec, dt float64) time.Duration {
	g := s.Grid()
	prof := stats.NewProfiles(g, sp.Solver.Viscosity, 0)
	var sprof []*stats.ScalarProfiles
	for i, sc := range sp.Solver.Scalars {
		sprof = append(sprof, stats.NewScalarProfiles(g, i, sp.Solver.Viscosity, sc.Diffusivity, sc.TurbulentSchmidt, 0))
	}
	n := max(sp.Output.Probes, 1)
	xs, zs := make([]float64, n), make([]float64, n)
	for i := range xs {
		xs[i], zs[i] = g.Lx*float64(i)/float64(n), g.H/2
	}
	probes := stats.NewProbes(g, xs, zs)
	for range 2 {
		if s.StepBy(dt) != nil {
			return 0
		}
	}
	var costs []time.Duration
	start := time.Now()
	for len(costs) < 3 || (len(costs) < timedSteps && time.Since(start) < timingBudget) {
		t0 := time.Now()
		if s.StepBy(dt) != nil {
			break
		}
		prof.Add(s, dt)
		for _, p := range sprof {
			p.Add(s, dt)
		}
		probes.Add(s)
		costs = append(costs, time.Since(t0))
	}
	if len(costs) == 0 {
		return 0
	}
	slices.Sort(costs)
	return costs[len(costs)/2]
}

// roughFit returns the most cells along z (uniform spacing) whose first
// centre lies above z0 with a margin of a half, given the first centre zc0
// of nz cells.
func roughFit(nz int, zc0, z0 float64) int {
	return max(1, int(float64(nz)*zc0/(1.5*z0)))
}

// FitWarnings lists what in an estimated run is likely to surprise: a
// fixed step beyond the scheme's stability limit, a run of more than a
// week.
func FitWarnings(sp *Spec, e *Estimate) []string {
	var ws []string
	if sp.FixedStep > 0 && e.Courant > StableCourant {
		ws = append(ws, fmt.Sprintf("time.fixed_step = %g s gives a Courant number of about %.2g at the velocity scale %.3g m/s, above the stability limit %.2g of the time scheme; use time.fixed_step = %.3g s or less, or remove it to let the step adapt",
			sp.FixedStep, e.Courant, e.VelocityScale, StableCourant, sp.FixedStep*0.5/e.Courant))
	}
	if e.WallTime > longRun {
		ws = append(ws, fmt.Sprintf("the run would take about %s on this machine with %d worker(s); shorten time.duration or coarsen the grid, or run it on a cluster", DurationText(e.WallTime), max(sp.Solver.Workers, 1)))
	}
	return ws
}

// StableCourant is the Courant number, in the definition of time.cfl,
// above which the low-storage three-stage Runge–Kutta scheme is unstable
// for advection: √3 (common practice, no source).
var StableCourant = math.Sqrt(3)

// DurationText writes a wall time to the precision a reader needs: "0.4 s",
// "12 s", "3 min 20 s", "5 h 10 min", "3.2 days".
func DurationText(d time.Duration) string {
	s := d.Seconds()
	switch {
	case s < 1:
		return fmt.Sprintf("%.2g s", s)
	case s < 60:
		return fmt.Sprintf("%.0f s", s)
	case s < 3600:
		return fmt.Sprintf("%d min %d s", int(s)/60, int(s)%60)
	case s < 48*3600:
		return fmt.Sprintf("%d h %d min", int(s)/3600, int(s)%3600/60)
	}
	return fmt.Sprintf("%.3g days", s/86400)
}

// velocityScale is the velocity the flow is expected to reach: the larger of
// the initial state's largest speed and the forcing's scale. With a canopy
// the forcing's scale is the largest speed of the drag-balanced profile
// (mixing length above, drag within), which holds the bulk velocity or
// balances the pressure gradient. Without one, a held bulk velocity U
// gives 1.2 U, and a fixed gradient Π the smaller of the laminar
// centre-line speed and 16 u*, u* = √(Π H) (a log-law estimate with
// ln(H/z0)/κ ≈ 16; common practice, no source). Waves and tides add their
// scale (oscillationScale).
func velocityScale(s *solver.Solver, sp *Spec) float64 {
	v := 0.0
	for _, u := range s.U() {
		v = math.Max(v, math.Abs(u))
	}
	maxAbs := func(p []float64) float64 {
		m := 0.0
		for _, u := range p {
			m = math.Max(m, math.Abs(u))
		}
		return m
	}
	c := s.Config()
	switch {
	case sp.Canopy != nil:
		if prof, _, err := s.DragBalancedProfile(); err == nil {
			v = math.Max(v, maxAbs(prof))
		}
	case c.Forcing.Kind == solver.FixedBulk:
		v = math.Max(v, 1.2*math.Abs(c.Forcing.Bulk))
	case c.Forcing.Kind == solver.FixedGradient:
		f := 16 * math.Sqrt(math.Abs(c.Forcing.Gradient)*c.H)
		if prof, _, err := s.LaminarProfile(); err == nil {
			f = math.Min(f, maxAbs(prof))
		}
		v = math.Max(v, f)
	}
	for _, w := range []solver.Wall{c.Bed, c.Top} {
		v = math.Max(v, math.Abs(w.Speed)+math.Abs(w.Amplitude))
	}
	return v + oscillationScale(c.Forcing)
}
