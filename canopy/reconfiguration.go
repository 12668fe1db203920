package canopy

import (
	"fmt"
	"math"
)

// Gravity is the standard acceleration of gravity g in m/s² (standard value
// of the 3rd CGPM, 1901).
const Gravity = 9.80665

// Flexible is the stiffness and buoyancy of flexible blades: a small value
// that a canopy (or a group of elements) carries when its blades bend with
// the flow. The blade length l is the canopy height and its width b the
// element width.
type Flexible struct {
	Modulus   float64 // Pa, Young's modulus E of the blade material, > 0
	Thickness float64 // m, blade thickness t, > 0 (and below the width)
	Density   float64 // kg/m³, blade density ρ_v, > 0 and at most the fluid's
}

// Validate checks the blades against the fluid density rho (kg/m³) and the
// blade width b (m). The reconfiguration law holds for blades that are
// buoyant or neutrally buoyant (ρ_v <= ρ): a heavier blade would lie on the
// bed at slack water, which the law does not describe.
func (f Flexible) Validate(rho, b float64) error {
	switch {
	case !(f.Modulus > 0) || math.IsInf(f.Modulus, 1):
		return fmt.Errorf("canopy: blade modulus E = %g Pa: need a finite value > 0 (seagrass blades: about 1e8 to 1e10 Pa)", f.Modulus)
	case !(f.Thickness > 0) || math.IsInf(f.Thickness, 1):
		return fmt.Errorf("canopy: blade thickness t = %g m: need a finite value > 0", f.Thickness)
	case !(b > 0):
		return fmt.Errorf("canopy: flexible blades need the blade width b > 0, not %g m", b)
	case f.Thickness >= b:
		return fmt.Errorf("canopy: blade thickness t = %g m is not below the blade width b = %g m: the bending law is for thin flat blades", f.Thickness, b)
	case !(rho > 0) || math.IsInf(rho, 1):
		return fmt.Errorf("canopy: fluid density %g kg/m³: need a finite value > 0", rho)
	case !(f.Density > 0) || f.Density > rho:
		return fmt.Errorf("canopy: blade density ρ_v = %g kg/m³ with fluid density %g kg/m³: need 0 < ρ_v <= ρ (the bending law is for buoyant or neutrally buoyant blades)", f.Density, rho)
	}
	return nil
}

// Rigidity returns the flexural rigidity E·I in N·m² of a blade of width b
// (m), with I = b t³/12.
func (f Flexible) Rigidity(b float64) float64 {
	return f.Modulus * b * f.Thickness * f.Thickness * f.Thickness / 12
}

// CauchyNumber returns Ca = ρ C_D b U² l³ / (2 E I), dimensionless: the
// drag on a blade of width b and length l (m) in a flow of speed u (m/s)
// and density rho (kg/m³) against its stiffness (Luhar & Nepf 2011,
// Limnol. Oceanogr. 56:2003; definition from memory).
func (f Flexible) CauchyNumber(rho, cd, b, l, u float64) float64 {
	return rho * cd * b * u * u * l * l * l / (2 * f.Rigidity(b))
}

// BuoyancyNumber returns B = (ρ − ρ_v) g b t l³ / (E I), dimensionless:
// the buoyancy of a blade of width b and length l (m) in a fluid of
// density rho (kg/m³) against its stiffness (Luhar & Nepf 2011; definition
// from memory).
func (f Flexible) BuoyancyNumber(rho, b, l float64) float64 {
	return (rho - f.Density) * Gravity * b * f.Thickness * l * l * l / f.Rigidity(b)
}

// EffectiveLength returns l_e/l, the length of a rigid upright blade with
// the same drag as the bent blade, relative to the blade length, from the
// Cauchy number ca and the buoyancy number b (both >= 0):
//
//	l_e/l = 1 − (1 − 0.9 Ca^(−1/3)) / (1 + Ca^(−3/2) (8 + B^(3/2)))
//
// (Luhar & Nepf 2011, Limnol. Oceanogr. 56:2003, their fit to the computed
// postures; formula from memory). It tends to 1 for stiff blades (Ca → 0)
// and to 0.9 Ca^(−1/3) for very flexible ones.
func EffectiveLength(ca, b float64) float64 {
	if ca <= 0 {
		return 1
	}
	return 1 - (1-0.9*math.Pow(ca, -1.0/3))/(1+math.Pow(ca, -1.5)*(8+math.Pow(b, 1.5)))
}

// BentHeight returns h_d/l, the height of the bent blade's tip above the bed
// relative to the blade length, from the Cauchy number ca and the buoyancy
// number b (both >= 0):
//
//	h_d/l = 1 − (1 − Ca^(−1/4)) / (1 + Ca^(−3/5) (4 + B^(3/5)) + Ca^(−2) (8 + B²))
//
// (Luhar & Nepf 2013, Adv. Water Resour. 51:305, a fit to the postures of
// the 2011 model; formula from memory). It tends to 1 for stiff blades and
// to Ca^(−1/4) for very flexible ones.
func BentHeight(ca, b float64) float64 {
	if ca <= 0 {
		return 1
	}
	return 1 - (1-math.Pow(ca, -0.25))/(1+math.Pow(ca, -0.6)*(4+math.Pow(b, 0.6))+math.Pow(ca, -2)*(8+b*b))
}

// Bending rewrites a canopy's quadratic drag array as its flexible blades
// bend with the local flow, quasi-statically: at each update, every column
// of the mesh takes the posture of a blade in a steady current of the speed
// it sees now, with no memory of earlier postures and no blade inertia.
//
// The speed of a column is the mean of |u| over the blade length l, |u| at
// the cell centres weighted by the part of each cell below l: the flow the
// upright blade would stand in. The bent blade's frontal area fills the column up to the bent height
// h_d, the rigid profile a(z) squeezed into it, and its frontal area index
// is the rigid one times l_e/l, so that the drag is that of the effective
// length: a_bent(z) = (l_e/h_d) a(z l/h_d) for z < h_d and 0 above.
// Columns where the blades stand upright (h_d = l_e = l to round-off, as
// for stiff blades) get the rigid values exactly.
type Bending struct {
	flex        Flexible
	rho, cd, b  float64   // kg/m³, dimensionless, m
	l, buoyancy float64   // m, blade length; B
	ztop        float64   // m, the top face of the highest cell holding elements
	nx, nz      int       // columns (points of a level) and levels
	zf, dz      []float64 // m, faces and cell heights
	below       []float64 // per level: the share of the cell below l
	rigid       []float64 // ½ a/(1 − φ) of the upright canopy, Nz·Nx
	cum         []float64 // per column: ∫ rigid dz at each face, (Nz+1)·Nx
	dst         []float64 // the drag array rewritten in place
	covered     []bool    // per column: the column holds elements
	height      []float64 // m, bent height per column
	ratio       []float64 // l_e/l per column
	lastMean    float64   // m, coverage-weighted mean of height
}

// NewBending prepares the bending of canopy c, whose blades are flex, on
// mesh m in a fluid of density rho (kg/m³). halfArea is the drag array
// (c.DragArea(m)) that Update rewrites in place; its values now are taken
// as the upright canopy. The canopy must have a fixed C_D and flat blades.
func NewBending(c *Canopy, flex Flexible, m Mesh, rho float64, halfArea []float64) (*Bending, error) {
	switch {
	case c.Elements.Shape != Blade:
		return nil, fmt.Errorf("canopy: flexible settings need flat blades (shape blade), not %v", c.Elements.Shape)
	case c.Law != nil || c.Linear != 0 || !(c.CD > 0):
		return nil, fmt.Errorf("canopy: flexible blades need a fixed drag coefficient C_D")
	}
	if err := flex.Validate(rho, c.Elements.Width); err != nil {
		return nil, err
	}
	// A column is a point of a level's row (the slice) or plane (a slab):
	// the drag array holds Nz levels of them.
	nz := len(m.Zf) - 1
	nx := len(halfArea) / max(nz, 1)
	if nx*nz != len(halfArea) || nx%max(len(m.X), 1) != 0 {
		panic(fmt.Sprintf("canopy: drag array of %d values for a mesh of %d levels of %d points along x", len(halfArea), nz, len(m.X)))
	}
	l := c.Height()
	bd := &Bending{flex: flex, rho: rho, cd: c.CD, b: c.Elements.Width, l: l,
		buoyancy: flex.BuoyancyNumber(rho, c.Elements.Width, l),
		nx:       nx, nz: nz, zf: m.Zf, dz: make([]float64, nz), below: make([]float64, nz),
		rigid: append([]float64(nil), halfArea...), cum: make([]float64, (nz+1)*nx),
		dst: halfArea, covered: make([]bool, nx), height: make([]float64, nx), ratio: make([]float64, nx)}
	for k := range nz {
		bd.dz[k] = m.Zf[k+1] - m.Zf[k]
		bd.below[k] = math.Max(0, math.Min(m.Zf[k+1], l)-m.Zf[k]) / bd.dz[k]
	}
	for i := range nx {
		for k := range nz {
			v := bd.rigid[k*nx+i]
			bd.cum[(k+1)*nx+i] = bd.cum[k*nx+i] + v*bd.dz[k]
			if v != 0 {
				bd.covered[i] = true
			}
		}
		bd.height[i], bd.ratio[i] = l, 1
	}
	for k := nz - 1; k >= 0 && bd.ztop == 0; k-- {
		for i := range nx {
			if bd.rigid[k*nx+i] != 0 {
				bd.ztop = m.Zf[k+1]
				break
			}
		}
	}
	bd.lastMean = bd.meanHeight()
	return bd, nil
}

// Length returns the blade length l in m (the upright canopy height).
func (bd *Bending) Length() float64 { return bd.l }

// Buoyancy returns the buoyancy number B of the blades.
func (bd *Bending) Buoyancy() float64 { return bd.buoyancy }

// Heights returns the bent height h_d in m of each column (Nx values, Ny·Nx
// in a slab, the
// blade length where the column holds no elements), as of the last Update.
// The slice is the Bending's own.
func (bd *Bending) Heights() []float64 { return bd.height }

// MeanHeight returns the bent height in m averaged over the columns that
// hold elements, as of the last Update.
func (bd *Bending) MeanHeight() float64 { return bd.lastMean }

// MeanLengthRatio returns l_e/l averaged over the columns that hold
// elements, as of the last Update.
func (bd *Bending) MeanLengthRatio() float64 { return bd.coveredMean(bd.ratio, 1) }

func (bd *Bending) meanHeight() float64 { return bd.coveredMean(bd.height, bd.l) }

// coveredMean returns the mean of v over the columns that hold elements,
// or none when there are none.
func (bd *Bending) coveredMean(v []float64, none float64) float64 {
	sum, n := 0.0, 0
	for i, c := range bd.covered {
		if c {
			sum += v[i]
			n++
		}
	}
	if n == 0 {
		return none
	}
	return sum / float64(n)
}

// Update bends the blades to the horizontal velocity (u, v) (m/s, at the
// cell centres, one row or plane per level as the drag array; v nil in
// the slice) and rewrites the drag array. It allocates nothing.
func (bd *Bending) Update(u, v []float64) {
	nx, nz := bd.nx, bd.nz
	for i := range nx {
		if !bd.covered[i] {
			continue
		}
		var sum, wsum float64
		for k := range nz {
			f := bd.below[k]
			if f == 0 {
				break
			}
			w := f * bd.dz[k]
			if v == nil {
				sum += w * math.Abs(u[k*nx+i])
			} else {
				sum += w * math.Hypot(u[k*nx+i], v[k*nx+i])
			}
			wsum += w
		}
		speed := sum / wsum
		ca := bd.flex.CauchyNumber(bd.rho, bd.cd, bd.b, bd.l, speed)
		hr, er := BentHeight(ca, bd.buoyancy), EffectiveLength(ca, bd.buoyancy)
		hr = math.Min(hr, 1)
		er = math.Min(er, 1)
		bd.height[i], bd.ratio[i] = hr*bd.l, er
		if hr == 1 && er == 1 {
			for k := range nz {
				bd.dst[k*nx+i] = bd.rigid[k*nx+i]
			}
			continue
		}
		bd.squeeze(i, hr, er)
	}
	bd.lastMean = bd.meanHeight()
}

// squeeze writes column i of the rigid profile squeezed by the factor hr
// with its frontal area scaled by er: the cell mean of (er/hr) a(z/hr) is
// (er/Δz) [F(z₁/hr) − F(z₀/hr)], F the integral of the rigid cell values
// from the bed. The rigid cell values are taken as constant over their
// cells, so the squeezed column reaches hr times the top face of the
// highest cell holding elements, a fraction of a cell above hr·l.
func (bd *Bending) squeeze(i int, hr, er float64) {
	nx, nz := bd.nx, bd.nz
	top := hr * bd.ztop
	j := 0 // the rigid cell holding the lower end, found by a walk upward
	lower := 0.0
	for k := range nz {
		z0 := bd.zf[k]
		if z0 >= top {
			bd.dst[k*nx+i] = 0
			continue
		}
		z1 := math.Min(bd.zf[k+1], top) / hr
		upper := bd.integral(i, z1, &j)
		bd.dst[k*nx+i] = er * (upper - lower) / bd.dz[k]
		lower = upper
	}
}

// integral returns F(z) for column i: the integral of the rigid cell values
// from the bed to z (m), walking *j upward to the cell holding z.
func (bd *Bending) integral(i int, z float64, j *int) float64 {
	nx, nz := bd.nx, bd.nz
	for *j < nz-1 && bd.zf[*j+1] <= z {
		*j++
	}
	k := *j
	if z >= bd.zf[nz] {
		return bd.cum[nz*nx+i]
	}
	return bd.cum[k*nx+i] + bd.rigid[k*nx+i]*(z-bd.zf[k])
}
