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
	Courant float64 // Courant number of the failed step (NaN for NaN values)
	Cause   string  // most likely cause, in words
}

func (e *BlowUpError) Error() string {
	return fmt.Sprintf("the run blew up at t = %.6g s (step %d) near x = %.4g m, z = %.4g m (Courant number %.3g): %s",
		e.Time, e.Step, e.X, e.Z, e.Courant, e.Cause)
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

// stage runs one Runge–Kutta stage: explicit fluxes, implicit vertical
// diffusion, projection.
func (s *Solver) stage() {
	if s.needsClosurePhase() {
		s.pool.run(s.closureTask)
	}
	s.pool.run(s.fluxTask)
	s.pool.run(s.xderivTask)
	s.pool.run(s.implicitTask)
	s.closeScalarStage()
	s.inStage = true
	s.project((s.st.alpha + s.st.beta) * s.st.dt)
}

// project makes the predicted velocity in vel.Real() divergence-free, with
// the correction u ← u* − c ∇p, and refreshes the x-derivatives.
func (s *Solver) project(c float64) {
	s.projC = c
	s.pool.run(s.fwdTask)
	s.pool.run(s.projectTask)
	s.pool.run(s.invTask)
}

// fluxPart computes, for its share of rows, the x-fluxes into flux.Real()
// and the z-fluxes gu (faces) and cz (centres):
//
//	u-equation: x-flux A  = u u − 2ν ∂u/∂x,       z-flux gu = u w − ν ∂w/∂x
//	w-equation: x-flux Gw = u w − ν (∂u/∂z + ∂w/∂x), z-flux cz = w w − ν ∂w/∂z
//
// The remaining ∂/∂z(ν ∂u/∂z) and ∂/∂z(ν ∂w/∂z) are implicit. For constant
// ν the explicit viscous parts reduce to ν ∂²/∂x² exactly, through the
// discrete continuity equation.
func (s *Solver) fluxPart(part int) {
	g, nx, nz := s.g, s.nx, s.nz
	u, w, ux, wx := s.u, s.w, s.ux, s.wx
	fr := s.flux.Real()
	fA, fG := fr[:nz*nx], fr[nz*nx:]
	// centres
	k0, k1 := span(nz, s.pool.n, part)
	for k := k0; k < k1; k++ {
		dz := g.Dz[k]
		lo, hi := (g.Zf[k+1]-g.Zc[k])/dz, (g.Zc[k]-g.Zf[k])/dz
		r := k * nx
		for i := r; i < r+nx; i++ {
			uu := u[i]
			fA[i] = uu*uu - 2*s.nuC[i]*ux[i]
			wc := lo*w[i] + hi*w[i+nx]
			s.cz[i] = wc*wc - s.nuC[i]*(w[i+nx]-w[i])/dz
		}
	}
	// faces
	j0, j1 := span(nz+1, s.pool.n, part)
	for j := j0; j < j1; j++ {
		r := j * nx
		if j == 0 || j == nz {
			clear(fG[r : r+nx])
			clear(s.gu[r : r+nx])
			continue
		}
		h := g.Hf[j]
		a, b := (g.Zc[j]-g.Zf[j])/h, (g.Zf[j]-g.Zc[j-1])/h
		if s.cfg.Closure.Cs > 0 {
			for i := r; i < r+nx; i++ {
				s.nuF[i] = a*s.nuC[i-nx] + b*s.nuC[i]
			}
		}
		if s.dragF != nil {
			for i := r; i < r+nx; i++ {
				s.dragF[i] = a*s.dragC[i-nx] + b*s.dragC[i]
			}
		}
		for i := r; i < r+nx; i++ {
			ub, ut := u[i-nx], u[i]
			uw := (a*ub + b*ut) * w[i]
			nwx := s.nuF[i] * wx[i]
			s.gu[i] = uw - nwx
			fG[i] = uw - nwx - s.nuF[i]*(ut-ub)/h
		}
	}
	if len(s.sc) > 0 {
		s.scalarFluxPart(part)
	}
}

// xderivPart replaces the x-fluxes in its share of flux rows by their
// dealiased x-derivatives.
func (s *Solver) xderivPart(part int) {
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
func (s *Solver) implicitPart(part int) {
	i0, i1 := span(s.nx, s.pool.n, part)
	s.implicitU(i0, i1)
	s.implicitW(i0, i1)
	if len(s.sc) > 0 {
		s.implicitScalars(part, i0, i1)
	}
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
	if s.dragC == nil {
		s.zeroC, s.zeroF = make([]float64, nz*s.nx), make([]float64, (nz+1)*s.nx)
	}
}

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

func (s *Solver) implicitU(i0, i1 int) {
	nx, nz := s.nx, s.nz
	st := &s.st
	dt, al, be, ga, ze := st.dt, st.alpha, st.beta, st.gamma, st.zeta
	u := s.u
	dAdx := s.flux.Real()[:nz*nx]
	cp, dp := s.cpU, s.dpU
	drag := s.dragC
	if drag == nil {
		drag = s.zeroC
	}
	cdt, bdt := (al+be)*dt, be*dt
	// At the bed and the top the neighbour rows rb, ra fold onto the row
	// itself; their coefficients are zero there, so nothing is read twice.
	for k := 0; k < nz; k++ {
		r, rb, ra := k*nx, max(k-1, 0)*nx, min(k+1, nz-1)*nx
		gl, gu, idz := s.gUlo[k], s.gUup[k], s.invDz[k]
		dX, lX, uX, affNow, affNext, rough := s.wallTerms(k)
		force := s.gradPi
		if s.cfg.BodyForce != nil {
			force += s.cfg.BodyForce[k]
		}
		extra := dt * (al*affNow + be*affNext)
		for i := i0; i < i1; i++ {
			p := r + i
			lo := s.nuF[p]*gl + lX
			up := s.nuF[p+nx]*gu + uX
			di := dX - s.nuF[p]*gl - s.nuF[p+nx]*gu - rough*math.Abs(u[p])
			lu := di*u[p] + lo*u[rb+i] + up*u[ra+i]
			n := force - dAdx[p] - (s.gu[p+nx]-s.gu[p])*idz
			rhs := u[p] + dt*(al*lu+ga*n+ze*s.nU[p]) + extra - cdt*s.px[p]
			s.nU[p] = n
			a, c := -bdt*lo, -bdt*up
			den := 1 / (1 - bdt*di + cdt*drag[p] - a*cp[rb+i])
			cp[p] = c * den
			dp[p] = (rhs - a*dp[rb+i]) * den
		}
	}
	r := (nz - 1) * nx
	copy(u[r+i0:r+i1], dp[r+i0:r+i1])
	for k := nz - 2; k >= 0; k-- {
		r := k * nx
		for i := r + i0; i < r+i1; i++ {
			u[i] = dp[i] - cp[i]*u[i+nx]
		}
	}
}

func (s *Solver) implicitW(i0, i1 int) {
	nx, nz := s.nx, s.nz
	st := &s.st
	dt, al, be, ga, ze := st.dt, st.alpha, st.beta, st.gamma, st.zeta
	w := s.w
	dGdx := s.flux.Real()[nz*nx:]
	cp, dp := s.cpW, s.dpW // row 0 stays zero: w = 0 at the bed
	drag := s.dragF
	if drag == nil {
		drag = s.zeroF
	}
	cdt, bdt := (al+be)*dt, be*dt
	// w = 0 on the wall rows 0 and Nz, so every interior row has the same
	// form; the wall neighbours contribute nothing.
	for j := 1; j < nz; j++ {
		r := j * nx
		gl, gu, ih := s.gWlo[j], s.gWup[j], s.invHf[j]
		for i := r + i0; i < r+i1; i++ {
			lo := s.nuC[i-nx] * gl
			up := s.nuC[i] * gu
			di := -(lo + up)
			lw := di*w[i] + lo*w[i-nx] + up*w[i+nx]
			n := -dGdx[i] - (s.cz[i]-s.cz[i-nx])*ih
			rhs := w[i] + dt*(al*lw+ga*n+ze*s.nW[i]) - cdt*s.pz[i]
			s.nW[i] = n
			a, c := -bdt*lo, -bdt*up
			den := 1 / (1 - bdt*di + cdt*drag[i] - a*cp[i-nx])
			cp[i] = c * den
			dp[i] = (rhs - a*dp[i-nx]) * den
		}
	}
	for j := nz - 1; j >= 1; j-- {
		r := j * nx
		for i := r + i0; i < r+i1; i++ {
			w[i] = dp[i] - cp[i]*w[i+nx]
		}
	}
}

func (s *Solver) forwardVelPart(part int) { s.vel.ForwardPart(part) }

func (s *Solver) inversePart(part int) {
	s.vel.InversePart(part)
	s.deriv.InversePart(part)
	s.pgrad.InversePart(part)
}

// TransformsPerStep returns the number of single-field transforms one step
// makes (forward and inverse; a field is one Nz- or (Nz+1)-row array):
// per stage, forward the x-fluxes and the predicted velocity and scalars,
// inverse the flux derivatives, the velocity and scalars, their
// x-derivatives and the pressure gradient.
func (s *Solver) TransformsPerStep() (forward, inverse int) {
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
		s.pool.run(s.yardTask)
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
}
