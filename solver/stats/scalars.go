package stats

import (
	"fmt"
	"math"

	"rollerbed/solver"
)

// ScalarProfiles accumulates x- and time-averaged profiles of one scalar:
// its mean, its resolved vertical flux ⟨w′c′⟩ and its diffusive (molecular
// plus subgrid) vertical flux −⟨(D + ν_t/Sc_t) ∂c/∂z⟩, all at the faces
// except the mean.
type ScalarProfiles struct {
	g         *solver.Grid
	index     int     // the scalar's index in the solver
	nu, d     float64 // m²/s, molecular viscosity and diffusivity
	invSct    float64
	Start     float64
	weight    float64
	sc        []float64 // centres: c
	sw, scf   []float64 // faces: w, c interpolated
	swc, sdif []float64 // faces: w·c, diffusive flux
}

// NewScalarProfiles prepares accumulators for scalar index of a solver on
// grid g, with molecular viscosity nu and diffusivity d (m²/s) and turbulent
// Schmidt number sct (0 means 1).
func NewScalarProfiles(g *solver.Grid, index int, nu, d, sct, start float64) *ScalarProfiles {
	nz := g.Nz
	inv := 1.0
	if sct > 0 {
		inv = 1 / sct
	}
	return &ScalarProfiles{g: g, index: index, nu: nu, d: d, invSct: inv, Start: start,
		sc: make([]float64, nz), sw: make([]float64, nz+1), scf: make([]float64, nz+1),
		swc: make([]float64, nz+1), sdif: make([]float64, nz+1)}
}

// Add takes one sample with weight dt (s).
func (p *ScalarProfiles) Add(s *solver.Solver, dt float64) {
	if s.Time() < p.Start || !(dt > 0) {
		return
	}
	g := p.g
	nx, nz := levelSize(g), g.Nz // nx: values in a level, Ny·Nx in a slab
	c, w, nue := s.Scalar(p.index), s.W(), s.Viscosity()
	f := dt / float64(nx)
	for k := 0; k < nz; k++ {
		sum := 0.0
		for _, v := range c[k*nx : (k+1)*nx] {
			sum += v
		}
		p.sc[k] += f * sum
	}
	for j := 1; j < nz; j++ {
		h := g.Hf[j]
		a, b := (g.Zc[j]-g.Zf[j])/h, (g.Zf[j]-g.Zc[j-1])/h
		var sw, scf, swc, sdif float64
		for i := j * nx; i < (j+1)*nx; i++ {
			cf := a*c[i-nx] + b*c[i]
			sw += w[i]
			scf += cf
			swc += w[i] * cf
			nut := a*(nue[i-nx]-p.nu) + b*(nue[i]-p.nu)
			sdif -= (p.d + nut*p.invSct) * (c[i] - c[i-nx]) / h
		}
		p.sw[j] += f * sw
		p.scf[j] += f * scf
		p.swc[j] += f * swc
		p.sdif[j] += f * sdif
	}
	p.weight += dt
}

// ScalarMean holds the averaged profiles of a scalar (unit: the scalar's
// concentration unit).
type ScalarMean struct {
	C         []float64 // unit, mean concentration at the centres
	Resolved  []float64 // unit·m/s, ⟨w′c′⟩ at the faces (upward positive)
	Diffusive []float64 // unit·m/s, −⟨(D + ν_t/Sc_t) ∂c/∂z⟩ at the faces
	// EddyDiffusivity is K(z) = −⟨w′c′⟩ / (d⟨c⟩/dz) at the faces (m²/s),
	// NaN where the mean gradient vanishes.
	EddyDiffusivity []float64
	Time            float64 // s, averaging time
}

// Mean returns the averages so far.
func (p *ScalarProfiles) Mean() ScalarMean {
	g := p.g
	nz := g.Nz
	m := ScalarMean{C: make([]float64, nz), Resolved: make([]float64, nz+1), Diffusive: make([]float64, nz+1),
		EddyDiffusivity: make([]float64, nz+1), Time: p.weight}
	if p.weight == 0 {
		return m
	}
	inv := 1 / p.weight
	for k := range m.C {
		m.C[k] = p.sc[k] * inv
	}
	m.EddyDiffusivity[0], m.EddyDiffusivity[nz] = math.NaN(), math.NaN()
	for j := 1; j < nz; j++ {
		m.Resolved[j] = p.swc[j]*inv - p.sw[j]*inv*p.scf[j]*inv
		m.Diffusive[j] = p.sdif[j] * inv
		grad := (m.C[j] - m.C[j-1]) / g.Hf[j]
		if grad != 0 {
			m.EddyDiffusivity[j] = -m.Resolved[j] / grad
		} else {
			m.EddyDiffusivity[j] = math.NaN()
		}
	}
	return m
}

// Export returns the accumulators as named arrays (prefixed by name), for
// checkpoints.
func (p *ScalarProfiles) Export(name string) map[string][]float64 {
	c := func(s []float64) []float64 { return append([]float64(nil), s...) }
	pre := "scalar_" + name + "_"
	return map[string][]float64{
		pre + "c": c(p.sc), pre + "w": c(p.sw), pre + "cf": c(p.scf),
		pre + "wc": c(p.swc), pre + "dif": c(p.sdif), pre + "weight": {p.weight, p.Start},
	}
}

// Import restores accumulators saved by Export.
func (p *ScalarProfiles) Import(name string, m map[string][]float64) error {
	pre := "scalar_" + name + "_"
	for suffix, d := range map[string][]float64{"c": p.sc, "w": p.sw, "cf": p.scf, "wc": p.swc, "dif": p.sdif} {
		v, ok := m[pre+suffix]
		if !ok || len(v) != len(d) {
			return fmt.Errorf("stats: saved statistics of scalar %q lack %s or are for another grid", name, suffix)
		}
		copy(d, v)
	}
	w := m[pre+"weight"]
	if len(w) != 2 {
		return fmt.Errorf("stats: saved statistics of scalar %q lack their weight", name)
	}
	p.weight, p.Start = w[0], w[1]
	return nil
}
