package report

import (
	"rollerbed/io/runfolder"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// uptakeFigure draws uptake.csv: for each scalar, the element uptake per
// unit element surface area (unit·m/s) against height, with the canopy top
// marked — how much more the upper parts of tall elements take up.
func uptakeFigure(r *runData, path string) error {
	if err := present(r.dir, runfolder.UptakeFile, "written by runs with scalars"); err != nil {
		return err
	}
	t, err := runfolder.ReadUptake(r.dir)
	if err != nil {
		return err
	}
	p := newPlot("", "uptake per element surface area [unit·m/s]", "z [m]")
	n := 0
	var lo, hi float64
	for _, sc := range t.Scalars {
		v := sc.PerArea
		var zs, vs []float64
		for k := range v {
			if v[k] != 0 {
				zs, vs = append(zs, t.Z[k]), append(vs, v[k])
			}
		}
		if len(vs) == 0 {
			continue
		}
		l := line(vs, zs, RunColour(n), vg.Points(1.8), nil)
		p.Add(l)
		p.Legend.Add(sc.Name, l)
		a, b := span(vs)
		if n == 0 || a < lo {
			lo = a
		}
		if n == 0 || b > hi {
			hi = b
		}
		n++
	}
	if n == 0 {
		return skipf("%s has no element uptake (no scalar with an uptake law, or no statistics yet)", runfolder.UptakeFile)
	}
	padRange(&p.X, lo, hi, true)
	p.Y.Min = 0
	if h := r.canopyHeight(); finite(h) && h > 0 {
		p.Y.Max = 1.15 * h
		lv := hline(h, canopyColour, vg.Points(1.2), dashes)
		p.Add(lv)
		p.Legend.Add("canopy top h = "+fmtG(h)+" m", lv)
	}
	p.Legend.Top = true
	title := "Element uptake against height — " + r.title()
	img := render(FigureWidth, FigureHeight, func(cv draw.Canvas) {
		cv = drawTitle(cv, title)
		cs := plot.Align([][]*plot.Plot{{p}}, draw.Tiles{Rows: 1, Cols: 1, PadRight: vg.Points(14), PadBottom: vg.Points(4)}, cv)
		p.Draw(cs[0][0])
	})
	return writePNG(path, img)
}
