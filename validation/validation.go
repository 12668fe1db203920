package validation

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"strconv"
	"strings"

	"rollerbed/canopy"
	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// The kinds of comparison a Check makes.
const (
	// KindRelative passes when |measured/expected − 1| <= tolerance.
	KindRelative = "relative"
	// KindAbsolute passes when |measured − expected| <= tolerance.
	KindAbsolute = "absolute"
	// KindAtMost passes when measured <= tolerance (a bound such as a
	// divergence or an error norm); expected is 0.
	KindAtMost = "at-most"
)

// Check is one measured quantity compared with its reference value.
//
// A NaN measurement never passes.
type Check struct {
	// Name identifies the check: "<case>/<check>", unique over all cases.
	Name string `json:"name"`
	// Quantity says in words what was measured, with its units.
	Quantity string `json:"quantity"`
	// Measured is the value the solver produced; Expected the reference.
	Measured float64 `json:"measured"`
	Expected float64 `json:"expected"`
	// Tolerance is the allowed deviation (relative or absolute, by Kind)
	// or, for KindAtMost, the bound itself.
	Tolerance float64 `json:"tolerance"`
	// Kind is KindRelative, KindAbsolute or KindAtMost.
	Kind string `json:"kind"`
	Pass bool   `json:"pass"`
	// Source names the published reference of Expected, or says "derived"
	// or "common practice, no source".
	Source string `json:"source"`
}

// Relative returns a check that passes when |measured/expected − 1| <= tol.
func Relative(name, quantity string, measured, expected, tol float64, source string) Check {
	return Check{Name: name, Quantity: quantity, Measured: measured, Expected: expected,
		Tolerance: tol, Kind: KindRelative, Source: source,
		Pass: math.Abs(measured/expected-1) <= tol}
}

// Absolute returns a check that passes when |measured − expected| <= tol.
func Absolute(name, quantity string, measured, expected, tol float64, source string) Check {
	return Check{Name: name, Quantity: quantity, Measured: measured, Expected: expected,
		Tolerance: tol, Kind: KindAbsolute, Source: source,
		Pass: math.Abs(measured-expected) <= tol}
}

// AtMost returns a check that passes when measured <= limit.
func AtMost(name, quantity string, measured, limit float64, source string) Check {
	return Check{Name: name, Quantity: quantity, Measured: measured,
		Tolerance: limit, Kind: KindAtMost, Source: source,
		Pass: measured <= limit}
}

// String returns a one-line summary of the check.
func (c Check) String() string {
	verdict := "FAIL"
	if c.Pass {
		verdict = "pass"
	}
	var cmp string
	switch c.Kind {
	case KindRelative:
		cmp = fmt.Sprintf("expected %.8g ± %.3g (relative)", c.Expected, c.Tolerance)
	case KindAbsolute:
		cmp = fmt.Sprintf("expected %.8g ± %.3g", c.Expected, c.Tolerance)
	default:
		cmp = fmt.Sprintf("at most %.3g", c.Tolerance)
	}
	return fmt.Sprintf("%s  %s: %s = %.8g, %s [%s]", verdict, c.Name, c.Quantity, c.Measured, cmp, c.Source)
}

// Options control a validation run.
type Options struct {
	// Full runs the fuller (slower, finer) sizes of each case.
	Full bool
	// Keep, when not empty, is a folder: each case writes Keep/<case>/
	// with CSV tables of measured against exact profiles or time series,
	// and checks.json with its checks.
	Keep string
	// Backend is the transform backend of the solvers (the backends case
	// uses both).
	Backend transform.Backend
	// Workers is the number of goroutines per solver (0 or 1: one).
	Workers int
}

// Case is one verification or validation case.
type Case struct {
	// Name is the case's name as Run accepts it, e.g. "vortex-decay".
	Name string
	// Summary says in one line what the case checks.
	Summary string

	run func(Options) ([]Check, error)
}

// Run runs the case and returns its checks, named "<case>/<check>". With
// opt.Keep set, it writes the case folder, checks.json last.
func (c Case) Run(opt Options) ([]Check, error) {
	checks, err := c.run(opt)
	for i := range checks {
		checks[i].Name = c.Name + "/" + checks[i].Name
	}
	if err != nil {
		return checks, fmt.Errorf("validation: case %s: %w", c.Name, err)
	}
	if opt.Keep != "" {
		data, err := json.MarshalIndent(checks, "", "  ")
		if err != nil {
			return checks, fmt.Errorf("validation: case %s: %w", c.Name, err)
		}
		if err := writeFile(filepath.Join(opt.Keep, c.Name, "checks.json"), append(data, '\n')); err != nil {
			return checks, fmt.Errorf("validation: case %s: %w", c.Name, err)
		}
	}
	return checks, nil
}

// Cases returns every case, in a stable order: solver verification from the
// simplest (projection, a free decaying vortex) through the drag layers to
// the hydrodynamic stability checks, then the canopy validation case, then
// the backend cross-check.
func Cases() []Case {
	return []Case{
		{Name: "projection", Summary: "random and solenoidal fields on a stretched grid: divergence after projection at round-off", run: runProjection},
		{Name: "vortex-decay", Summary: "Taylor–Green vortex array between free-slip walls: exponential decay and second-order convergence in z", run: runVortex},
		{Name: "open-channel-startup", Summary: "open channel (no-slip bed, free-slip top) started from rest by a fixed gradient: Fourier-series transient and parabolic steady state", run: runOpenStartup},
		{Name: "closed-channel-startup", Summary: "closed channel (no-slip bed and lid) started from rest by a fixed gradient: Fourier-series transient and parabolic steady state", run: runClosedStartup},
		{Name: "couette", Summary: "lid-driven Couette flow: linear steady state and the start-up series", run: runCouette},
		{Name: "stokes-second", Summary: "Stokes' second problem over an oscillating bed: U exp(−ηz) cos(ωt − ηz) on uniform and bed-clustered grids", run: runStokes},
		{Name: "womersley-channel", Summary: "laminar channel flow under an oscillating pressure gradient and under a tidal bulk-velocity target: the plane Womersley profile and second-order convergence in z", run: runWomersley},
		{Name: "wave-canopy", Summary: "oscillatory flow through a uniform rigid canopy: in-canopy attenuation against the canopy-flow model of Lowe et al. (2005) and its inertia- and drag-dominated limits", run: runWaveCanopy},
		{Name: "blade-reconfiguration", Summary: "flexible blades: the effective-length and bent-height laws against the quasi-static blade model (Luhar & Nepf 2011) over a range of Cauchy numbers", run: runReconfiguration},
		{Name: "brinkman-layer", Summary: "linear-drag (Brinkman) layer under clear fluid, open and closed channel: two-layer steady profile (Neale & Nader 1974) and second-order convergence", run: runBrinkman},
		{Name: "drag-balance", Summary: "emergent canopy filling the depth: interior velocity √(2Π(1−φ)/(C_D a)) reached with steps of 20 drag times, and the laminar bed layer", run: runDragBalance},
		{Name: "ts-wave", Summary: "Tollmien–Schlichting wave in plane Poiseuille flow at Re = 10⁴, α = 1: energy growth rate 2αc_i (Orszag 1971)", run: runTSWave},
		{Name: "kelvin-helmholtz", Summary: "temporal Kelvin–Helmholtz instability of a tanh mixing layer at Re = 1000, αδ = 0.4446: energy growth rate 2αc_i from the Orr–Sommerfeld solver (Michalke 1964)", run: runKelvinHelmholtz},
		{Name: "spanwise-box", Summary: "the spanwise-periodic box: a y-invariant flow follows the slice to round-off, an oblique Fourier mode decays at its exact rate with second-order convergence in z, divergence, backends and workers", run: runBox},
		{Name: "oblique-ts-wave", Summary: "oblique Tollmien–Schlichting wave (α, β) = (0.8, 0.6) in a spanwise-periodic box at Re = 1.25·10⁴: energy growth rate of the equivalent 2-D wave by Squire's theorem", run: runObliqueTS},
		{Name: "oblique-kelvin-helmholtz", Summary: "oblique Kelvin–Helmholtz mode of the tanh layer in a spanwise-periodic box, α̃δ = 0.4446 at 37°: energy growth rate of the equivalent 2-D mode by Squire's theorem", run: runObliqueKH},
		{Name: "canopy-shear-layer", Summary: "LES of a dense submerged canopy (C_D a h = 1): penetration depth, roller spacing and frequency against published scalings (validation, ±40 %)", run: runCanopyShear},
		{Name: "scalar-uptake", Summary: "passive scalars: still-fluid uptake decay, sink layer against cosh, a pulse around the domain, Churchill–Bernstein, budget closure and series-resistance limits", run: runScalars},
		{Name: "backends", Summary: "FFTW and gonum transforms, and one or several workers, give the same step of a perturbed shear flow", run: runBackends},
	}
}

// Run runs the named cases (all of them when names is empty), in the order
// of Cases, and returns their checks. An unknown name is an error that lists
// the known names; nothing runs then. A case that fails to run (as opposed
// to a check that fails) stops the run with its error, returning the checks
// gathered so far.
func Run(names []string, opt Options) ([]Check, error) {
	all := Cases()
	want := make(map[string]bool, len(names))
	for _, n := range names {
		found := false
		for _, c := range all {
			if c.Name == n {
				found = true
				break
			}
		}
		if !found {
			known := make([]string, len(all))
			for i, c := range all {
				known[i] = c.Name
			}
			return nil, fmt.Errorf("validation: unknown case %q; the cases are %s", n, strings.Join(known, ", "))
		}
		want[n] = true
	}
	var checks []Check
	for _, c := range all {
		if len(names) > 0 && !want[c.Name] {
			continue
		}
		got, err := c.Run(opt)
		checks = append(checks, got...)
		if err != nil {
			return checks, err
		}
	}
	return checks, nil
}

// Failed returns the checks that did not pass.
func Failed(checks []Check) []Check {
	var out []Check
	for _, c := range checks {
		if !c.Pass {
			out = append(out, c)
		}
	}
	return out
}

// Published and other sources named beside the checks.
const (
	srcTaylorGreen = "Taylor & Green 1937, Proc. R. Soc. A 158:499 (2-D form; wall form derived)"
	srcChannel     = "White, Viscous Fluid Flow; Schlichting & Gersten, Boundary-Layer Theory (series derived)"
	srcStokes      = "White, Viscous Fluid Flow; Schlichting & Gersten, Boundary-Layer Theory"
	srcOrszag      = "Orszag 1971, J. Fluid Mech. 50:689"
	srcWomersley   = "Womersley 1955, J. Physiol. 127:553 (pipe form; plane-channel form derived)"
	srcLuharNepf   = "Luhar & Nepf 2011, Limnol. Oceanogr. 56:2003 (blade model and effective-length fit from memory; bent-height fit: Luhar & Nepf 2013, Adv. Water Resour. 51:305, from memory)"
	srcLowe        = "Lowe, Koseff & Monismith 2005, J. Geophys. Res. 110, C10016 (model form from memory; emergent-canopy limits derived)"
	srcDerived     = "derived"
	srcPractice    = "common practice, no source"
	srcOrder       = "common practice, no source (second-order scheme: package solver, Numerics)"
)

// roundOff is the bound on errors that only rounding should produce,
// relative to the scale of the field (common practice, no source: a few
// thousand ulps of accumulated rounding over a run).
const roundOff = 1e-12

// fixedDrag returns the solver's drag for canopy c (a fixed C_D) on grid g:
// HalfArea = ½ a/(1 − φ) at the cell centres (canopy.Canopy.DragArea), C_D,
// and the element width as the diameter of the element Reynolds number.
func fixedDrag(c *canopy.Canopy, g *solver.Grid) *solver.Drag {
	m := canopy.Mesh{Lx: g.Lx, H: g.H, Dx: g.Dx, X: g.X, Zf: g.Zf}
	return &solver.Drag{HalfArea: c.DragArea(m), CD: c.CD, Diameter: c.Elements.Width}
}

// newSolver builds a solver with the backend and workers of opt.
func newSolver(opt Options, cfg solver.Config) (*solver.Solver, error) {
	cfg.Backend = opt.Backend
	cfg.Workers = opt.Workers
	return solver.New(cfg)
}

// periodicError sets s to the x-uniform profile exact(z, 0), takes
// periods − 1 periods of steps fixed steps each, and over the last period
// compares the x-mean velocity with exact(z, t) at 8 evenly spread phases.
// It returns the largest |u − exact| / scale and the profiles compared
// (t, z, measured, exact).
func periodicError(s *solver.Solver, exact func(z, t float64) float64, scale, period float64, periods, steps int) (worst float64, out *table, err error) {
	g := s.Grid()
	prof := make([]float64, g.Nz)
	for k, z := range g.Zc {
		prof[k] = exact(z, 0)
	}
	s.SetMeanProfile(prof)
	dt := period / float64(steps)
	if err := advance(s, (periods-1)*steps, dt); err != nil {
		return 0, nil, err
	}
	out = newTable("t_s", "z_m", "u_measured", "u_exact")
	const phases = 8
	for p := range phases {
		n := steps*(p+1)/phases - steps*p/phases
		if err := advance(s, n, dt); err != nil {
			return 0, nil, err
		}
		s.MeanU(prof)
		for k, z := range g.Zc {
			ex := exact(z, s.Time())
			worst = math.Max(worst, math.Abs(prof[k]-ex)/scale)
			out.add(s.Time(), z, prof[k], ex)
		}
	}
	return worst, out, nil
}

// advance takes n fixed steps of dt.
func advance(s *solver.Solver, n int, dt float64) error {
	for range n {
		if err := s.StepBy(dt); err != nil {
			return err
		}
	}
	return nil
}

// order returns the observed order of convergence log(e1/e2)/log(r) of two
// errors on grids refined by the ratio r.
func order(e1, e2, r float64) float64 { return math.Log(e1/e2) / math.Log(r) }

// maxAbs returns max |a|.
func maxAbs(a []float64) float64 {
	m := 0.0
	for _, v := range a {
		m = math.Max(m, math.Abs(v))
	}
	return m
}

// maxAbsDiff returns max |a − b|.
func maxAbsDiff(a, b []float64) float64 {
	m := 0.0
	for i := range a {
		m = math.Max(m, math.Abs(a[i]-b[i]))
	}
	return m
}

// modeErrorBound estimates the error of a second-order three-point
// diffusion operator on a decaying sine series (derived): mode n of
// amplitude |b_n| and wavenumber λ_n decays on the grid at the discrete rate
// ν λ_n² (1 − ε_n), ε_n = 1 − (sin(λ_n Δz/2)/(λ_n Δz/2))², so its
// amplitude at time t is off by |b_n| e^(−x)(e^(xε_n) − 1), x = ν λ_n² t.
// The sum over the modes bounds the max-norm error of the series, apart
// from the wall closure, which the tolerances built on it leave room for.
// amp(n) and lambda(n) describe mode n = 1, 2, ...; amp returns 0 for
// modes absent from the series.
func modeErrorBound(amp, lambda func(n int) float64, nu, t, dz float64) float64 {
	sum := 0.0
	for n := 1; n < 1_000_000; n++ {
		l := lambda(n)
		x := nu * l * l * t
		if x > 50 {
			break
		}
		h := l * dz / 2
		sinc := math.Sin(h) / h
		eps := 1 - sinc*sinc
		sum += math.Abs(amp(n)) * math.Exp(-x) * math.Expm1(x*eps)
	}
	return sum
}

// tolMargin is the factor between an a-priori error estimate and the
// tolerance built on it (common practice, no source): it leaves room for
// what the estimate leaves out (wall closures, time error, grid
// stretching) while still catching an error twice the expected size.
const tolMargin = 2

// table is a CSV table a case may keep.
type table struct {
	header []string
	rows   [][]float64
}

func newTable(header ...string) *table { return &table{header: header} }

func (t *table) add(row ...float64) { t.rows = append(t.rows, row) }

// keep writes the tables into opt.Keep/<name>/ as CSV files (file name →
// table); it does nothing when opt.Keep is empty.
func keep(opt Options, name string, tables map[string]*table) error {
	if opt.Keep == "" {
		return nil
	}
	for file, t := range tables {
		var b strings.Builder
		b.WriteString(strings.Join(t.header, ","))
		b.WriteByte('\n')
		for _, r := range t.rows {
			for i, v := range r {
				if i > 0 {
					b.WriteByte(',')
				}
				b.WriteString(strconv.FormatFloat(v, 'g', -1, 64))
			}
			b.WriteByte('\n')
		}
		if err := writeFile(filepath.Join(opt.Keep, name, file), []byte(b.String())); err != nil {
			return err
		}
	}
	return nil
}

// writeFile writes data to path atomically (runfolder.WriteFileAtomic),
// making its folder first.
func writeFile(path string, data []byte) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return runfolder.WriteFileAtomic(path, data)
}
