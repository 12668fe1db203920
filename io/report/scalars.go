package report

import (
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot/vg"

	"rollerbed/io/runfolder"
)

// maxScalarPanels is the most scalars a figure draws side by side; the
// others are named in a note.
const maxScalarPanels = 4

// scalarSeries is one quantity of each scalar against height, as a run
// folder's table holds it.
type scalarSeries struct {
	z      []float64 // m
	names  []string
	values [][]float64 // per scalar, at z
}

// readScalarMeans reads the time-mean concentrations of scalars.csv, or
// says why there are none.
func readScalarMeans(r *runData) (scalarSeries, error) {
	if err := present(r.dir, runfolder.ScalarsFile, "written by runs with scalars once statistics are gathered after the spin-up"); err != nil {
		return scalarSeries{}, err
	}
	t, err := runfolder.ReadScalars(r.dir)
	if err != nil {
		return scalarSeries{}, err
	}
	if r.sum != nil && !(r.sum.Run.StatsTime > 0) {
		return scalarSeries{}, skipf("%s holds no means: %s", runfolder.ScalarsFile, noStatistics(r))
	}
	out := scalarSeries{z: t.Z}
	for _, sc := range t.Scalars {
		out.names = append(out.names, sc.Name)
		out.values = append(out.values, sc.Mean)
	}
	return out, usable(out, runfolder.ScalarsFile)
}

// readUptakePerArea reads the element uptake per unit surface area of
// uptake.csv, or says why there is none.
func readUptakePerArea(r *runData) (scalarSeries, error) {
	if err := present(r.dir, runfolder.UptakeFile, "written by runs with scalars"); err != nil {
		return scalarSeries{}, err
	}
	t, err := runfolder.ReadUptake(r.dir)
	if err != nil {
		return scalarSeries{}, err
	}
	out := scalarSeries{z: t.Z}
	for _, sc := range t.Scalars {
		// Levels without elements (0) are left out of the lines.
		v := make([]float64, len(sc.PerArea))
		some := false
		for k, x := range sc.PerArea {
			v[k] = x
			if x == 0 {
				v[k] = math.NaN()
			}
			some = some || x != 0
		}
		if some {
			out.names = append(out.names, sc.Name)
			out.values = append(out.values, v)
		}
	}
	if len(out.names) == 0 && len(t.Scalars) > 0 {
		return out, skipf("%s has no element uptake (no scalar with an uptake law, or no statistics yet)", runfolder.UptakeFile)
	}
	return out, usable(out, runfolder.UptakeFile)
}

// usable says why a table of scalars cannot be drawn: no scalar, or fewer
// than 2 levels.
func usable(s scalarSeries, file string) error {
	switch {
	case len(s.names) == 0:
		return skipf("%s holds no scalar", file)
	case len(s.z) < 2:
		return skipf("%s holds %s; a profile needs 2 or more", file, rowsText(len(s.z)))
	}
	return nil
}

// scalarsFigure writes scalars.png: the time-mean concentration of each
// scalar against height, one panel per scalar, with the canopy top.
func scalarsFigure(r *runData, path string) error {
	s, err := readScalarMeans(r)
	if err != nil {
		return err
	}
	return writePNG(path, scalarPanels(r, s).render())
}

// scalarPanels lays out scalars.png.
func scalarPanels(r *runData, s scalarSeries) *panels {
	n := min(len(s.names), maxScalarPanels)
	f := &panels{cols: n, key: legendBox()}
	f.title = "Time-mean scalar concentration profiles — " + r.title()
	if st := r.statsTime(); finite(st) {
		f.title += fmt.Sprintf("\naveraged over %s s after the spin-up of %s s", fmtG(st), fmtG(r.spinUp()))
	}
	if len(s.names) > n {
		f.title += fmt.Sprintf("; %d more scalars in %s", len(s.names)-n, runfolder.ScalarsFile)
	}
	top := topOf(r, s.z)
	h := r.canopyHeight()
	for i := range n {
		p := newPlot(s.names[i], s.names[i]+" mean concentration [unit]", "z [m]")
		l := line(s.values[i], s.z, RunColour(i), vg.Points(2), nil)
		p.Add(l)
		lo, hi := span(s.values[i])
		padRange(&p.X, lo, hi, false)
		p.Y.Min, p.Y.Max = 0, top
		f.canopyTop(p, i == 0, h, "canopy top h = "+fmtG(h)+" m", vg.Points(1.4), dashes)
		f.plots = append(f.plots, p)
	}
	return f
}

// overlayScalarTable draws one panel per scalar name (the first
// maxScalarPanels names met) with each run's profile of a quantity of
// that scalar in the run's colour, and each run's canopy top dashed in
// its colour.
func overlayScalarTable(runs []*runData, path, what, xlabel string, read func(*runData) (scalarSeries, error)) ([]Note, error) {
	var notes []Note
	var names []string
	type drawn struct {
		r *runData
		i int
		s scalarSeries
	}
	var ds []drawn
	for i, r := range runs {
		s, err := read(r)
		if isSkip(err) {
			notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
			continue
		}
		if err != nil {
			return nil, err
		}
		for _, n := range s.names {
			if !slices.Contains(names, n) {
				names = append(names, n)
			}
		}
		ds = append(ds, drawn{r, i, s})
	}
	if len(ds) == 0 {
		return notes, skipf("no run has %s", what)
	}
	if len(names) > maxScalarPanels {
		notes = append(notes, Note{Reason: fmt.Sprintf("drawn: the first %d scalars of %d", maxScalarPanels, len(names))})
		names = names[:maxScalarPanels]
	}
	f := &panels{cols: len(names), key: legendBox()}
	f.title = fmt.Sprintf("%s of %d runs (dashed: each run's canopy top)", what, len(ds))
	top := 0.0
	for _, d := range ds {
		top = math.Max(top, topOf(d.r, d.s.z))
	}
	for _, name := range names {
		p := newPlot(name, name+" "+xlabel, "z [m]")
		var all [][]float64
		for _, d := range ds {
			k := slices.Index(d.s.names, name)
			if k < 0 {
				continue
			}
			col := RunColour(d.i)
			p.Add(line(d.s.values[k], d.s.z, col, vg.Points(2), nil))
			all = append(all, d.s.values[k])
			if h := d.r.canopyHeight(); finite(h) {
				p.Add(hline(h, col, vg.Points(1.2), dashes))
			}
		}
		lo, hi := span(all...)
		padRange(&p.X, lo, hi, false)
		p.Y.Min, p.Y.Max = 0, top
		f.plots = append(f.plots, p)
	}
	for _, d := range ds {
		label := d.r.label
		if h := d.r.canopyHeight(); finite(h) {
			label += ", canopy top h = " + fmtG(h) + " m"
		}
		f.addKey(label, swatch(RunColour(d.i)))
	}
	return notes, writePNG(path, f.render())
}

// overlayScalars writes the overlay of the time-mean concentration
// profiles of the runs' scalars.
func overlayScalars(runs []*runData, path string) ([]Note, error) {
	return overlayScalarTable(runs, path, "Time-mean scalar concentration profiles", "mean concentration [unit]", readScalarMeans)
}

// overlayUptake writes the overlay of the element uptake per unit surface
// area against height of the runs' scalars.
func overlayUptake(runs []*runData, path string) ([]Note, error) {
	return overlayScalarTable(runs, path, "Element uptake per surface area by height", "uptake per element surface area [unit·m/s]", readUptakePerArea)
}

// swatch is a legend sample: a short solid line of a colour.
func swatch(c color.Color) *level { return hline(0, c, vg.Points(2), nil) }
