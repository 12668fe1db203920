//go:build !cgo || !amd64

package solver

// forward runs the sweep in Go: this build has no C compiler, or the
// compiled kernel (x86-64 vector code) does not apply.
func (a *sweepArgs) forward() { a.forwardGo() }
