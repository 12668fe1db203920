package stability

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"sort"
	"testing"
)

func randCmat(r *rand.Rand, n int) *cmat {
	a := newCmat(n, n)
	for i := range a.data {
		a.data[i] = complex(r.NormFloat64(), r.NormFloat64())
	}
	return a
}

// LU with partial pivoting solves a random complex system to rounding.
// Common practice, no source.
func TestLUSolve(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{1, 5, 40} {
		a := randCmat(r, n)
		x := make([]complex128, n)
		for i := range x {
			x[i] = complex(r.NormFloat64(), r.NormFloat64())
		}
		b := a.mulVec(x)
		factorLU(a).solve(b)
		for i := range x {
			if cmplx.Abs(b[i]-x[i]) > 1e-10 {
				t.Fatalf("n = %d: x[%d] = %v, want %v", n, i, b[i], x[i])
			}
		}
	}
}

// eigenvalues recovers a prescribed complex spectrum, including real
// eigenvalues, from S·diag(λ)·S⁻¹, and a real
// matrix's spectrum. Common practice, no source.
func TestEigenvalues(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	cases := []struct {
		name   string
		lambda []complex128
		real   bool
	}{
		{"complex", []complex128{1 + 2i, 1 - 3i, -0.5, 3i, 0.2 + 0.1i, -2 - 1i, 4}, false},
		{"real matrix", []complex128{1 + 2i, 1 - 2i, -0.5, 3, 0.25 + 1i, 0.25 - 1i}, true},
	}
	for _, tc := range cases {
		n := len(tc.lambda)
		var s *cmat
		if tc.real {
			// A real matrix with the given (conjugate-closed) spectrum:
			// real 2×2 blocks [a b; −b a] and 1×1 blocks, similarity by a
			// real random S.
			d := newCmat(n, n)
			for i := 0; i < n; i++ {
				l := tc.lambda[i]
				if imag(l) == 0 {
					d.set(i, i, l)
					continue
				}
				d.set(i, i, complex(real(l), 0))
				d.set(i, i+1, complex(imag(l), 0))
				d.set(i+1, i, complex(-imag(l), 0))
				d.set(i+1, i+1, complex(real(l), 0))
				i++
			}
			s = newCmat(n, n)
			for i := range s.data {
				s.data[i] = complex(r.NormFloat64(), 0)
			}
			checkSpectrum(t, tc.name, similar(s, d), tc.lambda)
			continue
		}
		d := newCmat(n, n)
		for i, l := range tc.lambda {
			d.set(i, i, l)
		}
		s = randCmat(r, n)
		checkSpectrum(t, tc.name, similar(s, d), tc.lambda)
	}
}

// similar returns s·d·s⁻¹.
func similar(s, d *cmat) *cmat {
	n := s.n
	sd := newCmat(n, n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			var v complex128
			for k := 0; k < n; k++ {
				v += s.at(i, k) * d.at(k, j)
			}
			sd.set(i, j, v)
		}
	}
	// (s·d·s⁻¹)ᵀ = s⁻ᵀ (s d)ᵀ: solve sᵀ Xᵀ = (s d)ᵀ.
	st := newCmat(n, n)
	sdt := newCmat(n, n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			st.set(i, j, s.at(j, i))
			sdt.set(i, j, sd.at(j, i))
		}
	}
	xt := factorLU(st).solveMat(sdt)
	x := newCmat(n, n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			x.set(i, j, xt.at(j, i))
		}
	}
	return x
}

func checkSpectrum(t *testing.T, name string, a *cmat, want []complex128) {
	t.Helper()
	got, err := eigenvalues(a)
	if err != nil {
		t.Fatal(err)
	}
	order := func(v []complex128) []complex128 {
		v = append([]complex128(nil), v...)
		sort.Slice(v, func(i, j int) bool {
			if math.Abs(real(v[i])-real(v[j])) > 1e-6 {
				return real(v[i]) < real(v[j])
			}
			return imag(v[i]) < imag(v[j])
		})
		return v
	}
	g, w := order(got), order(want)
	if len(g) != len(w) {
		t.Fatalf("%s: %d eigenvalues, want %d", name, len(g), len(w))
	}
	for i := range g {
		if cmplx.Abs(g[i]-w[i]) > 1e-9 {
			t.Errorf("%s: eigenvalues %v, want %v", name, g, w)
			return
		}
	}
}
