package report

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math"
	"rollerbed/io/runfolder"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// Figure sizes in pixels. Every PNG is FigureWidth wide; all but
// vorticity.png are FigureHeight high, and vorticity.png is as high as the
// slice needs at its stated aspect ratio. Frames of rollers.gif are
// AnimationWidth wide.
const (
	FigureWidth    = 1200
	FigureHeight   = 800
	AnimationWidth = 720
)

// dpi is the resolution of the raster canvases: 100 pixels per inch, so
// that a 12 pt font is about 17 pixels high.
const dpi = 100

// px converts pixels to plot lengths at dpi.
func px(n float64) vg.Length { return vg.Length(n) * vg.Inch / dpi }

// dots converts plot lengths to pixels at dpi.
func dots(l vg.Length) float64 { return float64(l) * dpi / float64(vg.Inch) }

// Line colours and styles of the single-run figures.
var (
	canopyColour = color.RGBA{0x2f, 0x5d, 0x1e, 255} // canopy top: dark kelp green
	nepfColour   = color.RGBA{0xb3, 0x4a, 0x16, 255} // predicted penetration: burnt orange
	depthColour  = color.RGBA{0x6a, 0x3d, 0x8f, 255} // measured penetration: plum
	gridColour   = color.RGBA{0xdd, 0xdd, 0xdd, 255}
	dashes       = []vg.Length{vg.Points(6), vg.Points(3)}
	dots2        = []vg.Length{vg.Points(1.5), vg.Points(2.5)}
	dashDot      = []vg.Length{vg.Points(7), vg.Points(2.5), vg.Points(1.5), vg.Points(2.5)}
)

// sans is the typeface of all figure text.
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// styled applies the project's text style to a plot: sans-serif text, 12 pt
// title and axis labels, 10 pt tick labels, 11 pt legend, and tick labels
// precise enough to tell apart.
func styled(p *plot.Plot) *plot.Plot {
	p.Title.TextStyle.Font = font.From(sans, 12)
	p.Title.Padding = vg.Points(6)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = font.From(sans, 12)
		ax.Tick.Label.Font = font.From(sans, 10)
		ax.Tick.Marker = linearTicks{}
	}
	p.Legend.TextStyle.Font = font.From(sans, 11)
	return p
}

// newPlot returns a plot in the style of the project's figures: axis labels
// with units, light grid lines behind the data.
func newPlot(title, xlabel, ylabel string) *plot.Plot {
	p := styled(plot.New())
	p.Title.Text = title
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	g := plotter.NewGrid()
	g.Vertical.Color, g.Horizontal.Color = gridColour, gridColour
	p.Add(g)
	return p
}

// titleStyle is the style of a figure title drawn across several panels.
func titleStyle() text.Style {
	return text.Style{
		Color:   color.Black,
		Font:    font.From(sans, 13),
		XAlign:  draw.XCenter,
		YAlign:  draw.YTop,
		Handler: plot.DefaultTextHandler,
	}
}

// drawTitle draws a (multi-line) title at the top of c and returns the
// canvas below it.
func drawTitle(c draw.Canvas, title string) draw.Canvas {
	c.FillText(titleStyle(), vg.Point{X: c.Center().X, Y: c.Max.Y - vg.Points(6)}, title)
	return drawTitleSpace(c, title)
}

// drawTitleSpace returns the canvas below the space drawTitle takes.
func drawTitleSpace(c draw.Canvas, title string) draw.Canvas {
	h := titleStyle().Rectangle(title).Size().Y + vg.Points(12)
	return draw.Crop(c, 0, 0, 0, -h)
}

// render draws a figure of w × h pixels with fn and returns the image.
func render(w, h int, fn func(c draw.Canvas)) *image.RGBA {
	cv := vgimg.NewWith(vgimg.UseWH(px(float64(w)), px(float64(h))), vgimg.UseDPI(dpi))
	fn(draw.New(cv))
	return cv.Image().(*image.RGBA)
}

// writePNG encodes img and writes it atomically to path.
func writePNG(path string, img image.Image) error {
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		return err
	}
	return runfolder.WriteFileAtomic(path, buf.Bytes())
}

// level is a horizontal (z = const) or vertical (x = const) line across the
// whole data area, for marking heights and frequencies.
type level struct {
	at       float64
	vertical bool
	style    draw.LineStyle
}

func hline(z float64, c color.Color, width vg.Length, dash []vg.Length) *level {
	return &level{at: z, style: draw.LineStyle{Color: c, Width: width, Dashes: dash}}
}

func vline(x float64, c color.Color, width vg.Length, dash []vg.Length) *level {
	return &level{at: x, vertical: true, style: draw.LineStyle{Color: c, Width: width, Dashes: dash}}
}

// Plot draws the line.
func (l *level) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	if l.vertical {
		x := trX(l.at)
		if c.ContainsX(x) {
			c.StrokeLine2(l.style, x, c.Min.Y, x, c.Max.Y)
		}
		return
	}
	y := trY(l.at)
	if c.ContainsY(y) {
		c.StrokeLine2(l.style, c.Min.X, y, c.Max.X, y)
	}
}

// Thumbnail draws the legend sample.
func (l *level) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(l.style, c.Min.X, y, c.Max.X, y)
}

// line returns a plotter line through (x[i], y[i]), leaving out pairs
// with a non-finite value.
func line(x, y []float64, c color.Color, width vg.Length, dash []vg.Length) *plotter.Line {
	pts := make(plotter.XYs, 0, len(x))
	for i := range x {
		if finite(x[i]) && finite(y[i]) {
			pts = append(pts, plotter.XY{X: x[i], Y: y[i]})
		}
	}
	l := &plotter.Line{XYs: pts}
	l.LineStyle = draw.LineStyle{Color: c, Width: width, Dashes: dash}
	return l
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// span returns the smallest and largest finite values of the slices.
func span(vs ...[]float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		for _, x := range v {
			if finite(x) {
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			}
		}
	}
	return lo, hi
}

// padRange sets an axis to [lo, hi] widened by 5 % each side (or a unit
// step around a single value), optionally always including 0.
func padRange(ax *plot.Axis, lo, hi float64, withZero bool) {
	if withZero {
		lo, hi = math.Min(lo, 0), math.Max(hi, 0)
	}
	if !finite(lo) || !finite(hi) {
		lo, hi = 0, 1
	}
	d := hi - lo
	if scale := math.Max(math.Abs(lo), math.Abs(hi)); d <= 1e-9*scale || d == 0 {
		// Constant up to round-off (a held bulk velocity): ±5 % around it.
		if scale == 0 {
			scale = 1
		}
		lo, hi, d = 0.5*(lo+hi), 0.5*(lo+hi), scale
	}
	ax.Min, ax.Max = lo-0.05*d, hi+0.05*d
	if withZero && lo == 0 {
		ax.Min = 0
	}
}

// legendBox returns a legend to draw into a strip of its own.
func legendBox() plot.Legend {
	l := plot.NewLegend()
	l.Top, l.Left = true, true
	l.TextStyle.Font = font.From(sans, 11)
	l.Padding = vg.Points(3)
	l.ThumbnailWidth = vg.Points(28)
	return l
}

// legendHeight is the height a legend of n entries takes.
func legendHeight(n int) vg.Length {
	return vg.Length(n)*vg.Points(16.5) + vg.Points(10)
}

// fmtG prints a number to 3 significant digits for labels.
func fmtG(v float64) string { return runfolder.FormatNumber(v, 3) }

// linearTicks are gonum's default ticks on a linear axis, each labelled
// with the fewest significant digits that give its value to within a
// millionth of the tick spacing.
type linearTicks struct{}

// Ticks returns the ticks in [lo, hi].
func (linearTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	var major []int
	for i, t := range ts {
		if t.Label != "" {
			major = append(major, i)
		}
	}
	step := hi - lo
	for k := 1; k < len(major); k++ {
		step = math.Min(step, math.Abs(ts[major[k]].Value-ts[major[k-1]].Value))
	}
	for _, i := range major {
		v := ts[i].Value
		if math.Abs(v) < 1e-9*step {
			v = 0
		}
		for digits := 1; digits <= 15; digits++ {
			l := strconv.FormatFloat(v, 'g', digits, 64)
			if back, _ := strconv.ParseFloat(l, 64); math.Abs(back-v) <= 1e-6*step || digits == 15 {
				ts[i].Label = plainNumber(l)
				break
			}
		}
	}
	return ts
}

// plainNumber rewrites a number printed with an exponent ("2e+01",
// "5e-05") in plain decimals ("20", "0.00005") for magnitudes from 1e-5
// up to 1e7, so axes read like the numbers people write; larger and
// smaller numbers keep their exponent.
func plainNumber(l string) string {
	if !strings.ContainsAny(l, "eE") {
		return l
	}
	v, err := strconv.ParseFloat(l, 64)
	if err != nil {
		return l
	}
	if a := math.Abs(v); a >= 1e-5 && a < 1e7 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return l
}

// logTicks label the powers of ten of a log axis (and 2 and 5 times them
// when fewer than two powers fall in the range), with minor ticks between.
type logTicks struct{}

// Ticks returns the ticks in [lo, hi], lo > 0.
func (logTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || !(hi > lo) {
		return nil
	}
	k0, k1 := int(math.Floor(math.Log10(lo))), int(math.Ceil(math.Log10(hi)))
	powers := 0
	for k := k0; k <= k1; k++ {
		if v := math.Pow10(k); v >= lo && v <= hi {
			powers++
		}
	}
	var ts []plot.Tick
	for k := k0; k <= k1; k++ {
		for m := 1; m < 10; m++ {
			v := float64(m) * math.Pow10(k)
			if v < lo*(1-1e-12) || v > hi*(1+1e-12) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 || powers < 2 && (m == 2 || m == 5) {
				t.Label = strconv.FormatFloat(v, 'g', -1, 64)
			}
			ts = append(ts, t)
		}
	}
	return ts
}

// fitLines breaks each line of a (multi-line) text that is wider than
// width in the style sty into lines that fit: after "; " or before " — "
// where it can, else between words. A single word wider than width keeps
// its own line.
func fitLines(sty text.Style, s string, width vg.Length) string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		out = append(out, fitLine(sty, l, width)...)
	}
	return strings.Join(out, "\n")
}

// fitLine breaks one line as fitLines does.
func fitLine(sty text.Style, l string, width vg.Length) []string {
	if sty.Width(l) <= width {
		return []string{l}
	}
	// Pieces that end where a line may break: clauses, else words.
	var pieces []string
	for _, c := range strings.SplitAfter(l, "; ") {
		head, tail, dash := strings.Cut(c, " — ")
		if dash {
			pieces = append(pieces, head+" ", "— "+tail)
		} else {
			pieces = append(pieces, c)
		}
	}
	var words []string
	for _, p := range pieces {
		if sty.Width(strings.TrimSpace(p)) <= width {
			words = append(words, p)
			continue
		}
		for _, w := range strings.SplitAfter(p, " ") {
			if w != "" {
				words = append(words, w)
			}
		}
	}
	var lines []string
	cur := ""
	for _, w := range words {
		if cur != "" && sty.Width(strings.TrimSpace(cur+w)) > width {
			lines = append(lines, strings.TrimSpace(cur))
			cur = ""
		}
		cur += w
	}
	if strings.TrimSpace(cur) != "" {
		lines = append(lines, strings.TrimSpace(cur))
	}
	return lines
}

// NewPlot returns an empty plot in the style of the project's figures:
// its fonts, light grid lines, and tick labels in plain numbers. Axis
// labels should carry SI units in brackets.
func NewPlot(title, xlabel, ylabel string) *plot.Plot { return newPlot(title, xlabel, ylabel) }

// LogAxis makes ax logarithmic with the project's log ticks.
func LogAxis(ax *plot.Axis) {
	ax.Scale, ax.Tick.Marker = plot.LogScale{}, logTicks{}
}

// KeyEntry is an entry of a figure's key: its text and its sample (a
// plotter that draws its own legend thumbnail).
type KeyEntry struct {
	Text  string
	Thumb plot.Thumbnailer
}

// WritePlot writes p as a PNG figure of FigureWidth × FigureHeight to
// path (atomically): the title at the top, the key in a strip of its own
// below it, where it covers neither data nor frame, and the plot under
// them.
func WritePlot(path, title string, p *plot.Plot, key []KeyEntry) error {
	f := &panels{title: fitLines(titleStyle(), title, px(FigureWidth)-vg.Points(24)), plots: []*plot.Plot{p}, key: legendBox()}
	for _, k := range key {
		f.addKey(k.Text, k.Thumb)
	}
	return writePNG(path, f.render())
}
