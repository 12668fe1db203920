package solver

import "math"

// The inner loops of the explicit phase, one level row of Nx values at a
// time. Each has a Go version (the reference, and the kernel of builds
// without cgo) and a compiled one in rows_cgo.go that makes the same
// operations in the same order without fused multiply-adds, so that both
// give the same numbers and the C compiler may vectorise the loop. All
// slices of one call have the length of the first one named in its doc.

// viscRowGo sets the Smagorinsky viscosity (m²/s) of an interior level,
//
//	nuc = nu + l2·(2(ux² + wz²) + ½(sb² + st²))^½,
//	wz = (wt − wb)·idz, sb = (cen − below)·ihb + wxb, st = (above − cen)·iht + wxt,
//
// from u at the level (cen) and the levels below and above, ∂u/∂x (ux), w
// and ∂w/∂x at the faces below and above (wb, wt, wxb, wxt); len(cen).
func viscRowGo(nu, l2, idz, ihb, iht float64, cen, below, above, ux, wb, wt, wxb, wxt, nuc []float64) {
	n := len(cen)
	below, above, ux, wb, wt, wxb, wxt, nuc = below[:n], above[:n], ux[:n], wb[:n], wt[:n], wxb[:n], wxt[:n], nuc[:n]
	for i := range cen {
		sb := (cen[i]-below[i])*ihb + wxb[i]
		st := (above[i]-cen[i])*iht + wxt[i]
		wz := (wt[i] - wb[i]) * idz
		s2 := 2*(ux[i]*ux[i]+wz*wz) + 0.5*(sb*sb+st*st)
		nuc[i] = nu + l2*math.Sqrt(s2)
	}
}

// centreRowGo sets the centre fluxes of a level, A = u u − 2ν ∂u/∂x and
// cz = w_c w_c − ν ∂w/∂z with w_c = lo·wb + hi·wt; len(u).
func centreRowGo(lo, hi, idz float64, u, ux, nuc, wb, wt, fA, cz []float64) {
	n := len(u)
	ux, nuc, wb, wt, fA, cz = ux[:n], nuc[:n], wb[:n], wt[:n], fA[:n], cz[:n]
	for i, uu := range u {
		fA[i] = uu*uu - 2*nuc[i]*ux[i]
		wc := lo*wb[i] + hi*wt[i]
		cz[i] = wc*wc - nuc[i]*(wt[i]-wb[i])*idz
	}
}

// scalarXFluxGo sets a scalar's x-flux u c − K ∂c/∂x at a level, with
// K = D + (nuc − nu)·isct; len(u).
func scalarXFluxGo(D, nu, isct float64, u, nuc, c, cx, fx []float64) {
	n := len(u)
	nuc, c, cx, fx = nuc[:n], c[:n], cx[:n], fx[:n]
	for i, uu := range u {
		K := D + (nuc[i]-nu)*isct
		fx[i] = uu*c[i] - K*cx[i]
	}
}

// interpRowGo sets dst = a·x + b·y; len(dst).
func interpRowGo(a, b float64, x, y, dst []float64) {
	n := len(dst)
	x, y = x[:n], y[:n]
	for i := range dst {
		dst[i] = a*x[i] + b*y[i]
	}
}

// faceRowGo sets the momentum fluxes at an interior face,
// gu = u_f w − ν ∂w/∂x and Gw = gu − ν (ut − ub)·ih with u_f = a·ub + b·ut;
// len(nuf).
func faceRowGo(a, b, ih float64, ub, ut, w, wx, nuf, gu, fG []float64) {
	n := len(nuf)
	ub, ut, w, wx, gu, fG = ub[:n], ut[:n], w[:n], wx[:n], gu[:n], fG[:n]
	for i, nf := range nuf {
		uw := (a*ub[i] + b*ut[i]) * w[i]
		nwx := nf * wx[i]
		gu[i] = uw - nwx
		fG[i] = uw - nwx - nf*(ut[i]-ub[i])*ih
	}
}

// scalarZFluxGo sets a scalar's advective flux at a face,
// gc = w·(a·cb + b·ct); len(w).
func scalarZFluxGo(a, b float64, w, cb, ct, gc []float64) {
	n := len(w)
	cb, ct, gc = cb[:n], ct[:n], gc[:n]
	for i, wv := range w {
		gc[i] = wv * (a*cb[i] + b*ct[i])
	}
}
