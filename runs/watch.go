package runs

import (
	"slices"
	"time"

	"rollerbed/io/runfolder"
	"rollerbed/solver"
)

// Frame is a picture of a run in progress, handed to Options.Watch: the
// state of the flow now and the metrics as they stand on the statistics
// gathered so far. The receiver owns the frame and may keep it: the run
// never writes to it again. The grid, the canopy and Title are shared by
// every frame of a run and must only be read.
type Frame struct {
	Progress
	Title string
	// Lx and H are the length and depth of the slice (m); X holds the Nx
	// sample positions, Zc the Nz cell-centre and Zf the Nz+1 face heights
	// (m).
	Lx, H     float64
	X, Zc, Zf []float64
	// Frontal is the canopy frontal area a (1/m) at the cell centres, Nz
	// rows of Nx, nil without a canopy; CanopyHeight is h (m), 0 without.
	Frontal      []float64
	CanopyHeight float64
	// Vorticity is ∂u/∂z − ∂w/∂x (1/s) at the faces, Nz+1 rows of Nx. In
	// a slab, Frontal, Vorticity and Scalar are span averages.
	Vorticity []float64
	// ScalarName names the scalar of Scalar ("" without scalars); Scalar is
	// its concentration (the scalar's unit) at the cell centres, Nz rows of
	// Nx.
	ScalarName string
	Scalar     []float64
	// MeanU is the x-mean streamwise velocity now (m/s) at Zc.
	MeanU []float64
	// Flow holds the flow metrics of the summary from the statistics
	// gathered so far (nulls where they do not apply yet), and Scalars the
	// uptake rates of each scalar so far; both as summary.json will hold
	// them at the end of the run.
	Flow    runfolder.FlowSummary
	Scalars map[string]runfolder.ScalarSummary
	// Warnings are the run's warnings so far.
	Warnings []string
	// Done is true for the last frame, sent when the run has stopped and
	// written its summary; Interrupted and Error then say how it stopped.
	Done        bool
	Interrupted bool
	Error       string
}

// watcher sends frames of a run to Options.Watch at its cadence.
type watcher struct {
	last  time.Time     // wall time of the last frame; zero: none yet
	rest  time.Duration // wall time to wait after the last frame at least
	spent time.Duration // wall time spent on frames
	base  Frame         // the parts shared by every frame
	ready bool
}

// frameRest is how many times as long as making the last frame took the
// run waits before the next, at least: frames take at most about
// 1/(1+frameRest) of the run's time, whatever Options.WatchEvery asks.
const frameRest = 50

// watchDue tells whether a frame is due now.
func (r *run) watchDue() bool {
	return r.opt.Watch != nil && time.Since(r.watch.last) >= max(r.opt.WatchEvery, r.watch.rest)
}

// sendFrame hands the current state to Options.Watch.
func (r *run) sendFrame(res *Result) {
	start := time.Now()
	defer func() {
		r.watch.last = time.Now()
		cost := r.watch.last.Sub(start)
		r.watch.rest, r.watch.spent = frameRest*cost, r.watch.spent+cost
	}()
	f := r.frame()
	f.Warnings = slices.Clone(res.Warnings)
	mean := r.prof.Mean()
	spec, _ := r.spectrum()
	r.analyse(&f.Flow, mean, spec)
	f.Scalars = r.uptakeSoFar()
	r.opt.Watch(f)
}

// sendLastFrame hands the final state with the summary's metrics to
// Options.Watch.
func (r *run) sendLastFrame(res *Result, sum *Summary, runErr error) {
	if r.opt.Watch == nil || r.s == nil {
		return
	}
	f := r.frame()
	f.Done, f.Interrupted = true, res.Interrupted
	f.Warnings = slices.Clone(res.Warnings)
	if runErr != nil {
		f.Error = runErr.Error()
	}
	if sum != nil {
		f.Flow, f.Scalars = sum.Flow, sum.Scalars
	}
	r.opt.Watch(f)
}

// frame copies the state of the flow into a new frame.
func (r *run) frame() *Frame {
	s := r.s
	if !r.watch.ready {
		g := s.Grid()
		b := &r.watch.base
		b.Title, b.Lx, b.H, b.X, b.Zc, b.Zf = r.sp.Title, g.Lx, g.H, g.X, g.Zc, g.Zf
		if r.sp.Canopy != nil {
			b.Frontal = spanAverage(r.sp.Canopy.OnGrid(canopyMesh(g)), g.Nz, g.Ny, g.Nx)
			b.CanopyHeight = r.sp.Canopy.Height()
		}
		if i := r.watchScalar(); i >= 0 {
			b.ScalarName = s.ScalarName(i)
		}
		r.watch.ready = true
	}
	f := r.watch.base
	f.Progress = r.progress()
	g := s.Grid()
	f.Vorticity = spanAverage(Vorticity(s), g.Nz+1, g.Ny, g.Nx)
	if i := r.scalarIndex(f.ScalarName); f.ScalarName != "" && i >= 0 {
		f.Scalar = slices.Clone(spanAverage(s.Scalar(i), g.Nz, g.Ny, g.Nx))
	}
	f.MeanU = make([]float64, s.Grid().Nz)
	s.MeanU(f.MeanU)
	return &f
}

// watchScalar is the index of the scalar that frames show: the one
// Options.WatchScalar names, else the first; -1 without scalars.
func (r *run) watchScalar() int {
	if r.s.Scalars() == 0 {
		return -1
	}
	if i := r.scalarIndex(r.opt.WatchScalar); i >= 0 {
		return i
	}
	return 0
}

// uptakeSoFar returns each scalar's uptake rates over the statistics
// period so far (nil without scalars).
func (r *run) uptakeSoFar() map[string]runfolder.ScalarSummary {
	s := r.s
	if s.Scalars() == 0 {
		return nil
	}
	out := make(map[string]runfolder.ScalarSummary, s.Scalars())
	for i := 0; i < s.Scalars(); i++ {
		ss := runfolder.ScalarSummary{Imbalance: s.Budget(i).Imbalance()}
		r.uptakeRates(i, &ss)
		out[s.ScalarName(i)] = ss
	}
	return out
}

// uptakeRates fills the uptake and supply rates of scalar i over the
// statistics period so far (from the start of the run while it spins up)
// into ss, and returns the period (s).
func (r *run) uptakeRates(i int, ss *runfolder.ScalarSummary) float64 {
	b := r.s.Budget(i)
	b0 := r.spin[i]
	if !r.spinDone {
		b0 = solver.ScalarBudget{Storage0: b.Storage0}
	}
	span := b.Time - b0.Time
	if span > 0 {
		ss.ElementUptake = (b.ElementUptake - b0.ElementUptake) / span
		ss.BedUptake = -(b.BedIn - b0.BedIn) / span
		ss.TotalUptake = ss.ElementUptake + ss.BedUptake
		ss.TopSupply = (b.TopIn - b0.TopIn) / span
	}
	return span
}
