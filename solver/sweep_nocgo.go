//go:build !cgo

package solver

// forward runs the sweep in Go: this build has no C compiler.
func (a *sweepArgs) forward() { a.forwardGo() }
