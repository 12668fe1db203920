package report

import (
	"image/color"
	"math"
)

// The "tidepool" diverging palette of this project: deep navy-teal for the
// strongest negative values, through sea teal to a pale sand at zero, then
// amber to oxblood for the strongest positive values. Colours between the
// anchors are interpolated in CIE L*a*b*, so lightness changes evenly and
// both halves fall from the same pale centre.
var tidepool = []struct {
	at  float64 // position in [−1, 1]
	rgb [3]uint8
}{
	{-1.0, [3]uint8{0x0e, 0x2f, 0x4f}},
	{-0.5, [3]uint8{0x2c, 0x8c, 0x99}},
	{0.0, [3]uint8{0xf3, 0xee, 0xdf}},
	{0.5, [3]uint8{0xe3, 0x9a, 0x3b}},
	{1.0, [3]uint8{0x7a, 0x1f, 0x2b}},
}

// tidepoolLab holds the anchors in L*a*b*.
var tidepoolLab = func() [][3]float64 {
	out := make([][3]float64, len(tidepool))
	for i, a := range tidepool {
		out[i] = srgbToLab(a.rgb)
	}
	return out
}()

// DivergingColor returns the colour of the project's diverging palette for
// v in [−1, 1] (values outside are clamped, NaN gives the centre colour):
// −1 deep navy-teal, 0 pale sand, +1 oxblood.
func DivergingColor(v float64) color.RGBA {
	if math.IsNaN(v) {
		v = 0
	}
	v = math.Max(-1, math.Min(1, v))
	k := 0
	for k < len(tidepool)-2 && v > tidepool[k+1].at {
		k++
	}
	t := (v - tidepool[k].at) / (tidepool[k+1].at - tidepool[k].at)
	a, b := tidepoolLab[k], tidepoolLab[k+1]
	var lab [3]float64
	for i := range lab {
		lab[i] = a[i] + t*(b[i]-a[i])
	}
	rgb := labToSRGB(lab)
	return color.RGBA{rgb[0], rgb[1], rgb[2], 255}
}

// divergingLevels is the number of colours of the diverging palette in
// rasters and animations; with greyLevels greys they fill a GIF palette.
const (
	divergingLevels = 216
	greyLevels      = 40
)

// divergingTable holds the divergingLevels colours, from −1 to +1.
var divergingTable = func() []color.RGBA {
	out := make([]color.RGBA, divergingLevels)
	for i := range out {
		out[i] = DivergingColor(-1 + 2*float64(i)/float64(divergingLevels-1))
	}
	return out
}()

// divergingLevel returns the palette index of v in [−1, 1].
func divergingLevel(v float64) int {
	if math.IsNaN(v) {
		v = 0
	}
	i := int(math.Round((v + 1) / 2 * float64(divergingLevels-1)))
	return max(0, min(divergingLevels-1, i))
}

// animationPalette is the palette of the GIF frames: the diverging levels,
// then greys from black to white for axes, text and outlines. It holds
// divergingLevels + greyLevels <= 256 colours.
func animationPalette() color.Palette {
	p := make(color.Palette, 0, divergingLevels+greyLevels)
	for _, c := range divergingTable {
		p = append(p, c)
	}
	for i := range greyLevels {
		g := uint8(math.Round(255 * float64(i) / float64(greyLevels-1)))
		p = append(p, color.RGBA{g, g, g, 255})
	}
	return p
}

// runColours are the line colours of the overlay figures, one per run,
// repeating after the last: sea blue, rust, kelp green, violet, ochre,
// charcoal, rose and sky blue.
var runColours = []color.RGBA{
	{0x1b, 0x5e, 0x7a, 255},
	{0xc0, 0x53, 0x2b, 255},
	{0x3f, 0x8f, 0x3a, 255},
	{0x8a, 0x4f, 0xa3, 255},
	{0xd9, 0xa2, 0x1b, 255},
	{0x2e, 0x2e, 0x2e, 255},
	{0xd4, 0x6a, 0x9a, 255},
	{0x5a, 0xa5, 0xc8, 255},
}

// RunColour returns the line colour of the i-th run (from 0) in the
// overlay figures.
func RunColour(i int) color.RGBA {
	return runColours[((i%len(runColours))+len(runColours))%len(runColours)]
}

// sRGB ↔ CIE L*a*b* (D65 white), the standard formulas of IEC 61966-2-1 and
// CIE 15 (from memory).

func srgbToLab(c [3]uint8) [3]float64 {
	var lin [3]float64
	for i, v := range c {
		x := float64(v) / 255
		if x <= 0.04045 {
			lin[i] = x / 12.92
		} else {
			lin[i] = math.Pow((x+0.055)/1.055, 2.4)
		}
	}
	X := 0.4124564*lin[0] + 0.3575761*lin[1] + 0.1804375*lin[2]
	Y := 0.2126729*lin[0] + 0.7151522*lin[1] + 0.0721750*lin[2]
	Z := 0.0193339*lin[0] + 0.1191920*lin[1] + 0.9503041*lin[2]
	fx, fy, fz := labF(X/0.95047), labF(Y), labF(Z/1.08883)
	return [3]float64{116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)}
}

func labF(t float64) float64 {
	const d = 6.0 / 29
	if t > d*d*d {
		return math.Cbrt(t)
	}
	return t/(3*d*d) + 4.0/29
}

func labFInv(t float64) float64 {
	const d = 6.0 / 29
	if t > d {
		return t * t * t
	}
	return 3 * d * d * (t - 4.0/29)
}

func labToSRGB(lab [3]float64) [3]uint8 {
	fy := (lab[0] + 16) / 116
	fx := fy + lab[1]/500
	fz := fy - lab[2]/200
	X, Y, Z := 0.95047*labFInv(fx), labFInv(fy), 1.08883*labFInv(fz)
	lin := [3]float64{
		3.2404542*X - 1.5371385*Y - 0.4985314*Z,
		-0.9692660*X + 1.8760108*Y + 0.0415560*Z,
		0.0556434*X - 0.2040259*Y + 1.0572252*Z,
	}
	var out [3]uint8
	for i, v := range lin {
		v = math.Max(0, math.Min(1, v))
		if v <= 0.0031308 {
			v *= 12.92
		} else {
			v = 1.055*math.Pow(v, 1/2.4) - 0.055
		}
		out[i] = uint8(math.Round(255 * v))
	}
	return out
}
