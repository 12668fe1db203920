package report

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// CompareFigures writes the overlay figures of several runs into outDir
// (created when missing) and returns their paths and notes on what was
// left out:
//
//   - profiles.png: the mean velocity U(z) of every run on one plot, the
//     time mean of profiles.csv (or, for a run without statistics, the
//     final_profile.csv), each run's canopy height marked in its colour;
//   - spectra.png: the spectra of w at the probes of every run, labelled
//     with the probes' height (and "canopy top" where they are there),
//     their peaks marked with dots;
//   - scalars.png: the time-mean concentration profiles of scalars.csv,
//     one panel per scalar, every run that has the scalar in its colour;
//   - uptake.png: the element uptake per surface area by height of
//     uptake.csv, likewise.
//
// An overlay that no run has data for is left out with a note.
func CompareFigures(runDirs []string, outDir string) ([]string, []Note, error) {
	runs := make([]*runData, len(runDirs))
	for i, d := range runDirs {
		r, err := loadRun(d)
		if err != nil {
			return nil, nil, err
		}
		runs[i] = r
	}
	labels := runfolder.RunLabels(runDirs)
	for i, r := range runs {
		r.label = labels[i]
	}
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		return nil, nil, fmt.Errorf("cannot create the figures folder: %w", err)
	}
	var paths []string
	var notes []Note
	var errs []error
	for _, f := range []struct {
		name string
		make func([]*runData, string) ([]Note, error)
	}{
		{"profiles.png", overlayProfiles},
		{"spectra.png", overlaySpectra},
		{"scalars.png", overlayScalars},
		{"uptake.png", overlayUptake},
	} {
		path := filepath.Join(outDir, f.name)
		ns, err := f.make(runs, path)
		for _, n := range ns {
			notes = append(notes, Note{f.name, n.Reason})
		}
		switch {
		case err == nil:
			paths = append(paths, path)
		case isSkip(err):
			notes = append(notes, Note{f.name, err.Error()})
		default:
			errs = append(errs, fmt.Errorf("%s: %w", f.name, err))
		}
	}
	return paths, notes, errors.Join(errs...)
}

// overlayProfiles draws the U profiles of all runs.
func overlayProfiles(runs []*runData, path string) ([]Note, error) {
	p := newPlot("", "U [m/s]", "z [m]")
	legend := legendBox()
	var notes []Note
	var all [][]float64
	top, drawn, entries := 0.0, 0, 0
	for i, r := range runs {
		var z, u []float64
		what := "time mean"
		if d, err := readProfiles(r); err == nil {
			z, u = d.Z, d.U
		} else if !isSkip(err) {
			return nil, err
		} else {
			if err := present(r.dir, runfolder.ProfileFile, "written when the run stops"); err != nil {
				notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
				continue
			}
			t, err := runfolder.ReadProfile(r.dir)
			if err != nil {
				return nil, err
			}
			z, u, what = t.Z, t.U, "at the end, no statistics"
		}
		if len(z) < 2 {
			notes = append(notes, Note{Reason: r.label + " left out: its profile has fewer than 2 levels"})
			continue
		}
		col := RunColour(i)
		l := line(u, z, col, vg.Points(2), nil)
		p.Add(l)
		legend.Add(r.label+": U, "+what, l)
		entries++
		all = append(all, u)
		top = math.Max(top, topOf(r, z))
		if h := r.canopyHeight(); finite(h) {
			m := hline(h, col, vg.Points(1.2), dashes)
			p.Add(m)
			legend.Add(r.label+": canopy top h = "+fmtG(h)+" m", m)
			entries++
		}
		drawn++
	}
	if drawn == 0 {
		return notes, skipf("no run has a velocity profile (%s or %s)", runfolder.ProfilesFile, runfolder.ProfileFile)
	}
	lo, hi := span(all...)
	padRange(&p.X, lo, hi, true)
	p.Y.Min, p.Y.Max = 0, top
	title := fmt.Sprintf("Mean velocity profiles of %d runs", drawn)
	img := render(FigureWidth, FigureHeight, func(c draw.Canvas) {
		c = drawTitle(c, title)
		foot := legendHeight(entries)
		p.Draw(draw.Crop(c, vg.Points(6), -vg.Points(14), foot, 0))
		fc := c
		fc.Max.Y = c.Min.Y + foot
		fc.Min.X += vg.Points(12)
		legend.Draw(fc)
	})
	return notes, writePNG(path, img)
}

// overlaySpectra draws the w spectra of all runs.
func overlaySpectra(runs []*runData, path string) ([]Note, error) {
	sc, notes, err := spectraPlot(runs)
	if err != nil {
		return notes, err
	}
	img := render(FigureWidth, FigureHeight, func(c draw.Canvas) {
		c = drawTitle(c, sc.title)
		sc.p.Draw(draw.Crop(c, vg.Points(6), -vg.Points(14), vg.Points(4), 0))
	})
	return notes, writePNG(path, img)
}

// spectraContent is spectra.png before it is drawn.
type spectraContent struct {
	p      *plot.Plot
	title  string
	labels []string           // legend text, one per run drawn
	peaks  []*plotter.Scatter // the peak marks, one per run with a peak
}

// spectraPlot builds the plot of the w spectra of all runs: each run's
// spectrum in its colour, labelled with where its probes are and its
// peak, the peak a dot on the curve.
func spectraPlot(runs []*runData) (*spectraContent, []Note, error) {
	p := newPlot("", "f [Hz]", "S_ww [m²/s]")
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = logTicks{}, logTicks{}
	sc := &spectraContent{p: p}
	var notes []Note
	var fs, ss [][]float64
	for i, r := range runs {
		sp, err := spectrumOf(r)
		if isSkip(err) {
			notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
			continue
		}
		if err != nil {
			return nil, nil, err
		}
		f, s := positive(sp.freq, sp.psd)
		if len(f) < 2 {
			notes = append(notes, Note{Reason: r.label + " left out: its spectrum of w is zero"})
			continue
		}
		col := RunColour(i)
		l := line(f, s, col, vg.Points(1.8), nil)
		p.Add(l)
		label := r.label + ": probes " + probesWhere(r, sp.z)
		if sp.peak > 0 {
			dot, in := peakMark(f, s, sp.peak, col)
			p.Add(dot)
			sc.peaks = append(sc.peaks, dot)
			label += "; peak " + fmtG(sp.peak) + " Hz"
			if !in {
				label += " (ring: outside the resolved band)"
			}
			f = append(f, peakRoom(f, sp.peak)...) // keep the peak on the axis
		}
		p.Legend.Add(label, l)
		sc.labels = append(sc.labels, label)
		fs, ss = append(fs, f), append(ss, s)
	}
	if len(fs) == 0 {
		return nil, notes, skipf("no run has a spectrum of w (%s, written when the probes hold enough samples after the spin-up)", runfolder.SpectrumFile)
	}
	lo, hi := span(fs...)
	p.X.Min, p.X.Max = lo, hi
	lo, hi = span(ss...)
	p.Y.Min, p.Y.Max = lo/2, hi*2
	p.Legend.Top = true
	p.Legend.XOffs, p.Legend.YOffs = -vg.Points(12), -vg.Points(8)
	sc.title = fmt.Sprintf("Spectra of w at the probes of %d runs (Welch, after each run's spin-up; dots: peaks; rings: peaks outside the resolved band)", len(fs))
	return sc, notes, nil
}

// peakMark returns the mark of a spectrum's peak at frequency peak (Hz):
// a dot on the curve S(f) when the peak lies within the resolved band of
// f, else a ring at the density of the nearest end of the band; and
// whether it lies within.
func peakMark(f, s []float64, peak float64, col color.Color) (*plotter.Scatter, bool) {
	at := logInterp(f, s, peak)
	in := at > 0
	shape := draw.GlyphDrawer(draw.CircleGlyph{})
	if !in {
		at = s[0]
		if peak > f[len(f)-1] {
			at = s[len(s)-1]
		}
		shape = draw.RingGlyph{}
	}
	dot := &plotter.Scatter{XYs: plotter.XYs{{X: peak, Y: at}}}
	dot.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(4.5), Shape: shape}
	return dot, in
}

// peakRoom returns the frequency the axis must reach so that a peak
// outside the band f shows clear of the frame (10 % beyond it on the log
// axis), nothing for a peak within the band or none (0).
func peakRoom(f []float64, peak float64) []float64 {
	switch {
	case !(peak > 0) || len(f) == 0:
		return nil
	case peak < f[0]:
		return []float64{peak / 1.1}
	case peak > f[len(f)-1]:
		return []float64{peak * 1.1}
	}
	return nil
}

// positive keeps the pairs of a spectrum where f and S are both above 0,
// which a log–log plot can draw.
func positive(freq, psd []float64) (f, s []float64) {
	for k := range freq {
		if freq[k] > 0 && psd[k] > 0 {
			f, s = append(f, freq[k]), append(s, psd[k])
		}
	}
	return f, s
}

// probesWhere says where a run's probes are: "at z = 0.08 m (canopy top)"
// when they are within 1 % of the depth of the canopy top, "at z = 0.1 m"
// elsewhere, "at an unknown height" when the summary does not say.
func probesWhere(r *runData, z float64) string {
	if !finite(z) || z <= 0 {
		return "at an unknown height"
	}
	where := "at z = " + fmtG(z) + " m"
	h, tol := r.canopyHeight(), 0.01*z
	if d := r.depth(); finite(d) {
		tol = 0.01 * d
	}
	if finite(h) && math.Abs(z-h) <= tol {
		where += " (canopy top)"
	}
	return where
}
