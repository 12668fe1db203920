package report

import (
	"bytes"
	"errors"
	"fmt"
	"image"
	"image/color"
	"image/gif"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"slices"
	"sort"
	"strings"
	"unicode"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"rollerbed/io/h5"
)

// Animation limits: at most maxFrames snapshots, played in about
// animationSeconds.
const (
	maxFrames        = 60
	animationSeconds = 5.0
)

// Vorticity is the name of the vorticity field of the snapshots, the
// field that vorticity.png shows and rollers.gif animates unless told
// otherwise.
const Vorticity = "vorticity"

// slice is the snapshot data of a run: the grid, the canopy mask and the
// snapshots of fields.h5.
type slice struct {
	file    string
	grid    h5.GridInfo
	frontal []float64 // Nz × Nx at the centres, nil without a canopy
	all     []h5.SnapshotInfo
	snaps   []h5.SnapshotInfo // those that hold vorticity
	// bent is the time series with the bent height of flexible blades,
	// read when first needed (phases.go).
	bent *runfolder.TimeSeriesTable
}

// holding returns the snapshots that hold the field name.
func (s *slice) holding(name string) []h5.SnapshotInfo {
	var out []h5.SnapshotInfo
	for _, sn := range s.all {
		if slices.ContainsFunc(sn.Fields, func(f h5.FieldInfo) bool { return f.Name == name }) {
			out = append(out, sn)
		}
	}
	return out
}

// fieldNames lists the fields that any snapshot holds, quoted, in the
// order they first appear.
func (s *slice) fieldNames() []string {
	var out []string
	for _, sn := range s.all {
		for _, f := range sn.Fields {
			if q := fmt.Sprintf("%q", f.Name); !slices.Contains(out, q) {
				out = append(out, q)
			}
		}
	}
	return out
}

// noVorticity is why a run folder has no vorticity to draw.
func (s *slice) noVorticity() error {
	return skipf("the snapshots of fields.h5 hold no vorticity (add \"vorticity\" to output.fields in the case)")
}

// loadSlice reads the grid, canopy and snapshot list of fields.h5.
func loadSlice(r *runData) (*slice, error) {
	file := filepath.Join(r.dir, runfolder.FieldsFile)
	if _, err := os.Stat(file); errors.Is(err, os.ErrNotExist) {
		return nil, skipf("%s has no %s", r.dir, runfolder.FieldsFile)
	}
	all, err := h5.ListSnapshots(file)
	if err != nil {
		return nil, err
	}
	if len(all) == 0 {
		return nil, skipf("fields.h5 holds no snapshots (set output.snapshot_every > 0 in the case)")
	}
	s := &slice{file: file, all: all}
	s.snaps = s.holding(Vorticity)
	if s.grid, err = h5.ReadGrid(file); err != nil {
		return nil, err
	}
	if r.sum == nil || r.sum.Canopy != nil {
		if a, err := h5.ReadField(file, "/canopy/frontal_area"); err == nil && a.Rows == len(s.grid.Zc) && a.Cols == len(s.grid.X) {
			s.frontal = a.Data
		}
	}
	return s, nil
}

// vorticity reads the vorticity of a snapshot, checking its shape.
func (s *slice) vorticity(sn h5.SnapshotInfo) ([]float64, error) {
	v, _, err := s.field(sn, Vorticity)
	return v, err
}

// field reads the field name of a snapshot and returns it with the
// heights of its rows: the faces (Zf) or the cell centres (Zc).
func (s *slice) field(sn h5.SnapshotInfo, name string) ([]float64, []float64, error) {
	f, err := h5.ReadField(s.file, sn.Group+"/"+name)
	if err != nil {
		return nil, nil, err
	}
	if f.Cols == len(s.grid.X) {
		switch f.Rows {
		case len(s.grid.Zf):
			return f.Data, s.grid.Zf, nil
		case len(s.grid.Zc):
			return f.Data, s.grid.Zc, nil
		}
	}
	return nil, nil, fmt.Errorf("%s: %s/%s is %d × %d, neither the face grid %d × %d nor the centre grid %d × %d",
		s.file, sn.Group, name, f.Rows, f.Cols, len(s.grid.Zf), len(s.grid.X), len(s.grid.Zc), len(s.grid.X))
}

// colourLimit is the value that the ends of the colour scale stand for:
// the 99th percentile of |ω| over the inner faces (the bed and top faces
// carry the wall shear, which would wash out the rollers), so that a few
// extreme cells do not flatten the picture (common practice, no source).
// Large fields are sampled at an even stride of at most limitSamples
// values.
func colourLimit(nx int, om []float64) float64 {
	nz := len(om)/nx - 1
	inner := om[nx : nz*nx]
	stride := max(1, len(inner)/limitSamples)
	abs := make([]float64, 0, len(inner)/stride+1)
	for i := 0; i < len(inner); i += stride {
		if v := inner[i]; finite(v) {
			abs = append(abs, math.Abs(v))
		}
	}
	if len(abs) == 0 {
		return 1
	}
	sort.Float64s(abs)
	lim := abs[int(0.99*float64(len(abs)-1))]
	if !(lim > 0) {
		lim = abs[len(abs)-1]
	}
	if !(lim > 0) {
		return 1
	}
	return lim
}

// limitSamples bounds the values sorted for a colour limit.
const limitSamples = 1 << 18

// stretch returns the vertical exaggeration s of the slice picture and how
// the title says it: the drawn aspect ratio length/(s·depth) stays between
// 1 and 5, s taken from 1, 2, 2.5, 4, 5 times a power of ten.
func stretch(length, depth float64) (float64, string) {
	r := length / depth
	nice := func(v float64) float64 { // the smallest nice number >= v
		e := math.Pow(10, math.Floor(math.Log10(v)))
		for _, m := range []float64{1, 2, 2.5, 4, 5, 10} {
			if m*e >= v*(1-1e-9) {
				return m * e
			}
		}
		return 10 * e
	}
	switch {
	case r > 5:
		s := nice(r / 5)
		return s, "heights drawn " + fmtG(s) + "× their true scale"
	case r < 1:
		s := nice(1 / r)
		return 1 / s, "heights drawn at 1/" + fmtG(s) + " of their true scale"
	}
	return 1, "true aspect ratio"
}

// segment is a straight piece of the canopy outline, in m.
type segment struct{ x0, z0, x1, z1 float64 }

// canopyOutline returns the boundary of the cells where a > 0: the canopy
// top and the ends of patches. The bed (below the first cell) is left out.
// Cell i spans X[i] ± Δx/2 along the periodic x; cell k spans the faces
// Zf[k] to Zf[k+1].
func canopyOutline(g h5.GridInfo, a []float64) []segment {
	nx, nz := len(g.X), len(g.Zc)
	if a == nil || nx == 0 || len(a) != nx*nz {
		return nil
	}
	peak := 0.0
	for _, v := range a {
		peak = math.Max(peak, v)
	}
	if !(peak > 0) {
		return nil
	}
	in := func(k, i int) bool {
		if k < 0 || k >= nz {
			return false
		}
		return a[k*nx+((i%nx)+nx)%nx] > 1e-9*peak
	}
	dx := g.Lx / float64(nx)
	var horiz, vert []segment
	for k := 0; k < nz; k++ {
		for i := 0; i < nx; i++ {
			if in(k, i) != in(k+1, i) {
				lo, hi := g.X[i]-dx/2, g.X[i]+dx/2
				z := g.Zf[k+1]
				if lo < 0 { // the first cell wraps around x = Lx
					horiz = append(horiz, segment{lo + g.Lx, z, g.Lx, z})
					lo = 0
				}
				horiz = append(horiz, segment{lo, z, hi, z})
			}
			if in(k, i) != in(k, i+1) {
				x := g.X[i] + dx/2
				vert = append(vert, segment{x, g.Zf[k], x, g.Zf[k+1]})
			}
		}
	}
	return append(mergeSegments(horiz, false), mergeSegments(vert, true)...)
}

// mergeSegments joins collinear segments that touch, so the outline draws
// as few long lines.
func mergeSegments(s []segment, vertical bool) []segment {
	key := func(a segment) (float64, float64) {
		if vertical {
			return a.x0, a.z0
		}
		return a.z0, a.x0
	}
	sort.Slice(s, func(i, j int) bool {
		ai, bi := key(s[i])
		aj, bj := key(s[j])
		return ai < aj || ai == aj && bi < bj
	})
	var out []segment
	for _, a := range s {
		if n := len(out); n > 0 {
			b := &out[n-1]
			if vertical && b.x0 == a.x0 && math.Abs(b.z1-a.z0) < 1e-12 {
				b.z1 = a.z1
				continue
			}
			if !vertical && b.z0 == a.z0 && math.Abs(b.x1-a.x0) < 1e-12 {
				b.x1 = a.x1
				continue
			}
		}
		out = append(out, a)
	}
	return out
}

// outline draws canopy segments as a dark line with a pale edge, which
// shows on every colour of the palette.
type outline struct{ segs []segment }

// Plot draws the outline.
func (o outline) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for _, pass := range []draw.LineStyle{
		{Color: color.White, Width: vg.Points(3)},
		{Color: color.Black, Width: vg.Points(1.2)},
	} {
		for _, s := range o.segs {
			c.StrokeLine2(pass, trX(s.x0), trY(s.z0), trX(s.x1), trY(s.z1))
		}
	}
}

// colourScale maps field values onto the palette: a diverging scale
// centred on 0 with ends at ±hi (signed fields: vorticity, w), or a
// sequential one from lo (pale sand) to hi (oxblood), the upper half of the
// diverging palette (concentrations, speeds).
type colourScale struct {
	lo, hi    float64
	diverging bool
}

// divergingScale is the diverging scale with ends at ±lim.
func divergingScale(lim float64) colourScale { return colourScale{lo: -lim, hi: lim, diverging: true} }

// level returns the palette index of v.
func (c colourScale) level(v float64) int {
	if c.diverging {
		return divergingLevel(v / c.hi)
	}
	return divergingLevel(math.Max(0, (v-c.lo)/(c.hi-c.lo)))
}

// raster paints the field om (rows at heights zs × x) into a w × h image,
// bilinear in z between rows (constant beyond the first and last) and
// periodic-linear in x, with colours of the scale. Row 0 of the image is
// the top of the domain.
func raster(g h5.GridInfo, zs, om []float64, scale colourScale, w, h int) *image.RGBA {
	nx := len(g.X)
	img := image.NewRGBA(image.Rect(0, 0, w, h))
	dx := g.Lx / float64(nx)
	type xs struct {
		i0, i1 int
		t      float64
	}
	cols := make([]xs, w)
	for p := range cols {
		f := (float64(p) + 0.5) / float64(w) * g.Lx / dx
		i := math.Floor(f)
		i0 := ((int(i) % nx) + nx) % nx
		cols[p] = xs{i0, (i0 + 1) % nx, f - i}
	}
	zf := zs
	for q := 0; q < h; q++ {
		z := g.H * (1 - (float64(q)+0.5)/float64(h))
		j := sort.SearchFloat64s(zf, z) - 1
		j = max(0, min(len(zf)-2, j))
		tz := (z - zf[j]) / (zf[j+1] - zf[j])
		tz = math.Max(0, math.Min(1, tz))
		lo, hi := om[j*nx:(j+1)*nx], om[(j+1)*nx:(j+2)*nx]
		row := img.Pix[q*img.Stride:]
		for p, c := range cols {
			a := lo[c.i0] + c.t*(lo[c.i1]-lo[c.i0])
			b := hi[c.i0] + c.t*(hi[c.i1]-hi[c.i0])
			col := divergingTable[scale.level(a+tz*(b-a))]
			row[4*p], row[4*p+1], row[4*p+2], row[4*p+3] = col.R, col.G, col.B, 255
		}
	}
	return img
}

// colourStrip is the colour bar's image of a scale: its levels bottom
// (lo) to top (hi).
func colourStrip(scale colourScale) *image.RGBA {
	levels := divergingTable
	if !scale.diverging {
		levels = divergingTable[divergingLevels/2:]
	}
	img := image.NewRGBA(image.Rect(0, 0, 1, len(levels)))
	for i, c := range levels {
		img.SetRGBA(0, len(levels)-1-i, c)
	}
	return img
}

// mapLayout is the geometry of a vorticity picture of a given width.
type mapLayout struct {
	width, height int       // pixels
	barWidth      vg.Length // the colour bar strip at the right
	aspect        float64   // drawn length / drawn height of the data area
}

// mapFrame is what a map of one field shows besides the field: the colour
// scale, the colour bar's label and the title.
type mapFrame struct {
	scale colourScale
	label string // colour bar label with unit, e.g. "ω [1/s]"
	title string
	// across labels the vertical axis of a map: "" for z [m], or the
	// label of the other axis of a plan view, e.g. "y [m]".
	across string
}

// vorticityFrame is the frame of a vorticity map with ends at ±lim.
func vorticityFrame(lim float64, title string) mapFrame {
	return mapFrame{scale: divergingScale(lim), label: "ω [1/s]", title: title}
}

// mapPlots builds the map and colour bar plots of one frame. The title is
// broken into lines that fit the map's width (the picture's width less the
// colour bar), so that none is cut off.
func mapPlots(g h5.GridInfo, fr mapFrame, width int, barWidth vg.Length) (m, bar *plot.Plot) {
	m = styled(plot.New())
	m.Title.Text = fitLines(m.Title.TextStyle, fr.title, px(float64(width))-barWidth-vg.Points(8))
	m.X.Label.Text, m.Y.Label.Text = "x [m]", "z [m]"
	if fr.across != "" {
		m.Y.Label.Text = fr.across
	}
	m.X.Min, m.X.Max, m.Y.Min, m.Y.Max = 0, g.Lx, 0, g.H
	bar = styled(plot.New())
	bar.HideX()
	bar.Y.Label.Text = fr.label
	lo, hi := fr.scale.lo, fr.scale.hi
	bar.Y.Min, bar.Y.Max = lo, hi
	bar.Add(plotter.NewImage(colourStrip(fr.scale), 0, lo, 1, hi))
	bar.X.Min, bar.X.Max = 0, 1
	return m, bar
}

// barWidthOf is the width the colour bar of a frame takes at the right
// of a picture: its axis, label and strip.
func barWidthOf(g h5.GridInfo, fr mapFrame) vg.Length {
	_, bar := mapPlots(g, fr, 1000, 0)
	W := px(1000)
	probe := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: W, Y: W}}}
	bd := bar.DataCanvas(probe)
	return (bd.Min.X - probe.Min.X) + vg.Points(16) + vg.Points(22)
}

// layoutFor sizes a picture of the given pixel width so that the map's data
// area has the drawn aspect ratio of the slice.
func layoutFor(g h5.GridInfo, width int, fr mapFrame) mapLayout {
	s, _ := stretch(g.Lx, g.H)
	lay := mapLayout{width: width, aspect: g.Lx / (s * g.H)}
	W := px(float64(width))
	probe := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: W, Y: W}}}
	lay.barWidth = barWidthOf(g, fr)
	m, _ := mapPlots(g, fr, width, lay.barWidth)
	trial := W
	probe.Max.Y = trial
	md := m.DataCanvas(draw.Crop(probe, 0, -lay.barWidth, 0, 0))
	want := (md.Max.X - md.Min.X) / vg.Length(lay.aspect)
	total := trial + want - (md.Max.Y - md.Min.Y)
	lay.height = max(int(math.Round(dots(total))), 120)
	return lay
}

// drawMap renders one frame: the field om (rows at heights zs) with the
// canopy outline and the colour bar.
func drawMap(g h5.GridInfo, zs, om []float64, fr mapFrame, segs []segment, lay mapLayout) *image.RGBA {
	m, bar := mapPlots(g, fr, lay.width, lay.barWidth)
	return render(lay.width, lay.height, func(c draw.Canvas) {
		mc := draw.Crop(c, 0, -lay.barWidth, 0, 0)
		da := m.DataCanvas(mc)
		w := max(int(math.Round(dots(da.Max.X-da.Min.X))), 1)
		h := max(int(math.Round(dots(da.Max.Y-da.Min.Y))), 1)
		m.Add(plotter.NewImage(raster(g, zs, om, fr.scale, w, h), 0, 0, g.Lx, g.H))
		if len(segs) > 0 {
			m.Add(outline{segs})
		}
		m.Draw(mc)
		// The colour bar spans the height of the map's data area.
		bc := c
		bc.Min.X = c.Max.X - lay.barWidth + vg.Points(10)
		bc.Max.X = c.Max.X - vg.Points(6)
		bc.Min.Y, bc.Max.Y = da.Min.Y, da.Max.Y
		bd := bar.DataCanvas(bc)
		bc.Min.Y -= bd.Min.Y - bc.Min.Y
		bc.Max.Y += bc.Max.Y - bd.Max.Y
		bar.BackgroundColor = nil
		bar.Draw(bc)
	})
}

// picture is one vorticity map ready to draw.
type picture struct {
	g    h5.GridInfo
	om   []float64
	fr   mapFrame
	segs []segment
	lay  mapLayout
}

// draw renders the picture.
func (p *picture) draw() *image.RGBA {
	return drawMap(p.g, p.g.Zf, p.om, p.fr, p.segs, p.lay)
}

// lastPicture prepares the map of the last snapshot for vorticity.png.
func lastPicture(r *runData, s *slice) (*picture, error) {
	if len(s.snaps) == 0 {
		return nil, s.noVorticity()
	}
	last := s.snaps[len(s.snaps)-1]
	om, err := s.vorticity(last)
	if err != nil {
		return nil, err
	}
	g := s.grid
	lim := colourLimit(len(g.X), om)
	p := &picture{g: g, om: om, segs: canopyOutline(g, s.bentFrontal(r, last.Time))}
	_, aspect := stretch(g.Lx, g.H)
	what := "Spanwise vorticity ω = ∂u/∂z − ∂w/∂x"
	if s.grid.Slab() {
		what = "Span average of the spanwise vorticity ω = ∂u/∂z − ∂w/∂x"
	}
	title := fmt.Sprintf("%s at t = %s s — %s\n%s; colours end at ±%s 1/s (99th percentile of |ω|)",
		what, fmtG(last.Time), r.title(), aspect, fmtG(lim))
	if len(p.segs) > 0 {
		title += "; black-and-white line: canopy edge (a > 0)"
		if r.sum != nil && r.sum.Canopy != nil && r.sum.Canopy.Flexible != nil {
			title += ", blades bent as at that time"
		}
	}
	p.fr = vorticityFrame(lim, title)
	p.lay = layoutFor(g, FigureWidth, p.fr)
	return p, nil
}

// vorticityFigure writes vorticity.png of the last snapshot.
func vorticityFigure(r *runData, s *slice, path string) error {
	p, err := lastPicture(r, s)
	if err != nil {
		return err
	}
	return writePNG(path, p.draw())
}

// framesFor picks the snapshots of the animation: all of them from the
// first, so that the roll-up is seen, or maxFrames of them evenly spread
// from the first to the last when there are more.
func framesFor(snaps []h5.SnapshotInfo) []h5.SnapshotInfo {
	n := len(snaps)
	if n <= maxFrames {
		return snaps
	}
	out := make([]h5.SnapshotInfo, maxFrames)
	for i := range out {
		out[i] = snaps[int(math.Round(float64(i)*float64(n-1)/float64(maxFrames-1)))]
	}
	return out
}

// frameDelay returns the delay of each of n frames in 1/100 s, so that the
// animation plays in about animationSeconds; at least 2, below which
// viewers slow frames down.
func frameDelay(n int) int {
	return max(2, int(math.Round(animationSeconds*100/float64(n))))
}

// signedFields are the snapshot fields drawn on the diverging scale about
// zero; every other field (velocity u, pressure, eddy viscosity, scalar
// concentrations) is drawn on the sequential scale from its smallest to
// its largest value.
var signedFields = []string{Vorticity, "w"}

// animated is the content of an animation before it is drawn: which
// snapshots, on which colour scale, under which titles.
type animated struct {
	field  string
	frames []h5.SnapshotInfo
	label  string // colour bar label with unit
	scale  colourScale
	titles []string // one per frame
}

// animationOf prepares rollers.gif of field name: every snapshot that
// holds it from the first (at most maxFrames of them), on one colour scale
// for all frames. Without snapshots of the default field it skips; a field
// that no snapshot holds is a mistake of the caller.
func animationOf(r *runData, s *slice, name string) (*animated, error) {
	snaps := s.holding(name)
	if len(snaps) == 0 {
		if name == Vorticity {
			return nil, s.noVorticity()
		}
		return nil, fmt.Errorf("no snapshot of %s holds a field %q to animate; they hold %s: choose one of those", runfolder.FieldsFile, name, strings.Join(s.fieldNames(), ", "))
	}
	a := &animated{field: name, frames: framesFor(snaps)}
	if len(a.frames) < 2 {
		return nil, skipf("fields.h5 holds %d snapshot with %s; an animation needs at least 2 (lower output.snapshot_every)", len(a.frames), name)
	}
	info := fieldInfo(a.frames[0], name)
	a.label = name + " [" + info.Units + "]"
	if name == Vorticity {
		a.label = "ω [1/s]"
	}
	// One colour scale for all frames. The frames are read twice (here and
	// to draw them) to hold one at a time.
	g := s.grid
	lim, lo, hi := 0.0, math.Inf(1), math.Inf(-1)
	for _, sn := range a.frames {
		v, _, err := s.field(sn, name)
		if err != nil {
			return nil, err
		}
		lim = math.Max(lim, colourLimit(len(g.X), v))
		l, h := span(v)
		lo, hi = math.Min(lo, l), math.Max(hi, h)
	}
	what := "ω"
	if name != Vorticity {
		what = name
	}
	colours := ""
	if slices.Contains(signedFields, name) {
		a.scale = divergingScale(lim)
		colours = fmt.Sprintf("colours end at ±%s %s (largest 99th percentile of |%s|)", fmtG(lim), info.Units, what)
	} else {
		if math.Abs(lo) < 1e-9*math.Abs(hi) {
			lo = 0 // round-off below a field that starts at zero
		}
		if !(hi > lo) {
			lo, hi = lo-0.5, lo+0.5
			if !finite(lo) {
				lo, hi = 0, 1
			}
		}
		a.scale = colourScale{lo: lo, hi: hi}
		colours = fmt.Sprintf("colours from %s (pale) to %s %s (dark), its smallest and largest values", fmtG(lo), fmtG(hi), info.Units)
	}
	_, aspect := stretch(g.Lx, g.H)
	heading := "Vorticity ω"
	if name != Vorticity {
		heading = fieldHeading(info)
	}
	for i, sn := range a.frames {
		a.titles = append(a.titles, fmt.Sprintf("%s at t = %s s (frame %d of %d) — %s\n%s; %s",
			heading, fmtG(sn.Time), i+1, len(a.frames), r.title(), aspect, colours))
	}
	return a, nil
}

// fieldInfo returns the description of field name in a snapshot.
func fieldInfo(sn h5.SnapshotInfo, name string) h5.FieldInfo {
	for _, f := range sn.Fields {
		if f.Name == name {
			return f
		}
	}
	return h5.FieldInfo{Name: name}
}

// fieldHeading names a field in a title: its description, else its name,
// starting with a capital.
func fieldHeading(f h5.FieldInfo) string {
	h := f.Description
	if h == "" {
		h = f.Name
	}
	if rs := []rune(h); len(rs) > 0 {
		rs[0] = unicode.ToUpper(rs[0])
		h = string(rs)
	}
	return h
}

// animation writes rollers.gif of the field name.
func animation(r *runData, s *slice, name, path string) error {
	a, err := animationOf(r, s, name)
	if err != nil {
		return err
	}
	g := s.grid
	var lay mapLayout
	return writeGIF(path, len(a.frames), func(i int) (*image.RGBA, error) {
		fr := mapFrame{scale: a.scale, label: a.label, title: a.titles[i]}
		if i == 0 {
			lay = layoutFor(g, AnimationWidth, fr)
		}
		v, zs, err := s.field(a.frames[i], a.field)
		if err != nil {
			return nil, err
		}
		return drawMap(g, zs, v, fr, canopyOutline(g, s.bentFrontal(r, a.frames[i].Time)), lay), nil
	})
}

// writeGIF writes an animation of n frames, drawn in order by frame, on
// the animation palette, playing in about animationSeconds.
func writeGIF(path string, n int, frame func(i int) (*image.RGBA, error)) error {
	pal := animationPalette()
	anim := &gif.GIF{}
	delay := frameDelay(n)
	for i := range n {
		img, err := frame(i)
		if err != nil {
			return err
		}
		anim.Image = append(anim.Image, quantize(img, pal))
		anim.Delay = append(anim.Delay, delay)
	}
	var buf bytes.Buffer
	if err := gif.EncodeAll(&buf, anim); err != nil {
		return err
	}
	return runfolder.WriteFileAtomic(path, buf.Bytes())
}

// quantize maps an opaque image onto the palette, each colour to its
// nearest entry (no dithering: the map's colours are entries already).
func quantize(img *image.RGBA, pal color.Palette) *image.Paletted {
	out := image.NewPaletted(img.Bounds(), pal)
	cache := make(map[uint32]uint8)
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		src := img.Pix[(y-b.Min.Y)*img.Stride:]
		dst := out.Pix[(y-b.Min.Y)*out.Stride:]
		for x := 0; x < b.Dx(); x++ {
			r, g, bl := src[4*x], src[4*x+1], src[4*x+2]
			key := uint32(r)<<16 | uint32(g)<<8 | uint32(bl)
			idx, ok := cache[key]
			if !ok {
				idx = uint8(pal.Index(color.RGBA{r, g, bl, 255}))
				cache[key] = idx
			}
			dst[x] = idx
		}
	}
	return out
}
