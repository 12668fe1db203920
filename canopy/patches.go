package canopy

import (
	"fmt"
	"math"
	"sort"
)

// Patch is one streamwise stretch of canopy, the half-open range
// [X0, X1) in m on the periodic domain 0 <= x < Lx. X1 < X0 makes a patch
// that wraps through x = Lx (= 0): it covers [X0, Lx) and [0, X1). So
// 0 <= X0 < Lx and 0 <= X1 <= Lx, and X0 = 0, X1 = Lx is the whole domain.
type Patch struct {
	X0 float64 // m, upstream edge
	X1 float64 // m, downstream edge
}

// Length returns the streamwise length of the patch in m on a domain lx
// long (m).
func (p Patch) Length(lx float64) float64 {
	if p.X1 > p.X0 {
		return p.X1 - p.X0
	}
	return p.X1 + lx - p.X0
}

// validatePatches checks the patches and their edge width (m) on a domain
// lx long (m).
func validatePatches(ps []Patch, edge, lx float64) error {
	if math.IsNaN(edge) || math.IsInf(edge, 0) || edge < 0 {
		return fmt.Errorf("canopy: patch edge width %g m: need a finite width >= 0 (0 for sharp edges)", edge)
	}
	if len(ps) == 0 {
		if edge > 0 {
			return fmt.Errorf("canopy: patch edge width %g m given but no patches: give the patches' x ranges, or leave the width out for a canopy covering the whole domain", edge)
		}
		return nil
	}
	for i, p := range ps {
		switch {
		case math.IsNaN(p.X0) || math.IsInf(p.X0, 0) || p.X0 < 0 || p.X0 >= lx:
			return fmt.Errorf("canopy: patch %d: x0 = %g m: need 0 <= x0 < Lx = %g m", i+1, p.X0, lx)
		case math.IsNaN(p.X1) || math.IsInf(p.X1, 0) || p.X1 < 0 || p.X1 > lx:
			return fmt.Errorf("canopy: patch %d: x1 = %g m: need 0 <= x1 <= Lx = %g m (x1 < x0 wraps the patch through x = Lx)", i+1, p.X1, lx)
		case p.X0 == p.X1:
			return fmt.Errorf("canopy: patch %d: x0 = x1 = %g m: a patch needs a length; for a canopy covering the whole domain leave the patches out", i+1, p.X0)
		case edge > p.Length(lx):
			return fmt.Errorf("canopy: patch edge width %g m is more than the length %g m of patch %d: use a width <= the shortest patch", edge, p.Length(lx), i+1)
		}
	}
	order := make([]int, len(ps))
	for i := range order {
		order[i] = i
	}
	sort.Slice(order, func(i, j int) bool { return ps[order[i]].X0 < ps[order[j]].X0 })
	for k, i := range order {
		j := order[(k+1)%len(order)]
		end := ps[i].X1
		if end <= ps[i].X0 {
			end += lx
		}
		next := ps[j].X0
		if k == len(order)-1 {
			next += lx
		}
		if len(order) > 1 && end > next {
			return fmt.Errorf("canopy: patches %d [%g, %g) m and %d [%g, %g) m overlap by %g m: patches must not overlap; merge them into one",
				i+1, ps[i].X0, ps[i].X1, j+1, ps[j].X0, ps[j].X1, end-next)
		}
	}
	return nil
}

// coverage is the horizontal coverage C(x) of a validated canopy: 1
// everywhere without patches, else the sum of the patches' (smoothed)
// indicators.
type coverage struct {
	lx       float64
	patches  []Patch
	centre   []float64 // m, patch centres (may exceed lx for a wrapping patch)
	halfLen  []float64 // m, half the patch lengths
	halfEdge float64   // m, s = w/2 of the edge step
}

func newCoverage(ps []Patch, edge, lx float64) coverage {
	c := coverage{lx: lx, patches: ps, halfEdge: edge / 2}
	for _, p := range ps {
		l := p.Length(lx)
		c.centre = append(c.centre, p.X0+l/2)
		c.halfLen = append(c.halfLen, l/2)
	}
	return c
}

// images returns the range of periodic shifts n for which the patch with
// the given centre and half-length reaches into [xa, xb].
func (c coverage) images(xa, xb, centre, half float64) (n0, n1 float64) {
	reach := half + bandWidth*c.halfEdge
	return math.Ceil((xa - centre - reach) / c.lx), math.Floor((xb - centre + reach) / c.lx)
}

// at returns C(x).
func (c coverage) at(x float64) float64 {
	if len(c.centre) == 0 {
		return 1
	}
	if c.halfEdge == 0 {
		// Exact membership of the half-open ranges.
		x -= c.lx * math.Floor(x/c.lx)
		for _, p := range c.patches {
			if p.X1 > p.X0 && x >= p.X0 && x < p.X1 || p.X1 < p.X0 && (x >= p.X0 || x < p.X1) {
				return 1
			}
		}
		return 0
	}
	sum := 0.0
	for p, centre := range c.centre {
		n0, n1 := c.images(x, x, centre, c.halfLen[p])
		for n := n0; n <= n1; n++ {
			sum += window(x-centre-n*c.lx, c.halfLen[p], c.halfEdge)
		}
	}
	return sum
}

// mean returns the average of C over [xa, xb], xa < xb; the integrals are
// exact (closed form), so the averages over cells that tile the domain add
// up to the covered length to round-off.
func (c coverage) mean(xa, xb float64) float64 {
	if len(c.centre) == 0 {
		return 1
	}
	sum := 0.0
	for p, centre := range c.centre {
		half := c.halfLen[p]
		n0, n1 := c.images(xa, xb, centre, half)
		for n := n0; n <= n1; n++ {
			shift := centre + n*c.lx
			sum += windowPrimitive(xb-shift, half, c.halfEdge) - windowPrimitive(xa-shift, half, c.halfEdge)
		}
	}
	return sum / (xb - xa)
}

// fraction returns the covered fraction of the domain, Σ L / Lx.
func (c coverage) fraction() float64 {
	if len(c.centre) == 0 {
		return 1
	}
	sum := 0.0
	for _, h := range c.halfLen {
		sum += 2 * h
	}
	return sum / c.lx
}
