package solver

// The discrete projection. For each Fourier mode m (wavenumber κ) the
// divergence of the staggered velocity at cell centre k is
//
//	D[k] = iκ û[k] + (ŵ[k+1] − ŵ[k]) / Dz[k]
//
// and the pressure gradient is iκ p̂[k] at centres and
// (p̂[j] − p̂[j−1]) / Hf[j] at interior faces. The correction
// u ← u* − c G φ with D G φ = D u* / c therefore leaves D u = 0 to round-off.
// D G is tridiagonal in k with Neumann conditions (w is never corrected at
// the walls); its factors depend only on the grid and are made once.
//
// The pressure is incremental: the predictor of each stage carries the
// gradient of the previous stage's pressure through the implicit vertical
// diffusion, and the projection finds only the increment φ, p ← p + φ.
// Without that, the projection leaves an O(Δt) slip at no-slip walls and the
// scheme is first order in time wherever a pressure gradient runs along a
// wall.

// factorProjection precomputes the Thomas factors of D G for every kept
// mode m >= 1, and the per-level reciprocals the solves use.
func (s *Solver) factorProjection() {
	g, nz := s.g, s.nz
	s.invDz = make([]float64, nz)
	s.invHf = make([]float64, nz+1)
	s.pLo = make([]float64, nz)
	for k := 0; k < nz; k++ {
		s.invDz[k] = 1 / g.Dz[k]
		if k > 0 {
			s.pLo[k] = 1 / (g.Dz[k] * g.Hf[k])
		}
	}
	for j := range s.invHf {
		s.invHf[j] = 1 / g.Hf[j]
	}
	if s.ny > 1 {
		s.spanFactorProjection()
		return
	}
	for m := 1; m <= s.kcut; m++ {
		s.factorMode(m, s.kx[m]*s.kx[m])
	}
}

// factorMode precomputes the Thomas factors of D G for the mode at index q
// of a spectral level, of squared wavenumber k2 (1/m²).
func (s *Solver) factorMode(q int, k2 float64) {
	g, nz, ncp := s.g, s.nz, s.ncp
	var cprev float64
	for k := 0; k < nz; k++ {
		var c float64
		a := s.pLo[k]
		if k < nz-1 {
			c = 1 / (g.Dz[k] * g.Hf[k+1])
		}
		b := -(a + c) - k2
		den := b - a*cprev
		s.pinv[k*ncp+q] = 1 / den
		cprev = c / den
		s.pcp[k*ncp+q] = cprev
	}
}

// scale multiplies a complex number by a real one.
func scale(v complex128, f float64) complex128 { return complex(real(v)*f, imag(v)*f) }

// ik multiplies by i·k.
func ik(v complex128, k float64) complex128 { return complex(-k*imag(v), k*real(v)) }

// projectPart is the first half of the projection, split by modes: for its
// share of the kept modes it solves D G φ = D u*/c for the increment φ (left
// in prhs) and updates the pressure, p ← p + φ at the end of a stage or p ← 0
// after a plain projection. The tridiagonal solves run level by level over
// the part's modes, so every inner loop reads contiguous runs of the spectra.
// The correction of the velocity, its x-derivatives and the pressure gradient
// are row by row and come in correctPart.
func (s *Solver) projectPart(part int) {
	if s.ny > 1 {
		s.spanProjectPart(part)
		return
	}
	m0, m1 := span(s.kcut+1, s.crew.n, part)
	if m0 == 0 {
		s.projectMean(s.projC)
	}
	a, b := max(m0, 1), max(m1, 1)
	s.projectRun(a, b, s.kx[a:b], 0)
}

// projectRun solves D G φ = D u*/c for the modes at indices [a, b) of a
// spectral level, of x-wavenumbers kx (1/m) and, in three dimensions, the
// y-wavenumber ky (1/m): the increment φ goes to prhs and the pressure is
// updated.
func (s *Solver) projectRun(a, b int, kx []float64, ky float64) {
	nz, nc := s.nz, s.ncp
	ic := 1 / s.projC
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	var vh []complex128
	if s.ny > 1 {
		vh = spec[s.vRow()*nc:]
	}
	row := func(f []complex128, k int) []complex128 { return f[k*nc+a : k*nc+b] }
	rowf := func(f []float64, k int) []float64 { return f[k*nc+a : k*nc+b] }
	// Forward elimination on the divergence.
	for k := 0; k < nz; k++ {
		u, wb, wt := row(uh, k), row(wh, k), row(wh, k+1)
		ph, pv := row(s.prhs, k), rowf(s.pinv, k)
		idz, plo := s.invDz[k], s.pLo[k]
		if vh != nil {
			s.spanDivergenceRun(ph, u, row(vh, k), wb, wt, kx, ky, idz)
		} else {
			for m, kk := range kx {
				ph[m] = ik(u[m], kk) + scale(wt[m]-wb[m], idz)
			}
		}
		if k == 0 {
			for m := range ph {
				ph[m] = scale(ph[m], ic*pv[m])
			}
			continue
		}
		prev := row(s.prhs, k-1)
		for m := range ph {
			ph[m] = scale(scale(ph[m], ic)-scale(prev[m], plo), pv[m])
		}
	}
	// Back substitution gives the increment φ in prhs; each level's
	// pressure is updated as soon as its φ is final.
	s.updatePressureRow(row(s.phat, nz-1), row(s.prhs, nz-1))
	for k := nz - 2; k >= 0; k-- {
		ph, above, cp := row(s.prhs, k), row(s.prhs, k+1), rowf(s.pcp, k)
		for m := range ph {
			ph[m] -= scale(above[m], cp[m])
		}
		s.updatePressureRow(row(s.phat, k), ph)
	}
}

// updatePressureRow adds the increment phi to the pressure p (one level's
// run of modes) at the end of a stage, or clears p after a plain
// projection.
func (s *Solver) updatePressureRow(p, phi []complex128) {
	if !s.inStage {
		clear(p)
		return
	}
	phi = phi[:len(p)]
	for m := range p {
		p[m] += phi[m]
	}
}

// correctPart is the second half of the projection, split by the rows of
// the transform plans: for its rows of vel and deriv it applies the
// correction u ← u* − c G φ, writes the x-derivatives and removes the
// modes above the 2/3 cut, and for its rows of pgrad it writes the gradient
// of the new pressure; then it transforms those rows back. Each row is
// whole and contiguous, and still in cache when its inverse transform runs.
func (s *Solver) correctPart(part int) {
	if s.ny > 1 {
		s.spanCorrectPart(part)
		return
	}
	nz := s.nz
	lo, hi := s.vel.PartRows(part)
	for r := lo; r < hi; r++ {
		switch {
		case r < nz:
			s.correctCentreRow(r)
		case r <= 2*nz:
			s.correctFaceRow(r - nz)
		default:
			s.scalarSpecRow(r)
		}
	}
	lo, hi = s.pgrad.PartRows(part)
	s.pressureGradientRows(lo, hi)
	s.vel.InversePart(part)
	s.deriv.InversePart(part)
	s.pgrad.InversePart(part)
}

// specRow returns row r of a spectrum.
func (s *Solver) specRow(spec []complex128, r int) []complex128 {
	return spec[r*s.nc : (r+1)*s.nc]
}

// correctCentreRow corrects û at centre k, û ← û* − c iκ φ, and writes iκ û
// into deriv.Spec(). Mode 0 was made real by projectMean and has no
// x-derivative.
func (s *Solver) correctCentreRow(k int) {
	c, kc := s.projC, s.kcut
	u, du, ph := s.specRow(s.vel.Spec(), k), s.specRow(s.deriv.Spec(), k), s.specRow(s.prhs, k)
	kx := s.kx[:len(u)]
	du, ph = du[:len(u)], ph[:len(u)]
	du[0] = 0
	for m := 1; m <= kc; m++ {
		kk := kx[m]
		v := u[m] - scale(ik(ph[m], kk), c)
		u[m] = v
		du[m] = ik(v, kk)
	}
	clear(u[kc+1:])
	clear(du[kc+1:])
}

// correctFaceRow corrects ŵ at face j, ŵ ← ŵ* − c (φ[j] − φ[j−1]) / Hf[j],
// and writes iκ ŵ into deriv.Spec(). ŵ stays zero at the walls, and its
// mode 0 is zero everywhere (continuity; projectMean found φ₀ from it).
func (s *Solver) correctFaceRow(j int) {
	nz, c, kc := s.nz, s.projC, s.kcut
	w, dw := s.specRow(s.vel.Spec(), nz+j), s.specRow(s.deriv.Spec(), nz+j)
	if j == 0 || j == nz {
		clear(w)
		clear(dw)
		return
	}
	ph, phb := s.specRow(s.prhs, j), s.specRow(s.prhs, j-1)
	kx := s.kx[:len(w)]
	dw, ph, phb = dw[:len(w)], ph[:len(w)], phb[:len(w)]
	f := c * s.invHf[j]
	w[0], dw[0] = 0, 0
	for m := 1; m <= kc; m++ {
		kk := kx[m]
		v := w[m] - scale(ph[m]-phb[m], f)
		w[m] = v
		dw[m] = ik(v, kk)
	}
	clear(w[kc+1:])
	clear(dw[kc+1:])
}

// scalarSpecRow removes the modes above the 2/3 cut from row r of a
// scalar's spectrum and writes the x-derivative of the kept ones into
// deriv.Spec().
func (s *Solver) scalarSpecRow(r int) {
	kc := s.kcut
	c, dc := s.specRow(s.vel.Spec(), r), s.specRow(s.deriv.Spec(), r)
	kx := s.kx[:len(c)]
	dc = dc[:len(c)]
	c[0], dc[0] = complex(real(c[0]), 0), 0
	for m := 1; m <= kc; m++ {
		dc[m] = ik(c[m], kx[m])
	}
	clear(c[kc+1:])
	clear(dc[kc+1:])
}

// pressureGradientRows writes G p̂ into the rows [lo, hi) of pgrad.Spec()
// (Nz centre rows, then Nz+1 face rows): iκ p̂ at the centres, the vertical
// difference at the interior faces, zero at the walls and above the cut.
func (s *Solver) pressureGradientRows(lo, hi int) {
	if s.ny > 1 {
		s.spanPressureGradient(lo, hi)
		return
	}
	nz, kc := s.nz, s.kcut
	gs := s.pgrad.Spec()
	for r := lo; r < hi; r++ {
		g := s.specRow(gs, r)
		switch {
		case r < nz:
			p := s.specRow(s.phat, r)
			kx := s.kx[:len(g)]
			p = p[:len(g)]
			for m := 0; m <= kc; m++ {
				g[m] = ik(p[m], kx[m])
			}
		case r == nz || r == 2*nz:
			clear(g)
			continue
		default:
			j := r - nz
			p, pb := s.specRow(s.phat, j), s.specRow(s.phat, j-1)
			p, pb = p[:len(g)], pb[:len(g)]
			ih := s.invHf[j]
			for m := 0; m <= kc; m++ {
				g[m] = scale(p[m]-pb[m], ih)
			}
		}
		clear(g[kc+1:])
	}
}

// projectMean handles mode 0: continuity forces ŵ₀ = 0 everywhere (set in
// correctFaceRow), the pressure increment follows by integrating
// ∂φ/∂z = ŵ₀*/c, and for FixedBulk the mean velocity is shifted so that
// the depth mean meets the target. The shifts of a step, divided by the
// step, update Π once the step is done, so Π stays the same through the
// stages of a step.
func (s *Solver) projectMean(c float64) {
	g, nz, nc := s.g, s.nz, s.ncp // nc: values in a spectral level
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	var p float64
	s.prhs[0] = 0
	for j := 1; j < nz; j++ {
		p += g.Hf[j] * real(wh[j*nc]) / c
		s.prhs[j*nc] = complex(p, 0)
	}
	if s.cfg.Forcing.Kind == FixedBulk && s.inStage {
		sum := 0.0
		for k := 0; k < nz; k++ {
			sum += real(uh[k*nc]) * g.Dz[k]
		}
		d := s.stageBulk() - sum/s.cfg.H
		for k := 0; k < nz; k++ {
			uh[k*nc] += complex(d, 0)
		}
		s.bulkShift += d
	}
	for k := 0; k < nz; k++ {
		uh[k*nc] = complex(real(uh[k*nc]), 0)
		s.updatePressureRow(s.phat[k*nc:k*nc+1], s.prhs[k*nc:k*nc+1])
	}
}

// Project makes the current velocity divergence-free (and removes the modes
// above the 2/3 cut). Call it after changing U or W by hand. It resets the
// pressure to zero: the first stage after it finds the whole pressure.
func (s *Solver) Project() {
	s.inStage = false
	s.rateFresh = false
	s.project(1)
}
