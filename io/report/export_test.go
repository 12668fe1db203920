package report

import (
	"math"
	"rollerbed/io/runfolder"
	"strings"

	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// VorticityFigureSize returns the pixel size that vorticity.png of the run
// folder dir should have, for the tests of package report_test.
func VorticityFigureSize(dir string) (w, h int, err error) {
	r, err := loadRun(dir)
	if err != nil {
		return 0, 0, err
	}
	s, err := loadSlice(r)
	if err != nil {
		return 0, 0, err
	}
	p, err := lastPicture(r, s)
	if err != nil {
		return 0, 0, err
	}
	return p.lay.width, p.lay.height, nil
}

// SpectrumPeak returns the peak frequency of the spectrum that
// spectrum.png of the run folder dir shows.
func SpectrumPeak(dir string) (float64, error) {
	r, err := loadRun(dir)
	if err != nil {
		return 0, err
	}
	sp, err := spectrumOf(r)
	return sp.peak, err
}

// Animation is what rollers.gif of a field shows, for the tests of
// package report_test.
type Animation struct {
	Times     []float64 // s, of the frames
	Titles    []string  // as drawn, broken into lines
	Label     string    // colour bar
	Diverging bool
	// Overflow is the most that a title line is wider than the map it
	// is centred over, in points; at most 0 when every line fits.
	Overflow float64
}

// AnimationOf returns what rollers.gif of field shows for run folder dir.
func AnimationOf(dir, field string) (Animation, error) {
	r, err := loadRun(dir)
	if err != nil {
		return Animation{}, err
	}
	s, err := loadSlice(r)
	if err != nil {
		return Animation{}, err
	}
	a, err := animationOf(r, s, field)
	if err != nil {
		return Animation{}, err
	}
	out := Animation{Label: a.label, Diverging: a.scale.diverging, Overflow: math.Inf(-1)}
	for i, sn := range a.frames {
		fr := mapFrame{scale: a.scale, label: a.label, title: a.titles[i]}
		lay := layoutFor(s.grid, AnimationWidth, fr)
		m, _ := mapPlots(s.grid, fr, lay.width, lay.barWidth)
		room := px(float64(lay.width)) - lay.barWidth
		for _, l := range strings.Split(m.Title.Text, "\n") {
			out.Overflow = math.Max(out.Overflow, float64(m.Title.TextStyle.Width(l)-room))
		}
		out.Times = append(out.Times, sn.Time)
		out.Titles = append(out.Titles, m.Title.Text)
	}
	return out, nil
}

// Panels is what a figure of panels under a key shows.
type Panels struct {
	Title string
	Keys  []string
	// KeyClear says that the key's strip lies above every plot's area.
	KeyClear bool
	// XTicks are the labelled ticks of each plot's x axis.
	XTicks [][]string
}

// panelsOf describes f as drawn at FigureWidth × FigureHeight.
func panelsOf(f *panels) Panels {
	out := Panels{Title: f.title, Keys: f.keys, KeyClear: true}
	cv := draw.New(vgimg.NewWith(vgimg.UseWH(px(FigureWidth), px(FigureHeight)), vgimg.UseDPI(dpi)))
	key, rest := f.keyArea(cv)
	for _, p := range f.plots {
		if len(f.keys) > 0 && key.Min.Y < rest.Max.Y {
			out.KeyClear = false
		}
		var ticks []string
		for _, t := range p.X.Tick.Marker.Ticks(p.X.Min, p.X.Max) {
			if t.Label != "" {
				ticks = append(ticks, t.Label)
			}
		}
		out.XTicks = append(out.XTicks, ticks)
	}
	return out
}

// TimeseriesPanels returns what timeseries.png of run folder dir shows.
func TimeseriesPanels(dir string) (Panels, error) {
	r, err := loadRun(dir)
	if err != nil {
		return Panels{}, err
	}
	t, err := runfolder.ReadTimeSeries(dir)
	if err != nil {
		return Panels{}, err
	}
	return panelsOf(timeseriesPanels(r, t)), nil
}

// ScalarPanels returns what scalars.png of run folder dir shows, and
// the curves of each panel: the panel's title and its x values.
func ScalarPanels(dir string) (Panels, []string, [][]float64, error) {
	r, err := loadRun(dir)
	if err != nil {
		return Panels{}, nil, nil, err
	}
	s, err := readScalarMeans(r)
	if err != nil {
		return Panels{}, nil, nil, err
	}
	f := scalarPanels(r, s)
	var titles []string
	for _, p := range f.plots {
		titles = append(titles, p.Title.Text)
	}
	return panelsOf(f), titles, s.values, nil
}

// Spectra is what spectra.png of compared runs shows.
type Spectra struct {
	Title  string
	Labels []string
	Peaks  []SpectrumPeakMark
}

// SpectrumPeakMark is the mark of one run's peak.
type SpectrumPeakMark struct {
	F, S float64 // Hz, m²/s
	Dot  bool    // a filled dot (within the band), else a ring
}

// SpectraOf returns what spectra.png of the runs dirs shows.
func SpectraOf(dirs ...string) (Spectra, error) {
	var runs []*runData
	for _, d := range dirs {
		r, err := loadRun(d)
		if err != nil {
			return Spectra{}, err
		}
		runs = append(runs, r)
	}
	sc, _, err := spectraPlot(runs)
	if err != nil {
		return Spectra{}, err
	}
	out := Spectra{Title: sc.title, Labels: sc.labels}
	for _, p := range sc.peaks {
		_, dot := p.GlyphStyle.Shape.(draw.CircleGlyph)
		out.Peaks = append(out.Peaks, SpectrumPeakMark{F: p.XYs[0].X, S: p.XYs[0].Y, Dot: dot})
	}
	return out, nil
}

// UptakePanels returns what uptake.png of run folder dir shows.
func UptakePanels(dir string) (Panels, error) {
	r, err := loadRun(dir)
	if err != nil {
		return Panels{}, err
	}
	s, err := readUptakePerArea(r)
	if err != nil {
		return Panels{}, err
	}
	return panelsOf(uptakePanels(r, s)), nil
}
