package solver

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// randomThomas returns elimination arguments over random data: nz levels of
// width nx, the block [i0, i0+n), every optional array present when full.
func randomThomas(seed uint64, nx, nz, i0, n int, full bool) *thomasArgs {
	r := rand.New(rand.NewPCG(seed, 1))
	field := func(rows int) []float64 {
		f := make([]float64, rows*nx)
		for i := range f {
			f[i] = r.Float64() + 0.5
		}
		return f
	}
	a := &thomasArgs{nx: nx, n: n, k0: 0, k1: nz, kLo: 0, kHi: nz - 1,
		f: field(nz)[i0:], cp: field(nz)[i0:],
		old: make([]float64, n), zero: make([]float64, n), scratch: make([]float64, n),
		cb: field(nz)[i0:], ct: field(nz)[i0:], ax: field(nz)[i0:], gb: field(nz)[i0:], gt: field(nz)[i0:],
		row: field(nz)[:nz*thomasRowLen]}
	for i := range a.coef {
		a.coef[i] = r.Float64()
	}
	if full {
		a.px, a.nRead, a.nWrite, a.rate = field(nz)[i0:], field(nz)[i0:], field(nz)[i0:], field(nz)[i0:]
		a.rateOn = make([]bool, nz)
		for k := range a.rateOn {
			a.rateOn[k] = k%3 != 1
		}
		a.bedK, a.bedRow = field(1)[:n], 0
		a.speed = field(1)[:n]
	}
	return a
}

// clone copies the arrays the elimination writes.
func (a *thomasArgs) clone() *thomasArgs {
	b := *a
	cp := func(f []float64) []float64 { return append([]float64(nil), f...) }
	b.f, b.cp, b.old, b.scratch = cp(a.f), cp(a.cp), cp(a.old), cp(a.scratch)
	if a.nWrite != nil {
		b.nWrite = cp(a.nWrite)
	}
	return &b
}

// TestEliminationKernelsAgree: the compiled elimination makes the same
// operations in the same order as the Go one, so both give the same numbers
// (to a few units in the last place where a compiler contracts into fused
// multiply-adds) for every combination of optional terms, the in-place first
// level included (common practice, no source).
func TestEliminationKernelsAgree(t *testing.T) {
	for _, full := range []bool{false, true} {
		for _, blk := range [][2]int{{0, 40}, {7, 33}, {39, 1}} {
			a := randomThomas(3, 40, 9, blk[0], blk[1], full)
			b := a.clone()
			a.eliminate()
			b.eliminateGo()
			for name, pair := range map[string][2][]float64{"f": {a.f, b.f}, "cp": {a.cp, b.cp}, "n": {a.nWrite, b.nWrite}} {
				for i := range pair[0] {
					x, y := pair[0][i], pair[1][i]
					if math.Abs(x-y) > 1e-13*math.Max(1, math.Abs(y)) || math.IsNaN(x) != math.IsNaN(y) {
						t.Fatalf("full=%v block %v: %s[%d] = %g compiled, %g in Go", full, blk, name, i, x, y)
					}
				}
			}
		}
	}
}

// BenchmarkElimination times the forward elimination of 512 columns over 128
// levels with every term present, compiled and in Go.
func BenchmarkElimination(b *testing.B) {
	for _, nz := range []int{16, 128} {
		a := randomThomas(1, 512, nz, 0, 512, true)
		b.Run(fmt.Sprintf("nz=%d/compiled", nz), func(b *testing.B) {
			for b.Loop() {
				a.eliminate()
			}
		})
		b.Run(fmt.Sprintf("nz=%d/go", nz), func(b *testing.B) {
			for b.Loop() {
				a.eliminateGo()
			}
		})
	}
}

// TestBackSubstituteAgree: the compiled back substitution gives the Go
// one's numbers bit for bit, for blocks that leave every remainder of the
// vector loop (common practice, no source).
func TestBackSubstituteAgree(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 1))
	const nx, nz = 41, 7
	for _, c := range [][4]int{{0, 41, 0, nz}, {5, 13, 1, nz}, {40, 1, 0, nz}, {3, 7, 2, 4}} {
		i0, n, j0, j1 := c[0], c[1], c[2], c[3]
		f, cp := make([]float64, nz*nx), make([]float64, nz*nx)
		for i := range f {
			f[i], cp[i] = 2*r.Float64()-1, 2*r.Float64()-1
		}
		g := append([]float64(nil), f...)
		backSubstitute(f, cp, nx, i0, n, j0, j1)
		backSubstituteGo(g, cp, nx, i0, n, j0, j1)
		for i := range f {
			if math.Float64bits(f[i]) != math.Float64bits(g[i]) {
				t.Fatalf("block %v: f[%d] = %v compiled, %v in Go", c, i, f[i], g[i])
			}
		}
	}
}
