package solver

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// rowKernel is one row kernel in both versions, applied to the same inputs:
// in[i] are read-only rows, the returned rows are the ones it writes.
type rowKernel struct {
	name     string
	inputs   int
	compiled func(in [][]float64, out [][]float64)
	goRef    func(in [][]float64, out [][]float64)
	outputs  int
}

func rowKernels() []rowKernel {
	const a, b, c, d, e = 0.3, 0.7, 1.9, 2.5e-4, 0.45
	return []rowKernel{
		{"visc", 8, func(in, out [][]float64) {
			viscRow(1e-6, d, c, a, b, in[0], in[1], in[2], in[3], in[4], in[5], in[6], in[7], out[0])
		}, func(in, out [][]float64) {
			viscRowGo(1e-6, d, c, a, b, in[0], in[1], in[2], in[3], in[4], in[5], in[6], in[7], out[0])
		}, 1},
		{"centre", 5, func(in, out [][]float64) {
			centreRow(a, b, c, in[0], in[1], in[2], in[3], in[4], out[0], out[1])
		}, func(in, out [][]float64) {
			centreRowGo(a, b, c, in[0], in[1], in[2], in[3], in[4], out[0], out[1])
		}, 2},
		{"scalar-x", 4, func(in, out [][]float64) {
			scalarXFlux(d, 1e-6, e, in[0], in[1], in[2], in[3], out[0])
		}, func(in, out [][]float64) {
			scalarXFluxGo(d, 1e-6, e, in[0], in[1], in[2], in[3], out[0])
		}, 1},
		{"interp", 2, func(in, out [][]float64) { interpRow(a, b, in[0], in[1], out[0]) },
			func(in, out [][]float64) { interpRowGo(a, b, in[0], in[1], out[0]) }, 1},
		{"face", 5, func(in, out [][]float64) {
			faceRow(a, b, c, in[0], in[1], in[2], in[3], in[4], out[0], out[1])
		}, func(in, out [][]float64) {
			faceRowGo(a, b, c, in[0], in[1], in[2], in[3], in[4], out[0], out[1])
		}, 2},
		{"scalar-z", 3, func(in, out [][]float64) { scalarZFlux(a, b, in[0], in[1], in[2], out[0]) },
			func(in, out [][]float64) { scalarZFluxGo(a, b, in[0], in[1], in[2], out[0]) }, 1},
	}
}

// randomRows returns k rows of n values of either sign, with some zeros.
func randomRows(r *rand.Rand, k, n int) [][]float64 {
	rows := make([][]float64, k)
	for j := range rows {
		rows[j] = make([]float64, n)
		for i := range rows[j] {
			if r.IntN(7) == 0 {
				continue
			}
			rows[j][i] = 2*r.Float64() - 1
		}
	}
	return rows
}

// TestRowKernelsAgree: the compiled row kernels make the same operations in
// the same order as the Go ones and take correctly rounded square roots,
// so both give the same numbers bit for bit, for row lengths that leave
// every remainder of the vector loops (common practice, no source).
func TestRowKernelsAgree(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 1))
	for _, k := range rowKernels() {
		for _, n := range []int{1, 2, 3, 5, 8, 13, 64, 511} {
			in := randomRows(r, k.inputs, n)
			got, want := randomRows(r, k.outputs, n), randomRows(r, k.outputs, n)
			k.compiled(in, got)
			k.goRef(in, want)
			for o := range got {
				for i := range got[o] {
					if math.Float64bits(got[o][i]) != math.Float64bits(want[o][i]) {
						t.Fatalf("%s n=%d: output %d [%d] = %v compiled, %v in Go", k.name, n, o, i, got[o][i], want[o][i])
					}
				}
			}
		}
	}
}

// BenchmarkRowKernels times each row kernel on rows of 512 values, compiled
// and in Go.
func BenchmarkRowKernels(b *testing.B) {
	r := rand.New(rand.NewPCG(5, 1))
	for _, k := range rowKernels() {
		in, out := randomRows(r, k.inputs, 512), randomRows(r, k.outputs, 512)
		for _, v := range []struct {
			name string
			f    func(in, out [][]float64)
		}{{"compiled", k.compiled}, {"go", k.goRef}} {
			b.Run(fmt.Sprintf("%s/%s", k.name, v.name), func(b *testing.B) {
				for b.Loop() {
					v.f(in, out)
				}
			})
		}
	}
}
