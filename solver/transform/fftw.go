//go:build cgo

package transform

/*
#cgo pkg-config: fftw3
#include <stddef.h>
#include <fftw3.h>

// rb_plan_r2c plans howmany contiguous rows of n reals at in to rows of
// n/2+1 complex values at out.
static fftw_plan rb_plan_r2c(int n, int howmany, double *in, fftw_complex *out, unsigned flags) {
	return fftw_plan_many_dft_r2c(1, &n, howmany, in, NULL, 1, n, out, NULL, 1, n/2 + 1, flags);
}

// rb_plan_c2r is the inverse of rb_plan_r2c.
static fftw_plan rb_plan_c2r(int n, int howmany, fftw_complex *in, double *out, unsigned flags) {
	return fftw_plan_many_dft_c2r(1, &n, howmany, in, NULL, 1, n/2 + 1, out, NULL, 1, n, flags);
}

// rb_plan_r2c_2d plans howmany contiguous planes of ny rows of n reals at
// in to planes of ny rows of n/2+1 complex values at out.
static fftw_plan rb_plan_r2c_2d(int ny, int n, int howmany, double *in, fftw_complex *out, unsigned flags) {
	int dims[2] = {ny, n};
	return fftw_plan_many_dft_r2c(2, dims, howmany, in, NULL, 1, ny*n, out, NULL, 1, ny*(n/2 + 1), flags);
}

// rb_plan_c2r_2d is the inverse of rb_plan_r2c_2d.
static fftw_plan rb_plan_c2r_2d(int ny, int n, int howmany, fftw_complex *in, double *out, unsigned flags) {
	int dims[2] = {ny, n};
	return fftw_plan_many_dft_c2r(2, dims, howmany, in, NULL, 1, ny*(n/2 + 1), out, NULL, 1, ny*n, flags);
}

// rb_execute executes the plan p.
static void rb_execute(fftw_plan p) {
	fftw_execute(p);
}

// rb_forward executes the r2c plan p and multiplies its count complex
// outputs at out by s while they are still in cache.
static void rb_forward(fftw_plan p, fftw_complex *out, size_t count, double s) {
	fftw_execute(p);
	double *d = (double *)out;
	for (size_t i = 0; i < 2*count; i++) {
		d[i] *= s;
	}
}

// rb_inverse zeroes the imaginary parts of the first and last of the h
// coefficients of each of rows rows at in, then executes the c2r plan p.
static void rb_inverse(fftw_plan p, fftw_complex *in, size_t rows, size_t h) {
	for (size_t r = 0; r < rows; r++) {
		in[r*h][1] = 0;
		in[r*h + h - 1][1] = 0;
	}
	fftw_execute(p);
}

// rb_fftw_version is the linked library's fftw_version string.
static const char *rb_fftw_version(void) {
	return fftw_version;
}
*/
import "C"

import (
	"fmt"
	"sync"
	"unsafe"
)

// haveFFTW reports whether this build has the FFTW backend.
const haveFFTW = true

// FFTWVersion returns the version string of the FFTW library linked into
// this program, as the library states it ("fftw-3.3.10-sse2-avx"), or
// "not linked" in a build without cgo.
func FFTWVersion() string { return C.GoString(C.rb_fftw_version()) }

// plannerMu serialises every FFTW call except fftw_execute: FFTW's planner,
// fftw_destroy_plan and its allocator share global state and are not
// thread-safe. Another package of this program that calls FFTW directly
// would have to take this lock too.
var plannerMu sync.Mutex

// fftwFlags is the planner rigour. FFTW_ESTIMATE picks the algorithm from
// the sizes alone, so every process on every machine load makes the same
// plan and the same case gives the same numbers, bit for bit, run after run
// and across a checkpoint and resume (see package solver). FFTW_MEASURE
// would pick faster kernels (about 1.5× at N = 512) by timing candidates,
// but the choice, and so the last bits of the results, can change from one
// process to the next; using it needs wisdom saved and reloaded per
// machine.
const fftwFlags = C.FFTW_ESTIMATE

// fftwPlan is the FFTW backend. Each part has its own r2c/c2r plan pair,
// made on that part's rows of the shared buffers, so that parts can be
// executed concurrently (fftw_execute is thread-safe on distinct plans) and
// a part's rows are transformed by the same plan whether Forward or
// ForwardPart is called.
type fftwPlan struct {
	layout
	x    []float64    // physical buffer, C memory
	c    []complex128 // spectral buffer, C memory
	xbuf *C.double
	cbuf *C.fftw_complex
	fwd  []C.fftw_plan
	inv  []C.fftw_plan
	// scale is 1/N, applied to the r2c output, which FFTW leaves unscaled.
	scale  C.double
	closed bool
}

func newFFTW(l layout) (Plan, error) {
	p := &fftwPlan{layout: l, scale: C.double(1 / float64(l.n*l.ny))}
	nx, nc := l.rows*l.ny*l.n, l.rows*l.ny*l.h

	plannerMu.Lock()
	defer plannerMu.Unlock()

	p.xbuf = (*C.double)(C.fftw_malloc(C.size_t(nx) * C.sizeof_double))
	p.cbuf = (*C.fftw_complex)(C.fftw_malloc(C.size_t(nc) * C.sizeof_fftw_complex))
	if p.xbuf == nil || p.cbuf == nil {
		p.release()
		return nil, fmt.Errorf("transform: fftw_malloc failed for %d rows of n = %d", l.rows, l.n)
	}
	x := unsafe.Slice((*float64)(unsafe.Pointer(p.xbuf)), nx)
	c := unsafe.Slice((*complex128)(unsafe.Pointer(p.cbuf)), nc)

	parts := l.Parts()
	p.fwd = make([]C.fftw_plan, parts)
	p.inv = make([]C.fftw_plan, parts)
	for i := range parts {
		lo, hi := l.start[i], l.start[i+1]
		xp := (*C.double)(unsafe.Pointer(&x[lo*l.ny*l.n]))
		cp := (*C.fftw_complex)(unsafe.Pointer(&c[lo*l.ny*l.h]))
		n, m := C.int(l.n), C.int(hi-lo)
		if l.ny > 1 {
			// Multi-dimensional c2r transforms cannot preserve their input
			// either; the forward one may keep it.
			p.fwd[i] = C.rb_plan_r2c_2d(C.int(l.ny), n, m, xp, cp, fftwFlags|C.FFTW_PRESERVE_INPUT)
			p.inv[i] = C.rb_plan_c2r_2d(C.int(l.ny), n, m, cp, xp, fftwFlags|C.FFTW_DESTROY_INPUT)
		} else {
			p.fwd[i] = C.rb_plan_r2c(n, m, xp, cp, fftwFlags|C.FFTW_PRESERVE_INPUT)
			p.inv[i] = C.rb_plan_c2r(n, m, cp, xp, fftwFlags|C.FFTW_DESTROY_INPUT)
		}
		if p.fwd[i] == nil || p.inv[i] == nil {
			p.release()
			return nil, fmt.Errorf("transform: FFTW could not plan part %d (%d rows of n = %d)", i, hi-lo, l.n)
		}
	}
	// MEASURE has overwritten the buffers; the contract is that they start
	// zeroed.
	clear(x)
	clear(c)
	p.x, p.c = x, c
	return p, nil
}

// release destroys whatever plans and buffers p holds. The caller holds
// plannerMu.
func (p *fftwPlan) release() {
	for i := range p.fwd {
		if p.fwd[i] != nil {
			C.fftw_destroy_plan(p.fwd[i])
		}
		if p.inv[i] != nil {
			C.fftw_destroy_plan(p.inv[i])
		}
	}
	p.fwd, p.inv = nil, nil
	if p.xbuf != nil {
		C.fftw_free(unsafe.Pointer(p.xbuf))
	}
	if p.cbuf != nil {
		C.fftw_free(unsafe.Pointer(p.cbuf))
	}
	p.xbuf, p.cbuf = nil, nil
	p.x, p.c = nil, nil
}

func (p *fftwPlan) Real() []float64    { return p.x }
func (p *fftwPlan) Spec() []complex128 { return p.c }

// Forward transforms the parts one after another with their own plans, so
// its results are bit for bit those of ForwardPart on every part.
func (p *fftwPlan) Forward() {
	if p.closed {
		panic(errClosed)
	}
	for i := range p.fwd {
		p.ForwardPart(i)
	}
}

// Inverse transforms the parts one after another, like Forward.
func (p *fftwPlan) Inverse() {
	if p.closed {
		panic(errClosed)
	}
	for i := range p.inv {
		p.InversePart(i)
	}
}

func (p *fftwPlan) ForwardPart(i int) {
	if p.closed {
		panic(errClosed)
	}
	p.checkPart(i)
	lo, hi := p.start[i], p.start[i+1]
	C.rb_forward(p.fwd[i], (*C.fftw_complex)(unsafe.Pointer(&p.c[lo*p.ny*p.h])), C.size_t((hi-lo)*p.ny*p.h), p.scale)
}

func (p *fftwPlan) InversePart(i int) {
	if p.closed {
		panic(errClosed)
	}
	p.checkPart(i)
	lo, hi := p.start[i], p.start[i+1]
	if p.ny > 1 {
		ny, h := p.ny, p.h
		for pl := lo; pl < hi; pl++ {
			hermitian(p.c[pl*ny*h:(pl+1)*ny*h], ny, h)
		}
		C.rb_execute(p.inv[i])
		return
	}
	C.rb_inverse(p.inv[i], (*C.fftw_complex)(unsafe.Pointer(&p.c[lo*p.h])), C.size_t(hi-lo), C.size_t(p.h))
}

// Close destroys the plans and frees the buffers; later calls do nothing.
func (p *fftwPlan) Close() {
	if p.closed {
		return
	}
	plannerMu.Lock()
	p.release()
	plannerMu.Unlock()
	p.closed = true
}
