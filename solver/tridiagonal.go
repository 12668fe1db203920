package solver

import "math"

// The forward elimination of the implicit vertical solves (the Thomas
// algorithm for the tridiagonal systems in z). One kernel serves the u, w
// and scalar rows: per level k and column i of a block it assembles the
// stage's right-hand side and runs one step of the Thomas algorithm,
//
//	K_b = D + (ν_b − ν) s, K_t = D + (ν_t − ν) s   (D = ν = 0, s = 1 for momentum)
//	lo = K_b g_l + l_X, up = K_t g_u + u_X
//	di = d_X − K_b g_l − K_t g_u − r_w |f| − k_b/Δz   (|f| → s at level 0 when given)
//	A  = a + k_b c_w/Δz
//	Lf = di f + lo f_below + up f_above + A
//	N  = F − X − (Z_t − Z_b)/Δz
//	rhs = f + Δt (α Lf + γ N + ζ N_prev) + βΔt A + e − cΔt P + cΔt λ c_w
//	den = 1/(1 − βΔt di + cΔt λ + βΔt lo cp_below)
//	cp = −βΔt up den, f ← (rhs + βΔt lo f_prev) den
//
// with ν_b, ν_t the viscosity at the level's lower and upper neighbours,
// g_l, g_u the geometry, (d_X, l_X, u_X, a, e, F, r_w) the level's wall and
// forcing terms, X the x-derivative of the x-flux, Z the z-flux, P the
// pressure gradient, λ the point-implicit sink (drag or uptake rate),
// k_b the bed transfer velocity and c = α + β. The rough-wall rate r_w
// multiplies |f|, or, where the caller gives the speed s along the bed per
// column (the horizontal speed of a three-dimensional run), s at level 0. The forward values overwrite
// the field row by row, the old row kept in a buffer for the level above;
// backSubstitute finishes the solve in place.

// Per-level values of thomasArgs.row, thomasRowLen to a level.
const (
	rowGl = iota
	rowGu
	rowIdz
	rowDX
	rowLX
	rowUX
	rowForce
	rowExtra
	rowRough
	rowAff
	thomasRowLen
)

// Stage values of thomasArgs.coef.
const (
	coefDt = iota
	coefAl
	coefGa
	coefZe
	coefCdt
	coefBdt
	coefD
	coefNu
	coefIsct
	coefCw
	thomasCoefLen
)

// thomasArgs is one forward elimination over the levels [k0, k1) of a block
// of n columns. f and cp hold level k at k·nx (sliced at the block's first
// column); the neighbour levels are clamped to [kLo, kHi], and the first
// level's lower neighbour is the clamped one. The other field arrays hold
// level k at (k−k0)·nx; px, nRead, nWrite and rate may be nil (zero, or not
// stored), rateOn marks the levels where rate applies, and bedK (per column)
// applies at level bedRow.
type thomasArgs struct {
	nx, n, k0, k1, kLo, kHi int
	f, cp                   []float64
	old, zero, scratch      []float64 // block rows: the old row below, zeros, a sink
	cb, ct, ax, gb, gt      []float64
	px, nRead, nWrite, rate []float64
	rateOn                  []bool
	bedK                    []float64
	bedRow                  int
	speed                   []float64 // per column: the speed along the bed at level 0 for r_w, or nil for |f|
	row                     []float64 // thomasRowLen values per level k
	coef                    [thomasCoefLen]float64
}

// eliminateGo is the forward elimination in Go: the reference for the
// compiled kernel and the kernel of builds without cgo.
func (a *thomasArgs) eliminateGo() {
	nx, n := a.nx, a.n
	c := &a.coef
	dt, al, ga, ze, cdt, bdt := c[coefDt], c[coefAl], c[coefGa], c[coefZe], c[coefCdt], c[coefBdt]
	D, nu, isct, cw := c[coefD], c[coefNu], c[coefIsct], c[coefCw]
	old := a.old[:n]
	for k := a.k0; k < a.k1; k++ {
		t := (k - a.k0) * nx
		rc := a.row[k*thomasRowLen : (k+1)*thomasRowLen]
		gl, gu, idz, dX, lX, uX := rc[rowGl], rc[rowGu], rc[rowIdz], rc[rowDX], rc[rowLX], rc[rowUX]
		force, extra, rough, aff := rc[rowForce], rc[rowExtra], rc[rowRough], rc[rowAff]
		kb, ka := max(k-1, a.kLo), min(k+1, a.kHi)
		f, cpk := a.f[k*nx:k*nx+n], a.cp[k*nx:k*nx+n]
		above, prev, cpb := a.f[ka*nx:ka*nx+n], a.f[kb*nx:kb*nx+n], a.cp[kb*nx:kb*nx+n]
		below := old
		if k == a.k0 {
			below = prev
		}
		cb, ct, ax, gb, gt := a.cb[t:t+n], a.ct[t:t+n], a.ax[t:t+n], a.gb[t:t+n], a.gt[t:t+n]
		px, nr, nw, lam, bk := a.zero[:n], a.zero[:n], a.scratch[:n], a.zero[:n], a.zero[:n]
		if a.px != nil {
			px = a.px[t : t+n]
		}
		if a.nRead != nil {
			nr = a.nRead[t : t+n]
		}
		if a.nWrite != nil {
			nw = a.nWrite[t : t+n]
		}
		if a.rate != nil && a.rateOn[k] {
			lam = a.rate[t : t+n]
		}
		if a.bedK != nil && k == a.bedRow {
			bk = a.bedK[:n]
		}
		var spd []float64
		if a.speed != nil && k == 0 {
			spd = a.speed[:n]
		}
		for i := range f {
			co := f[i]
			kl := D + (cb[i]-nu)*isct
			ku := D + (ct[i]-nu)*isct
			lo := kl*gl + lX
			up := ku*gu + uX
			sp := math.Abs(co)
			if spd != nil {
				sp = spd[i]
			}
			di := dX - kl*gl - ku*gu - rough*sp - bk[i]*idz
			affk := aff + bk[i]*cw*idz
			lf := di*co + lo*below[i] + up*above[i] + affk
			nn := force - ax[i] - (gt[i]-gb[i])*idz
			rhs := co + dt*(al*lf+ga*nn+ze*nr[i]) + bdt*affk + extra - cdt*px[i] + cdt*lam[i]*cw
			nw[i] = nn
			lc, uc := -bdt*lo, -bdt*up
			den := 1 / (1 - bdt*di + cdt*lam[i] - lc*cpb[i])
			cpk[i] = uc * den
			old[i] = co
			f[i] = (rhs - lc*prev[i]) * den
		}
	}
}

// backSubstituteGo finishes a Thomas solve in place over the rows [j0, j1)
// of f (row width nx) for the columns [i0, i0+n): row j ← row j − cp_j ·
// row j+1, top down from row j1−2, row j1−1 holding its final values.
// backSubstitute is the same in the compiled kernel where there is one.
func backSubstituteGo(f, cp []float64, nx, i0, n, j0, j1 int) {
	for j := j1 - 2; j >= j0; j-- {
		r := j*nx + i0
		row, next, c := f[r:r+n], f[r+nx:r+nx+n], cp[r:r+n]
		for i := range row {
			row[i] -= c[i] * next[i]
		}
	}
}
