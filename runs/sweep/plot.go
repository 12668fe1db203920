package sweep

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"rollerbed/canopy"
	"rollerbed/io/runfolder"
)

// Summary keys the scalings apply to.
const (
	penetrationKey = runfolder.KeyPenetrationDepth
	spacingKey     = runfolder.KeyRollerSpacing
)

// PlotSpec is one figure: a metric (Y) against a parameter (X), each a
// varied key or a summary column.
type PlotSpec struct {
	Y, X string
}

// ParsePlotSpec reads "Y:X", e.g. "flow.penetration_depth_m:canopy.frontal_area".
func ParsePlotSpec(s string) (PlotSpec, error) {
	y, x, ok := strings.Cut(s, ":")
	y, x = strings.TrimSpace(y), strings.TrimSpace(x)
	if !ok || y == "" || x == "" || strings.Contains(x, ":") {
		return PlotSpec{}, fmt.Errorf("--plot %q: write the metric and the parameter as Y:X, e.g. --plot flow.penetration_depth_m:canopy.frontal_area", s)
	}
	return PlotSpec{Y: y, X: x}, nil
}

// CheckPlots checks that the specs name columns of the collection, so a
// mistake is reported before anything is written.
func (c *Collection) CheckPlots(specs []PlotSpec) error {
	var errs []string
	for _, s := range specs {
		for _, k := range []string{s.Y, s.X} {
			if c.has(k) {
				continue
			}
			if contains(c.Empty, k) {
				errs = append(errs, fmt.Sprintf("--plot %s:%s: %q is null in every done member: the runs did not give it (their summary.json says why, e.g. flow.roller_frequency_note); plot another metric, or run the members longer", s.Y, s.X, k))
				continue
			}
			msg := fmt.Sprintf("--plot %s:%s: %q is neither a varied key (%s) nor a numeric summary key", s.Y, s.X, k, strings.Join(c.Keys, ", "))
			if sug := closest(k, append(append([]string{}, c.Keys...), c.Columns...)); sug != "" {
				msg += "; did you mean " + sug + "?"
			}
			errs = append(errs, msg+" (the columns of "+CSVName+" are the choices)")
		}
	}
	if len(errs) > 0 {
		return fmt.Errorf("%s", strings.Join(errs, "\n"))
	}
	return nil
}

// Figure is a written figure.
type Figure struct {
	Path string
	// Reference names the published scaling drawn, "" for none; Note
	// says why none was drawn where one applies.
	Reference, Note string
	Points          int
}

var unsafeName = regexp.MustCompile(`[^A-Za-z0-9_.-]+`)

// Plot writes one PNG figure per spec into figures/ of the sweep folder:
// the done members' Y against X, with the published scaling where one
// applies (penetration depth against 0.23/(C_D a), capped at the canopy
// height; roller spacing against 8.1 Ls). The x axis is logarithmic when
// X is an axis given as a log range.
func (c *Collection) Plot(specs []PlotSpec) ([]Figure, error) {
	if err := c.CheckPlots(specs); err != nil {
		return nil, err
	}
	if len(specs) == 0 {
		return nil, nil
	}
	dir := filepath.Join(c.dir, runfolder.FiguresDir)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	var figs []Figure
	for _, s := range specs {
		fig, err := c.plotOne(dir, s)
		if err != nil {
			return figs, err
		}
		figs = append(figs, fig)
	}
	return figs, nil
}

func (c *Collection) logAxis(key string) bool {
	f, err := Parse([]byte(c.man.SweepText), "")
	if err != nil {
		return false
	}
	for _, a := range f.Axes {
		if a.Key == key {
			return a.Spacing == SpacingLog
		}
	}
	return false
}

func (c *Collection) plotOne(dir string, s PlotSpec) (Figure, error) {
	fig := Figure{Path: filepath.Join(dir, unsafeName.ReplaceAllString(s.Y, "_")+"-vs-"+unsafeName.ReplaceAllString(s.X, "_")+".png")}
	xs, xok := c.Column(s.X)
	ys, yok := c.Column(s.Y)
	logX := c.logAxis(s.X)
	var pts plotter.XYs
	var rows []int
	for i := range c.Rows {
		if xok[i] && yok[i] && c.Rows[i].State == StateDone && (!logX || xs[i] > 0) {
			pts = append(pts, plotter.XY{X: xs[i], Y: ys[i]})
			rows = append(rows, i)
		}
	}
	fig.Points = len(pts)
	if len(pts) == 0 {
		return fig, fmt.Errorf("--plot %s:%s: no done member has both values", s.Y, s.X)
	}
	p := plot.New()
	title := s.Y + " against " + s.X
	if c.man.Title != "" {
		title = c.man.Title + ": " + title
	}
	p.Title.Text = title
	p.X.Label.Text, p.Y.Label.Text = s.X, s.Y
	if logX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	}
	p.Add(plotter.NewGrid())
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return fig, err
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(3)
	sc.GlyphStyle.Color = color.RGBA{R: 0x1f, G: 0x55, B: 0xa0, A: 0xff}
	p.Add(sc)
	p.Legend.Add("members", sc)
	p.Legend.Top = true

	ref, label, note := c.reference(s, rows, xs)
	fig.Note = note
	if len(ref) > 0 {
		line, err := plotter.NewLine(ref)
		if err != nil {
			return fig, err
		}
		line.Color = color.RGBA{R: 0xc0, G: 0x30, B: 0x20, A: 0xff}
		line.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
		line.Width = vg.Points(1.5)
		p.Add(line)
		p.Legend.Add(label, line)
		fig.Reference = label
	}
	// Room around the points, and above them for the legend.
	if logX {
		p.X.Min, p.X.Max = p.X.Min/1.15, p.X.Max*1.15
	} else {
		pad := 0.05 * math.Max(p.X.Max-p.X.Min, math.Abs(p.X.Max)*1e-3+1e-300)
		p.X.Min, p.X.Max = p.X.Min-pad, p.X.Max+pad
	}
	span := math.Max(p.Y.Max-p.Y.Min, math.Abs(p.Y.Max)*1e-3+1e-300)
	p.Y.Min, p.Y.Max = p.Y.Min-0.05*span, p.Y.Max+0.25*span
	wt, err := p.WriterTo(7*vg.Inch, 4.5*vg.Inch, "png")
	if err != nil {
		return fig, err
	}
	var b bytes.Buffer
	if _, err := wt.WriteTo(&b); err != nil {
		return fig, err
	}
	return fig, runfolder.WriteFileAtomic(fig.Path, b.Bytes())
}

// reference returns the published scaling for the spec's metric at the
// members' x values, sorted by x, with its legend; or a note why none is
// drawn where one would apply.
func (c *Collection) reference(s PlotSpec, rows []int, xs []float64) (plotter.XYs, string, string) {
	var ref plotter.XYs
	switch s.Y {
	case penetrationKey:
		skipped := 0
		for _, i := range rows {
			sum, err := runfolder.ReadSummary(RunDir(c.dir, c.Rows[i].Name))
			if err != nil || sum.Canopy == nil || sum.Canopy.PredictedPenetrationDepth == nil {
				skipped++
				continue
			}
			ref = append(ref, plotter.XY{X: xs[i], Y: math.Min(sum.Canopy.Height, *sum.Canopy.PredictedPenetrationDepth)})
		}
		note := ""
		if skipped > 0 {
			note = fmt.Sprintf("no 0.23/(C_D a) for %d member(s): it needs a block canopy (height and frontal_area) with a fixed drag coefficient", skipped)
		}
		return sortXY(ref), "min(h, 0.23/(C_D a)), Nepf et al. 2007", note
	case spacingKey, runfolder.KeyRollerSpacingCorrelation:
		for _, i := range rows {
			sum, err := runfolder.ReadSummary(RunDir(c.dir, c.Rows[i].Name))
			if err == nil && sum.Flow.ShearLength != nil {
				ref = append(ref, plotter.XY{X: xs[i], Y: canopy.PredictedRollerSpacing(*sum.Flow.ShearLength)})
			}
		}
		note := ""
		if len(ref) < len(rows) {
			note = "no 8.1 Ls for members without flow.shear_length_m"
		}
		return sortXY(ref), "8.1 Ls, Raupach et al. 1996", note
	}
	return nil, "", ""
}

// sortXY sorts points by x and averages those at the same x (replicates),
// so the scaling draws as one line.
func sortXY(pts plotter.XYs) plotter.XYs {
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].X < pts[j].X })
	var out plotter.XYs
	for i := 0; i < len(pts); {
		j, sum := i, 0.0
		for ; j < len(pts) && pts[j].X == pts[i].X; j++ {
			sum += pts[j].Y
		}
		out = append(out, plotter.XY{X: pts[i].X, Y: sum / float64(j-i)})
		i = j
	}
	return out
}
