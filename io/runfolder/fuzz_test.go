package runfolder

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

// FuzzParseCSV: any text either fails to parse or reads back the same
// after writing it again.
func FuzzParseCSV(f *testing.F) {
	f.Add([]byte("\"z [m]\",\"U [m/s]\"\n0.1,0.2\n0.3,4e-17\n"))
	f.Add([]byte("a\n1\n2,3\n"))
	f.Add([]byte(""))
	f.Add([]byte("\"t\"\nNaN\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := parseCSV(bytes.NewReader(data))
		if err != nil {
			return
		}
		for _, c := range tab.Columns {
			if len(c) != tab.Rows() {
				t.Fatalf("columns differ in length: %v", tab.Columns)
			}
		}
		path := filepath.Join(t.TempDir(), "t.csv")
		if err := tab.WriteCSV(path); err != nil {
			t.Fatal(err)
		}
		back, err := ReadCSV(path)
		if err != nil {
			t.Fatalf("rereading %q: %v", data, err)
		}
		if len(back.Header) != len(tab.Header) || back.Rows() != tab.Rows() {
			t.Fatalf("reread %v, wrote %v", back, tab)
		}
	})
}

// FuzzParseSummary: any text either fails to decode or encodes and
// decodes again to a summary that encodes the same; flattening never panics.
func FuzzParseSummary(f *testing.F) {
	f.Add([]byte(`{"run": {"steps": 3, "sim_time_s": 1.5}, "flow": {"u_top_m_s": null}}`))
	f.Add([]byte(`{"canopy": {"height_m": 0.1, "drag_density_1_m": 8}, "spectrum": {"probes": 2}}`))
	f.Add([]byte(`{"scalars": {"o2": {"mean_in_canopy": 0.2}}}`))
	f.Add([]byte(`{"phases": {"bins": 12, "period_s": 8, "velocity_ratio_oscillating": null}, "canopy": {"flexible": {"blade_length_m": 0.2}}}`))
	f.Add([]byte(`[1, 2]`))
	f.Fuzz(func(t *testing.T, data []byte) {
		FlattenJSON(data)
		s, err := parseSummary(data)
		if err != nil {
			return
		}
		b, err := json.Marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		again, err := parseSummary(b)
		if err != nil {
			t.Fatalf("re-decoding %s: %v", b, err)
		}
		b2, err := json.Marshal(again)
		if err != nil || !bytes.Equal(b, b2) {
			t.Fatalf("%s became %s (%v)", b, b2, err)
		}
		if _, err := FlattenJSON(b); err != nil {
			t.Fatalf("flattening %s: %v", b, err)
		}
	})
}

// FuzzParseSweepTable: any text either fails or writes back to a table
// that reads the same.
func FuzzParseSweepTable(f *testing.F) {
	f.Add([]byte("member,canopy.height,flow.u_top_m_s\n0,0.1,0.05\n1,0.2,\n"))
	f.Add([]byte("member\n"))
	f.Add([]byte("x,\"y\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := parseSweepTable(bytes.NewReader(data))
		if err != nil {
			return
		}
		path := filepath.Join(t.TempDir(), SweepTableFile)
		if err := tab.WriteCSV(path); err != nil {
			t.Fatal(err)
		}
		back, err := ReadSweepTable(path)
		if err != nil {
			t.Fatalf("rereading %q: %v", data, err)
		}
		if len(back.Rows) != len(tab.Rows) || !reflect.DeepEqual(back.Header, tab.Header) {
			t.Fatalf("reread %q, wrote %q", back, tab)
		}
	})
}

// FuzzParsePoint: a probe column's position never panics the reader, and
// one it accepts prints back to the same text.
func FuzzParsePoint(f *testing.F) {
	f.Add("x=0 m, z=0.08 m)")
	f.Add("x=1.333 m, z=1e-05 m)")
	f.Add("x= m, z= m)")
	f.Add("x=0.2 m, y=0.05 m, z=0.08 m)")
	f.Add("x=0.2 m, y= m, z=0.08 m)")
	f.Fuzz(func(t *testing.T, s string) {
		x, y, z, err := parsePoint(s)
		if err != nil {
			return
		}
		if math.IsNaN(x) || math.IsNaN(z) || y != nil && math.IsNaN(*y) {
			return // NaN positions read but do not compare
		}
		again := "x=" + shortFloat(x) + " m, z=" + shortFloat(z) + " m)"
		if y != nil {
			again = "x=" + shortFloat(x) + " m, y=" + shortFloat(*y) + " m, z=" + shortFloat(z) + " m)"
		}
		_, y2, _, err := parsePoint(again)
		if err != nil || (y == nil) != (y2 == nil) {
			t.Fatalf("%q read as %q, which does not read again the same way: %v", s, again, err)
		}
	})
}

// FuzzReadPhaseTables: the readers of phase_profiles.csv and
// phase_cycle.csv never panic, and what they accept has at least two bins
// of profiles as long as the heights, and cycle columns as long as the
// phases.
func FuzzReadPhaseTables(f *testing.F) {
	f.Add([]byte("\"z [m]\",\"U (phase 0) [m/s]\",\"u'w' (phase 0) [m2/s2]\",\"U (phase 1) [m/s]\",\"u'w' (phase 1) [m2/s2]\"\n0.1,1,2,3,4\n"),
		[]byte("\"phase [1]\",\"averaging time [s]\",\"bent height [m]\"\n0.25,1,NaN\n0.75,0,0.1\n"))
	f.Add([]byte("\"z [m]\",\"U (phase 0) [m/s]\"\n1,2\n"), []byte("\"phase [1]\"\n0.5\n"))
	f.Fuzz(func(t *testing.T, profiles, cycle []byte) {
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, PhaseProfilesFile), profiles, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, PhaseCycleFile), cycle, 0o644); err != nil {
			t.Fatal(err)
		}
		if p, err := ReadPhaseProfiles(dir); err == nil {
			if len(p.Bins) < 2 {
				t.Fatalf("accepted %d bins", len(p.Bins))
			}
			for _, b := range p.Bins {
				if len(b.U) != len(p.Z) || len(b.UW) != len(p.Z) {
					t.Fatalf("bin columns of %d and %d values for %d heights", len(b.U), len(b.UW), len(p.Z))
				}
			}
		}
		if c, err := ReadPhaseCycle(dir); err == nil {
			for _, col := range [][]float64{c.Time, c.UIn, c.UAbove, c.Ratio, c.BentHeight} {
				if col != nil && len(col) != len(c.Phase) {
					t.Fatalf("a column of %d values for %d phases", len(col), len(c.Phase))
				}
			}
		}
	})
}
