package sweep

import (
	"math"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/plot/plotter"

	"rollerbed/io/report"
)

// Axes name the quantity in words with its unit (from the summary key's
// suffix), and a varied case key by its words and the key itself.
func TestAxisLabels(t *testing.T) {
	c := &Collection{Keys: []string{"canopy.frontal_area", "initial.seed"}}
	for _, tc := range []struct{ key, want string }{
		{"flow.penetration_depth_m", "penetration depth [m]"},
		{"flow.roller_frequency_hz", "roller frequency [Hz]"},
		{"flow.pressure_gradient_m_s2", "pressure gradient [m/s²]"},
		{"flow.strouhal", "strouhal"},
		{"run.steps", "steps"},
		{"scalars.oxygen.exchange_velocity_m_s", "oxygen exchange velocity [m/s]"},
		{"canopy.frontal_area", "frontal area (canopy.frontal_area)"},
		{"initial.seed", "seed (initial.seed)"},
	} {
		if got := c.axisLabel(tc.key); got != tc.want {
			t.Errorf("axisLabel(%q) = %q, want %q", tc.key, got, tc.want)
		}
	}
}

// Replicates (members at one parameter value) are summed up by their
// mean, smallest and largest value, in increasing x.
func TestReplicates(t *testing.T) {
	gs := replicates(plotter.XYs{{X: 15, Y: 2}, {X: 10, Y: 1}, {X: 15, Y: 4}, {X: 10, Y: 3}, {X: 15, Y: 3}, {X: 20, Y: 7}})
	want := []replicateGroup{
		{X: 10, Ys: []float64{1, 3}, Mean: 2, Min: 1, Max: 3},
		{X: 15, Ys: []float64{2, 4, 3}, Mean: 3, Min: 2, Max: 4},
		{X: 20, Ys: []float64{7}, Mean: 7, Min: 7, Max: 7},
	}
	if len(gs) != len(want) {
		t.Fatalf("%d groups, want %d", len(gs), len(want))
	}
	for i, g := range gs {
		w := want[i]
		if g.X != w.X || !slices.Equal(g.Ys, w.Ys) || math.Abs(g.Mean-w.Mean) > 1e-15 || g.Min != w.Min || g.Max != w.Max {
			t.Errorf("group %d: %+v, want %+v", i, g, w)
		}
	}
}

// The sweep figure uses the fonts of the other figures, readable labels,
// a key (drawn in a strip of its own) that says what the dots and bars
// are, and its axes hold every member and bar end.
func TestSweepFigure(t *testing.T) {
	f := &sweepFigure{
		xlabel: "frontal area (canopy.frontal_area)",
		ylabel: "penetration depth [m]",
		groups: replicates(plotter.XYs{{X: 10, Y: 0.011}, {X: 10, Y: 0.013}, {X: 15, Y: 0.009}, {X: 15, Y: 0.010}}),
		ref:    plotter.XYs{{X: 10, Y: 0.023}, {X: 15, Y: 0.0153}}, refLabel: "min(h, 0.23/(C_D a)), Nepf et al. 2007",
	}
	p, key, err := f.plot()
	if err != nil {
		t.Fatal(err)
	}
	ref := report.NewPlot("", "", "")
	for name, got := range map[string]string{
		"title": string(p.Title.TextStyle.Font.Typeface) + " " + string(p.Title.TextStyle.Font.Variant),
		"x":     string(p.X.Label.TextStyle.Font.Typeface) + " " + string(p.X.Label.TextStyle.Font.Variant),
		"ticks": string(p.Y.Tick.Label.Font.Typeface) + " " + string(p.Y.Tick.Label.Font.Variant),
	} {
		want := string(ref.Title.TextStyle.Font.Typeface) + " " + string(ref.Title.TextStyle.Font.Variant)
		if got != want {
			t.Errorf("%s font %q, want the figures' %q", name, got, want)
		}
	}
	if p.X.Label.Text != f.xlabel || p.Y.Label.Text != f.ylabel {
		t.Errorf("labels %q, %q", p.X.Label.Text, p.Y.Label.Text)
	}
	var texts []string
	for _, k := range key {
		texts = append(texts, k.Text)
	}
	joined := strings.Join(texts, "\n")
	for _, want := range []string{"pale", "bars: smallest to largest of the replicates", "mean of the replicates (up to 2 at a value)", "Nepf et al. 2007"} {
		if !strings.Contains(joined, want) {
			t.Errorf("key %q lacks %q", texts, want)
		}
	}
	if p.Y.Min > 0.009 || p.Y.Max < 0.023 || p.X.Min >= 10 || p.X.Max <= 15 {
		t.Errorf("axes x %v–%v, y %v–%v do not hold the data", p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
	}

	// Without replicates: the members alone, no bars.
	f.groups = replicates(plotter.XYs{{X: 10, Y: 0.011}, {X: 15, Y: 0.009}})
	_, key, err = f.plot()
	if err != nil {
		t.Fatal(err)
	}
	if len(key) != 2 || key[0].Text != "members" {
		t.Errorf("key without replicates %+v", key)
	}
}
