package validation

import (
	"fmt"
	"math"
	"math/cmplx"

	"rollerbed/canopy"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// csSetup is one size of the canopy shear-layer case.
type csSetup struct {
	nx, nz   int
	lx       float64 // m
	cluster  solver.Cluster
	spinUp   float64 // s, before statistics start
	average  float64 // s, of statistics after the spin-up
	sample   float64 // s, between probe samples
	segment  int     // samples per Welch segment
	probes   int     // probes at the canopy top, evenly spread in x
	cfl      float64
	perturb  float64 // m/s, amplitude of the seeded perturbation
	seed     uint64
	bulk     float64 // m/s
	smagorin float64
}

const (
	csH    = 0.5  // m, flume depth
	csTop  = 0.2  // m, canopy height h
	csA    = 5.0  // 1/m, frontal-area density
	csCD   = 1.0  // drag coefficient
	csD    = 6e-3 // m, dowel diameter
	csNu   = 1e-6 // m²/s, water
	csBulk = 0.1  // m/s
)

func csCanopy() canopy.Canopy {
	return canopy.Canopy{Profile: canopy.Block(csTop, csA), CD: csCD,
		Elements: canopy.Elements{Shape: canopy.Cylinder, Width: csD}}
}

func csConfig(opt Options) csSetup {
	c := csSetup{nx: 256, nz: 96, lx: 2.0,
		cluster: solver.Cluster{At: csTop, AtFactor: 2, AtWidth: 0.06},
		spinUp:  60, average: 120, sample: 0.1, segment: 512, probes: 8, cfl: 0.5,
		perturb: 0.005, seed: 1, bulk: csBulk, smagorin: 0.2}
	if opt.Full {
		c.nx, c.nz = 512, 192
		c.average = 480
	}
	return c
}

// csMeasured is what one run measured.
type csMeasured struct {
	mean     stats.Mean
	layer    canopy.ShearLayer
	tau      []float64 // m²/s², −(⟨u′w′⟩ + subgrid) at the faces
	delta    float64   // m, penetration depth
	spectrum canopy.Spectrum
	freq     float64 // Hz, peak of w at the canopy top
	steps    int
	maxCFL   float64
	gradient float64 // m/s², time-mean Π over the statistics
	// modes[m] is the time-mean |ŵ_m|² of w along the canopy top (m = 0
	// excluded), speed[m] the phase speed of mode m (m/s), weighted by
	// its energy.
	modes, speed []float64
}

func (c csSetup) run(opt Options) (csMeasured, error) {
	var m csMeasured
	cp := csCanopy()
	if err := cp.Validate(c.lx, csH); err != nil {
		return m, err
	}
	g, err := solver.NewGrid(c.nx, c.nz, c.lx, csH, c.cluster)
	if err != nil {
		return m, err
	}
	s, err := newSolver(opt, solver.Config{Nx: c.nx, Nz: c.nz, Lx: c.lx, H: csH, Cluster: c.cluster,
		Viscosity: csNu, Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Forcing: solver.Forcing{Kind: solver.FixedBulk, Bulk: c.bulk},
		CFL:     c.cfl, Closure: solver.Closure{Cs: c.smagorin}, Drag: cp.Drag(g)})
	if err != nil {
		return m, err
	}
	defer s.Close()
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		return m, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(c.perturb, csTop, 0.05, c.seed)

	xs, zs := make([]float64, c.probes), make([]float64, c.probes)
	for n := range xs {
		xs[n] = c.lx * float64(n) / float64(c.probes)
		zs[n] = csTop
	}
	probes := stats.NewProbes(g, xs, zs)
	nSamples := int(math.Round(c.average / c.sample))
	probes.Reserve(nSamples + 1)
	profiles := stats.NewProfiles(g, csNu, c.spinUp)
	end := c.spinUp + c.average + c.sample/2
	next := c.spinUp
	gradSum, gradT := 0.0, 0.0
	topFace := 0
	for j, z := range g.Zf {
		if math.Abs(z-csTop) < math.Abs(g.Zf[topFace]-csTop) {
			topFace = j
		}
	}
	top := newRowModes(g, c.sample)
	for s.Time() < end-1e-9 {
		// Adaptive steps, shortened to land on the spin-up end and on
		// every probe sample time after it.
		dt := s.NextStep()
		if left := next - s.Time(); dt >= left {
			dt = left
		} else if 2*dt > left {
			dt = left / 2
		}
		if err := s.StepBy(dt); err != nil {
			return m, err
		}
		m.steps++
		m.maxCFL = math.Max(m.maxCFL, s.CourantNumber(dt))
		profiles.Add(s, dt)
		if s.Time() > c.spinUp {
			gradSum += s.Gradient() * dt
			gradT += dt
		}
		if math.Abs(s.Time()-next) < 1e-9 {
			probes.Add(s)
			top.add(s.W()[topFace*c.nx : (topFace+1)*c.nx])
			next = c.spinUp + float64(len(probes.T))*c.sample
		}
	}
	m.gradient = gradSum / gradT
	m.mean = profiles.Mean()
	m.layer, err = canopy.MeasureShearLayer(m.mean.Zc, m.mean.U, csTop)
	if err != nil {
		return m, err
	}
	m.tau = make([]float64, len(m.mean.Zf))
	for j := range m.tau {
		m.tau[j] = -(m.mean.UW[j] + m.mean.SGS[j])
	}
	m.delta = canopy.PenetrationDepth(m.mean.Zf, m.tau, csTop)
	m.spectrum, err = canopy.WelchSpectrum(probes.W, c.sample, c.segment)
	if err != nil {
		return m, err
	}
	m.freq = m.spectrum.Peak()
	m.modes, m.speed = top.result()
	return m, nil
}

func runCanopyShear(opt Options) ([]Check, error) {
	c := csConfig(opt)
	m, err := c.run(opt)
	if err != nil {
		return nil, err
	}
	fmt.Printf("%+v\n", m.layer)
	fmt.Println("delta", m.delta, "deltaCDa", m.delta*csCD*csA, "freq", m.freq, "steps", m.steps, "maxCFL", m.maxCFL, "Pi", m.gradient)
	fmt.Println("Lambda/Ls (Ubar)", m.layer.UBar/m.freq/m.layer.ShearLength, "(Uh)", m.layer.UTop/m.freq/m.layer.ShearLength, "f theta/Ubar", m.freq*m.layer.Theta/m.layer.UBar)
	return []Check{AtMost("x", "x", 0, 1, srcPractice)}, nil
}

// rowModes accumulates the Fourier modes of one row of samples taken every
// dt seconds: the mean energy |ŵ_m|² of each mode and its phase speed from
// the phase change between samples (weighted by the product of the
// amplitudes).
type rowModes struct {
	g         *solver.Grid
	dt        float64
	prev      []complex128
	energy    []float64
	cross     []complex128
	n, ncross int
}

func newRowModes(g *solver.Grid, dt float64) *rowModes {
	nm := g.KeptModes() + 1
	return &rowModes{g: g, dt: dt, energy: make([]float64, nm), cross: make([]complex128, nm)}
}

func (r *rowModes) add(row []float64) {
	nm := len(r.energy)
	cur := make([]complex128, nm)
	for m := 1; m < nm; m++ {
		cur[m] = tsMode1(row, r.g.X, r.g.Wavenumber(m))
		r.energy[m] += real(cur[m])*real(cur[m]) + imag(cur[m])*imag(cur[m])
		if r.prev != nil {
			r.cross[m] += cur[m] * cmplx.Conj(r.prev[m])
		}
	}
	if r.prev != nil {
		r.ncross++
	}
	r.prev = cur
	r.n++
}

func (r *rowModes) result() (energy, speed []float64) {
	nm := len(r.energy)
	energy, speed = make([]float64, nm), make([]float64, nm)
	for m := 1; m < nm; m++ {
		energy[m] = r.energy[m] / float64(max(r.n, 1))
		speed[m] = -cmplx.Phase(r.cross[m]) / (r.g.Wavenumber(m) * r.dt)
	}
	return energy, speed
}
