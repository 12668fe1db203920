package runs

import (
	"fmt"
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"strconv"
	"strings"
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
	// YardstickSpeedup2Cores is the speed-up of the yardstick itself from
	// one to two workers: what the machine gives the transforms, against
	// which Speedup2Cores can be read.
	YardstickSpeedup2Cores float64 `json:"yardstick_speedup_2_cores"`
	AllocsPerStep          float64 `json:"allocs_per_step"`
	PeakRSSMB              float64 `json:"peak_rss_mb"` // of a one-worker run of the grid alone
	Forward                int     `json:"forward_transforms_per_step"`
	Inverse                int     `json:"inverse_transforms_per_step"`
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
	cfg.Drag = canopyDrag(cp, canopyMesh(g))
	cfg.Scalars = []solver.Scalar{{
		Name: "oxygen", Diffusivity: 1.76e-9, Initial: 0.25,
		Top:             solver.ScalarBoundary{Kind: solver.FixedValue, Value: 0.25},
		Bed:             solver.ScalarBoundary{Kind: solver.Transfer, Capacity: 1e-5, Velocity: func(us float64) float64 { return 0.0889 * us * math.Pow(570, -0.704) }},
		SurfaceArea:     cp.SurfaceArea(canopyMesh(g)),
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

// benchRound is the number of steps timed in one turn: the one-worker
// steps, the yardstick and the two-worker steps alternate in short turns so
// that all three see the same load on a shared machine.
const benchRound = 4

// Bench measures the solver on each grid: steps timed after warmup steps,
// with one and with two workers, each followed by the transform yardstick
// of the same steps on that solver's own plans (its state saved before each
// turn of the yardstick and restored after it). Allocations are counted
// afterwards on both solvers with one processor, and peak memory on a
// one-worker run of the grid alone.
func Bench(grids [][2]int, steps, warmup int, progress func(string)) ([]BenchResult, error) {
	var out []BenchResult
	for _, gr := range grids {
		r, err := benchGrid(gr[0], gr[1], steps, warmup)
		if err != nil {
			return nil, err
		}
		out = append(out, r)
		if progress != nil {
			progress(r.Grid)
		}
	}
	return out, nil
}

// benchGrid measures one grid.
func benchGrid(nx, nz, steps, warmup int) (BenchResult, error) {
	r := BenchResult{Grid: fmt.Sprintf("%dx%d", nx, nz), Nx: nx, Nz: nz}
	var ss [2]*solver.Solver
	defer func() {
		for _, s := range ss {
			if s != nil {
				s.Close()
			}
		}
	}()
	var dt [2]float64
	for w := range ss {
		cfg, err := benchConfig(nx, nz, w+1)
		if err != nil {
			return r, err
		}
		if ss[w], err = newBenchSolver(cfg); err != nil {
			return r, err
		}
		dt[w] = ss[w].NextStep()
		for range warmup {
			if err := ss[w].StepBy(dt[w]); err != nil {
				return r, err
			}
		}
	}
	one := ss[0]
	var saved solver.State
	// yardstick times the transforms of n steps on solver w, its state
	// saved before and restored after.
	yardstick := func(w, n int) (time.Duration, error) {
		ss[w].Save(&saved)
		d := ss[w].TransformYardstick(n)
		return d, ss[w].Restore(&saved)
	}
	for w := range ss {
		if _, err := yardstick(w, warmup); err != nil {
			return r, err
		}
	}
	var t, yard [2]time.Duration
	for done := 0; done < steps; done += benchRound {
		n := min(benchRound, steps-done)
		for w, s := range ss {
			t0 := time.Now()
			for range n {
				if err := s.StepBy(dt[w]); err != nil {
					return r, err
				}
			}
			t[w] += time.Since(t0)
			d, err := yardstick(w, n)
			if err != nil {
				return r, err
			}
			yard[w] += d
		}
	}
	for w, s := range ss {
		a, err := stepAllocs(s, dt[w], 2*benchRound)
		if err != nil {
			return r, err
		}
		r.AllocsPerStep = max(r.AllocsPerStep, a)
	}
	r.Forward, r.Inverse = one.TransformsPerStep()
	for w, s := range ss {
		s.Close()
		ss[w] = nil
	}
	perStep := func(d time.Duration) float64 { return float64(d.Nanoseconds()) / float64(steps) / 1e6 }
	r.MsPerStep, r.MsPerStep2, r.YardstickMs = perStep(t[0]), perStep(t[1]), perStep(yard[0])
	r.PointUpdatesPerS = float64(nx*nz) / (r.MsPerStep / 1e3)
	r.YardstickRatio = r.MsPerStep / r.YardstickMs
	r.Speedup2Cores = r.MsPerStep / r.MsPerStep2
	r.YardstickSpeedup2Cores = float64(yard[0]) / float64(yard[1])
	peak, err := benchPeakMB(nx, nz, warmup)
	if err != nil {
		return r, err
	}
	r.PeakRSSMB = peak
	return r, nil
}

// stepAllocs returns the heap allocations per step over n steps. Like
// testing.AllocsPerRun it counts them with one processor, so that the
// runtime's own goroutine wait records, which it allocates afresh when the
// workers' wake-ups move between processors, do not count; the step's code
// path, workers included, is the same.
func stepAllocs(s *solver.Solver, dt float64, n int) (float64, error) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	if err := s.StepBy(dt); err != nil {
		return 0, err
	}
	var m runtime.MemStats
	runtime.ReadMemStats(&m)
	m0 := m.Mallocs
	for range n {
		if err := s.StepBy(dt); err != nil {
			return 0, err
		}
	}
	runtime.ReadMemStats(&m)
	return float64(m.Mallocs-m0) / float64(n), nil
}

// benchPeakMB returns the peak resident memory (MB) of a one-worker run of
// the grid on its own: the memory the earlier solvers held is handed back to
// the system and the kernel's high-water mark reset first. Where the mark
// cannot be reset (not Linux), it is the process's peak so far.
func benchPeakMB(nx, nz, warmup int) (float64, error) {
	runtime.GC()
	debug.FreeOSMemory()
	reset := os.WriteFile("/proc/self/clear_refs", []byte("5"), 0) == nil
	cfg, err := benchConfig(nx, nz, 1)
	if err != nil {
		return 0, err
	}
	s, err := newBenchSolver(cfg)
	if err != nil {
		return 0, err
	}
	defer s.Close()
	dt := s.NextStep()
	for range warmup + benchRound {
		if err := s.StepBy(dt); err != nil {
			return 0, err
		}
	}
	if reset {
		if kb, ok := statusKB("VmHWM"); ok {
			return kb / 1024, nil
		}
	}
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0, nil
	}
	return float64(ru.Maxrss) / 1024, nil // Linux reports KiB
}

// statusKB reads a "Key: N kB" line of /proc/self/status.
func statusKB(key string) (float64, bool) {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0, false
	}
	for line := range strings.SplitSeq(string(b), "\n") {
		if rest, ok := strings.CutPrefix(line, key+":"); ok {
			v, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(rest), " kB"), 64)
			return v, err == nil
		}
	}
	return 0, false
}
