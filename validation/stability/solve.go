package stability

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// problem is the discretised eigenproblem A x = c B x on the unknown nodal
// values x of φ, after the boundary conditions have been eliminated.
type problem struct {
	p         Profile
	alpha, re float64
	n         int
	mp        mapping
	y         []float64 // physical nodes y_j = y(ξ_j), j = 0..n (y_0 = Y2)
	d1, d2    []float64 // d/dy and d²/dy² on the n+1 nodes, row-major
	inner     []int     // nodes whose values are the unknowns (and collocation rows)
	// Full nodal φ = E x: rows 0 and n of E are zero, row inner[m] is the
	// unit vector e_m, and (viscous case) rows 1 and n−1 come from the
	// derivative conditions at the walls.
	e1, en1 []float64 // rows 1 and n−1 of E (viscous only)
	a, b    *cmat
}

func (pr *problem) inviscid() bool { return math.IsInf(pr.re, 1) }

// newProblem builds the collocation matrices.
//
// Unknowns are φ_j at the Gauss–Lobatto nodes. φ_0 = φ_n = 0 at both walls.
// In the viscous case the second condition at each wall (φ' = 0 or φ″ = 0,
// one row of the collocation derivative matrix) is solved for the two nodes
// next to the walls, φ_1 and φ_(n−1), in terms of φ_2..φ_(n−2); the equation
// is collocated at those n−3 interior nodes. The inviscid problem keeps
// φ_1..φ_(n−1) and collocates there. No boundary rows enter the matrices, so
// B is regular and the problem has no spurious eigenvalues from them.
func newProblem(p Profile, alpha, re float64, n int) (*problem, error) {
	pr := &problem{p: p, alpha: alpha, re: re, n: n}
	pr.mp = mapping{mid: (p.Y1 + p.Y2) / 2, half: (p.Y2 - p.Y1) / 2, b: p.Stretch}
	np := n + 1
	xi := chebNodes(n)
	pr.y = make([]float64, np)
	for j, x := range xi {
		pr.y[j] = pr.mp.y(x)
	}
	pr.y[0], pr.y[n] = p.Y2, p.Y1
	order := 4
	if pr.inviscid() {
		order = 2
	}
	dx := chebDiff(n, order)
	d1 := make([]float64, np*np)
	d2 := make([]float64, np*np)
	var d4 []float64
	if !pr.inviscid() {
		d4 = make([]float64, np*np)
	}
	for j := 0; j < np; j++ {
		h1, h2, h3, h4 := pr.mp.derivs(pr.y[j])
		for k := 0; k < np; k++ {
			i := j*np + k
			d1[i] = h1 * dx[0][i]
			d2[i] = h1*h1*dx[1][i] + h2*dx[0][i]
			if d4 != nil {
				// Faà di Bruno for f(ξ(y)).
				d4[i] = h1*h1*h1*h1*dx[3][i] + 6*h1*h1*h2*dx[2][i] +
					(3*h2*h2+4*h1*h3)*dx[1][i] + h4*dx[0][i]
			}
		}
	}
	pr.d1, pr.d2 = d1, d2

	a2 := alpha * alpha
	u := make([]float64, np)
	u2 := make([]float64, np)
	for j, y := range pr.y {
		u[j], u2[j] = p.U(y), p.D2U(y)
		if math.IsNaN(u[j]) || math.IsInf(u[j], 0) || math.IsNaN(u2[j]) || math.IsInf(u2[j], 0) {
			return nil, fmt.Errorf("stability: profile is not finite at y = %g", y)
		}
	}
	// Full operators on all nodes: B = D² − α², A = U B − U'' − L4/(iαRe),
	// L4 = D⁴ − 2α²D² + α⁴.
	visc := complex(0, 0)
	if !pr.inviscid() {
		visc = complex(0, 1/(alpha*re)) // −1/(iαRe)
	}
	full := func(j, k int) (a, b complex128) {
		i := j*np + k
		bv := d2[i]
		if j == k {
			bv -= a2
		}
		av := complex(u[j]*bv, 0)
		if j == k {
			av -= complex(u2[j], 0)
		}
		if d4 != nil {
			l4 := d4[i] - 2*a2*d2[i]
			if j == k {
				l4 += a2 * a2
			}
			av += visc * complex(l4, 0)
		}
		return av, complex(bv, 0)
	}

	if pr.inviscid() {
		for j := 1; j < n; j++ {
			pr.inner = append(pr.inner, j)
		}
	} else {
		for j := 2; j < n-1; j++ {
			pr.inner = append(pr.inner, j)
		}
		row := func(w Wall, j int) []float64 {
			if w == NoSlip {
				return d1[j*np : (j+1)*np]
			}
			return d2[j*np : (j+1)*np]
		}
		top, bot := row(p.Top, 0), row(p.Bottom, n)
		// [top_1 top_(n−1); bot_1 bot_(n−1)] [φ_1; φ_(n−1)] = −Σ_k [top_k; bot_k] φ_k.
		m11, m12, m21, m22 := top[1], top[n-1], bot[1], bot[n-1]
		det := m11*m22 - m12*m21
		if det == 0 || math.IsNaN(det) {
			return nil, errors.New("stability: boundary conditions are singular on this grid")
		}
		pr.e1 = make([]float64, len(pr.inner))
		pr.en1 = make([]float64, len(pr.inner))
		for m, k := range pr.inner {
			rt, rb := -top[k], -bot[k]
			pr.e1[m] = (m22*rt - m12*rb) / det
			pr.en1[m] = (m11*rb - m21*rt) / det
		}
	}
	nm := len(pr.inner)
	pr.a, pr.b = newCmat(nm, nm), newCmat(nm, nm)
	for i, j := range pr.inner {
		var a1, b1, an1, bn1 complex128
		if !pr.inviscid() {
			a1, b1 = full(j, 1)
			an1, bn1 = full(j, n-1)
		}
		for m, k := range pr.inner {
			av, bv := full(j, k)
			if !pr.inviscid() {
				e1, en1 := complex(pr.e1[m], 0), complex(pr.en1[m], 0)
				av += a1*e1 + an1*en1
				bv += b1*e1 + bn1*en1
			}
			pr.a.set(i, m, av)
			pr.b.set(i, m, bv)
		}
	}
	return pr, nil
}

// nodal returns φ at all n+1 nodes from the unknowns x.
func (pr *problem) nodal(x []complex128) []complex128 {
	phi := make([]complex128, pr.n+1)
	for m, k := range pr.inner {
		phi[k] = x[m]
	}
	if !pr.inviscid() {
		var s1, sn1 complex128
		for m, v := range x {
			s1 += complex(pr.e1[m], 0) * v
			sn1 += complex(pr.en1[m], 0) * v
		}
		phi[1], phi[pr.n-1] = s1, sn1
	}
	return phi
}

// Spectrum is the discrete spectrum of one temporal stability problem.
type Spectrum struct {
	// C holds the eigenvalues c (complex phase speeds, in units of the
	// profile's velocity scale) sorted by decreasing imaginary part, so C[0]
	// is the least stable. The growth rate of mode i is Alpha·imag(C[i]).
	//
	// Only the eigenvalues whose eigenfunctions are resolved by the grid are
	// accurate; the dense solve is good to roughly 1e-10 in |c| for the
	// well-conditioned modes. Mode refines one eigenvalue.
	C []complex128
	// Alpha is the streamwise wavenumber and Re the Reynolds number
	// (+Inf for the Rayleigh problem).
	Alpha, Re float64
	// N is the Chebyshev degree: the grid has N+1 Gauss–Lobatto points.
	N int

	pr *problem
}

// Solve returns the spectrum of the temporal stability problem for profile p
// at streamwise wavenumber alpha > 0 and Reynolds number re > 0, with φ
// expanded in Chebyshev polynomials up to degree n (n+1 Gauss–Lobatto
// collocation points, MinN ≤ n ≤ MaxN).
//
// For finite re the Orr–Sommerfeld equation
//
//	(U − c)(φ'' − α²φ) − U''φ = (φ'''' − 2α²φ'' + α⁴φ)/(iαRe)
//
// is solved with φ = 0 and the Wall condition at each wall; re = math.Inf(1)
// gives the inviscid Rayleigh equation (U − c)(φ″ − α²φ) − U″φ = 0 with
// φ = 0 at both walls. The disturbance stream function is
// ψ = Re[φ(y) exp(iα(x − ct))].
//
// The collocation problem A x = c B x is reduced to the standard one
// (B⁻¹A) x = c x with a complex LU factorisation of B, and its eigenvalues
// are found by gonum's real eigensolver (directly when B⁻¹A is real, as in
// the Rayleigh problem, otherwise through the real embedding of the complex
// matrix described in the package documentation).
func Solve(p Profile, alpha, re float64, n int) (Spectrum, error) {
	if err := check(p, alpha, re, n); err != nil {
		return Spectrum{}, err
	}
	pr, err := newProblem(p, alpha, re, n)
	if err != nil {
		return Spectrum{}, err
	}
	c := factorLU(pr.b).solveMat(pr.a)
	vals, err := eigenvalues(c)
	if err != nil {
		return Spectrum{}, err
	}
	out := vals[:0]
	for _, v := range vals {
		if !cmplx.IsNaN(v) && !cmplx.IsInf(v) {
			out = append(out, v)
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		if imag(out[i]) != imag(out[j]) {
			return imag(out[i]) > imag(out[j])
		}
		return real(out[i]) < real(out[j])
	})
	if len(out) == 0 {
		return Spectrum{}, errEigen
	}
	return Spectrum{C: out, Alpha: alpha, Re: re, N: n, pr: pr}, nil
}

// Mode refines eigenvalue i of the spectrum by inverse iteration and returns
// it with its eigenfunction. It fails if i is out of range or the iteration
// does not converge.
func (s Spectrum) Mode(i int) (Mode, error) {
	if s.pr == nil {
		return Mode{}, errors.New("stability: empty spectrum")
	}
	if i < 0 || i >= len(s.C) {
		return Mode{}, fmt.Errorf("stability: mode index %d out of range [0, %d)", i, len(s.C))
	}
	return s.pr.refine(s.C[i])
}

// LeastStable returns the mode with the largest imaginary part of c (the
// largest temporal growth rate α c_i) of the problem described at Solve,
// its eigenvalue refined by inverse iteration to the rounding level of the
// discrete problem (about 1e-11 in c at n ≈ 100).
//
// In the inviscid problem without an unstable mode, the answer is a member
// of the discretised continuous spectrum (c real up to rounding) and has no
// meaning beyond c_i ≈ 0.
func LeastStable(p Profile, alpha, re float64, n int) (Mode, error) {
	s, err := Solve(p, alpha, re, n)
	if err != nil {
		return Mode{}, err
	}
	return s.Mode(0)
}

// Iteration controls of refine.
const (
	fixedShiftIters = 3
	maxRQIters      = 20
	refineTol       = 1e-13 // converged: relative change below this
	noiseTol        = 1e-10 // stagnated at rounding: change below this and not falling
)

// refine converges the eigenvalue nearest guess and its eigenvector: a few
// steps of inverse iteration with the fixed shift guess (which select the
// eigenvalue nearest to it), then Rayleigh-quotient iteration, the shift
// updated every step to the least-squares quotient c = (Bx)ᴴ(Ax)/|Bx|².
// It stops when c changes by less than refineTol·max(1, |c|), or by less
// than noiseTol·max(1, |c|) without falling any more (the rounding level of
// the quotient, about 1e-12 for the Orr–Sommerfeld matrices at n ≈ 100), and
// returns the iterate with the smallest residual |Ax − cBx|/|Bx|.
func (pr *problem) refine(guess complex128) (Mode, error) {
	nm := pr.a.n
	x := make([]complex128, nm)
	for i := range x {
		// A fixed start with no special structure.
		x[i] = complex(1+0.5*math.Sin(float64(3*i+1)), 0.3*math.Cos(float64(7*i+2)))
	}
	normalise(x)
	shifted := func(s complex128) *clu {
		k := newCmat(nm, nm)
		for i := range k.data {
			k.data[i] = pr.a.data[i] - s*pr.b.data[i]
		}
		return factorLU(k)
	}
	lu := shifted(guess)
	c := guess
	bestC, bestX, bestRes := c, x, math.Inf(1)
	prevStep := math.Inf(1)
	converged := false
	for it := 0; it < fixedShiftIters+maxRQIters; it++ {
		y := pr.b.mulVec(x)
		lu.solve(y)
		x = y
		normalise(x)
		ax, bx := pr.a.mulVec(x), pr.b.mulVec(x)
		var num complex128
		var den float64
		for i := range ax {
			num += cmplx.Conj(bx[i]) * ax[i]
			den += real(bx[i])*real(bx[i]) + imag(bx[i])*imag(bx[i])
		}
		cNew := num / complex(den, 0)
		if cmplx.IsNaN(cNew) || cmplx.IsInf(cNew) {
			return Mode{}, errors.New("stability: inverse iteration broke down")
		}
		res := 0.0
		for i := range ax {
			r := ax[i] - cNew*bx[i]
			res += real(r)*real(r) + imag(r)*imag(r)
		}
		res = math.Sqrt(res / den)
		if res < bestRes {
			bestC, bestX, bestRes = cNew, x, res
		}
		step := cmplx.Abs(cNew-c) / math.Max(1, cmplx.Abs(cNew))
		c = cNew
		if it < fixedShiftIters-1 {
			continue
		}
		if step <= refineTol || (step <= noiseTol && step >= prevStep) {
			converged = true
			break
		}
		prevStep = step
		lu = shifted(c)
	}
	if !converged {
		return Mode{}, fmt.Errorf("stability: inverse iteration from c = %v did not converge", guess)
	}
	return pr.mode(bestC, bestX), nil
}

func normalise(x []complex128) {
	s := 0.0
	for _, v := range x {
		s += real(v)*real(v) + imag(v)*imag(v)
	}
	f := complex(1/math.Sqrt(s), 0)
	for i := range x {
		x[i] *= f
	}
}

// mode builds the Mode of eigenvalue c and eigenvector x.
func (pr *problem) mode(c complex128, x []complex128) Mode {
	m := Mode{C: c, Alpha: pr.alpha, Re: pr.re, N: pr.n, y1: pr.p.Y1, y2: pr.p.Y2, mp: pr.mp}
	m.nodes = pr.nodal(x)
	m.setCoeffs()
	// Normalise: the largest |φ'| over the nodes, then sharpened by a
	// golden-section search between the neighbouring nodes.
	np := pr.n + 1
	jmax, vmax := 0, -1.0
	for j := 0; j < np; j++ {
		var d complex128
		for k := 0; k < np; k++ {
			d += complex(pr.d1[j*np+k], 0) * m.nodes[k]
		}
		if v := cmplx.Abs(d); v > vmax {
			jmax, vmax = j, v
		}
	}
	lo, hi := pr.y[min(jmax+1, pr.n)], pr.y[max(jmax-1, 0)]
	f := func(y float64) float64 { _, d := m.Eval(y); return -cmplx.Abs(d) }
	ystar := goldenMin(f, lo, hi, 60)
	if f(pr.y[jmax]) < f(ystar) {
		ystar = pr.y[jmax]
	}
	_, d := m.Eval(ystar)
	scale := 1 / d
	for i := range m.nodes {
		m.nodes[i] *= scale
	}
	m.setCoeffs()
	m.YMax = ystar
	return m
}

// goldenMin returns an approximate minimiser of f on [lo, hi] by
// golden-section search with the given number of steps.
func goldenMin(f func(float64) float64, lo, hi float64, steps int) float64 {
	g := (math.Sqrt(5) - 1) / 2
	a, b := lo, hi
	x1, x2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := f(x1), f(x2)
	for i := 0; i < steps; i++ {
		if f1 < f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - g*(b-a)
			f1 = f(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(b-a)
			f2 = f(x2)
		}
	}
	return (a + b) / 2
}

// Mode is one eigenmode of the temporal stability problem: the disturbance
// stream function is ψ(x, y, t) = Re[φ(y) exp(iα(x − c t))], in the length and
// velocity units of the Profile.
//
// φ is normalised so that max |φ'| over [Y1, Y2] is 1, attained at y = YMax
// where φ' is real and positive.
type Mode struct {
	// C is the complex phase speed c = c_r + i c_i; the disturbance grows
	// like exp(α c_i t) and travels at c_r.
	C complex128
	// Alpha and Re are the wavenumber and Reynolds number of the problem.
	Alpha, Re float64
	// N is the Chebyshev degree used.
	N int
	// YMax is where |φ'| is largest (and φ'(YMax) = 1).
	YMax float64

	y1, y2    float64
	mp        mapping
	nodes     []complex128 // φ at the Gauss–Lobatto nodes
	a, a1, a2 []complex128 // Chebyshev coefficients of φ, dφ/dξ, d²φ/dξ²
}

func (m *Mode) setCoeffs() {
	m.a = chebCoeffs(m.nodes)
	m.a1 = chebDerivCoeffs(m.a)
	m.a2 = chebDerivCoeffs(m.a1)
}

// GrowthRate returns the temporal growth rate ω_i = α c_i.
func (m Mode) GrowthRate() float64 { return m.Alpha * imag(m.C) }

// xi returns the Chebyshev variable of y, or false outside [Y1, Y2] (with a
// tolerance of rounding size at the walls).
func (m Mode) xi(y float64) (float64, bool) {
	tol := 1e-12 * (m.y2 - m.y1)
	if !(y >= m.y1-tol && y <= m.y2+tol) {
		return 0, false
	}
	x := m.mp.xi(y)
	return math.Max(-1, math.Min(1, x)), true
}

// Eval returns φ(y) and φ'(y) = dφ/dy for y in [Y1, Y2], from the
// Chebyshev series of the eigenfunction (Clenshaw's recurrence). Outside
// [Y1, Y2] it returns NaNs.
func (m Mode) Eval(y float64) (phi, dphi complex128) {
	x, ok := m.xi(y)
	if !ok || m.a == nil {
		nan := cmplx.NaN()
		return nan, nan
	}
	h1, _, _, _ := m.mp.derivs(y)
	return clenshaw(m.a, x), complex(h1, 0) * clenshaw(m.a1, x)
}

// Eval2 is Eval with the second derivative φ″(y) as well.
func (m Mode) Eval2(y float64) (phi, dphi, d2phi complex128) {
	x, ok := m.xi(y)
	if !ok || m.a == nil {
		nan := cmplx.NaN()
		return nan, nan, nan
	}
	h1, h2, _, _ := m.mp.derivs(y)
	px, pxx := clenshaw(m.a1, x), clenshaw(m.a2, x)
	return clenshaw(m.a, x), complex(h1, 0) * px, complex(h1*h1, 0)*pxx + complex(h2, 0)*px
}

// Velocity returns the disturbance velocity of the mode at (x, y) and time
// t. With u = ∂ψ/∂y and v = −∂ψ/∂x,
//
//	u' = Re[φ'(y) exp(iα(x − ct))],
//	v' = Re[−iα φ(y) exp(iα(x − ct))],
//
// so at t = 0 the peak of |u'| is 1 (at y = YMax) and the amplitude grows
// like exp(α c_i t). A flow solver seeds a disturbance of amplitude ε by
// adding ε·(u', v').
func (m Mode) Velocity(x, y, t float64) (u, v float64) {
	phi, dphi := m.Eval(y)
	e := cmplx.Exp(complex(0, m.Alpha) * (complex(x, 0) - m.C*complex(t, 0)))
	return real(dphi * e), real(complex(0, -m.Alpha) * phi * e)
}
