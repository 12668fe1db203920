//go:build cgo

package transform

import (
	"os/exec"
	"strings"
	"testing"
)

// TestFFTWVersion: the linked library's version string names the version
// that pkg-config gives for the installed development files, an
// independent source (common practice, no source).
func TestFFTWVersion(t *testing.T) {
	v := FFTWVersion()
	if !strings.HasPrefix(v, "fftw-") {
		t.Fatalf("FFTWVersion() = %q, want fftw-…", v)
	}
	pc, err := exec.LookPath("pkg-config")
	if err != nil {
		t.Skip("pkg-config not found: install it to compare the FFTW version")
	}
	out, err := exec.Command(pc, "--modversion", "fftw3").Output()
	if err != nil {
		t.Skipf("pkg-config knows no fftw3: %v", err)
	}
	want := "fftw-" + strings.TrimSpace(string(out))
	if v != want && !strings.HasPrefix(v, want+"-") {
		t.Errorf("FFTWVersion() = %q, pkg-config says %q", v, want)
	}
}
