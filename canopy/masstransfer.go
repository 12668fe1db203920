package canopy

// Mass transfer to canopy elements and to the bed.
//
// The scalar sink of an element is a_s k_e (c − c_w) with k_e the series
// combination of a boundary-layer transfer velocity k_bl (m/s) and the
// surface's own uptake capacity k_s (m/s). k_bl comes from a Sherwood
// number correlation, Sh = k_bl d / D, in the element Reynolds number
// Re = |u| d / ν and the Schmidt number Sc = ν / D, with |u| the local speed
// (m/s), d the element width (m: cylinder diameter or blade width), ν the
// kinematic viscosity (m²/s) and D the scalar's molecular diffusivity
// (m²/s). The bed's transfer velocity comes from a wall correlation in the
// friction velocity u* (m/s).

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// OxygenDiffusivity20C is the molecular diffusivity of dissolved O₂ in
// water at 20 °C and 0.1 MPa, 1.76×10⁻⁹ m²/s (Han & Bartels 1996, J. Phys.
// Chem. 100:5597). With fresh-water ν = 1.0034×10⁻⁶ m²/s it gives
// Sc ≈ 570. It is a fresh-water value; see SchmidtOxygenSeawater for the
// sea.
const OxygenDiffusivity20C = 1.76e-9 // m²/s

// Sherwood is a Sherwood number correlation Sh(Re, Sc) for one element
// (dimensionless in, dimensionless out). The correlations here are called
// at every canopy cell and stage: they do not allocate and return a finite
// value for every finite Re >= 0 (Re = 0 in still water included) and
// finite Sc > 0. A
// negative Re, a programming error since Re = |u| d/ν, gives NaN, as does
// a NaN argument.
type Sherwood func(re, sc float64) float64

// The Reynolds-number ranges of Hilpert's table, Re = |u| d/ν
// (dimensionless).
const (
	HilpertMinRe = 0.4 // lower end of the first range
	HilpertMaxRe = 4e5 // upper end of the last range
)

// Hilpert is the cylinder-in-cross-flow correlation
//
//	Sh = C Re^m Sc^(1/3)
//
// with Re = |u| d/ν for a cylinder of diameter d, from Hilpert 1933, as
// tabulated in Incropera & DeWitt, Fundamentals of Heat and Mass Transfer
// (table 7.2 of the 6th edition; table number from memory), there for heat
// (Nu and Pr, Pr ≳ 0.7) and used here for mass by the heat–mass analogy:
//
//	Re            C      m
//	0.4–4         0.989  0.330
//	4–40          0.911  0.385
//	40–4000       0.683  0.466
//	4000–40 000   0.193  0.618
//	40 000–4×10⁵  0.027  0.805
//
// The table is discontinuous where the ranges meet (jumps of −0.6 % at
// Re = 4, +1.1 % at 40, −0.3 % at 4000, +1.5 % at 40 000). Each range owns
// its lower boundary: Re = 4 uses (0.911, 0.385), Re = 40 uses
// (0.683, 0.466), Re = 4000 uses (0.193, 0.618), Re = 40 000 uses
// (0.027, 0.805); the last range also owns its upper end, Re = 4×10⁵.
//
// Outside the table (HilpertInRange reports it) the choice is common
// practice, no source:
//   - Re < 0.4, Re = 0 in still water included: Sh is held at its Re = 0.4
//     value, 0.989 · 0.4^0.330 · Sc^(1/3) ≈ 0.731 Sc^(1/3), rather than
//     following the power law to Sh = 0. A sink that vanished whenever a
//     cell's speed passed through zero would switch uptake off and on with
//     every passing roller, while the real element keeps taking up by
//     diffusion; holding the floor keeps the sink finite and continuous in
//     Re. The floor overstates uptake in slack water: steady diffusion
//     from a cylinder of radius r to a concentration held at radius R
//     gives Sh = 2/ln(R/r) (derived), about 0.9–1.2 for R = 5–10 r,
//     against ≈ 6 from the floor at Sc = 570; in a slack canopy the
//     resolved concentration field, not this law, then carries most of
//     the limitation.
//   - Re > 4×10⁵: the last range's constants (0.027, 0.805) continue.
func Hilpert(re, sc float64) float64 {
	var c, m float64
	switch {
	case re < 0:
		return math.NaN()
	case re < HilpertMinRe:
		re, c, m = HilpertMinRe, 0.989, 0.330
	case re < 4:
		c, m = 0.989, 0.330
	case re < 40:
		c, m = 0.911, 0.385
	case re < 4000:
		c, m = 0.683, 0.466
	case re < 40000:
		c, m = 0.193, 0.618
	default: // 40 000 and above, NaN included
		c, m = 0.027, 0.805
	}
	return c * math.Pow(re, m) * math.Cbrt(sc)
}

// HilpertInRange reports whether the element Reynolds number re lies in
// Hilpert's table, 0.4 <= Re <= 4×10⁵ (Hilpert 1933, as tabulated in
// Incropera & DeWitt); outside it Hilpert extrapolates as documented there.
func HilpertInRange(re float64) bool {
	return re >= HilpertMinRe && re <= HilpertMaxRe
}

// ChurchillBernstein is the cylinder-in-cross-flow correlation of
// Churchill & Bernstein 1977, J. Heat Transfer 99:300, one formula for all
// Re (written there for Nu and Pr, used here for mass by the heat–mass
// analogy):
//
//	Sh = 0.3 + 0.62 Re^½ Sc^⅓ [1 + (0.4/Sc)^⅔]^(−¼) [1 + (Re/282 000)^⅝]^⅘
//
// with Re = |u| d/ν for a cylinder of diameter d. It gives 40.6371 at
// Re = 6071, Sc = 0.7. Its stated range is Re Sc >= 0.2
// (ChurchillBernsteinInRange); below it the formula is used as is and
// tends to Sh = 0.3 in still water, which keeps some uptake at Re = 0
// without any floor.
func ChurchillBernstein(re, sc float64) float64 {
	if re < 0 {
		return math.NaN()
	}
	prandtl := math.Pow(1+math.Pow(0.4/sc, 2.0/3), -0.25)
	high := math.Pow(1+math.Pow(re/282000, 5.0/8), 0.8)
	return 0.3 + 0.62*math.Sqrt(re)*math.Cbrt(sc)*prandtl*high
}

// ChurchillBernsteinInRange reports whether Re Sc >= 0.2, the range of
// ChurchillBernstein (Churchill & Bernstein 1977, J. Heat Transfer 99:300).
func ChurchillBernsteinInRange(re, sc float64) bool {
	return re*sc >= 0.2
}

// PlateCriticalRe is the transition Reynolds number Re_L = |u| L/ν = 5×10⁵
// (dimensionless) of the flat-plate correlations (Incropera & DeWitt).
const PlateCriticalRe = 5e5

// PlateMaxRe is the upper end of the mixed flat-plate correlation, 10⁸
// (Incropera & DeWitt; from memory).
const PlateMaxRe = 1e8

// PlateLaminar is the average Sherwood number over a flat plate of length
// L in a laminar boundary layer,
//
//	Sh = 0.664 Re_L^½ Sc^⅓,  Re_L = |u| L/ν < 5×10⁵,
//
// from Incropera & DeWitt, Fundamentals of Heat and Mass Transfer (for Nu
// and Pr ≳ 0.6, used here for mass by the heat–mass analogy). Above 5×10⁵
// the formula is used as is (PlateLaminarInRange reports it). Re = 0
// gives Sh = 0: unlike Hilpert no floor is applied, so under the plate
// laws a blade in still water takes nothing up.
//
// For blades the plate length is the blade width b: the flow is taken to
// cross the blade from edge to edge over its width b, the length scale the
// rest of rollerbed uses for blades (common practice, no source). A blade
// bent over by the flow so that the water runs along its length has a
// longer plate and a smaller average Sh, which this choice does not follow.
func PlateLaminar(re, sc float64) float64 {
	return 0.664 * math.Sqrt(re) * math.Cbrt(sc)
}

// PlateLaminarInRange reports whether Re_L < 5×10⁵, the range of
// PlateLaminar (Incropera & DeWitt).
func PlateLaminarInRange(re float64) bool {
	return re >= 0 && re < PlateCriticalRe
}

// PlateMixed is the average Sherwood number over a flat plate of length L
// (a blade of width b, as for PlateLaminar) with a laminar leading part
// and a turbulent boundary layer after transition at Re = 5×10⁵:
//
//	Sh = 0.664 Re_L^½ Sc^⅓           Re_L <= 5×10⁵
//	Sh = (0.037 Re_L^0.8 − 871) Sc^⅓  Re_L >  5×10⁵
//
// from Incropera & DeWitt, Fundamentals of Heat and Mass Transfer (for Nu,
// with 0.6 < Pr < 60 and Re_L <= 10⁸, ranges from memory; used here for
// mass by the heat–mass analogy, which at Sc ≈ 500 for O₂ in water is an
// extrapolation in Sc). The laminar formula owns the boundary Re = 5×10⁵.
// The constant 871 is 0.037 Re_c^0.8 − 0.664 Re_c^½ at Re_c = 5×10⁵
// rounded, so the two branches meet to within 0.07 % (469.84 against
// 469.52 times Sc^⅓). Above 10⁸ the turbulent branch is used as is.
func PlateMixed(re, sc float64) float64 {
	if re > PlateCriticalRe {
		return (0.037*math.Pow(re, 0.8) - 871) * math.Cbrt(sc)
	}
	return PlateLaminar(re, sc)
}

// PlateInRange reports whether 0 <= Re_L <= 10⁸, the range of PlateMixed
// (Incropera & DeWitt; upper end from memory).
func PlateInRange(re float64) bool {
	return re >= 0 && re <= PlateMaxRe
}

// PowerLaw is an element transfer velocity given directly as a power of
// the local speed, k_bl = α |u|^n (m/s), for users with their own
// measurements of an element's uptake against speed (common practice, no
// source). α is in m^(1−n) s^(n−1), n is dimensionless; n = 0.5 matches a
// laminar boundary layer, n ≈ 0.8 a turbulent one.
type PowerLaw struct {
	Alpha float64 // α, m^(1−n) s^(n−1)
	N     float64 // n, dimensionless
}

// Velocity returns k_bl = α |speed|^n in m/s for a local speed in m/s.
// With n > 0 it is zero in still water; with n = 0 it is α at any speed.
func (p PowerLaw) Velocity(speed float64) float64 {
	return p.Alpha * math.Pow(math.Abs(speed), p.N)
}

// ElementTransfer turns the local speed into an element's boundary-layer
// transfer velocity k_bl (m/s) for one scalar. Build it once per scalar
// with NewElementTransfer; its methods are then cheap, allocate nothing,
// and may be called at every grid point and step, from several goroutines
// at once. The zero value transfers nothing (k_bl = 0).
type ElementTransfer struct {
	name    string
	sh      Sherwood // nil for the power law
	power   PowerLaw
	width   float64 // d, m
	nu      float64 // ν, m²/s
	diff    float64 // D, m²/s
	sc      float64 // ν/D
	reScale float64 // d/ν, s/m
	kScale  float64 // D/d, m/s
}

// Element transfer laws by the names NewElementTransfer and case files
// ([[scalar]] uptake) give them.
const (
	TransferHilpert            = "hilpert"
	TransferChurchillBernstein = "churchill-bernstein"
	TransferPlateLaminar       = "plate-laminar"
	TransferPlate              = "plate"
	TransferPowerLaw           = "power-law"
)

// transferLaw is one element transfer law NewElementTransfer knows.
type transferLaw struct {
	name string
	sh   Sherwood // nil for the power law
	// shape is the element cross-section the correlation is for; any
	// shape (the power law) when anyShape is set.
	shape    Shape
	anyShape bool
	// inRange reports whether Re and Sc lie in the published range; nil
	// for the power law, whose range is the user's.
	inRange func(re, sc float64) bool
}

// transferLaws is the one list of element transfer laws, in the order
// messages list them. A new law is one entry here (and its test).
var transferLaws = []transferLaw{
	{name: TransferHilpert, sh: Hilpert, shape: Cylinder, inRange: func(re, _ float64) bool { return HilpertInRange(re) }},
	{name: TransferChurchillBernstein, sh: ChurchillBernstein, shape: Cylinder, inRange: ChurchillBernsteinInRange},
	{name: TransferPlateLaminar, sh: PlateLaminar, shape: Blade, inRange: func(re, _ float64) bool { return PlateLaminarInRange(re) }},
	{name: TransferPlate, sh: PlateMixed, shape: Blade, inRange: func(re, _ float64) bool { return PlateInRange(re) }},
	{name: TransferPowerLaw, anyShape: true},
}

// ElementTransfers returns the names of the element transfer laws, in the
// order messages list them.
func ElementTransfers() []string {
	names := make([]string, len(transferLaws))
	for i, l := range transferLaws {
		names[i] = l.name
	}
	return names
}

// TransferShape returns the element shape the correlation named name
// holds for, and false for a law for any shape (the power law) or a name
// that is not a law.
func TransferShape(name string) (Shape, bool) {
	l, ok := findTransfer(name)
	return l.shape, ok && !l.anyShape
}

// findTransfer returns the law named exactly name.
func findTransfer(name string) (transferLaw, bool) {
	for _, l := range transferLaws {
		if l.name == name {
			return l, true
		}
	}
	return transferLaw{}, false
}

// NewElementTransfer builds the element transfer law named name (case and
// surrounding space ignored):
//
//	"hilpert"              Hilpert (cylinders, d the diameter)
//	"churchill-bernstein"  ChurchillBernstein (cylinders)
//	"plate-laminar"        PlateLaminar (blades, d the blade width)
//	"plate"                PlateMixed (blades)
//	"power-law"            PowerLaw{alpha, n}
//
// d is the element width in m, nu the kinematic viscosity and diff the
// scalar's molecular diffusivity, both in m²/s; alpha (m^(1−n) s^(n−1))
// and n (dimensionless) are the power law's and must be zero for the
// correlations. The power law does not use d, which may then be zero; nu
// and diff are required for every law (they give the scalar's Sc).
//
// Errors name the quantity, its value and the fix: an unknown name (the
// message lists the known ones); d, nu or diff not positive and finite
// where needed; for the power law, alpha not positive and finite or n
// negative or not finite; alpha or n given to a correlation.
func NewElementTransfer(name string, d, nu, diff float64, alpha, n float64) (ElementTransfer, error) {
	key := strings.ToLower(strings.TrimSpace(name))
	law, ok := findTransfer(key)
	if !ok {
		quoted := make([]string, len(transferLaws))
		for i, l := range transferLaws {
			quoted[i] = strconv.Quote(l.name)
		}
		return ElementTransfer{}, fmt.Errorf("canopy: element transfer law %q unknown: need one of %s", name, strings.Join(quoted, ", "))
	}
	sh := law.sh
	positive := func(v float64) bool { return v > 0 && !math.IsInf(v, 1) }
	if !positive(nu) {
		return ElementTransfer{}, fmt.Errorf("canopy: element transfer %s: viscosity ν = %g m²/s: need a positive, finite value (water at 20 °C: 1.0034e-6)", key, nu)
	}
	if !positive(diff) {
		return ElementTransfer{}, fmt.Errorf("canopy: element transfer %s: diffusivity D = %g m²/s: need a positive, finite value (O₂ in water at 20 °C: 1.76e-9)", key, diff)
	}
	e := ElementTransfer{name: key, sh: sh, nu: nu, diff: diff, sc: nu / diff}
	if sh == nil {
		if !positive(alpha) {
			return ElementTransfer{}, fmt.Errorf("canopy: element transfer power-law: alpha = %g m^(1-n) s^(n-1): need a positive, finite value (for no uptake set the surface capacity to 0 instead)", alpha)
		}
		if !(n >= 0) || math.IsInf(n, 1) {
			return ElementTransfer{}, fmt.Errorf("canopy: element transfer power-law: exponent n = %g: need a finite value >= 0 (0.5 laminar, about 0.8 turbulent)", n)
		}
		if d < 0 || math.IsNaN(d) || math.IsInf(d, 1) {
			return ElementTransfer{}, fmt.Errorf("canopy: element transfer power-law: width d = %g m: need a finite value >= 0 (the power law does not use it; leave it 0)", d)
		}
		e.power = PowerLaw{Alpha: alpha, N: n}
		e.width = d
		if d > 0 {
			e.reScale = d / nu
			e.kScale = diff / d
		}
		return e, nil
	}
	if !positive(d) {
		return ElementTransfer{}, fmt.Errorf("canopy: element transfer %s: width d = %g m: need the element's positive width (cylinder diameter or blade width)", key, d)
	}
	if alpha != 0 || n != 0 {
		return ElementTransfer{}, fmt.Errorf("canopy: element transfer %s: alpha = %g, n = %g belong to \"power-law\" only: leave them 0 or choose \"power-law\"", key, alpha, n)
	}
	e.width = d
	e.reScale = d / nu
	e.kScale = diff / d
	return e, nil
}

// Name returns the law's name as NewElementTransfer knows it ("hilpert",
// ..., "power-law"); "" for the zero value.
func (e ElementTransfer) Name() string { return e.name }

// Width returns the element width d in m.
func (e ElementTransfer) Width() float64 { return e.width }

// Schmidt returns the scalar's Schmidt number Sc = ν/D (dimensionless).
func (e ElementTransfer) Schmidt() float64 { return e.sc }

// Reynolds returns the element Reynolds number Re = |speed| d/ν
// (dimensionless) for a local speed in m/s; 0 for a power law built
// without a width.
func (e ElementTransfer) Reynolds(speed float64) float64 {
	return math.Abs(speed) * e.reScale
}

// Velocity returns the boundary-layer transfer velocity k_bl in m/s at the
// local speed |speed| (m/s): Sh(Re, Sc) D/d for a correlation, α |u|^n for
// the power law. It does not allocate.
func (e ElementTransfer) Velocity(speed float64) float64 {
	if e.sh == nil {
		return e.power.Velocity(speed)
	}
	return e.sh(math.Abs(speed)*e.reScale, e.sc) * e.kScale
}

// EffectiveVelocity returns k_e = SeriesVelocity(Velocity(speed), ks) in
// m/s: the element's boundary layer in series with a surface uptake
// capacity ks (m/s). It does not allocate.
func (e ElementTransfer) EffectiveVelocity(speed, ks float64) float64 {
	return SeriesVelocity(e.Velocity(speed), ks)
}

// InRange reports whether the local speed (m/s) gives a Reynolds number
// inside the published range of the law (HilpertInRange,
// ChurchillBernsteinInRange, PlateLaminarInRange, PlateInRange; always
// true for the power law, whose range is the user's), for warnings. The
// Schmidt-number ranges are in each correlation's comment and not checked
// here.
func (e ElementTransfer) InRange(speed float64) bool {
	l, ok := findTransfer(e.name)
	if !ok || l.inRange == nil {
		return true
	}
	return l.inRange(e.Reynolds(speed), e.sc)
}

// SeriesVelocity returns the transfer velocity k_e (m/s) of two
// resistances in series, 1/k_e = 1/kbl + 1/ks, with kbl the boundary-layer
// transfer velocity and ks the surface uptake capacity, both >= 0 in m/s.
// A perfect sink, ks = +Inf, gives kbl; a surface that takes nothing up,
// ks = 0, gives 0 (and symmetrically for kbl). It does not allocate.
func SeriesVelocity(kbl, ks float64) float64 {
	return 1 / (1/kbl + 1/ks)
}

// BoundaryLayerShare returns the fraction of the transfer resistance that
// sits in the element's boundary layer,
//
//	(1/kbl) / (1/kbl + 1/ks) = k_e/kbl,
//
// with kbl and ks >= 0 in m/s as for SeriesVelocity: 1 for a perfect sink
// (ks = +Inf) or a stagnant boundary layer (kbl = 0), 0 when the boundary
// layer offers no resistance (kbl = +Inf) or the surface takes nothing up
// (ks = 0). It is NaN where both resistances are zero or both infinite.
func BoundaryLayerShare(kbl, ks float64) float64 {
	return 1 / (1 + kbl/ks)
}

// The Schmidt-number range of ShawHanratty (Shaw & Hanratty 1977, AIChE J.
// 23:28; range from memory).
const (
	ShawHanrattyMinSc = 700
	ShawHanrattyMaxSc = 37000
)

// ShawHanratty is the mass transfer to a smooth wall under a turbulent
// boundary layer at high Schmidt number, as a dimensionless transfer
// velocity
//
//	k⁺ = k/u* = 0.0889 Sc^(−0.704),
//
// from Shaw & Hanratty 1977, AIChE J. 23:28, measured for Sc ≈ 700–37 000
// (range from memory; ShawHanrattyInRange). Outside the range the formula
// is used as is. O₂ in water at 20 °C (Sc ≈ 530–570) lies a little below
// it; the extrapolation there is short, but at Sc of order one the formula
// is far off. It needs Sc > 0.
func ShawHanratty(sc float64) float64 {
	return 0.0889 * math.Pow(sc, -0.704)
}

// ShawHanrattyInRange reports whether 700 <= Sc <= 37 000, the range of
// ShawHanratty (Shaw & Hanratty 1977, AIChE J. 23:28; range from memory).
func ShawHanrattyInRange(sc float64) bool {
	return sc >= ShawHanrattyMinSc && sc <= ShawHanrattyMaxSc
}

// BedTransferVelocity returns the bed's diffusive-boundary-layer transfer
// velocity k_dbl = u* k⁺(Sc) in m/s from the local friction velocity u*
// (m/s; its sign is ignored) and the Schmidt number, with k⁺ from
// ShawHanratty (Shaw & Hanratty 1977, AIChE J. 23:28). Combine it with the
// bed's uptake capacity through SeriesVelocity. It does not allocate.
func BedTransferVelocity(ustar, sc float64) float64 {
	return math.Abs(ustar) * ShawHanratty(sc)
}

// The temperature range of SchmidtOxygenSeawater, in °C (from memory).
const (
	SchmidtOxygenMinTemp = 0
	SchmidtOxygenMaxTemp = 30
)

// SchmidtOxygenSeawater returns the Schmidt number of dissolved O₂ in
// seawater (salinity 35 g/kg, from memory) at temperature tempC in °C, from the cubic fit of
// Keeling et al. 1998 (Global Biogeochem. Cycles 12:141; journal from
// memory):
//
//	Sc = 1638 − 81.83 T + 1.483 T² − 0.008004 T³,
//
// fitted over about 0–30 °C (from memory; the cubic is used as is
// outside). It gives 530.568 at 20 °C. With the seawater viscosity at
// 20 °C (1.0507×10⁻⁶ m²/s) this implies D ≈ 1.98×10⁻⁹ m²/s, some 12 %
// above the fresh-water OxygenDiffusivity20C, although salt lowers the
// diffusivity: the two sources do not agree to better than about 10 %.
func SchmidtOxygenSeawater(tempC float64) float64 {
	t := tempC
	return 1638 + t*(-81.83+t*(1.483+t*(-0.008004)))
}
