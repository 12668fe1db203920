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

// slice is the vorticity data of a run: the grid, the canopy mask and the
// snapshots that hold vorticity.
type slice struct {
	file    string
	grid    h5.GridInfo
	frontal []float64 // Nz × Nx at the centres, nil without a canopy
	snaps   []h5.SnapshotInfo
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
	s := &slice{file: file}
	for _, sn := range all {
		if slices.ContainsFunc(sn.Fields, func(f h5.FieldInfo) bool { return f.Name == "vorticity" }) {
			s.snaps = append(s.snaps, sn)
		}
	}
	if len(s.snaps) == 0 {
		if len(all) == 0 {
			return nil, skipf("fields.h5 holds no snapshots (set output.snapshot_every > 0 in the case)")
		}
		return nil, skipf("the snapshots of fields.h5 hold no vorticity (add \"vorticity\" to output.fields in the case)")
	}
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
	f, err := h5.ReadField(s.file, sn.Group+"/vorticity")
	if err != nil {
		return nil, err
	}
	if f.Rows != len(s.grid.Zf) || f.Cols != len(s.grid.X) {
		return nil, fmt.Errorf("%s: %s/vorticity is %d × %d, the face grid %d × %d", s.file, sn.Group, f.Rows, f.Cols, len(s.grid.Zf), len(s.grid.X))
	}
	return f.Data, nil
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

// raster paints the vorticity om (faces × x) into a w × h image, bilinear
// in z between faces and periodic-linear in x, with colours of the
// diverging palette at ±lim. Row 0 of the image is the top of the domain.
func raster(g h5.GridInfo, om []float64, lim float64, w, h int) *image.RGBA {
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
	zf := g.Zf
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
			col := divergingTable[divergingLevel((a+tz*(b-a))/lim)]
			row[4*p], row[4*p+1], row[4*p+2], row[4*p+3] = col.R, col.G, col.B, 255
		}
	}
	return img
}

// colourStrip is the colour bar's image: the diverging levels bottom (−)
// to top (+).
func colourStrip() *image.RGBA {
	img := image.NewRGBA(image.Rect(0, 0, 1, divergingLevels))
	for i, c := range divergingTable {
		img.SetRGBA(0, divergingLevels-1-i, c)
	}
	return img
}

// mapLayout is the geometry of a vorticity picture of a given width.
type mapLayout struct {
	width, height int       // pixels
	barWidth      vg.Length // the colour bar strip at the right
	aspect        float64   // drawn length / drawn height of the data area
}

// vorticityPlots builds the map and colour bar plots of one frame.
func vorticityPlots(g h5.GridInfo, lim float64, title string) (m, bar *plot.Plot) {
	m = styled(plot.New())
	m.Title.Text = title
	m.X.Label.Text, m.Y.Label.Text = "x [m]", "z [m]"
	m.X.Min, m.X.Max, m.Y.Min, m.Y.Max = 0, g.Lx, 0, g.H
	bar = styled(plot.New())
	bar.HideX()
	bar.Y.Label.Text = "ω [1/s]"
	bar.Y.Min, bar.Y.Max = -lim, lim
	bar.Add(plotter.NewImage(colourStrip(), 0, -lim, 1, lim))
	bar.X.Min, bar.X.Max = 0, 1
	return m, bar
}

// layoutFor sizes a picture of the given pixel width so that the map's data
// area has the drawn aspect ratio of the slice.
func layoutFor(g h5.GridInfo, width int, m, bar *plot.Plot) mapLayout {
	s, _ := stretch(g.Lx, g.H)
	lay := mapLayout{width: width, aspect: g.Lx / (s * g.H)}
	W := px(float64(width))
	probe := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: W, Y: W}}}
	bd := bar.DataCanvas(probe)
	lay.barWidth = (bd.Min.X - probe.Min.X) + vg.Points(16) + vg.Points(22)
	trial := W
	probe.Max.Y = trial
	md := m.DataCanvas(draw.Crop(probe, 0, -lay.barWidth, 0, 0))
	want := (md.Max.X - md.Min.X) / vg.Length(lay.aspect)
	total := trial + want - (md.Max.Y - md.Min.Y)
	lay.height = max(int(math.Round(dots(total))), 120)
	return lay
}

// drawVorticity renders one frame: the map with the canopy outline and the
// colour bar.
func drawVorticity(g h5.GridInfo, om []float64, lim float64, segs []segment, title string, lay mapLayout) *image.RGBA {
	m, bar := vorticityPlots(g, lim, title)
	return render(lay.width, lay.height, func(c draw.Canvas) {
		mc := draw.Crop(c, 0, -lay.barWidth, 0, 0)
		da := m.DataCanvas(mc)
		w := max(int(math.Round(dots(da.Max.X-da.Min.X))), 1)
		h := max(int(math.Round(dots(da.Max.Y-da.Min.Y))), 1)
		m.Add(plotter.NewImage(raster(g, om, lim, w, h), 0, 0, g.Lx, g.H))
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
	g     h5.GridInfo
	om    []float64
	lim   float64
	segs  []segment
	title string
	lay   mapLayout
}

// draw renders the picture.
func (p *picture) draw() *image.RGBA {
	return drawVorticity(p.g, p.om, p.lim, p.segs, p.title, p.lay)
}

// lastPicture prepares the map of the last snapshot for vorticity.png.
func lastPicture(r *runData, s *slice) (*picture, error) {
	last := s.snaps[len(s.snaps)-1]
	om, err := s.vorticity(last)
	if err != nil {
		return nil, err
	}
	g := s.grid
	p := &picture{g: g, om: om, lim: colourLimit(len(g.X), om), segs: canopyOutline(g, s.frontal)}
	_, aspect := stretch(g.Lx, g.H)
	p.title = fmt.Sprintf("Spanwise vorticity ω = ∂u/∂z − ∂w/∂x at t = %s s — %s\n%s; colours end at ±%s 1/s (99th percentile of |ω|)",
		fmtG(last.Time), r.title(), aspect, fmtG(p.lim))
	if len(p.segs) > 0 {
		p.title += "; black-and-white line: canopy edge (a > 0)"
	}
	m, bar := vorticityPlots(g, p.lim, p.title)
	p.lay = layoutFor(g, FigureWidth, m, bar)
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

// framesFor picks the snapshots of the animation: those after the spin-up
// when there are at least two, else all; the last maxFrames of them.
func framesFor(snaps []h5.SnapshotInfo, spinUp float64) []h5.SnapshotInfo {
	var late []h5.SnapshotInfo
	for _, sn := range snaps {
		if sn.Time >= spinUp {
			late = append(late, sn)
		}
	}
	if len(late) < 2 {
		late = snaps
	}
	if len(late) > maxFrames {
		late = late[len(late)-maxFrames:]
	}
	return late
}

// frameDelay returns the delay of each of n frames in 1/100 s, so that the
// animation plays in about animationSeconds; at least 2, below which
// viewers slow frames down.
func frameDelay(n int) int {
	return max(2, int(math.Round(animationSeconds*100/float64(n))))
}

// animation writes rollers.gif: vorticity over the last snapshots, at one
// colour scale for all frames.
func animation(r *runData, s *slice, path string) error {
	frames := framesFor(s.snaps, r.spinUp())
	if len(frames) < 2 {
		return skipf("fields.h5 holds %d snapshot with vorticity; an animation needs at least 2 (lower output.snapshot_every)", len(frames))
	}
	// One colour scale for all frames: the largest of their limits. The
	// frames are read twice (here and to draw them) to hold one at a time.
	g := s.grid
	lim := 0.0
	for _, sn := range frames {
		om, err := s.vorticity(sn)
		if err != nil {
			return err
		}
		lim = math.Max(lim, colourLimit(len(g.X), om))
	}
	segs := canopyOutline(g, s.frontal)
	_, aspect := stretch(g.Lx, g.H)
	pal := animationPalette()
	anim := &gif.GIF{}
	delay := frameDelay(len(frames))
	var lay mapLayout
	for i, sn := range frames {
		title := fmt.Sprintf("Vorticity ω at t = %s s (frame %d of %d) — %s\n%s; colours end at ±%s 1/s (largest 99th percentile of |ω|)",
			fmtG(sn.Time), i+1, len(frames), r.title(), aspect, fmtG(lim))
		if i == 0 {
			m, bar := vorticityPlots(g, lim, title)
			lay = layoutFor(g, AnimationWidth, m, bar)
		}
		om, err := s.vorticity(sn)
		if err != nil {
			return err
		}
		img := drawVorticity(g, om, lim, segs, title, lay)
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
