package solver

import (
	"fmt"
	"math"
	"time"
)

// BlowUpLimit is the Courant number above which a step counts as a blow-up.
const BlowUpLimit = 5.0

// BlowUpError reports a run that became unstable: NaN values or a Courant
// number above BlowUpLimit.
type BlowUpError struct {
	Time    float64 // s, simulated time at the end of the failed step
	Step    int     // number of the failed step
	X, Z    float64 // m, where it was detected
	Y       float64 // m, where it was detected across the span
	Span    bool    // the run is three-dimensional and Y is meaningful
	Courant float64 // Courant number of the failed step (NaN for NaN values)
	Cause   string  // most likely cause, in words
	// Fix is what to change, in the caller's terms (the solver knows the
	// step it was given, not how it was chosen); "" leaves it out.
	Fix string
}

func (e *BlowUpError) Error() string {
	msg := fmt.Sprintf("the run blew up at t = %.6g s (step %d) near x = %.4g m, z = %.4g m (Courant number %.3g): %s",
		e.Time, e.Step, e.X, e.Z, e.Courant, e.Cause)
	if e.Span {
		msg = fmt.Sprintf("the run blew up at t = %.6g s (step %d) near x = %.4g m, y = %.4g m, z = %.4g m (Courant number %.3g): %s",
			e.Time, e.Step, e.X, e.Y, e.Z, e.Courant, e.Cause)
	}
	if e.Fix != "" {
		msg += "; " + e.Fix
	}
	return msg
}

// NextStep returns the step size the next call to Step would take, from the
// advective Courant limit, the explicit horizontal-diffusion limit and
// Config.MaxStep.
func (s *Solver) NextStep() float64 {
	dt := math.Inf(1)
	rate := s.cachedRate
	if !s.rateFresh {
		rate = s.courantRate()
	}
	if rate > 0 {
		dt = s.cfg.CFL / rate
	}
	if d := s.diffusionLimit(); d < dt {
		dt = d
	}
	if s.cfg.MaxStep > 0 && s.cfg.MaxStep < dt {
		dt = s.cfg.MaxStep
	}
	return dt
}

// diffusionLimit bounds the step for the explicitly treated horizontal
// diffusion: RK3 is stable for real eigenvalues down to about −2.5/Δt; the
// largest is about −2 ν_max k_max² (common practice, no source), so the
// bound keeps a safety factor of about 1.25.
func (s *Solver) diffusionLimit() float64 {
	numax := 0.0
	for _, v := range s.nuC {
		numax = math.Max(numax, v)
	}
	if s.ny > 1 {
		return 1.0 / (numax * (s.kmax*s.kmax + s.kmaxY*s.kmaxY))
	}
	return 1.0 / (numax * s.kmax * s.kmax)
}

// Step advances the solution by one adaptive step (see NextStep).
func (s *Solver) Step() error {
	return s.StepBy(s.NextStep())
}

// StepBy advances the solution by one step of dt seconds. It returns a
// *BlowUpError when the new state holds NaN values or its Courant number
// with this step exceeds BlowUpLimit.
func (s *Solver) StepBy(dt float64) error {
	if !(dt > 0) || math.IsInf(dt, 0) {
		panic(fmt.Sprintf("solver: step %g s: need a finite step > 0", dt))
	}
	for _, sc := range s.sc {
		b := &sc.budget
		b.StepTopIn, b.StepBedIn, b.StepElement = 0, 0, 0
	}
	for k := range rk3 {
		s.stageNo = k
		c := rk3[k]
		s.st = stageCoef{dt: dt, alpha: c.alpha, beta: c.beta, gamma: c.gamma, zeta: c.zeta,
			tNow: s.t + c.cNow*dt, tNext: s.t + c.cNext*dt}
		s.stage()
	}
	s.closeScalarStep(dt)
	s.gradPi += s.bulkShift / dt
	s.bulkShift = 0
	s.t += dt
	s.dt = dt
	s.steps++
	return s.checkHealth(dt)
}

// stage runs one Runge–Kutta stage: closure and explicit fluxes, their
// x-derivatives, implicit vertical diffusion, projection.
func (s *Solver) stage() {
	s.crew.run(s.explicitTask)
	s.crew.run(s.xderivTask)
	s.crew.run(s.implicitTask)
	s.closeScalarStage()
	s.inStage = true
	s.project((s.st.alpha + s.st.beta) * s.st.dt)
}

// project makes the predicted velocity in vel.Real() divergence-free, with
// the correction u ← u* − c ∇φ, and refreshes the x-derivatives and the
// pressure gradient: forward transforms, the Poisson solves split by modes,
// then the correction and the inverse transforms split by rows.
func (s *Solver) project(c float64) {
	s.projC = c
	s.crew.run(s.fwdTask)
	s.crew.run(s.projectTask)
	s.crew.run(s.correctTask)
}

// explicitPart computes, for its share of levels and level by level, the
// closure (ν + ν_t and the drag rate at the centres) and the explicit
// fluxes: the x-fluxes into flux.Real() and the z-fluxes gu (faces) and cz
// (centres),
//
//	u-equation: x-flux A  = u u − 2ν ∂u/∂x,       z-flux gu = u w − ν ∂w/∂x
//	w-equation: x-flux Gw = u w − ν (∂u/∂z + ∂w/∂x), z-flux cz = w w − ν ∂w/∂z
//
// and those of the scalars. The remaining ∂/∂z(ν ∂u/∂z) and ∂/∂z(ν ∂w/∂z)
// are implicit. For constant ν the explicit viscous parts reduce to
// ν ∂²/∂x² exactly, through the discrete continuity equation.
//
// The part owns the centres [k0, k1) and the faces [k0, k1) (and the top
// face Nz in the last part). Face k0 needs the closure of the level below
// it, which the part before computes at the same time, so the part
// computes its own copy of that level into a private buffer.
func (s *Solver) explicitPart(part int) {
	nx, nz := s.np, s.nz // nx: values in a level
	if s.stageNo == 0 && len(s.sc) > 0 {
		s.scalarRatesPart(part)
	}
	closure, drag := s.cfg.Closure.Cs > 0, s.cfg.Drag != nil
	k0, k1 := s.levelSpans[part][0], s.levelSpans[part][1]
	var nuBelow, dragBelow []float64
	if k0 > 0 {
		r := (k0 - 1) * nx
		nuBelow = s.nuC[r : r+nx]
		if closure {
			nuBelow = s.halo[part][:nx]
			s.eddyViscosityRow(k0-1, nuBelow)
		}
		if drag {
			dragBelow = s.zeroRow
			if s.dragRow[k0-1] {
				dragBelow = s.halo[part][nx : 2*nx]
				s.dragRateRow(k0-1, dragBelow)
			}
		}
	}
	for k := k0; k < k1; k++ {
		r := k * nx
		if closure {
			s.eddyViscosityRow(k, s.nuC[r:r+nx])
		}
		if drag && s.dragRow[k] {
			s.dragRateRow(k, s.dragC[r:r+nx])
		}
		s.centreFluxRow(k)
		if s.ny > 1 {
			s.spanCentreFluxRow(k)
		}
		if k == 0 {
			s.wallFluxRow(0)
			continue
		}
		if k > k0 {
			nuBelow = s.nuC[r-nx : r]
			if drag {
				dragBelow = s.dragC[r-nx : r]
			}
		}
		s.faceFluxRow(k, nuBelow, dragBelow)
	}
	if k1 == nz {
		s.wallFluxRow(nz)
	}
}

// centreFluxRow computes the centre fluxes of level k: A and cz, and each
// scalar's x-flux u c − K ∂c/∂x, K = D + ν_t/Sc_t.
func (s *Solver) centreFluxRow(k int) {
	g, nx := s.g, s.np // nx: values in a level
	r := k * nx
	dz := g.Dz[k]
	lo, hi, idz := (g.Zf[k+1]-g.Zc[k])/dz, (g.Zc[k]-g.Zf[k])/dz, 1/dz
	centreRow(lo, hi, idz, s.u[r:r+nx], s.ux[r:r+nx], s.nuC[r:r+nx], s.w[r:r+nx], s.w[r+nx:r+2*nx],
		s.flux.Real()[r:r+nx], s.cz[r:r+nx])
	nu := s.cfg.Viscosity
	for _, sc := range s.sc {
		scalarXFlux(sc.cfg.Diffusivity, nu, sc.invSct, s.u[r:r+nx], s.nuC[r:r+nx], sc.c[r:r+nx], sc.cx[r:r+nx], sc.fx[r:r+nx])
	}
}

// faceFluxRow computes the fluxes at interior face j: gu and Gw, each
// scalar's advective z-flux w c, and the face viscosity and drag rate
// interpolated from the centres, nuBelow and dragBelow holding those of
// level j−1 (dragBelow nil without drag).
func (s *Solver) faceFluxRow(j int, nuBelow, dragBelow []float64) {
	g, nx, nz := s.g, s.np, s.nz // nx: values in a level
	r := j * nx
	h := g.Hf[j]
	a, b, ih := (g.Zc[j]-g.Zf[j])/h, (g.Zf[j]-g.Zc[j-1])/h, 1/h
	nuf := s.nuF[r : r+nx]
	if s.cfg.Closure.Cs > 0 {
		interpRow(a, b, nuBelow, s.nuC[r:r+nx], nuf)
	}
	if dragBelow != nil && s.dragFace[j] {
		interpRow(a, b, dragBelow, s.dragC[r:r+nx], s.dragF[r:r+nx])
	}
	faceRow(a, b, ih, s.u[r-nx:r], s.u[r:r+nx], s.w[r:r+nx], s.wx[r:r+nx], nuf, s.gu[r:r+nx], s.flux.Real()[nz*nx+r:nz*nx+r+nx])
	for _, sc := range s.sc {
		scalarZFlux(a, b, s.w[r:r+nx], sc.c[r-nx:r], sc.c[r:r+nx], sc.gc[r:r+nx])
	}
	if s.ny > 1 {
		faceRow(a, b, ih, s.v[r-nx:r], s.v[r:r+nx], s.w[r:r+nx], s.wy[r:r+nx], nuf, s.gv[r:r+nx], s.fluxY.Real()[nz*nx+r:nz*nx+r+nx])
	}
}

// wallFluxRow clears the z-fluxes at the wall face j (0 or Nz): w = 0 there
// and the wall stresses are in the implicit operator.
func (s *Solver) wallFluxRow(j int) {
	nx, nz := s.np, s.nz // nx: values in a level
	r := j * nx
	clear(s.flux.Real()[nz*nx+r : nz*nx+r+nx])
	clear(s.gu[r : r+nx])
	if s.ny > 1 {
		clear(s.fluxY.Real()[nz*nx+r : nz*nx+r+nx])
		clear(s.gv[r : r+nx])
	}
	for _, sc := range s.sc {
		clear(sc.gc[r : r+nx])
	}
}

// xderivPart replaces the x-fluxes in its share of flux rows by their
// dealiased x-derivatives.
func (s *Solver) xderivPart(part int) {
	if s.ny > 1 {
		s.spanDerivPart(part)
		return
	}
	s.flux.ForwardPart(part)
	lo, hi := s.flux.PartRows(part)
	spec := s.flux.Spec()
	for r := lo; r < hi; r++ {
		s.ikRow(spec[r*s.nc:(r+1)*s.nc], spec[r*s.nc:(r+1)*s.nc])
	}
	s.flux.InversePart(part)
}

// ikRow sets dst = i k src for the kept modes and zero above the 2/3 cut.
func (s *Solver) ikRow(dst, src []complex128) {
	for m := 0; m <= s.kcut; m++ {
		v := src[m]
		dst[m] = complex(-s.kx[m]*imag(v), s.kx[m]*real(v))
	}
	clear(dst[s.kcut+1:])
}

// implicitPart assembles the explicit terms and solves the implicit vertical
// diffusion for its share of columns, writing the predicted velocity into
// vel.Real(). Per column, the stage is
//
//	(I − βΔt L) u* = u + Δt (α L u + γ N + ζ N_prev)
//
// with L the vertical diffusion operator including the wall closures.
//
// The tridiagonal solves run level by level across a block of implicitBlock
// columns. The forward elimination of the Thomas algorithm writes its values
// over the field row by row (keeping the old row in a per-worker buffer for
// the level above), and the back substitution finishes in place while the
// block is still in the core's own cache. Levels without elements read a row
// of zeros for their drag and uptake rates, the first stage (ζ = 0) does not
// read N_prev and the last does not store N for a next stage.
func (s *Solver) implicitPart(part int) {
	i0, i1 := span(s.np, s.crew.n, part)
	for _, sc := range s.sc {
		clear(sc.parts[part])
	}
	for b := i0; b < i1; b += implicitBlock {
		e := min(b+implicitBlock, i1)
		if s.bedSpeed != nil {
			s.fillBedSpeed(part, b, e)
		}
		s.implicitU(b, e, part)
		if s.ny > 1 {
			s.implicitV(b, e, part)
		}
		s.implicitW(b, e, part)
		if len(s.sc) > 0 {
			s.implicitScalars(part, b, e)
		}
	}
}

// implicitBlock is the number of columns the implicit tridiagonal solves take
// together: a block of their rows (two arrays of Nz of them) stays in a
// core's cache between the forward elimination and the back substitution.
const implicitBlock = 256

// explicitStore returns the stored N_prev to read and the store for N:
// the first stage (ζ = 0) reads none and the last stores none (nil).
func (s *Solver) explicitStore(stored []float64) (read, write []float64) {
	read, write = stored, stored
	if s.st.zeta == 0 {
		read = nil
	}
	if s.stageNo == len(rk3)-1 {
		write = nil
	}
	return read, write
}

// thomasFor returns the worker's elimination arguments for the columns
// [i0, i1) with the stage's coefficients, for momentum (D = ν = 0, s = 1,
// c_w = 0).
func (s *Solver) thomasFor(part, i0, i1 int) *thomasArgs {
	a := &s.thomas[part]
	st := &s.st
	n := i1 - i0
	*a = thomasArgs{nx: s.np, n: n, old: s.rowOld[part][:n], zero: s.zeroRow[:n], scratch: s.rowScratch[part][:n],
		row: s.rowCoef[part]}
	a.coef[coefDt], a.coef[coefAl], a.coef[coefGa], a.coef[coefZe] = st.dt, st.alpha, st.gamma, st.zeta
	a.coef[coefCdt], a.coef[coefBdt] = (st.alpha+st.beta)*st.dt, st.beta*st.dt
	a.coef[coefIsct] = 1
	return a
}

// Vertical-diffusion geometry, per level: the operator's coefficients are
// ν at the neighbouring face (centre) times these, zero where a neighbour is
// a wall.
func (s *Solver) setupImplicit() {
	g, nz := s.g, s.nz
	s.gUlo, s.gUup = make([]float64, nz), make([]float64, nz)
	for k := 0; k < nz; k++ {
		if k > 0 {
			s.gUlo[k] = 1 / (g.Hf[k] * g.Dz[k])
		}
		if k < nz-1 {
			s.gUup[k] = 1 / (g.Hf[k+1] * g.Dz[k])
		}
	}
	s.gWlo, s.gWup = make([]float64, nz+1), make([]float64, nz+1)
	for j := 1; j < nz; j++ {
		s.gWlo[j] = 1 / (g.Dz[j-1] * g.Hf[j])
		s.gWup[j] = 1 / (g.Dz[j] * g.Hf[j])
	}
	s.zeroRow = make([]float64, s.np)
	s.rowOld, s.rowScratch = make([][]float64, s.crew.n), make([][]float64, s.crew.n)
	s.rowCoef, s.thomas = make([][]float64, s.crew.n), make([]thomasArgs, s.crew.n)
	for p := range s.rowOld {
		s.rowOld[p], s.rowScratch[p] = make([]float64, s.np), make([]float64, s.np)
		s.rowCoef[p] = make([]float64, (nz+1)*thomasRowLen)
	}
	s.halo = make([][]float64, s.crew.n)
	for p := range s.halo {
		s.halo[p] = make([]float64, 2*s.np)
	}
	cost := make([]float64, nz)
	for k := range cost {
		cost[k] = 1
		if s.dragRow != nil && s.dragRow[k] {
			cost[k] += dragLevelCost
		}
	}
	s.levelSpans = weightedSpans(cost, s.crew.n)
}

// dragLevelCost is the extra cost of the flux phase at a level with canopy
// drag (the drag rate and its face values), relative to a level without:
// measured with BenchmarkPhases at 512×128.
const dragLevelCost = 1.0

// wallTerms returns the extra operator coefficients of level k from the
// wall closures: on the diagonal, below and above, the affine part now and
// at the stage's end, and the rough-wall rate per unit |u|.
func (s *Solver) wallTerms(k int) (di, lo, up, affNow, affNext, rough float64) {
	nz, nu, st := s.nz, s.cfg.Viscosity, &s.st
	dz := s.g.Dz[k]
	bed, top := s.cfg.Bed, s.cfg.Top
	if k == 0 {
		switch bed.Kind {
		case NoSlip:
			di -= nu * s.bedA / dz
			up += nu * s.bedB / dz
			f := nu * (s.bedA - s.bedB) / dz
			affNow, affNext = f*bed.SpeedAt(st.tNow), f*bed.SpeedAt(st.tNext)
		case Rough:
			rough = s.roughC / dz
		}
	}
	if k == nz-1 && top.Kind == NoSlip {
		di -= nu * s.topA / dz
		lo += nu * s.topB / dz
		f := nu * (s.topA - s.topB) / dz
		affNow += f * top.SpeedAt(st.tNow)
		affNext += f * top.SpeedAt(st.tNext)
	}
	return di, lo, up, affNow, affNext, rough
}

// implicitU solves the u rows for columns [i0, i1).
func (s *Solver) implicitU(i0, i1, part int) {
	s.implicitAlong(i0, i1, part, s.u, s.flux.Real(), s.gu, s.px, s.nU, true)
}

// implicitAlong solves the rows of a velocity component along the bed (u,
// or v in three dimensions) for columns [i0, i1): f is the component, ax
// the plan buffer whose first Nz levels hold its horizontal flux
// derivative, gz its z-flux at the faces, pg its pressure gradient and
// stored its explicit terms of the previous stage. The mean pressure
// gradient, the body force and the wall speeds act on u (streamwise)
// only.
func (s *Solver) implicitAlong(i0, i1, part int, f, ax, gz, pg, stored []float64, streamwise bool) {
	nx, nz := s.np, s.nz // nx: values in a level
	st := &s.st
	a := s.thomasFor(part, i0, i1)
	for k := 0; k < nz; k++ {
		dX, lX, uX, affNow, affNext, rough := s.wallTerms(k)
		force := s.stageGradient()
		if s.cfg.BodyForce != nil {
			force += s.cfg.BodyForce[k]
		}
		if !streamwise {
			force, affNow, affNext = 0, 0, 0
		}
		rc := a.row[k*thomasRowLen : (k+1)*thomasRowLen]
		rc[rowGl], rc[rowGu], rc[rowIdz] = s.gUlo[k], s.gUup[k], s.invDz[k]
		rc[rowDX], rc[rowLX], rc[rowUX] = dX, lX, uX
		rc[rowForce], rc[rowExtra] = force, st.dt*(st.alpha*affNow+st.beta*affNext)
		rc[rowRough], rc[rowAff] = rough, 0
	}
	// At the bed and the top the neighbour rows fold onto the row itself;
	// their coefficients are zero there.
	a.k0, a.k1, a.kLo, a.kHi = 0, nz, 0, nz-1
	a.f, a.cp = f[i0:], s.cpU[i0:]
	a.cb, a.ct = s.nuF[i0:], s.nuF[nx+i0:]
	a.ax, a.gb, a.gt, a.px = ax[i0:nz*nx], gz[i0:], gz[nx+i0:], pg[i0:]
	a.nRead, a.nWrite = s.explicitStore(stored[i0:])
	if s.dragC != nil {
		a.rate, a.rateOn = s.dragC[i0:], s.dragRow
	}
	if s.bedSpeed != nil {
		a.speed = s.bedSpeed[part][:a.n]
	}
	a.eliminate()
	backSubstitute(f, s.cpU, nx, i0, a.n, 0, nz)
}

// implicitW solves the interior w rows for columns [i0, i1); w = 0 on the
// wall rows 0 and Nz, so every interior row has the same form, and the
// forward elimination starts from row 0 (zero, as are its cp).
func (s *Solver) implicitW(i0, i1, part int) {
	nx, nz := s.np, s.nz // nx: values in a level
	a := s.thomasFor(part, i0, i1)
	for j := 1; j < nz; j++ {
		rc := a.row[j*thomasRowLen : (j+1)*thomasRowLen]
		clear(rc)
		rc[rowGl], rc[rowGu], rc[rowIdz] = s.gWlo[j], s.gWup[j], s.invHf[j]
	}
	a.k0, a.k1, a.kLo, a.kHi = 1, nz, 0, nz
	a.f, a.cp = s.w[i0:], s.cpW[i0:]
	a.cb, a.ct = s.nuC[i0:], s.nuC[nx+i0:]
	a.ax, a.gb, a.gt, a.px = s.flux.Real()[nz*nx+nx+i0:], s.cz[i0:], s.cz[nx+i0:], s.pz[nx+i0:]
	a.nRead, a.nWrite = s.explicitStore(s.nW[nx+i0:])
	if s.dragF != nil {
		a.rate, a.rateOn = s.dragF[nx+i0:], s.dragFace
	}
	a.eliminate()
	backSubstitute(s.w, s.cpW, nx, i0, a.n, 1, nz)
}

func (s *Solver) forwardVelPart(part int) { s.vel.ForwardPart(part) }

// TransformsPerStep returns the number of single-field transforms one step
// makes (forward and inverse; a field is one Nz- or (Nz+1)-level array):
// per stage, forward the x-fluxes and the predicted velocity and scalars,
// inverse the flux derivatives, the velocity and scalars, their
// x-derivatives and the pressure gradient; in three dimensions also
// forward the y-fluxes and inverse the y-derivatives.
func (s *Solver) TransformsPerStep() (forward, inverse int) {
	if s.ny > 1 {
		// forward: x- and y-fluxes, the predicted fields; inverse: flux
		// divergences, the fields, x- and y-derivatives, three pressure
		// gradients.
		f := 3 + len(s.sc) // u, v, w and each scalar
		return len(rk3) * 3 * f, len(rk3) * (4*f + 3)
	}
	f := 2 + len(s.sc) // u, w and each scalar
	return len(rk3) * 2 * f, len(rk3) * (3*f + 2)
}

// TransformYardstick runs the transforms of reps steps alone, on the
// solver's own plans and workers, and returns the time they took: the cost
// a step cannot go below. It leaves the solver's state unchanged only in
// the sense that the plan buffers are scratch; call it before setting the
// initial state or after saving it.
func (s *Solver) TransformYardstick(reps int) time.Duration {
	t0 := time.Now()
	for range reps * len(rk3) {
		s.crew.run(s.yardTask)
	}
	return time.Since(t0)
}

func (s *Solver) yardPart(part int) {
	s.flux.ForwardPart(part)
	s.flux.InversePart(part)
	s.vel.ForwardPart(part)
	s.vel.InversePart(part)
	s.deriv.InversePart(part)
	s.pgrad.InversePart(part)
	if s.ny > 1 {
		s.fluxY.ForwardPart(part)
		s.derivY.InversePart(part)
	}
}
