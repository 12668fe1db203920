package sweep

import (
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"rollerbed/canopy"
	"rollerbed/io/report"
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
	var rows []int
	for i := range c.Rows {
		if xok[i] && yok[i] && c.Rows[i].State == StateDone && (!logX || xs[i] > 0) {
			rows = append(rows, i)
		}
	}
	fig.Points = len(rows)
	if len(rows) == 0 {
		return fig, fmt.Errorf("--plot %s:%s: no done member has both values", s.Y, s.X)
	}
	sf := &sweepFigure{
		xlabel: c.axisLabel(s.X),
		ylabel: c.axisLabel(s.Y),
		logX:   logX,
	}
	sf.title = sf.ylabel + " against " + sf.xlabel
	if c.man.Title != "" {
		sf.title = c.man.Title + ": " + sf.title
	}
	var pts plotter.XYs
	for _, i := range rows {
		pts = append(pts, plotter.XY{X: xs[i], Y: ys[i]})
	}
	sf.groups = replicates(pts)
	ref, label, note := c.reference(s, rows, xs)
	fig.Note = note
	if len(ref) > 0 {
		sf.ref, sf.refLabel = ref, label
		fig.Reference = label
	}
	p, key, err := sf.plot()
	if err != nil {
		return fig, err
	}
	return fig, report.WritePlot(fig.Path, sf.title, p, key)
}

// replicateGroup is the members of a sweep that share a parameter value
// (replicates, e.g. differing in the seed only).
type replicateGroup struct {
	X              float64
	Ys             []float64 // the members' values
	Mean, Min, Max float64
}

// replicates groups points by x, in increasing x, with the mean, the
// smallest and the largest y of each group.
func replicates(pts plotter.XYs) []replicateGroup {
	pts = append(plotter.XYs(nil), pts...)
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].X < pts[j].X })
	var out []replicateGroup
	for i := 0; i < len(pts); {
		g := replicateGroup{X: pts[i].X, Min: math.Inf(1), Max: math.Inf(-1)}
		sum := 0.0
		for ; i < len(pts) && pts[i].X == g.X; i++ {
			y := pts[i].Y
			g.Ys = append(g.Ys, y)
			sum += y
			g.Min, g.Max = math.Min(g.Min, y), math.Max(g.Max, y)
		}
		g.Mean = sum / float64(len(g.Ys))
		out = append(out, g)
	}
	return out
}

// sweepFigure is a sweep figure before it is drawn: the members' values
// grouped by parameter value, and the published scaling where one
// applies.
type sweepFigure struct {
	title, xlabel, ylabel string
	logX                  bool
	groups                []replicateGroup
	ref                   plotter.XYs // the scaling at the members' x, nil for none
	refLabel              string
}

// Colours of the sweep figures: the members' values and the published
// scaling, the replicates a pale tint of the members' colour.
var (
	memberColour    = report.RunColour(0)
	replicateColour = color.RGBA{R: 0x8a, G: 0xaa, B: 0xbe, A: 0xff}
	scalingColour   = report.RunColour(1)
)

// plot builds the figure's plot and key. With replicates (two or more
// members at one value) it draws each member as a pale dot and their mean
// as a line through dots with bars from the smallest to the largest
// member; otherwise the members as dots joined by a line.
func (f *sweepFigure) plot() (*plot.Plot, []report.KeyEntry, error) {
	p := report.NewPlot("", f.xlabel, f.ylabel)
	if f.logX {
		report.LogAxis(&p.X)
	}
	var key []report.KeyEntry
	most := 0
	var each, means plotter.XYs
	var bars plotter.YErrors
	for _, g := range f.groups {
		most = max(most, len(g.Ys))
		for _, y := range g.Ys {
			each = append(each, plotter.XY{X: g.X, Y: y})
		}
		means = append(means, plotter.XY{X: g.X, Y: g.Mean})
		bars = append(bars, struct{ Low, High float64 }{g.Mean - g.Min, g.Max - g.Mean})
	}
	if most > 1 {
		sc, err := plotter.NewScatter(each)
		if err != nil {
			return nil, nil, err
		}
		sc.GlyphStyle = draw.GlyphStyle{Color: replicateColour, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
		eb := &plotter.YErrorBars{XYs: means, YErrors: bars}
		eb.LineStyle = draw.LineStyle{Color: memberColour, Width: vg.Points(1.2)}
		eb.CapWidth = vg.Points(10)
		p.Add(eb, sc) // the members over the bars' ends
		key = append(key, report.KeyEntry{Text: "members (replicates at the same value, pale)", Thumb: sc})
		key = append(key, report.KeyEntry{Text: "bars: smallest to largest of the replicates", Thumb: barThumb{eb.LineStyle}})
	}
	l, sc, err := plotter.NewLinePoints(means)
	if err != nil {
		return nil, nil, err
	}
	l.LineStyle = draw.LineStyle{Color: memberColour, Width: vg.Points(1.6)}
	sc.GlyphStyle = draw.GlyphStyle{Color: memberColour, Radius: vg.Points(3.5), Shape: draw.CircleGlyph{}}
	p.Add(l, sc)
	what := "members"
	if most > 1 {
		what = fmt.Sprintf("mean of the replicates (up to %d at a value)", most)
	}
	key = append(key, report.KeyEntry{Text: what, Thumb: sc})
	if len(f.ref) > 0 {
		line, err := plotter.NewLine(f.ref)
		if err != nil {
			return nil, nil, err
		}
		line.LineStyle = draw.LineStyle{Color: scalingColour, Width: vg.Points(1.5), Dashes: []vg.Length{vg.Points(6), vg.Points(3)}}
		p.Add(line)
		key = append(key, report.KeyEntry{Text: f.refLabel, Thumb: line})
	}
	// Room around the points.
	if f.logX {
		p.X.Min, p.X.Max = p.X.Min/1.15, p.X.Max*1.15
	} else {
		pad := 0.05 * math.Max(p.X.Max-p.X.Min, math.Abs(p.X.Max)*1e-3+1e-300)
		p.X.Min, p.X.Max = p.X.Min-pad, p.X.Max+pad
	}
	span := math.Max(p.Y.Max-p.Y.Min, math.Abs(p.Y.Max)*1e-3+1e-300)
	p.Y.Min, p.Y.Max = p.Y.Min-0.05*span, p.Y.Max+0.05*span
	return p, key, nil
}

// barThumb is the key's sample of the range bars: a vertical bar with
// caps.
type barThumb struct{ style draw.LineStyle }

// Thumbnail draws the sample.
func (b barThumb) Thumbnail(c *draw.Canvas) {
	x, lo, hi := c.Center().X, c.Min.Y, c.Max.Y
	cap := vg.Points(4)
	c.StrokeLine2(b.style, x, lo, x, hi)
	c.StrokeLine2(b.style, x-cap, lo, x+cap, lo)
	c.StrokeLine2(b.style, x-cap, hi, x+cap, hi)
}

// axisLabel names a column on an axis: a summary key by its quantity in
// words with its unit in brackets ("penetration depth [m]" for
// flow.penetration_depth_m), a scalar's key with the scalar's name first;
// a varied key of the case by its last part in words and the key itself
// ("frontal area (canopy.frontal_area)").
func (c *Collection) axisLabel(key string) string {
	parts := strings.Split(key, ".")
	last := parts[len(parts)-1]
	if slices.Contains(c.Keys, key) {
		return strings.ReplaceAll(last, "_", " ") + " (" + key + ")"
	}
	words := strings.Split(last, "_")
	unit := runfolder.Unit(key)
	if unit != "" {
		// Leave out the unit words of the suffix, as runfolder.Unit reads them.
		for len(words) > 1 && runfolder.Unit("x_"+words[len(words)-1]) != "" {
			words = words[:len(words)-1]
		}
	}
	name := strings.Join(words, " ")
	if len(parts) == 3 && parts[0] == "scalars" {
		name = parts[1] + " " + name
	}
	if unit != "" {
		name += " [" + unit + "]"
	}
	return name
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
