package transform

import "gonum.org/v1/gonum/dsp/fourier"

// gonumPlan is the pure-Go backend. gonum's FFT.Coefficients computes the
// unscaled sums Σ_j x_j exp(−2πi jk/N), k = 0..N/2, and FFT.Sequence the
// unnormalised Hermitian synthesis c_0 + 2 Σ_(0<k<N/2) Re(c_k exp(+2πi jk/N))
// + c_(N/2) (−1)^j reading only the real parts of c_0 and c_(N/2); so the
// package convention is Coefficients times 1/N, and Sequence as it is.
//
// Each part has its own fourier.FFT, whose work arrays make it unsafe for
// concurrent use. A plan of planes composes the transforms: real ones along
// each row of a plane, then complex ones (fourier.CmplxFFT, per part, with a
// column buffer) down each of its h columns.
type gonumPlan struct {
	layout
	x      []float64
	c      []complex128
	ffts   []*fourier.FFT
	cffts  []*fourier.CmplxFFT // per part, planes only
	col    [][]complex128      // per part, ny values, planes only
	scale  float64
	closed bool
}

func newGonum(l layout) *gonumPlan {
	p := &gonumPlan{
		layout: l,
		x:      make([]float64, l.rows*l.ny*l.n),
		c:      make([]complex128, l.rows*l.ny*l.h),
		ffts:   make([]*fourier.FFT, l.Parts()),
		scale:  1 / float64(l.n*l.ny),
	}
	for i := range p.ffts {
		p.ffts[i] = fourier.NewFFT(l.n)
	}
	if l.ny > 1 {
		p.cffts, p.col = make([]*fourier.CmplxFFT, l.Parts()), make([][]complex128, l.Parts())
		for i := range p.cffts {
			p.cffts[i] = fourier.NewCmplxFFT(l.ny)
			p.col[i] = make([]complex128, l.ny)
		}
	}
	return p
}

func (p *gonumPlan) Real() []float64    { return p.x }
func (p *gonumPlan) Spec() []complex128 { return p.c }

func (p *gonumPlan) Forward() {
	if p.closed {
		panic(errClosed)
	}
	for i := range p.ffts {
		p.ForwardPart(i)
	}
}

func (p *gonumPlan) Inverse() {
	if p.closed {
		panic(errClosed)
	}
	for i := range p.ffts {
		p.InversePart(i)
	}
}

func (p *gonumPlan) ForwardPart(i int) {
	if p.closed {
		panic(errClosed)
	}
	p.checkPart(i)
	if p.ny > 1 {
		p.forwardPlanes(i)
		return
	}
	f, n, h, s := p.ffts[i], p.n, p.h, p.scale
	for r := p.start[i]; r < p.start[i+1]; r++ {
		c := p.c[r*h : (r+1)*h]
		f.Coefficients(c, p.x[r*n:(r+1)*n])
		for k, v := range c {
			c[k] = complex(real(v)*s, imag(v)*s)
		}
	}
}

func (p *gonumPlan) InversePart(i int) {
	if p.closed {
		panic(errClosed)
	}
	p.checkPart(i)
	if p.ny > 1 {
		p.inversePlanes(i)
		return
	}
	f, n, h := p.ffts[i], p.n, p.h
	for r := p.start[i]; r < p.start[i+1]; r++ {
		f.Sequence(p.x[r*n:(r+1)*n], p.c[r*h:(r+1)*h])
	}
}

// forwardPlanes transforms the planes of part i: each row along x, then
// each column along y, scaled by 1/(N·Ny).
func (p *gonumPlan) forwardPlanes(i int) {
	f, cf, col, n, h, ny, s := p.ffts[i], p.cffts[i], p.col[i], p.n, p.h, p.ny, p.scale
	for r := p.start[i] * ny; r < p.start[i+1]*ny; r++ {
		f.Coefficients(p.c[r*h:(r+1)*h], p.x[r*n:(r+1)*n])
	}
	for pl := p.start[i]; pl < p.start[i+1]; pl++ {
		c := p.c[pl*ny*h : (pl+1)*ny*h]
		for k := 0; k < h; k++ {
			for l := range col {
				col[l] = c[l*h+k]
			}
			cf.Coefficients(col, col)
			for l, v := range col {
				c[l*h+k] = complex(real(v)*s, imag(v)*s)
			}
		}
	}
}

// inversePlanes makes each plane's spectrum Hermitian, transforms its
// columns back along y and then its rows along x.
func (p *gonumPlan) inversePlanes(i int) {
	f, cf, col, n, h, ny := p.ffts[i], p.cffts[i], p.col[i], p.n, p.h, p.ny
	for pl := p.start[i]; pl < p.start[i+1]; pl++ {
		c := p.c[pl*ny*h : (pl+1)*ny*h]
		hermitian(c, ny, h)
		for k := 0; k < h; k++ {
			for l := range col {
				col[l] = c[l*h+k]
			}
			cf.Sequence(col, col)
			for l, v := range col {
				c[l*h+k] = v
			}
		}
	}
	for r := p.start[i] * ny; r < p.start[i+1]*ny; r++ {
		f.Sequence(p.x[r*n:(r+1)*n], p.c[r*h:(r+1)*h])
	}
}

// Close drops the buffers; later calls do nothing.
func (p *gonumPlan) Close() {
	p.x, p.c, p.ffts, p.cffts, p.col = nil, nil, nil, nil, nil
	p.closed = true
}
