package stats

import (
	"math"
	"sort"

	"rollerbed/solver"
)

// Probe is a point where time series are recorded: u at the nearest centre
// and w at the nearest face in z, at the nearest sample in x (and in a
// slab in y).
type Probe struct {
	X, Z    float64 // m, the point asked for
	Y       float64 // m, across the span of a slab; 0 in the slice
	i, k, j int
	row     int // spanwise sample index in a slab
}

// Probes records u and w at fixed points every sample.
type Probes struct {
	Points []Probe
	T      []float64   // s
	U, W   [][]float64 // m/s, one series per probe
}

// NewProbes places probes at the given (x, z) points of grid g (x wraps
// periodically; z is clamped to the domain); in a slab at y = 0.
func NewProbes(g *solver.Grid, xs, zs []float64) *Probes {
	return NewProbesAcross(g, xs, nil, zs)
}

// NewProbesAcross places probes at the given (x, y, z) points of a slab's
// grid g (x and y wrap periodically; z is clamped to the domain); ys nil
// puts them at y = 0, and is the only choice in the slice.
func NewProbesAcross(g *solver.Grid, xs, ys, zs []float64) *Probes {
	p := &Probes{}
	wrap := func(x, l float64) float64 {
		x = math.Mod(x, l)
		if x < 0 {
			x += l
		}
		return x
	}
	for n := range xs {
		x := wrap(xs[n], g.Lx)
		i := int(math.Round(x/g.Dx)) % g.Nx
		pr := Probe{X: xs[n], Z: zs[n], i: i, k: nearest(g.Zc, zs[n]), j: nearest(g.Zf[1:g.Nz], zs[n]) + 1}
		if ys != nil && g.Ny > 1 {
			dy := g.Ly / float64(g.Ny)
			pr.Y, pr.row = ys[n], int(math.Round(wrap(ys[n], g.Ly)/dy))%g.Ny
		}
		p.Points = append(p.Points, pr)
	}
	p.U = make([][]float64, len(p.Points))
	p.W = make([][]float64, len(p.Points))
	return p
}

// nearest returns the index of the value in the increasing slice v closest
// to z.
func nearest(v []float64, z float64) int {
	best, at := math.Inf(1), 0
	for k, zz := range v {
		if d := math.Abs(zz - z); d < best {
			best, at = d, k
		}
	}
	return at
}

// Reserve makes room for at least n more samples so that Add does not
// allocate; it grows the series geometrically.
func (p *Probes) Reserve(n int) {
	grow := func(s []float64) []float64 {
		if cap(s)-len(s) < n {
			t := make([]float64, len(s), max(len(s)+n, 2*cap(s)))
			copy(t, s)
			return t
		}
		return s
	}
	p.T = grow(p.T)
	for i := range p.U {
		p.U[i] = grow(p.U[i])
		p.W[i] = grow(p.W[i])
	}
}

// Add records one sample.
func (p *Probes) Add(s *solver.Solver) {
	g := s.Grid()
	nx, np := g.Nx, levelSize(g)
	u, w := s.U(), s.W()
	p.T = append(p.T, s.Time())
	for n, pr := range p.Points {
		at := pr.row*nx + pr.i
		p.U[n] = append(p.U[n], u[pr.k*np+at])
		p.W[n] = append(p.W[n], w[pr.j*np+at])
	}
}

// minEvenSamples is the fewest samples after the start time that Even
// resamples.
const minEvenSamples = 8

// Even returns the probe series from the first sample at or after time
// from (s) to the last, resampled by EvenSeries: for spectra of a run
// with adaptive steps. It returns nil series when that span holds fewer
// than 8 samples.
func (p *Probes) Even(from float64) (u, w [][]float64, dt float64) {
	series := append(append([][]float64{}, p.U...), p.W...)
	even, dt := EvenSeries(p.T, series, from)
	if even == nil {
		return nil, nil, 0
	}
	return even[:len(p.U)], even[len(p.U):], dt
}

// EvenSeries resamples series sampled at the increasing times T (s), from
// the first sample at or after time from to the last, by linear
// interpolation onto as many evenly spaced times, dt (s) apart, as there
// are samples in that span. It returns nil when that span holds fewer than
// 8 samples.
func EvenSeries(T []float64, series [][]float64, from float64) (even [][]float64, dt float64) {
	k0 := sort.SearchFloat64s(T, from)
	if len(T)-k0 < minEvenSamples {
		return nil, 0
	}
	n := len(T) - k0
	dt = (T[len(T)-1] - T[k0]) / float64(n-1)
	even = make([][]float64, len(series))
	for i, v := range series {
		even[i] = resampleEven(T, v, k0, n, dt)
	}
	return even, dt
}

// resampleEven interpolates v(T) linearly onto n even times from T[k0] in
// steps of dt.
func resampleEven(T, v []float64, k0, n int, dt float64) []float64 {
	out := make([]float64, n)
	t0 := T[k0]
	j := k0
	for i := range out {
		t := t0 + float64(i)*dt
		for j < len(T)-2 && T[j+1] < t {
			j++
		}
		a := (t - T[j]) / (T[j+1] - T[j])
		out[i] = v[j] + a*(v[j+1]-v[j])
	}
	return out
}
