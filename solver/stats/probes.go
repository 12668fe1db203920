package stats

import (
	"math"

	"rollerbed/solver"
)

// Probe is a point where time series are recorded: u at the nearest centre
// and w at the nearest face in z, at the nearest sample in x.
type Probe struct {
	X, Z    float64 // m, the point asked for
	i, k, j int
}

// Probes records u and w at fixed points every sample.
type Probes struct {
	Points []Probe
	T      []float64   // s
	U, W   [][]float64 // m/s, one series per probe
}

// NewProbes places probes at the given (x, z) points of grid g (x wraps
// periodically; z is clamped to the domain).
func NewProbes(g *solver.Grid, xs, zs []float64) *Probes {
	p := &Probes{}
	for n := range xs {
		x := math.Mod(xs[n], g.Lx)
		if x < 0 {
			x += g.Lx
		}
		i := int(math.Round(x/g.Dx)) % g.Nx
		pr := Probe{X: xs[n], Z: zs[n], i: i, k: nearest(g.Zc, zs[n]), j: nearest(g.Zf[1:g.Nz], zs[n]) + 1}
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
	nx := s.Grid().Nx
	u, w := s.U(), s.W()
	p.T = append(p.T, s.Time())
	for n, pr := range p.Points {
		p.U[n] = append(p.U[n], u[pr.k*nx+pr.i])
		p.W[n] = append(p.W[n], w[pr.j*nx+pr.i])
	}
}
