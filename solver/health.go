package solver

import "math"

// scanPart finds, for its share of centre levels, the largest local Courant
// rate k_max|u| + max(|w| below, |w| above)/Dz (1/s), plus k_max,y |v| in
// three dimensions, and its index. NaN values win.
func (s *Solver) scanPart(part int) {
	nx := s.np // values in a level
	k0, k1 := span(s.nz, s.crew.n, part)
	best, at := -1.0, -1
	for k := k0; k < k1; k++ {
		inv := 1 / s.g.Dz[k]
		r := k * nx
		for i := r; i < r+nx; i++ {
			rate := s.kmax*math.Abs(s.u[i]) + math.Max(math.Abs(s.w[i]), math.Abs(s.w[i+nx]))*inv
			if s.v != nil {
				rate += s.kmaxY * math.Abs(s.v[i])
			}
			if !(rate <= best) { // true for NaN too
				best, at = rate, i
				if math.IsNaN(rate) {
					s.scanRate[part], s.scanIdx[part] = rate, at
					return
				}
			}
		}
	}
	s.scanRate[part], s.scanIdx[part] = best, at
}

// scan returns the largest Courant rate (1/s) and the centre index where it
// occurs; the rate is NaN when the state holds NaN.
func (s *Solver) scan() (rate float64, at int) {
	s.crew.run(s.scanTask)
	rate, at = -1, 0
	for p := 0; p < s.crew.n; p++ {
		r := s.scanRate[p]
		if s.scanIdx[p] < 0 {
			continue
		}
		if math.IsNaN(r) {
			return r, s.scanIdx[p]
		}
		if r > rate {
			rate, at = r, s.scanIdx[p]
		}
	}
	return rate, at
}

func (s *Solver) courantRate() float64 {
	r, _ := s.scan()
	return r
}

// CourantNumber returns the Courant number of the current state with the
// step dt (s), in the definition of Config.CFL.
func (s *Solver) CourantNumber(dt float64) float64 { return s.courantRate() * dt }

func (s *Solver) checkHealth(dt float64) error {
	rate, at := s.scan()
	s.cachedRate, s.rateFresh = rate, true
	courant := rate * dt
	if !math.IsNaN(courant) && courant <= BlowUpLimit {
		return nil
	}
	k, i := at/s.np, at%s.np
	e := &BlowUpError{Time: s.t, Step: s.steps, X: s.g.X[i%s.nx], Y: s.g.Y(i / s.nx), Span: s.ny > 1, Z: s.g.Zc[k], Courant: courant}
	switch {
	case math.IsNaN(courant):
		e.Cause = "the velocity became NaN: the step was too large for the flow, or the forcing is far from a balance the grid can carry"
	default:
		e.Cause = "the velocity outgrew the step"
	}
	return e
}

// divergencePart measures, for its share of modes, the largest |D û| over
// levels (written to divMax[2 part]) and the largest velocity-gradient
// magnitude, max(|κ û| + |∂ŵ/∂z|, |∂û/∂z|) (divMax[2 part + 1]), both from
// the transformed copy of the velocity in flux.Spec().
func (s *Solver) divergencePart(part int) {
	if s.ny > 1 {
		s.spanDivergencePart(part)
		return
	}
	g, nz, nc := s.g, s.nz, s.nc
	spec := s.flux.Spec()
	uh, wh := spec[:nz*nc], spec[nz*nc:]
	m0, m1 := span(nc, s.crew.n, part)
	var dmax, gmax float64
	for m := m0; m < m1; m++ {
		ik := complex(0, s.kx[m])
		for k := 0; k < nz; k++ {
			i := k*nc + m
			dwdz := (wh[i+nc] - wh[i]) * complex(1/g.Dz[k], 0)
			dux := ik * uh[i]
			d := cabs(dux + dwdz)
			dmax = math.Max(dmax, d)
			gmax = math.Max(gmax, cabs(dux)+cabs(dwdz))
			if k > 0 {
				gmax = math.Max(gmax, cabs(uh[i]-uh[i-nc])/g.Hf[k])
			}
		}
	}
	s.divMax[2*part], s.divMax[2*part+1] = dmax, gmax
}

func cabs(c complex128) float64 { return math.Hypot(real(c), imag(c)) }

// Divergence returns the largest modulus of the discrete divergence over all
// Fourier modes and levels (1/s), and for scale the largest
// velocity-gradient modulus on the same modes: |∂u/∂x| + |∂w/∂z| or the
// shear |∂u/∂z|, whichever is larger. It uses the flux plan as
// scratch and must not be called during a step.
func (s *Solver) Divergence() (div, scale float64) {
	copy(s.flux.Real(), s.vel.Real())
	s.flux.Forward()
	s.crew.run(s.divergenceTask)
	for p := 0; p < s.crew.n; p++ {
		div = math.Max(div, s.divMax[2*p])
		scale = math.Max(scale, s.divMax[2*p+1])
	}
	return div, scale
}
