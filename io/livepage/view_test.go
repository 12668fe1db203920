package livepage

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"rollerbed/io/runfolder"
)

// TestEncode checks the message of a view: the maps on their scales, the
// canopy outline, the profile with a missing value as null, an unknown
// time left as -1, the metrics with their units and histories.
// Common practice, no source.
func TestEncode(t *testing.T) {
	v := testView(2)
	v.ETA = -1
	dye := make([]float64, 8*16)
	for i := range dye {
		dye[i] = 1 + float64(i)
	}
	v.Fields = append(v.Fields, Field{Name: "dye", Label: "dye [unit]", Data: dye})
	v.ProfileU = append([]float64(nil), v.ProfileU...)
	v.ProfileU[3] = math.NaN()
	h := history{}
	h.add(1, v.Metrics)
	h.add(2, v.Metrics)
	b, err := encode(v, h)
	if err != nil {
		t.Fatal(err)
	}
	var m message
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	if len(m.Maps) != 2 {
		t.Fatalf("%d maps", len(m.Maps))
	}
	if om := m.Maps[0]; !om.Diverging || om.Lo != -om.Hi || !(om.Hi > 0) || !strings.HasPrefix(om.Image, "data:image/png;base64,") {
		t.Errorf("vorticity map: diverging %v, %g to %g", om.Diverging, om.Lo, om.Hi)
	}
	if d := m.Maps[1]; d.Diverging || d.Lo != 1 || d.Hi != 128 {
		t.Errorf("dye map: diverging %v, %g to %g, want 1 to 128", d.Diverging, d.Lo, d.Hi)
	}
	// The canopy fills the lower half: its outline is the top at 0.25 m.
	if len(m.Outline) != 1 || m.Outline[0] != (seg{0, 0.25, 2, 0.25}) {
		t.Errorf("outline %v", m.Outline)
	}
	if m.Profile.U[3] != nil || m.Profile.U[2] == nil {
		t.Errorf("profile %v", m.Profile.U)
	}
	if m.ETA != -1 {
		t.Errorf("time left %g, want -1 (unknown)", m.ETA)
	}
	pen := m.Metrics[0]
	if pen.Key != runfolder.KeyPenetrationDepth || pen.Unit != "m" || len(pen.History) != 2 || pen.History[1] != [2]float64{2, 2.1} {
		t.Errorf("penetration depth %+v", pen)
	}
}

// TestHistoryRestartsAfterGoingBack checks that a time before the last
// recorded one (a resumed run) drops what came after it, and that a long
// history is thinned. Common practice, no source.
func TestHistoryRestartsAfterGoingBack(t *testing.T) {
	h := history{}
	one := func(v float64) []Metric { return []Metric{{Key: "k", Value: &v}} }
	for i := range 10 {
		h.add(float64(i), one(float64(i)))
	}
	h.add(4.5, one(-1))
	if got := h["k"]; len(got) != 6 || got[5] != [2]float64{4.5, -1} {
		t.Errorf("after going back: %v", got)
	}
	for i := range 3 * maxHistory {
		h.add(10+float64(i), one(0))
	}
	if n := len(h["k"]); n > maxHistory || n < maxHistory/2 {
		t.Errorf("%d points kept, want %d at most", n, maxHistory)
	}
}
