package runs

import (
	"math"
	"path/filepath"
	"sort"

	"rollerbed/canopy"
	"rollerbed/io/h5"
	"rollerbed/io/report"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// snapshot writes the chosen fields of the current state into fields.h5.
func (r *run) snapshot() error {
	s := r.s
	g := s.Grid()
	nx, nz := g.Nx, g.Nz
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
			p := make([]float64, nz*nx)
			s.Pressure(p)
			f.Description, f.Data = "kinematic pressure p/ρ, up to a constant", p
		case "vorticity":
			f.Description, f.Data, f.Rows, f.Location = "spanwise vorticity ∂u/∂z − ∂w/∂x", Vorticity(s), nz+1, h5.LocationFace
		case "nu_t":
			nut := make([]float64, nz*nx)
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
	return r.fields.WriteSnapshot(s.Time(), s.Steps(), fs)
}

// Vorticity returns ω = ∂u/∂z − ∂w/∂x at the faces (1/s). At a wall face
// it is the wall shear: u at the first centre over its distance for a
// no-slip or rough wall (first order), zero for a free-slip one.
func Vorticity(s *solver.Solver) []float64 {
	g := s.Grid()
	c := s.Config()
	nx, nz := g.Nx, g.Nz
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

// Summary is the content of summary.json. Keys carry their unit; metrics
// that do not apply to a run (no canopy, no statistics yet) are null.
type Summary struct {
	Run     RunSummary               `json:"run"`
	Flow    FlowSummary              `json:"flow"`
	Scalars map[string]ScalarSummary `json:"scalars,omitempty"`
}

// ScalarSummary holds a scalar's uptake over the statistics period (after
// the spin-up), per unit bed area, in unit·m/s (unit: the scalar's
// concentration unit, e.g. mol/m³ gives mol/(m² s)).
type ScalarSummary struct {
	ElementUptake float64 `json:"element_uptake_per_bed_area"`
	BedUptake     float64 `json:"bed_uptake_per_bed_area"`
	TotalUptake   float64 `json:"total_uptake_per_bed_area"`
	TopSupply     float64 `json:"top_supply_per_bed_area"`
	// MeanInCanopy and MeanAbove are the time- and space-mean
	// concentrations below and above the canopy top (unit).
	MeanInCanopy *float64 `json:"mean_in_canopy"`
	MeanAbove    *float64 `json:"mean_above_canopy"`
	// ExchangeVelocity is the uptake inside the canopy over the
	// concentration difference between the water above and inside it
	// (m/s): the flux across the canopy top in a statistically steady run.
	ExchangeVelocity *float64 `json:"exchange_velocity_m_s"`
	// FlushingTime is h/k_ex, the time to exchange the canopy water at the
	// exchange velocity (s).
	FlushingTime *float64 `json:"flushing_time_s"`
	// BoundaryLayerShare is the uptake-weighted share of the element
	// transfer resistance in the boundary layer around the elements,
	// (1/k_bl)/(1/k_bl + 1/k_s), from the final state.
	BoundaryLayerShare *float64 `json:"boundary_layer_share"`
	// Imbalance is the budget residual over its largest term, from the
	// start of the run.
	Imbalance float64 `json:"budget_relative_imbalance"`
}

// RunSummary describes the run itself.
type RunSummary struct {
	Title       string  `json:"title,omitempty"`
	Steps       int     `json:"steps"`
	SimTime     float64 `json:"sim_time_s"`
	WallTime    float64 `json:"wall_time_s"`
	Nx          int     `json:"nx"`
	Nz          int     `json:"nz"`
	Version     string  `json:"version"`
	Interrupted bool    `json:"interrupted"`
	StatsTime   float64 `json:"statistics_time_s"`
	Error       string  `json:"error,omitempty"`
}

// FlowSummary holds the flow numbers.
type FlowSummary struct {
	BulkVelocity       float64  `json:"bulk_velocity_m_s"`
	Gradient           float64  `json:"pressure_gradient_m_s2"`
	MaxDivergence      float64  `json:"max_divergence"`
	CanopyHeight       *float64 `json:"canopy_height_m"`
	UTop               *float64 `json:"u_top_m_s"`
	U1                 *float64 `json:"u1_m_s"`
	U2                 *float64 `json:"u2_m_s"`
	MomentumThickness  *float64 `json:"momentum_thickness_m"`
	VorticityThickness *float64 `json:"vorticity_thickness_m"`
	ShearLength        *float64 `json:"shear_length_m"`
	PenetrationDepth   *float64 `json:"penetration_depth_m"`
	RollerFrequency    *float64 `json:"roller_frequency_hz"`
	Strouhal           *float64 `json:"strouhal"`
	RollerSpacing      *float64 `json:"roller_spacing_m"`
	// RollerSpacingCorrelation is the spacing from the two-point
	// correlation of w along the canopy top in the final state.
	RollerSpacingCorrelation *float64 `json:"roller_spacing_correlation_m"`
	SweepEjectionRatio       *float64 `json:"sweep_ejection_ratio"`
}

func num(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// analyse fills the canopy shear-layer metrics from the statistics.
func (r *run) analyse(f *FlowSummary, mean stats.Mean) {
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
	if sp := canopy.CorrelationSpacing(r.s.W()[j*g.Nx:(j+1)*g.Nx], g.Dx); sp > 0 {
		f.RollerSpacingCorrelation = num(sp)
	}
	u, w, dt := r.probeSeries()
	if len(w) > 0 && len(w[0]) >= 64 {
		seg := 1
		for seg*2 <= len(w[0])/4 {
			seg *= 2
		}
		seg = max(seg, 64)
		if sp, err := canopy.WelchSpectrum(w, dt, seg); err == nil {
			if fr := sp.Peak(); fr > 0 {
				f.RollerFrequency = num(fr)
				f.Strouhal = num(fr * sl.Theta / sl.UBar)
				f.RollerSpacing = num(sl.UBar / fr)
			}
		}
	}
	var uu, ww []float64
	for n := range u {
		uu = append(uu, u[n]...)
		ww = append(ww, w[n]...)
	}
	if len(uu) > 0 {
		q := canopy.QuadrantShares(uu, ww)
		f.SweepEjectionRatio = num(q.SweepEjectionRatio())
	}
}

// probeSeries returns the probe series after the spin-up, resampled onto
// even times (linear interpolation) at the mean step, for spectra.
func (r *run) probeSeries() (u, w [][]float64, dt float64) {
	T := r.probes.T
	k0 := sort.SearchFloat64s(T, r.sp.SpinUp)
	if len(T)-k0 < 8 {
		return nil, nil, 0
	}
	t0, t1 := T[k0], T[len(T)-1]
	n := len(T) - k0
	dt = (t1 - t0) / float64(n-1)
	resample := func(v []float64) []float64 {
		out := make([]float64, n)
		j := k0
		for i := range out {
			t := t0 + float64(i)*dt
			for j < len(T)-2 && T[j+1] < t {
				j++
			}
			a := (t - T[j]) / (T[j+1] - T[j])
			out[i] = v[j] + a*(v[j+1]-v[j])
		}
		return out
	}
	for p := range r.probes.Points {
		u = append(u, resample(r.probes.U[p]))
		w = append(w, resample(r.probes.W[p]))
	}
	return u, w, dt
}

func (r *run) writeOutputs(res *Result, runErr error) (*Summary, error) {
	dir := r.opt.Dir
	s := r.s
	g := s.Grid()
	mean := make([]float64, g.Nz)
	s.MeanU(mean)
	if err := (report.Table{
		Header:  []string{"z [m]", "U [m/s]"},
		Columns: [][]float64{g.Zc, mean},
	}).WriteCSV(filepath.Join(dir, "profile.csv")); err != nil {
		return nil, err
	}
	if err := r.ts.table().WriteCSV(filepath.Join(dir, "timeseries.csv")); err != nil {
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
		if err := (report.Table{
			Header:  []string{"z [m]", "U [m/s]", "u'u' [m2/s2]", "w'w' [m2/s2]", "u'w' [m2/s2]", "subgrid stress [m2/s2]", "TKE [m2/s2]", "nu_t [m2/s]", "dispersive stress [m2/s2]"},
			Columns: [][]float64{g.Zc, m.U, m.UU, at(m.WW), at(m.UW), at(m.SGS), m.TKE, m.NuT, at(m.Dispersive)},
		}).WriteCSV(filepath.Join(dir, "profiles.csv")); err != nil {
			return nil, err
		}
	}
	if len(r.probes.T) > 0 {
		header := []string{"t [s]"}
		cols := [][]float64{r.probes.T}
		for n, p := range r.probes.Points {
			header = append(header, fmtProbe("u", n, p), fmtProbe("w", n, p))
			cols = append(cols, r.probes.U[n], r.probes.W[n])
		}
		if err := (report.Table{Header: header, Columns: cols}).WriteCSV(filepath.Join(dir, "probes.csv")); err != nil {
			return nil, err
		}
	}
	sum := &Summary{
		Run: RunSummary{Title: r.sp.Title, Steps: res.Steps, SimTime: res.SimTime, WallTime: res.WallTime.Seconds(),
			Nx: g.Nx, Nz: g.Nz, Version: Version, Interrupted: res.Interrupted, StatsTime: m.Time},
		Flow: FlowSummary{BulkVelocity: res.Bulk, Gradient: res.Gradient, MaxDivergence: res.MaxDivergence},
	}
	if runErr != nil {
		sum.Run.Error = runErr.Error()
	}
	r.analyse(&sum.Flow, m)
	if err := r.scalarOutputs(sum); err != nil {
		return nil, err
	}
	return sum, report.WriteJSON(filepath.Join(dir, "summary.json"), sum)
}

func fmtProbe(v string, n int, p stats.Probe) string {
	return v + "_" + itoa(n) + " (x=" + ftoa(p.X) + " m, z=" + ftoa(p.Z) + " m) [m/s]"
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
	sum.Scalars = map[string]ScalarSummary{}
	h := 0.0
	if r.sp.Canopy != nil {
		h = r.sp.Canopy.Height()
	}
	var asMean []float64
	if r.sp.Canopy != nil {
		as := r.sp.Canopy.SurfaceArea(canopyMesh(g))
		asMean = make([]float64, nz)
		for k := range asMean {
			for i := 0; i < g.Nx; i++ {
				asMean[k] += as[k*g.Nx+i]
			}
			asMean[k] /= float64(g.Nx)
		}
	}
	profHeader := []string{"z [m]"}
	profCols := [][]float64{g.Zc}
	upHeader := []string{"z [m]"}
	upCols := [][]float64{g.Zc}
	for i := 0; i < s.Scalars(); i++ {
		name := s.ScalarName(i)
		b := s.Budget(i)
		b0 := r.spin[i]
		if !r.spinDone {
			b0 = solver.ScalarBudget{Storage0: b.Storage0}
		}
		span := b.Time - b0.Time
		ss := ScalarSummary{Imbalance: b.Imbalance()}
		if span > 0 {
			ss.ElementUptake = (b.ElementUptake - b0.ElementUptake) / span
			ss.BedUptake = -(b.BedIn - b0.BedIn) / span
			ss.TotalUptake = ss.ElementUptake + ss.BedUptake
			ss.TopSupply = (b.TopIn - b0.TopIn) / span
		}
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
		profHeader = append(profHeader, name+" mean [unit]", name+" resolved flux w'c' [unit m/s]", name+" diffusive flux [unit m/s]", name+" eddy diffusivity [m2/s]")
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
		profCols = append(profCols, m.C, at(m.Resolved), at(m.Diffusive), at(m.EddyDiffusivity))
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
		upHeader = append(upHeader, name+" element uptake [unit/(m3 s)]", name+" uptake per surface area [unit m/s]")
		upCols = append(upCols, dens, perArea)
	}
	if err := (report.Table{Header: profHeader, Columns: profCols}).WriteCSV(filepath.Join(r.opt.Dir, "scalars.csv")); err != nil {
		return err
	}
	return report.Table{Header: upHeader, Columns: upCols}.WriteCSV(filepath.Join(r.opt.Dir, "uptake.csv"))
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
	nx := g.Nx
	u, w, c := s.U(), s.W(), s.Scalar(i)
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
