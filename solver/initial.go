package solver

import (
	"errors"
	"math"
	"math/rand/v2"
)

// SetVelocityFunc sets u(x, z) at the cell centres and w(x, z) at the
// interior faces (w stays zero at the bed and the top), the same at every y
// with v = 0 in three dimensions, then projects. Either function may be nil
// for zero.
func (s *Solver) SetVelocityFunc(fu, fw func(x, z float64) float64) {
	g, nx, np := s.g, s.nx, s.np
	for k := 0; k < s.nz; k++ {
		for i := 0; i < np; i++ {
			v := 0.0
			if fu != nil {
				v = fu(g.X[i%nx], g.Zc[k])
			}
			s.u[k*np+i] = v
		}
	}
	for j := 0; j <= s.nz; j++ {
		for i := 0; i < np; i++ {
			v := 0.0
			if fw != nil && j > 0 && j < s.nz {
				v = fw(g.X[i%nx], g.Zf[j])
			}
			s.w[j*np+i] = v
		}
	}
	clear(s.v)
	s.Project()
}

// SetVelocity copies u (Nz levels of Ny·Nx values at centres) and w (Nz+1
// levels at faces) into the state, sets v = 0 in three dimensions, and
// projects.
func (s *Solver) SetVelocity(u, w []float64) error {
	return s.SetVelocity3(u, nil, w)
}

// SetVelocity3 is SetVelocity with the spanwise velocity v (Nz levels of
// Ny·Nx values at centres; nil for zero, and nil in the slice).
func (s *Solver) SetVelocity3(u, v, w []float64) error {
	if len(u) != len(s.u) || len(w) != len(s.w) || v != nil && len(v) != len(s.v) {
		return errors.New("solver: SetVelocity: u and v need Nz·Ny·Nx and w (Nz+1)·Ny·Nx values (Ny = 1 in the slice, without v)")
	}
	copy(s.u, u)
	copy(s.w, w)
	clear(s.v)
	copy(s.v, v)
	nx := s.np // values in a level
	clear(s.w[:nx])
	clear(s.w[s.nz*nx:])
	s.Project()
	return nil
}

// SetMeanProfile sets u(x, y, z) = U(z), v = w = 0, from Nz values at the
// centres.
func (s *Solver) SetMeanProfile(prof []float64) {
	for k := 0; k < s.nz; k++ {
		row := s.u[k*s.np : (k+1)*s.np]
		for i := range row {
			row[i] = prof[k]
		}
	}
	clear(s.w)
	clear(s.v)
	s.Project()
}

// LaminarProfile returns the discrete steady laminar profile U(z) at the
// centres for the configured viscosity, walls and forcing: the solution of
// ν d²U/dz² + Π = 0 with the scheme's own wall closures, so that a run
// started from it stays steady to round-off. For FixedBulk, Π is chosen so
// that the depth mean is the target; it is returned as well.
func (s *Solver) LaminarProfile() (prof []float64, gradient float64, err error) {
	bed, top := s.cfg.Bed, s.cfg.Top
	if bed.Kind == FreeSlip && top.Kind == FreeSlip {
		return nil, 0, errors.New("solver: a laminar profile needs a no-slip or rough wall: with free slip at the bed and the top no steady state exists")
	}
	pi := s.cfg.Forcing.Gradient
	if s.cfg.Forcing.Kind == FixedBulk {
		// The profile is affine in Π: U = U_walls + Π U_1 (linear walls) and
		// found by secant iteration for a rough bed.
		target := s.cfg.Forcing.Bulk
		f := func(p float64) (float64, []float64) {
			u := s.laminarColumn(p)
			return s.depthMean(u) - target, u
		}
		p0, p1 := 0.0, 1.0
		f0, _ := f(p0)
		f1, u := f(p1)
		for it := 0; it < 100 && f1 != 0 && f1 != f0; it++ {
			p2 := p1 - f1*(p1-p0)/(f1-f0)
			p0, f0 = p1, f1
			p1 = p2
			f1, u = f(p1)
			if math.Abs(f1) <= 1e-15*math.Max(math.Abs(target), 1e-30) {
				break
			}
		}
		return u, p1, nil
	}
	return s.laminarColumn(pi), pi, nil
}

func (s *Solver) depthMean(u []float64) float64 {
	sum := 0.0
	for k, v := range u {
		sum += v * s.g.Dz[k]
	}
	return sum / s.cfg.H
}

// laminarColumn solves L U = −Π for one column with constant ν (iterating
// the wall stress for a rough bed).
func (s *Solver) laminarColumn(pi float64) []float64 {
	g, nz, nu := s.g, s.nz, s.cfg.Viscosity
	bed, top := s.cfg.Bed, s.cfg.Top
	u := make([]float64, nz)
	lo, di, up, rhs := make([]float64, nz), make([]float64, nz), make([]float64, nz), make([]float64, nz)
	iters := 1
	ucoef := 0.0 // bed velocity the rough-wall stress coefficient is taken at
	if bed.Kind == Rough {
		iters = 500
		ucoef = math.Sqrt(math.Abs(pi)*s.cfg.H) / Karman
	}
	for it := 0; it < iters; it++ {
		for k := 0; k < nz; k++ {
			dz := g.Dz[k]
			lo[k], up[k] = 0, 0
			if k > 0 {
				lo[k] = nu / (g.Hf[k] * dz)
			}
			if k < nz-1 {
				up[k] = nu / (g.Hf[k+1] * dz)
			}
			di[k] = -(lo[k] + up[k])
			rhs[k] = -pi
		}
		switch bed.Kind {
		case NoSlip:
			dz := g.Dz[0]
			di[0] -= nu * s.bedA / dz
			up[0] += nu * s.bedB / dz
			rhs[0] -= nu * (s.bedA - s.bedB) / dz * bed.SpeedAt(0)
		case Rough:
			di[0] -= s.roughC * math.Abs(ucoef) / g.Dz[0]
		}
		if top.Kind == NoSlip {
			dz := g.Dz[nz-1]
			di[nz-1] -= nu * s.topA / dz
			lo[nz-1] += nu * s.topB / dz
			rhs[nz-1] -= nu * (s.topA - s.topB) / dz * top.SpeedAt(0)
		}
		thomas(lo, di, up, rhs, u)
		if bed.Kind != Rough {
			break
		}
		// The wall stress is quadratic in U₁: averaging the coefficient's
		// velocity with the new one makes the fixed-point iteration converge.
		if math.Abs(u[0]-ucoef) <= 1e-14*math.Abs(u[0]) {
			break
		}
		ucoef = 0.5 * (ucoef + u[0])
	}
	return u
}

// thomas solves the tridiagonal system lo[k] x[k−1] + di[k] x[k] +
// up[k] x[k+1] = rhs[k]; rhs is overwritten.
func thomas(lo, di, up, rhs, x []float64) {
	n := len(di)
	cp := make([]float64, n)
	cp[0] = up[0] / di[0]
	rhs[0] /= di[0]
	for k := 1; k < n; k++ {
		den := di[k] - lo[k]*cp[k-1]
		cp[k] = up[k] / den
		rhs[k] = (rhs[k] - lo[k]*rhs[k-1]) / den
	}
	x[n-1] = rhs[n-1]
	for k := n - 2; k >= 0; k-- {
		x[k] = rhs[k] - cp[k]*x[k+1]
	}
}

// Perturb adds seeded random, divergence-free velocity perturbations inside
// a layer centred at height at (m) with Gaussian half-width width (m),
// scaled so that the largest rms over a level of the added u′ is amp (m/s).
// In three dimensions v gets perturbations too. The same seed on the same
// grid gives the same numbers.
func (s *Solver) Perturb(amp, at, width float64, seed uint64) {
	if amp == 0 {
		return
	}
	g, nx, nz := s.g, s.np, s.nz // nx: values in a level
	rng := rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15))
	du := make([]float64, nz*nx)
	dw := make([]float64, (nz+1)*nx)
	env := func(z float64) float64 { d := (z - at) / width; return math.Exp(-d * d) }
	for k := 0; k < nz; k++ {
		e := env(g.Zc[k])
		for i := 0; i < nx; i++ {
			du[k*nx+i] = e * (2*rng.Float64() - 1)
		}
	}
	for j := 1; j < nz; j++ {
		e := env(g.Zf[j])
		for i := 0; i < nx; i++ {
			dw[j*nx+i] = e * (2*rng.Float64() - 1)
		}
	}
	var dv []float64
	if s.v != nil {
		dv = make([]float64, nz*nx)
		for k := 0; k < nz; k++ {
			e := env(g.Zc[k])
			for i := 0; i < nx; i++ {
				dv[k*nx+i] = e * (2*rng.Float64() - 1)
			}
		}
	}
	// Project the perturbation alone, then scale it and add it.
	keepU, keepW, keepV := append([]float64(nil), s.u...), append([]float64(nil), s.w...), append([]float64(nil), s.v...)
	copy(s.u, du)
	copy(s.w, dw)
	copy(s.v, dv)
	s.Project()
	// The perturbation leaves the mean profile alone: drop its mean over
	// each level.
	peak := 0.0
	for k := 0; k < nz; k++ {
		row := s.u[k*nx : (k+1)*nx]
		mean, sq := 0.0, 0.0
		for _, v := range row {
			mean += v
		}
		mean /= float64(nx)
		for i, v := range row {
			row[i] = v - mean
			sq += row[i] * row[i]
		}
		peak = math.Max(peak, math.Sqrt(sq/float64(nx)))
	}
	for k := 0; k < nz && s.v != nil; k++ {
		row := s.v[k*nx : (k+1)*nx]
		mean := 0.0
		for _, v := range row {
			mean += v
		}
		mean /= float64(nx)
		for i, v := range row {
			row[i] = v - mean
		}
	}
	f := 0.0
	if peak > 0 {
		f = amp / peak
	}
	for i := range s.u {
		s.u[i] = keepU[i] + f*s.u[i]
	}
	for i := range s.w {
		s.w[i] = keepW[i] + f*s.w[i]
	}
	for i := range s.v {
		s.v[i] = keepV[i] + f*s.v[i]
	}
	s.Project()
}

// MixingLengthMax is the cap ℓ_max = 0.09 H on the mixing length of the
// drag-balanced initial profile (the outer-layer value of boundary-layer
// mixing-length models; common practice, no source).
const MixingLengthMax = 0.09

// DragBalancedProfile returns a steady one-dimensional mean profile U(z) for
// the configured drag, walls and forcing, to start canopy runs from: the
// balance
//
//	0 = Π − r(U) U + d/dz((ν + ℓ² |dU/dz|) dU/dz)
//
// with the x-mean canopy drag rate r (quadratic or linear) and a
// mixing length ℓ = κ z / (1 + κ z/ℓ_max), ℓ_max = 0.09 H, that stands in
// for the turbulence the run will resolve. Deep in a dense canopy it gives
// the drag-balanced speed √(2Π/(C_D a)); above, a log-like layer. It is an
// initial state, not a prediction. For FixedBulk, Π is chosen for the
// target bulk velocity and returned.
func (s *Solver) DragBalancedProfile() (prof []float64, gradient float64, err error) {
	if s.cfg.Drag == nil && s.cfg.Bed.Kind == FreeSlip && s.cfg.Top.Kind == FreeSlip {
		return nil, 0, errors.New("solver: a drag-balanced profile needs canopy drag or a wall")
	}
	if s.cfg.Forcing.Kind == FixedBulk {
		target := s.cfg.Forcing.Bulk
		p0, p1 := 0.0, target*target/s.cfg.H // a first guess of Π
		f := func(p float64) (float64, []float64, error) {
			u, err := s.mixingLengthColumn(p)
			if err != nil {
				return 0, nil, err
			}
			return s.depthMean(u) - target, u, nil
		}
		f0, _, err := f(p0)
		if err != nil {
			return nil, 0, err
		}
		f1, u, err := f(p1)
		if err != nil {
			return nil, 0, err
		}
		for it := 0; it < 60 && math.Abs(f1) > 1e-12*math.Abs(target) && f1 != f0; it++ {
			p2 := p1 - f1*(p1-p0)/(f1-f0)
			if p2 <= 0 {
				p2 = p1 / 2
			}
			p0, f0 = p1, f1
			p1 = p2
			if f1, u, err = f(p1); err != nil {
				return nil, 0, err
			}
		}
		return u, p1, nil
	}
	u, err := s.mixingLengthColumn(s.cfg.Forcing.Gradient)
	return u, s.cfg.Forcing.Gradient, err
}

// meanDragRate returns, per level, the level-mean drag rate coefficients: the
// quadratic factor q (1/m, rate q|U|) and the linear rate l (1/s).
func (s *Solver) meanDragRate() (q, l []float64) {
	nz, nx := s.nz, s.np // nx: values in a level
	q, l = make([]float64, nz), make([]float64, nz)
	d := s.cfg.Drag
	if d == nil {
		return q, l
	}
	for k := 0; k < nz; k++ {
		for i := 0; i < nx; i++ {
			if d.HalfArea != nil {
				q[k] += d.HalfArea[k*nx+i]
			}
			if d.Linear != nil {
				l[k] += d.Linear[k*nx+i]
			}
		}
		q[k] /= float64(nx)
		l[k] /= float64(nx)
	}
	return q, l
}

func (s *Solver) mixingLengthColumn(pi float64) ([]float64, error) {
	g, nz, nu := s.g, s.nz, s.cfg.Viscosity
	bed, top := s.cfg.Bed, s.cfg.Top
	q, l := s.meanDragRate()
	d := s.cfg.Drag
	lmax := MixingLengthMax * s.cfg.H
	ell := func(z float64) float64 { return Karman * z / (1 + Karman*z/lmax) }
	// Start from a rough guess and iterate with lagged coefficients.
	u := make([]float64, nz)
	for k := range u {
		u[k] = math.Sqrt(math.Max(pi, 0)*s.cfg.H) / Karman
	}
	lo, di, up, rhs := make([]float64, nz), make([]float64, nz), make([]float64, nz), make([]float64, nz)
	nuf := make([]float64, nz+1)
	next := make([]float64, nz)
	for it := 0; it < 2000; it++ {
		for j := 1; j < nz; j++ {
			dudz := (u[j] - u[j-1]) / g.Hf[j]
			lz := ell(g.Zf[j])
			if top.Kind == NoSlip {
				lz = math.Min(lz, ell(s.cfg.H-g.Zf[j]))
			}
			nuf[j] = nu + lz*lz*math.Abs(dudz)
		}
		for k := 0; k < nz; k++ {
			dz := g.Dz[k]
			lo[k], up[k] = 0, 0
			if k > 0 {
				lo[k] = nuf[k] / (g.Hf[k] * dz)
			}
			if k < nz-1 {
				up[k] = nuf[k+1] / (g.Hf[k+1] * dz)
			}
			cd := 1.0
			if d != nil && d.Law != nil {
				cd = d.Law(math.Abs(u[k]) * d.Diameter / nu)
			} else if d != nil {
				cd = d.CD
			}
			di[k] = -(lo[k] + up[k]) - cd*q[k]*math.Abs(u[k]) - l[k]
			rhs[k] = -pi
		}
		// Walls: the molecular closure plus, for a turbulent profile, the
		// log law over the first cell (its stress coefficient (κ/ln(z1/z0))²
		// with z0 = ν/(9 u*) on a smooth wall; common practice, no source).
		wallC := func(z1, z0 float64) float64 { c := Karman / math.Log(z1/z0); return c * c }
		switch bed.Kind {
		case NoSlip:
			dz := g.Dz[0]
			ustar := math.Sqrt(math.Abs(pi) * s.cfg.H)
			lam := nu * (s.bedA - s.bedB) / dz
			tur := 0.0
			if ustar > 0 && g.Zc[0] > 11*nu/ustar {
				tur = wallC(g.Zc[0], nu/(9*ustar)) * math.Abs(u[0]) / dz
			}
			if tur > lam {
				di[0] -= tur
			} else {
				di[0] -= nu * s.bedA / dz
				up[0] += nu * s.bedB / dz
			}
		case Rough:
			di[0] -= s.roughC * math.Abs(u[0]) / g.Dz[0]
		}
		if top.Kind == NoSlip {
			dz := g.Dz[nz-1]
			di[nz-1] -= nu * s.topA / dz
			lo[nz-1] += nu * s.topB / dz
		}
		thomas(lo, di, up, rhs, next)
		change, size := 0.0, 0.0
		for k := range u {
			change = math.Max(change, math.Abs(next[k]-u[k]))
			size = math.Max(size, math.Abs(next[k]))
			u[k] = 0.5*u[k] + 0.5*next[k]
		}
		if change <= 1e-11*size {
			return u, nil
		}
	}
	return nil, errors.New("solver: the drag-balanced profile did not converge; check the forcing and the canopy drag")
}
