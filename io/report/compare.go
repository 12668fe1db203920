package report

import (
	"errors"
	"fmt"
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
//     final profile.csv), each run's canopy height marked in its colour;
//   - spectra.png: the spectra of w at the canopy-top probes of every run,
//     their peaks marked.
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
		return notes, skipf("no run has a velocity profile (profiles.csv or profile.csv)")
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
	p := newPlot("", "f [Hz]", "S_ww [m²/s]")
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = logTicks{}, logTicks{}
	var notes []Note
	var fs, ss [][]float64
	for i, r := range runs {
		sp, err := spectrumOf(r)
		if isSkip(err) {
			notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
			continue
		}
		if err != nil {
			return nil, err
		}
		var f, s []float64
		for k := range sp.freq {
			if sp.freq[k] > 0 && sp.psd[k] > 0 {
				f, s = append(f, sp.freq[k]), append(s, sp.psd[k])
			}
		}
		if len(f) < 2 {
			notes = append(notes, Note{Reason: r.label + " left out: its spectrum of w is zero"})
			continue
		}
		col := RunColour(i)
		l := line(f, s, col, vg.Points(1.8), nil)
		p.Add(l)
		label := r.label
		if at := logInterp(f, s, sp.peak); at > 0 {
			dot, err := plotter.NewScatter(plotter.XYs{{X: sp.peak, Y: at}})
			if err == nil {
				dot.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(4), Shape: draw.CircleGlyph{}}
				p.Add(dot)
			}
			label += ": peak " + fmtG(sp.peak) + " Hz"
		}
		p.Legend.Add(label, l)
		fs, ss = append(fs, f), append(ss, s)
	}
	if len(fs) == 0 {
		return notes, skipf("no run has a spectrum of w (%s, written when the probes hold enough samples after the spin-up)", runfolder.SpectrumFile)
	}
	lo, hi := span(fs...)
	p.X.Min, p.X.Max = lo, hi
	lo, hi = span(ss...)
	p.Y.Min, p.Y.Max = lo/2, hi*2
	p.Legend.Top = true
	p.Legend.XOffs, p.Legend.YOffs = -vg.Points(12), -vg.Points(8)
	title := fmt.Sprintf("Spectra of w at the canopy-top probes of %d runs (Welch, after each run's spin-up; dots: peaks)", len(fs))
	img := render(FigureWidth, FigureHeight, func(c draw.Canvas) {
		c = drawTitle(c, title)
		p.Draw(draw.Crop(c, vg.Points(6), -vg.Points(14), vg.Points(4), 0))
	})
	return notes, writePNG(path, img)
}
