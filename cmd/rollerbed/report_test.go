package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"rollerbed/io/runfolder"
	"strings"
	"testing"
)

// reportCase is a small canopy case of a few hundred steps with snapshots,
// statistics after a spin-up and canopy-top probes; SEED is replaced.
const reportCase = `
title = "report test: small canopy"
[domain]
length = 0.4
depth = 0.2
nx = 32
nz = 24
[fluid]
viscosity = 1.0e-5
[canopy]
height = 0.08
frontal_area = 15.0
diameter = 0.004
drag_coefficient = 1.0
[forcing]
bulk_velocity = 0.05
[initial]
profile = "drag-balanced"
perturbation = 0.002
perturbation_at = 0.08
perturbation_width = 0.03
seed = SEED
[[scalar]]
name = "oxygen"
diffusivity = 1.76e-9
initial = 0.25
uptake = "hilpert"
capacity = 2.0e-5
[time]
duration = 4.0
spin_up = 1.0
[output]
profile_every = 0.25
snapshot_every = 0.5
checkpoint_every = 2.0
probes = 4
[numerics]
workers = 1
`

// runSeeds runs reportCase once per seed into parent/seedN.
func runSeeds(t *testing.T, parent string, seeds ...int) []string {
	t.Helper()
	var dirs []string
	for _, s := range seeds {
		cs := filepath.Join(parent, fmt.Sprintf("seed%d.toml", s))
		os.WriteFile(cs, []byte(strings.Replace(reportCase, "SEED", fmt.Sprint(s), 1)), 0o644)
		dir := filepath.Join(parent, fmt.Sprint("seed", s))
		if code, _, e := runCmd(t, "run", cs, "--out", dir, "--quiet", "--no-figures"); code != exitOK {
			t.Fatalf("run seed %d: %d %s", s, code, e)
		}
		dirs = append(dirs, dir)
	}
	return dirs
}

var spaces = regexp.MustCompile(`\s{2,}`)

// table parses an aligned table (columns two or more spaces apart) from the
// line that starts with head to the first blank line.
func table(t *testing.T, out, head string) [][]string {
	t.Helper()
	var rows [][]string
	in := false
	for _, l := range strings.Split(out, "\n") {
		if !in {
			in = strings.HasPrefix(l, head)
		}
		if !in {
			continue
		}
		if strings.TrimSpace(l) == "" {
			break
		}
		rows = append(rows, spaces.Split(strings.TrimSpace(l), -1))
	}
	if len(rows) == 0 {
		t.Fatalf("no table headed %q in:\n%s", head, out)
	}
	return rows
}

func TestReportAndCompare(t *testing.T) {
	parent := t.TempDir()
	dirs := runSeeds(t, parent, 3, 5)
	a, b := dirs[0], dirs[1]

	t.Run("report", func(t *testing.T) {
		code, o, e := runCmd(t, "report", a)
		if code != exitOK || e != "" {
			t.Fatalf("report: %d, stderr %q", code, e)
		}
		rows := table(t, o, "key")
		if h := rows[0]; len(h) != 3 || h[1] != "value" || h[2] != "unit" {
			t.Fatalf("header %q", h)
		}
		got := map[string][]string{}
		for _, r := range rows[1:] {
			got[r[0]] = r
		}
		for key, unit := range map[string]string{
			"run.steps": "–", "run.sim_time_s": "s", "flow.bulk_velocity_m_s": "m/s",
			"flow.pressure_gradient_m_s2": "m/s²", "flow.roller_frequency_hz": "Hz", "flow.canopy_height_m": "m",
		} {
			r, ok := got[key]
			if !ok || len(r) != 3 || r[2] != unit {
				t.Errorf("row %s = %q, want unit %q", key, r, unit)
			}
		}
		if r := got["run.sim_time_s"]; len(r) < 2 || r[1] != "4" {
			t.Errorf("sim time row %q", r)
		}
		for _, name := range []string{"vorticity.png", "profiles.png", "spectrum.png", "timeseries.png", "rollers.gif"} {
			p := filepath.Join(a, "figures", name)
			if !strings.Contains(o, p) {
				t.Errorf("report does not list %s", p)
			}
			if _, err := os.Stat(p); err != nil {
				t.Error(err)
			}
		}
	})

	t.Run("report --animate", func(t *testing.T) {
		code, o, e := runCmd(t, "report", a, "--animate", "oxygen")
		if code != exitOK || !strings.Contains(o, filepath.Join(a, "figures", "rollers.gif")) {
			t.Errorf("--animate oxygen: %d, stderr %q", code, e)
		}
		code, _, e = runCmd(t, "report", a, "--animate", "dye")
		if code != exitFail || !strings.Contains(e, `"dye"`) || !strings.Contains(e, `"oxygen"`) {
			t.Errorf("--animate dye (no such field): %d, stderr %q", code, e)
		}
		if code, o, _ := runCmd(t, "help", "report"); code != exitOK || !strings.Contains(o, "--animate") || !strings.Contains(o, "scalars.png") {
			t.Errorf("help report: %d %q", code, o)
		}
	})

	t.Run("report --no-figures", func(t *testing.T) {
		code, o, _ := runCmd(t, "report", b, "--no-figures")
		if code != exitOK || !strings.Contains(o, "flow.bulk_velocity_m_s") || strings.Contains(o, "figures:") {
			t.Fatalf("code %d, output:\n%s", code, o)
		}
		if _, err := os.Stat(filepath.Join(b, "figures")); err == nil {
			t.Error("--no-figures made the figures folder")
		}
	})

	t.Run("compare", func(t *testing.T) {
		// A copy of the second run with a scalar summary key the first lacks.
		c := filepath.Join(parent, "scalar")
		os.MkdirAll(c, 0o755)
		sum, _ := os.ReadFile(filepath.Join(b, runfolder.SummaryFile))
		var m map[string]any
		json.Unmarshal(sum, &m)
		m["scalars"] = map[string]any{"oxygen": map[string]any{"total_uptake_per_bed_area_mol_m2_s": 4e-7}}
		out, _ := json.Marshal(m)
		os.WriteFile(filepath.Join(c, runfolder.SummaryFile), out, 0o644)

		code, o, e := runCmd(t, "compare", a, b, c, "--no-figures")
		if code != exitOK || e != "" {
			t.Fatalf("compare: %d, stderr %q", code, e)
		}
		rows := table(t, o, "key")
		head := []string{"key", "unit", "seed3", "seed5", "÷ first", "scalar", "÷ first"}
		if strings.Join(rows[0], "|") != strings.Join(head, "|") {
			t.Fatalf("header %q, want %q", rows[0], head)
		}
		got := map[string][]string{}
		for _, r := range rows[1:] {
			if len(r) != len(head) {
				t.Errorf("row %q has %d cells, want %d", r, len(r), len(head))
			}
			got[r[0]] = r
		}
		if r := got["run.nx"]; len(r) != 7 || r[2] != "32" || r[3] != "32" || r[4] != "1" || r[6] != "1" {
			t.Errorf("run.nx row %q", r)
		}
		if r := got["flow.bulk_velocity_m_s"]; len(r) != 7 || r[1] != "m/s" || r[4] != "1" {
			t.Errorf("bulk velocity row %q (the forcing holds it at 0.05 m/s in both runs)", r)
		}
		if r := got["scalars.oxygen.total_uptake_per_bed_area_mol_m2_s"]; len(r) != 7 || r[1] != "mol/(m²·s)" ||
			r[2] != "–" || r[3] != "–" || r[4] != "–" || r[5] != "4e-07" || r[6] != "–" {
			t.Errorf("scalar row %q", r)
		}
		if _, ok := got["flow.penetration_depth_m"]; !ok {
			t.Error("no penetration depth row")
		}
		// Round-off gets no ratio: the supply through the top next to the
		// uptake, and the divergence, which is round-off by design.
		for _, key := range []string{"scalars.oxygen.top_supply_per_bed_area", "flow.max_divergence"} {
			if r := got[key]; len(r) != 7 || r[4] != "–" {
				t.Errorf("%s row %q, want no ratio", key, r)
			}
		}
		if _, ok := got["run.title"]; ok {
			t.Error("a text key in the comparison")
		}
	})

	t.Run("compare --json and figures", func(t *testing.T) {
		out := filepath.Join(parent, "cmp")
		code, o, e := runCmd(t, "compare", a, b, "--json", "--out", out)
		if code != exitOK || e != "" {
			t.Fatalf("compare --json: %d, stderr %q", code, e)
		}
		var res map[string]json.RawMessage
		if err := json.Unmarshal([]byte(o), &res); err != nil {
			t.Fatalf("not JSON: %v\n%s", err, o)
		}
		for _, k := range []string{"runs", "dirs", "titles", "rows", "figures", "notes"} {
			if _, ok := res[k]; !ok {
				t.Errorf("no key %q in %s", k, o)
			}
		}
		var rows []struct {
			Key          string     `json:"key"`
			Unit         string     `json:"unit"`
			Values       []*float64 `json:"values"`
			RatioToFirst []*float64 `json:"ratio_to_first"`
		}
		json.Unmarshal(res["rows"], &rows)
		found := false
		for _, r := range rows {
			if len(r.Values) != 2 || len(r.RatioToFirst) != 2 {
				t.Errorf("row %+v", r)
			}
			if r.Key == "flow.penetration_depth_m" && r.Unit == "m" && r.Values[0] != nil && *r.RatioToFirst[0] == 1 {
				found = true
			}
		}
		if !found {
			t.Error("no penetration depth row with unit m")
		}
		var figs []string
		json.Unmarshal(res["figures"], &figs)
		var names []string
		for _, f := range figs {
			names = append(names, filepath.Base(f))
			if filepath.Dir(f) != out {
				t.Errorf("figure %s is not in %s", f, out)
			}
		}
		if got := strings.Join(names, " "); got != "profiles.png spectra.png scalars.png uptake.png" {
			t.Errorf("figures %q, want the velocity profiles, spectra, scalar profiles and uptake", got)
		}
		for _, f := range figs {
			if _, err := os.Stat(f); err != nil {
				t.Error(err)
			}
		}
	})

	t.Run("compare default figures folder", func(t *testing.T) {
		if code, _, e := runCmd(t, "compare", a, b); code != exitOK {
			t.Fatalf("compare: %d %s", code, e)
		}
		for _, n := range []string{"profiles.png", "spectra.png"} {
			if _, err := os.Stat(filepath.Join(a, "figures", "compare", n)); err != nil {
				t.Error(err)
			}
		}
	})

	t.Run("compare errors", func(t *testing.T) {
		if code, _, e := runCmd(t, "compare", a); code != exitUsage || !strings.Contains(e, "two or more run folders") {
			t.Errorf("one folder: %d %q", code, e)
		}
		empty := t.TempDir()
		if code, _, e := runCmd(t, "compare", a, empty); code != exitUsage || !strings.Contains(e, "is not a run folder") {
			t.Errorf("not a run folder: %d %q", code, e)
		}
		half := t.TempDir()
		os.WriteFile(filepath.Join(half, runfolder.CaseFile), []byte("title = 'x'\n"), 0o644)
		if code, _, e := runCmd(t, "compare", a, half); code != exitFail || !strings.Contains(e, "has no summary.json") || !strings.Contains(e, "--resume") {
			t.Errorf("no summary: %d %q", code, e)
		}
	})
}

func TestReportErrors(t *testing.T) {
	if code, _, e := runCmd(t, "report"); code != exitUsage || !strings.Contains(e, "Usage: rollerbed report RUNDIR") {
		t.Errorf("no folder: %d %q", code, e)
	}
	empty := t.TempDir()
	if code, _, e := runCmd(t, "report", empty); code != exitUsage || !strings.Contains(e, "is not a run folder") || !strings.Contains(e, "rollerbed run --out DIR") {
		t.Errorf("not a run folder: %d %q", code, e)
	}
	if code, _, e := runCmd(t, "report", filepath.Join(empty, "missing")); code != exitUsage || !strings.Contains(e, "no such file or directory") {
		t.Errorf("missing folder: %d %q", code, e)
	}
	// A run folder that was killed before it wrote its results: the
	// summary is missing, and so is every figure's data.
	killed := t.TempDir()
	os.WriteFile(filepath.Join(killed, runfolder.CaseFile), []byte(strings.Replace(reportCase, "SEED", "1", 1)), 0o644)
	code, _, e := runCmd(t, "report", killed)
	if code != exitFail || !strings.Contains(e, "has no summary.json") || !strings.Contains(e, "rollerbed run --resume "+killed) {
		t.Errorf("no summary: %d %q", code, e)
	}
	if !strings.Contains(e, "note: spectrum.png skipped") {
		t.Errorf("no notes on the skipped figures: %q", e)
	}
	if code, o, _ := runCmd(t, "help", "compare"); code != exitOK || !strings.Contains(o, "÷ first") || !strings.Contains(o, "--json") {
		t.Errorf("help compare: %d %q", code, o)
	}
}
