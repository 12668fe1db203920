package stats

import (
	"fmt"
	"math"
	"math/cmplx"

	"rollerbed/solver"
)

// Phases accumulates x-averaged statistics by phase of a periodic forcing:
// the cycle of Period seconds is cut into Bins equal bins, and each sample
// (a step) goes into the bin of the phase at the middle of the step, with
// the step as its weight. Per bin it keeps the streamwise velocity profile,
// the resolved shear stress and each scalar's vertical flux about the phase
// mean, and the scalar uptake by the elements and the bed.
type Phases struct {
	g      *solver.Grid
	bins   int
	period float64 // s
	Start  float64 // s, samples before this time are ignored
	weight []float64
	// Sums over x and time, per bin (bin b at [b·n, (b+1)·n)):
	su           []float64 // centres: u
	sw, suf, suw []float64 // faces: w, u at the face, u·w
	scalars      []phaseScalar
}

type phaseScalar struct {
	index        int
	sc           []float64 // centres: c
	scf, swc     []float64 // faces: c at the face, w·c
	element, bed []float64 // per bin: uptake by the elements and the bed, unit·m per bed area
}

// NewPhases prepares phase statistics with bins bins (>= 2) of a cycle of
// period seconds (> 0) on grid g, for the scalars of the given solver
// indices; samples before start (s) are skipped. Phases are counted from
// t = 0.
func NewPhases(g *solver.Grid, bins int, period, start float64, scalars []int) *Phases {
	if bins < 2 || !(period > 0) {
		panic(fmt.Sprintf("stats: %d phase bins of a %g s period: need >= 2 bins and a period > 0", bins, period))
	}
	nz := g.Nz
	p := &Phases{g: g, bins: bins, period: period, Start: start, weight: make([]float64, bins),
		su: make([]float64, bins*nz), sw: make([]float64, bins*(nz+1)),
		suf: make([]float64, bins*(nz+1)), suw: make([]float64, bins*(nz+1))}
	for _, i := range scalars {
		p.scalars = append(p.scalars, phaseScalar{index: i, sc: make([]float64, bins*nz),
			scf: make([]float64, bins*(nz+1)), swc: make([]float64, bins*(nz+1)),
			element: make([]float64, bins), bed: make([]float64, bins)})
	}
	return p
}

// Bins returns the number of phase bins.
func (p *Phases) Bins() int { return p.bins }

// Bin returns the bin of time t (s): floor(Bins · frac(t/Period)).
func (p *Phases) Bin(t float64) int {
	f := math.Mod(t/p.period, 1)
	if f < 0 {
		f++
	}
	return min(int(f*float64(p.bins)), p.bins-1)
}

// Add takes the step of dt seconds that the solver has just taken. It does
// nothing before Start. It allocates nothing.
func (p *Phases) Add(s *solver.Solver, dt float64) {
	t := s.Time()
	if t < p.Start || !(dt > 0) {
		return
	}
	b := p.Bin(t - dt/2)
	g := p.g
	nx, nz := levelSize(g), g.Nz
	u, w := s.U(), s.W()
	f := dt / float64(nx)
	cen, fac := b*nz, b*(nz+1)
	addLevelSums(p.su[cen:cen+nz], u, nx, f)
	for j := 1; j < nz; j++ {
		sw, suf, suw := faceSums(g, j, u, w)
		p.sw[fac+j] += f * sw
		p.suf[fac+j] += f * suf
		p.suw[fac+j] += f * suw
	}
	for n := range p.scalars {
		ps := &p.scalars[n]
		c := s.Scalar(ps.index)
		addLevelSums(ps.sc[cen:cen+nz], c, nx, f)
		for j := 1; j < nz; j++ {
			_, scf, swc := faceSums(g, j, c, w)
			ps.scf[fac+j] += f * scf
			ps.swc[fac+j] += f * swc
		}
		bud := s.Budget(ps.index)
		ps.element[b] += bud.StepElement
		ps.bed[b] -= bud.StepBedIn
	}
	p.weight[b] += dt
}

// addLevelSums adds weight times the sum over a level (x, and y in a slab)
// of each level of field (nx values each) to dst, one value per level.
func addLevelSums(dst, field []float64, nx int, weight float64) {
	for k := range dst {
		sum := 0.0
		for _, v := range field[k*nx : (k+1)*nx] {
			sum += v
		}
		dst[k] += weight * sum
	}
}

// faceSums returns, at interior face j, the sums over the level (x, and y
// in a slab) of w, of the centre field c interpolated to the face, and of
// their product.
func faceSums(g *solver.Grid, j int, c, w []float64) (sw, scf, swc float64) {
	nx := levelSize(g)
	h := g.Hf[j]
	wa, wb := (g.Zc[j]-g.Zf[j])/h, (g.Zf[j]-g.Zc[j-1])/h
	for i := j * nx; i < (j+1)*nx; i++ {
		cf := wa*c[i-nx] + wb*c[i]
		sw += w[i]
		scf += cf
		swc += cf * w[i]
	}
	return sw, scf, swc
}

// PhaseMean is the statistics of one phase bin. Centre profiles have Nz
// values at Grid.Zc, face profiles Nz+1 at Grid.Zf (zero at the bed and
// the top).
type PhaseMean struct {
	Phase float64 // the middle of the bin as a fraction of the period
	Time  float64 // s, averaging time in the bin
	U     []float64
	// UW is the resolved shear stress ⟨u′w′⟩ about the x-mean of the
	// phase mean (faces), m²/s².
	UW []float64
	// C and Flux are, per scalar, the mean concentration (centres) and
	// the resolved vertical flux ⟨w′c′⟩ (faces, unit·m/s).
	C, Flux [][]float64
	// ElementUptake and BedUptake are, per scalar, the uptake rates by
	// the elements and by the bed per unit bed area in the bin,
	// unit·m/s.
	ElementUptake, BedUptake []float64
}

// Means returns the statistics of every bin; a bin without samples has
// zero profiles and Time 0.
func (p *Phases) Means() []PhaseMean {
	nz := p.g.Nz
	out := make([]PhaseMean, p.bins)
	for b := range out {
		m := &out[b]
		m.Phase, m.Time = (float64(b)+0.5)/float64(p.bins), p.weight[b]
		m.U, m.UW = make([]float64, nz), make([]float64, nz+1)
		ns := len(p.scalars)
		m.C, m.Flux = make([][]float64, ns), make([][]float64, ns)
		m.ElementUptake, m.BedUptake = make([]float64, ns), make([]float64, ns)
		for n := range m.C {
			m.C[n], m.Flux[n] = make([]float64, nz), make([]float64, nz+1)
		}
		if p.weight[b] == 0 {
			continue
		}
		inv := 1 / p.weight[b]
		cen, fac := b*nz, b*(nz+1)
		for k := range nz {
			m.U[k] = p.su[cen+k] * inv
		}
		for j := 1; j < nz; j++ {
			m.UW[j] = p.suw[fac+j]*inv - p.suf[fac+j]*inv*p.sw[fac+j]*inv
		}
		for n, ps := range p.scalars {
			for k := range nz {
				m.C[n][k] = ps.sc[cen+k] * inv
			}
			for j := 1; j < nz; j++ {
				m.Flux[n][j] = ps.swc[fac+j]*inv - ps.scf[fac+j]*inv*p.sw[fac+j]*inv
			}
			m.ElementUptake[n], m.BedUptake[n] = ps.element[b]*inv, ps.bed[b]*inv
		}
	}
	return out
}

// LayerMean returns the thickness-weighted mean of a centre profile over
// the cells whose centres lie in [z0, z1) (m), or 0 when none does.
func LayerMean(g *solver.Grid, f []float64, z0, z1 float64) float64 {
	var sum, w float64
	for k, z := range g.Zc {
		if z >= z0 && z < z1 {
			sum += f[k] * g.Dz[k]
			w += g.Dz[k]
		}
	}
	if w == 0 {
		return 0
	}
	return sum / w
}

// Harmonic returns the amplitude and phase (rad) of the first harmonic of
// values sampled at the middles of equal phase bins over one period:
// v(φ) ≈ mean + amplitude·cos(2πφ + phase). Bins without samples (per
// weights) are left out.
func Harmonic(values, weights []float64) (amplitude, phase float64) {
	var z complex128
	var wsum float64
	n := float64(len(values))
	for b, v := range values {
		if weights[b] == 0 {
			continue
		}
		phi := 2 * math.Pi * (float64(b) + 0.5) / n
		z += complex(v, 0) * cmplx.Exp(complex(0, -phi))
		wsum++
	}
	if wsum == 0 {
		return 0, 0
	}
	z *= complex(2/wsum, 0)
	return cmplx.Abs(z), cmplx.Phase(z)
}

// Export returns the accumulators as named arrays, for checkpoints.
func (p *Phases) Export() map[string][]float64 {
	c := func(s []float64) []float64 { return append([]float64(nil), s...) }
	m := map[string][]float64{
		"phase_u": c(p.su), "phase_w": c(p.sw), "phase_uf": c(p.suf), "phase_uw": c(p.suw),
		"phase_weight": c(p.weight), "phase_start": {p.Start},
	}
	for n, ps := range p.scalars {
		pre := fmt.Sprintf("phase_scalar%d_", n)
		m[pre+"c"], m[pre+"cf"], m[pre+"wc"] = c(ps.sc), c(ps.scf), c(ps.swc)
		m[pre+"element"], m[pre+"bed"] = c(ps.element), c(ps.bed)
	}
	return m
}

// Import restores accumulators saved by Export with the same grid, bins and
// scalars.
func (p *Phases) Import(m map[string][]float64) error {
	dst := map[string][]float64{"phase_u": p.su, "phase_w": p.sw, "phase_uf": p.suf, "phase_uw": p.suw, "phase_weight": p.weight}
	for n, ps := range p.scalars {
		pre := fmt.Sprintf("phase_scalar%d_", n)
		dst[pre+"c"], dst[pre+"cf"], dst[pre+"wc"] = ps.sc, ps.scf, ps.swc
		dst[pre+"element"], dst[pre+"bed"] = ps.element, ps.bed
	}
	for name, d := range dst {
		v, ok := m[name]
		if !ok || len(v) != len(d) {
			return fmt.Errorf("stats: saved phase statistics lack %s or are for other bins or another grid", name)
		}
		copy(d, v)
	}
	st := m["phase_start"]
	if len(st) != 1 {
		return fmt.Errorf("stats: saved phase statistics lack their start")
	}
	p.Start = st[0]
	return nil
}
