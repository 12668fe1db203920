//go:build !cgo || !amd64

package solver

// This build has no C compiler, or the compiled kernels (x86-64 vector
// code) do not apply: the row kernels are the Go ones.
var (
	viscRow     = viscRowGo
	centreRow   = centreRowGo
	scalarXFlux = scalarXFluxGo
	interpRow   = interpRowGo
	faceRow     = faceRowGo
	scalarZFlux = scalarZFluxGo
)
