//go:build cgo && amd64

package solver

/*
#cgo CFLAGS: -O3
#pragma GCC optimize("fp-contract=off")
#include <math.h>

// rb_eliminate is thomasArgs.eliminateGo in C, the same operations in the
// same order (no contraction into fused multiply-adds), so that the compiler
// may vectorise the loop over the columns. Pointers that Go passes as nil are
// NULL here.
__attribute__((target_clones("avx2", "default")))
void rb_eliminate(long nx, long n, long k0, long k1, long klo, long khi,
		double *f, double *cp, double *old, const double *zero, double *scratch,
		const double *cb, const double *ct, const double *ax, const double *gb, const double *gt,
		const double *px, const double *nread, double *nwrite,
		const double *rate, const unsigned char *rateon, const double *bedk, long bedrow,
		const double *speed, const double *row, const double *coef) {
	const double dt = coef[0], al = coef[1], ga = coef[2], ze = coef[3], cdt = coef[4], bdt = coef[5];
	const double D = coef[6], nu = coef[7], isct = coef[8], cw = coef[9];
	for (long k = k0; k < k1; k++) {
		const long t = (k - k0) * nx;
		const double *rc = row + 10 * k;
		const double gl = rc[0], gu = rc[1], idz = rc[2], dX = rc[3], lX = rc[4], uX = rc[5];
		const double force = rc[6], extra = rc[7], rough = rc[8], aff = rc[9];
		const long kb = k - 1 < klo ? klo : k - 1, ka = k + 1 > khi ? khi : k + 1;
		double *fk = f + k * nx, *cpk = cp + k * nx;
		const double *above = f + ka * nx, *prev = f + kb * nx, *cpb = cp + kb * nx;
		const double *below = k == k0 ? prev : old;
		const double *cbr = cb + t, *ctr = ct + t, *axr = ax + t, *gbr = gb + t, *gtr = gt + t;
		const double *pxr = px ? px + t : zero, *nr = nread ? nread + t : zero;
		double *nw = nwrite ? nwrite + t : scratch;
		const double *lam = rate && rateon[k] ? rate + t : zero;
		const double *bk = bedk && k == bedrow ? bedk : zero;
		const double *spd = speed && k == 0 ? speed : NULL;
		// The same-index reads of f, N and a folded neighbour come before
		// the writes: no dependence is carried from one column to the next.
		#pragma GCC ivdep
		for (long i = 0; i < n; i++) {
			const double co = fk[i];
			const double kl = D + (cbr[i] - nu) * isct;
			const double ku = D + (ctr[i] - nu) * isct;
			const double lo = kl * gl + lX;
			const double up = ku * gu + uX;
			const double di = dX - kl * gl - ku * gu - rough * (spd ? spd[i] : fabs(co)) - bk[i] * idz;
			const double affk = aff + bk[i] * cw * idz;
			const double lf = di * co + lo * below[i] + up * above[i] + affk;
			const double nn = force - axr[i] - (gtr[i] - gbr[i]) * idz;
			const double rhs = co + dt * (al * lf + ga * nn + ze * nr[i]) + bdt * affk + extra - cdt * pxr[i] + cdt * lam[i] * cw;
			nw[i] = nn;
			const double lc = -bdt * lo, uc = -bdt * up;
			const double den = 1 / (1 - bdt * di + cdt * lam[i] - lc * cpb[i]);
			cpk[i] = uc * den;
			old[i] = co;
			fk[i] = (rhs - lc * prev[i]) * den;
		}
	}
}

// rb_back is backSubstituteGo in C over rows rows from f and cp.
__attribute__((target_clones("avx2", "default")))
void rb_back(long nx, long n, long rows, double *f, const double *cp) {
	for (long j = rows - 2; j >= 0; j--) {
		double *restrict row = f + j * nx;
		const double *restrict next = f + (j + 1) * nx, *restrict c = cp + j * nx;
		for (long i = 0; i < n; i++) {
			row[i] -= c[i] * next[i];
		}
	}
}
*/
import "C"

import "unsafe"

// The C kernel reads thomasRowLen = 10 values per level and the coefficients
// coefDt..coefCw at 0..9; these fail to compile if the Go layout changes.
var (
	_ [thomasRowLen - 10]struct{}
	_ [10 - thomasRowLen]struct{}
	_ [coefCw - 9]struct{}
	_ [9 - coefCw]struct{}
)

// ptr returns the address of f[0] for C, or nil for an empty f.
func ptr(f []float64) *C.double {
	if len(f) == 0 {
		return nil
	}
	return (*C.double)(unsafe.Pointer(&f[0]))
}

// eliminate runs the forward elimination in the compiled kernel.
func (a *thomasArgs) eliminate() {
	var on *C.uchar
	if len(a.rateOn) > 0 {
		on = (*C.uchar)(unsafe.Pointer(&a.rateOn[0]))
	}
	C.rb_eliminate(C.long(a.nx), C.long(a.n), C.long(a.k0), C.long(a.k1), C.long(a.kLo), C.long(a.kHi),
		ptr(a.f), ptr(a.cp), ptr(a.old), ptr(a.zero), ptr(a.scratch),
		ptr(a.cb), ptr(a.ct), ptr(a.ax), ptr(a.gb), ptr(a.gt),
		ptr(a.px), ptr(a.nRead), ptr(a.nWrite),
		ptr(a.rate), on, ptr(a.bedK), C.long(a.bedRow),
		ptr(a.speed), ptr(a.row), (*C.double)(unsafe.Pointer(&a.coef[0])))
}

// backSubstitute runs backSubstituteGo's loops in the compiled kernel,
// after checking that f and cp hold every row it touches.
func backSubstitute(f, cp []float64, nx, i0, n, j0, j1 int) {
	if j1-j0 < 2 || n == 0 {
		return
	}
	end := (j1-1)*nx + i0 + n
	f, cp = f[j0*nx+i0:end:end], cp[j0*nx+i0:end:end]
	C.rb_back(C.long(nx), C.long(n), C.long(j1-j0), ptr(f), ptr(cp))
}
