//go:build !cgo || !amd64

package solver

// eliminate runs the forward elimination in Go: this build has no C
// compiler, or the compiled kernel (x86-64 vector code) does not apply.
func (a *thomasArgs) eliminate() { a.eliminateGo() }

// backSubstitute runs backSubstituteGo.
func backSubstitute(f, cp []float64, nx, i0, n, j0, j1 int) {
	backSubstituteGo(f, cp, nx, i0, n, j0, j1)
}
