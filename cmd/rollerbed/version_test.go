package main

import (
	"encoding/json"
	"os/exec"
	"strings"
	"testing"

	"rollerbed/io/runfolder"
	"rollerbed/runs"
)

// pkgConfigVersion returns what pkg-config says of module's version, or
// skips when it cannot say.
func pkgConfigVersion(t *testing.T, module string) string {
	t.Helper()
	pc, err := exec.LookPath("pkg-config")
	if err != nil {
		t.Skip("pkg-config not found: install it to compare the library versions")
	}
	out, err := exec.Command(pc, "--modversion", module).Output()
	if err != nil {
		t.Skipf("pkg-config knows no %s: %v", module, err)
	}
	return strings.TrimSpace(string(out))
}

// TestVersionPrintsProvenance: `rollerbed version` prints the version and a
// line per fact of the build, its libraries and the host; the HDF5 and
// FFTW versions agree with pkg-config's, an independent source (common
// practice, no source); --json gives the same facts.
func TestVersionPrintsProvenance(t *testing.T) {
	code, out, e := runCmd(t, "version")
	if code != exitOK || e != "" {
		t.Fatalf("version: code %d, stderr %q", code, e)
	}
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	if lines[0] != "rollerbed "+runs.Version {
		t.Errorf("first line %q, want %q", lines[0], "rollerbed "+runs.Version)
	}
	got := map[string]string{}
	for _, l := range lines[1:] {
		i := strings.Index(l, "  ")
		if i < 0 {
			t.Fatalf("line %q has no value", l)
		}
		got[l[:i]] = strings.TrimSpace(l[i:])
	}
	var p runfolder.Provenance
	for _, f := range p.Facts() {
		if f.Key == "version" || f.Key == "command_line" {
			continue
		}
		if got[f.Label] == "" {
			t.Errorf("no %s line in\n%s", f.Label, out)
		}
	}
	if h := pkgConfigVersion(t, "hdf5"); got["HDF5"] != h {
		t.Errorf("HDF5 %q, pkg-config says %q", got["HDF5"], h)
	}
	if f := "fftw-" + pkgConfigVersion(t, "fftw3"); got["FFTW"] != f && !strings.HasPrefix(got["FFTW"], f+"-") {
		t.Errorf("FFTW %q, pkg-config says %q", got["FFTW"], f)
	}

	for _, args := range [][]string{{"version", "--json"}, {"--version", "--json"}} {
		code, js, e := runCmd(t, args...)
		if code != exitOK || e != "" {
			t.Fatalf("%q: code %d, stderr %q", args, code, e)
		}
		var jp runfolder.Provenance
		if err := json.Unmarshal([]byte(js), &jp); err != nil {
			t.Fatalf("%q: %v in\n%s", args, err, js)
		}
		for _, f := range jp.Facts() {
			if *f.Value == "" {
				t.Errorf("%q: %s is empty", args, f.Key)
			} else if want, ok := got[f.Label]; ok && want != *f.Value {
				t.Errorf("%q: %s = %q, the text says %q", args, f.Key, *f.Value, want)
			}
		}
		if jp.Version != runs.Version {
			t.Errorf("%q: version %q", args, jp.Version)
		}
	}
}
