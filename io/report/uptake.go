package report

import (
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
)

// uptakeFigure draws uptake.csv: for each scalar, the element uptake per
// unit element surface area (unit·m/s) against height, with the canopy top
// marked — how much more the upper parts of tall elements take up.
func uptakeFigure(r *runData, path string) error {
	s, err := readUptakePerArea(r)
	if err != nil {
		return err
	}
	return writePNG(path, uptakePanels(r, s).render())
}

// uptakePanels lays out uptake.png: one plot with a line per scalar, the
// key above it.
func uptakePanels(r *runData, s scalarSeries) *panels {
	f := &panels{title: "Element uptake against height — " + r.title(), key: legendBox()}
	p := newPlot("", "uptake per element surface area [unit·m/s]", "z [m]")
	for i, name := range s.names {
		l := line(s.values[i], s.z, RunColour(i), vg.Points(1.8), nil)
		p.Add(l)
		f.addKey(name, l)
	}
	lo, hi := span(s.values...)
	padRange(&p.X, lo, hi, true)
	p.Y.Min = 0
	if h := r.canopyHeight(); finite(h) && h > 0 {
		p.Y.Max = 1.15 * h
		lv := hline(h, canopyColour, vg.Points(1.2), dashes)
		p.Add(lv)
		f.addKey("canopy top h = "+fmtG(h)+" m", lv)
	}
	f.plots = []*plot.Plot{p}
	return f
}
