package solver

import (
	"errors"
	"fmt"
	"math"
)

// Cluster describes a smooth vertical clustering of cells. The cell density
// (cells per metre, up to a constant) is
//
//	φ(z) = 1 + (Bed−1)·exp(−z/BedWidth) + (AtFactor−1)·exp(−((z−At)/AtWidth)²)
//
// so that the spacing near the bed is about Bed times finer, and around
// z = At about AtFactor times finer, than far from both. Factors of 1 (or a
// zero Cluster) give a uniform grid. Widths are in m.
type Cluster struct {
	Bed      float64 // spacing refinement at the bed, >= 1
	BedWidth float64 // m, e-folding distance of the bed refinement
	At       float64 // m, height of the second refinement; 0 for none
	AtFactor float64 // spacing refinement around At, >= 1
	AtWidth  float64 // m, Gaussian half-width of the second refinement
}

func (c Cluster) uniform() bool {
	return (c.Bed <= 1 || c.BedWidth <= 0) && (c.At <= 0 || c.AtFactor <= 1 || c.AtWidth <= 0)
}

// cumulative returns ∫₀^z φ dz'.
func (c Cluster) cumulative(z float64) float64 {
	s := z
	if c.Bed > 1 && c.BedWidth > 0 {
		s += (c.Bed - 1) * c.BedWidth * (1 - math.Exp(-z/c.BedWidth))
	}
	if c.At > 0 && c.AtFactor > 1 && c.AtWidth > 0 {
		s += (c.AtFactor - 1) * c.AtWidth * math.Sqrt(math.Pi) / 2 *
			(math.Erf((z-c.At)/c.AtWidth) + math.Erf(c.At/c.AtWidth))
	}
	return s
}

// Grid is the computational mesh of a slice Lx long and H deep, or of a
// spanwise-periodic box Ly wide (Ny > 1).
type Grid struct {
	Nx, Nz int
	Lx, H  float64
	// Ny is the number of points across the span, 1 in the slice; Ly (m)
	// is the spanwise period, 0 in the slice.
	Ny int
	Ly float64
	Dx float64   // m, Lx/Nx
	X  []float64 // m, Nx sample positions i·Dx
	Zf []float64 // m, Nz+1 face heights, Zf[0] = 0, Zf[Nz] = H
	Zc []float64 // m, Nz cell-centre heights
	Dz []float64 // m, Nz cell heights Zf[k+1] − Zf[k]
	Hf []float64 // m, Nz+1 centre-to-centre distances at faces: Hf[j] = Zc[j] − Zc[j−1] for 1 <= j < Nz; Hf[0], Hf[Nz] are the wall-to-centre distances
}

// NewGrid builds the grid. The faces and centres are the images of evenly
// spaced points ξ = j/Nz and ξ = (k+½)/Nz under the smooth mapping defined
// by the cluster density, so the scheme stays second order on stretched
// grids.
func NewGrid(nx, nz int, lx, h float64, c Cluster) (*Grid, error) {
	switch {
	case nx < 8 || nx%2 != 0:
		return nil, fmt.Errorf("solver: grid: Nx = %d: need an even number >= 8", nx)
	case nz < 4:
		return nil, fmt.Errorf("solver: grid: Nz = %d: need >= 4", nz)
	case !(lx > 0) || math.IsInf(lx, 0):
		return nil, fmt.Errorf("solver: grid: Lx = %g m: need a finite length > 0", lx)
	case !(h > 0) || math.IsInf(h, 0):
		return nil, fmt.Errorf("solver: grid: H = %g m: need a finite depth > 0", h)
	case c.Bed != 0 && c.Bed < 1:
		return nil, fmt.Errorf("solver: grid: bed clustering factor %g: need >= 1 (a smaller factor folds the grid)", c.Bed)
	case c.AtFactor != 0 && c.AtFactor < 1:
		return nil, fmt.Errorf("solver: grid: clustering factor %g at z = %g m: need >= 1", c.AtFactor, c.At)
	case c.At < 0 || c.At >= h && c.At != 0:
		return nil, fmt.Errorf("solver: grid: clustering height %g m: need 0 < At < H = %g m", c.At, h)
	}
	g := &Grid{Nx: nx, Nz: nz, Lx: lx, H: h, Dx: lx / float64(nx), Ny: 1}
	g.X = make([]float64, nx)
	for i := range g.X {
		g.X[i] = float64(i) * g.Dx
	}
	g.Zf = make([]float64, nz+1)
	g.Zc = make([]float64, nz)
	if c.uniform() {
		for j := range g.Zf {
			g.Zf[j] = h * float64(j) / float64(nz)
		}
		for k := range g.Zc {
			g.Zc[k] = h * (float64(k) + 0.5) / float64(nz)
		}
	} else {
		total := c.cumulative(h)
		inv := func(xi float64) float64 { return invertMonotone(c.cumulative, xi*total, 0, h) }
		for j := range g.Zf {
			g.Zf[j] = inv(float64(j) / float64(nz))
		}
		g.Zf[0], g.Zf[nz] = 0, h
		for k := range g.Zc {
			g.Zc[k] = inv((float64(k) + 0.5) / float64(nz))
		}
	}
	g.Dz = make([]float64, nz)
	for k := range g.Dz {
		g.Dz[k] = g.Zf[k+1] - g.Zf[k]
		if !(g.Dz[k] > 0) {
			return nil, errors.New("solver: grid: the clustering produced a cell of zero height; use smaller clustering factors")
		}
	}
	g.Hf = make([]float64, nz+1)
	g.Hf[0] = g.Zc[0]
	g.Hf[nz] = h - g.Zc[nz-1]
	for j := 1; j < nz; j++ {
		g.Hf[j] = g.Zc[j] - g.Zc[j-1]
	}
	return g, nil
}

// invertMonotone solves f(z) = target for z in [lo, hi] for an increasing f
// by bisection refined with secant steps; accurate to round-off.
func invertMonotone(f func(float64) float64, target, lo, hi float64) float64 {
	flo, fhi := f(lo)-target, f(hi)-target
	if flo >= 0 {
		return lo
	}
	if fhi <= 0 {
		return hi
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		// A secant guess inside the bracket speeds convergence.
		if s := lo - flo*(hi-lo)/(fhi-flo); s > lo && s < hi {
			mid = 0.5 * (mid + s)
		}
		fm := f(mid) - target
		if fm == 0 {
			return mid
		}
		if fm < 0 {
			lo, flo = mid, fm
		} else {
			hi, fhi = mid, fm
		}
		if hi-lo <= 1e-15*math.Max(1, math.Abs(hi)) {
			break
		}
	}
	return 0.5 * (lo + hi)
}

// MaxSpacingRatio returns the largest ratio between neighbouring cell
// heights, a measure of how abruptly the grid is stretched.
func (g *Grid) MaxSpacingRatio() float64 {
	r := 1.0
	for k := 1; k < g.Nz; k++ {
		q := g.Dz[k] / g.Dz[k-1]
		if q < 1 {
			q = 1 / q
		}
		r = math.Max(r, q)
	}
	return r
}

// MinDz returns the smallest cell height in m.
func (g *Grid) MinDz() float64 {
	m := math.Inf(1)
	for _, d := range g.Dz {
		m = math.Min(m, d)
	}
	return m
}

// KeptModes returns the highest Fourier mode m kept by the 2/3 rule: the
// largest m with 3m < Nx.
func (g *Grid) KeptModes() int { return (g.Nx - 1) / 3 }

// Wavenumber returns 2π m / Lx in 1/m.
func (g *Grid) Wavenumber(m int) float64 { return 2 * math.Pi * float64(m) / g.Lx }

// Y returns the spanwise position j·Ly/Ny of point j of a plane in m (0 in
// the slice).
func (g *Grid) Y(j int) float64 { return float64(j) * g.Ly / float64(g.Ny) }

// KeptModesY returns the highest spanwise Fourier mode kept by the 2/3
// rule, the largest l with 3l < Ny (0 in the slice).
func (g *Grid) KeptModesY() int { return (g.Ny - 1) / 3 }

// WavenumberY returns 2π l / Ly in 1/m for the spanwise mode l (negative l
// for the modes stored above Ny/2).
func (g *Grid) WavenumberY(l int) float64 { return 2 * math.Pi * float64(l) / g.Ly }
