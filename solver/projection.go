package solver

// The discrete projection. For each Fourier mode m (wavenumber κ) the
// divergence of the staggered velocity at cell centre k is
//
//	D[k] = iκ û[k] + (ŵ[k+1] − ŵ[k]) / Dz[k]
//
// and the pressure gradient is iκ p̂[k] at centres and
// (p̂[j] − p̂[j−1]) / Hf[j] at interior faces. The correction
// u ← u* − c G p with D G p = D u* / c therefore leaves D u = 0 to round-off.
// D G is tridiagonal in k with Neumann conditions (w is never corrected at
// the walls); its factors depend only on the grid and are made once.

// factorProjection precomputes the Thomas factors of D G for every kept
// mode m >= 1.
func (s *Solver) factorProjection() {
	g, nz, nc := s.g, s.nz, s.nc
	for m := 1; m <= s.kcut; m++ {
		k2 := s.kx[m] * s.kx[m]
		var cprev float64
		for k := 0; k < nz; k++ {
			var a, c float64
			if k > 0 {
				a = 1 / (g.Dz[k] * g.Hf[k])
			}
			if k < nz-1 {
				c = 1 / (g.Dz[k] * g.Hf[k+1])
			}
			b := -(a + c) - k2
			den := b - a*cprev
			s.pinv[k*nc+m] = 1 / den
			cprev = c / den
			s.pcp[k*nc+m] = cprev
		}
	}
}

// projectPart projects the modes of its share of [0, nc) and writes their
// x-derivatives into deriv.Spec(). Modes above the 2/3 cut are removed.
func (s *Solver) projectPart(part int) {
	g, nz, nc := s.g, s.nz, s.nc
	c := s.projC
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	dspec := s.deriv.Spec()
	duh, dwh := dspec[:nz*nc], dspec[nz*nc:]
	m0, m1 := span(nc, s.pool.n, part)
	for m := m0; m < m1; m++ {
		if m > s.kcut {
			for k := 0; k < nz; k++ {
				uh[k*nc+m], s.phat[k*nc+m], duh[k*nc+m] = 0, 0, 0
			}
			for j := 0; j <= nz; j++ {
				wh[j*nc+m], dwh[j*nc+m] = 0, 0
			}
			continue
		}
		if m == 0 {
			s.projectMean(c)
			continue
		}
		kx := s.kx[m]
		ik := complex(0, kx)
		// Forward sweep on the divergence.
		var dprev complex128
		for k := 0; k < nz; k++ {
			i := k*nc + m
			div := ik*uh[i] + (wh[i+nc]-wh[i])*complex(1/g.Dz[k], 0)
			rhs := div * complex(1/c, 0)
			if k > 0 {
				rhs -= complex(1/(g.Dz[k]*g.Hf[k]), 0) * dprev
			}
			dprev = rhs * complex(s.pinv[i], 0)
			s.prhs[i] = dprev
		}
		// Back substitution gives p̂.
		i := (nz-1)*nc + m
		s.phat[i] = s.prhs[i]
		for k := nz - 2; k >= 0; k-- {
			i := k*nc + m
			s.phat[i] = s.prhs[i] - complex(s.pcp[i], 0)*s.phat[i+nc]
		}
		// Correct and differentiate.
		for k := 0; k < nz; k++ {
			i := k*nc + m
			v := uh[i] - complex(c, 0)*ik*s.phat[i]
			uh[i] = v
			duh[i] = ik * v
		}
		wh[m], dwh[m] = 0, 0
		wh[nz*nc+m], dwh[nz*nc+m] = 0, 0
		for j := 1; j < nz; j++ {
			i := j*nc + m
			v := wh[i] - complex(c/g.Hf[j], 0)*(s.phat[i]-s.phat[i-nc])
			wh[i] = v
			dwh[i] = ik * v
		}
	}
}

// projectMean handles mode 0: continuity forces ŵ₀ = 0 everywhere, the
// pressure follows by integrating ∂p/∂z = ŵ₀*/c, and for FixedBulk the mean
// velocity is shifted so that the depth mean meets the target. The shifts of
// a step, divided by the step, update Π once the step is done, so Π stays
// the same through the stages of a step.
func (s *Solver) projectMean(c float64) {
	g, nz, nc := s.g, s.nz, s.nc
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	dspec := s.deriv.Spec()
	var p float64
	s.phat[0] = 0
	for j := 1; j < nz; j++ {
		p += g.Hf[j] * real(wh[j*nc]) / c
		s.phat[j*nc] = complex(p, 0)
	}
	for j := 0; j <= nz; j++ {
		wh[j*nc] = 0
		dspec[(nz+j)*nc] = 0
	}
	if s.cfg.Forcing.Kind == FixedBulk && s.inStage {
		sum := 0.0
		for k := 0; k < nz; k++ {
			sum += real(uh[k*nc]) * g.Dz[k]
		}
		d := s.cfg.Forcing.Bulk - sum/s.cfg.H
		for k := 0; k < nz; k++ {
			uh[k*nc] += complex(d, 0)
		}
		s.bulkShift += d
	}
	for k := 0; k < nz; k++ {
		uh[k*nc] = complex(real(uh[k*nc]), 0)
		dspec[k*nc] = 0
	}
}

// Project makes the current velocity divergence-free (and removes the modes
// above the 2/3 cut). Call it after changing U or W by hand.
func (s *Solver) Project() {
	s.inStage = false
	s.project(1)
}
