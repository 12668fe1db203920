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
//
// In a slab (periodic across the span 0 <= y < Ly too) a patch is a
// stripe across the whole span when Y0 == Y1 (both 0 by default), and
// otherwise the rectangle [X0, X1) × [Y0, Y1), with Y1 < Y0 wrapping
// through y = Ly as in x.
type Patch struct {
	X0 float64 // m, upstream edge
	X1 float64 // m, downstream edge
	Y0 float64 // m, first side across the span (slab only)
	Y1 float64 // m, second side across the span (slab only)
}

// Spanwise reports whether the patch is limited across the span (a
// rectangle) rather than a stripe over the whole span.
func (p Patch) Spanwise() bool { return p.Y0 != p.Y1 }

// Width returns the extent of the patch across a span ly wide (m): ly for a
// stripe.
func (p Patch) Width(ly float64) float64 {
	if !p.Spanwise() {
		return ly
	}
	return Patch{X0: p.Y0, X1: p.Y1}.Length(ly)
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
// lx long and ly wide (m; ly = 0 for the x–z slice).
func validatePatches(ps []Patch, edge, lx, ly float64) error {
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
		if err := validateAcross(i, p, edge, ly); err != nil {
			return err
		}
	}
	if anySpanwise(ps) {
		return rectanglesApart(ps, lx, ly)
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

// validateAcross checks the spanwise extent of patch i (numbered from 0)
// on a span ly wide (m; 0 for the slice).
func validateAcross(i int, p Patch, edge, ly float64) error {
	switch {
	case !p.Spanwise():
		return nil
	case ly == 0:
		return fmt.Errorf("canopy: patch %d: y0 = %g m, y1 = %g m: only a slab has a span; give the domain a spanwise width, or leave y0 and y1 out for the x–z slice", i+1, p.Y0, p.Y1)
	case math.IsNaN(p.Y0) || math.IsInf(p.Y0, 0) || p.Y0 < 0 || p.Y0 >= ly:
		return fmt.Errorf("canopy: patch %d: y0 = %g m: need 0 <= y0 < Ly = %g m", i+1, p.Y0, ly)
	case math.IsNaN(p.Y1) || math.IsInf(p.Y1, 0) || p.Y1 < 0 || p.Y1 > ly:
		return fmt.Errorf("canopy: patch %d: y1 = %g m: need 0 <= y1 <= Ly = %g m (y1 < y0 wraps the patch through y = Ly)", i+1, p.Y1, ly)
	case edge > p.Width(ly):
		return fmt.Errorf("canopy: patch edge width %g m is more than the spanwise extent %g m of patch %d: use a width <= the narrowest patch", edge, p.Width(ly), i+1)
	}
	return nil
}

func anySpanwise(ps []Patch) bool {
	for _, p := range ps {
		if p.Spanwise() {
			return true
		}
	}
	return false
}

// rectanglesApart checks that no two patches overlap where some are
// rectangles: two overlap when their x ranges and their y ranges both do
// (a stripe's y range is the whole span).
func rectanglesApart(ps []Patch, lx, ly float64) error {
	for j := range ps {
		for i := range j {
			if intervalsOverlap(ps[i].X0, ps[i].X1, ps[j].X0, ps[j].X1, lx) &&
				(!ps[i].Spanwise() || !ps[j].Spanwise() || intervalsOverlap(ps[i].Y0, ps[i].Y1, ps[j].Y0, ps[j].Y1, ly)) {
				return fmt.Errorf("canopy: patches %d (x [%g, %g) m, y [%g, %g) m) and %d (x [%g, %g) m, y [%g, %g) m) overlap: patches must not overlap; move one or merge them",
					i+1, ps[i].X0, ps[i].X1, ps[i].Y0, ps[i].Y1, j+1, ps[j].X0, ps[j].X1, ps[j].Y0, ps[j].Y1)
			}
		}
	}
	return nil
}

// intervalsOverlap reports whether the periodic half-open ranges [a0, a1)
// and [b0, b1) on a period l share a stretch of positive length; a range
// with end < start wraps through l.
func intervalsOverlap(a0, a1, b0, b1, l float64) bool {
	split := func(s, e float64) [][2]float64 {
		if e > s {
			return [][2]float64{{s, e}}
		}
		return [][2]float64{{s, l}, {0, e}}
	}
	for _, a := range split(a0, a1) {
		for _, b := range split(b0, b1) {
			if math.Max(a[0], b[0]) < math.Min(a[1], b[1]) {
				return true
			}
		}
	}
	return false
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

// band is one patch's smoothed indicator along one periodic direction: the
// range centre ± half on a period (m), its edges smoothed over halfEdge
// (m, s = w/2 of the edge step).
type band struct {
	centre, half, period, halfEdge float64
	whole                          bool // covers the whole period (a stripe across the span)
}

// mean returns the average of the band over [a, b], a < b (m), exact as
// coverage.mean.
func (d band) mean(a, b float64) float64 {
	if d.whole {
		return 1
	}
	reach := d.half + bandWidth*d.halfEdge
	n0, n1 := math.Ceil((a-d.centre-reach)/d.period), math.Floor((b-d.centre+reach)/d.period)
	sum := 0.0
	for n := n0; n <= n1; n++ {
		shift := d.centre + n*d.period
		sum += windowPrimitive(b-shift, d.half, d.halfEdge) - windowPrimitive(a-shift, d.half, d.halfEdge)
	}
	return sum / (b - a)
}

// bands returns the x and y bands of patch p on a domain lx long and ly
// wide (m), with edge width edge (m).
func bands(p Patch, edge, lx, ly float64) (x, y band) {
	l := p.Length(lx)
	x = band{centre: p.X0 + l/2, half: l / 2, period: lx, halfEdge: edge / 2}
	if !p.Spanwise() {
		return x, band{whole: true}
	}
	w := p.Width(ly)
	return x, band{centre: p.Y0 + w/2, half: w / 2, period: ly, halfEdge: edge / 2}
}
