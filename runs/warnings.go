package runs

import (
	"fmt"
	"math"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
	"rollerbed/solver"
)

// Resolution rules of thumb for the canopy shear layer (common practice,
// no source; they come from the resolution studies of this project's own
// verification runs, not from a publication):
const (
	// CellsPerPenetration is the fewest cells across the penetration depth
	// δe ≈ 0.23/(C_D a) at the canopy top for the rollers to be resolved.
	CellsPerPenetration = 8
	// RollersPerDomain is the fewest rollers the periodic domain should
	// hold so that pairing does not lock onto the domain length at once.
	RollersPerDomain = 4
	// shearLengthDrag estimates the shear length Ls ≈ 0.2/(C_D a) of a
	// dense canopy, so that the roller spacing is about 8.1 Ls
	// (Raupach, Finnigan & Brunet 1996).
	shearLengthDrag = 0.2
)

// Warnings lists what in a valid spec is likely to spoil the results: a
// canopy-top shear layer too thin for the grid, a domain too short for
// several rollers, too few forcing cycles for the phase averages. Each warning names the grid that would do.
func Warnings(sp *Spec) []string {
	var ws []string
	c := sp.Solver
	g, err := solver.NewGrid(c.Nx, c.Nz, c.Lx, c.H, c.Cluster)
	if err != nil {
		return nil
	}
	if r := g.MaxSpacingRatio(); r > 1.25 {
		ws = append(ws, fmt.Sprintf("neighbouring cells differ in height by up to %.2f×; the scheme stays second order only for gentle stretching (below about 1.25): lower domain.cluster factors or widen the clusters", r))
	}
	ws = append(ws, waveWarnings(sp)...)
	cp := sp.Canopy
	if cp == nil || cp.Height() == 0 {
		return ws
	}
	ws = append(ws, uptakeWarnings(sp, cp)...)
	h := cp.Height()
	cd := cp.CD
	if cd == 0 {
		cd = 1 // a Reynolds-number law (about 1 for cylinders) or a linear drag
	}
	cda := cd * cp.Profile.MeanDensity()
	if !(cda > 0) {
		return ws
	}
	// Penetration depth, capped by the canopy height for sparse canopies.
	de := math.Min(0.23/cda, h)
	dz := g.Dz[nearestCell(g.Zc, h)]
	if cells := de / dz; cells < CellsPerPenetration {
		need := int(math.Ceil(float64(c.Nz) * CellsPerPenetration / cells))
		fix := fmt.Sprintf("use domain.nz = %d", need)
		if need > casefile.MaxNz {
			fix = fmt.Sprintf("more than the %d cells domain.nz allows would be needed on a uniform grid", casefile.MaxNz)
		}
		if cl := c.Cluster; cl.At > 0 && math.Abs(cl.At-h) <= math.Max(cl.AtWidth, dz) {
			fix += fmt.Sprintf(", or a larger domain.cluster.at_factor (now %g) for finer cells around the canopy top", cl.AtFactor)
		} else {
			fix += fmt.Sprintf(", or cluster cells at the canopy top (domain.cluster.at = %g)", h)
		}
		ws = append(ws, fmt.Sprintf("only %.1f cells across the expected penetration depth δe ≈ %.3g m at the canopy top (Δz = %.3g m there); the rollers need at least %d: %s",
			cells, de, dz, CellsPerPenetration, fix))
	}
	if dx := g.Dx; de/dx < CellsPerPenetration/2 {
		need := evenCeil(float64(c.Nx) * CellsPerPenetration / 2 / (de / dx))
		fix := fmt.Sprintf("use domain.nx = %d", need)
		if need > casefile.MaxNx {
			fix = fmt.Sprintf("that would take domain.nx = %.3g, more than the %d allowed: shorten domain.length (to at most %.3g m at domain.nx = %d)",
				float64(need), casefile.MaxNx, float64(casefile.MaxNx)*de/(CellsPerPenetration/2), casefile.MaxNx)
		}
		ws = append(ws, fmt.Sprintf("Δx = %.3g m is coarse for a penetration depth of %.3g m: %s", dx, de, fix))
	}
	spacing := canopy.PredictedRollerSpacing(math.Min(shearLengthDrag/cda, 0.5*h))
	if rollers := c.Lx / spacing; rollers < RollersPerDomain {
		lx := RollersPerDomain * spacing
		nx := evenCeil(float64(c.Nx) * lx / c.Lx)
		fix := fmt.Sprintf("use domain.length = %.3g m with domain.nx = %d to keep Δx", lx, nx)
		if nx > casefile.MaxNx {
			fix = fmt.Sprintf("use domain.length = %.3g m; keeping Δx would take domain.nx = %.3g, more than the %d allowed, so coarsen Δx as far as the penetration depth allows", lx, float64(nx), casefile.MaxNx)
		}
		ws = append(ws, fmt.Sprintf("the domain holds only %.1f rollers of the expected spacing %.3g m (8.1 Ls); %s", rollers, spacing, fix))
	}
	return append(ws, slabWarnings(c, de, spacing)...)
}

func nearestCell(z []float64, v float64) int {
	best, at := math.Inf(1), 0
	for k, zz := range z {
		if d := math.Abs(zz - v); d < best {
			best, at = d, k
		}
	}
	return at
}

func evenCeil(v float64) int {
	n := int(math.Ceil(v))
	return n + n%2
}

// uptakeWarnings checks the element Reynolds numbers a run is expected to
// see against each scalar's Sherwood correlation: from the drag-balanced
// speed deep in the canopy, √(2Π/(C_D a)) with Π from the forcing (or the
// bulk velocity when it is held), to the bulk velocity.
func uptakeWarnings(sp *Spec, cp *canopy.Canopy) []string {
	var ws []string
	c := sp.Solver
	cd := cp.CD
	if cd == 0 {
		cd = 1
	}
	a := cp.Profile.MeanDensity()
	hi := c.Forcing.Bulk
	lo := hi
	if c.Forcing.Kind == solver.FixedGradient && a > 0 {
		lo = math.Sqrt(2 * c.Forcing.Gradient / (cd * a))
		hi = 16 * math.Sqrt(c.Forcing.Gradient*c.H)
	}
	for i, et := range sp.Transfer {
		if i >= len(sp.ElementUptake) || !sp.ElementUptake[i] || et.Name() == "power-law" || et.Name() == "" {
			continue
		}
		for _, u := range []float64{lo, hi} {
			if u > 0 && !et.InRange(u) {
				ws = append(ws, fmt.Sprintf("scalar[%d].uptake = %q: the element Reynolds number reaches %.3g at %.3g m/s, outside the correlation's range; the uptake there is extrapolated (see the correlation's documentation) — choose another correlation or a power law fitted to your measurements",
					i, et.Name(), et.Reynolds(u), u))
				break
			}
		}
	}
	return ws
}
