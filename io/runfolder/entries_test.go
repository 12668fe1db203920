package runfolder

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestFlattenJSONKeepsOrderAndNests(t *testing.T) {
	es, err := FlattenJSON([]byte(`{"run": {"steps": 12, "title": "a"}, "flow": {"u_m_s": 0.5, "none": null},
		"scalars": {"oxygen": {"uptake_mol_m2_s": 1e-6, "ok": true}}, "probes": {"z_m": [0.1, 0.2]}}`))
	if err != nil {
		t.Fatal(err)
	}
	want := []Entry{
		{"run.steps", 12.0}, {"run.title", "a"}, {"flow.u_m_s", 0.5}, {"flow.none", nil},
		{"scalars.oxygen.uptake_mol_m2_s", 1e-6}, {"scalars.oxygen.ok", true},
		{"probes.z_m[0]", 0.1}, {"probes.z_m[1]", 0.2},
	}
	if len(es) != len(want) {
		t.Fatalf("entries %v, want %v", es, want)
	}
	for i := range want {
		if es[i] != want[i] {
			t.Errorf("entry %d = %v, want %v", i, es[i], want[i])
		}
	}
	for _, bad := range []string{``, `[1, 2]`, `{"a": 1} {"b": 2}`, `{"a": }`} {
		if _, err := FlattenJSON([]byte(bad)); err == nil {
			t.Errorf("%q flattened without an error", bad)
		}
	}
}

func TestUnitFromKeySuffix(t *testing.T) {
	for key, want := range map[string]string{
		"flow.bulk_velocity_m_s":                            "m/s",
		"flow.pressure_gradient_m_s2":                       "m/s²",
		"run.sim_time_s":                                    "s",
		"flow.canopy_height_m":                              "m",
		"flow.roller_frequency_hz":                          "Hz",
		"flow.u1_m_s":                                       "m/s",
		"eddy_diffusivity_m2_s":                             "m²/s",
		"scalars.oxygen.total_uptake_per_bed_area_mol_m2_s": "mol/(m²·s)",
		"scalars.oxygen.decay_rate_1_s":                     "1/s",
		"probes.z_m[3]":                                     "m",
		"run.steps":                                         "",
		"run.nx":                                            "",
		"flow.strouhal":                                     "",
		"flow.max_divergence":                               "",
		"scalars.oxygen.total_uptake_per_bed_area":          "",
		"m_s": "",
		"s":   "",
	} {
		if got := Unit(key); got != want {
			t.Errorf("Unit(%q) = %q, want %q", key, got, want)
		}
	}
}

func TestFormatValue(t *testing.T) {
	for _, c := range []struct {
		v    any
		want string
	}{
		{nil, "–"}, {123.0, "123"}, {12345678.0, "12345678"}, {0.000620664830257, "0.000620665"},
		{2.43e-16, "2.43e-16"}, {true, "yes"}, {false, "no"}, {"a  b\nc", "a b c"}, {"", "–"},
	} {
		if got := FormatValue(c.v); got != c.want {
			t.Errorf("FormatValue(%v) = %q, want %q", c.v, got, c.want)
		}
	}
}

func TestSummaryTableColumns(t *testing.T) {
	var b bytes.Buffer
	WriteSummaryTable(&b, []Entry{{"run.title", "two words"}, {"flow.u_m_s", 0.5}, {"flow.strouhal", nil}})
	lines := strings.Split(strings.TrimSpace(b.String()), "\n")
	if len(lines) != 4 {
		t.Fatalf("table:\n%s", b.String())
	}
	// Columns line up in characters (tabwriter counts runes).
	col := strings.Index(lines[0], "value")
	ucol := strings.Index(lines[0], "unit")
	for _, l := range lines[1:] {
		if r := []rune(l); string(r[col-2:col]) != "  " {
			t.Errorf("value column not aligned in %q", l)
		}
	}
	if !strings.HasPrefix(string([]rune(lines[2])[ucol:]), "m/s") || !strings.HasPrefix(string([]rune(lines[3])[ucol:]), "–") {
		t.Errorf("units misplaced:\n%s", b.String())
	}
}

func TestReadSummaryErrors(t *testing.T) {
	dir := t.TempDir()
	if _, err := ReadEntries(dir); err == nil || !strings.Contains(err.Error(), "is not a run folder") {
		t.Errorf("empty folder: %v", err)
	}
	os.WriteFile(filepath.Join(dir, "case.toml"), []byte("title = 'x'\n"), 0o644)
	if _, err := ReadEntries(dir); err == nil || !strings.Contains(err.Error(), "has no summary.json") || !strings.Contains(err.Error(), "rollerbed run --resume "+dir) {
		t.Errorf("no summary: %v", err)
	}
	os.WriteFile(filepath.Join(dir, "summary.json"), []byte(`{"run": {`), 0o644)
	if _, err := ReadEntries(dir); err == nil || !strings.Contains(err.Error(), "damaged") {
		t.Errorf("damaged summary: %v", err)
	}
	file := filepath.Join(dir, "case.toml")
	if err := Check(file); err == nil || !strings.Contains(err.Error(), "is a file") {
		t.Errorf("a file as run folder: %v", err)
	}
}
