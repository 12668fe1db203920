package solver

import (
	"fmt"
	"math"
)

// ScalarBoundaryKind is the condition for a scalar at the bed or the top.
type ScalarBoundaryKind int

const (
	// ZeroFlux: no scalar crosses the boundary.
	ZeroFlux ScalarBoundaryKind = iota
	// FixedValue holds the concentration at the boundary at Value; the
	// diffusive flux uses the one-sided second-order wall derivative.
	FixedValue
	// FixedFlux sets the flux into the fluid through the boundary to Value
	// (unit·m/s; negative for a flux out of the fluid).
	FixedFlux
	// Transfer is a surface-uptake law at the bed: a flux out of the
	// fluid k (c₁ − c_w), c₁ the concentration at the first centre, with
	// the series combination 1/k = 1/k_dbl(u*) + 1/Capacity of the
	// diffusive-boundary-layer transfer velocity and the surface's own
	// uptake capacity. Bed only.
	Transfer
)

// ScalarBoundary is a scalar's condition at the bed or the top.
type ScalarBoundary struct {
	Kind  ScalarBoundaryKind
	Value float64 // concentration (FixedValue) or flux into the fluid (FixedFlux)
	// Capacity is the surface uptake capacity k_s in m/s (Transfer);
	// +Inf for a perfect sink.
	Capacity float64
	// Velocity is k_dbl(u*) in m/s from the local friction velocity u*
	// (m/s) (Transfer).
	Velocity func(ustar float64) float64
}

// Scalar configures one passive scalar c (any concentration unit, "unit"):
//
//	∂c/∂t + ∇·(u c) = ∇·((D + ν_t/Sc_t) ∇c) − a_s k_e (c − c_w) + S
//
// with the element uptake rate a_s k_e, 1/k_e = 1/k_bl(|u|) + 1/k_s.
type Scalar struct {
	Name             string
	Diffusivity      float64 // D, m²/s
	TurbulentSchmidt float64 // Sc_t of the subgrid flux; 0 means 1
	Initial          float64 // unit, uniform initial concentration
	Source           float64 // unit/s, uniform volume source
	Top, Bed         ScalarBoundary
	// SurfaceArea is the element surface area per unit volume a_s (1/m)
	// at the centres (Nz·Nx values, Nz·Ny·Nx in a box); nil for no element
	// uptake.
	SurfaceArea []float64
	// ElementVelocity is the boundary-layer transfer velocity k_bl (m/s)
	// of an element at local speed |u| (m/s).
	ElementVelocity func(speed float64) float64
	// Capacity is the element surface's uptake capacity k_s in m/s; +Inf
	// for a perfect sink, 0 for no uptake.
	Capacity float64
	// SurfaceValue is the concentration c_w at the element and mat
	// surfaces (unit).
	SurfaceValue float64
}

// SeriesVelocity combines two transfer velocities in series:
// 1/k = 1/a + 1/b, with +Inf acting as no resistance and 0 as no transfer.
func SeriesVelocity(a, b float64) float64 {
	switch {
	case a <= 0 || b <= 0:
		return 0
	case math.IsInf(a, 1):
		return b
	case math.IsInf(b, 1):
		return a
	}
	return a * b / (a + b)
}

func (c *Scalar) check(nx, nz int) error {
	switch {
	case !(c.Diffusivity > 0) || math.IsInf(c.Diffusivity, 0):
		return fmt.Errorf("solver: scalar %q: diffusivity %g m²/s: need a finite value > 0", c.Name, c.Diffusivity)
	case c.TurbulentSchmidt < 0:
		return fmt.Errorf("solver: scalar %q: turbulent Schmidt number %g: need > 0", c.Name, c.TurbulentSchmidt)
	case c.SurfaceArea != nil && len(c.SurfaceArea) != nx*nz:
		return fmt.Errorf("solver: scalar %q: SurfaceArea has %d values, need one per cell centre, %d", c.Name, len(c.SurfaceArea), nx*nz)
	case c.SurfaceArea != nil && c.ElementVelocity == nil && c.Capacity != 0:
		return fmt.Errorf("solver: scalar %q: element uptake needs a transfer velocity law", c.Name)
	case c.Top.Kind == Transfer:
		return fmt.Errorf("solver: scalar %q: the transfer law is for the bed only", c.Name)
	case c.Bed.Kind == Transfer && c.Bed.Velocity == nil:
		return fmt.Errorf("solver: scalar %q: the bed transfer law needs k_dbl(u*)", c.Name)
	}
	return nil
}

// scalarState is the solver's working data of one scalar.
type scalarState struct {
	cfg     Scalar
	row     int       // first row of the scalar in the vel, deriv and flux plans
	c, cx   []float64 // views: concentration and ∂c/∂x at the centres
	fx      []float64 // view: x-flux, then its x-derivative
	cy, fy  []float64 // views: ∂c/∂y and the y-flux (three dimensions only)
	n       []float64 // explicit right-hand side of the previous stage
	gc      []float64 // advective z-flux w c at the faces
	rate    []float64 // 1/s, element uptake rate a_s k_e at the centres (nil without uptake)
	rateRow []bool    // per level: elements take the scalar up there
	bedK    []float64 // m/s, bed transfer velocity per column (Transfer)
	invSct  float64
	budget  ScalarBudget
	byLevel []float64   // element uptake per level, this run (unit·m per bed area)
	parts   [][]float64 // per worker: top, bed, elements, and uptake per level this stage
}

// ScalarBudget is the running budget of a scalar, per unit bed area
// (unit·m), from the start of the run:
//
//	Storage − Storage0 = TopIn + BedIn − ElementUptake + Sources
//
// where TopIn and BedIn are the fluxes into the fluid through the top and
// the bed integrated in time (BedIn < 0 for a bed that takes the scalar
// up). Every term is summed as the scheme applies it, so the budget closes
// to round-off.
type ScalarBudget struct {
	Storage0, Storage    float64
	TopIn, BedIn         float64
	ElementUptake        float64
	Sources              float64
	Time                 float64 // s, time the flux terms cover
	StepTopIn, StepBedIn float64 // the terms of the last step
	StepElement          float64
}

// Imbalance returns the budget's residual relative to the largest term.
func (b ScalarBudget) Imbalance() float64 {
	res := (b.Storage - b.Storage0) - (b.TopIn + b.BedIn - b.ElementUptake + b.Sources)
	scale := math.Max(math.Max(math.Abs(b.Storage), math.Abs(b.Storage0)),
		math.Max(math.Max(math.Abs(b.TopIn), math.Abs(b.BedIn)), math.Max(math.Abs(b.ElementUptake), math.Abs(b.Sources))))
	if scale == 0 {
		return 0
	}
	return math.Abs(res) / scale
}

// Scalars returns the number of scalars.
func (s *Solver) Scalars() int { return len(s.sc) }

// ScalarName returns the name of scalar i.
func (s *Solver) ScalarName(i int) string { return s.sc[i].cfg.Name }

// Scalar returns scalar i at the cell centres (Nz levels of Ny·Nx), a view.
func (s *Solver) Scalar(i int) []float64 { return s.sc[i].c }

// ScalarDX returns ∂c/∂x of scalar i at the cell centres, a view.
func (s *Solver) ScalarDX(i int) []float64 { return s.sc[i].cx }

// Budget returns the running budget of scalar i.
func (s *Solver) Budget(i int) ScalarBudget { return s.sc[i].budget }

// UptakeByLevel returns the element uptake of scalar i per level since the
// start (unit·m per unit bed area); the levels sum to
// Budget(i).ElementUptake.
func (s *Solver) UptakeByLevel(i int) []float64 { return s.sc[i].byLevel }

// UptakeRate returns the element uptake rate a_s k_e (1/s) of scalar i at
// the centres as last computed, or nil without element uptake.
func (s *Solver) UptakeRate(i int) []float64 { return s.sc[i].rate }

// BedTransferVelocity returns k_bed (m/s) per column of scalar i as last
// computed, or nil without a bed transfer law.
func (s *Solver) BedTransferVelocity(i int) []float64 { return s.sc[i].bedK }

// storage returns ∫c dz averaged over the bed (unit·m per bed area).
func (s *Solver) storage(sc *scalarState) float64 {
	sum := 0.0
	for k := 0; k < s.nz; k++ {
		row := 0.0
		for _, v := range sc.c[k*s.np : (k+1)*s.np] {
			row += v
		}
		sum += row * s.g.Dz[k]
	}
	return sum / float64(s.np)
}

// setupScalars sizes the scalar work arrays; views are set by bindScalars.
func (s *Solver) setupScalars() {
	nx, nz := s.np, s.nz // nx: values in a level
	for i := range s.cfg.Scalars {
		c := s.cfg.Scalars[i]
		sc := &scalarState{cfg: c, row: s.scalarBase + i*nz}
		sc.n = make([]float64, nz*nx)
		sc.gc = make([]float64, (nz+1)*nx)
		sc.invSct = 1
		if c.TurbulentSchmidt > 0 {
			sc.invSct = 1 / c.TurbulentSchmidt
		}
		if c.SurfaceArea != nil && c.Capacity != 0 {
			sc.rate = make([]float64, nz*nx)
			sc.rateRow = make([]bool, nz)
			for k := range sc.rateRow {
				sc.rateRow[k] = anyNonzero(c.SurfaceArea, k, nx)
			}
		}
		if c.Bed.Kind == Transfer {
			sc.bedK = make([]float64, nx)
		}
		sc.byLevel = make([]float64, nz)
		sc.parts = make([][]float64, s.crew.n)
		for p := range sc.parts {
			sc.parts[p] = make([]float64, 3+nz)
		}
		s.sc = append(s.sc, sc)
	}
	s.bindScalars()
	for _, sc := range s.sc {
		for i := range sc.c {
			sc.c[i] = sc.cfg.Initial
		}
		clear(sc.cx)
		sc.budget.Storage0 = s.storage(sc)
		sc.budget.Storage = sc.budget.Storage0
	}
}

func (s *Solver) bindScalars() {
	nx, nz := s.np, s.nz // nx: values in a level
	for _, sc := range s.sc {
		a, b := sc.row*nx, (sc.row+nz)*nx
		sc.c = s.vel.Real()[a:b]
		sc.cx = s.deriv.Real()[a:b]
		sc.fx = s.flux.Real()[a:b]
		if s.ny > 1 {
			sc.cy, sc.fy = s.derivY.Real()[a:b], s.fluxY.Real()[a:b]
		}
	}
}

// wallFluxes returns the scalar's fluxes into the fluid through the bed and
// through the top (as bedFlux gives them), summed over columns [i0, i1) and
// evaluated on its present values.
func (s *Solver) wallFluxes(sc *scalarState, i0, i1 int) (bed, top float64) {
	nx, nz, c := s.np, s.nz, sc.c // nx: values in a level
	_, _, _, _, b0, b1, bf := s.scalarBoundary(sc, 0)
	_, _, _, _, t0, t1, tf := s.scalarBoundary(sc, nz-1)
	r1, rt, rs := min(1, nz-1)*nx, (nz-1)*nx, max(nz-2, 0)*nx
	for i := i0; i < i1; i++ {
		bed += s.bedFlux(sc, i, c[i], c[r1+i], b0, b1, bf)
		top += t0*c[rt+i] + t1*c[rs+i] + tf
	}
	return bed, top
}

// scalarRatesPart computes, at the first stage of a step, the element
// uptake rates and the bed transfer velocities of its share of columns
// (columns, not levels, so that the elements' work is shared evenly; levels
// without elements keep their zero rates).
func (s *Solver) scalarRatesPart(part int) {
	g, nx, nz := s.g, s.np, s.nz // nx: values in a level
	w := s.w
	i0, i1 := span(nx, s.crew.n, part)
	for _, sc := range s.sc {
		c := &sc.cfg
		if sc.rate != nil {
			for k := 0; k < nz; k++ {
				if !sc.rateRow[k] {
					continue
				}
				dz := g.Dz[k]
				lo, hi := (g.Zf[k+1]-g.Zc[k])/dz, (g.Zc[k]-g.Zf[k])/dz
				for i := k*nx + i0; i < k*nx+i1; i++ {
					as := c.SurfaceArea[i]
					if as == 0 {
						sc.rate[i] = 0
						continue
					}
					speed := s.pointSpeed(i, lo*w[i]+hi*w[i+nx])
					sc.rate[i] = as * SeriesVelocity(c.ElementVelocity(speed), c.Capacity)
				}
			}
		}
		if sc.bedK != nil {
			for i := i0; i < i1; i++ {
				sc.bedK[i] = SeriesVelocity(c.Bed.Velocity(s.frictionVelocity(i)), c.Bed.Capacity)
			}
		}
	}
}

// frictionVelocity returns u* = √|τ_bed| (m/s) at column i from the wall
// closure: ν |∂u/∂z| at a no-slip bed, the log-law stress at a rough one.
func (s *Solver) frictionVelocity(i int) float64 {
	if s.ny > 1 {
		return s.spanFrictionVelocity(i)
	}
	nx, u := s.nx, s.u
	switch s.cfg.Bed.Kind {
	case NoSlip:
		ub := s.cfg.Bed.SpeedAt(s.st.tNow)
		return math.Sqrt(s.cfg.Viscosity * math.Abs(s.bedA*(u[i]-ub)-s.bedB*(u[i+nx]-ub)))
	case Rough:
		return math.Sqrt(s.roughC) * math.Abs(u[i])
	}
	return 0
}

// scalarBoundary returns, for level k, the extra diagonal, lower and upper
// coefficients and the affine part of the scalar diffusion operator from the
// wall conditions, and the coefficients (a0, a1, af) of the flux into the
// fluid through the bed (k = 0) or the top (k = Nz−1) as
// a0·c[k] + a1·c[next] + af.
func (s *Solver) scalarBoundary(sc *scalarState, k int) (di, lo, up, aff float64, f0, f1, ff float64) {
	nz, dz := s.nz, s.g.Dz[k]
	D := sc.cfg.Diffusivity
	if k == 0 {
		b := sc.cfg.Bed
		switch b.Kind {
		case FixedValue:
			// flux into the fluid = −D ∂c/∂z|0 = −D (a (c0 − cb) − b (c1 − cb))
			f0, f1, ff = -D*s.bedA, D*s.bedB, D*(s.bedA-s.bedB)*b.Value
		case FixedFlux:
			ff = b.Value
		}
		di, up, aff = f0/dz, f1/dz, ff/dz
	}
	if k == nz-1 {
		t := sc.cfg.Top
		var g0, g1, gf float64
		switch t.Kind {
		case FixedValue:
			// flux into the fluid = D ∂c/∂z|H = −D (at (c_{n−1} − ct) − bt (c_{n−2} − ct))
			g0, g1, gf = -D*s.topA, D*s.topB, D*(s.topA-s.topB)*t.Value
		case FixedFlux:
			gf = t.Value
		}
		di += g0 / dz
		lo += g1 / dz
		aff += gf / dz
		if k != 0 {
			f0, f1, ff = g0, g1, gf
		}
	}
	return di, lo, up, aff, f0, f1, ff
}

// implicitScalars solves the implicit vertical diffusion and the
// point-implicit element sink of every scalar for columns [i0, i1), writing
// the new concentration into the vel plan, and adds the stage's boundary and
// uptake terms to this worker's budget slots.
//
//	(I − βΔt L + cΔt λ) c* = c + Δt (α L c + γ N + ζ N_prev) + cΔt λ c_w
//
// with c = α + β, L including the wall conditions and the mat's Robin law.
func (s *Solver) implicitScalars(part, i0, i1 int) {
	nx, nz, n := s.np, s.nz, i1-i0 // nx: values in a level
	st := &s.st
	dt, al, be := st.dt, st.alpha, st.beta
	cdt := (al + be) * dt
	invLx := 1 / float64(nx)
	for _, sc := range s.sc {
		cfg := &sc.cfg
		cw := cfg.SurfaceValue
		acc := sc.parts[part]
		a := s.thomasFor(part, i0, i1)
		a.coef[coefD], a.coef[coefNu], a.coef[coefIsct], a.coef[coefCw] = cfg.Diffusivity, s.cfg.Viscosity, sc.invSct, cw
		for k := 0; k < nz; k++ {
			dX, lX, uX, aff, _, _, _ := s.scalarBoundary(sc, k)
			rc := a.row[k*thomasRowLen : (k+1)*thomasRowLen]
			rc[rowGl], rc[rowGu], rc[rowIdz] = s.gUlo[k], s.gUup[k], s.invDz[k]
			rc[rowDX], rc[rowLX], rc[rowUX] = dX, lX, uX
			rc[rowForce], rc[rowExtra], rc[rowRough], rc[rowAff] = cfg.Source, 0, 0, aff
		}
		// Fluxes into the fluid at the bed and the top, evaluated on the
		// old state now (α part) and on the new one after the solve (β).
		bedOld, topOld := s.wallFluxes(sc, i0, i1)
		// At the bed and the top the neighbour rows fold onto the row
		// itself; their coefficients are zero there.
		a.k0, a.k1, a.kLo, a.kHi = 0, nz, 0, nz-1
		a.f, a.cp = sc.c[i0:], s.cpU[i0:]
		a.cb, a.ct = s.nuF[i0:], s.nuF[nx+i0:]
		a.ax, a.gb, a.gt = sc.fx[i0:], sc.gc[i0:], sc.gc[nx+i0:]
		a.nRead, a.nWrite = s.explicitStore(sc.n[i0:])
		if sc.rate != nil {
			a.rate, a.rateOn = sc.rate[i0:], sc.rateRow
		}
		if sc.bedK != nil {
			a.bedK, a.bedRow = sc.bedK[i0:i1], 0
		}
		a.eliminate()
		backSubstitute(sc.c, s.cpU, nx, i0, n, 0, nz)
		// Budget terms of the stage, as applied.
		bedNew, topNew := s.wallFluxes(sc, i0, i1)
		c := sc.c
		acc[0] += dt * (al*topOld + be*topNew) * invLx
		acc[1] += dt * (al*bedOld + be*bedNew) * invLx
		if sc.rate != nil {
			for k := 0; k < nz; k++ {
				if !sc.rateRow[k] {
					continue
				}
				r := k*nx + i0
				cr, lr := c[r:r+n], sc.rate[r:r+n]
				sum := 0.0
				for i := range cr {
					sum += lr[i] * (cr[i] - cw)
				}
				v := cdt * sum * s.g.Dz[k] * invLx
				acc[3+k] += v
				acc[2] += v
			}
		}
	}
}

// bedFlux returns the flux into the fluid through the bed at column i for
// bed concentration values c0 (first centre) and c1 (second).
func (s *Solver) bedFlux(sc *scalarState, i int, c0, c1, f0, f1, ff float64) float64 {
	if sc.bedK != nil {
		return -sc.bedK[i] * (c0 - sc.cfg.SurfaceValue)
	}
	return f0*c0 + f1*c1 + ff
}

// closeScalarStage adds the workers' stage terms to the budgets.
func (s *Solver) closeScalarStage() {
	cdt := (s.st.alpha + s.st.beta) * s.st.dt
	for _, sc := range s.sc {
		b := &sc.budget
		var top, bed, el float64
		for _, acc := range sc.parts {
			top += acc[0]
			bed += acc[1]
			el += acc[2]
			for k := range sc.byLevel {
				sc.byLevel[k] += acc[3+k]
			}
		}
		b.TopIn += top
		b.BedIn += bed
		b.ElementUptake += el
		b.StepTopIn += top
		b.StepBedIn += bed
		b.StepElement += el
		b.Sources += cdt * sc.cfg.Source * s.cfg.H
	}
}

// closeScalarStep records the storage after a step.
func (s *Solver) closeScalarStep(dt float64) {
	for _, sc := range s.sc {
		sc.budget.Storage = s.storage(sc)
		sc.budget.Time += dt
	}
}

// SetScalarFunc sets scalar i to f(x, z) at the cell centres (the same at
// every y) and projects (which also refreshes its derivatives and resets
// the pressure).
func (s *Solver) SetScalarFunc(i int, f func(x, z float64) float64) {
	g, nx, np := s.g, s.nx, s.np
	c := s.sc[i].c
	for k := 0; k < s.nz; k++ {
		for j := 0; j < np; j++ {
			c[k*np+j] = f(g.X[j%nx], g.Zc[k])
		}
	}
	s.Project()
	s.sc[i].budget.Storage0 = s.storage(s.sc[i])
	s.sc[i].budget.Storage = s.sc[i].budget.Storage0
}
