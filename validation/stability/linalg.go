package stability

import (
	"errors"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// cmat is a dense complex matrix stored row by row.
type cmat struct {
	n    int // rows
	m    int // columns
	data []complex128
}

func newCmat(n, m int) *cmat {
	return &cmat{n: n, m: m, data: make([]complex128, n*m)}
}

func (a *cmat) at(i, j int) complex128     { return a.data[i*a.m+j] }
func (a *cmat) set(i, j int, v complex128) { a.data[i*a.m+j] = v }

// mulVec returns a·x.
func (a *cmat) mulVec(x []complex128) []complex128 {
	y := make([]complex128, a.n)
	for i := 0; i < a.n; i++ {
		row := a.data[i*a.m : (i+1)*a.m]
		var s complex128
		for j, v := range row {
			s += v * x[j]
		}
		y[i] = s
	}
	return y
}

// maxAbs returns the largest modulus of an entry of a.
func (a *cmat) maxAbs() float64 {
	m := 0.0
	for _, v := range a.data {
		m = math.Max(m, cmplx.Abs(v))
	}
	return m
}

// clu is the LU factorisation P·A = L·U of a square complex matrix with
// partial (row) pivoting, L unit lower triangular; L and U share lu.
type clu struct {
	n   int
	lu  []complex128
	piv []int
}

// factorLU factorises the square matrix a (which it does not modify). A
// pivot that is exactly zero (a singular matrix, e.g. a shift that hits an
// eigenvalue to the last bit) is replaced by a tiny multiple of the matrix
// norm, which is what inverse iteration wants.
func factorLU(a *cmat) *clu {
	n := a.n
	lu := make([]complex128, len(a.data))
	copy(lu, a.data)
	piv := make([]int, n)
	tiny := complex(1e-300+a.maxAbs()*1e-30, 0)
	for k := 0; k < n; k++ {
		p, pmax := k, -1.0
		for i := k; i < n; i++ {
			if v := cmplx.Abs(lu[i*n+k]); v > pmax {
				p, pmax = i, v
			}
		}
		piv[k] = p
		if p != k {
			rk, rp := lu[k*n:(k+1)*n], lu[p*n:(p+1)*n]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
		}
		if lu[k*n+k] == 0 {
			lu[k*n+k] = tiny
		}
		inv := 1 / lu[k*n+k]
		rk := lu[k*n+k+1 : (k+1)*n]
		for i := k + 1; i < n; i++ {
			l := lu[i*n+k] * inv
			lu[i*n+k] = l
			if l == 0 {
				continue
			}
			ri := lu[i*n+k+1 : (i+1)*n]
			for j, v := range rk {
				ri[j] -= l * v
			}
		}
	}
	return &clu{n: n, lu: lu, piv: piv}
}

// solve overwrites b with the solution x of A x = b.
func (f *clu) solve(b []complex128) {
	n := f.n
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
		}
	}
	for i := 1; i < n; i++ {
		row := f.lu[i*n : i*n+i]
		s := b[i]
		for j, v := range row {
			s -= v * b[j]
		}
		b[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		row := f.lu[i*n+i+1 : (i+1)*n]
		s := b[i]
		for j, v := range row {
			s -= v * b[i+1+j]
		}
		b[i] = s / f.lu[i*n+i]
	}
}

// solveMat returns A⁻¹ b for a square matrix b.
func (f *clu) solveMat(b *cmat) *cmat {
	n := f.n
	x := newCmat(n, b.m)
	col := make([]complex128, n)
	for j := 0; j < b.m; j++ {
		for i := 0; i < n; i++ {
			col[i] = b.at(i, j)
		}
		f.solve(col)
		for i := 0; i < n; i++ {
			x.set(i, j, col[i])
		}
	}
	return x
}

var errEigen = errors.New("stability: dense eigenvalue solver did not converge")

// eigenvalues returns all eigenvalues of the square complex matrix c.
//
// gonum's mat.Eigen handles real matrices only. If c is real it is used
// directly. Otherwise the eigenvalues are taken from the real 2n×2n
// embedding
//
//	R = [Re c  −Im c]
//	    [Im c   Re c],
//
// whose spectrum is that of c together with that of conj(c). An eigenvector
// w = [p; q] of R for eigenvalue λ gives c(p + iq) = λ(p + iq) and
// conj(c)(p − iq) = λ(p − iq), so λ belongs to c when p + iq is not
// negligible. R is real, so its complex eigenpairs come as (λ, w) and
// (conj λ, conj w), and s(w) = |p+iq|²/(|p+iq|² + |p−iq|²) satisfies
// s(conj w) = 1 − s(w): of each such pair the member with s > 1/2 belongs
// to c. A real eigenvalue λ of c is a double real eigenvalue of R (with
// eigenvectors for z and iz, both with s = 1/2), so the real eigenvalues of
// R are sorted and every second one is kept.
//
// The one case this cannot sort out is a c that has both λ and conj λ
// (non-real) as eigenvalues: then either copy may be returned twice. The
// viscous stability matrices are complex without such a symmetry, and the
// inviscid ones are real and take the direct path.
func eigenvalues(c *cmat) ([]complex128, error) {
	n := c.n
	isReal := true
	for _, v := range c.data {
		if imag(v) != 0 {
			isReal = false
			break
		}
	}
	var e mat.Eigen
	if isReal {
		r := mat.NewDense(n, n, nil)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				r.Set(i, j, real(c.at(i, j)))
			}
		}
		if !e.Factorize(r, mat.EigenNone) {
			return nil, errEigen
		}
		return e.Values(nil), nil
	}
	r := mat.NewDense(2*n, 2*n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			v := c.at(i, j)
			r.Set(i, j, real(v))
			r.Set(i, n+j, -imag(v))
			r.Set(n+i, j, imag(v))
			r.Set(n+i, n+j, real(v))
		}
	}
	if !e.Factorize(r, mat.EigenRight) {
		return nil, errEigen
	}
	vals := e.Values(nil)
	var vec mat.CDense
	e.VectorsTo(&vec)
	score := func(k int) float64 {
		var plus, minus float64
		for i := 0; i < n; i++ {
			p, q := vec.At(i, k), vec.At(n+i, k)
			a := p + 1i*q
			b := p - 1i*q
			plus += real(a)*real(a) + imag(a)*imag(a)
			minus += real(b)*real(b) + imag(b)*imag(b)
		}
		return plus / (plus + minus)
	}
	out := make([]complex128, 0, n)
	var reals []float64
	for k := 0; k < 2*n; k++ {
		if imag(vals[k]) == 0 {
			reals = append(reals, real(vals[k]))
			continue
		}
		// gonum stores a conjugate pair in adjacent columns.
		if score(k) >= score(k+1) {
			out = append(out, vals[k])
		} else {
			out = append(out, vals[k+1])
		}
		k++
	}
	sort.Float64s(reals)
	for k := 0; k < len(reals); k += 2 {
		out = append(out, complex(reals[k], 0))
	}
	return out, nil
}
