package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
	"rollerbed/validation/stability"
)

// Temporal Kelvin–Helmholtz instability of the mixing layer
// U = U0 tanh((z − H/2)/δ) at Re = U0 δ/ν = 1000 between free-slip walls at
// ±khZmax δ from the centre, in a domain one most-unstable wavelength long
// (α δ = 0.4446, Michalke 1964, J. Fluid Mech. 19:543). The inviscid growth
// rate of the unbounded layer there is α c_i = 0.1897 U0/δ (Michalke 1964);
// viscosity lowers it slightly (Betchov & Szewczyk 1963, Phys. Fluids
// 6:1391), so the run is compared with the viscous Orr–Sommerfeld growth
// rate for the same walls and Re from package stability, computed here.
//
// The base profile is held steady by the body force −ν L U, L the solver's
// own three-point vertical diffusion operator with its free-slip wall
// closures applied to the sampled profile (the discrete form of −ν U″, so
// the base flow does not diffuse at all). The closure is off (Cs = 0). The
// run is seeded with the eigenfunction at peak u′ = khEps U0, and the
// growth rate of the disturbance energy (every x-mode but the mean) is
// fitted over [khFitFrom, khEnd] δ/U0, after the part of the seed that is
// not the discrete eigenmode has decayed and before the disturbance (then
// about 2e-3 U0) is large enough for nonlinear terms to matter. The
// energy grows as exp(2 α c_i t).
//
// The phase speed is zero by symmetry (Michalke 1964: c_r = 0 for the tanh
// layer), which the grid, clustered symmetrically about the centre, keeps.

const (
	khAlpha   = 0.4446 // α δ, the most unstable wavenumber (Michalke 1964)
	khRe      = 1000.0
	khZmax    = 10.0 // walls at ±khZmax δ
	khDelta   = 0.02 // m, half-thickness δ
	khU0      = 0.05 // m/s
	khEps     = 1e-6 // peak u′ of the seed, in U0
	khFitFrom = 10.0 // δ/U0
	khEnd     = 40.0 // δ/U0
	khSample  = 0.5  // δ/U0 between energy samples
	khNx      = 16   // Fourier modes 1..5 kept; the seeded mode is m = 1
	khNu      = khU0 * khDelta / khRe
	khH       = 2 * khZmax * khDelta
	// khTol is the allowed relative error of the energy growth rate (the
	// task's 3 %).
	khTol = 0.03
	// khCrTol bounds |c_r|/U0 (common practice, no source: c_r vanishes
	// by symmetry, so anything above rounding means a broken symmetry).
	khCrTol = 1e-3
	// khInviscidTol is the allowed relative deviation of the Orr–Sommerfeld
	// growth rate at Re = 10⁶ from Michalke's inviscid 0.1897 (the task's
	// 0.5 %; Michalke gives four digits).
	khInviscidTol = 0.005
	khMichalke    = 0.1897 // α c_i δ/U0 at α δ = 0.4446 (Michalke 1964)
	// khChebyshev is the degree of the Orr–Sommerfeld solves: converged to
	// about 1e-11 in α c_i from n = 80 (package stability's doc).
	khChebyshev = 96
)

const srcMichalke = "Michalke 1964, J. Fluid Mech. 19:543"

// khCluster refines the spacing factor times around the centre, with a
// Gaussian half-width of three shear-layer half-thicknesses.
func khCluster(factor float64) solver.Cluster {
	if factor <= 1 {
		return solver.Cluster{}
	}
	return solver.Cluster{At: khH / 2, AtFactor: factor, AtWidth: 3 * khDelta}
}

type khRun struct {
	nz      int
	cluster float64 // refinement factor at the centre; 1 for a uniform grid
	dt      float64 // δ/U0
}

func (r khRun) String() string {
	if r.cluster > 1 {
		return fmt.Sprintf("Nz = %d clustered %g× at the centre, Δt = %g δ/U0", r.nz, r.cluster, r.dt)
	}
	return fmt.Sprintf("uniform Nz = %d, Δt = %g δ/U0", r.nz, r.dt)
}

// khGrids returns the grids, each twice the one before, all clustered 3×
// at the centre and stepped at Δt = 0.1 δ/U0 (the advective limit at CFL
// 0.5 is 0.23 δ/U0); the growth rate on the last is checked, and the same
// run with twice the step.
func khGrids(opt Options) []khRun {
	if opt.Full {
		return []khRun{{128, 3, 0.1}, {256, 3, 0.1}, {512, 3, 0.1}}
	}
	return []khRun{{64, 3, 0.1}, {128, 3, 0.1}, {256, 3, 0.1}}
}

func runKelvinHelmholtz(opt Options) ([]Check, error) {
	grids := khGrids(opt)
	last := grids[len(grids)-1]
	coarseDt := khRun{last.nz, last.cluster, 2 * last.dt}
	mode, err := stability.LeastStable(stability.Tanh(khZmax), khAlpha, khRe, khChebyshev)
	if err != nil {
		return nil, err
	}
	inviscid, err := stability.LeastStable(stability.Tanh(khZmax), khAlpha, 1e6, khChebyshev)
	if err != nil {
		return nil, err
	}
	want := 2 * mode.GrowthRate()
	checks := []Check{Relative("inviscid-limit",
		fmt.Sprintf("Orr–Sommerfeld α c_i δ/U0 at α δ = %g, Re = 10⁶, walls at ±%g δ (package stability, n = %d)", khAlpha, khZmax, khChebyshev),
		inviscid.GrowthRate(), khMichalke, khInviscidTol, srcMichalke)}
	tables := map[string]*table{}
	summary := newTable("nz", "cluster", "dt_delta_over_u0", "growth_rate", "growth_rate_os", "relative_error", "c_r")
	done := map[khRun]growth{}
	measure := func(r khRun) (growth, error) {
		if res, ok := done[r]; ok {
			return res, nil
		}
		res, err := r.measure(opt, mode)
		if err != nil {
			return res, err
		}
		done[r] = res
		summary.add(float64(r.nz), r.cluster, r.dt, res.rate, want, res.rate/want-1, res.cr)
		tables[fmt.Sprintf("energy_nz%d_cluster%g_dt%g.csv", r.nz, r.cluster, r.dt)] = res.series
		return res, nil
	}
	errs := make([]float64, len(grids))
	var main growth
	for i, r := range grids {
		res, err := measure(r)
		if err != nil {
			return checks, err
		}
		errs[i] = math.Abs(res.rate/want - 1)
		main = res
	}
	const srcOS = "package stability, viscous Orr–Sommerfeld for the same walls and Re (2αc_i); inviscid value: Michalke 1964, J. Fluid Mech. 19:543"
	checks = append(checks,
		Relative("growth-rate", fmt.Sprintf("energy growth rate (U0/δ) over t = %g–%g δ/U0, %v (Orr–Sommerfeld 2αc_i = %.8g)", khFitFrom, khEnd, last, want),
			main.rate, want, khTol, srcOS),
		AtMost("phase-speed", fmt.Sprintf("|c_r|/U0 of mode 1 of w at the centre, %v", last), math.Abs(main.cr), khCrTol, srcMichalke+" (c_r = 0)"),
		AtMost("exponential", fmt.Sprintf("|rate over %g–%g − rate over %g–%g| / rate (δ/U0): one mode grows, linearly, %v",
			khFitFrom, (khFitFrom+khEnd)/2, (khFitFrom+khEnd)/2, khEnd, last),
			math.Abs(main.early-main.late)/main.rate, 0.01, srcPractice))
	for i := 1; i < len(grids); i++ {
		checks = append(checks, Absolute(fmt.Sprintf("order-nz%d-nz%d", grids[i-1].nz, grids[i].nz),
			"observed order of the growth-rate error under z refinement", order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
	}
	coarse, err := measure(coarseDt)
	if err != nil {
		return checks, err
	}
	checks = append(checks, AtMost("time-step",
		fmt.Sprintf("|rate(Δt = %g δ/U0) − rate(Δt = %g δ/U0)| / rate, Nz = %d", coarseDt.dt, last.dt, last.nz),
		math.Abs(coarse.rate-main.rate)/main.rate, khTol/4, srcPractice))
	tables["summary.csv"] = summary
	return checks, keep(opt, "kelvin-helmholtz", tables)
}

// khBase returns the sampled base profile and the body force −ν L U that
// holds it steady on grid g (L with zero-flux free-slip walls, as the
// solver applies it).
func khBase(g *solver.Grid) (u, force []float64) {
	nz := g.Nz
	u = make([]float64, nz)
	for k, z := range g.Zc {
		u[k] = khU0 * math.Tanh((z-khH/2)/khDelta)
	}
	force = make([]float64, nz)
	for k := range nz {
		flux := func(j int) float64 { // ν U′ at face j
			if j == 0 || j == nz {
				return 0
			}
			return khNu * (u[j] - u[j-1]) / g.Hf[j]
		}
		force[k] = -(flux(k+1) - flux(k)) / g.Dz[k]
	}
	return u, force
}

func (r khRun) measure(opt Options, mode stability.Mode) (growth, error) {
	lx := 2 * math.Pi / khAlpha * khDelta
	g, err := solver.NewGrid(khNx, r.nz, lx, khH, khCluster(r.cluster))
	if err != nil {
		return growth{}, err
	}
	base, force := khBase(g)
	s, err := newSolver(opt, solver.Config{Nx: khNx, Nz: r.nz, Lx: lx, H: khH, Cluster: khCluster(r.cluster),
		Viscosity: khNu, Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		BodyForce: force})
	if err != nil {
		return growth{}, err
	}
	defer s.Close()
	nx, nz := g.Nx, g.Nz
	u := make([]float64, nz*nx)
	w := make([]float64, (nz+1)*nx)
	for k, z := range g.Zc {
		for i, x := range g.X {
			du, _ := mode.Velocity(x/khDelta, (z-khH/2)/khDelta, 0)
			u[k*nx+i] = base[k] + khEps*khU0*du
		}
	}
	for j := 1; j < nz; j++ {
		for i, x := range g.X {
			_, dw := mode.Velocity(x/khDelta, (g.Zf[j]-khH/2)/khDelta, 0)
			w[j*nx+i] = khEps * khU0 * dw
		}
	}
	if err := s.SetVelocity(u, w); err != nil {
		return growth{}, err
	}
	mid := nz / 2 // the centre face, where w of the mode peaks
	tUnit := khDelta / khU0
	return measureGrowth(s, growthSpec{
		timeColumn: "t_delta_over_u0", tUnit: tUnit, dt: r.dt * tUnit,
		perSample: int(math.Round(khSample / r.dt)), samples: int(math.Round(khEnd / khSample)),
		from: khFitFrom, end: khEnd, alpha: khAlpha,
		energy: func() float64 { return tsEnergy(s) },
		wave:   func() complex128 { return tsMode1(s.W()[mid*nx:(mid+1)*nx], g.X, khAlpha/khDelta) },
	})
}
