package runs

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"time"

	"rollerbed/io/report"
	"rollerbed/solver"
)

// Progress is what a run reports while it steps.
type Progress struct {
	SimTime, EndTime float64       // s
	Steps            int           // steps taken
	StepsPerSecond   float64       // wall-clock rate
	ETA              time.Duration // estimated wall time left
	Dt               float64       // s, last step
}

// Options controls a run.
type Options struct {
	Dir   string // run folder
	Force bool   // write into an existing, non-empty folder
	// Progress, when set, is called about every ProgressEvery of wall time.
	Progress      func(Progress)
	ProgressEvery time.Duration
}

// Result is the outcome of a run.
type Result struct {
	Steps         int
	SimTime       float64 // s
	WallTime      time.Duration
	Interrupted   bool
	MaxDivergence float64 // relative to the velocity-gradient scale
	Bulk          float64 // m/s, depth-mean velocity at the end
	Gradient      float64 // m/s², mean pressure gradient at the end
}

// ErrFolderInUse reports a run folder that already holds files.
var ErrFolderInUse = errors.New("run folder is not empty")

// PrepareDir creates the run folder, refusing a non-empty one unless force.
func PrepareDir(dir string, force bool) error {
	ents, err := os.ReadDir(dir)
	switch {
	case err == nil && len(ents) > 0 && !force:
		return fmt.Errorf("%s: %w; choose another --out folder or add --force to overwrite it", dir, ErrFolderInUse)
	case err == nil:
	case errors.Is(err, os.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("cannot create run folder: %w", err)
		}
	default:
		return fmt.Errorf("cannot use run folder %s: %w", dir, err)
	}
	// Probe that the folder takes files before any work is done.
	probe := filepath.Join(dir, ".rollerbed-probe")
	if err := os.WriteFile(probe, nil, 0o644); err != nil {
		return fmt.Errorf("run folder %s is not writable: %w", dir, err)
	}
	return os.Remove(probe)
}

// NewSolver builds the solver of a spec and sets its initial state.
func NewSolver(sp *Spec) (*solver.Solver, error) {
	s, err := solver.New(sp.Solver)
	if err != nil {
		return nil, err
	}
	in := sp.Initial
	switch in.Profile {
	case "", "rest":
	case "uniform":
		prof := make([]float64, s.Grid().Nz)
		for k := range prof {
			prof[k] = in.Speed
		}
		s.SetMeanProfile(prof)
	case "laminar":
		prof, _, err := s.LaminarProfile()
		if err != nil {
			s.Close()
			return nil, fmt.Errorf("initial.profile = \"laminar\": %w", err)
		}
		s.SetMeanProfile(prof)
	default:
		s.Close()
		return nil, fmt.Errorf("initial.profile = %q: unknown profile", in.Profile)
	}
	s.Perturb(in.Perturbation, in.At, in.Width, in.Seed)
	return s, nil
}

// Run carries out a spec and writes its run folder. Cancelling ctx stops it
// after the current step; what was computed is written and the result says
// it was interrupted.
func Run(ctx context.Context, sp *Spec, opt Options) (*Result, error) {
	if err := PrepareDir(opt.Dir, opt.Force); err != nil {
		return nil, err
	}
	if err := report.WriteFileAtomic(filepath.Join(opt.Dir, "case.toml"), []byte(sp.CaseText)); err != nil {
		return nil, err
	}
	s, err := NewSolver(sp)
	if err != nil {
		return nil, err
	}
	defer s.Close()

	start := time.Now()
	every := sp.ProfileEvery
	if !(every > 0) {
		every = sp.Duration / 100
	}
	var ts timeSeries
	ts.add(s)
	nextRow := every
	lastReport := start
	res := &Result{}
	var runErr error
	for s.Time() < sp.Duration*(1-1e-12) {
		if ctx.Err() != nil {
			res.Interrupted = true
			break
		}
		dt := sp.FixedStep
		if !(dt > 0) {
			dt = s.NextStep()
		}
		// Land exactly on the end time.
		if left := sp.Duration - s.Time(); dt > left {
			dt = left
		}
		if err := s.StepBy(dt); err != nil {
			runErr = err
			break
		}
		if s.Time() >= nextRow*(1-1e-12) {
			ts.add(s)
			for nextRow <= s.Time()*(1+1e-12) {
				nextRow += every
			}
		}
		if opt.Progress != nil && time.Since(lastReport) >= opt.ProgressEvery {
			lastReport = time.Now()
			opt.Progress(progressOf(s, sp.Duration, start))
		}
	}
	if opt.Progress != nil && runErr == nil {
		opt.Progress(progressOf(s, sp.Duration, start))
	}
	res.Steps, res.SimTime, res.WallTime = s.Steps(), s.Time(), time.Since(start)
	div, scale := s.Divergence()
	if scale > 0 {
		res.MaxDivergence = div / scale
	}
	res.Bulk, res.Gradient = s.Bulk(), s.Gradient()
	if werr := writeOutputs(opt.Dir, sp, s, &ts, res, runErr); werr != nil {
		return res, errors.Join(runErr, werr)
	}
	return res, runErr
}

func progressOf(s *solver.Solver, end float64, start time.Time) Progress {
	el := time.Since(start)
	p := Progress{SimTime: s.Time(), EndTime: end, Steps: s.Steps(), Dt: s.LastStep()}
	if sec := el.Seconds(); sec > 0 {
		p.StepsPerSecond = float64(s.Steps()) / sec
	}
	if s.Time() > 0 {
		left := el.Seconds() * (end - s.Time()) / s.Time()
		p.ETA = time.Duration(math.Max(left, 0) * float64(time.Second))
	}
	return p
}

// timeSeries collects bulk quantities at the profile cadence.
type timeSeries struct {
	t, dt, bulk, grad, courant []float64
}

func (ts *timeSeries) add(s *solver.Solver) {
	ts.t = append(ts.t, s.Time())
	ts.dt = append(ts.dt, s.LastStep())
	ts.bulk = append(ts.bulk, s.Bulk())
	ts.grad = append(ts.grad, s.Gradient())
	ts.courant = append(ts.courant, s.CourantNumber(s.LastStep()))
}

// Summary is the content of summary.json. Keys carry their unit.
type Summary struct {
	Run  RunSummary  `json:"run"`
	Flow FlowSummary `json:"flow"`
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
	Error       string  `json:"error,omitempty"`
}

// FlowSummary holds the bulk flow numbers.
type FlowSummary struct {
	BulkVelocity  float64 `json:"bulk_velocity_m_s"`
	Gradient      float64 `json:"pressure_gradient_m_s2"`
	MaxDivergence float64 `json:"max_divergence"`
}

func writeOutputs(dir string, sp *Spec, s *solver.Solver, ts *timeSeries, res *Result, runErr error) error {
	g := s.Grid()
	mean := make([]float64, g.Nz)
	s.MeanU(mean)
	err := report.Table{
		Header:  []string{"z [m]", "U [m/s]"},
		Columns: [][]float64{g.Zc, mean},
	}.WriteCSV(filepath.Join(dir, "profile.csv"))
	if err != nil {
		return err
	}
	err = report.Table{
		Header:  []string{"t [s]", "dt [s]", "bulk velocity [m/s]", "pressure gradient [m/s2]", "Courant number"},
		Columns: [][]float64{ts.t, ts.dt, ts.bulk, ts.grad, ts.courant},
	}.WriteCSV(filepath.Join(dir, "timeseries.csv"))
	if err != nil {
		return err
	}
	sum := Summary{
		Run: RunSummary{Title: sp.Title, Steps: res.Steps, SimTime: res.SimTime, WallTime: res.WallTime.Seconds(),
			Nx: g.Nx, Nz: g.Nz, Version: Version, Interrupted: res.Interrupted},
		Flow: FlowSummary{BulkVelocity: res.Bulk, Gradient: res.Gradient, MaxDivergence: res.MaxDivergence},
	}
	if runErr != nil {
		sum.Run.Error = runErr.Error()
	}
	return report.WriteJSON(filepath.Join(dir, "summary.json"), sum)
}
