package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"rollerbed/io/runfolder"
)

// phaseColour returns the colour of a phase (a fraction of the period) on
// a colour wheel, so that the last phase of a cycle sits beside the first.
func phaseColour(phase float64) color.RGBA {
	h := math.Mod(phase, 1) * 6
	const s, v = 0.75, 0.8
	c := v * s
	x := c * (1 - math.Abs(math.Mod(h, 2)-1))
	var r, g, b float64
	switch int(h) {
	case 0:
		r, g = c, x
	case 1:
		r, g = x, c
	case 2:
		g, b = c, x
	case 3:
		g, b = x, c
	case 4:
		r, b = x, c
	default:
		r, b = c, x
	}
	m := v - c
	to := func(f float64) uint8 { return uint8(math.Round(255 * (f + m))) }
	return color.RGBA{to(r), to(g), to(b), 255}
}

// phasesFigure writes phases.png: the velocity and the shear stress by
// phase of the forcing cycle (phase_profiles.csv), with the canopy top and,
// for flexible blades, the bent height of each phase (phase_cycle.csv).
func phasesFigure(r *runData, path string) error {
	if err := present(r.dir, runfolder.PhaseProfilesFile, "written for a forcing with waves or tides"); err != nil {
		return err
	}
	f, err := phasePanels(r)
	if err != nil {
		return err
	}
	return writePNG(path, f.render())
}

// phasePanels lays out phases.png.
func phasePanels(r *runData) (*panels, error) {
	t, err := runfolder.ReadPhaseProfiles(r.dir)
	if err != nil {
		return nil, err
	}
	cyc, err := runfolder.ReadPhaseCycle(r.dir)
	if err != nil {
		return nil, err
	}
	n := len(t.Bins)
	if len(cyc.Phase) != n {
		return nil, fmt.Errorf("%s has %d phases, %s %d", runfolder.PhaseCycleFile, len(cyc.Phase), runfolder.PhaseProfilesFile, n)
	}
	f := &panels{cols: 2, key: legendBox()}
	pu := newPlot("velocity by phase", "U [m/s]", "z [m]")
	ps := newPlot("shear stress by phase", "−u'w' [m²/s²]", "z [m]")
	var all, allS [][]float64
	shown := 0
	for b, bin := range t.Bins {
		if cyc.Time[b] == 0 {
			continue // no samples in this bin yet
		}
		shown++
		c := phaseColour(cyc.Phase[b])
		stress := make([]float64, len(bin.UW))
		for k, v := range bin.UW {
			stress[k] = -v
		}
		lu := line(bin.U, t.Z, c, vg.Points(1.6), nil)
		pu.Add(lu)
		ps.Add(line(stress, t.Z, c, vg.Points(1.6), nil))
		all, allS = append(all, bin.U), append(allS, stress)
		entry := "t/T = " + fmtG(cyc.Phase[b])
		if cyc.BentHeight != nil {
			entry += ", blades bent to " + fmtG(cyc.BentHeight[b]) + " m"
			l := hline(cyc.BentHeight[b], c, vg.Points(1.2), dashes)
			pu.Add(l)
		}
		f.addKey(entry, lu)
	}
	if shown == 0 {
		return nil, skipf("%s holds no phase with samples yet (the statistics start after the spin-up)", runfolder.PhaseProfilesFile)
	}
	lo, hi := span(all...)
	padRange(&pu.X, lo, hi, true)
	lo, hi = span(allS...)
	padRange(&ps.X, lo, hi, true)
	top := topOf(r, t.Z)
	h := r.canopyHeight()
	entry := "canopy top h = " + fmtG(h) + " m"
	if cyc.BentHeight != nil {
		entry += " (upright blades)"
	}
	for i, p := range []*plot.Plot{pu, ps} {
		p.Y.Min, p.Y.Max = 0, top
		f.canopyTop(p, i == 0, h, entry, vg.Points(1.6), nil)
	}
	f.plots = []*plot.Plot{pu, ps}
	f.title = "Profiles by phase of the forcing cycle — " + r.title()
	if s := r.sum; s != nil && s.Phases != nil {
		ph := s.Phases
		f.title += fmt.Sprintf("\n%d phases of a %s s period, over %s cycles", ph.Bins, fmtG(ph.Period), fmtG(ph.Cycles))
		if v := ph.OscillatingRatio; v != nil {
			f.title += "; in-canopy / above-canopy oscillation " + fmtG(*v)
		}
		if cyc.BentHeight != nil {
			f.title += "; dashed: bent height"
		}
	}
	return f, nil
}

// canopyTop marks the canopy top h (m; none when NaN) on plot p, and adds
// the key entry when key is set.
func (f *panels) canopyTop(p *plot.Plot, key bool, h float64, entry string, width vg.Length, dash []vg.Length) {
	if !finite(h) {
		return
	}
	l := hline(h, canopyColour, width, dash)
	p.Add(l)
	if key {
		f.addKey(entry, l)
	}
}

// bentFrontal returns the canopy mask of the slice at time t (s): the
// frontal area of fields.h5 where the blades stand upright, and for
// flexible blades a column squeezed to the bent height of the time series
// at t (linear between its rows).
func (s *slice) bentFrontal(r *runData, t float64) []float64 {
	if s.frontal == nil || r.sum == nil || r.sum.Canopy == nil || r.sum.Canopy.Flexible == nil {
		return s.frontal
	}
	if s.bent == nil {
		ts, err := runfolder.ReadTimeSeries(r.dir)
		if err != nil || len(ts.BentHeight) == 0 {
			return s.frontal
		}
		s.bent = &ts
	}
	ratio := interpolate(s.bent.T, s.bent.BentHeight, t) / r.sum.Canopy.Flexible.Length
	g := s.grid
	nx, nz := len(g.X), len(g.Zc)
	out := make([]float64, len(s.frontal))
	for i := range nx {
		top := 0.0
		for k := range nz {
			if s.frontal[k*nx+i] > 0 {
				top = g.Zf[k+1]
			}
		}
		for k := range nz {
			if g.Zf[k] < ratio*top {
				out[k*nx+i] = 1
			}
		}
	}
	return out
}

// interpolate returns y at x, linear between the points (xs increasing),
// held at the ends.
func interpolate(xs, ys []float64, x float64) float64 {
	n := len(xs)
	switch {
	case x <= xs[0]:
		return ys[0]
	case x >= xs[n-1]:
		return ys[n-1]
	}
	j := 1
	for xs[j] < x {
		j++
	}
	w := (x - xs[j-1]) / (xs[j] - xs[j-1])
	return ys[j-1] + w*(ys[j]-ys[j-1])
}
