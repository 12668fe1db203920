package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Comparison holds the numeric summary values of several runs side by
// side: one row per key that is a number in at least one run.
type Comparison struct {
	// Runs names the runs as the table heads them: the folder names, or
	// the paths as given when two folders share a name.
	Runs []string `json:"runs"`
	// Dirs are the run folders as given.
	Dirs []string `json:"dirs"`
	// Titles are the runs' run.title, "" where there is none.
	Titles []string        `json:"titles"`
	Rows   []ComparisonRow `json:"rows"`
}

// ComparisonRow is one summary key across the runs.
type ComparisonRow struct {
	Key  string `json:"key"`
	Unit string `json:"unit"` // see Unit; "" when dimensionless
	// Values holds the value of each run, nil where the run lacks the key
	// or has null there.
	Values []*float64 `json:"values"`
	// RatioToFirst holds each value divided by the first run's (1 for the
	// first run), nil where either is missing or the first is 0.
	RatioToFirst []*float64 `json:"ratio_to_first"`
}

// Compare reads the summary.json of each run folder and lines up every
// numeric key present in any of them, in the order the keys first appear.
func Compare(runDirs []string) (*Comparison, error) {
	if len(runDirs) == 0 {
		return nil, errors.New("compare needs at least one run folder")
	}
	c := &Comparison{Dirs: append([]string(nil), runDirs...)}
	summaries := make([]map[string]float64, len(runDirs))
	var keys []string
	seen := map[string]bool{}
	for i, dir := range runDirs {
		es, err := ReadSummary(dir)
		if err != nil {
			return nil, err
		}
		summaries[i] = map[string]float64{}
		title := ""
		for _, e := range es {
			if e.Key == "run.title" {
				title, _ = e.Value.(string)
			}
			v, ok := e.Number()
			if !ok {
				continue
			}
			summaries[i][e.Key] = v
			if !seen[e.Key] {
				seen[e.Key] = true
				keys = append(keys, e.Key)
			}
		}
		c.Titles = append(c.Titles, title)
	}
	c.Runs = runLabels(runDirs)
	for _, k := range keys {
		row := ComparisonRow{Key: k, Unit: Unit(k)}
		for i := range runDirs {
			v, ok := summaries[i][k]
			if ok && finite(v) {
				row.Values = append(row.Values, &v)
			} else {
				row.Values = append(row.Values, nil)
			}
		}
		for _, v := range row.Values {
			var r *float64
			if first := row.Values[0]; first != nil && v != nil && *first != 0 {
				q := *v / *first
				r = &q
			}
			row.RatioToFirst = append(row.RatioToFirst, r)
		}
		c.Rows = append(c.Rows, row)
	}
	return c, nil
}

// runLabels names runs by their folder names, or by the paths as given when
// two folders share a name.
func runLabels(dirs []string) []string {
	out := make([]string, len(dirs))
	count := map[string]int{}
	for i, d := range dirs {
		out[i] = filepath.Base(filepath.Clean(d))
		count[out[i]]++
	}
	for i, d := range dirs {
		if count[out[i]] > 1 {
			out[i] = filepath.Clean(d)
		}
	}
	for i := range out {
		out[i] = oneLine(out[i])
	}
	return out
}

// RatioHead is the head of the ratio columns of the comparison table.
const RatioHead = "÷ first"

// WriteTable prints the comparison as an aligned table: the key, its unit,
// then each run's value, and after every run but the first a column
// "÷ first" with its value over the first run's. Missing values print as
// "–"; columns are separated by at least two spaces.
func (c *Comparison) WriteTable(w io.Writer) error {
	head := []string{"key", "unit"}
	for i, r := range c.Runs {
		head = append(head, r)
		if i > 0 {
			head = append(head, RatioHead)
		}
	}
	rows := [][]string{head}
	for _, row := range c.Rows {
		unit := row.Unit
		if unit == "" {
			unit = missing
		}
		cells := []string{row.Key, unit}
		for i, v := range row.Values {
			cells = append(cells, numberCell(v, 6))
			if i > 0 {
				cells = append(cells, numberCell(row.RatioToFirst[i], 4))
			}
		}
		rows = append(rows, cells)
	}
	return writeAligned(w, rows)
}

func numberCell(v *float64, digits int) string {
	if v == nil {
		return missing
	}
	return formatNumber(*v, digits)
}

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
	labels := runLabels(runDirs)
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
			z, u = d.z, d.u
		} else if !isSkip(err) {
			return nil, err
		} else {
			t, err := readTable(r.dir, "profile.csv", "written when the run stops")
			if isSkip(err) {
				notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
				continue
			}
			if err != nil {
				return nil, err
			}
			c, err := columns(t, filepath.Join(r.dir, "profile.csv"), "z", "U")
			if err != nil {
				return nil, err
			}
			z, u, what = c[0], c[1], "at the end, no statistics"
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
		sp, err := spectrumOf(r.dir, r.spinUp())
		if isSkip(err) {
			notes = append(notes, Note{Reason: r.label + " left out: " + err.Error()})
			continue
		}
		if err != nil {
			return nil, err
		}
		var f, s []float64
		for k := range sp.Freq {
			if sp.Freq[k] > 0 && sp.PSD[k] > 0 {
				f, s = append(f, sp.Freq[k]), append(s, sp.PSD[k])
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
		return notes, skipf("no run has a spectrum of w (probes.csv with enough samples after the spin-up)")
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
