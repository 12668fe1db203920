//go:build !cgo

package transform

import (
	"errors"
	"strings"
	"testing"
)

func TestFFTWWithoutCgo(t *testing.T) {
	p, err := New(FFTW, 16, 4, 2)
	if p != nil || !errors.Is(err, errNoCgo) || !strings.Contains(err.Error(), "built without cgo; use the gonum backend") {
		t.Fatalf("New(FFTW) without cgo = %v, %v; want errNoCgo", p, err)
	}
}

func TestFFTWVersionWithoutCgo(t *testing.T) {
	if v := FFTWVersion(); v != "not linked" {
		t.Errorf("FFTWVersion() without cgo = %q, want \"not linked\"", v)
	}
}
