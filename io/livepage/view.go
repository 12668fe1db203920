package livepage

import (
	"bytes"
	"encoding/base64"
	"encoding/json"
	"image"
	"image/png"
	"maps"
	"math"
	"slices"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// State says where a run stands.
type State string

// The states of a run as the page shows them.
const (
	Waiting     State = "waiting"     // no snapshot to show yet
	Running     State = "running"     // stepping
	Finished    State = "finished"    // reached its end time
	Interrupted State = "interrupted" // stopped on a signal after a checkpoint
	Failed      State = "failed"      // stopped by an error (a blow-up)
)

// View is one state of a run as the page shows it. A View handed to
// Server.Publish belongs to the server from then on.
type View struct {
	Title string
	// Source says where the view comes from, e.g. "live run" or "run
	// folder demo-run (read from its files)".
	Source string
	State  State
	// Note says more about the state (an error, why nothing shows yet).
	Note string
	// Time and EndTime are the simulated time now and at the end (s);
	// Steps the steps taken; ETA the wall time left, negative when not
	// known; StepsPerSecond the wall-clock rate, 0 when not known.
	Time, EndTime  float64
	Steps          int
	ETA            time.Duration
	StepsPerSecond float64
	// Grid is the mesh of the slice; Frontal the canopy frontal area a
	// (1/m) at the cell centres, nil without a canopy; CanopyHeight h (m),
	// 0 without one.
	Grid         h5.GridInfo
	Frontal      []float64
	CanopyHeight float64
	// Fields are the maps to draw, the vorticity first.
	Fields []Field
	// ProfileU is the x-mean velocity (m/s) at the heights ProfileZ (m);
	// ProfileWhat says which mean it is.
	ProfileZ, ProfileU []float64
	ProfileWhat        string
	Metrics            []Metric
	Warnings           []string
	// Links are files of the run folder the page links to (report.html,
	// the figures), by name relative to the folder.
	Links []string
}

// Field is one map of a View: Data at the faces (len(Grid.Zf) rows) or
// the cell centres (len(Grid.Zc) rows) of the grid, len(Grid.X) values a
// row.
type Field struct {
	Name  string // e.g. "vorticity", "oxygen"
	Label string // the colour bar's label with the unit, e.g. "ω [1/s]"
	// Signed fields are drawn on the diverging scale about zero.
	Signed bool
	Data   []float64
}

// Metric is one number of the summary as the page lists it.
type Metric struct {
	Key   string // the flattened summary key, e.g. "flow.penetration_depth_m"
	Label string // for people
	Unit  string // "" when dimensionless
	// Value is nil while the metric does not apply yet (no statistics, no
	// resolved spectrum).
	Value *float64
}

// Metrics picks the main metrics of a run from its summary's flow and
// scalar parts: the penetration depth, the roller frequency and spacing,
// the velocity at the canopy top, the momentum thickness, and each
// scalar's uptake per bed area, all of it and by the elements, in that
// order.
func Metrics(flow runfolder.FlowSummary, scalars map[string]runfolder.ScalarSummary) []Metric {
	m := []Metric{
		metric(runfolder.KeyPenetrationDepth, "penetration depth δe", flow.PenetrationDepth, ""),
		metric("flow.roller_frequency_hz", "roller frequency", flow.RollerFrequency, ""),
		metric(runfolder.KeyRollerSpacing, "roller spacing (from the frequency)", flow.RollerSpacing, ""),
		metric(runfolder.KeyRollerSpacingCorrelation, "roller spacing (two-point correlation)", flow.RollerSpacingCorrelation, ""),
		metric("flow.u_top_m_s", "U at the canopy top", flow.UTop, ""),
		metric("flow.momentum_thickness_m", "momentum thickness θ", flow.MomentumThickness, ""),
	}
	for _, n := range slices.Sorted(maps.Keys(scalars)) {
		s := scalars[n]
		k := "scalars." + n + "."
		m = append(m,
			metric(k+"total_uptake_per_bed_area", n+" uptake per bed area", runfolder.Num(s.TotalUptake), "unit·m/s"),
			metric(k+"element_uptake_per_bed_area", n+" uptake by the elements", runfolder.Num(s.ElementUptake), "unit·m/s"))
	}
	return m
}

// metric makes a Metric, its unit from the key unless one is given.
func metric(key, label string, v *float64, unit string) Metric {
	if unit == "" {
		unit = runfolder.Unit(key)
	}
	return Metric{Key: key, Label: label, Unit: unit, Value: v}
}

// pictureWidth is the width of the map pictures of a grid nx points long
// in pixels: two pixels a point, from 400 to 960; the page scales them
// smoothly to its width.
func pictureWidth(nx int) int { return min(960, max(400, 2*nx)) }

// message is the JSON a page receives for one View.
type message struct {
	Title    string    `json:"title"`
	Source   string    `json:"source"`
	State    State     `json:"state"`
	Note     string    `json:"note"`
	Time     float64   `json:"t"`
	EndTime  float64   `json:"end"`
	Steps    int       `json:"steps"`
	ETA      float64   `json:"eta_s"` // -1: not known
	Rate     float64   `json:"steps_per_s"`
	Lx       float64   `json:"lx"`
	H        float64   `json:"h"`
	Stretch  string    `json:"stretch"`
	Maps     []mapMsg  `json:"maps"`
	Outline  []seg     `json:"outline"`
	Top      float64   `json:"canopy_top"`
	Profile  profile   `json:"profile"`
	Metrics  []metMsg  `json:"metrics"`
	Warnings []string  `json:"warnings"`
	Links    []string  `json:"links"`
	Sent     time.Time `json:"sent"`
}

type seg [4]float64

type mapMsg struct {
	Name      string  `json:"name"`
	Label     string  `json:"label"`
	Image     string  `json:"image"` // PNG data URI
	Bar       string  `json:"bar"`   // PNG data URI, Lo at the bottom
	Lo        float64 `json:"lo"`
	Hi        float64 `json:"hi"`
	Diverging bool    `json:"diverging"`
}

type profile struct {
	What string     `json:"what"`
	Z    []*float64 `json:"z"`
	U    []*float64 `json:"u"`
}

type metMsg struct {
	Key     string       `json:"key"`
	Label   string       `json:"label"`
	Unit    string       `json:"unit"`
	Value   *float64     `json:"value"`
	History [][2]float64 `json:"history"` // (t, value) pairs, t in s
}

// history keeps the values of each metric against simulated time, at
// most maxHistory points each: when full, every other point is dropped.
type history map[string][][2]float64

// maxHistory bounds the points of a metric's history.
const maxHistory = 400

// add records the metrics of a view at time t; a time before the last
// recorded one (a resumed run's restart) drops what came after it.
func (h history) add(t float64, ms []Metric) {
	for _, m := range ms {
		pts := h[m.Key]
		for len(pts) > 0 && pts[len(pts)-1][0] >= t {
			pts = pts[:len(pts)-1]
		}
		if m.Value != nil && finite(*m.Value) {
			pts = append(pts, [2]float64{t, *m.Value})
		}
		if len(pts) > maxHistory {
			half := pts[:0]
			for i := 0; i < len(pts); i += 2 {
				half = append(half, pts[i])
			}
			pts = half
		}
		h[m.Key] = pts
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// encode turns a view into the JSON of its message, with the metrics'
// histories of h.
func encode(v *View, h history) ([]byte, error) {
	g := v.Grid
	m := message{Title: v.Title, Source: v.Source, State: v.State, Note: v.Note, Time: v.Time, EndTime: v.EndTime,
		Steps: v.Steps, ETA: -1, Rate: v.StepsPerSecond, Lx: g.Lx, H: g.H, Top: v.CanopyHeight,
		Profile:  profile{What: v.ProfileWhat, Z: nullable(v.ProfileZ), U: nullable(v.ProfileU)},
		Warnings: nonNil(v.Warnings), Links: nonNil(v.Links), Maps: []mapMsg{}, Outline: []seg{}, Metrics: []metMsg{},
		Sent: time.Now().UTC()}
	if v.ETA >= 0 {
		m.ETA = v.ETA.Seconds()
	}
	if len(g.X) > 0 && g.Lx > 0 && g.H > 0 {
		_, m.Stretch = report.Stretch(g.Lx, g.H)
		for _, s := range report.CanopyOutline(g, v.Frontal) {
			m.Outline = append(m.Outline, s)
		}
		wpx := pictureWidth(len(g.X))
		hpx := report.PictureSize(g.Lx, g.H, wpx)
		for _, f := range v.Fields {
			zs := g.Zc
			if len(f.Data) == len(g.Zf)*len(g.X) {
				zs = g.Zf
			} else if len(f.Data) != len(g.Zc)*len(g.X) {
				continue
			}
			p := report.PaintField(g, zs, f.Data, f.Signed, wpx, hpx)
			img, err := dataURI(p.Image)
			if err != nil {
				return nil, err
			}
			bar, err := dataURI(p.Bar)
			if err != nil {
				return nil, err
			}
			m.Maps = append(m.Maps, mapMsg{Name: f.Name, Label: f.Label, Image: img, Bar: bar, Lo: p.Lo, Hi: p.Hi, Diverging: p.Diverging})
		}
	}
	for _, mt := range v.Metrics {
		val := mt.Value
		if val != nil && !finite(*val) {
			val = nil
		}
		m.Metrics = append(m.Metrics, metMsg{Key: mt.Key, Label: mt.Label, Unit: mt.Unit, Value: val, History: nonNil(h[mt.Key])})
	}
	return json.Marshal(m)
}

// dataURI encodes an image as a PNG data URI.
func dataURI(img image.Image) (string, error) {
	var buf bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(&buf, img); err != nil {
		return "", err
	}
	return "data:image/png;base64," + base64.StdEncoding.EncodeToString(buf.Bytes()), nil
}

// nullable returns v with NaN and infinities, which JSON cannot hold, as
// null; nil gives an empty list.
func nullable(v []float64) []*float64 {
	out := make([]*float64, len(v))
	for i, x := range v {
		out[i] = runfolder.Num(x)
	}
	return out
}

func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}
