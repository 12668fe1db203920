package runs

import (
	"fmt"

	"rollerbed/io/casefile"
	"rollerbed/io/h5"
	"rollerbed/solver"
)

// A slab (the three-dimensional mode) writes what a slice writes, from
// its span averages, so every reader of a slice's run folder reads a
// slab's unchanged, and adds the three-dimensional fields (volumes) that
// only it has.

// levelSize returns the values in one level of grid g: Nx in the slice,
// Ny·Nx in a slab.
func levelSize(g *solver.Grid) int { return g.Nx * max(g.Ny, 1) }

// spanAverage returns the average over y of f, rows levels of ny·nx
// values, as rows × nx values; in the slice (ny <= 1) f itself.
func spanAverage(f []float64, rows, ny, nx int) []float64 {
	if ny <= 1 {
		return f
	}
	out := make([]float64, rows*nx)
	inv := 1 / float64(ny)
	for k := range rows {
		dst := out[k*nx : (k+1)*nx]
		for j := range ny {
			for i, v := range f[(k*ny+j)*nx : (k*ny+j+1)*nx] {
				dst[i] += v
			}
		}
		for i := range dst {
			dst[i] *= inv
		}
	}
	return out
}

// faceToCentres returns a face field f ((Nz+1)·np values, np per level)
// at the cell centres, linearly interpolated in z between the faces below
// and above each centre as the velocity vector of fields.h5 is.
func faceToCentres(g *solver.Grid, f []float64) []float64 {
	np := levelSize(g)
	out := make([]float64, g.Nz*np)
	for k := range g.Nz {
		a := (g.Zc[k] - g.Zf[k]) / (g.Zf[k+1] - g.Zf[k])
		for n := range np {
			lo, hi := f[k*np+n], f[(k+1)*np+n]
			out[k*np+n] = lo + float64(a*(hi-lo))
		}
	}
	return out
}

// centreDZ returns ∂f/∂z at the centres of a centre field f: centred
// differences between the neighbouring centres inside, one-sided at the
// first and last level (1/m times f's unit).
func centreDZ(g *solver.Grid, f []float64) []float64 {
	np, nz := levelSize(g), g.Nz
	out := make([]float64, nz*np)
	for k := range nz {
		lo, hi := max(k-1, 0), min(k+1, nz-1)
		h := g.Zc[hi] - g.Zc[lo]
		for n := range np {
			out[k*np+n] = (f[hi*np+n] - f[lo*np+n]) / h
		}
	}
	return out
}

// QCriterion returns the Q criterion of a slab's velocity at the cell
// centres (1/s²), Q = ½(|Ω|² − |S|²) = −½ ∂u_i/∂x_j ∂u_j/∂x_i for an
// incompressible flow (Hunt, Wray & Moin 1988, "Eddies, streams, and
// convergence zones in turbulent flows", Center for Turbulence Research
// Report CTR-S88, 193–208): positive in vortex cores, where rotation
// outweighs strain. The x and y derivatives are the solver's spectral
// ones; the z derivatives second-order differences, with ∂w/∂x and ∂w/∂y
// averaged from the faces. Nil in the slice.
func QCriterion(s *solver.Solver) []float64 {
	if !s.ThreeD() {
		return nil
	}
	g := s.Grid()
	np := levelSize(g)
	ux, uy, uz := s.DUDX(), s.DUDY(), centreDZ(g, s.U())
	vx, vy, vz := s.DVDX(), s.DVDY(), centreDZ(g, s.V())
	wx, wy := faceToCentres(g, s.DWDX()), faceToCentres(g, s.DWDY())
	w := s.W()
	q := make([]float64, g.Nz*np)
	for k := range g.Nz {
		for n := k * np; n < (k+1)*np; n++ {
			wz := (w[n+np] - w[n]) / g.Dz[k]
			q[n] = -0.5 * (ux[n]*ux[n] + vy[n]*vy[n] + wz*wz + 2*(uy[n]*vx[n]+uz[n]*wx[n]+vz[n]*wy[n]))
		}
	}
	return q
}

// qSource names the published definition of the vortex-core field, for
// the attribute source of fields.h5.
const qSource = "Q criterion, Hunt, J. C. R., Wray, A. A. & Moin, P. 1988, Eddies, streams, and convergence zones in turbulent flows, Center for Turbulence Research Report CTR-S88, 193-208"

// slabVolumes returns the three-dimensional fields of a slab's snapshot at
// the cell centres: each of fields (the x–z fields of the snapshot, as
// they are before the span average) at the centres, v after u, and the
// vortex-core field.
func slabVolumes(s *solver.Solver, fields []h5.Field, full [][]float64) []h5.Volume {
	g := s.Grid()
	var vs []h5.Volume
	for n, f := range fields {
		data := full[n]
		desc := f.Description
		if f.Location == h5.LocationFace {
			data = faceToCentres(g, data)
			desc += ", interpolated to the cell centres"
		}
		vs = append(vs, h5.Volume{Name: f.Name, Units: f.Units, Description: desc, Data: data})
		if f.Name == "u" {
			vs = append(vs,
				h5.Volume{Name: "v", Units: "m/s", Description: "spanwise velocity", Data: s.V()},
				h5.Volume{Name: "q_criterion", Units: "1/s2", Description: "vortex-core field: the Q criterion ½(|Ω|² − |S|²), positive in vortex cores", Source: qSource, Data: QCriterion(s)})
		}
	}
	return vs
}

// SpacingsAcross is the fewest expected roller spacings a slab's span
// should hold, so that a roller can bend and break across it rather than
// stay locked straight by the period (common practice, no source).
const SpacingsAcross = 2

// slabWarnings lists what may spoil a slab over a canopy of expected
// penetration depth de and roller spacing spacing (m): a span narrower
// than SpacingsAcross spacings, spanwise cells too coarse for the shear
// layer (the rule for Δx, CellsPerPenetration/2 cells across δe). None for
// the slice.
func slabWarnings(c solver.Config, de, spacing float64) []string {
	if c.Ny <= 1 || !(c.Ly > 0) {
		return nil
	}
	var ws []string
	dy := c.Ly / float64(c.Ny)
	if across := c.Ly / spacing; across < SpacingsAcross {
		ly := SpacingsAcross * spacing
		ws = append(ws, fmt.Sprintf("domain.width = %.3g m holds only %.1f expected roller spacings (8.1 Ls = %.3g m); a roller needs room across the span to bend and break up, or the span keeps it straight as the slice does: use domain.width = %.3g m with domain.ny = %d to keep Δy",
			c.Ly, across, spacing, ly, evenCeil(ly/dy)))
	}
	if de/dy < CellsPerPenetration/2 {
		need := evenCeil(float64(c.Ny) * CellsPerPenetration / 2 / (de / dy))
		fix := fmt.Sprintf("use domain.ny = %d", need)
		if need > casefile.MaxNy {
			fix = fmt.Sprintf("that would take domain.ny = %d, more than the %d allowed: narrow domain.width (to at most %.3g m at domain.ny = %d)", need, casefile.MaxNy, float64(casefile.MaxNy)*de/(CellsPerPenetration/2), casefile.MaxNy)
		}
		ws = append(ws, fmt.Sprintf("Δy = %.3g m is coarse for a penetration depth of %.3g m, so the shear layer is not resolved across the span: %s", dy, de, fix))
	}
	return ws
}
