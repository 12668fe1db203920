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
// mode m >= 1, and the per-level reciprocals the sweeps use.
func (s *Solver) factorProjection() {
	g, nz, nc := s.g, s.nz, s.nc
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
	for m := 1; m <= s.kcut; m++ {
		k2 := s.kx[m] * s.kx[m]
		var cprev float64
		for k := 0; k < nz; k++ {
			var c float64
			a := s.pLo[k]
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

// scale multiplies a complex number by a real one.
func scale(v complex128, f float64) complex128 { return complex(real(v)*f, imag(v)*f) }

// ik multiplies by i·k.
func ik(v complex128, k float64) complex128 { return complex(-k*imag(v), k*real(v)) }

// projectPart projects the modes of its share of [0, nc), writes their
// x-derivatives into deriv.Spec() and the new pressure gradient into
// pgrad.Spec(). Modes above the 2/3 cut are removed. The sweeps run level
// by level over the part's modes, so every inner loop reads contiguous
// rows of the spectra.
func (s *Solver) projectPart(part int) {
	nz, nc := s.nz, s.nc
	c, ic := s.projC, 1/s.projC
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	dspec := s.deriv.Spec()
	duh, dwh := dspec[:nz*nc], dspec[nz*nc:]
	gs := s.pgrad.Spec()
	gx, gz := gs[:nz*nc], gs[nz*nc:]
	// The part's share of the kept modes [m0, m1) and of the removed ones
	// [r0, r1), split separately so that the work is shared evenly.
	m0, m1 := span(s.kcut+1, s.pool.n, part)
	r0, r1 := span(nc-s.kcut-1, s.pool.n, part)
	r0, r1 = r0+s.kcut+1, r1+s.kcut+1
	s.projectScalars(m0, m1)
	s.projectScalars(r0, r1)
	if m0 == 0 {
		s.projectMean(c)
	}
	a, b := max(m0, 1), max(m1, 1)
	kx := s.kx[a:b]
	row := func(f []complex128, k int) []complex128 { return f[k*nc+a : k*nc+b] }
	rowf := func(f []float64, k int) []float64 { return f[k*nc+a : k*nc+b] }
	// Forward sweep on the divergence.
	for k := 0; k < nz; k++ {
		u, wb, wt := row(uh, k), row(wh, k), row(wh, k+1)
		ph, pv := row(s.prhs, k), rowf(s.pinv, k)
		idz, plo := s.invDz[k], s.pLo[k]
		if k == 0 {
			for m, kk := range kx {
				d := ik(u[m], kk) + scale(wt[m]-wb[m], idz)
				ph[m] = scale(d, ic*pv[m])
			}
			continue
		}
		prev := row(s.prhs, k-1)
		for m, kk := range kx {
			d := ik(u[m], kk) + scale(wt[m]-wb[m], idz)
			ph[m] = scale(scale(d, ic)-scale(prev[m], plo), pv[m])
		}
	}
	// Back substitution gives the increment φ in prhs.
	for k := nz - 2; k >= 0; k-- {
		ph, above, cp := row(s.prhs, k), row(s.prhs, k+1), rowf(s.pcp, k)
		for m := range ph {
			ph[m] -= scale(above[m], cp[m])
		}
	}
	// Correct, differentiate and update the pressure and its gradient,
	// face j = k after centre k so that both pressures it needs are new.
	clear(row(wh, 0))
	clear(row(dwh, 0))
	clear(row(gz, 0))
	clear(row(wh, nz))
	clear(row(dwh, nz))
	clear(row(gz, nz))
	for k := 0; k < nz; k++ {
		u, du, ph, p, g := row(uh, k), row(duh, k), row(s.prhs, k), row(s.phat, k), row(gx, k)
		for m, kk := range kx {
			v := u[m] - scale(ik(ph[m], kk), c)
			u[m] = v
			du[m] = ik(v, kk)
		}
		if s.inStage {
			for m, kk := range kx {
				v := p[m] + ph[m]
				p[m] = v
				g[m] = ik(v, kk)
			}
		} else {
			clear(p)
			clear(g)
		}
		if k == 0 {
			continue
		}
		w, dw, gzr := row(wh, k), row(dwh, k), row(gz, k)
		phb, pb := row(s.prhs, k-1), row(s.phat, k-1)
		ih := s.invHf[k]
		for m, kk := range kx {
			v := w[m] - scale(ph[m]-phb[m], c*ih)
			w[m] = v
			dw[m] = ik(v, kk)
			gzr[m] = scale(p[m]-pb[m], ih)
		}
	}
	// Modes above the cut.
	if r0 < r1 {
		for k := 0; k < nz; k++ {
			r := k * nc
			clear(uh[r+r0 : r+r1])
			clear(duh[r+r0 : r+r1])
			clear(s.phat[r+r0 : r+r1])
			clear(gx[r+r0 : r+r1])
		}
		for j := 0; j <= nz; j++ {
			r := j * nc
			clear(wh[r+r0 : r+r1])
			clear(dwh[r+r0 : r+r1])
			clear(gz[r+r0 : r+r1])
		}
	}
}

// projectScalars removes the modes above the 2/3 cut from the scalars and
// writes the x-derivatives of the kept ones into deriv.Spec().
func (s *Solver) projectScalars(m0, m1 int) {
	nc := s.nc
	spec, dspec := s.vel.Spec(), s.deriv.Spec()
	for _, sc := range s.sc {
		for k := 0; k < s.nz; k++ {
			r := (sc.row + k) * nc
			for m := m0; m < m1; m++ {
				i := r + m
				switch {
				case m > s.kcut:
					spec[i], dspec[i] = 0, 0
				case m == 0:
					spec[i], dspec[i] = complex(real(spec[i]), 0), 0
				default:
					dspec[i] = ik(spec[i], s.kx[m])
				}
			}
		}
	}
}

// updatePressure adds the increment φ of mode m (in prhs) to the pressure at
// the end of a stage, or clears the pressure after a plain projection, and
// writes the mode's pressure gradient into pgrad.Spec().
func (s *Solver) updatePressure(m int) {
	nz, nc := s.nz, s.nc
	kept := m <= s.kcut
	for k := 0; k < nz; k++ {
		i := k*nc + m
		switch {
		case !kept || !s.inStage:
			s.phat[i] = 0
		default:
			s.phat[i] += s.prhs[i]
		}
	}
	s.fillPressureGradient(m)
}

// fillPressureGradient writes G p̂ of mode m into pgrad.Spec(): iκ p̂ at the
// centres and the vertical difference at the interior faces.
func (s *Solver) fillPressureGradient(m int) {
	nz, nc := s.nz, s.nc
	gs := s.pgrad.Spec()
	gx, gz := gs[:nz*nc], gs[nz*nc:]
	kx := s.kx[m]
	for k := 0; k < nz; k++ {
		gx[k*nc+m] = ik(s.phat[k*nc+m], kx)
	}
	gz[m], gz[nz*nc+m] = 0, 0
	for j := 1; j < nz; j++ {
		i := j*nc + m
		gz[i] = scale(s.phat[i]-s.phat[i-nc], s.invHf[j])
	}
}

// projectMean handles mode 0: continuity forces ŵ₀ = 0 everywhere, the
// pressure increment follows by integrating ∂φ/∂z = ŵ₀*/c, and for
// FixedBulk the mean velocity is shifted so that the depth mean meets the
// target. The shifts of a step, divided by the step, update Π once the step
// is done, so Π stays the same through the stages of a step.
func (s *Solver) projectMean(c float64) {
	g, nz, nc := s.g, s.nz, s.nc
	spec := s.vel.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	dspec := s.deriv.Spec()
	var p float64
	s.prhs[0] = 0
	for j := 1; j < nz; j++ {
		p += g.Hf[j] * real(wh[j*nc]) / c
		s.prhs[j*nc] = complex(p, 0)
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
	s.updatePressure(0)
}

// Project makes the current velocity divergence-free (and removes the modes
// above the 2/3 cut). Call it after changing U or W by hand. It resets the
// pressure to zero: the first stage after it finds the whole pressure.
func (s *Solver) Project() {
	s.inStage = false
	s.rateFresh = false
	s.project(1)
}
