package solver

import (
	"fmt"
	"math"

	"rollerbed/solver/transform"
)

// Solver holds the state of one run and advances it in time.
//
// The velocity lives in physical space between steps: U() returns the
// streamwise velocity at cell centres, W() the vertical velocity at faces.
// Both are views into the solver's buffers, valid until the next call that
// changes the state.
type Solver struct {
	cfg Config
	g   *Grid

	nx, nz, nc int
	ny         int       // points across the span, 1 in the slice
	np, ncp    int       // values in a level: Ny·Nx in physical space, Ny·(Nx/2+1) in spectral space
	kcut       int       // highest kept Fourier mode (2/3 rule)
	kx         []float64 // 1/m, wavenumber of each kept mode, 0 above kcut
	kmax       float64   // 1/m, wavenumber of mode kcut
	spanwise             // the spanwise parts of a three-dimensional run (span.go)

	// Transform plans, a row (a plane in a box) per level: rows [0, Nz)
	// hold a centre field, rows [Nz, 2Nz] a face field, then v in a box
	// (Nz rows) and each scalar (Nz rows).
	vel   transform.Plan // u and w
	deriv transform.Plan // ∂u/∂x and ∂w/∂x
	flux  transform.Plan // x-fluxes, then their x-derivatives
	pgrad transform.Plan // ∂p/∂x at centres and ∂p/∂z at faces

	u, w   []float64 // views into vel.Real()
	ux, wx []float64 // views into deriv.Real()
	px, pz []float64 // views into pgrad.Real()

	nuC, nuF     []float64    // m²/s, effective viscosity at centres and faces
	ell2         []float64    // m², squared mixing length per level
	dragC, dragF []float64    // 1/s, drag rate at centres and faces (nil without drag)
	nU, nW       []float64    // explicit right-hand side of the previous stage
	gu, cz       []float64    // z-fluxes: u-momentum at faces, w-momentum at centres
	cpU, cpW     []float64    // tridiagonal work, centres and faces
	rowOld       [][]float64  // per worker: the old values of the row below
	rowScratch   [][]float64  // per worker: a row written and never read
	rowCoef      [][]float64  // per worker: the per-level values of a tridiagonal solve
	thomas       []thomasArgs // per worker: the arguments of its tridiagonal solves
	halo         [][]float64  // per worker: ν_e and drag rate of the level below its part
	levelSpans   [][2]int     // per worker: the levels of its part of the flux phase

	phat       []complex128 // kinematic pressure, spectral, Nz×ncp
	prhs       []complex128 // projection work, Nz×ncp
	pcp, pinv  []float64    // projection factors per level and mode
	pLo        []float64    // 1/(Dz[k] Hf[k]), the lower coefficient of D G
	invDz      []float64    // 1/Dz[k]
	invHf      []float64    // 1/Hf[j]
	gUlo, gUup []float64    // vertical-diffusion geometry for u rows
	gWlo, gWup []float64    // vertical-diffusion geometry for w rows
	zeroRow    []float64    // a level of zeros: the drag or uptake rate of a level without elements
	dragRow    []bool       // per level: the canopy drags there (nil without drag)
	dragFace   []bool       // per face: the canopy drags at a neighbouring centre

	// Wall closure coefficients for the one-sided wall derivative.
	bedA, bedB, topA, topB float64
	roughC                 float64 // (κ/ln(z1/z0))², rough bed

	t, dt     float64
	steps     int
	gradPi    float64 // m/s², the mean pressure gradient now applied
	bulkShift float64 // m/s, uniform velocity added this step to hold the bulk
	// unsteadyGradient: Π follows Forcing.GradientAt stage by stage.
	unsteadyGradient bool

	st      stageCoef
	stageNo int // index of the running Runge–Kutta stage
	sc      []*scalarState
	projC   float64 // s, the coefficient c of the projection u ← u* − c ∇p
	inStage bool    // the projection ends a Runge–Kutta stage
	// cachedRate is the Courant rate of the state after the last step; it
	// saves NextStep a scan. rateFresh is cleared when the state is set.
	cachedRate float64
	rateFresh  bool

	crew                                               *crew
	explicitTask, yardTask                             func(int)
	xderivTask, implicitTask, fwdTask                  func(int)
	projectTask, correctTask, scanTask, divergenceTask func(int)
	scanRate                                           []float64
	scanIdx                                            []int
	divMax                                             []float64
}

type stageCoef struct {
	dt, alpha, beta, gamma, zeta float64
	tNow, tNext                  float64
}

// rk3 holds the coefficients of the Spalart–Moser–Rogers low-storage IMEX
// scheme (Spalart, Moser & Rogers 1991, J. Comput. Phys. 96:297, eq. A.1).
var rk3 = [3]struct{ gamma, zeta, alpha, beta, cNow, cNext float64 }{
	{8.0 / 15, 0, 29.0 / 96, 37.0 / 160, 0, 8.0 / 15},
	{5.0 / 12, -17.0 / 60, -3.0 / 40, 5.0 / 24, 8.0 / 15, 2.0 / 3},
	{3.0 / 4, -5.0 / 12, 1.0 / 6, 1.0 / 6, 2.0 / 3, 1},
}

// New builds a solver at rest at t = 0.
func New(cfg Config) (*Solver, error) {
	if cfg.CFL == 0 {
		cfg.CFL = DefaultCFL
	}
	if err := cfg.check(); err != nil {
		return nil, err
	}
	g, err := NewGrid(cfg.Nx, cfg.Nz, cfg.Lx, cfg.H, cfg.Cluster)
	if err != nil {
		return nil, err
	}
	if cfg.Bed.Kind == Rough && cfg.Bed.Z0 >= g.Zc[0] {
		return nil, fmt.Errorf("solver: bed roughness z0 = %g m must be below the first cell centre at %g m; use a smaller z0 or fewer cells near the bed", cfg.Bed.Z0, g.Zc[0])
	}
	workers := max(cfg.Workers, 1)
	workers = min(workers, cfg.Nz)
	s := &Solver{cfg: cfg, g: g, nx: cfg.Nx, nz: cfg.Nz, nc: cfg.Nx/2 + 1, ny: 1}
	if cfg.Ny > 1 {
		s.ny, g.Ny, g.Ly = cfg.Ny, cfg.Ny, cfg.Ly
	}
	s.np, s.ncp = s.ny*s.nx, s.ny*s.nc
	for i := range cfg.Scalars {
		if err := cfg.Scalars[i].check(s.np, cfg.Nz); err != nil {
			return nil, err
		}
	}
	// Rows of the plans: u, w, v (three-dimensional runs), then each scalar.
	s.scalarBase = 2*s.nz + 1
	pgradRows := 2*s.nz + 1
	plans := []*transform.Plan{&s.vel, &s.deriv, &s.flux, &s.pgrad}
	if s.ny > 1 {
		s.scalarBase += s.nz
		pgradRows += s.nz
		plans = append(plans, &s.derivY, &s.fluxY)
	}
	rows := s.scalarBase + len(cfg.Scalars)*s.nz
	for _, p := range plans {
		n := rows
		if p == &s.pgrad {
			n = pgradRows
		}
		*p, err = transform.NewPlanes(cfg.Backend, s.nx, s.ny, n, workers)
		if err != nil {
			s.Close()
			return nil, fmt.Errorf("solver: %w", err)
		}
	}
	np, nz, ncp := s.np, s.nz, s.ncp
	cells, faces := nz*np, (nz+1)*np
	s.u, s.w = s.vel.Real()[:cells], s.vel.Real()[cells:cells+faces]
	s.ux, s.wx = s.deriv.Real()[:cells], s.deriv.Real()[cells:cells+faces]
	s.px, s.pz = s.pgrad.Real()[:cells], s.pgrad.Real()[cells:cells+faces]
	s.nuC, s.nuF = make([]float64, cells), make([]float64, faces)
	s.nU, s.nW = make([]float64, cells), make([]float64, faces)
	s.gu, s.cz = make([]float64, faces), make([]float64, cells)
	s.cpU, s.cpW = make([]float64, cells), make([]float64, faces)
	s.phat, s.prhs = make([]complex128, nz*ncp), make([]complex128, nz*ncp)
	s.pcp, s.pinv = make([]float64, nz*ncp), make([]float64, nz*ncp)
	clear(s.vel.Real())
	clear(s.deriv.Real())
	clear(s.pgrad.Real())
	s.setupSpan()
	for i := range s.nuC {
		s.nuC[i] = cfg.Viscosity
	}
	for i := range s.nuF {
		s.nuF[i] = cfg.Viscosity
	}

	s.kcut = g.KeptModes()
	s.kx = make([]float64, s.nc)
	for m := 1; m <= s.kcut; m++ {
		s.kx[m] = g.Wavenumber(m)
	}
	s.kmax = g.Wavenumber(s.kcut)
	s.setupSpanModes()
	s.factorProjection()

	z0, z1 := g.Zc[0], g.Zc[1]
	s.bedA, s.bedB = z1/(z0*(z1-z0)), z0/(z1*(z1-z0))
	d0, d1 := cfg.H-g.Zc[nz-1], cfg.H-g.Zc[nz-2]
	s.topA, s.topB = d1/(d0*(d1-d0)), d0/(d1*(d1-d0))
	if cfg.Bed.Kind == Rough {
		l := Karman / math.Log(z0/cfg.Bed.Z0)
		s.roughC = l * l
	}
	if cfg.Forcing.Kind == FixedGradient {
		s.gradPi = cfg.Forcing.Gradient
		s.unsteadyGradient = !cfg.Forcing.Steady()
	}

	s.crew = newCrew(workers)
	s.scanRate = make([]float64, workers)
	s.scanIdx = make([]int, workers)
	s.divMax = make([]float64, 2*workers)
	s.setupClosure()
	s.setupImplicit()
	s.setupScalars()
	s.explicitTask = s.explicitPart
	s.yardTask = s.yardPart
	s.xderivTask = s.xderivPart
	s.implicitTask = s.implicitPart
	s.fwdTask = s.forwardVelPart
	s.projectTask = s.projectPart
	s.correctTask = s.correctPart
	s.scanTask = s.scanPart
	s.divergenceTask = s.divergencePart
	return s, nil
}

// Close stops the workers and releases the transform buffers. The slices
// returned by U, W and friends must not be used afterwards.
func (s *Solver) Close() {
	if s.crew != nil {
		s.crew.close()
	}
	for _, p := range []transform.Plan{s.vel, s.deriv, s.flux, s.pgrad, s.derivY, s.fluxY} {
		if p != nil {
			p.Close()
		}
	}
	s.vel, s.deriv, s.flux, s.pgrad, s.derivY, s.fluxY = nil, nil, nil, nil, nil, nil
	s.u, s.w, s.ux, s.wx, s.px, s.pz = nil, nil, nil, nil, nil, nil
	s.v, s.vx, s.uy, s.vy, s.wy, s.py = nil, nil, nil, nil, nil, nil
	for _, sc := range s.sc {
		sc.c, sc.cx, sc.fx, sc.cy, sc.fy = nil, nil, nil, nil, nil
	}
}

// Grid returns the mesh.
func (s *Solver) Grid() *Grid { return s.g }

// Config returns the configuration the solver was built with (with defaults
// filled in).
func (s *Solver) Config() Config { return s.cfg }

// Time returns the simulated time in s.
func (s *Solver) Time() float64 { return s.t }

// Steps returns the number of steps taken.
func (s *Solver) Steps() int { return s.steps }

// LastStep returns the size of the last step in s (0 before the first).
func (s *Solver) LastStep() float64 { return s.dt }

// LastCourant returns the Courant number, in the definition of
// Config.CFL, of the last step on the state it produced, from the scan the
// step made anyway (0 before the first step).
func (s *Solver) LastCourant() float64 {
	if !s.rateFresh {
		return 0
	}
	return s.cachedRate * s.dt
}

// Gradient returns the mean pressure gradient Π in m/s² now applied
// (prescribed for FixedGradient, adjusted for FixedBulk).
func (s *Solver) Gradient() float64 {
	if s.unsteadyGradient {
		return s.cfg.Forcing.GradientAt(s.t)
	}
	return s.gradPi
}

// U returns the streamwise velocity at cell centres, Nz levels of Ny·Nx
// (Nz rows of Nx in the slice), m/s.
func (s *Solver) U() []float64 { return s.u }

// W returns the vertical velocity at faces, Nz+1 levels of Ny·Nx, m/s;
// levels 0 and Nz (bed and top) are zero.
func (s *Solver) W() []float64 { return s.w }

// DUDX returns ∂u/∂x at cell centres, 1/s.
func (s *Solver) DUDX() []float64 { return s.ux }

// DWDX returns ∂w/∂x at faces, 1/s.
func (s *Solver) DWDX() []float64 { return s.wx }

// Viscosity returns the effective viscosity ν + ν_t at cell centres, m²/s.
func (s *Solver) Viscosity() []float64 { return s.nuC }

// Pressure writes the kinematic pressure p/ρ (m²/s²) at cell centres into
// dst (Nz·Ny·Nx values). It is the pressure of the last projection, defined up
// to a constant; it uses the flux plan as scratch and must not be called
// during a step.
func (s *Solver) Pressure(dst []float64) {
	spec := s.flux.Spec()
	clear(spec)
	copy(spec[:s.nz*s.ncp], s.phat)
	s.flux.Inverse()
	copy(dst, s.flux.Real()[:s.nz*s.np])
}

// MeanU writes the average of u over each level (over x, and y in three
// dimensions) into dst (Nz values).
func (s *Solver) MeanU(dst []float64) {
	for k := 0; k < s.nz; k++ {
		sum := 0.0
		for _, v := range s.u[k*s.np : (k+1)*s.np] {
			sum += v
		}
		dst[k] = sum / float64(s.np)
	}
}

// Bulk returns the depth- and x-mean streamwise velocity in m/s.
func (s *Solver) Bulk() float64 {
	sum := 0.0
	for k := 0; k < s.nz; k++ {
		row := 0.0
		for _, v := range s.u[k*s.np : (k+1)*s.np] {
			row += v
		}
		sum += row * s.g.Dz[k]
	}
	return sum / (float64(s.np) * s.cfg.H)
}
