package solver

import "math"

// The explicit and implicit phases of a three-dimensional stage: the parts
// that y adds to the slice's (see span.go for the equations).

// pointSpeed returns |u| (m/s) at centre i, wc being w interpolated there:
// of u and w in the slice, of u, v and w in three dimensions.
func (s *Solver) pointSpeed(i int, wc float64) float64 {
	u := s.u[i]
	if s.v == nil {
		return math.Sqrt(u*u + wc*wc)
	}
	v := s.v[i]
	return math.Sqrt(u*u + v*v + wc*wc)
}

// spanFrictionVelocity returns u* = √|τ_bed| (m/s) at column i from the
// wall closure, with the stress of both components along the bed.
func (s *Solver) spanFrictionVelocity(i int) float64 {
	np, u, v := s.np, s.u, s.v
	switch s.cfg.Bed.Kind {
	case NoSlip:
		ub := s.cfg.Bed.SpeedAt(s.st.tNow)
		du := s.bedA*(u[i]-ub) - s.bedB*(u[i+np]-ub)
		dv := s.bedA*v[i] - s.bedB*v[i+np]
		return math.Sqrt(s.cfg.Viscosity * math.Hypot(du, dv))
	case Rough:
		return math.Sqrt(s.roughC) * math.Hypot(u[i], v[i])
	}
	return 0
}

// spanCentreFluxRow computes the centre fluxes that y adds at level k: the
// cross flux B (x-flux of v, y-flux of u), the y-flux C of v, and each
// scalar's y-flux v c − K ∂c/∂y.
func (s *Solver) spanCentreFluxRow(k int) {
	np := s.np
	r := k * np
	vr := s.vRow()*np + r
	fx, fy := s.flux.Real(), s.fluxY.Real()
	spanCentreRowGo(s.u[r:r+np], s.v[r:r+np], s.uy[r:r+np], s.vx[r:r+np], s.vy[r:r+np], s.nuC[r:r+np],
		fx[vr:vr+np], fy[r:r+np], fy[vr:vr+np])
	nu := s.cfg.Viscosity
	for _, sc := range s.sc {
		scalarXFlux(sc.cfg.Diffusivity, nu, sc.invSct, s.v[r:r+np], s.nuC[r:r+np], sc.c[r:r+np], sc.cy[r:r+np], sc.fy[r:r+np])
	}
}

// spanEddyViscosity sets dst to ν + ν_t at the centres of level k, with
//
//	|S|² = 2(∂u/∂x)² + 2(∂v/∂y)² + 2(∂w/∂z)² + (∂u/∂y + ∂v/∂x)²
//	       + the means over the cell's two faces of (∂u/∂z + ∂w/∂x)² and (∂v/∂z + ∂w/∂y)²,
//
// the face shears at a wall from the wall closure.
func (s *Solver) spanEddyViscosity(k int, dst []float64) {
	np, nz := s.np, s.nz
	u, v, w := s.u, s.v, s.w
	ux, uy, vx, vy, wx, wy := s.ux, s.uy, s.vx, s.vy, s.wx, s.wy
	nu := s.cfg.Viscosity
	r := k * np
	idz, l2 := s.invDz[k], s.ell2[k]
	dst = dst[:np]
	if k == 0 || k == nz-1 {
		ubed, utop := s.cfg.Bed.SpeedAt(s.st.tNow), s.cfg.Top.SpeedAt(s.st.tNow)
		for i := range dst {
			p := r + i
			sbu, stu := s.faceShearOf(u, wx, k, p, ubed, utop), s.faceShearOf(u, wx, k+1, p+np, ubed, utop)
			sbv, stv := s.faceShearOf(v, wy, k, p, 0, 0), s.faceShearOf(v, wy, k+1, p+np, 0, 0)
			dst[i] = nu + l2*math.Sqrt(spanStrain2(ux[p], vy[p], (w[p+np]-w[p])*idz, uy[p]+vx[p], sbu, stu, sbv, stv))
		}
		return
	}
	ihb, iht := s.invHf[k], s.invHf[k+1]
	for i := range dst {
		p := r + i
		sbu := (u[p]-u[p-np])*ihb + wx[p]
		stu := (u[p+np]-u[p])*iht + wx[p+np]
		sbv := (v[p]-v[p-np])*ihb + wy[p]
		stv := (v[p+np]-v[p])*iht + wy[p+np]
		dst[i] = nu + l2*math.Sqrt(spanStrain2(ux[p], vy[p], (w[p+np]-w[p])*idz, uy[p]+vx[p], sbu, stu, sbv, stv))
	}
}

// spanStrain2 returns 2 S_ij S_ij from the normal strains, the horizontal
// shear sxy = ∂u/∂y + ∂v/∂x and the vertical shears at the faces below and
// above (1/s²).
func spanStrain2(sxx, syy, szz, sxy, sbu, stu, sbv, stv float64) float64 {
	return 2*(sxx*sxx+syy*syy+szz*szz) + sxy*sxy + 0.5*(sbu*sbu+stu*stu+sbv*sbv+stv*stv)
}

// spanDerivPart replaces the x-fluxes in its share of flux planes by the
// dealiased horizontal divergence i k_x F̂_x + i k_y F̂_y of the x- and
// y-fluxes.
func (s *Solver) spanDerivPart(part int) {
	s.flux.ForwardPart(part)
	s.fluxY.ForwardPart(part)
	lo, hi := s.flux.PartRows(part)
	fx, fy := s.flux.Spec(), s.fluxY.Spec()
	for r := lo; r < hi; r++ {
		a, b := r*s.ncp, (r+1)*s.ncp
		s.horizontalDivergence(fx[a:b], fx[a:b], fy[a:b])
	}
	s.flux.InversePart(part)
}

// horizontalDivergence sets the spectral plane dst to i k_x fx + i k_y fy on
// the kept modes and zero elsewhere; dst may be fx.
func (s *Solver) horizontalDivergence(dst, fx, fy []complex128) {
	nc, kc := s.nc, s.kcut
	for l, keep := range s.keepY {
		d := dst[l*nc : (l+1)*nc]
		if !keep {
			clear(d)
			continue
		}
		x, y, ky := fx[l*nc:(l+1)*nc], fy[l*nc:(l+1)*nc], s.ky[l]
		for m := 0; m <= kc; m++ {
			d[m] = ik(x[m], s.kx[m]) + ik(y[m], ky)
		}
		clear(d[kc+1:])
	}
}

// implicitV solves the v rows for columns [i0, i1).
func (s *Solver) implicitV(i0, i1, part int) {
	s.implicitAlong(i0, i1, part, s.v, s.flux.Real()[s.vRow()*s.np:], s.gv, s.py, s.nV, false)
}
