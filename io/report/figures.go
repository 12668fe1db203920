package report

import (
	"errors"
	"fmt"
	"image"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Note says why a figure was not written: the run folder lacks its data.
type Note struct {
	Figure string // file name, e.g. "spectrum.png"
	Reason string
}

// String reads "spectrum.png skipped: REASON".
func (n Note) String() string { return n.Figure + " skipped: " + n.Reason }

// figure is one figure of a run folder and how to make it.
type figure struct {
	name string
	make func(r *runData, path string) error
}

// Figures writes the figures that the run folder runDir has data for into
// runDir/figures and returns their paths. It is WriteFigures without the
// notes on the figures left out.
func Figures(runDir string) ([]string, error) {
	paths, _, err := WriteFigures(runDir)
	return paths, err
}

// Options choose what the figures of a run show. The zero value gives the
// defaults.
type Options struct {
	// Animate is the snapshot field that rollers.gif animates: "" or
	// Vorticity for the vorticity, else the name of another field of the
	// snapshots ("u", "w", "p", "nu_t" or a scalar's name, e.g. a dye).
	Animate string
}

// WriteFigures writes the figures of a run folder with the default
// Options; see WriteFiguresWith.
func WriteFigures(runDir string) ([]string, []Note, error) {
	return WriteFiguresWith(runDir, Options{})
}

// WriteFiguresWith writes into runDir/figures every figure the run folder has
// data for, and returns their paths and a note for each figure left out for
// want of data (no snapshots, no statistics yet). It works on a finished
// run and on an interrupted or still running one. The figures:
//
//   - vorticity.png: the last snapshot's vorticity over the slice, with the
//     canopy outline (flexible blades bent to the height of the time
//     series at the snapshot's time) and a colour bar (FigureWidth wide, as high as the
//     slice needs);
//   - profiles.png: the time-mean profiles of profiles.csv (U, the shear
//     stress, the turbulent kinetic energy) with the canopy top and the
//     penetration depth, measured and predicted;
//   - spectrum.png: the Welch spectrum of w at the canopy-top probes after
//     the spin-up that the run wrote (spectrum.csv), with its peak;
//   - timeseries.png: the bulk velocity and the pressure gradient of
//     timeseries.csv, and the bent height of flexible blades;
//   - uptake.png: element uptake per unit surface area against height, per
//     scalar, from uptake.csv;
//   - scalars.png: the time-mean concentration profile of each scalar
//     against height, with the canopy top, from scalars.csv;
//   - section.png (a slab only): the spanwise vorticity in the x–z
//     section at y = 0 of the last snapshot, beside vorticity.png's span
//     average;
//   - plan.png (a slab only): the vertical velocity w at the canopy top
//     (mid-depth without a canopy) seen from above, over x and y, at the
//     last snapshot: straight rollers are bands across the span, broken
//     ones patches;
//   - breakup.gif (a slab only): the plan view over the snapshots, as
//     rollers.gif is, so that the rollers are seen to bend and break;
//   - phases.png: the velocity and shear-stress profiles of every phase of
//     a forcing with waves or tides (phase_profiles.csv), with the bent
//     height of flexible blades by phase (phase_cycle.csv); not attempted
//     when the summary shows a steady forcing;
//   - rollers.gif: an animation of the vorticity (or of the field
//     o.Animate, e.g. a dye) over the snapshots from the first, so that
//     the roll-up shows (at most 60 frames evenly spread, about 5 s),
//     AnimationWidth wide.
//
// A figure whose data is damaged, or an o.Animate field that no snapshot
// holds, is reported in the error, and the others are still written.
func WriteFiguresWith(runDir string, o Options) ([]string, []Note, error) {
	r, err := loadRun(runDir)
	if err != nil {
		return nil, nil, err
	}
	dir := filepath.Join(runDir, runfolder.FiguresDir)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, nil, fmt.Errorf("cannot create the figures folder: %w", err)
	}
	var sl *slice
	var slErr error
	withSlice := func(fn func(*runData, *slice, string) error) func(*runData, string) error {
		return func(r *runData, path string) error {
			if sl == nil && slErr == nil {
				sl, slErr = loadSlice(r)
			}
			if slErr != nil {
				return slErr
			}
			return fn(r, sl, path)
		}
	}
	// A slab's own figures say nothing when the fields cannot be read:
	// vorticity.png already says why.
	withSlab := func(fn func(*runData, *slice, string) error) func(*runData, string) error {
		inner := withSlice(fn)
		return func(r *runData, path string) error {
			err := inner(r, path)
			if err != nil && err == slErr {
				return errSliceRun
			}
			return err
		}
	}
	figs := []figure{
		{"vorticity.png", withSlice(vorticityFigure)},
		{"profiles.png", profilesFigure},
		{"spectrum.png", spectrumFigure},
		{"timeseries.png", timeseriesFigure},
		{"uptake.png", uptakeFigure},
		{"scalars.png", scalarsFigure},
		{"section.png", withSlab(sectionFigure)},
		{"plan.png", withSlab(planFigure)},
		{"breakup.gif", withSlab(planAnimation)},
		{"rollers.gif", withSlice(func(r *runData, s *slice, path string) error {
			field := o.Animate
			if field == "" {
				field = Vorticity
			}
			return animation(r, s, field, path)
		})},
	}
	if r.sum == nil || r.sum.Phases != nil {
		// A steady forcing has no phases, and no note says so.
		figs = append(figs[:len(figs)-1], figure{"phases.png", phasesFigure}, figs[len(figs)-1])
	}
	var paths []string
	var notes []Note
	var errs []error
	for _, f := range figs {
		path := filepath.Join(dir, f.name)
		switch err := f.make(r, path); {
		case err == nil:
			paths = append(paths, path)
		case errors.Is(err, errSliceRun):
		case isSkip(err):
			notes = append(notes, Note{f.name, err.Error()})
		default:
			errs = append(errs, fmt.Errorf("%s: %w", f.name, err))
		}
	}
	return paths, notes, errors.Join(errs...)
}

// readProfiles reads profiles.csv, or says why there is none.
func readProfiles(r *runData) (runfolder.ProfilesTable, error) {
	if err := present(r.dir, runfolder.ProfilesFile, noStatistics(r)); err != nil {
		return runfolder.ProfilesTable{}, err
	}
	t, err := runfolder.ReadProfiles(r.dir)
	if err != nil {
		return runfolder.ProfilesTable{}, err
	}
	if len(t.Z) < 2 {
		return runfolder.ProfilesTable{}, skipf("%s holds %s; a profile needs 2 or more", runfolder.ProfilesFile, rowsText(len(t.Z)))
	}
	return t, nil
}

// noStatistics says why a run has no statistics.
func noStatistics(r *runData) string {
	if sp := r.spinUp(); sp > 0 {
		return fmt.Sprintf("no statistics were gathered: the run stopped before time.spin_up = %g s", sp)
	}
	return "no statistics were gathered: the run stopped before time.spin_up"
}

// topOf returns the depth of the domain: from the case, else estimated
// from the top cell centres.
func topOf(r *runData, z []float64) float64 {
	if d := r.depth(); d > 0 {
		return d
	}
	n := len(z)
	return z[n-1] + 0.5*(z[n-1]-z[n-2])
}

// profilesFigure writes profiles.png: U, −(u′w′ + subgrid) and the TKE
// against z in three panels, with the canopy top and the penetration
// depth as levels.
func profilesFigure(r *runData, path string) error {
	d, err := readProfiles(r)
	if err != nil {
		return err
	}
	n := len(d.Z)
	total, resolved := make([]float64, n), make([]float64, n)
	for k := range n {
		total[k] = -(d.UW[k] + d.Subgrid[k])
		resolved[k] = -d.UW[k]
	}
	top := topOf(r, d.Z)
	pu := newPlot("mean velocity", "U [m/s]", "z [m]")
	ps := newPlot("shear stress", "−(u'w' + subgrid) [m²/s²]", "z [m]")
	pk := newPlot("turbulent kinetic energy", "k [m²/s²]", "z [m]")
	lu := line(d.U, d.Z, RunColour(0), vg.Points(2), nil)
	lt := line(total, d.Z, RunColour(1), vg.Points(2), nil)
	lr := line(resolved, d.Z, RunColour(1), vg.Points(1.2), dashes)
	lk := line(d.TKE, d.Z, RunColour(2), vg.Points(2), nil)
	pu.Add(lu)
	ps.Add(lt, lr)
	pk.Add(lk)
	lo, hi := span(d.U)
	padRange(&pu.X, lo, hi, true)
	lo, hi = span(total, resolved)
	padRange(&ps.X, lo, hi, true)
	lo, hi = span(d.TKE)
	padRange(&pk.X, lo, hi, true)

	curves := legendBox()
	curves.Add("U, time mean", lu)
	curves.Add("−(u'w' + subgrid stress), total", lt)
	curves.Add("−u'w', resolved part", lr)
	curves.Add("k, resolved turbulent kinetic energy", lk)
	levels := legendBox()
	var marks []*level
	var remarks []string
	h := r.canopyHeight()
	if finite(h) {
		l := hline(h, canopyColour, vg.Points(1.6), nil)
		marks = append(marks, l)
		levels.Add("canopy top h = "+fmtG(h)+" m", l)
		if de := r.penetrationDepth(); finite(de) {
			l := hline(h-de, depthColour, vg.Points(1.6), dots2)
			marks = append(marks, l)
			levels.Add("h − δe measured (stress down to 10 % of its value at h), δe = "+fmtG(de)+" m", l)
		}
		if de, why := r.predictedPenetration(); finite(de) {
			if de < h {
				l := hline(h-de, nepfColour, vg.Points(1.6), dashDot)
				marks = append(marks, l)
				levels.Add("h − δe predicted, δe = 0.23/(C_D a) = "+fmtG(de)+" m (Nepf et al. 2007)", l)
			} else {
				remarks = append(remarks, "0.23/(C_D a) = "+fmtG(de)+" m ≥ h: the stress is predicted to reach the bed (Nepf et al. 2007)")
			}
		} else {
			remarks = append(remarks, "no predicted δe: "+why)
		}
	}
	for _, p := range []*plot.Plot{pu, ps, pk} {
		p.Y.Min, p.Y.Max = 0, top
		for _, m := range marks {
			p.Add(m)
		}
	}
	title := "Time-mean profiles — " + r.title()
	sub := "averaged after the spin-up"
	if st := r.statsTime(); finite(st) {
		sub = fmt.Sprintf("averaged over %s s after the spin-up of %s s", fmtG(st), fmtG(r.spinUp()))
	}
	for _, s := range remarks {
		sub += "; " + s
	}
	title += "\n" + sub
	img := render(FigureWidth, FigureHeight, func(c draw.Canvas) {
		c = drawTitle(c, title)
		foot := legendHeight(max(4, len(marks)))
		panels := draw.Crop(c, 0, 0, foot, 0)
		tiles := draw.Tiles{Rows: 1, Cols: 3, PadX: vg.Points(10), PadLeft: vg.Points(4), PadRight: vg.Points(10)}
		plots := [][]*plot.Plot{{pu, ps, pk}}
		cs := plot.Align(plots, tiles, panels)
		for i, p := range plots[0] {
			p.Draw(cs[0][i])
		}
		fc := c
		fc.Max.Y = c.Min.Y + foot
		fc.Min.X += vg.Points(12)
		curves.Draw(draw.Crop(fc, 0, -(fc.Max.X-fc.Min.X)*0.62, 0, 0))
		levels.Draw(draw.Crop(fc, (fc.Max.X-fc.Min.X)*0.36, 0, 0, 0))
	})
	return writePNG(path, img)
}

// spectrumFigure writes spectrum.png: the spectrum of w at the canopy-top
// probes, log–log, with its peak.
func spectrumFigure(r *runData, path string) error {
	sp, err := spectrumOf(r)
	if err != nil {
		return err
	}
	f, s := positive(sp.freq, sp.psd)
	if len(f) < 2 {
		return skipf("the spectrum of w is zero: the flow at the probes is steady")
	}
	title := fmt.Sprintf("Power spectral density S_ww of w %s, mean of %d probes — %s\nWelch: Hann window, half-overlapping segments of %d samples, Δt = %s s, t ≥ %s s (after the spin-up)",
		probesWhere(r, sp.z), sp.probes, r.title(), sp.segment, fmtG(sp.dt), fmtG(r.spinUp()))
	p := newPlot(title, "f [Hz]", "S_ww [m²/s]")
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = logTicks{}, logTicks{}
	l := line(f, s, RunColour(0), vg.Points(1.8), nil)
	p.Add(l)
	p.Legend.Add("S_ww(f)", l)
	if sp.peak > 0 {
		v := vline(sp.peak, RunColour(1), vg.Points(1.4), dashes)
		p.Add(v)
		label := "peak f = " + fmtG(sp.peak) + " Hz"
		if lo, hi := f[0], f[len(f)-1]; sp.peak < lo || sp.peak > hi {
			label += " (outside the resolved band)"
		}
		p.Legend.Add(label, v)
		dot, _ := peakMark(f, s, sp.peak, RunColour(1))
		p.Add(dot)
	}
	p.Legend.Top = true
	p.Legend.XOffs, p.Legend.YOffs = -vg.Points(12), -vg.Points(8)
	lo, hi := span(f, peakRoom(f, sp.peak))
	p.X.Min, p.X.Max = lo, hi
	lo, hi = span(s)
	p.Y.Min, p.Y.Max = lo/2, hi*2
	img := render(FigureWidth, FigureHeight, func(c draw.Canvas) {
		p.Draw(draw.Crop(c, vg.Points(6), -vg.Points(12), vg.Points(4), -vg.Points(6)))
	})
	return writePNG(path, img)
}

// logInterp interpolates y(x) linearly in log–log at v, 0 outside x.
func logInterp(x, y []float64, v float64) float64 {
	for i := 1; i < len(x); i++ {
		if v >= x[i-1] && v <= x[i] {
			t := math.Log(v/x[i-1]) / math.Log(x[i]/x[i-1])
			return math.Exp(math.Log(y[i-1]) + t*math.Log(y[i]/y[i-1]))
		}
	}
	return 0
}

// timeseriesFigure writes timeseries.png: bulk velocity and pressure
// gradient against time, the spin-up marked.
func timeseriesFigure(r *runData, path string) error {
	if err := present(r.dir, runfolder.TimeSeriesFile, "written when the run stops"); err != nil {
		return err
	}
	t, err := runfolder.ReadTimeSeries(r.dir)
	if err != nil {
		return err
	}
	if len(t.T) < 2 {
		return skipf("%s holds %s; a time series needs 2 or more (lower output.profile_every, or run longer)", runfolder.TimeSeriesFile, rowsText(len(t.T)))
	}
	return writePNG(path, timeseriesPanels(r, t).render())
}

// panels is a figure of plots stacked in one column under a title, with
// a key (legend) in a strip of its own between the title and the plots,
// so that it covers neither data nor frames.
type panels struct {
	title string
	plots []*plot.Plot
	cols  int // plots side by side; 0 stacks them in one column
	key   plot.Legend
	keys  []string // the text of the key's entries
}

// addKey adds an entry to the key.
func (f *panels) addKey(text string, thumb plot.Thumbnailer) {
	f.key.Add(text, thumb)
	f.keys = append(f.keys, text)
}

// keyArea returns the strip of canvas cv (below the title) that the key
// takes, and the canvas left for the plots.
func (f *panels) keyArea(cv draw.Canvas) (key, rest draw.Canvas) {
	cv = drawTitleSpace(cv, f.title)
	if len(f.keys) == 0 {
		return draw.Canvas{}, cv
	}
	h := legendHeight(len(f.keys))
	key = draw.Crop(cv, vg.Points(60), 0, 0, 0)
	key.Min.Y = key.Max.Y - h
	return key, draw.Crop(cv, 0, 0, 0, -h)
}

// render draws the figure at FigureWidth × FigureHeight.
func (f *panels) render() image.Image {
	return render(FigureWidth, FigureHeight, func(cv draw.Canvas) {
		drawTitle(cv, f.title)
		kc, cv := f.keyArea(cv)
		if len(f.keys) > 0 {
			f.key.Draw(kc)
		}
		cols := max(1, f.cols)
		rows := (len(f.plots) + cols - 1) / cols
		tiles := draw.Tiles{Rows: rows, Cols: cols, PadX: vg.Points(14), PadY: vg.Points(12), PadLeft: vg.Points(4), PadRight: vg.Points(14), PadBottom: vg.Points(4)}
		plots := make([][]*plot.Plot, rows)
		for i := range plots {
			plots[i] = make([]*plot.Plot, cols)
		}
		for i, p := range f.plots {
			plots[i/cols][i%cols] = p
		}
		cs := plot.Align(plots, tiles, cv)
		for i, p := range f.plots {
			p.Draw(cs[i/cols][i%cols])
		}
	})
}

// timeseriesPanels lays out timeseries.png: the bulk velocity and the
// pressure gradient against time, each with the end of the spin-up.
func timeseriesPanels(r *runData, t runfolder.TimeSeriesTable) *panels {
	f := &panels{title: "Bulk velocity and driving pressure gradient — " + r.title(), key: legendBox()}
	c := [][]float64{t.T, t.Bulk, t.Gradient}
	pb := newPlot("", "t [s]", "bulk velocity [m/s]")
	pg := newPlot("", "t [s]", "pressure gradient Π [m/s²]")
	pb.Add(line(c[0], c[1], RunColour(0), vg.Points(1.8), nil))
	pg.Add(line(c[0], c[2], RunColour(1), vg.Points(1.8), nil))
	lo, hi := span(c[0])
	for i, p := range []*plot.Plot{pb, pg} {
		p.X.Min, p.X.Max = lo, hi
		l, h := span(c[i+1])
		padRange(&p.Y, l, h, false)
		if su := r.spinUp(); su > lo && su < hi {
			v := vline(su, canopyColour, vg.Points(1.2), dashes)
			p.Add(v)
			if i == 0 {
				f.addKey("end of the spin-up, t = "+fmtG(su)+" s (statistics are taken after it)", v)
			}
		}
	}
	f.plots = []*plot.Plot{pb, pg}
	if t.BentHeight != nil {
		ph := newPlot("", "t [s]", "bent height of the blades [m]")
		ph.Add(line(c[0], t.BentHeight, RunColour(2), vg.Points(1.8), nil))
		ph.X.Min, ph.X.Max = lo, hi
		l, h := span(t.BentHeight)
		padRange(&ph.Y, l, h, true)
		f.plots = append(f.plots, ph)
		f.title = "Bulk velocity, driving pressure gradient and bent height — " + r.title()
	}
	return f
}

// rowsText says how many rows a table has: "1 row", "3 rows".
func rowsText(n int) string {
	if n == 1 {
		return "1 row"
	}
	return fmt.Sprintf("%d rows", n)
}
