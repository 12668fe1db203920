package transform

import "gonum.org/v1/gonum/dsp/fourier"

// gonumPlan is the pure-Go backend. gonum's FFT.Coefficients computes the
// unscaled sums Σ_j x_j exp(−2πi jk/N), k = 0..N/2, and FFT.Sequence the
// unnormalised Hermitian synthesis c_0 + 2 Σ_(0<k<N/2) Re(c_k exp(+2πi jk/N))
// + c_(N/2) (−1)^j reading only the real parts of c_0 and c_(N/2); so the
// package convention is Coefficients times 1/N, and Sequence as it is.
//
// Each part has its own fourier.FFT, whose work arrays make it unsafe for
// concurrent use.
type gonumPlan struct {
	layout
	x      []float64
	c      []complex128
	ffts   []*fourier.FFT
	scale  float64
	closed bool
}

func newGonum(l layout) *gonumPlan {
	p := &gonumPlan{
		layout: l,
		x:      make([]float64, l.rows*l.n),
		c:      make([]complex128, l.rows*l.h),
		ffts:   make([]*fourier.FFT, l.Parts()),
		scale:  1 / float64(l.n),
	}
	for i := range p.ffts {
		p.ffts[i] = fourier.NewFFT(l.n)
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
	f, n, h := p.ffts[i], p.n, p.h
	for r := p.start[i]; r < p.start[i+1]; r++ {
		f.Sequence(p.x[r*n:(r+1)*n], p.c[r*h:(r+1)*h])
	}
}

// Close drops the buffers; later calls do nothing.
func (p *gonumPlan) Close() {
	p.x, p.c, p.ffts = nil, nil, nil
	p.closed = true
}
