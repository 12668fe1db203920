//go:build !cgo

package transform

import "errors"

// haveFFTW reports whether this build has the FFTW backend.
const haveFFTW = false

// errNoCgo is New's error for the FFTW backend in a build without cgo.
var errNoCgo = errors.New("transform: FFTW backend unavailable: built without cgo; use the gonum backend")

func newFFTW(layout) (Plan, error) { return nil, errNoCgo }
