package report

import (
	"errors"
	"fmt"
	"image"
	"math"
	"strings"

	"rollerbed/io/h5"
)

// The figures of a slab (a run periodic across the span): its x–z
// section and its plan view, drawn from the three-dimensional volumes of
// fields.h5 with the maps of the slice.

// errSliceRun says that a figure only a slab has was not made for a
// slice; WriteFiguresWith passes over it without a note.
var errSliceRun = errors.New("a slab's figure, and the run is a slice")

// lastVolume returns the last snapshot that holds the volume name, and
// false when none does or the run is a slice.
func (s *slice) lastVolume(name string) (h5.SnapshotInfo, bool) {
	if !s.grid.Slab() {
		return h5.SnapshotInfo{}, false
	}
	for n := len(s.all) - 1; n >= 0; n-- {
		for _, v := range s.all[n].Volumes {
			if v.Name == name {
				return s.all[n], true
			}
		}
	}
	return h5.SnapshotInfo{}, false
}

// readVolume reads volume name of snapshot sn and checks its extent.
func (s *slice) readVolume(sn h5.SnapshotInfo, name string) ([]float64, error) {
	v, err := h5.ReadVolume(s.file, sn.Index, name)
	if err != nil {
		return nil, err
	}
	g := s.grid
	if want := len(g.Zc) * len(g.Y) * len(g.X); len(v.Data) != want {
		return nil, fmt.Errorf("%s: volume %s of snapshot %d holds %d values, the grid %d", s.file, name, sn.Index, len(v.Data), want)
	}
	return v.Data, nil
}

// section returns the x–z section at spanwise row j of a volume: Nz rows
// of Nx values.
func section(g h5.GridInfo, v []float64, j int) []float64 {
	nx, ny := len(g.X), len(g.Y)
	out := make([]float64, 0, len(g.Zc)*nx)
	for k := range g.Zc {
		out = append(out, v[(k*ny+j)*nx:(k*ny+j+1)*nx]...)
	}
	return out
}

// plane returns level k of a volume: Ny rows of Nx values.
func plane(g h5.GridInfo, v []float64, k int) []float64 {
	n := len(g.Y) * len(g.X)
	return v[k*n : (k+1)*n]
}

// planGrid describes the x–y plane of a slab to the maps, which draw a
// grid's rows at heights up to H: the rows are the spanwise positions and
// H the width.
func planGrid(g h5.GridInfo) h5.GridInfo {
	return h5.GridInfo{X: g.X, Lx: g.Lx, H: g.Ly, Zc: g.Y, Zf: g.Y}
}

// sectionFigure writes section.png: the spanwise vorticity in the x–z
// section at y = 0 of the last snapshot that holds it.
func sectionFigure(r *runData, s *slice, path string) error {
	if !s.grid.Slab() {
		return errSliceRun
	}
	sn, ok := s.lastVolume(Vorticity)
	if !ok {
		return skipf("the snapshots of fields.h5 hold no volume of the vorticity (add \"vorticity\" to output.fields in the case)")
	}
	v, err := s.readVolume(sn, Vorticity)
	if err != nil {
		return err
	}
	g := s.grid
	om := section(g, v, 0)
	lim := colourLimit(len(g.X), om)
	_, aspect := stretch(g.Lx, g.H)
	title := fmt.Sprintf("Spanwise vorticity ω = ∂u/∂z − ∂w/∂x in the x–z section at y = %s m, t = %s s — %s\n%s; colours end at ±%s 1/s (99th percentile of |ω|); vorticity.png shows its span average",
		fmtG(g.Y[0]), fmtG(sn.Time), r.title(), aspect, fmtG(lim))
	segs := canopyOutline(g, s.frontal)
	if len(segs) > 0 {
		title += "; line: edge of the span-averaged canopy"
	}
	fr := vorticityFrame(lim, title)
	return writePNG(path, drawMap(g, g.Zc, om, fr, segs, layoutFor(g, FigureWidth, fr)))
}

// planLevel returns the level the plan views show, nearest the canopy
// top (mid-depth without a canopy), and its name for titles.
func planLevel(r *runData, g h5.GridInfo) (int, string) {
	z, where := g.H/2, "mid-depth"
	if r.sum != nil && r.sum.Canopy != nil && r.sum.Canopy.Height > 0 {
		z, where = r.sum.Canopy.Height, "the canopy top"
	}
	k := 0
	for i, zc := range g.Zc {
		if math.Abs(zc-z) < math.Abs(g.Zc[k]-z) {
			k = i
		}
	}
	return k, where
}

// planAnimation writes breakup.gif: the plan view of w at the canopy top
// over the snapshots from the first (at most maxFrames of them, on one
// colour scale), in which rollers that roll up straight across the span
// are seen to bend and break.
func planAnimation(r *runData, s *slice, path string) error {
	if !s.grid.Slab() {
		return errSliceRun
	}
	var snaps []h5.SnapshotInfo
	for _, sn := range s.all {
		for _, v := range sn.Volumes {
			if v.Name == "w" {
				snaps = append(snaps, sn)
			}
		}
	}
	frames := framesFor(snaps)
	if len(frames) < 2 {
		return skipf("fields.h5 holds %d snapshot with the volume of w; an animation needs at least 2 (lower output.snapshot_every)", len(frames))
	}
	g := s.grid
	k, where := planLevel(r, g)
	pg := planGrid(g)
	level := func(sn h5.SnapshotInfo) ([]float64, error) {
		v, err := s.readVolume(sn, "w")
		if err != nil {
			return nil, err
		}
		return plane(g, v, k), nil
	}
	lim := 0.0
	for _, sn := range frames {
		w, err := level(sn)
		if err != nil {
			return err
		}
		lim = math.Max(lim, colourLimit(len(g.X), w))
	}
	_, aspect := stretch(pg.Lx, pg.H)
	aspect = strings.Replace(aspect, "heights", "widths across the span", 1)
	var lay mapLayout
	return writeGIF(path, len(frames), func(i int) (*image.RGBA, error) {
		sn := frames[i]
		title := fmt.Sprintf("Vertical velocity w at %s (z = %s m), seen from above, t = %s s (frame %d of %d) — %s\n%s; colours end at ±%s m/s (largest 99th percentile of |w|)",
			where, fmtG(g.Zc[k]), fmtG(sn.Time), i+1, len(frames), r.title(), aspect, fmtG(lim))
		fr := mapFrame{scale: divergingScale(lim), label: "w [m/s]", title: title, across: "y [m]"}
		if i == 0 {
			lay = layoutFor(pg, AnimationWidth, fr)
		}
		w, err := level(sn)
		if err != nil {
			return nil, err
		}
		return drawMap(pg, pg.Zc, w, fr, nil, lay), nil
	})
}

// planFigure writes plan.png: w at the level nearest the canopy top
// (mid-depth without a canopy) of the last snapshot that holds it, over x
// and y.
func planFigure(r *runData, s *slice, path string) error {
	if !s.grid.Slab() {
		return errSliceRun
	}
	sn, ok := s.lastVolume("w")
	if !ok {
		return skipf("the snapshots of fields.h5 hold no volume of w (add \"w\" to output.fields in the case)")
	}
	v, err := s.readVolume(sn, "w")
	if err != nil {
		return err
	}
	g := s.grid
	k, where := planLevel(r, g)
	w := plane(g, v, k)
	pg := planGrid(g)
	lim := colourLimit(len(g.X), w)
	_, aspect := stretch(pg.Lx, pg.H)
	aspect = strings.Replace(aspect, "heights", "widths across the span", 1)
	title := fmt.Sprintf("Vertical velocity w at %s (z = %s m), seen from above, t = %s s — %s\n%s; colours end at ±%s m/s; rollers lying straight across the span are bands, broken ones patches",
		where, fmtG(g.Zc[k]), fmtG(sn.Time), r.title(), aspect, fmtG(lim))
	fr := mapFrame{scale: divergingScale(lim), label: "w [m/s]", title: title, across: "y [m]"}
	return writePNG(path, drawMap(pg, pg.Zc, w, fr, nil, layoutFor(pg, FigureWidth, fr)))
}
