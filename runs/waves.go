package runs

import (
	"fmt"
	"math"
	"slices"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
	"rollerbed/io/runfolder"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// oscillationsFromCase adds the waves, tides and ramp of a case's forcing
// to the solver's forcing (phases in degrees become radians).
func oscillationsFromCase(f *solver.Forcing, cf casefile.Forcing) {
	conv := func(os []casefile.Oscillation) []solver.Oscillation {
		var out []solver.Oscillation
		for _, o := range os {
			out = append(out, solver.Oscillation{Amplitude: o.Amplitude, Period: o.Period, Phase: o.Phase * math.Pi / 180})
		}
		return out
	}
	f.Waves, f.Tides, f.Ramp = conv(cf.Waves), conv(cf.Tides), cf.Ramp
	f.OneWay = len(cf.Tides) > 0 && !cf.TideReverses
}

// oscillationScale is the speed in m/s that the oscillating parts of a
// forcing add to the steady flow: for each wave the free-stream velocity
// amplitude A/ω = A·T/(2π) that its pressure gradient drives without
// friction, for each tide 1.2 times its amplitude, like a held bulk
// velocity (derived; the 1.2 allows for the profile's peak above its mean,
// common practice, no source).
func oscillationScale(f solver.Forcing) float64 {
	v := 0.0
	for _, o := range f.Waves {
		v += math.Abs(o.Amplitude) * o.Period / (2 * math.Pi)
	}
	for _, o := range f.Tides {
		v += 1.2 * math.Abs(o.Amplitude)
	}
	return v
}

// minCycles is the fewest forcing cycles the statistics should hold for
// averages by phase (common practice, no source).
const minCycles = 3

// waveWarnings says when the statistics hold fewer than minCycles cycles
// of a periodic forcing, and when waves move flexible blades in a way the
// quasi-static law does not describe: an orbital excursion shorter than
// the blades.
func waveWarnings(sp *Spec) []string {
	f := sp.Solver.Forcing
	period := f.Period()
	if period == 0 {
		return nil
	}
	var ws []string
	if cycles := (sp.Duration - sp.SpinUp) / period; cycles < minCycles {
		ws = append(ws, fmt.Sprintf("the statistics after time.spin_up cover %.3g cycles of the %.4g s forcing period; averages by phase need at least %d: raise time.duration to %.4g s or more",
			cycles, period, minCycles, sp.SpinUp+minCycles*period))
	}
	excursion := 0.0
	for _, o := range f.Waves {
		w := 2 * math.Pi / o.Period
		excursion += math.Abs(o.Amplitude) / (w * w)
	}
	if cp := sp.Canopy; cp != nil && cp.Flexible != nil && excursion > 0 && excursion < cp.Height() {
		ws = append(ws, fmt.Sprintf("the wave excursion A/ω² ≈ %.3g m is shorter than the blades (%.3g m): real blades then move with the water and feel less drag than the quasi-static bending law gives (Luhar & Nepf 2016, J. Fluids Struct., from memory); read the canopy drag as an upper bound",
			excursion, cp.Height()))
	}
	return ws
}

// setupBending prepares the bending of flexible blades on the solver's
// drag array and bends them to the present flow; nothing for rigid
// elements. It runs after the state is set (fresh or restored), so that a
// resumed run bends as the uninterrupted one did.
func (r *run) setupBending() error {
	cp := r.sp.Canopy
	if cp == nil || cp.Flexible == nil {
		return nil
	}
	drag := r.s.Config().Drag
	bd, err := canopy.NewBending(cp, *cp.Flexible, canopyMesh(r.s.Grid()), r.sp.FluidDensity, drag.HalfArea)
	if err != nil {
		return fmt.Errorf("[canopy] flexible blades: %w", err)
	}
	bd.Update(r.s.U(), r.s.V())
	r.bend = bd
	r.ts.bend = bd
	return nil
}

// setupPhases prepares the statistics by phase when the case asks for
// them.
func (r *run) setupPhases() {
	f := r.sp.Solver.Forcing
	if r.sp.Output.PhaseBins < 2 || f.Period() == 0 {
		return
	}
	idx := make([]int, len(r.sp.Solver.Scalars))
	for i := range idx {
		idx[i] = i
	}
	r.phases = stats.NewPhases(r.s.Grid(), r.sp.Output.PhaseBins, f.Period(), r.sp.SpinUp, idx)
	r.bentSum = make([]float64, r.sp.Output.PhaseBins)
}

// afterStep bends the blades to the new flow and adds the step to the
// statistics by phase. It allocates nothing.
func (r *run) afterStep(dt float64) {
	s := r.s
	if r.bend != nil {
		r.bend.Update(s.U(), s.V())
	}
	if r.phases != nil {
		r.phases.Add(s, dt)
		if r.bend != nil && s.Time() >= r.phases.Start {
			r.bentSum[r.phases.Bin(s.Time()-dt/2)] += dt * r.bend.MeanHeight()
		}
	}
}

// exportWaves adds the statistics by phase to a checkpoint's arrays.
func (r *run) exportWaves(arrays map[string][]float64) {
	if r.phases == nil {
		return
	}
	for k, v := range r.phases.Export() {
		arrays[k] = v
	}
	arrays["phase_bent_height"] = append([]float64(nil), r.bentSum...)
}

// importWaves restores the statistics by phase from a checkpoint.
func (r *run) importWaves(arrays map[string][]float64) error {
	if r.phases == nil {
		return nil
	}
	if err := r.phases.Import(arrays); err != nil {
		return err
	}
	b := arrays["phase_bent_height"]
	if len(b) != len(r.bentSum) {
		return fmt.Errorf("the checkpoint lacks the bent height by phase")
	}
	copy(r.bentSum, b)
	return nil
}

// waveOutputs writes phase_profiles.csv and phase_cycle.csv and fills the
// phase and flexible-blade summaries.
func (r *run) waveOutputs(sum *Summary) error {
	if r.bend != nil && sum.Canopy != nil {
		fs := &runfolder.FlexibleSummary{Length: r.bend.Length(), Buoyancy: r.bend.Buoyancy(),
			FinalHeight: r.bend.MeanHeight(), FinalLengthRatio: r.bend.MeanLengthRatio()}
		hs := r.ts.bent
		fs.MinHeight, fs.MaxHeight = math.Inf(1), math.Inf(-1)
		for _, h := range hs {
			fs.MinHeight, fs.MaxHeight = math.Min(fs.MinHeight, h), math.Max(fs.MaxHeight, h)
			fs.MeanHeight += h / float64(len(hs))
		}
		sum.Canopy.Flexible = fs
	}
	if r.phases == nil {
		return nil
	}
	g := r.s.Grid()
	means := r.phases.Means()
	names := make([]string, r.s.Scalars())
	for i := range names {
		names[i] = r.s.ScalarName(i)
	}
	prof := runfolder.PhaseProfilesTable{Z: g.Zc, Scalars: names}
	cyc := runfolder.PhaseCycleTable{}
	for _, name := range names {
		cyc.Scalars = append(cyc.Scalars, runfolder.PhaseUptake{Name: name, Element: make([]float64, len(means)), Bed: make([]float64, len(means))})
	}
	h := 0.0
	if r.sp.Canopy != nil {
		h = r.sp.Canopy.Height()
		cyc.UIn, cyc.UAbove, cyc.Ratio = make([]float64, len(means)), make([]float64, len(means)), make([]float64, len(means))
	}
	if r.bend != nil {
		cyc.BentHeight = make([]float64, len(means))
	}
	weights := make([]float64, len(means))
	var stat float64
	for b, m := range means {
		pp := runfolder.PhaseProfile{U: m.U, UW: centred(m.UW)}
		for n := range names {
			pp.Flux = append(pp.Flux, centred(m.Flux[n]))
			cyc.Scalars[n].Element[b], cyc.Scalars[n].Bed[b] = m.ElementUptake[n], m.BedUptake[n]
		}
		prof.Bins = append(prof.Bins, pp)
		cyc.Phase, cyc.Time = append(cyc.Phase, m.Phase), append(cyc.Time, m.Time)
		weights[b] = m.Time
		stat += m.Time
		if m.Time == 0 {
			// A bin the statistics have not reached yet.
			emptyBin(&prof.Bins[b], &cyc, b)
			continue
		}
		if h > 0 {
			in, above := stats.LayerMean(g, m.U, 0, h), stats.LayerMean(g, m.U, h, g.H)
			cyc.UIn[b], cyc.UAbove[b] = in, above
			cyc.Ratio[b] = in / above
			if above == 0 {
				cyc.Ratio[b] = math.NaN()
			}
		}
		if cyc.BentHeight != nil {
			cyc.BentHeight[b] = r.bentSum[b] / m.Time
		}
	}
	period := r.sp.Solver.Forcing.Period()
	ps := &runfolder.PhaseSummary{Bins: len(means), Period: period, Cycles: stat / period}
	if h > 0 && !slices.Contains(weights, 0) {
		// Every bin holds samples: the cycle is covered.
		aIn, phIn := stats.Harmonic(cyc.UIn, weights)
		aAb, phAb := stats.Harmonic(cyc.UAbove, weights)
		if aAb > 0 {
			ps.OscillatingRatio = num(aIn / aAb)
			ps.OscillatingLead = num(math.Remainder(phIn-phAb, 2*math.Pi))
		}
		var mIn, mAb float64
		for b := range means {
			mIn += cyc.UIn[b] * weights[b] / stat
			mAb += cyc.UAbove[b] * weights[b] / stat
		}
		if mAb != 0 {
			ps.MeanRatio = num(mIn / mAb)
		}
	}
	sum.Phases = ps
	if err := prof.Write(r.opt.Dir); err != nil {
		return err
	}
	return cyc.Write(r.opt.Dir)
}

// emptyBin fills bin b of the tables with NaN: no statistics yet.
func emptyBin(p *runfolder.PhaseProfile, c *runfolder.PhaseCycleTable, b int) {
	nan := math.NaN()
	fill := func(f []float64) {
		for i := range f {
			f[i] = nan
		}
	}
	fill(p.U)
	fill(p.UW)
	for _, f := range p.Flux {
		fill(f)
	}
	for _, col := range [][]float64{c.UIn, c.UAbove, c.Ratio, c.BentHeight} {
		if col != nil {
			col[b] = nan
		}
	}
	for _, s := range c.Scalars {
		s.Element[b], s.Bed[b] = nan, nan
	}
}

// centred returns a face profile (Nz+1 values) at the Nz centres, the mean
// of the two faces of each cell.
func centred(f []float64) []float64 {
	out := make([]float64, len(f)-1)
	for k := range out {
		out[k] = 0.5 * (f[k] + f[k+1])
	}
	return out
}
