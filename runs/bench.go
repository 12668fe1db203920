package runs

import (
	"fmt"
	"math"
	"runtime"
	"syscall"
	"time"

	"rollerbed/canopy"
	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// BenchResult is the speed of the solver on one grid, measured in one
// process against the transforms it cannot avoid.
type BenchResult struct {
	Grid             string  `json:"grid"`
	Nx               int     `json:"nx"`
	Nz               int     `json:"nz"`
	MsPerStep        float64 `json:"ms_per_step"`         // one worker
	MsPerStep2       float64 `json:"ms_per_step_2_cores"` // two workers
	PointUpdatesPerS float64 `json:"point_updates_per_s"` // grid points × steps per second, one worker
	YardstickMs      float64 `json:"yardstick_ms_per_step"`
	YardstickRatio   float64 `json:"yardstick_ratio"` // step time / transform time, one worker
	Speedup2Cores    float64 `json:"speedup_2_cores"`
	AllocsPerStep    float64 `json:"allocs_per_step"`
	PeakRSSMB        float64 `json:"peak_rss_mb"` // of the process so far
	Forward          int     `json:"forward_transforms_per_step"`
	Inverse          int     `json:"inverse_transforms_per_step"`
}

// BenchGrids are the grids `rollerbed bench` measures.
var BenchGrids = [][2]int{{256, 64}, {512, 128}, {1024, 256}}

// benchConfig is the fixed benchmark case: a dowel flume (1.6 m × 0.4 m,
// dowels 0.12 m tall, a = 8 /m, C_D = 1) at a bulk velocity of 0.12 m/s with
// the Smagorinsky closure and one scalar taken up by the dowels (a
// Reynolds-number power law) and by a mat.
func benchConfig(nx, nz, workers int) (solver.Config, error) {
	cfg := solver.Config{
		Nx: nx, Nz: nz, Lx: 1.6, H: 0.4,
		Cluster:   solver.Cluster{At: 0.12, AtFactor: 2, AtWidth: 0.05},
		Viscosity: 1e-6,
		Bed:       solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Forcing: solver.Forcing{Kind: solver.FixedBulk, Bulk: 0.12},
		Closure: solver.Closure{Cs: solver.DefaultSmagorinsky},
		Backend: transform.FFTW, Workers: workers,
	}
	g, err := solver.NewGrid(nx, nz, cfg.Lx, cfg.H, cfg.Cluster)
	if err != nil {
		return cfg, err
	}
	cp := &canopy.Canopy{Profile: canopy.Block(0.12, 8), CD: 1,
		Elements: canopy.Elements{Shape: canopy.Cylinder, Width: 0.0064}}
	if err := cp.Validate(cfg.Lx, cfg.H); err != nil {
		return cfg, err
	}
	cfg.Drag = cp.Drag(g)
	cfg.Scalars = []solver.Scalar{{
		Name: "oxygen", Diffusivity: 1.76e-9, Initial: 0.25,
		Top:             solver.ScalarBoundary{Kind: solver.FixedValue, Value: 0.25},
		Bed:             solver.ScalarBoundary{Kind: solver.Transfer, Capacity: 1e-5, Velocity: func(us float64) float64 { return 0.0889 * us * math.Pow(570, -0.704) }},
		SurfaceArea:     cp.SurfaceArea(g),
		ElementVelocity: func(speed float64) float64 { return 2e-5 * math.Pow(speed+1e-6, 0.5) },
		Capacity:        1e-5,
	}}
	return cfg, nil
}

// newBenchSolver starts the bench case from its drag-balanced profile with
// perturbations seeded in the shear layer at the canopy top.
func newBenchSolver(cfg solver.Config) (*solver.Solver, error) {
	s, err := solver.New(cfg)
	if err != nil {
		return nil, err
	}
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		s.Close()
		return nil, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(2e-3, 0.12, 0.03, 1)
	return s, nil
}

// Bench measures the solver on each grid: steps timed after warmup steps,
// with one and with two workers, and the transform yardstick of the same
// steps.
func Bench(grids [][2]int, steps, warmup int, progress func(string)) ([]BenchResult, error) {
	var out []BenchResult
	for _, gr := range grids {
		nx, nz := gr[0], gr[1]
		r := BenchResult{Grid: fmt.Sprintf("%dx%d", nx, nz), Nx: nx, Nz: nz}
		var t [3]time.Duration
		for workers := 1; workers <= 2; workers++ {
			cfg, err := benchConfig(nx, nz, workers)
			if err != nil {
				return nil, err
			}
			s, err := newBenchSolver(cfg)
			if err != nil {
				return nil, err
			}
			dt := s.NextStep()
			for range warmup {
				if err := s.StepBy(dt); err != nil {
					s.Close()
					return nil, err
				}
			}
			var m0, m1 runtime.MemStats
			runtime.ReadMemStats(&m0)
			t0 := time.Now()
			for range steps {
				if err := s.StepBy(dt); err != nil {
					s.Close()
					return nil, err
				}
			}
			t[workers] = time.Since(t0)
			runtime.ReadMemStats(&m1)
			if workers == 1 {
				r.AllocsPerStep = float64(m1.Mallocs-m0.Mallocs) / float64(steps)
				r.Forward, r.Inverse = s.TransformsPerStep()
				// The yardstick on the same plans, after the state is done with.
				s.TransformYardstick(warmup)
				r.YardstickMs = float64(s.TransformYardstick(steps).Nanoseconds()) / float64(steps) / 1e6
			}
			s.Close()
		}
		r.MsPerStep = float64(t[1].Nanoseconds()) / float64(steps) / 1e6
		r.MsPerStep2 = float64(t[2].Nanoseconds()) / float64(steps) / 1e6
		r.PointUpdatesPerS = float64(nx*nz) / (r.MsPerStep / 1e3)
		r.YardstickRatio = r.MsPerStep / r.YardstickMs
		r.Speedup2Cores = r.MsPerStep / r.MsPerStep2
		r.PeakRSSMB = peakRSSMB()
		out = append(out, r)
		if progress != nil {
			progress(r.Grid)
		}
	}
	return out, nil
}

// peakRSSMB returns the process's peak resident memory in MB.
func peakRSSMB() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return float64(ru.Maxrss) / 1024 // Linux reports KiB
}
