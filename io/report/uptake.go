package report

import (
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// uptakeFigure draws uptake.csv: for each scalar, the element uptake per
// unit element surface area (unit·m/s) against height, with the canopy top
// marked — how much more the upper parts of tall elements take up.
func uptakeFigure(r *runData, path string) error {
	t, err := readTable(r.dir, "uptake.csv", "written by runs with scalars")
	if err != nil {
		return err
	}
	file := filepath.Join(r.dir, "uptake.csv")
	c, err := columns(t, file, "z")
	if err != nil {
		return err
	}
	z := c[0]
	const suffix = " uptake per surface area"
	p := newPlot("", "uptake per element surface area [unit·m/s]", "z [m]")
	n := 0
	var lo, hi float64
	for i, h := range t.Header {
		name := ColumnName(h)
		if !strings.HasSuffix(name, suffix) {
			continue
		}
		v := t.Columns[i]
		var zs, vs []float64
		for k := range v {
			if v[k] != 0 {
				zs, vs = append(zs, z[k]), append(vs, v[k])
			}
		}
		if len(vs) == 0 {
			continue
		}
		l := line(vs, zs, RunColour(n), vg.Points(1.8), nil)
		p.Add(l)
		p.Legend.Add(strings.TrimSuffix(name, suffix), l)
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
		return skipf("uptake.csv has no element uptake (no scalar with an uptake law, or no statistics yet)")
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
