package casefile

import (
	"runtime"

	"rollerbed/io/stricttoml"
	"rollerbed/solver/transform"
)

// Numerics is the [numerics] table.
type Numerics struct {
	// Transform names the Fourier transform backend, one of
	// transform.Names: "fftw" (FFTW 3 through cgo, the fast default) or
	// "gonum" (gonum's pure-Go transform).
	Transform string `toml:"transform"`
	// Workers is the number of goroutines sharing a step, 0 to 256; 0
	// (the default) is one per CPU core, see WorkerCount.
	Workers int `toml:"workers"`
}

// maxWorkers bounds numerics.workers.
const maxWorkers = 256

// WorkerCount returns the number of goroutines to use: Workers, or
// runtime.NumCPU() when Workers is 0.
func (n Numerics) WorkerCount() int {
	if n.Workers == 0 {
		return runtime.NumCPU()
	}
	return n.Workers
}

func checkNumerics(c *Case, p *stricttoml.Problems) {
	n := &c.Numerics
	if p.Parsing && !p.Has("numerics.transform") {
		n.Transform = transform.FFTW.String()
	}
	if p.OK("numerics.transform") {
		p.OneOf("numerics.transform", n.Transform, transform.Names(), "")
	}
	if p.OK("numerics.workers") {
		p.IntRange("numerics.workers", int64(n.Workers), 0, maxWorkers, "goroutines sharing a step; 0 = one per CPU core", "")
	}
}

func numericsTemplate() string {
	return `[numerics]
# Fourier transform backend: "fftw" (FFTW 3, fast) or "gonum" (pure Go,
# slower, needs no C library). Default "fftw".
# transform = "fftw"
# Goroutines sharing each step; 0 = one per CPU core. Default 0; 0 to 256.
# workers = 0
`
}
