package stats

import (
	"rollerbed/solver"
)

// Profiles accumulates x- and time-averaged profiles; in a slab
// (Grid.Ny > 1) the averages are over x, y and time, each level a plane of
// Ny·Nx values.
type Profiles struct {
	g      *solver.Grid
	nu     float64 // molecular viscosity, m²/s
	Start  float64 // s, samples before this time are ignored
	weight float64 // s, total time weight
	n      int

	// Sums over x and time (weighted by dt) of:
	su, suu, snut []float64 // centres
	sw, sww       []float64 // faces
	suf, suw      []float64 // faces: u interpolated to the face, u·w
	ssgs          []float64 // faces: subgrid stress −ν_t (∂u/∂z + ∂w/∂x)
	// Time sums per point, for the dispersive stress of patchy canopies:
	// u interpolated to the faces, and w.
	tuf, tw []float64
	// sv, svv: sums of v and v² (centres), a slab's only.
	sv, svv []float64
}

// levelSize returns the values in one level of grid g: Nx in the slice,
// Ny·Nx in a slab.
func levelSize(g *solver.Grid) int { return g.Nx * max(g.Ny, 1) }

// NewProfiles prepares accumulators for grid g; samples at times before
// start are skipped. nu is the molecular viscosity (m²/s), subtracted from
// the solver's effective viscosity to give ν_t.
func NewProfiles(g *solver.Grid, nu, start float64) *Profiles {
	nz, np := g.Nz, levelSize(g)
	p := &Profiles{
		g: g, nu: nu, Start: start,
		su: make([]float64, nz), suu: make([]float64, nz), snut: make([]float64, nz),
		sw: make([]float64, nz+1), sww: make([]float64, nz+1),
		suf: make([]float64, nz+1), suw: make([]float64, nz+1), ssgs: make([]float64, nz+1),
		tuf: make([]float64, (nz+1)*np), tw: make([]float64, (nz+1)*np),
	}
	if g.Ny > 1 {
		p.sv, p.svv = make([]float64, nz), make([]float64, nz)
	}
	return p
}

// Add takes one sample of the solver's state with weight dt (s), normally
// the step just taken. It does nothing before Start.
func (p *Profiles) Add(s *solver.Solver, dt float64) {
	p.add(s.Time(), dt, s.U(), s.W(), s.DWDX(), s.Viscosity())
	if p.sv != nil && s.Time() >= p.Start && dt > 0 {
		p.addV(dt, s.V())
	}
}

// addV adds the sums of v of a slab (before add counts the sample).
func (p *Profiles) addV(dt float64, v []float64) {
	np := levelSize(p.g)
	f := dt / float64(np)
	for k := range p.sv {
		var a, b float64
		for _, x := range v[k*np : (k+1)*np] {
			a += x
			b += x * x
		}
		p.sv[k] += f * a
		p.svv[k] += f * b
	}
}

// add takes one sample; nx below is the number of values in a level (Nx
// in the slice, Ny·Nx in a slab), the stride from one level to the next.
func (p *Profiles) add(t, dt float64, u, w, wx, nue []float64) {
	if t < p.Start || !(dt > 0) {
		return
	}
	g := p.g
	nx, nz := levelSize(g), g.Nz
	f := dt / float64(nx)
	for k := 0; k < nz; k++ {
		var a, b, c float64
		for _, v := range u[k*nx : (k+1)*nx] {
			a += v
			b += v * v
		}
		for _, v := range nue[k*nx : (k+1)*nx] {
			c += v - p.nu
		}
		p.su[k] += f * a
		p.suu[k] += f * b
		p.snut[k] += f * c
	}
	for j := 1; j < nz; j++ {
		h := g.Hf[j]
		wa, wb := (g.Zc[j]-g.Zf[j])/h, (g.Zf[j]-g.Zc[j-1])/h
		var sw, sww, suf, suw, sgs float64
		r := j * nx
		for i := r; i < r+nx; i++ {
			uf := wa*u[i-nx] + wb*u[i]
			wv := w[i]
			sw += wv
			sww += wv * wv
			suf += uf
			suw += uf * wv
			p.tuf[i] += dt * uf
			p.tw[i] += dt * wv
			nut := wa*(nue[i-nx]-p.nu) + wb*(nue[i]-p.nu)
			sgs -= nut * ((u[i]-u[i-nx])/h + wx[i])
		}
		p.sw[j] += f * sw
		p.sww[j] += f * sww
		p.suf[j] += f * suf
		p.suw[j] += f * suw
		p.ssgs[j] += f * sgs
	}
	p.weight += dt
	p.n++
}

// Samples returns the number of samples taken and their total weight (s).
func (p *Profiles) Samples() (n int, seconds float64) { return p.n, p.weight }

// Mean holds averaged profiles. Centre profiles have Nz values at Grid.Zc,
// face profiles Nz+1 values at Grid.Zf (zero at the bed and the top).
type Mean struct {
	Zc, Zf []float64 // m
	U      []float64 // m/s, mean streamwise velocity (centres)
	UU     []float64 // m²/s², ⟨u′u′⟩ (centres)
	WW     []float64 // m²/s², ⟨w′w′⟩ (faces)
	// UW is the resolved stress ⟨u′w′⟩ about the x- and time-mean (faces):
	// the turbulent part plus the dispersive part below.
	UW  []float64 // m²/s²
	SGS []float64 // m²/s², subgrid shear stress ⟨−ν_t (∂u/∂z + ∂w/∂x)⟩ (faces)
	TKE []float64 // m²/s², ½(⟨u′u′⟩ + ⟨w′w′⟩) of the resolved motion (centres; w′w′ interpolated)
	NuT []float64 // m²/s, mean eddy viscosity (centres)
	// Dispersive is the dispersive stress ⟨ū″ w̄″⟩ at the faces: the
	// x-average of the product of the deviations of the time means from
	// their x-means (zero for a horizontally uniform canopy; Raupach & Shaw
	// 1982, Boundary-Layer Meteorol. 22:79, from memory). In a slab the
	// average and the deviations are over x and y.
	Dispersive []float64
	// VV is ⟨v′v′⟩ at the centres in a slab (m²/s²), where TKE then is
	// ½(⟨u′u′⟩ + ⟨v′v′⟩ + ⟨w′w′⟩); nil in the slice.
	VV   []float64
	Time float64 // s, averaging time
}

// Mean returns the averages so far; all zero when no sample was taken.
func (p *Profiles) Mean() Mean {
	g := p.g
	nz := g.Nz
	m := Mean{Zc: g.Zc, Zf: g.Zf, Time: p.weight,
		U: make([]float64, nz), UU: make([]float64, nz), TKE: make([]float64, nz), NuT: make([]float64, nz),
		WW: make([]float64, nz+1), UW: make([]float64, nz+1), SGS: make([]float64, nz+1),
		Dispersive: make([]float64, nz+1)}
	if p.weight == 0 {
		return m
	}
	inv := 1 / p.weight
	for k := 0; k < nz; k++ {
		m.U[k] = p.su[k] * inv
		m.UU[k] = p.suu[k]*inv - m.U[k]*m.U[k]
		m.NuT[k] = p.snut[k] * inv
	}
	for j := 1; j < nz; j++ {
		wm := p.sw[j] * inv
		m.WW[j] = p.sww[j]*inv - wm*wm
		m.UW[j] = p.suw[j]*inv - p.suf[j]*inv*wm
		m.SGS[j] = p.ssgs[j] * inv
		var a, b, ab float64
		np := levelSize(g)
		nx := float64(np)
		for i := j * np; i < (j+1)*np; i++ {
			u, w := p.tuf[i]*inv, p.tw[i]*inv
			a += u
			b += w
			ab += u * w
		}
		m.Dispersive[j] = ab/nx - (a/nx)*(b/nx)
	}
	for k := 0; k < nz; k++ {
		m.TKE[k] = 0.5 * (m.UU[k] + 0.5*(m.WW[k]+m.WW[k+1]))
	}
	if p.sv != nil {
		m.VV = make([]float64, nz)
		for k := range m.VV {
			vm := p.sv[k] * inv
			m.VV[k] = p.svv[k]*inv - vm*vm
			m.TKE[k] += 0.5 * m.VV[k]
		}
	}
	return m
}
