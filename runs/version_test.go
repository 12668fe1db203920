package runs

import (
	"context"
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/solver/transform"
)

// TestProvenanceFilled: every fact is filled, from its own source, or
// says "unknown" (a test binary carries no version-control stamp).
func TestProvenanceFilled(t *testing.T) {
	p := Provenance()
	for _, f := range p.Facts() {
		if *f.Value == "" {
			t.Errorf("%s is empty", f.Key)
		}
	}
	if p.Modified != "true" && p.Modified != "false" && p.Modified != unknown {
		t.Errorf("revision_modified = %q", p.Modified)
	}
	hdf5, err := h5.LibraryVersion()
	if err != nil {
		t.Fatal(err)
	}
	host, err := os.Hostname()
	if err != nil {
		host = unknown
	}
	for _, c := range []struct{ key, got, want string }{
		{"version", p.Version, Version},
		{"hdf5_version", p.HDF5, hdf5},
		{"fftw_version", p.FFTW, transform.FFTWVersion()},
		{"host", p.Host, host},
		{"command_line", p.CommandLine, CommandLine(os.Args)},
	} {
		if c.got != c.want {
			t.Errorf("%s = %q, want %q", c.key, c.got, c.want)
		}
	}
}

func TestSetBuild(t *testing.T) {
	stamped := []debug.BuildSetting{
		{Key: "-compiler", Value: "gc"},
		{Key: "vcs", Value: "git"},
		{Key: "vcs.revision", Value: "0123456789abcdef0123456789abcdef01234567"},
		{Key: "vcs.time", Value: "2024-06-10T17:00:00Z"},
		{Key: "vcs.modified", Value: "true"},
	}
	for _, c := range []struct {
		name     string
		bi       debug.BuildInfo
		rev, at  string
		modified string
		goV      string
	}{
		{"stamped", debug.BuildInfo{GoVersion: "go1.26.0", Settings: stamped},
			"0123456789abcdef0123456789abcdef01234567", "2024-06-10T17:00:00Z", "true", "go1.26.0"},
		{"go run or go test", debug.BuildInfo{GoVersion: "go1.26.0", Settings: stamped[:1]},
			unknown, unknown, unknown, "go1.26.0"},
		{"empty values", debug.BuildInfo{Settings: []debug.BuildSetting{{Key: "vcs.revision"}}},
			unknown, unknown, unknown, unknown},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := runfolder.Provenance{Revision: unknown, RevisionTime: unknown, Modified: unknown, GoVersion: unknown}
			setBuild(&p, &c.bi)
			if p.Revision != c.rev || p.RevisionTime != c.at || p.Modified != c.modified || p.GoVersion != c.goV {
				t.Errorf("got %+v", p)
			}
		})
	}
}

func TestCommandLine(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"rollerbed", "run", "case.toml", "--out", "runA"}, "rollerbed run case.toml --out runA"},
		{[]string{"rollerbed", "run", "my case.toml"}, `rollerbed run "my case.toml"`},
		{[]string{"rollerbed", "init", ""}, `rollerbed init ""`},
		{[]string{"rollerbed", `a"b`, `c\d`, "e'f"}, `rollerbed "a\"b" "c\\d" "e'f"`},
		{[]string{"rollerbed", "line\nbreak", "tab\there"}, `rollerbed "line\nbreak" "tab\there"`},
		{[]string{"rollerbed", "höhe=0.3"}, "rollerbed höhe=0.3"},
		{nil, ""},
	} {
		if got := CommandLine(c.args); got != c.want {
			t.Errorf("CommandLine(%q) = %s, want %s", c.args, got, c.want)
		}
	}
}

// TestRunRecordsProvenance: a run's fields.h5 and summary.json carry the
// provenance of the process that wrote them; a resume keeps the creator's
// provenance in fields.h5, adds a line naming the resume, and writes its
// own into summary.json.
func TestRunRecordsProvenance(t *testing.T) {
	sp, dir := interruptedRun(t)
	want := Provenance()
	fields := filepath.Join(dir, runfolder.FieldsFile)
	m, err := h5.ReadMeta(fields)
	if err != nil {
		t.Fatal(err)
	}
	if m.Provenance != want || len(m.Resumes) != 0 {
		t.Errorf("fields.h5 provenance %+v, resumes %v; want %+v and none", m.Provenance, m.Resumes, want)
	}
	sum, err := runfolder.ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Provenance == nil || *sum.Provenance != want {
		t.Errorf("summary.json provenance %+v, want %+v", sum.Provenance, want)
	}
	if _, err := Run(context.Background(), sp, Options{Dir: dir, Resume: true}); err != nil {
		t.Fatal(err)
	}
	m, err = h5.ReadMeta(fields)
	if err != nil {
		t.Fatal(err)
	}
	if m.Provenance != want {
		t.Errorf("after the resume fields.h5 provenance %+v, want the creator's %+v", m.Provenance, want)
	}
	if len(m.Resumes) != 1 || m.Resumes[0].CommandLine != want.CommandLine || m.Resumes[0].Time.Before(m.Started) {
		t.Errorf("resumes %v, want one by %q after %v", m.Resumes, want.CommandLine, m.Started)
	}
	if sum, err = runfolder.ReadSummary(dir); err != nil {
		t.Fatal(err)
	}
	if sum.Provenance == nil || *sum.Provenance != want {
		t.Errorf("summary.json after the resume: provenance %+v, want %+v", sum.Provenance, want)
	}
}
