//go:build !cgo

package transform

import "errors"

// haveFFTW reports whether this build has the FFTW backend.
const haveFFTW = false

// FFTWVersion returns the version string of the FFTW library linked into
// this program, as the library states it ("fftw-3.3.10-sse2-avx"), or
// "not linked" in a build without cgo.
func FFTWVersion() string { return "not linked" }

// errNoCgo is New's error for the FFTW backend in a build without cgo.
var errNoCgo = errors.New("transform: FFTW backend unavailable: built without cgo; use the gonum backend")

func newFFTW(layout) (Plan, error) { return nil, errNoCgo }
