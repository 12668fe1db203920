package solver

import (
	"math"
	"testing"
)

// BenchmarkPhases times each phase of a stage on its own, at 512×128 with
// the canopy, the closure and one scalar taken up by the elements and a
// mat: where the non-transform part of the step goes.
func BenchmarkPhases(b *testing.B) {
	c := canopyChannel(512, 128, 1)
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
	s := mustNew(b, c)
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		b.Fatal(err)
	}
	s.SetMeanProfile(prof)
	s.Perturb(1e-3, 0.33, 0.1, 1)
	dt := s.NextStep()
	for range 3 {
		if err := s.StepBy(dt); err != nil {
			b.Fatal(err)
		}
	}
	s.st = stageCoef{dt: dt, alpha: rk3[1].alpha, beta: rk3[1].beta, gamma: rk3[1].gamma, zeta: rk3[1].zeta}
	s.inStage = true
	for _, ph := range []struct {
		name string
		task func(int)
	}{
		{"explicit", s.explicitTask}, {"xderiv", s.xderivTask},
		{"implicit", s.implicitTask}, {"forward", s.fwdTask}, {"project", s.projectTask},
		{"inverse", s.invTask},
	} {
		b.Run(ph.name, func(b *testing.B) {
			for b.Loop() {
				s.pool.run(ph.task)
			}
		})
	}
}
