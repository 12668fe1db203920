package runs

import (
	"fmt"
	"math"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// snapshot writes the chosen fields of the current state into fields.h5:
// in a slab their span averages under the same names, and the fields
// themselves as volumes (slabVolumes).
func (r *run) snapshot() error {
	s := r.s
	g := s.Grid()
	nx, nz, np := g.Nx, g.Nz, levelSize(g)
	names := r.sp.Output.Fields
	if len(names) == 0 {
		names = []string{"u", "w", "p", "vorticity", "nu_t"}
		for i := 0; i < s.Scalars(); i++ {
			names = append(names, s.ScalarName(i))
		}
	}
	var fs []h5.Field
	for _, name := range names {
		f := h5.Field{Name: name, Units: SnapshotFields[name], Cols: nx, Rows: nz, Location: h5.LocationCentre}
		switch name {
		case "u":
			f.Description, f.Data = "streamwise velocity", s.U()
		case "w":
			f.Description, f.Data, f.Rows, f.Location = "vertical velocity", s.W(), nz+1, h5.LocationFace
		case "p":
			p := make([]float64, nz*np)
			s.Pressure(p)
			f.Description, f.Data = "kinematic pressure p/ρ, up to a constant", p
		case "vorticity":
			f.Description, f.Data, f.Rows, f.Location = "spanwise vorticity ∂u/∂z − ∂w/∂x", Vorticity(s), nz+1, h5.LocationFace
		case "nu_t":
			nut := make([]float64, nz*np)
			for i, v := range s.Viscosity() {
				nut[i] = v - r.sp.Solver.Viscosity
			}
			f.Description, f.Data = "subgrid eddy viscosity", nut
		default:
			i := r.scalarIndex(name)
			if i < 0 {
				continue
			}
			f.Description, f.Data, f.Units = "concentration of scalar "+name, s.Scalar(i), "unit"
		}
		fs = append(fs, f)
	}
	if !s.ThreeD() {
		return r.fields.WriteSnapshot(s.Time(), s.Steps(), fs)
	}
	full := make([][]float64, len(fs))
	for n := range fs {
		full[n] = fs[n].Data
		fs[n].Data = spanAverage(full[n], fs[n].Rows, g.Ny, nx)
		fs[n].Description = "span average of the " + fs[n].Description
	}
	return r.fields.WriteSlabSnapshot(s.Time(), s.Steps(), fs, slabVolumes(s, fs, full))
}

// Vorticity returns ω = ∂u/∂z − ∂w/∂x at the faces (1/s); in a slab the
// spanwise component ω_y, at every point of each level. At a wall face
// it is the wall shear: u at the first centre over its distance for a
// no-slip or rough wall (first order), zero for a free-slip one.
func Vorticity(s *solver.Solver) []float64 {
	g := s.Grid()
	c := s.Config()
	nx, nz := levelSize(g), g.Nz // nx: values in a level
	u, wx := s.U(), s.DWDX()
	om := make([]float64, (nz+1)*nx)
	for j := 1; j < nz; j++ {
		for i := 0; i < nx; i++ {
			p := j*nx + i
			om[p] = (u[p]-u[p-nx])/g.Hf[j] - wx[p]
		}
	}
	t := s.Time()
	if c.Bed.Kind != solver.FreeSlip {
		for i := 0; i < nx; i++ {
			om[i] = (u[i] - c.Bed.SpeedAt(t)) / g.Zc[0]
		}
	}
	if c.Top.Kind == solver.NoSlip {
		for i := 0; i < nx; i++ {
			om[nz*nx+i] = (c.Top.SpeedAt(t) - u[(nz-1)*nx+i]) / (g.H - g.Zc[nz-1])
		}
	}
	return om
}

// Summary is the content of summary.json (see runfolder.Summary).
type Summary = runfolder.Summary

var num = runfolder.Num

// analyse fills the canopy shear-layer metrics from the statistics and
// the spectrum of w at the probes (nil when there is none).
func (r *run) analyse(f *runfolder.FlowSummary, mean stats.Mean, spec *stats.Spectrum) {
	if r.sp.Canopy == nil || mean.Time == 0 {
		return
	}
	h := r.sp.Canopy.Height()
	f.CanopyHeight = num(h)
	sl, err := canopy.MeasureShearLayer(mean.Zc, mean.U, h)
	if err != nil {
		return
	}
	f.UTop, f.U1, f.U2 = num(sl.UTop), num(sl.U1), num(sl.U2)
	f.MomentumThickness, f.VorticityThickness = num(sl.Theta), num(sl.VorticityThickness)
	f.ShearLength = num(sl.ShearLength)
	tau := make([]float64, len(mean.UW))
	for j := range tau {
		tau[j] = mean.UW[j] + mean.SGS[j]
	}
	f.PenetrationDepth = num(canopy.PenetrationDepth(mean.Zf, tau, h))
	g := r.s.Grid()
	j := nearestCell(g.Zf, h)
	np := levelSize(g)
	top := r.s.W()[j*np : (j+1)*np]
	if sp := stats.CorrelationSpacingRows(top, g.Nx, g.Dx); sp > 0 {
		f.RollerSpacingCorrelation = num(sp)
	}
	if g.Ny > 1 {
		l, bounded := stats.SpanCorrelationLength(top, g.Nx, g.Ny, g.Ly/float64(g.Ny))
		f.SpanCorrelationLength = num(l)
		if !bounded {
			f.SpanCorrelationNote = fmt.Sprintf("w at the canopy top stays correlated across half the span (%.3g m), so the length is a lower bound: widen domain.width", g.Ly/2)
		}
	}
	if spec != nil {
		fr, why := spec.ResolvedPeak()
		if fr > 0 {
			f.RollerFrequency = num(fr)
			f.Strouhal = num(fr * sl.Theta / sl.UBar)
			f.RollerSpacing = num(sl.UBar / fr)
		}
		f.RollerFrequencyNote = why
	}
	u, w, _ := r.probes.Even(r.sp.SpinUp)
	var uu, ww []float64
	for n := range u {
		uu = append(uu, u[n]...)
		ww = append(ww, w[n]...)
	}
	if len(uu) > 0 {
		q := stats.QuadrantShares(uu, ww)
		f.SweepEjectionRatio = num(q.SweepEjectionRatio())
	}
}

// spectrum returns the Welch spectrum of w at the probes after the
// spin-up and how it was taken, or nil and nil when the probes hold fewer
// than stats.MinSpectrumSamples samples after it.
func (r *run) spectrum() (*stats.Spectrum, *runfolder.SpectrumSummary) {
	_, w, dt := r.probes.Even(r.sp.SpinUp)
	if len(w) == 0 || len(w[0]) < stats.MinSpectrumSamples || !(dt > 0) {
		return nil, nil
	}
	seg := stats.WelchSegment(len(w[0]))
	sp, err := stats.WelchSpectrum(w, dt, seg)
	if err != nil {
		return nil, nil
	}
	info := &runfolder.SpectrumSummary{Probes: len(w), Samples: len(w[0]), Segment: seg, Interval: dt,
		ProbeHeight: r.probes.Points[0].Z}
	if fr := sp.Peak(); fr > 0 {
		info.Peak = num(fr)
	}
	return &sp, info
}

// canopySummary describes the canopy of the run, with C_D a and the
// predicted penetration depth where they apply: a uniform block (one
// profile point) with a fixed drag coefficient.
func (r *run) canopySummary() *runfolder.CanopySummary {
	cp := r.sp.Canopy
	if cp == nil {
		return nil
	}
	cs := &runfolder.CanopySummary{Height: cp.Height()}
	switch {
	case len(cp.Profile.A) != 1:
		cs.DragDensityNote = "the canopy is a profile, not a uniform block, so C_D a varies with height"
	case cp.Linear > 0:
		cs.DragDensityNote = fmt.Sprintf("canopy.drag_law = %q has no fixed C_D", casefile.DragLinear)
	case cp.Law != nil:
		cs.DragDensityNote = fmt.Sprintf("canopy.drag_law = %q has no fixed C_D", casefile.DragCylinder)
	default:
		cda := cp.CD * cp.Profile.A[0]
		cs.DragDensity = num(cda)
		cs.PredictedPenetrationDepth = num(canopy.PredictedPenetrationDepth(cda))
	}
	return cs
}

func (r *run) writeOutputs(res *Result, runErr error) (*Summary, error) {
	dir := r.opt.Dir
	s := r.s
	g := s.Grid()
	mean := make([]float64, g.Nz)
	s.MeanU(mean)
	if err := (runfolder.ProfileTable{Z: g.Zc, U: mean}).Write(dir); err != nil {
		return nil, err
	}
	if err := r.ts.table().Write(dir); err != nil {
		return nil, err
	}
	m := r.prof.Mean()
	if m.Time > 0 {
		// Face quantities interpolated to the centres for one table.
		at := func(f []float64) []float64 {
			out := make([]float64, g.Nz)
			for k := range out {
				out[k] = 0.5 * (f[k] + f[k+1])
			}
			return out
		}
		if err := (runfolder.ProfilesTable{Z: g.Zc, U: m.U, UU: m.UU, WW: at(m.WW), UW: at(m.UW),
			Subgrid: at(m.SGS), TKE: m.TKE, NuT: m.NuT, Dispersive: at(m.Dispersive), VV: m.VV}).Write(dir); err != nil {
			return nil, err
		}
	}
	if len(r.probes.T) > 0 {
		t := runfolder.ProbesTable{T: r.probes.T}
		for n, p := range r.probes.Points {
			ps := runfolder.ProbeSeries{X: p.X, Z: p.Z, U: r.probes.U[n], W: r.probes.W[n]}
			if s.ThreeD() {
				ps.Y = num(p.Y)
			}
			t.Probes = append(t.Probes, ps)
		}
		if err := t.Write(dir); err != nil {
			return nil, err
		}
	}
	spec, specInfo := r.spectrum()
	if spec != nil {
		if err := (runfolder.SpectrumTable{Freq: spec.Freq, PSD: spec.PSD}).Write(dir); err != nil {
			return nil, err
		}
	}
	sum := &Summary{
		Run: runfolder.RunSummary{Title: r.sp.Title, Steps: res.Steps, SimTime: res.SimTime, WallTime: res.WallTime.Seconds(),
			Nx: g.Nx, Nz: g.Nz, Version: Version, Interrupted: res.Interrupted, StatsTime: m.Time,
			SpinUp: r.sp.SpinUp, Depth: r.sp.Solver.H},
		Flow:     runfolder.FlowSummary{BulkVelocity: res.Bulk, Gradient: res.Gradient, MaxDivergence: res.MaxDivergence},
		Canopy:   r.canopySummary(),
		Spectrum: specInfo,
	}
	if g.Ny > 1 {
		sum.Run.Ny, sum.Run.Width = g.Ny, g.Ly
	}
	prov := Provenance()
	sum.Provenance = &prov
	if runErr != nil {
		sum.Run.Error = runErr.Error()
	}
	r.analyse(&sum.Flow, m, spec)
	// Under waves or tides the free quantity oscillates by design; the
	// drift of thirds of the statistics would only measure the phase.
	if w := spinUpWarning(&r.ts, r.sp.SpinUp, r.sp.Solver.Forcing.Kind); w != "" && r.sp.Solver.Forcing.Period() == 0 {
		res.Warnings = append(res.Warnings, w)
	}
	if w := boxWarning(&sum.Flow, r.sp.Solver.Lx); w != "" {
		res.Warnings = append(res.Warnings, w)
	}
	sum.Run.Warnings = res.Warnings
	if err := r.scalarOutputs(sum); err != nil {
		return nil, err
	}
	if err := r.waveOutputs(sum); err != nil {
		return nil, err
	}
	return sum, sum.Write(dir)
}

func (r *run) scalarIndex(name string) int {
	for i := 0; i < r.s.Scalars(); i++ {
		if r.s.ScalarName(i) == name {
			return i
		}
	}
	return -1
}

// scalarOutputs fills the scalar summaries and writes scalars.csv (mean
// profiles and fluxes) and uptake.csv (element uptake by height).
func (r *run) scalarOutputs(sum *Summary) error {
	s := r.s
	if s.Scalars() == 0 {
		return nil
	}
	g := s.Grid()
	nz := g.Nz
	sum.Scalars = map[string]runfolder.ScalarSummary{}
	h := 0.0
	if r.sp.Canopy != nil {
		h = r.sp.Canopy.Height()
	}
	var asMean []float64
	if r.sp.Canopy != nil {
		as := r.sp.Canopy.SurfaceArea(canopyMesh(g))
		np := levelSize(g)
		asMean = make([]float64, nz)
		for k := range asMean {
			for i := 0; i < np; i++ {
				asMean[k] += as[k*np+i]
			}
			asMean[k] /= float64(np)
		}
	}
	prof := runfolder.ScalarsTable{Z: g.Zc}
	up := runfolder.UptakeTable{Z: g.Zc}
	for i := 0; i < s.Scalars(); i++ {
		name := s.ScalarName(i)
		ss := runfolder.ScalarSummary{Imbalance: s.Budget(i).Imbalance()}
		span := r.uptakeRates(i, &ss)
		m := r.sprof[i].Mean()
		if m.Time > 0 && h > 0 {
			var in, above, win, wab float64
			for k, z := range g.Zc {
				if z < h {
					in += m.C[k] * g.Dz[k]
					win += g.Dz[k]
				} else {
					above += m.C[k] * g.Dz[k]
					wab += g.Dz[k]
				}
			}
			if win > 0 && wab > 0 {
				in, above = in/win, above/wab
				ss.MeanInCanopy, ss.MeanAbove = num(in), num(above)
				if d := above - in; d != 0 && ss.TotalUptake != 0 {
					kex := ss.TotalUptake / d
					ss.ExchangeVelocity = num(kex)
					ss.FlushingTime = num(h / kex)
				}
			}
		}
		ss.BoundaryLayerShare = r.boundaryLayerShare(i)
		sum.Scalars[name] = ss
		at := func(f []float64) []float64 {
			out := make([]float64, nz)
			for k := range out {
				a, b := f[k], f[k+1]
				switch {
				case k == 0:
					out[k] = b
				case k == nz-1:
					out[k] = a
				default:
					out[k] = 0.5 * (a + b)
				}
			}
			return out
		}
		prof.Scalars = append(prof.Scalars, runfolder.ScalarProfile{Name: name, Mean: m.C,
			Resolved: at(m.Resolved), Diffusive: at(m.Diffusive), EddyDiffusivity: at(m.EddyDiffusivity)})
		level := s.UptakeByLevel(i)
		dens := make([]float64, nz)
		perArea := make([]float64, nz)
		for k := range dens {
			if span > 0 {
				dens[k] = (level[k] - r.spinLevel[i][k]) / span / g.Dz[k]
			}
			if asMean != nil && asMean[k] > 0 {
				perArea[k] = dens[k] / asMean[k]
			}
		}
		up.Scalars = append(up.Scalars, runfolder.ScalarUptake{Name: name, Element: dens, PerArea: perArea})
	}
	if err := prof.Write(r.opt.Dir); err != nil {
		return err
	}
	return up.Write(r.opt.Dir)
}

// boundaryLayerShare returns the uptake-weighted boundary-layer share of
// the element transfer resistance of scalar i in the final state, or nil
// without element uptake.
func (r *run) boundaryLayerShare(i int) *float64 {
	s := r.s
	rate := s.UptakeRate(i)
	if rate == nil || i >= len(r.sp.Transfer) {
		return nil
	}
	g := s.Grid()
	nx := levelSize(g) // values in a level
	u, w, c, v := s.U(), s.W(), s.Scalar(i), s.V()
	cw := r.sp.Solver.Scalars[i].SurfaceValue
	ks := r.sp.Solver.Scalars[i].Capacity
	var wsum, ssum float64
	for k := 0; k < g.Nz; k++ {
		for j := k * nx; j < (k+1)*nx; j++ {
			if rate[j] == 0 {
				continue
			}
			wc := 0.5 * (w[j] + w[j+nx])
			speed := math.Sqrt(u[j]*u[j] + wc*wc)
			if v != nil {
				speed = math.Sqrt(u[j]*u[j] + v[j]*v[j] + wc*wc)
			}
			up := rate[j] * math.Abs(c[j]-cw)
			wsum += up
			ssum += up * canopy.BoundaryLayerShare(r.sp.Transfer[i].Velocity(speed), ks)
		}
	}
	if wsum == 0 {
		return nil
	}
	return num(ssum / wsum)
}
