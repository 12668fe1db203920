package livepage

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
)

// Folder makes Views of a run folder from its files: the newest snapshot
// of fields.h5, summary.json, case.toml and run.log. It reads the files
// again only when they have changed.
type Folder struct {
	Dir string
	// Scalar names the scalar to map besides the vorticity; "" for the
	// first the snapshots hold.
	Scalar string

	stamp   string // sizes and times of the files last read
	grid    *h5.GridInfo
	frontal []float64
	view    *View
	// seen is the simulated time of the newest snapshot and when it was
	// first seen (wall clock), for the rate of progress.
	seen []sighting
}

type sighting struct {
	t    float64
	wall time.Time
}

// warningMark starts the lines of run.log that hold a warning.
const warningMark = "warning: "

// Follow publishes a View of the run folder dir at once and again each
// time its files change, checking every interval, until ctx ends. It
// returns an error at once when dir is not a run folder.
func Follow(ctx context.Context, f *Folder, every time.Duration, publish func(*View)) error {
	if err := runfolder.Check(f.Dir); err != nil {
		return err
	}
	tick := time.NewTicker(every)
	defer tick.Stop()
	for {
		if v, changed := f.Read(); changed {
			publish(v)
		}
		select {
		case <-ctx.Done():
			return nil
		case <-tick.C:
		}
	}
}

// Read returns the View of the folder and whether it changed since the
// last Read. A file that cannot be read yet (a run that has just started,
// a snapshot being written) leaves its part of the View out with a note.
func (f *Folder) Read() (*View, bool) {
	stamp := f.stampNow()
	if f.view != nil && stamp == f.stamp {
		return f.view, false
	}
	f.stamp = stamp
	v := &View{Source: "run folder " + f.Dir + ", read from its files", State: Running, ETA: -1}
	var notes []string
	if text, err := os.ReadFile(filepath.Join(f.Dir, runfolder.CaseFile)); err == nil {
		if c, err := casefile.Parse(text); err == nil {
			v.Title, v.EndTime = c.Title, c.Time.Duration
		}
	}
	if err := f.readSnapshot(v); err != nil {
		notes = append(notes, err.Error())
	}
	sum, err := runfolder.ReadSummary(f.Dir)
	if err == nil {
		v.Metrics = Metrics(sum.Flow, sum.Scalars)
		v.Warnings = sum.Run.Warnings
		v.Time, v.Steps = sum.Run.SimTime, sum.Run.Steps
		if v.Title == "" {
			v.Title = sum.Run.Title
		}
		switch {
		case sum.Run.Error != "":
			v.State = Failed
			notes = append(notes, sum.Run.Error)
		case sum.Run.Interrupted:
			v.State = Interrupted
			notes = append(notes, fmt.Sprintf("interrupted; continue it with: rollerbed run --resume %s", f.Dir))
		default:
			v.State = Finished
		}
	} else {
		v.Metrics = Metrics(runfolder.FlowSummary{}, nil)
		v.Warnings = logWarnings(filepath.Join(f.Dir, runfolder.LogFile))
		notes = append(notes, "no "+runfolder.SummaryFile+" yet: the run is still going (or stopped before writing it); the metrics appear when it ends")
		v.ETA = f.eta(v.Time, v.EndTime)
	}
	if v.State == Running && v.Grid.X == nil {
		v.State = Waiting
	}
	v.Links = FolderLinks(f.Dir)
	v.Note = strings.Join(notes, "; ")
	f.view = v
	return v, true
}

// stampNow describes the sizes and modification times of the files a View
// is made from.
func (f *Folder) stampNow() string {
	var b strings.Builder
	for _, name := range []string{runfolder.FieldsFile, runfolder.SummaryFile, runfolder.LogFile, runfolder.CaseFile, runfolder.ReportFile} {
		if st, err := os.Stat(filepath.Join(f.Dir, name)); err == nil {
			fmt.Fprintf(&b, "%s %d %d;", name, st.Size(), st.ModTime().UnixNano())
		}
	}
	return b.String()
}

// readSnapshot fills the maps, the grid, the canopy and the profile of v
// from the newest snapshot of fields.h5.
func (f *Folder) readSnapshot(v *View) error {
	file := filepath.Join(f.Dir, runfolder.FieldsFile)
	if _, err := os.Stat(file); errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("no %s yet", runfolder.FieldsFile)
	}
	snaps, err := h5.ListSnapshots(file)
	if err != nil {
		return err
	}
	if len(snaps) == 0 {
		return fmt.Errorf("%s holds no snapshot yet", runfolder.FieldsFile)
	}
	if f.grid == nil {
		g, err := h5.ReadGrid(file)
		if err != nil {
			return err
		}
		f.grid = &g
		if a, err := h5.ReadField(file, "/canopy/frontal_area"); err == nil && a.Rows == len(g.Zc) && a.Cols == len(g.X) {
			f.frontal = a.Data
		}
	}
	g := *f.grid
	v.Grid, v.Frontal = g, f.frontal
	v.CanopyHeight = canopyHeight(g, f.frontal)
	last := snaps[len(snaps)-1]
	v.Time, v.Steps = last.Time, last.Step
	f.sight(last.Time)
	var scalar string
	for _, fi := range last.Fields {
		switch name := fi.Name; {
		case name == "vorticity":
			data, err := h5.ReadField(file, last.Group+"/"+name)
			if err != nil {
				return err
			}
			v.Fields = append([]Field{{Name: name, Label: "ω [1/s]", Signed: true, Data: data.Data}}, v.Fields...)
		case name == "u":
			data, err := h5.ReadField(file, last.Group+"/"+name)
			if err != nil {
				return err
			}
			v.ProfileZ, v.ProfileU = g.Zc, rowMeans(data.Data, len(g.X))
			v.ProfileWhat = fmt.Sprintf("The x-mean velocity of the snapshot at t = %.4g s.", last.Time)
		case scalar == "" && fi.Units == "unit" && (f.Scalar == "" || f.Scalar == name):
			scalar = name
			data, err := h5.ReadField(file, last.Group+"/"+name)
			if err != nil {
				return err
			}
			v.Fields = append(v.Fields, Field{Name: name, Label: name + " [unit]", Data: data.Data})
		}
	}
	return nil
}

// sight records the newest snapshot's time t when it is new.
func (f *Folder) sight(t float64) {
	if n := len(f.seen); n > 0 && f.seen[n-1].t >= t {
		return
	}
	f.seen = append(f.seen, sighting{t, time.Now()})
	if len(f.seen) > 8 {
		f.seen = f.seen[len(f.seen)-8:]
	}
}

// eta estimates the wall time left from the rate at which snapshots came,
// or -1 before two have been seen.
func (f *Folder) eta(t, end float64) time.Duration {
	n := len(f.seen)
	if n < 2 || !(end > t) {
		return -1
	}
	a, b := f.seen[0], f.seen[n-1]
	rate := (b.t - a.t) / b.wall.Sub(a.wall).Seconds()
	if !(rate > 0) {
		return -1
	}
	return time.Duration((end - t) / rate * float64(time.Second))
}

// rowMeans returns the mean of each row of nx values.
func rowMeans(data []float64, nx int) []float64 {
	out := make([]float64, len(data)/nx)
	for k := range out {
		s := 0.0
		for _, x := range data[k*nx : (k+1)*nx] {
			s += x
		}
		out[k] = s / float64(nx)
	}
	return out
}

// canopyHeight is the height of the highest face below a cell with
// frontal area (m), 0 without a canopy.
func canopyHeight(g h5.GridInfo, a []float64) float64 {
	nx := len(g.X)
	if a == nil || nx == 0 {
		return 0
	}
	h := 0.0
	for k := range g.Zc {
		for _, x := range a[k*nx : (k+1)*nx] {
			if x > 0 {
				h = math.Max(h, g.Zf[k+1])
				break
			}
		}
	}
	return h
}

// logWarnings returns the warnings run.log holds, without their time
// stamps.
func logWarnings(path string) []string {
	fh, err := os.Open(path)
	if err != nil {
		return nil
	}
	defer fh.Close()
	var out []string
	sc := bufio.NewScanner(fh)
	sc.Buffer(make([]byte, 64*1024), 1<<20)
	for sc.Scan() {
		if _, w, ok := strings.Cut(sc.Text(), " "+warningMark); ok {
			out = append(out, w)
		}
	}
	return out
}

// FolderLinks lists report.html and the figures of the run folder dir.
func FolderLinks(dir string) []string {
	var out []string
	if _, err := os.Stat(filepath.Join(dir, runfolder.ReportFile)); err == nil {
		out = append(out, runfolder.ReportFile)
	}
	ents, _ := os.ReadDir(filepath.Join(dir, runfolder.FiguresDir))
	for _, e := range ents {
		if ext := filepath.Ext(e.Name()); e.Type().IsRegular() && (ext == ".png" || ext == ".gif") {
			out = append(out, runfolder.FiguresDir+"/"+e.Name())
		}
	}
	return out
}
