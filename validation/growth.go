package validation

import (
	"math"
	"math/cmplx"

	"rollerbed/solver"
)

// growth is what a growing-wave run measured: the disturbance energy's
// growth rate, fitted over a window and over its two halves, and the phase
// speed of the wave, in the time and length units of its growthSpec.
type growth struct {
	rate, early, late float64 // energy growth rate, 1/time unit
	cr                float64 // phase speed, length unit/time unit
	series            *table  // time, energy, unwrapped phase
}

// growthSpec says how to sample and fit a growing wave.
type growthSpec struct {
	timeColumn         string  // name of the series' time column
	tUnit              float64 // s per time unit
	dt                 float64 // s, the step
	perSample, samples int     // steps between records; records after the first
	from, end          float64 // fit window, time units
	alpha              float64 // streamwise wavenumber, 1/length unit
	// energy returns the disturbance energy; wave the complex amplitude
	// of the wave, whose phase falls as α c_r t.
	energy func() float64
	wave   func() complex128
}

// measureGrowth steps s, records the energy and the unwrapped phase of the
// wave every perSample steps, and fits the growth rate (the slope of
// log energy) and the phase speed (−slope of the phase / α) by least
// squares over the window.
func measureGrowth(s *solver.Solver, sp growthSpec) (growth, error) {
	series := newTable(sp.timeColumn, "energy", "phase_w_mid_rad")
	var ts, logE, phase []float64
	prev, unwrap := 0.0, 0.0
	for n := 0; ; n++ {
		e := sp.energy()
		ph := cmplx.Phase(sp.wave())
		if n > 0 {
			for ph+unwrap-prev > math.Pi {
				unwrap -= 2 * math.Pi
			}
			for ph+unwrap-prev < -math.Pi {
				unwrap += 2 * math.Pi
			}
		}
		prev = ph + unwrap
		t := s.Time() / sp.tUnit
		series.add(t, e, prev)
		ts, logE, phase = append(ts, t), append(logE, math.Log(e)), append(phase, prev)
		if n == sp.samples {
			break
		}
		if err := advance(s, sp.perSample, sp.dt); err != nil {
			return growth{}, err
		}
	}
	half := (sp.from + sp.end) / 2
	return growth{
		rate:   slope(ts, logE, sp.from, sp.end),
		early:  slope(ts, logE, sp.from, half),
		late:   slope(ts, logE, half, sp.end),
		cr:     -slope(ts, phase, sp.from, sp.end) / sp.alpha,
		series: series,
	}, nil
}
