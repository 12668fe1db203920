package report

import (
	"image"
	"math"

	"rollerbed/io/h5"
)

// Painting is a field painted on the figures' palette for a page that
// draws its own axes: the picture of the slice, top row at the top of the
// domain, and the colour scale it uses.
type Painting struct {
	Image *image.RGBA
	// Lo and Hi are the values the ends of the colour scale stand for.
	Lo, Hi float64
	// Diverging is true for the diverging scale about zero (signed fields),
	// false for the sequential one from Lo (pale) to Hi (dark).
	Diverging bool
	// Bar is the colour bar: one pixel wide, Lo at the bottom, Hi at the
	// top.
	Bar *image.RGBA
}

// PaintField paints the field v (rows at the heights zs, len(g.X) values
// a row) into a w × h picture of the slice, as vorticity.png and
// rollers.gif paint it: a signed field (vorticity, w) on the diverging
// scale with ends at ± the 99th percentile of |v| over the inner rows,
// any other field on the sequential scale from its smallest to its
// largest value.
func PaintField(g h5.GridInfo, zs, v []float64, signed bool, w, h int) Painting {
	var scale colourScale
	if signed {
		scale = divergingScale(colourLimit(len(g.X), v))
	} else {
		lo, hi := span(v)
		if !(hi > lo) {
			lo, hi = lo-0.5, lo+0.5
			if !finite(lo) {
				lo, hi = 0, 1
			}
		}
		scale = colourScale{lo: lo, hi: hi}
	}
	return Painting{Image: raster(g, zs, v, scale, w, h), Lo: scale.lo, Hi: scale.hi,
		Diverging: scale.diverging, Bar: colourStrip(scale)}
}

// CanopyOutline returns the outline of the canopy whose frontal area a
// (1/m, at the cell centres) the grid g holds, as line pieces x0, z0, x1,
// z1 (m): the outline that vorticity.png draws. Nil without a canopy.
func CanopyOutline(g h5.GridInfo, a []float64) [][4]float64 {
	segs := canopyOutline(g, a)
	out := make([][4]float64, len(segs))
	for i, s := range segs {
		out[i] = [4]float64{s.x0, s.z0, s.x1, s.z1}
	}
	return out
}

// Stretch returns the vertical exaggeration s of a slice of the given
// length and depth (m) as the figures draw it (drawn aspect
// length/(s·depth) between 1 and 5), and how a caption says it.
func Stretch(length, depth float64) (float64, string) { return stretch(length, depth) }

// PictureSize returns the pixel height of a picture of the slice width
// pixels wide with the figures' vertical exaggeration.
func PictureSize(length, depth float64, width int) int {
	s, _ := stretch(length, depth)
	return max(1, int(math.Round(float64(width)*s*depth/length)))
}
