package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
)

// A porous layer of uniform linear drag λ (the Darcy–Brinkman form,
// solver.Drag.Linear) in 0 < z < h under clear fluid, no-slip bed, driven
// by a fixed gradient Π with the molecular viscosity ν only. The steady
// profile is the two-layer solution of Neale & Nader 1974 (Can. J. Chem.
// Eng. 52:475; their form from memory, the solution derived here):
//
// In the layer, ν U″ − λ U + Π = 0 with U(0) = 0:
//
//	U = P (1 − cosh(z/ℓ)) + B sinh(z/ℓ),  P = Π/λ,  ℓ = √(ν/λ),
//
// the Darcy velocity P reached a few decay lengths ℓ from the bed and from
// the interface. Above it, ν U″ + Π = 0, with s = z − h:
//
//	U = C + D s − Π s²/(2ν).
//
// At z = h the velocity and the stress ν U′ are continuous (the Brinkman
// matching, with the fluid viscosity in the layer):
//
//	C = P (1 − ch) + B sh,  D = (B ch − P sh)/ℓ,  ch = cosh(h/ℓ), sh = sinh(h/ℓ).
//
// The top closes the system, with S = H − h. A free-slip top (an open
// channel over a porous bed), U′(H) = 0, gives D = Π S/ν and
//
//	B = (ℓ Π S/ν + P sh)/ch;
//
// a no-slip lid, U(H) = 0, gives C + D S = Π S²/(2ν) and
//
//	B = (Π S²/(2ν) − P (1 − ch) + P S sh/ℓ)/(sh + S ch/ℓ).
//
// The discrete problem: λ is given at the cell centres, so the interface
// sits on a face (h a multiple of the spacing of the uniform grids used)
// and each cell is wholly porous or clear. The flux across that face is the
// centred difference of U, whose error there is first order in Δz (U″ jumps
// by λU(h)/ν); but it acts across a single cell spacing, so the solution
// error stays second order (derived: the defect is a dipole of O(1)
// truncation errors in the two cells beside the face, shifting U′ by O(Δz)
// over one spacing only). The steady state is reached by fixed steps far
// longer than the drag and viscous times of the cells: diffusion and drag
// are implicit, so the steps converge quickly to the discrete steady state,
// which does not depend on the step (the stage weights of the explicit and
// implicit parts are equal, see drag-balance). The domain is long so that
// the advective Courant number of the x-uniform flow stays small.

const (
	brH        = 1.0  // m, depth
	brLayer    = 0.5  // m, layer height h
	brNu       = 1e-3 // m²/s
	brLambda   = 0.1  // 1/s: ℓ = √(ν/λ) = 0.1 m
	brGradient = 1e-3 // m/s²
	brLx       = 1000.0
	brNx       = 8
	brDt       = 50.0 // s: 5 drag times 1/λ, 0.05 viscous times H²/ν
	// brTol is the allowed max error relative to the peak velocity (the
	// task's 1e-3) on the checked grid.
	brTol       = 1e-3
	brConverged = 1e-13 // max |ΔU|/U_peak over a step counted as steady
	brMaxSteps  = 5000
)

// brinkman is one of the two channels.
type brinkman struct {
	name string
	top  solver.WallKind
}

// exact returns the steady two-layer profile.
func (b brinkman) exact(z float64) float64 {
	l := math.Sqrt(brNu / brLambda)
	p := brGradient / brLambda
	ch, sh := math.Cosh(brLayer/l), math.Sinh(brLayer/l)
	span := brH - brLayer
	var bb float64
	if b.top == solver.FreeSlip {
		bb = (l*brGradient*span/brNu + p*sh) / ch
	} else {
		bb = (brGradient*span*span/(2*brNu) - p*(1-ch) + p*span*sh/l) / (sh + span*ch/l)
	}
	if z <= brLayer {
		return p*(1-math.Cosh(z/l)) + bb*math.Sinh(z/l)
	}
	c := p*(1-ch) + bb*sh
	d := (bb*ch - p*sh) / l
	s := z - brLayer
	return c + d*s - brGradient*s*s/(2*brNu)
}

// peak returns the largest velocity of the exact profile, the scale of the
// errors: at the top for the open channel, where U′ = 0 for the closed one.
func (b brinkman) peak() float64 {
	if b.top == solver.FreeSlip {
		return b.exact(brH)
	}
	l := math.Sqrt(brNu / brLambda)
	p := brGradient / brLambda
	ch, sh := math.Cosh(brLayer/l), math.Sinh(brLayer/l)
	span := brH - brLayer
	bb := (brGradient*span*span/(2*brNu) - p*(1-ch) + p*span*sh/l) / (sh + span*ch/l)
	d := (bb*ch - p*sh) / l
	return b.exact(brLayer + brNu*d/brGradient)
}

// brGrids returns the uniform grids, each twice the one before; the error
// on the last is checked against brTol (ℓ/Δz = 12.8 at Nz = 128).
func brGrids(opt Options) []int {
	if opt.Full {
		return []int{64, 128, 256, 512}
	}
	return []int{32, 64, 128}
}

type brResult struct {
	err, change float64
	steps       int
	profile     *table
}

func (b brinkman) run(opt Options, nz int) (brResult, error) {
	if brLayer*float64(nz)/brH != math.Round(brLayer*float64(nz)/brH) {
		return brResult{}, fmt.Errorf("the layer top %g m is not on a face of the %d-cell grid", brLayer, nz)
	}
	lin := make([]float64, nz*brNx)
	for k := range nz {
		if (float64(k)+0.5)*brH/float64(nz) < brLayer {
			for i := range brNx {
				lin[k*brNx+i] = brLambda
			}
		}
	}
	s, err := newSolver(opt, solver.Config{Nx: brNx, Nz: nz, Lx: brLx, H: brH, Viscosity: brNu,
		Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: b.top},
		Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: brGradient},
		Drag:    &solver.Drag{Linear: lin}})
	if err != nil {
		return brResult{}, err
	}
	defer s.Close()
	scale := b.peak()
	var res brResult
	prev, now := make([]float64, nz), make([]float64, nz)
	for res.steps < brMaxSteps {
		s.MeanU(prev)
		if err := s.StepBy(brDt); err != nil {
			return res, err
		}
		res.steps++
		s.MeanU(now)
		res.change = maxAbsDiff(prev, now) / scale
		if res.change <= brConverged {
			break
		}
	}
	res.profile = newTable("z_m", "u_measured", "u_exact")
	for k, z := range s.Grid().Zc {
		ex := b.exact(z)
		res.profile.add(z, now[k], ex)
		res.err = math.Max(res.err, math.Abs(now[k]-ex)/scale)
	}
	return res, nil
}

func runBrinkman(opt Options) ([]Check, error) {
	grids := brGrids(opt)
	var checks []Check
	tables := map[string]*table{}
	summary := newTable("closed", "nz", "steps", "max_error_over_peak", "peak_exact")
	const src = "Neale & Nader 1974, Can. J. Chem. Eng. 52:475 (form from memory; solution derived)"
	for _, b := range []brinkman{{"open", solver.FreeSlip}, {"closed", solver.NoSlip}} {
		errs := make([]float64, len(grids))
		closed := 0.0
		if b.top == solver.NoSlip {
			closed = 1
		}
		for i, nz := range grids {
			res, err := b.run(opt, nz)
			if err != nil {
				return checks, err
			}
			errs[i] = res.err
			summary.add(closed, float64(nz), float64(res.steps), res.err, b.peak())
			tables[fmt.Sprintf("profile_%s_nz%d.csv", b.name, nz)] = res.profile
			if i == len(grids)-1 {
				checks = append(checks,
					AtMost(fmt.Sprintf("%s-profile-nz%d", b.name, nz),
						fmt.Sprintf("max |U − U_exact| / U_peak, %s top, uniform Nz = %d (h/Δz = %g, ℓ/Δz = %g)",
							b.top, nz, brLayer*float64(nz)/brH, math.Sqrt(brNu/brLambda)*float64(nz)/brH),
						res.err, brTol, src),
					AtMost(fmt.Sprintf("%s-steady-nz%d", b.name, nz),
						fmt.Sprintf("max |U(n+1) − U(n)| / U_peak over the last of %d steps of %g s", res.steps, brDt),
						res.change, 10*brConverged, srcPractice))
			}
		}
		for i := 1; i < len(grids); i++ {
			checks = append(checks, Absolute(fmt.Sprintf("%s-order-nz%d-nz%d", b.name, grids[i-1], grids[i]),
				fmt.Sprintf("observed order of the profile error under z refinement, %s top", b.top),
				order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
		}
	}
	tables["summary.csv"] = summary
	return checks, keep(opt, "brinkman-layer", tables)
}
