package report

import (
	"image"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"rollerbed/io/h5"
)

// grid returns a uniform grid of nx × nz cells over lx × h.
func grid(nx, nz int, lx, h float64) h5.GridInfo {
	g := h5.GridInfo{Lx: lx, H: h}
	for i := range nx {
		g.X = append(g.X, float64(i)*lx/float64(nx))
	}
	for k := range nz {
		g.Zc = append(g.Zc, (float64(k)+0.5)*h/float64(nz))
	}
	for k := 0; k <= nz; k++ {
		g.Zf = append(g.Zf, float64(k)*h/float64(nz))
	}
	return g
}

func TestStretchKeepsTheDrawnAspectBetween1And5(t *testing.T) {
	if s, say := stretch(0.4, 0.2); s != 1 || say != "true aspect ratio" {
		t.Errorf("0.4 × 0.2 m: %v %q", s, say)
	}
	if s, say := stretch(2, 0.1); s != 4 || !strings.Contains(say, "4×") {
		t.Errorf("2 × 0.1 m: %v %q", s, say)
	}
	if s, say := stretch(0.1, 1); s != 0.1 || !strings.Contains(say, "1/10") {
		t.Errorf("0.1 × 1 m: %v %q", s, say)
	}
	for r := 0.05; r < 500; r *= 1.37 {
		s, _ := stretch(r, 1)
		if a := r / s; a < 1-1e-9 || a > 5+1e-9 {
			t.Errorf("length/depth %.3g: drawn aspect %.3g", r, a)
		}
	}
}

// The map's data area has the drawn aspect ratio, whatever the slice.
func TestLayoutGivesTheDataAreaItsAspect(t *testing.T) {
	for _, c := range []struct{ lx, h float64 }{{0.4, 0.2}, {2, 0.1}, {0.1, 0.3}, {1, 1}} {
		g := grid(16, 8, c.lx, c.h)
		for _, width := range []int{FigureWidth, AnimationWidth} {
			fr := vorticityFrame(2.5, "one\ntwo")
			lay := layoutFor(g, width, fr)
			m, _ := mapPlots(g, fr, lay.width, lay.barWidth)
			cv := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: px(float64(lay.width)), Y: px(float64(lay.height))}}}
			da := m.DataCanvas(draw.Crop(cv, 0, -lay.barWidth, 0, 0))
			got := float64((da.Max.X - da.Min.X) / (da.Max.Y - da.Min.Y))
			if math.Abs(got/lay.aspect-1) > 0.01 {
				t.Errorf("%g × %g m at %d px: data area aspect %.4g, want %.4g", c.lx, c.h, width, got, lay.aspect)
			}
		}
	}
}

func TestCanopyOutline(t *testing.T) {
	g := grid(8, 4, 8, 4) // cells 1 m wide centred on x = 0..7, faces z = 0..4
	mask := func(in func(k, i int) bool) []float64 {
		a := make([]float64, 8*4)
		for k := range 4 {
			for i := range 8 {
				if in(k, i) {
					a[k*8+i] = 3
				}
			}
		}
		return a
	}
	for _, c := range []struct {
		name string
		in   func(k, i int) bool
		want []segment
	}{
		{"whole slice", func(k, i int) bool { return k < 2 }, []segment{{0, 2, 8, 2}}},
		{"patch", func(k, i int) bool { return k < 2 && i >= 2 && i <= 5 },
			[]segment{{1.5, 2, 5.5, 2}, {1.5, 0, 1.5, 2}, {5.5, 0, 5.5, 2}}},
		{"patch across x = 0", func(k, i int) bool { return k < 2 && (i >= 6 || i <= 1) },
			[]segment{{0, 2, 1.5, 2}, {5.5, 2, 8, 2}, {1.5, 0, 1.5, 2}, {5.5, 0, 5.5, 2}}},
		{"no canopy", func(k, i int) bool { return false }, nil},
	} {
		got := canopyOutline(g, mask(c.in))
		if len(got) != len(c.want) {
			t.Errorf("%s: outline %v, want %v", c.name, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("%s: segment %d = %v, want %v", c.name, i, got[i], c.want[i])
			}
		}
	}
	if canopyOutline(g, nil) != nil {
		t.Error("an outline without a canopy")
	}
}

func TestRasterColours(t *testing.T) {
	g := grid(4, 2, 1, 1)
	om := make([]float64, 3*4)
	for i := range 4 {
		om[i], om[4+i], om[8+i] = -2, 0, 2 // faces z = 0, 0.5, 1
	}
	img := raster(g, g.Zf, om, divergingScale(2), 10, 100)
	top, mid, bottom := img.RGBAAt(3, 0), img.RGBAAt(3, 50), img.RGBAAt(3, 99)
	near := func(a, b [3]uint8) bool {
		for i := range a {
			if d := int(a[i]) - int(b[i]); d > 8 || d < -8 {
				return false
			}
		}
		return true
	}
	if !near([3]uint8{top.R, top.G, top.B}, tidepool[4].rgb) || !near([3]uint8{bottom.R, bottom.G, bottom.B}, tidepool[0].rgb) ||
		!near([3]uint8{mid.R, mid.G, mid.B}, tidepool[2].rgb) {
		t.Errorf("top %v, middle %v, bottom %v", top, mid, bottom)
	}
}

func TestColourLimitLeavesOutTheWalls(t *testing.T) {
	nx := 10
	om := make([]float64, 4*nx)
	for i := range nx {
		om[i], om[3*nx+i] = 1000, -1000 // bed and top faces
		om[nx+i], om[2*nx+i] = float64(i), -float64(i)
	}
	if lim := colourLimit(nx, om); lim != 9 {
		t.Errorf("limit %v, want 9 (the largest inner |ω| at the 99th percentile of 20 values)", lim)
	}
	if lim := colourLimit(nx, make([]float64, 4*nx)); lim != 1 {
		t.Errorf("limit of a field at rest %v, want 1", lim)
	}
}

// The animation starts at the first snapshot, so that the roll-up shows,
// and spreads its frames over the whole run when there are many.
func TestFrames(t *testing.T) {
	var snaps []h5.SnapshotInfo
	for i := range 100 {
		snaps = append(snaps, h5.SnapshotInfo{Index: i, Time: float64(i)})
	}
	if f := framesFor(snaps[:10]); len(f) != 10 || f[0].Time != 0 {
		t.Errorf("few snapshots: %d frames from t = %v, want all 10 from t = 0", len(f), f[0].Time)
	}
	f := framesFor(snaps)
	if len(f) != maxFrames || f[0].Time != 0 || f[maxFrames-1].Time != 99 {
		t.Errorf("many snapshots: %d frames from %v to %v, want %d from 0 to 99", len(f), f[0].Time, f[len(f)-1].Time, maxFrames)
	}
	for i := 1; i < len(f); i++ {
		if d := f[i].Time - f[i-1].Time; d < 1 || d > 2 {
			t.Errorf("frames %d and %d are %v s apart; want them evenly spread", i-1, i, d)
		}
	}
	for n, want := range map[int]int{60: 8, 7: 71, 2: 250, 1000: 2} {
		if got := frameDelay(n); got != want {
			t.Errorf("frameDelay(%d) = %d, want %d", n, got, want)
		}
	}
}

func TestQuantizeKeepsPaletteColours(t *testing.T) {
	pal := animationPalette()
	img := image.NewRGBA(image.Rect(0, 0, len(pal), 1))
	for i, c := range pal {
		img.Set(i, 0, c)
	}
	q := quantize(img, pal)
	for i := range pal {
		if int(q.Pix[i]) != i && pal[q.Pix[i]] != pal[i] {
			t.Errorf("colour %d → %d", i, q.Pix[i])
		}
	}
}

func TestTickLabels(t *testing.T) {
	for _, r := range [][2]float64{{-1.63, 1.63}, {0.0475, 0.0525}, {0, 0.00062}, {3.01, 3.019}} {
		ts := linearTicks{}.Ticks(r[0], r[1])
		n := 0
		for _, tk := range ts {
			if tk.Label == "" {
				continue
			}
			n++
			v, err := strconv.ParseFloat(tk.Label, 64)
			if err != nil || math.Abs(v-tk.Value) > 1e-6*(r[1]-r[0]) {
				t.Errorf("range %v: tick %v labelled %q", r, tk.Value, tk.Label)
			}
		}
		if n < 2 {
			t.Errorf("range %v: %d labelled ticks", r, n)
		}
	}
	var labels []string
	for _, tk := range (logTicks{}).Ticks(0.3, 20) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
		if tk.Value < 0.3 || tk.Value > 20 {
			t.Errorf("log tick %v outside the range", tk.Value)
		}
	}
	if strings.Join(labels, " ") != "1 10" {
		t.Errorf("log labels %q", labels)
	}
	labels = nil
	for _, tk := range (logTicks{}).Ticks(1.5, 8) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if strings.Join(labels, " ") != "2 5" {
		t.Errorf("log labels within one decade %q", labels)
	}
}

// Tick labels read as plain numbers between 1e-5 and 1e7, and keep their
// exponent beyond.
func TestPlainTickLabels(t *testing.T) {
	for _, tc := range []struct {
		lo, hi float64
		want   []string
	}{
		{0, 45, []string{"0", "20", "40"}},
		{0, 0.00045, []string{"0", "0.0002", "0.0004"}},
		{0, 4.5e7, []string{"0", "2e+07", "4e+07"}},
	} {
		var got []string
		for _, tk := range (linearTicks{}).Ticks(tc.lo, tc.hi) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		if strings.Join(got, " ") != strings.Join(tc.want, " ") {
			t.Errorf("ticks of %v–%v: %q, want %q", tc.lo, tc.hi, got, tc.want)
		}
	}
}

// Titles are broken after "; " or before " — " into lines that fit, and
// between words where a clause alone is too wide.
func TestFitLines(t *testing.T) {
	sty := styled(plot.New()).Title.TextStyle
	long := "Vorticity ω at t = 0 s (frame 1 of 60) — a run with a long title that goes on\n" +
		"heights drawn 2× their true scale; colours end at ±1.73 1/s (largest 99th percentile of |ω|)"
	for _, width := range []vg.Length{vg.Points(150), vg.Points(300), vg.Points(2000)} {
		got := fitLines(sty, long, width)
		for _, l := range strings.Split(got, "\n") {
			if w := sty.Width(l); w > width && strings.Contains(l, " ") {
				t.Errorf("width %v: line %q is %v wide", width, l, w)
			}
		}
		if strings.Join(strings.Fields(got), " ") != strings.Join(strings.Fields(long), " ") {
			t.Errorf("width %v: the words changed: %q", width, got)
		}
	}
	if got := fitLines(sty, long, vg.Points(2000)); got != long {
		t.Errorf("a title that fits was changed: %q", got)
	}
	if got := fitLines(sty, long, vg.Points(300)); !strings.HasPrefix(strings.Split(got, "\n")[1], "— a run") {
		t.Errorf("not broken before the dash: %q", got)
	}
}
