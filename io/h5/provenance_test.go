package h5

import (
	"os/exec"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"rollerbed/io/runfolder"
)

// testProvenance is a provenance with every fact set, in words that
// h5dump prints as they are.
func testProvenance() runfolder.Provenance {
	return runfolder.Provenance{
		Version:      testMeta(0).Version,
		Revision:     "0123456789abcdef0123456789abcdef01234567",
		RevisionTime: "2024-06-10T17:00:00Z",
		Modified:     "false",
		GoVersion:    "go1.26.0",
		HDF5:         "1.10.8",
		FFTW:         "fftw-3.3.10-sse2-avx",
		Host:         "node17",
		CommandLine:  "rollerbed run case.toml --out runA",
	}
}

// createMeta creates a fields file with meta and nothing else, and returns
// its path and the meta read back from it.
func createMeta(t *testing.T, meta Meta) (string, Meta) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl, err := Create(path, meta)
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	got, err := ReadMeta(path)
	if err != nil {
		t.Fatal(err)
	}
	return path, got
}

// TestProvenanceAttributes: the provenance of the creating process is
// stored as root attributes, reads back through this package and through
// h5dump (an independent reader), and each OpenToResume adds a line
// (the time to the second) without changing it.
func TestProvenanceAttributes(t *testing.T) {
	meta := testMeta(0)
	meta.Provenance = testProvenance()
	path, got := createMeta(t, meta)
	if got.Provenance != meta.Provenance || got.Version != meta.Version || len(got.Resumes) != 0 {
		t.Errorf("read back %+v, resumes %v; want %+v", got.Provenance, got.Resumes, meta.Provenance)
	}

	h5dump := needTool(t, "h5dump", "hdf5-tools")
	p := meta.Provenance
	for _, f := range p.Facts() {
		out, err := exec.Command(h5dump, "-a", "/"+f.Key, path).CombinedOutput()
		if err != nil {
			t.Errorf("h5dump -a /%s: %v\n%s", f.Key, err, out)
			continue
		}
		if want := `(0): "` + *f.Value + `"`; !strings.Contains(string(out), want) {
			t.Errorf("h5dump -a /%s does not show %s:\n%s", f.Key, want, out)
		}
	}

	resumes := []Resume{
		{time.Date(2024, 6, 12, 9, 0, 0, 0, time.UTC), `rollerbed run --resume "run A"`},
		{time.Date(2024, 6, 13, 10, 30, 5, 0, time.UTC), "rollerbed run --resume runA"},
	}
	for i, r := range resumes {
		fl, err := OpenToResume(path, Resume{r.Time.Add(700 * time.Millisecond), r.CommandLine})
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(fl.Meta().Resumes, resumes[:i+1]) {
			t.Errorf("after resume %d: Meta().Resumes = %v", i+1, fl.Meta().Resumes)
		}
		if err := fl.Close(); err != nil {
			t.Fatal(err)
		}
	}
	got, err := ReadMeta(path)
	if err != nil {
		t.Fatal(err)
	}
	if got.Provenance != meta.Provenance {
		t.Errorf("after the resumes the provenance is %+v, want the creator's %+v", got.Provenance, meta.Provenance)
	}
	if !reflect.DeepEqual(got.Resumes, resumes) {
		t.Errorf("resumes read back as %v, want %v", got.Resumes, resumes)
	}
	out, err := exec.Command(h5dump, "-a", "/"+resumedAttr, path).CombinedOutput()
	if err != nil || !strings.Contains(string(out), "2024-06-13T10:30:05Z rollerbed run --resume runA") {
		t.Errorf("h5dump -a /%s: %v\n%s", resumedAttr, err, out)
	}
}

// TestProvenanceOptional: a file made without provenance (or by a version
// before it was stored) has none of its attributes, and reads back with
// the facts empty.
func TestProvenanceOptional(t *testing.T) {
	_, got := createMeta(t, testMeta(0))
	want := runfolder.Provenance{Version: testMeta(0).Version}
	if got.Provenance != want {
		t.Errorf("provenance %+v, want only the version", got.Provenance)
	}
}

// TestOpenToResumeRefusesLineBreaks: a command line that would break the
// one-line-per-resume attribute is refused, and the file is unchanged.
func TestOpenToResumeRefusesLineBreaks(t *testing.T) {
	path, _ := createMeta(t, testMeta(0))
	if _, err := OpenToResume(path, Resume{time.Now(), "rollerbed run\n--resume x"}); err == nil || !strings.Contains(err.Error(), "line break") {
		t.Errorf("OpenToResume with a line break: %v", err)
	}
	if m, err := ReadMeta(path); err != nil || len(m.Resumes) != 0 {
		t.Errorf("resumes %v, %v; want none", m.Resumes, err)
	}
}

// TestLibraryVersion: the version the library reports at run time matches
// the one pkg-config gives for the installed development files, an
// independent source (common practice, no source).
func TestLibraryVersion(t *testing.T) {
	v, err := LibraryVersion()
	if err != nil {
		t.Fatal(err)
	}
	pc, err := exec.LookPath("pkg-config")
	if err != nil {
		t.Skip("pkg-config not found: install it to compare the HDF5 version")
	}
	out, err := exec.Command(pc, "--modversion", "hdf5").Output()
	if err != nil {
		t.Skipf("pkg-config knows no hdf5: %v", err)
	}
	if want := strings.TrimSpace(string(out)); v != want {
		t.Errorf("LibraryVersion() = %q, pkg-config says %q", v, want)
	}
}

// FuzzParseResumes: any text of the resumed attribute parses without
// panicking, and what it yields writes back to text that parses to the
// same resumes.
func FuzzParseResumes(f *testing.F) {
	f.Add("2024-06-12T09:00:00Z rollerbed run --resume runA\n")
	f.Add("2024-06-12T09:00:00+02:00 a\nnot a time\n2024-06-13T10:30:05Z\n")
	f.Add("")
	f.Fuzz(func(t *testing.T, text string) {
		rs := parseResumes(text)
		var b strings.Builder
		for _, r := range rs {
			if strings.ContainsAny(r.CommandLine, "\n") {
				t.Fatalf("a command line holds a line break: %q", r.CommandLine)
			}
			b.WriteString(r.line())
		}
		again := parseResumes(b.String())
		if len(again) != len(rs) {
			t.Fatalf("%q: %d resumes, %d after writing back", text, len(rs), len(again))
		}
		for i := range rs {
			if !again[i].Time.Equal(rs[i].Time) || again[i].CommandLine != rs[i].CommandLine {
				t.Fatalf("%q: resume %d is %v, %v after writing back", text, i, rs[i], again[i])
			}
		}
	})
}
