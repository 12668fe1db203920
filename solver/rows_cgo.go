//go:build cgo && amd64

package solver

/*
#cgo CFLAGS: -O3
#pragma GCC optimize("fp-contract=off")
#include <emmintrin.h>

// The row kernels of rows.go in C, the same operations in the same order.
// Every array of a call is distinct from the ones it writes. The compiler
// will not vectorise a loop that calls sqrt (it may set errno), so the
// kernels with a square root store its argument, take the roots in place
// with the SSE2 instruction (correctly rounded, as sqrt is) and finish in a
// third loop.

// rb_sqrt_row replaces each of the n values at x by its square root.
static void rb_sqrt_row(long n, double *x) {
	long i = 0;
	for (; i + 2 <= n; i += 2) {
		_mm_storeu_pd(x + i, _mm_sqrt_pd(_mm_loadu_pd(x + i)));
	}
	for (; i < n; i++) {
		_mm_store_sd(x + i, _mm_sqrt_sd(_mm_setzero_pd(), _mm_load_sd(x + i)));
	}
}

__attribute__((target_clones("avx2", "default")))
static void rb_visc_arg(long n, double idz, double ihb, double iht,
		const double *restrict cen, const double *restrict below, const double *restrict above,
		const double *restrict ux, const double *restrict wb, const double *restrict wt,
		const double *restrict wxb, const double *restrict wxt, double *restrict s2) {
	for (long i = 0; i < n; i++) {
		const double sb = (cen[i] - below[i]) * ihb + wxb[i];
		const double st = (above[i] - cen[i]) * iht + wxt[i];
		const double wz = (wt[i] - wb[i]) * idz;
		s2[i] = 2 * (ux[i] * ux[i] + wz * wz) + 0.5 * (sb * sb + st * st);
	}
}

__attribute__((target_clones("avx2", "default")))
static void rb_affine_row(long n, double a, double b, double *restrict x) {
	for (long i = 0; i < n; i++) {
		x[i] = a + b * x[i];
	}
}

void rb_visc_row(long n, double nu, double l2, double idz, double ihb, double iht,
		const double *restrict cen, const double *restrict below, const double *restrict above,
		const double *restrict ux, const double *restrict wb, const double *restrict wt,
		const double *restrict wxb, const double *restrict wxt, double *restrict nuc) {
	rb_visc_arg(n, idz, ihb, iht, cen, below, above, ux, wb, wt, wxb, wxt, nuc);
	rb_sqrt_row(n, nuc);
	rb_affine_row(n, nu, l2, nuc);
}

__attribute__((target_clones("avx2", "default")))
void rb_centre_row(long n, double lo, double hi, double idz,
		const double *restrict u, const double *restrict ux, const double *restrict nuc,
		const double *restrict wb, const double *restrict wt, double *restrict fA, double *restrict cz) {
	for (long i = 0; i < n; i++) {
		const double uu = u[i];
		fA[i] = uu * uu - 2 * nuc[i] * ux[i];
		const double wc = lo * wb[i] + hi * wt[i];
		cz[i] = wc * wc - nuc[i] * (wt[i] - wb[i]) * idz;
	}
}

__attribute__((target_clones("avx2", "default")))
void rb_scalar_xflux(long n, double D, double nu, double isct,
		const double *restrict u, const double *restrict nuc, const double *restrict c,
		const double *restrict cx, double *restrict fx) {
	for (long i = 0; i < n; i++) {
		const double K = D + (nuc[i] - nu) * isct;
		fx[i] = u[i] * c[i] - K * cx[i];
	}
}

__attribute__((target_clones("avx2", "default")))
void rb_interp_row(long n, double a, double b, const double *restrict x, const double *restrict y,
		double *restrict dst) {
	for (long i = 0; i < n; i++) {
		dst[i] = a * x[i] + b * y[i];
	}
}

__attribute__((target_clones("avx2", "default")))
void rb_face_row(long n, double a, double b, double ih,
		const double *restrict ub, const double *restrict ut, const double *restrict w,
		const double *restrict wx, const double *restrict nuf, double *restrict gu, double *restrict fG) {
	for (long i = 0; i < n; i++) {
		const double nf = nuf[i];
		const double uw = (a * ub[i] + b * ut[i]) * w[i];
		const double nwx = nf * wx[i];
		gu[i] = uw - nwx;
		fG[i] = uw - nwx - nf * (ut[i] - ub[i]) * ih;
	}
}

__attribute__((target_clones("avx2", "default")))
void rb_scalar_zflux(long n, double a, double b, const double *restrict w, const double *restrict cb,
		const double *restrict ct, double *restrict gc) {
	for (long i = 0; i < n; i++) {
		gc[i] = w[i] * (a * cb[i] + b * ct[i]);
	}
}

*/
import "C"

// The wrappers below are the compiled versions of the *Go kernels in
// rows.go, with the same arguments.

// rowPtr returns the address of f[0] for C (nil for n = 0, which the
// kernels never read) after checking that f holds at least n values; a
// short row is a programmer error.
func rowPtr(f []float64, n int) *C.double {
	return ptr(f[:n:n])
}

func viscRow(nu, l2, idz, ihb, iht float64, cen, below, above, ux, wb, wt, wxb, wxt, nuc []float64) {
	n := len(cen)
	C.rb_visc_row(C.long(n), C.double(nu), C.double(l2), C.double(idz), C.double(ihb), C.double(iht),
		rowPtr(cen, n), rowPtr(below, n), rowPtr(above, n), rowPtr(ux, n), rowPtr(wb, n), rowPtr(wt, n),
		rowPtr(wxb, n), rowPtr(wxt, n), rowPtr(nuc, n))
}

func centreRow(lo, hi, idz float64, u, ux, nuc, wb, wt, fA, cz []float64) {
	n := len(u)
	C.rb_centre_row(C.long(n), C.double(lo), C.double(hi), C.double(idz),
		rowPtr(u, n), rowPtr(ux, n), rowPtr(nuc, n), rowPtr(wb, n), rowPtr(wt, n), rowPtr(fA, n), rowPtr(cz, n))
}

func scalarXFlux(D, nu, isct float64, u, nuc, c, cx, fx []float64) {
	n := len(u)
	C.rb_scalar_xflux(C.long(n), C.double(D), C.double(nu), C.double(isct),
		rowPtr(u, n), rowPtr(nuc, n), rowPtr(c, n), rowPtr(cx, n), rowPtr(fx, n))
}

func interpRow(a, b float64, x, y, dst []float64) {
	n := len(dst)
	C.rb_interp_row(C.long(n), C.double(a), C.double(b), rowPtr(x, n), rowPtr(y, n), rowPtr(dst, n))
}

func faceRow(a, b, ih float64, ub, ut, w, wx, nuf, gu, fG []float64) {
	n := len(nuf)
	C.rb_face_row(C.long(n), C.double(a), C.double(b), C.double(ih),
		rowPtr(ub, n), rowPtr(ut, n), rowPtr(w, n), rowPtr(wx, n), rowPtr(nuf, n), rowPtr(gu, n), rowPtr(fG, n))
}

func scalarZFlux(a, b float64, w, cb, ct, gc []float64) {
	n := len(w)
	C.rb_scalar_zflux(C.long(n), C.double(a), C.double(b), rowPtr(w, n), rowPtr(cb, n), rowPtr(ct, n), rowPtr(gc, n))
}
