package solver

import (
	"math"
	"os"
	"strconv"
	"testing"
	"time"
)

// BenchmarkPhases times each phase of a stage on its own, at 512×128 with
// the canopy, the closure and one scalar taken up by the elements and a
// mat: where the non-transform part of the step goes.
func BenchmarkPhases(b *testing.B) {
	s, phases := phaseSolver(b, benchWorkers())
	for _, ph := range phases {
		b.Run(ph.name, func(b *testing.B) {
			for b.Loop() {
				s.crew.run(ph.task)
			}
		})
	}
}

// BenchmarkPhaseParts times each worker's part of each phase of a
// two-worker solver on its own, run serially: how evenly a phase is split.
func BenchmarkPhaseParts(b *testing.B) {
	_, phases := phaseSolver(b, 2)
	for _, ph := range phases {
		for part := range 2 {
			b.Run(ph.name+"/part="+strconv.Itoa(part), func(b *testing.B) {
				for b.Loop() {
					ph.task(part)
				}
			})
		}
	}
}

type phase struct {
	name string
	task func(int)
}

// phaseSolver returns the 512×128 canopy solver of the phase benchmarks,
// a few steps in and set inside the second stage, and its phases in order.
func phaseSolver(b *testing.B, workers int) (*Solver, []phase) {
	c := canopyChannel(512, 128, workers)
	area := make([]float64, len(c.Drag.HalfArea))
	for i, h := range c.Drag.HalfArea {
		area[i] = 2 * math.Pi * h
	}
	c.Scalars = []Scalar{{
		Name: "oxygen", Diffusivity: 1.76e-9, Initial: 0.25,
		Top:             ScalarBoundary{Kind: FixedValue, Value: 0.25},
		Bed:             ScalarBoundary{Kind: Transfer, Capacity: 1e-5, Velocity: func(us float64) float64 { return 0.0889 * us * math.Pow(570, -0.704) }},
		SurfaceArea:     area,
		ElementVelocity: func(speed float64) float64 { return 2e-5 * math.Pow(speed+1e-6, 0.5) },
		Capacity:        1e-5,
	}}
	s := startCanopy(b, c)
	dt := s.NextStep()
	for range 3 {
		if err := s.StepBy(dt); err != nil {
			b.Fatal(err)
		}
	}
	s.st = stageCoef{dt: dt, alpha: rk3[1].alpha, beta: rk3[1].beta, gamma: rk3[1].gamma, zeta: rk3[1].zeta}
	s.inStage = true
	return s, []phase{
		{"explicit", s.explicitTask}, {"xderiv", s.xderivTask},
		{"implicit", s.implicitTask}, {"forward", s.fwdTask}, {"project", s.projectTask},
		{"correct", s.correctTask},
	}
}

// benchWorkers is the number of workers of BenchmarkPhases: 1, or the value
// of ROLLERBED_BENCH_WORKERS.
func benchWorkers() int {
	if n, err := strconv.Atoi(os.Getenv("ROLLERBED_BENCH_WORKERS")); err == nil && n > 0 {
		return n
	}
	return 1
}

// BenchmarkPhasePartsTogether runs each phase on a two-worker solver and
// reports, beside the phase's wall time, how long each part took while the
// other ran beside it (part0-µs, part1-µs). Against BenchmarkPhaseParts,
// where each part runs alone, it shows how much the two cores slow each
// other down; the wall time less the slower part is what the barrier and
// the wake-up of the worker cost.
func BenchmarkPhasePartsTogether(b *testing.B) {
	s, phases := phaseSolver(b, 2)
	for _, ph := range phases {
		b.Run(ph.name, func(b *testing.B) {
			var took [2]time.Duration
			task := func(part int) {
				t0 := time.Now()
				ph.task(part)
				took[part] += time.Since(t0)
			}
			for b.Loop() {
				s.crew.run(task)
			}
			for part, d := range took {
				b.ReportMetric(float64(d.Microseconds())/float64(b.N), "part"+strconv.Itoa(part)+"-µs")
			}
		})
	}
}
