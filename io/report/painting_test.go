package report

import (
	"testing"

	"rollerbed/io/h5"
)

// TestPaintField checks the scales and sizes of the pictures a page
// draws: the diverging one ends at ± the 99th percentile of |ω| as
// vorticity.png does, the sequential one at the field's extremes; the
// outline of a canopy in the lower half is its top; a 2 m × 0.5 m slice
// is drawn at its true aspect ratio. Common practice, no source.
func TestPaintField(t *testing.T) {
	g := h5.GridInfo{Lx: 2, H: 0.5}
	for i := range 8 {
		g.X = append(g.X, float64(i)/4)
	}
	for k := range 5 {
		g.Zf = append(g.Zf, float64(k)/8)
	}
	for k := range 4 {
		g.Zc = append(g.Zc, (float64(k)+0.5)/8)
	}
	om := make([]float64, 5*8)
	for i := range om {
		om[i] = float64(i - 20)
	}
	p := PaintField(g, g.Zf, om, true, 40, 10)
	if lim := colourLimit(8, om); !p.Diverging || p.Hi != lim || p.Lo != -lim {
		t.Errorf("diverging scale %g to %g, want ±%g", p.Lo, p.Hi, lim)
	}
	if b := p.Image.Bounds(); b.Dx() != 40 || b.Dy() != 10 {
		t.Errorf("picture %v", b)
	}
	c := make([]float64, 4*8)
	for i := range c {
		c[i] = 2 + float64(i)
	}
	if p := PaintField(g, g.Zc, c, false, 40, 10); p.Diverging || p.Lo != 2 || p.Hi != 33 {
		t.Errorf("sequential scale %g to %g, want 2 to 33", p.Lo, p.Hi)
	}
	a := make([]float64, 4*8)
	for i := range 2 * 8 {
		a[i] = 5
	}
	if o := CanopyOutline(g, a); len(o) != 1 || o[0] != [4]float64{0, 0.25, 2, 0.25} {
		t.Errorf("outline %v", o)
	}
	if h := PictureSize(g.Lx, g.H, 400); h != 100 {
		t.Errorf("picture height %d, want 100", h)
	}
}
