package stability

import (
	"math"
	"math/cmplx"
	"testing"
)

// Collocation differentiation is exact (to rounding) for polynomials of
// degree ≤ n. Common practice, no source.
func TestChebDiffPolynomial(t *testing.T) {
	const n = 24
	x := chebNodes(n)
	d := chebDiff(n, 4)
	// p(ξ) = ξ^k and its derivatives, for a k ≤ n.
	pow := func(x float64, k int) float64 {
		if k < 0 {
			return 0
		}
		return math.Pow(x, float64(k))
	}
	fall := func(k, l int) float64 { // k(k−1)…(k−l+1)
		f := 1.0
		for i := 0; i < l; i++ {
			f *= float64(k - i)
		}
		return f
	}
	for _, k := range []int{0, 1, 3, 7, 12, n} {
		for l := 1; l <= 4; l++ {
			worst := 0.0
			for j := range x {
				s := 0.0
				for i := range x {
					s += d[l-1][j*(n+1)+i] * pow(x[i], k)
				}
				want := fall(k, l) * pow(x[j], k-l)
				worst = math.Max(worst, math.Abs(s-want)/(1+fall(n, l)))
			}
			if worst > 1e-11 {
				t.Errorf("ξ^%d, derivative %d: relative error %.2g", k, l, worst)
			}
		}
	}
}

// The Chebyshev coefficients, their derivative recurrence and Clenshaw's sum
// reproduce a polynomial and its derivatives between the nodes. Common
// practice, no source.
func TestChebSeries(t *testing.T) {
	const n = 20
	x := chebNodes(n)
	p := func(x float64) complex128 { return complex(x*x*x-2*x, math.Pow(x, 10)) }
	dp := func(x float64) complex128 { return complex(3*x*x-2, 10*math.Pow(x, 9)) }
	d2p := func(x float64) complex128 { return complex(6*x, 90*math.Pow(x, 8)) }
	f := make([]complex128, n+1)
	for j, xj := range x {
		f[j] = p(xj)
	}
	a := chebCoeffs(f)
	a1 := chebDerivCoeffs(a)
	a2 := chebDerivCoeffs(a1)
	for _, xx := range []float64{-1, -0.77, -0.1, 0, 0.333, 0.9, 1} {
		for _, c := range []struct {
			name      string
			got, want complex128
		}{
			{"p", clenshaw(a, xx), p(xx)},
			{"p'", clenshaw(a1, xx), dp(xx)},
			{"p''", clenshaw(a2, xx), d2p(xx)},
		} {
			if cmplx.Abs(c.got-c.want) > 1e-10 {
				t.Errorf("%s(%g) = %v, want %v", c.name, xx, c.got, c.want)
			}
		}
	}
}

// The sinh map: xi inverts y, and derivs matches the closed-form derivatives
// of ξ(y) checked against finite differences. Common practice, no source.
func TestMapping(t *testing.T) {
	for _, m := range []mapping{{0, 1, 0}, {0.5, 3, 0}, {0, 20, 5.3697}, {-1, 2, 1.5}} {
		for _, x := range []float64{-1, -0.6, 0, 0.25, 1} {
			y := m.y(x)
			if got := m.xi(y); math.Abs(got-x) > 1e-13 {
				t.Errorf("%+v: xi(y(%g)) = %g", m, x, got)
			}
		}
		h := 1e-4 * math.Min(1, m.half)
		for _, y := range []float64{m.mid - 0.4*m.half, m.mid + 0.05*m.half, m.mid + 0.7*m.half} {
			d1, d2, d3, d4 := m.derivs(y)
			// Derivatives of the previous order by central differences.
			fd := func(f func(float64) float64) float64 { return (f(y+h) - f(y-h)) / (2 * h) }
			g1 := func(y float64) float64 { a, _, _, _ := m.derivs(y); return a }
			g2 := func(y float64) float64 { _, b, _, _ := m.derivs(y); return b }
			g3 := func(y float64) float64 { _, _, c, _ := m.derivs(y); return c }
			for _, c := range []struct {
				name      string
				got, want float64
			}{
				{"dξ/dy", d1, fd(m.xi)},
				{"d²ξ/dy²", d2, fd(g1)},
				{"d³ξ/dy³", d3, fd(g2)},
				{"d⁴ξ/dy⁴", d4, fd(g3)},
			} {
				if math.Abs(c.got-c.want) > 1e-5*(1+math.Abs(c.want)) {
					t.Errorf("%+v at y = %g: %s = %g, finite difference %g", m, y, c.name, c.got, c.want)
				}
			}
		}
	}
}

// TanhStretch makes the mid-point slope dy/dξ = zmax·b/sinh(b) equal to 1
// (its documented property; no source).
func TestTanhStretch(t *testing.T) {
	for _, z := range []float64{1.01, 2, 10, 15, 20, 100} {
		b := TanhStretch(z)
		if s := z * b / math.Sinh(b); math.Abs(s-1) > 1e-12 {
			t.Errorf("zmax = %g: b = %g, slope %g", z, b, s)
		}
	}
	for _, z := range []float64{-3, 0, 0.5, 1, math.NaN(), math.Inf(1)} {
		if b := TanhStretch(z); b != 0 {
			t.Errorf("zmax = %g: b = %g, want 0", z, b)
		}
	}
}
