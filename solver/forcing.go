package solver

import (
	"fmt"
	"math"
)

// Oscillation is one periodic part of the forcing,
// Amplitude·cos(2π t/Period + Phase), t in s from the start of the run.
// The unit of Amplitude is that of the quantity it adds to: m/s² for a wave
// (pressure-gradient) part, m/s for a tidal (bulk-velocity) part.
type Oscillation struct {
	Amplitude float64 // m/s² (waves) or m/s (tides)
	Period    float64 // s, > 0
	Phase     float64 // rad, the phase at t = 0
}

// At returns the oscillation's value at time t (s).
func (o Oscillation) At(t float64) float64 {
	return o.Amplitude * math.Cos(2*math.Pi*t/o.Period+o.Phase)
}

// RampAt returns the start-up factor at time t (s) of a ramp lasting ramp
// seconds: ½(1 − cos(π t/ramp)) for t < ramp, rising smoothly from 0 to 1
// with zero slope at both ends, and 1 afterwards or when ramp is 0.
func RampAt(t, ramp float64) float64 {
	if ramp <= 0 || t >= ramp {
		return 1
	}
	if t <= 0 {
		return 0
	}
	return 0.5 * (1 - math.Cos(math.Pi*t/ramp))
}

// Steady reports whether the forcing has no oscillating part and no ramp,
// so that Π (FixedGradient) or the bulk target (FixedBulk) is constant.
func (f *Forcing) Steady() bool {
	return len(f.Waves) == 0 && len(f.Tides) == 0 && f.Ramp == 0
}

// GradientAt returns the prescribed pressure gradient Π in m/s² at time t
// (s) of a FixedGradient forcing: the ramp factor times Gradient plus the
// wave parts.
func (f *Forcing) GradientAt(t float64) float64 {
	g := f.Gradient
	for _, o := range f.Waves {
		g += o.At(t)
	}
	return RampAt(t, f.Ramp) * g
}

// BulkAt returns the target depth-mean velocity in m/s at time t (s) of a
// FixedBulk forcing: the ramp factor times Bulk plus the tidal parts, and
// its absolute value when OneWay is set.
func (f *Forcing) BulkAt(t float64) float64 {
	b := f.Bulk
	for _, o := range f.Tides {
		b += o.At(t)
	}
	if f.OneWay {
		b = math.Abs(b)
	}
	return RampAt(t, f.Ramp) * b
}

// Period returns the period in s of the forcing's cycle, by which phases
// are counted: that of the first wave part, else of the first tidal part;
// 0 for a forcing without oscillating parts.
func (f *Forcing) Period() float64 {
	switch {
	case len(f.Waves) > 0:
		return f.Waves[0].Period
	case len(f.Tides) > 0:
		return f.Tides[0].Period
	}
	return 0
}

// PhaseAt returns the phase of time t (s) in the forcing cycle as a
// fraction of the period, in [0, 1): 0 at t = 0 and at every whole
// period after it. It is 0 for a forcing without oscillating parts.
func (f *Forcing) PhaseAt(t float64) float64 {
	p := f.Period()
	if p == 0 {
		return 0
	}
	ph := math.Mod(t/p, 1)
	if ph < 0 {
		ph++
	}
	if ph >= 1 {
		ph = 0
	}
	return ph
}

func (f *Forcing) check() error {
	for i, o := range f.Waves {
		if err := o.check("wave", i); err != nil {
			return err
		}
	}
	for i, o := range f.Tides {
		if err := o.check("tide", i); err != nil {
			return err
		}
	}
	switch {
	case !(f.Ramp >= 0) || math.IsInf(f.Ramp, 0):
		return fmt.Errorf("solver: forcing ramp %g s: need a finite time >= 0", f.Ramp)
	case len(f.Waves) > 0 && f.Kind != FixedGradient:
		return fmt.Errorf("solver: %d oscillating pressure-gradient parts with a fixed bulk velocity, which would cancel them: use FixedGradient", len(f.Waves))
	case len(f.Tides) > 0 && f.Kind != FixedBulk:
		return fmt.Errorf("solver: %d tidal bulk-velocity parts with a fixed pressure gradient: use FixedBulk", len(f.Tides))
	}
	return nil
}

func (o Oscillation) check(kind string, i int) error {
	switch {
	case !(o.Period > 0) || math.IsInf(o.Period, 0):
		return fmt.Errorf("solver: forcing %s %d: period %g s: need a finite period > 0", kind, i, o.Period)
	case math.IsNaN(o.Amplitude) || math.IsInf(o.Amplitude, 0):
		return fmt.Errorf("solver: forcing %s %d: amplitude %g: need a finite value", kind, i, o.Amplitude)
	case math.IsNaN(o.Phase) || math.IsInf(o.Phase, 0):
		return fmt.Errorf("solver: forcing %s %d: phase %g rad: need a finite value", kind, i, o.Phase)
	}
	return nil
}

// stageGradient returns Π (m/s²) for the explicit terms of the running
// stage: the prescribed gradient at the stage's start for an unsteady
// FixedGradient forcing, else the gradient held through the step.
func (s *Solver) stageGradient() float64 {
	if s.unsteadyGradient {
		return s.cfg.Forcing.GradientAt(s.st.tNow)
	}
	return s.gradPi
}

// stageBulk returns the depth-mean velocity (m/s) the projection of the
// running stage holds for FixedBulk: the target at the stage's end.
func (s *Solver) stageBulk() float64 {
	if s.cfg.Forcing.Steady() {
		return s.cfg.Forcing.Bulk
	}
	return s.cfg.Forcing.BulkAt(s.st.tNext)
}
