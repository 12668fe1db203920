package stability

import "math"

// chebNodes returns the n+1 Chebyshev–Gauss–Lobatto points
// ξ_j = cos(πj/n), j = 0..n, in decreasing order (ξ_0 = 1, ξ_n = −1).
// They are computed as sin(π(n−2j)/(2n)), which is exactly antisymmetric
// about the middle (Weideman & Reddy 2000, ACM TOMS 26:465).
func chebNodes(n int) []float64 {
	x := make([]float64, n+1)
	for j := range x {
		x[j] = math.Sin(math.Pi * float64(n-2*j) / float64(2*n))
	}
	return x
}

// chebDiff returns the Chebyshev collocation differentiation matrices of
// orders 1..m on the n+1 Gauss–Lobatto points of chebNodes, each as a
// row-major (n+1)×(n+1) slice: d[l-1][j*(n+1)+k] is the weight of f(ξ_k) in
// the l-th derivative of the interpolant at ξ_j.
//
// The recursion is the one of Weideman & Reddy (2000, ACM TOMS 26:465),
// after Welfert (1997, SIAM J. Numer. Anal. 34:1640):
//
//	D^(l)_jk = l/(ξ_j−ξ_k) · (c_j/c_k (−1)^(j+k) D^(l−1)_jj − D^(l−1)_jk),  j ≠ k,
//
// with c_0 = c_n = 2, c_j = 1 otherwise, D^(0) = I, the differences ξ_j − ξ_k
// from trigonometric identities with the flipping trick, and the diagonal
// from the negative-sum trick (each row of D^(l), l ≥ 1, sums to zero). This
// is markedly more accurate than forming D^l as matrix powers.
func chebDiff(n, m int) [][]float64 {
	np := n + 1
	// dx[j][k] = ξ_j − ξ_k with ξ_j = cos θ_j, θ_j = πj/n:
	// cos θ_j − cos θ_k = 2 sin((θ_j+θ_k)/2) sin((θ_k−θ_j)/2).
	// Rows in the lower half are taken from the upper half by the
	// antisymmetry ξ_(n−j) = −ξ_j, which keeps the small differences exact.
	h := math.Pi / float64(2*n)
	dx := make([]float64, np*np)
	diffAt := func(j, k int) float64 {
		return 2 * math.Sin(h*float64(j+k)) * math.Sin(h*float64(k-j))
	}
	half := np / 2
	for j := 0; j < np; j++ {
		for k := 0; k < np; k++ {
			if j < half {
				dx[j*np+k] = diffAt(j, k)
			} else {
				dx[j*np+k] = -diffAt(n-j, n-k)
			}
		}
	}
	// ratio[j][k] = c_j/c_k (−1)^(j+k).
	c := func(j int) float64 {
		if j == 0 || j == n {
			return 2
		}
		return 1
	}
	out := make([][]float64, m)
	prev := make([]float64, np*np)
	for j := 0; j < np; j++ {
		prev[j*np+j] = 1
	}
	for l := 1; l <= m; l++ {
		d := make([]float64, np*np)
		for j := 0; j < np; j++ {
			sum := 0.0
			for k := 0; k < np; k++ {
				if k == j {
					continue
				}
				r := c(j) / c(k)
				if (j+k)%2 == 1 {
					r = -r
				}
				v := float64(l) / dx[j*np+k] * (r*prev[j*np+j] - prev[j*np+k])
				d[j*np+k] = v
				sum += v
			}
			d[j*np+j] = -sum
		}
		out[l-1] = d
		prev = d
	}
	return out
}

// chebCoeffs returns the coefficients a_k, k = 0..n, of the degree-n
// polynomial p(ξ) = Σ a_k T_k(ξ) that interpolates the values f_j at the
// Gauss–Lobatto points ξ_j = cos(πj/n):
//
//	a_k = 2/(n c̄_k) Σ_j f_j cos(πjk/n)/c̄_j,  c̄_0 = c̄_n = 2, c̄_j = 1 otherwise.
//
// (Canuto, Hussaini, Quarteroni & Zang 1988, Spectral Methods in Fluid
// Dynamics, §2.4.) The direct O(n²) sum is cheap at the sizes used here.
func chebCoeffs(f []complex128) []complex128 {
	n := len(f) - 1
	a := make([]complex128, n+1)
	for k := 0; k <= n; k++ {
		var s complex128
		for j := 0; j <= n; j++ {
			w := math.Cos(math.Pi * float64((j*k)%(2*n)) / float64(n))
			if j == 0 || j == n {
				w /= 2
			}
			s += complex(w, 0) * f[j]
		}
		s *= complex(2/float64(n), 0)
		if k == 0 || k == n {
			s /= 2
		}
		a[k] = s
	}
	return a
}

// chebDerivCoeffs returns the Chebyshev coefficients of the derivative
// p'(ξ) of p(ξ) = Σ a_k T_k(ξ), by the standard backward recurrence
// b_(k−1) = b_(k+1) + 2k a_k, with b_0 halved at the end.
func chebDerivCoeffs(a []complex128) []complex128 {
	n := len(a) - 1
	b := make([]complex128, n+1)
	if n == 0 {
		return b
	}
	// b has degree n−1; b[n] stays zero.
	for k := n; k >= 1; k-- {
		var next complex128
		if k+1 <= n {
			next = b[k+1]
		}
		b[k-1] = next + complex(2*float64(k), 0)*a[k]
	}
	b[0] /= 2
	return b
}

// clenshaw evaluates Σ a_k T_k(ξ) by Clenshaw's recurrence.
func clenshaw(a []complex128, x float64) complex128 {
	var b1, b2 complex128
	tx := complex(2*x, 0)
	for k := len(a) - 1; k >= 1; k-- {
		b1, b2 = tx*b1-b2+a[k], b1
	}
	return complex(x, 0)*b1 - b2 + a[0]
}

// mapping is the map between the Chebyshev variable ξ ∈ [−1, 1] and the
// physical coordinate y ∈ [mid−half, mid+half]:
//
//	y = mid + half·ξ                      (b = 0),
//	y = mid + half·sinh(bξ)/sinh(b)       (b > 0).
//
// With b > 0 the points cluster around mid: the local spacing there is
// b/sinh(b) times that of the affine map.
type mapping struct {
	mid, half, b float64
}

// y returns the physical coordinate of ξ.
func (m mapping) y(x float64) float64 {
	if m.b == 0 {
		return m.mid + m.half*x
	}
	return m.mid + m.half*math.Sinh(m.b*x)/math.Sinh(m.b)
}

// xi returns the Chebyshev variable of y (the inverse of y).
func (m mapping) xi(y float64) float64 {
	if m.b == 0 {
		return (y - m.mid) / m.half
	}
	return math.Asinh(math.Sinh(m.b)*(y-m.mid)/m.half) / m.b
}

// derivs returns dξ/dy, d²ξ/dy², d³ξ/dy³ and d⁴ξ/dy⁴ at y. For the sinh map
// ξ = asinh(s(y−mid))/b with s = sinh(b)/half, so with u = s(y−mid) and
// g(u) = (1+u²)^(−1/2):
//
//	ξ' = s g/b, ξ'' = s² g'/b, ξ''' = s³ g''/b, ξ'''' = s⁴ g'''/b,
//	g' = −u(1+u²)^(−3/2), g'' = (2u²−1)(1+u²)^(−5/2), g''' = (9u−6u³)(1+u²)^(−7/2).
func (m mapping) derivs(y float64) (d1, d2, d3, d4 float64) {
	if m.b == 0 {
		return 1 / m.half, 0, 0, 0
	}
	s := math.Sinh(m.b) / m.half
	u := s * (y - m.mid)
	q := 1 + u*u
	g := 1 / math.Sqrt(q)
	g1 := -u * g / q
	g2 := (2*u*u - 1) * g / (q * q)
	g3 := (9*u - 6*u*u*u) * g / (q * q * q)
	return s * g / m.b, s * s * g1 / m.b, s * s * s * g2 / m.b, s * s * s * s * g3 / m.b
}
