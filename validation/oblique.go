package validation

import (
	"fmt"
	"math"
	"math/cmplx"

	"rollerbed/solver"
	"rollerbed/validation/stability"
)

// Oblique waves in a spanwise-periodic box. By Squire's transformation
// (Squire 1933, Proc. R. Soc. A 142:621) the wave exp(i(αx + βy − αct)) in
// a parallel flow U(z) e_x at Reynolds number Re has the phase speed c of
// the two-dimensional wave of wavenumber α̃ = (α² + β²)^½ at Reynolds number
// Re α/α̃: the Orr–Sommerfeld equation for w is the same. Its energy grows
// as exp(2 α c_i t). So the oblique runs are checked against the project's
// Orr–Sommerfeld solver at (α̃, Re α/α̃), with the obliquity chosen so that
// the equivalent wave is that of the slice's ts-wave and kelvin-helmholtz
// cases (α̃ = 1 at Re = 10⁴; α̃δ = 0.4446 at Re = 1000), at cos θ = α/α̃ =
// 0.8.
//
// The seed is the whole three-dimensional eigenmode: along the wave vector
// the two-dimensional mode's velocity ũ = φ′ and ŵ = −iα̃φ; across it the
// wall-normal vorticity η̂ = i(β û − α v̂), forced by the mode through
//
//	[iα(U − c) + ν(α̃² − D²)] η̂ = −iβ U′ ŵ
//
// (the linearised equation of η, derived), solved on the run's own grid
// with its three-point D² and wall conditions (η = 0 at a no-slip wall,
// Dη = 0 at a free-slip one). Then û = (α α̃ ũ − iβ η̂)/α̃² and
// v̂ = (β α̃ ũ + iα η̂)/α̃². Seeding ũ and ŵ alone would add damped Squire
// modes that, in the slowly growing channel case, outlast the fit window.

// obliqueCos is cos θ = α/α̃ of the oblique waves.
const obliqueCos = 0.8

const srcSquire = "Squire 1933, Proc. R. Soc. A 142:621; package stability, Orr–Sommerfeld at (α̃, Re α/α̃) (2αc_i)"

// obliqueFlow is one oblique-wave run: the base flow, the box and the
// sampling, in the solver's units (m, s).
type obliqueFlow struct {
	mode      stability.Mode                  // the equivalent two-dimensional mode at α̃
	alpha     float64                         // 1/m, streamwise wavenumber α
	beta      float64                         // 1/m, spanwise wavenumber β
	nu        float64                         // m²/s
	cfg       solver.Config                   // the box without its velocity
	zMode     func(z float64) float64         // the mode's coordinate of height z
	speedUnit float64                         // m/s per mode velocity unit
	base      func(z float64) (u, du float64) // m/s and 1/s
	eps       float64                         // peak |ũ| of the seed in mode velocity units
	sample    float64                         // s between energy samples
	dt        float64                         // s
	fitFrom   float64                         // s
	end       float64                         // s
}

// run seeds the base flow with the oblique eigenmode and fits the energy
// growth rate and the phase speed.
func (f obliqueFlow) run(opt Options) (growth, error) {
	s, err := newSolver(opt, f.cfg)
	if err != nil {
		return growth{}, err
	}
	defer s.Close()
	g := s.Grid()
	nx, ny, nz := g.Nx, g.Ny, g.Nz
	at := math.Hypot(f.alpha, f.beta)
	// ũ, ŵ at the centres and ŵ at the faces, m/s.
	ut, wc := make([]complex128, nz), make([]complex128, nz)
	wf := make([]complex128, nz+1)
	shape := func(z float64) (complex128, complex128) {
		phi, dphi := f.mode.Eval(f.zMode(z))
		a := complex(f.eps*f.speedUnit, 0)
		return a * dphi, a * complex(0, -f.mode.Alpha) * phi
	}
	for k, z := range g.Zc {
		ut[k], wc[k] = shape(z)
	}
	for j := 1; j < nz; j++ {
		_, wf[j] = shape(g.Zf[j])
	}
	eta := f.squireVorticity(g, wc)
	u, v, w := make([]float64, nz*ny*nx), make([]float64, nz*ny*nx), make([]float64, (nz+1)*ny*nx)
	ia2 := complex(1/(at*at), 0)
	for k, z := range g.Zc {
		ub, _ := f.base(z)
		uh := (complex(f.alpha*at, 0)*ut[k] - complex(0, f.beta)*eta[k]) * ia2
		vh := (complex(f.beta*at, 0)*ut[k] + complex(0, f.alpha)*eta[k]) * ia2
		for j := 0; j < ny; j++ {
			for i := 0; i < nx; i++ {
				e := cmplx.Exp(complex(0, f.alpha*g.X[i]+f.beta*g.Y(j)))
				p := (k*ny+j)*nx + i
				u[p], v[p] = ub+real(uh*e), real(vh*e)
			}
		}
	}
	for l := 1; l < nz; l++ {
		for j := 0; j < ny; j++ {
			for i := 0; i < nx; i++ {
				w[(l*ny+j)*nx+i] = real(wf[l] * cmplx.Exp(complex(0, f.alpha*g.X[i]+f.beta*g.Y(j))))
			}
		}
	}
	if err := s.SetVelocity3(u, v, w); err != nil {
		return growth{}, err
	}
	mid := nz / 2
	return measureGrowth(s, growthSpec{
		timeColumn: "t_s", tUnit: 1, dt: f.dt,
		perSample: int(math.Round(f.sample / f.dt)), samples: int(math.Round(f.end / f.sample)),
		from: f.fitFrom, end: f.end, alpha: f.alpha,
		energy: func() float64 { return obliqueEnergy(s) },
		wave:   func() complex128 { return obliqueMode(s.W()[mid*ny*nx:(mid+1)*ny*nx], g, f.alpha, f.beta) },
	})
}

// squireVorticity solves the forced equation of η̂ at the centres of g for
// the mode's ŵ there (m/s), with the run's three-point D² and wall
// conditions.
func (f obliqueFlow) squireVorticity(g *solver.Grid, w []complex128) []complex128 {
	nz := g.Nz
	at2 := f.alpha*f.alpha + f.beta*f.beta
	c := f.mode.C * complex(f.speedUnit, 0)
	lo, di, up, rhs := make([]complex128, nz), make([]complex128, nz), make([]complex128, nz), make([]complex128, nz)
	// wallCoef is the coupling of the first centre to the wall: ν/(Hf Dz)
	// with η = 0 there (no-slip), none with Dη = 0 (free-slip).
	wallCoef := func(kind solver.WallKind, k, j int) float64 {
		if kind == solver.FreeSlip {
			return 0
		}
		return f.nu / (g.Hf[j] * g.Dz[k])
	}
	for k, z := range g.Zc {
		ub, dub := f.base(z)
		var a, b float64
		if k > 0 {
			a = f.nu / (g.Hf[k] * g.Dz[k])
			lo[k] = complex(-a, 0)
		} else {
			a = wallCoef(f.cfg.Bed.Kind, 0, 0)
		}
		if k < nz-1 {
			b = f.nu / (g.Hf[k+1] * g.Dz[k])
			up[k] = complex(-b, 0)
		} else {
			b = wallCoef(f.cfg.Top.Kind, nz-1, nz)
		}
		di[k] = complex(0, f.alpha)*(complex(ub, 0)-c) + complex(f.nu*at2+a+b, 0)
		rhs[k] = complex(0, -f.beta*dub) * w[k]
	}
	return complexThomas(lo, di, up, rhs)
}

// complexThomas solves the tridiagonal system lo[k] x[k−1] + di[k] x[k] +
// up[k] x[k+1] = rhs[k].
func complexThomas(lo, di, up, rhs []complex128) []complex128 {
	n := len(di)
	cp, x := make([]complex128, n), make([]complex128, n)
	cp[0] = up[0] / di[0]
	x[0] = rhs[0] / di[0]
	for k := 1; k < n; k++ {
		den := di[k] - lo[k]*cp[k-1]
		cp[k] = up[k] / den
		x[k] = (rhs[k] - lo[k]*x[k-1]) / den
	}
	for k := n - 2; k >= 0; k-- {
		x[k] -= cp[k] * x[k+1]
	}
	return x
}

// obliqueEnergy returns the kinetic energy (per unit density, up to the
// factor ½ and 1/(Nx Ny)) of the disturbance: u and v minus their means over
// each level, and w.
func obliqueEnergy(s *solver.Solver) float64 {
	g := s.Grid()
	np := g.Nx * g.Ny
	e := 0.0
	for _, f := range [][]float64{s.U(), s.V()} {
		for k := range g.Zc {
			row := f[k*np : (k+1)*np]
			mean := 0.0
			for _, v := range row {
				mean += v
			}
			mean /= float64(np)
			sum := 0.0
			for _, v := range row {
				sum += (v - mean) * (v - mean)
			}
			e += sum * g.Dz[k]
		}
	}
	w := s.W()
	for j := 1; j < g.Nz; j++ {
		sum := 0.0
		for _, v := range w[j*np : (j+1)*np] {
			sum += v * v
		}
		e += sum * g.Hf[j]
	}
	return e
}

// obliqueMode returns the coefficient (1/(Nx Ny)) Σ f exp(−i(αx + βy)) of a
// plane.
func obliqueMode(plane []float64, g *solver.Grid, alpha, beta float64) complex128 {
	var c complex128
	for j := 0; j < g.Ny; j++ {
		for i, x := range g.X {
			c += complex(plane[j*g.Nx+i], 0) * cmplx.Exp(complex(0, -alpha*x-beta*g.Y(j)))
		}
	}
	return c / complex(float64(g.Nx*g.Ny), 0)
}

// obliqueChecks returns the growth-rate, exponential-growth and phase-speed
// checks of a run against the equivalent mode.
func obliqueChecks(f obliqueFlow, res growth, tol float64, what string) []Check {
	want := 2 * f.alpha * imag(f.mode.C) * f.speedUnit
	wantCr := real(f.mode.C) * f.speedUnit
	crScale := f.speedUnit
	return []Check{
		Relative("growth-rate", fmt.Sprintf("energy growth rate (1/s) of the oblique wave over t = %g–%g s, %s (2αc_i = %.8g)", f.fitFrom, f.end, what, want),
			res.rate, want, tol, srcSquire),
		AtMost("exponential", fmt.Sprintf("|rate over the first half of the fit − rate over the second| / rate, %s", what),
			math.Abs(res.early-res.late)/res.rate, 0.01, srcPractice),
		AtMost("phase-speed", fmt.Sprintf("|c_r − c_r of the equivalent mode| / (velocity scale) of the (α, β) wave of w at mid-depth, %s", what),
			math.Abs(res.cr-wantCr)/crScale, 1e-3, srcSquire),
	}
}

// obliqueTSFlow is the oblique Tollmien–Schlichting wave: plane Poiseuille
// flow (centre-line speed 1 m/s, half-width 1 m) at Re = 10⁴/0.8, α = 0.8,
// β = 0.6 (1/m), equivalent to the ts-wave case's α = 1, Re = 10⁴, on that
// case's clustered grid and step.
func obliqueTSFlow(nz int, dt float64) (obliqueFlow, error) {
	at := 1.0
	alpha, beta := obliqueCos*at, math.Sqrt(1-obliqueCos*obliqueCos)*at
	re := tsRe * at / alpha
	mode, err := stability.LeastStable(stability.Poiseuille(), at, tsRe, tsChebyshev)
	if err != nil {
		return obliqueFlow{}, err
	}
	nu := 1 / re
	return obliqueFlow{
		mode: mode, alpha: alpha, beta: beta, nu: nu,
		cfg: solver.Config{Nx: tsNx, Ny: 4, Nz: nz, Lx: 2 * math.Pi / alpha, Ly: 2 * math.Pi / beta, H: tsH,
			Cluster: tsCluster(), Viscosity: nu,
			Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.NoSlip},
			Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: 2 * nu}},
		zMode: func(z float64) float64 { return z - tsH/2 }, speedUnit: 1,
		base: func(z float64) (float64, float64) { y := z - tsH/2; return 1 - y*y, -2 * y },
		eps:  tsEps, sample: tsSample, dt: dt, fitFrom: tsFitFrom, end: tsEnd,
	}, nil
}

func runObliqueTS(opt Options) ([]Check, error) {
	nz, dt := 256, 0.1
	if opt.Full {
		nz, dt = 512, 0.05
	}
	f, err := obliqueTSFlow(nz, dt)
	if err != nil {
		return nil, err
	}
	res, err := f.run(opt)
	if err != nil {
		return nil, err
	}
	what := fmt.Sprintf("α = %g, β = %g 1/m, Re = %.6g, clustered Nz = %d, Ny = 4, dt = %g s", f.alpha, f.beta, 1/f.nu, nz, dt)
	return obliqueChecks(f, res, tsTol, what), keep(opt, "oblique-ts-wave", map[string]*table{"energy.csv": res.series})
}

// obliqueKHFlow is the oblique Kelvin–Helmholtz mode of the tanh layer of
// the kelvin-helmholtz case at Re = 1000/0.8, α̃δ = 0.4446 (αδ = 0.3557,
// βδ = 0.2668), held steady by the body force −ν L U.
func obliqueKHFlow(nz int, dt float64) (obliqueFlow, error) {
	at := khAlpha / khDelta
	alpha, beta := obliqueCos*at, math.Sqrt(1-obliqueCos*obliqueCos)*at
	re := khRe * at / alpha
	mode, err := stability.LeastStable(stability.Tanh(khZmax), khAlpha, khRe, khChebyshev)
	if err != nil {
		return obliqueFlow{}, err
	}
	nu := khU0 * khDelta / re
	lx, ly := 2*math.Pi/alpha, 2*math.Pi/beta
	g, err := solver.NewGrid(khNx, nz, lx, khH, khCluster(3))
	if err != nil {
		return obliqueFlow{}, err
	}
	_, force := khBase(g)
	for k := range force {
		force[k] *= nu / khNu // khBase holds the profile at the slice's ν
	}
	return obliqueFlow{
		mode: mode, alpha: alpha, beta: beta, nu: nu,
		cfg: solver.Config{Nx: khNx, Ny: 4, Nz: nz, Lx: lx, Ly: ly, H: khH, Cluster: khCluster(3),
			Viscosity: nu, Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
			BodyForce: force},
		zMode: func(z float64) float64 { return (z - khH/2) / khDelta }, speedUnit: khU0,
		base: func(z float64) (float64, float64) {
			t := math.Tanh((z - khH/2) / khDelta)
			return khU0 * t, khU0 / khDelta * (1 - t*t)
		},
		eps: khEps, sample: khSample * khDelta / khU0, dt: dt * khDelta / khU0,
		fitFrom: khFitFrom * khDelta / khU0, end: khEnd * khDelta / khU0,
	}, nil
}

func runObliqueKH(opt Options) ([]Check, error) {
	nz := 256
	if opt.Full {
		nz = 512
	}
	f, err := obliqueKHFlow(nz, 0.1)
	if err != nil {
		return nil, err
	}
	res, err := f.run(opt)
	if err != nil {
		return nil, err
	}
	what := fmt.Sprintf("αδ = %.4g, βδ = %.4g, Re = %.6g, Nz = %d clustered 3× at the centre, Ny = 4, Δt = 0.1 δ/U0", f.alpha*khDelta, f.beta*khDelta, khU0*khDelta/f.nu, nz)
	return obliqueChecks(f, res, khTol, what), keep(opt, "oblique-kelvin-helmholtz", map[string]*table{"energy.csv": res.series})
}
