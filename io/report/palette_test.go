package report

import (
	"image/color"
	"math"
	"testing"
)

func TestDivergingColorAnchors(t *testing.T) {
	for _, a := range tidepool {
		got := DivergingColor(a.at)
		c := [3]uint8{got.R, got.G, got.B}
		for i := range c {
			if d := int(c[i]) - int(a.rgb[i]); d > 1 || d < -1 {
				t.Errorf("DivergingColor(%v) = %v, want %v", a.at, c, a.rgb)
			}
		}
	}
	if DivergingColor(math.NaN()) != DivergingColor(0) || DivergingColor(7) != DivergingColor(1) {
		t.Error("NaN or out-of-range values are not clamped")
	}
}

// A diverging palette should grow darker steadily away from its centre on
// both sides, so that larger magnitudes read as stronger (common practice,
// no source).
func TestDivergingLightnessFallsFromTheCentre(t *testing.T) {
	for _, sign := range []float64{-1, 1} {
		prev := math.Inf(1)
		for i := 0; i <= 50; i++ {
			c := DivergingColor(sign * float64(i) / 50)
			l := srgbToLab([3]uint8{c.R, c.G, c.B})[0]
			if l > prev+0.5 { // half a unit of L* for rounding to 8 bits
				t.Errorf("L* rises from %.2f to %.2f at v = %v", prev, l, sign*float64(i)/50)
			}
			prev = l
		}
	}
}

func TestLabRoundTrip(t *testing.T) {
	for _, c := range [][3]uint8{{0, 0, 0}, {255, 255, 255}, {12, 200, 77}, {0x7a, 0x1f, 0x2b}} {
		if got := labToSRGB(srgbToLab(c)); got != c {
			t.Errorf("%v → %v", c, got)
		}
	}
}

func TestAnimationPalette(t *testing.T) {
	p := animationPalette()
	if len(p) > 256 {
		t.Fatalf("%d colours, a GIF holds 256", len(p))
	}
	if p[p.Index(color.Black)] != (color.RGBA{0, 0, 0, 255}) || p[p.Index(color.White)] != (color.RGBA{255, 255, 255, 255}) {
		t.Error("no pure black or white for text and outlines")
	}
	if divergingLevel(-1) != 0 || divergingLevel(1) != divergingLevels-1 || divergingLevel(math.NaN()) != divergingLevel(0) {
		t.Error("levels do not span the palette")
	}
	if RunColour(0) != RunColour(len(runColours)) || RunColour(-1) != RunColour(len(runColours)-1) {
		t.Error("run colours do not repeat")
	}
}
