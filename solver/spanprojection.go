package solver

import "math"

// The projection of a three-dimensional run: per horizontal wavenumber pair
// (k_x, k_y) the divergence of the staggered velocity at centre k is
//
//	D[k] = i k_x û[k] + i k_y v̂[k] + (ŵ[k+1] − ŵ[k]) / Dz[k]
//
// and the pressure gradient is (i k_x p̂, i k_y p̂) at the centres and
// (p̂[j] − p̂[j−1]) / Hf[j] at the faces, so D G is the slice's tridiagonal
// operator with k_x² + k_y² in place of k_x²: one solve per kept pair. The
// mean (0, 0) is the slice's mean mode.

// spanFactorProjection precomputes the Thomas factors of D G for every kept
// pair but the mean.
func (s *Solver) spanFactorProjection() {
	nc := s.nc
	for _, l := range s.keptRows {
		ky2 := s.ky[l] * s.ky[l]
		for m := 0; m <= s.kcut; m++ {
			if l == 0 && m == 0 {
				continue
			}
			s.factorMode(l*nc+m, s.kx[m]*s.kx[m]+ky2)
		}
	}
}

// spanProjectPart solves for the pressure increment of its share of the kept
// spectral rows l (each the pairs (k_x(m), k_y(l)), m = 0..kcut).
func (s *Solver) spanProjectPart(part int) {
	j0, j1 := span(len(s.keptRows), s.crew.n, part)
	nc := s.nc
	for _, l := range s.keptRows[j0:j1] {
		a, m0 := l*nc, 0
		if l == 0 {
			s.projectMean(s.projC)
			a, m0 = a+1, 1
		}
		s.projectRun(a, l*nc+s.kcut+1, s.kx[m0:s.kcut+1], s.ky[l])
	}
}

// spanDivergenceRun sets d to the divergence of a run of modes at one level.
func (s *Solver) spanDivergenceRun(d, u, v, wb, wt []complex128, kx []float64, ky, idz float64) {
	u, v, wb, wt = u[:len(d)], v[:len(d)], wb[:len(d)], wt[:len(d)]
	for m, kk := range kx[:len(d)] {
		d[m] = ik(u[m], kk) + ik(v[m], ky) + scale(wt[m]-wb[m], idz)
	}
}

// spanCorrectPart is correctPart for planes: the correction of u, v, w, the
// x- and y-derivatives of every field, the pressure gradient, and the
// inverse transforms of its planes.
func (s *Solver) spanCorrectPart(part int) {
	nz, vr := s.nz, s.vRow()
	lo, hi := s.vel.PartRows(part)
	for r := lo; r < hi; r++ {
		switch {
		case r < nz:
			s.spanCorrectCentre(r, r, true)
		case r <= 2*nz:
			s.spanCorrectFace(r - nz)
		case r < vr+nz:
			s.spanCorrectCentre(r, r-vr, false)
		default:
			s.spanCorrectCentre(r, -1, false)
		}
	}
	lo, hi = s.pgrad.PartRows(part)
	s.spanPressureGradient(lo, hi)
	s.vel.InversePart(part)
	s.deriv.InversePart(part)
	s.derivY.InversePart(part)
	s.pgrad.InversePart(part)
}

// planes returns plane r of the velocity spectrum and of its x- and
// y-derivatives.
func (s *Solver) planes(r int) (f, dx, dy []complex128) {
	a, b := r*s.ncp, (r+1)*s.ncp
	return s.vel.Spec()[a:b], s.deriv.Spec()[a:b], s.derivY.Spec()[a:b]
}

// spanCorrectCentre corrects the centre field in plan plane r with the
// pressure increment of level k: û ← û* − c i k_x φ (alongX) or v̂ ← v̂* −
// c i k_y φ; k < 0 leaves a scalar uncorrected. Then spanFinish writes the
// derivatives; the mean stays, made real.
func (s *Solver) spanCorrectCentre(r, k int, alongX bool) {
	c := s.projC
	f, dx, dy := s.planes(r)
	if k >= 0 {
		phi := s.prhs[k*s.ncp : (k+1)*s.ncp]
		s.eachKept(func(a, m int, kx, ky float64) {
			g := ky
			if alongX {
				g = kx
			}
			f[a+m] -= scale(ik(phi[a+m], g), c)
		})
	}
	s.spanFinish(f, dx, dy, complex(real(f[0]), 0))
}

// spanCorrectFace corrects ŵ at face j, ŵ ← ŵ* − c (φ[j] − φ[j−1]) / Hf[j];
// ŵ stays zero at the walls and in the mean. Then spanFinish writes the
// derivatives.
func (s *Solver) spanCorrectFace(j int) {
	nz, ncp := s.nz, s.ncp
	w, dx, dy := s.planes(nz + j)
	if j == 0 || j == nz {
		clear(w)
		clear(dx)
		clear(dy)
		return
	}
	ph, phb := s.prhs[j*ncp:(j+1)*ncp], s.prhs[(j-1)*ncp:j*ncp]
	f := s.projC * s.invHf[j]
	s.eachKept(func(a, m int, _, _ float64) {
		w[a+m] -= scale(ph[a+m]-phb[a+m], f)
	})
	s.spanFinish(w, dx, dy, 0)
}

// eachKept calls fn for every kept mode of a spectral plane but the mean,
// with the start a of its spectral row, its x-index m and its wavenumbers.
func (s *Solver) eachKept(fn func(a, m int, kx, ky float64)) {
	for _, l := range s.keptRows {
		a, m0 := l*s.nc, 0
		if l == 0 {
			m0 = 1
		}
		for m := m0; m <= s.kcut; m++ {
			fn(a, m, s.kx[m], s.ky[l])
		}
	}
}

// spanFinish completes a corrected spectral plane f: it sets the mean to
// mean, clears the modes outside the kept ones, and writes i k_x f and
// i k_y f into dx and dy (zero mean).
func (s *Solver) spanFinish(f, dx, dy []complex128, mean complex128) {
	nc, kc := s.nc, s.kcut
	for l, keep := range s.keepY {
		a, b := l*nc, (l+1)*nc
		fr, xr, yr := f[a:b], dx[a:b], dy[a:b]
		if !keep {
			clear(fr)
			clear(xr)
			clear(yr)
			continue
		}
		ky := s.ky[l]
		for m := 0; m <= kc; m++ {
			v := fr[m]
			xr[m], yr[m] = ik(v, s.kx[m]), ik(v, ky)
		}
		clear(fr[kc+1:])
		clear(xr[kc+1:])
		clear(yr[kc+1:])
	}
	f[0], dx[0], dy[0] = mean, 0, 0
}

// spanPressureGradient writes G p̂ into the planes [lo, hi) of pgrad.Spec()
// (Nz centre planes of i k_x p̂, Nz+1 face planes, Nz centre planes of
// i k_y p̂), zero at the walls and outside the kept modes.
func (s *Solver) spanPressureGradient(lo, hi int) {
	nz, nc, ncp, kc, vr := s.nz, s.nc, s.ncp, s.kcut, s.vRow()
	gs := s.pgrad.Spec()
	for r := lo; r < hi; r++ {
		g := gs[r*ncp : (r+1)*ncp]
		if r == nz || r == 2*nz {
			clear(g)
			continue
		}
		for l, keep := range s.keepY {
			a := l * nc
			gr := g[a : a+nc]
			if !keep {
				clear(gr)
				continue
			}
			switch {
			case r < nz:
				p := s.phat[r*ncp+a:]
				for m := 0; m <= kc; m++ {
					gr[m] = ik(p[m], s.kx[m])
				}
			case r < 2*nz:
				j := r - nz
				p, pb := s.phat[j*ncp+a:], s.phat[(j-1)*ncp+a:]
				ih := s.invHf[j]
				for m := 0; m <= kc; m++ {
					gr[m] = scale(p[m]-pb[m], ih)
				}
			default:
				p, ky := s.phat[(r-vr)*ncp+a:], s.ky[l]
				for m := 0; m <= kc; m++ {
					gr[m] = ik(p[m], ky)
				}
			}
			clear(gr[kc+1:])
		}
	}
}

// spanDivergencePart is divergencePart for planes: over its share of the
// kept spectral rows, the largest |D û| and the largest velocity-gradient
// modulus max(|k_x û| + |k_y v̂| + |∂ŵ/∂z|, |∂û/∂z|, |∂v̂/∂z|).
func (s *Solver) spanDivergencePart(part int) {
	g, nz, nc, ncp := s.g, s.nz, s.nc, s.ncp
	spec := s.flux.Spec()
	uh, wh, vh := spec[:nz*ncp], spec[nz*ncp:], spec[s.vRow()*ncp:]
	j0, j1 := span(len(s.keptRows), s.crew.n, part)
	var dmax, gmax float64
	for _, l := range s.keptRows[j0:j1] {
		iy := complex(0, s.ky[l])
		for m := 0; m <= s.kcut; m++ {
			ix := complex(0, s.kx[m])
			for k := 0; k < nz; k++ {
				i := k*ncp + l*nc + m
				dwdz := (wh[i+ncp] - wh[i]) * complex(1/g.Dz[k], 0)
				dux, dvy := ix*uh[i], iy*vh[i]
				dmax = math.Max(dmax, cabs(dux+dvy+dwdz))
				gmax = math.Max(gmax, cabs(dux)+cabs(dvy)+cabs(dwdz))
				if k > 0 {
					gmax = math.Max(gmax, math.Max(cabs(uh[i]-uh[i-ncp]), cabs(vh[i]-vh[i-ncp]))/g.Hf[k])
				}
			}
		}
	}
	s.divMax[2*part], s.divMax[2*part+1] = dmax, gmax
}
