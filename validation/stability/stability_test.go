package stability

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

var inviscid = math.Inf(1)

// Orszag (1971, J. Fluid Mech. 50:689): plane Poiseuille flow at
// α = 1, Re = 10⁴ has the least-stable eigenvalue
// c = 0.23752649 + 0.00373967 i. Checked to all eight quoted decimals
// (half a unit in the last place).
func TestPoiseuilleOrszag(t *testing.T) {
	m, err := LeastStable(Poiseuille(), 1, 1e4, 96)
	if err != nil {
		t.Fatal(err)
	}
	const cr, ci = 0.23752649, 0.00373967 // Orszag 1971
	if d := math.Abs(real(m.C) - cr); d > 5e-9 {
		t.Errorf("c_r = %.10f, Orszag 1971 %.8f (diff %.2g)", real(m.C), cr, d)
	}
	if d := math.Abs(imag(m.C) - ci); d > 5e-9 {
		t.Errorf("c_i = %.10f, Orszag 1971 %.8f (diff %.2g)", imag(m.C), ci, d)
	}
	t.Logf("Poiseuille α = 1, Re = 1e4, n = 96: c = %.11f %+.11fi", real(m.C), imag(m.C))
}

// Orszag (1971, J. Fluid Mech. 50:689): the critical point of plane
// Poiseuille flow is Re_c = 5772.22 at α_c = 1.02056. At α_c the growth rate
// changes sign between Re = 5760 and 5785, and the neutral Re is Re_c to the
// quoted two decimals.
func TestPoiseuilleCritical(t *testing.T) {
	const alphaC, reC = 1.02056, 5772.22 // Orszag 1971
	const n = 80
	lo, err := LeastStable(Poiseuille(), alphaC, 5760, n)
	if err != nil {
		t.Fatal(err)
	}
	hi, err := LeastStable(Poiseuille(), alphaC, 5785, n)
	if err != nil {
		t.Fatal(err)
	}
	if !(imag(lo.C) < 0 && imag(hi.C) > 0) {
		t.Errorf("c_i(5760) = %.3g, c_i(5785) = %.3g: want stable then unstable", imag(lo.C), imag(hi.C))
	}
	re, err := NeutralRe(Poiseuille(), alphaC, 5760, 5785, n)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(re-reC) > 0.005 {
		t.Errorf("neutral Re at α = %g: %.4f, Orszag 1971 %.2f", alphaC, re, reC)
	}
	t.Logf("neutral Re at α = %g: %.5f", alphaC, re)
}

// Michalke (1964, J. Fluid Mech. 19:543): the inviscid tanh mixing layer is
// most unstable at α = 0.4446 with α c_i = 0.1897 and c_r = 0, and has its
// neutral mode at α = 1. The walls at ±20 change the free-layer value by
// O(exp(−2α·20)) ≈ 2e-8.
func TestTanhMichalke(t *testing.T) {
	const alphaMax, growthMax = 0.4446, 0.1897 // Michalke 1964
	p := Tanh(20)
	const n = 96
	m, err := LeastStable(p, alphaMax, inviscid, n)
	if err != nil {
		t.Fatal(err)
	}
	if d := math.Abs(m.GrowthRate() - growthMax); d > 5e-5 {
		t.Errorf("α c_i = %.6f, Michalke 1964 %.4f", m.GrowthRate(), growthMax)
	}
	if math.Abs(real(m.C)) > 1e-10 {
		t.Errorf("c_r = %g, Michalke 1964: 0", real(m.C))
	}
	t.Logf("inviscid tanh, zmax = 20, α = %g, n = %d: α c_i = %.10f", alphaMax, n, m.GrowthRate())

	// α = 0.4446 is the maximum (Michalke 1964): the growth rate is lower
	// on either side.
	for _, a := range []float64{0.42, 0.47} {
		ma, err := LeastStable(p, a, inviscid, n)
		if err != nil {
			t.Fatal(err)
		}
		if ma.GrowthRate() >= m.GrowthRate() {
			t.Errorf("α c_i(%g) = %.6f ≥ α c_i(%g) = %.6f", a, ma.GrowthRate(), alphaMax, m.GrowthRate())
		}
	}

	// Neutral at α = 1 (Michalke 1964): the growth rate falls towards zero
	// as α → 1 and no unstable mode is left beyond. Close to α = 1 the
	// critical layer sharpens, hence the larger n.
	prev := m.GrowthRate()
	for _, a := range []float64{0.6, 0.8, 0.9, 0.95} {
		ma, err := LeastStable(p, a, inviscid, 200)
		if err != nil {
			t.Fatal(err)
		}
		g := ma.GrowthRate()
		if !(g > 0 && g < prev) {
			t.Errorf("α c_i(%g) = %.6f, want in (0, %.6f)", a, g, prev)
		}
		prev = g
	}
	if prev > 0.04 {
		t.Errorf("α c_i(0.95) = %.4f, want it close to zero (neutral at α = 1, Michalke 1964)", prev)
	}
	for _, a := range []float64{1, 1.1} {
		ma, err := LeastStable(p, a, inviscid, 200)
		if err != nil {
			t.Fatal(err)
		}
		if ma.GrowthRate() > 1e-8 {
			t.Errorf("α = %g: α c_i = %.3g, want no unstable mode (Michalke 1964)", a, ma.GrowthRate())
		}
	}
}

// Betchov & Szewczyk (1963, Phys. Fluids 6:1391): viscosity lowers the
// growth rate of the tanh layer slightly, and it tends to the inviscid value
// (Michalke 1964, J. Fluid Mech. 19:543: 0.1897 at α = 0.4446) as Re → ∞.
// The brief asks for 0.5 %; the tolerance at Re = 10⁶ is that. The pinned
// Re = 1000 values are this package's own converged results (n = 96 and
// 128 agree to 1e-11), no external source: the flow solver is compared with
// them.
func TestTanhViscous(t *testing.T) {
	const alpha, growthMichalke = 0.4446, 0.1897 // Michalke 1964
	const n = 96
	for _, re := range []float64{1e5, 1e6} {
		m, err := LeastStable(Tanh(20), alpha, re, n)
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(m.GrowthRate()/growthMichalke - 1); d > 0.005 {
			t.Errorf("Re = %g: α c_i = %.6f, %.2g%% off Michalke 1964", re, m.GrowthRate(), 100*d)
		}
	}
	cases := []struct {
		zmax, growth float64 // growth: own converged value, no source
	}{
		{10, 0.1880225889},
		{15, 0.1880840583},
		{20, 0.1880847788},
	}
	for _, tc := range cases {
		p := Tanh(tc.zmax)
		visc, err := LeastStable(p, alpha, 1000, n)
		if err != nil {
			t.Fatal(err)
		}
		inv, err := LeastStable(p, alpha, inviscid, n)
		if err != nil {
			t.Fatal(err)
		}
		g, g0 := visc.GrowthRate(), inv.GrowthRate()
		// Betchov & Szewczyk 1963: lower, but only slightly.
		if !(g < g0 && g > 0.97*g0) {
			t.Errorf("zmax = %g: viscous α c_i = %.6f, inviscid %.6f: want slightly lower", tc.zmax, g, g0)
		}
		if math.Abs(g-tc.growth) > 1e-9 {
			t.Errorf("zmax = %g, Re = 1000: α c_i = %.10f, pinned %.10f", tc.zmax, g, tc.growth)
		}
		if math.Abs(real(visc.C)) > 1e-9 {
			t.Errorf("zmax = %g, Re = 1000: c_r = %g, want 0 by symmetry", tc.zmax, real(visc.C))
		}
		t.Logf("tanh, zmax = %g, α = %g, n = %d: α c_i = %.10f (Re = 1000), %.10f (inviscid)", tc.zmax, alpha, n, g, g0)
	}
}

// The eigenvalue at the chosen n moves by less than 1e-8 when n grows by 16
// (common practice, no source).
func TestConvergenceInN(t *testing.T) {
	cases := []struct {
		name      string
		p         Profile
		alpha, re float64
		n         int
	}{
		{"Poiseuille Re 1e4", Poiseuille(), 1, 1e4, 80},
		{"Poiseuille critical", Poiseuille(), 1.02056, 5772.22, 80},
		{"tanh inviscid zmax 20", Tanh(20), 0.4446, inviscid, 80},
		{"tanh Re 1000 zmax 10", Tanh(10), 0.4446, 1000, 80},
		{"tanh Re 1000 zmax 20", Tanh(20), 0.4446, 1000, 80},
		{"tanh Re 1e6 zmax 20", Tanh(20), 0.4446, 1e6, 80},
	}
	for _, tc := range cases {
		a, err := LeastStable(tc.p, tc.alpha, tc.re, tc.n)
		if err != nil {
			t.Fatal(err)
		}
		b, err := LeastStable(tc.p, tc.alpha, tc.re, tc.n+16)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmplx.Abs(a.C - b.C); d > 1e-8 {
			t.Errorf("%s: |c(%d) − c(%d)| = %.2g", tc.name, tc.n, tc.n+16, d)
		}
	}
}

// dphi4 evaluates φ and its y-derivatives up to the fourth from the
// Chebyshev series by the chain rule through the map.
func dphi4(m Mode, y float64) [5]complex128 {
	x := m.mp.xi(y)
	x = math.Max(-1, math.Min(1, x))
	a := m.a
	var px [5]complex128
	for k := 0; k < 5; k++ {
		px[k] = clenshaw(a, x)
		a = chebDerivCoeffs(a)
	}
	h1, h2, h3, h4 := m.mp.derivs(y)
	c := func(v float64) complex128 { return complex(v, 0) }
	return [5]complex128{
		px[0],
		c(h1) * px[1],
		c(h1*h1)*px[2] + c(h2)*px[1],
		c(h1*h1*h1)*px[3] + c(3*h1*h2)*px[2] + c(h3)*px[1],
		c(h1*h1*h1*h1)*px[4] + c(6*h1*h1*h2)*px[3] + c(3*h2*h2+4*h1*h3)*px[2] + c(h4)*px[1],
	}
}

// The eigenfunction: Eval at the nodes reproduces the discrete
// eigenvector and its collocation derivative; the Orr–Sommerfeld (or
// Rayleigh) residual of the Chebyshev series, evaluated between the nodes,
// is small relative to the size of its terms; the wall conditions hold; and
// the normalisation is as documented. Common practice, no source. The
// residual involves the fourth derivative of the series, whose rounding
// grows like ε n⁸ near the walls and whose truncation error falls more
// slowly than that of c: hence n = 128 for the viscous tanh case (c itself
// has converged by n = 80) and a looser tolerance for the wall-bounded
// Couette-type case.
func TestEigenfunction(t *testing.T) {
	cases := []struct {
		name      string
		p         Profile
		alpha, re float64
		n         int
		resTol    float64
	}{
		{"Poiseuille", Poiseuille(), 1, 1e4, 96, 1e-8},
		{"tanh viscous", Tanh(15), 0.4446, 1000, 128, 1e-8},
		{"tanh inviscid", Tanh(15), 0.4446, inviscid, 96, 1e-8},
		{"mixed walls", Profile{U: func(y float64) float64 { return y }, D2U: func(float64) float64 { return 0 },
			Y1: 0, Y2: 1, Bottom: NoSlip, Top: FreeSlip}, 2, 500, 48, 1e-6},
	}
	for _, tc := range cases {
		s, err := Solve(tc.p, tc.alpha, tc.re, tc.n)
		if err != nil {
			t.Fatal(err)
		}
		m, err := s.Mode(0)
		if err != nil {
			t.Fatal(err)
		}
		pr := s.pr
		np := tc.n + 1
		// Nodes.
		for j, y := range pr.y {
			phi, dphi := m.Eval(y)
			var d complex128
			for k := 0; k < np; k++ {
				d += complex(pr.d1[j*np+k], 0) * m.nodes[k]
			}
			if cmplx.Abs(phi-m.nodes[j]) > 1e-11 || cmplx.Abs(dphi-d) > 1e-8*math.Max(1, cmplx.Abs(d)) {
				t.Errorf("%s: node %d: Eval = %v, %v; discrete %v, %v", tc.name, j, phi, dphi, m.nodes[j], d)
				break
			}
		}
		// Residual between the nodes, relative to the largest term.
		worst, scale := 0.0, 0.0
		for i := 0; i < 400; i++ {
			y := tc.p.Y1 + (tc.p.Y2-tc.p.Y1)*(float64(i)+0.37)/400
			f := dphi4(m, y)
			a2 := complex(tc.alpha*tc.alpha, 0)
			l2 := f[2] - a2*f[0]
			uc := complex(tc.p.U(y), 0) - m.C
			lhs := uc*l2 - complex(tc.p.D2U(y), 0)*f[0]
			var rhs complex128
			if !math.IsInf(tc.re, 1) {
				rhs = (f[4] - 2*a2*f[2] + a2*a2*f[0]) / complex(0, tc.alpha*tc.re)
			}
			worst = math.Max(worst, cmplx.Abs(lhs-rhs))
			scale = math.Max(scale, math.Max(cmplx.Abs(uc*l2), cmplx.Abs(rhs)))
		}
		if worst > tc.resTol*scale {
			t.Errorf("%s: residual %.2g, largest term %.2g", tc.name, worst, scale)
		}
		// Wall conditions: φ = 0 to rounding, and the derivative condition
		// to rounding relative to Σ_k |D_jk φ_k|, the size of the terms
		// that cancel in it.
		for _, w := range []struct {
			j    int
			y    float64
			wall Wall
		}{{tc.n, tc.p.Y1, tc.p.Bottom}, {0, tc.p.Y2, tc.p.Top}} {
			phi, dphi, d2phi := m.Eval2(w.y)
			if cmplx.Abs(phi) > 1e-12 {
				t.Errorf("%s: wall %g: |φ| = %.2g", tc.name, w.y, cmplx.Abs(phi))
			}
			if math.IsInf(tc.re, 1) {
				continue
			}
			second, d := dphi, pr.d1
			if w.wall == FreeSlip {
				second, d = d2phi, pr.d2
			}
			size := 0.0
			for k := 0; k < np; k++ {
				size += cmplx.Abs(complex(d[w.j*np+k], 0) * m.nodes[k])
			}
			if cmplx.Abs(second) > 1e-12*size {
				t.Errorf("%s: wall %g (%v): |second condition| = %.2g, terms %.2g", tc.name, w.y, w.wall, cmplx.Abs(second), size)
			}
		}
		// Normalisation: φ'(YMax) = 1, |φ'| ≤ 1 everywhere.
		if _, d := m.Eval(m.YMax); cmplx.Abs(d-1) > 1e-12 {
			t.Errorf("%s: φ'(YMax) = %v, want 1", tc.name, d)
		}
		for i := 0; i <= 2000; i++ {
			y := tc.p.Y1 + (tc.p.Y2-tc.p.Y1)*float64(i)/2000
			if _, d := m.Eval(y); cmplx.Abs(d) > 1+1e-9 {
				t.Errorf("%s: |φ'(%g)| = %.12f > 1", tc.name, y, cmplx.Abs(d))
				break
			}
		}
	}
}

// Velocity follows from ψ = Re[φ exp(iα(x − ct))] with u = ∂ψ/∂y,
// v = −∂ψ/∂x: checked against finite differences of ψ, and the field is
// divergence-free. Common practice, no source.
func TestVelocity(t *testing.T) {
	m, err := LeastStable(Tanh(10), 0.4446, 1000, 64)
	if err != nil {
		t.Fatal(err)
	}
	psi := func(x, y, tm float64) float64 {
		phi, _ := m.Eval(y)
		return real(phi * cmplx.Exp(complex(0, m.Alpha)*(complex(x, 0)-m.C*complex(tm, 0))))
	}
	const h = 1e-5
	for _, pt := range [][3]float64{{0, 0, 0}, {1.3, -0.7, 0}, {4, 2.5, 3}, {-2, 0.1, 1}} {
		x, y, tm := pt[0], pt[1], pt[2]
		u, v := m.Velocity(x, y, tm)
		uFD := (psi(x, y+h, tm) - psi(x, y-h, tm)) / (2 * h)
		vFD := -(psi(x+h, y, tm) - psi(x-h, y, tm)) / (2 * h)
		if math.Abs(u-uFD) > 1e-7 || math.Abs(v-vFD) > 1e-7 {
			t.Errorf("(%g, %g, %g): u, v = %g, %g; from ψ %g, %g", x, y, tm, u, v, uFD, vFD)
		}
		ux := func(x float64) float64 { u, _ := m.Velocity(x, y, tm); return u }
		vy := func(y float64) float64 { _, v := m.Velocity(x, y, tm); return v }
		div := (ux(x+h)-ux(x-h))/(2*h) + (vy(y+h)-vy(y-h))/(2*h)
		if math.Abs(div) > 1e-6 {
			t.Errorf("(%g, %g, %g): ∇·u' = %.2g", x, y, tm, div)
		}
	}
	if u, _ := m.Velocity(0, m.YMax, 0); math.Abs(u-1) > 1e-12 {
		t.Errorf("u'(0, YMax, 0) = %g, want 1", u)
	}
	// Growth: amplitude × exp(α c_i t).
	u0, _ := m.Velocity(0, m.YMax, 0)
	tm := 2.0
	ut, _ := m.Velocity(real(m.C)*tm, m.YMax, tm)
	if want := u0 * math.Exp(m.GrowthRate()*tm); math.Abs(ut-want) > 1e-12*want {
		t.Errorf("u' following the wave at t = %g: %g, want %g", tm, ut, want)
	}
	if phi, _ := m.Eval(10.5); !cmplx.IsNaN(phi) {
		t.Errorf("Eval outside the walls = %v, want NaN", phi)
	}
}

// User mistakes come back as errors. Common practice, no source.
func TestBadInput(t *testing.T) {
	good := Poiseuille()
	mod := func(f func(*Profile)) Profile { p := good; f(&p); return p }
	cases := []struct {
		name      string
		p         Profile
		alpha, re float64
		n         int
		want      string
	}{
		{"n too small", good, 1, 1e4, 4, "degree"},
		{"n too large", good, 1, 1e4, MaxN + 1, "degree"},
		{"y1 = y2", mod(func(p *Profile) { p.Y2 = p.Y1 }), 1, 1e4, 32, "Y1 < Y2"},
		{"y1 > y2", mod(func(p *Profile) { p.Y1, p.Y2 = 1, -1 }), 1, 1e4, 32, "Y1 < Y2"},
		{"infinite wall", mod(func(p *Profile) { p.Y2 = math.Inf(1) }), 1, 1e4, 32, "finite"},
		{"alpha zero", good, 0, 1e4, 32, "wavenumber"},
		{"alpha negative", good, -1, 1e4, 32, "wavenumber"},
		{"alpha NaN", good, math.NaN(), 1e4, 32, "wavenumber"},
		{"re zero", good, 1, 0, 32, "Reynolds"},
		{"re negative", good, 1, -5, 32, "Reynolds"},
		{"re NaN", good, 1, math.NaN(), 32, "Reynolds"},
		{"nil U", mod(func(p *Profile) { p.U = nil }), 1, 1e4, 32, "U and D2U"},
		{"bad wall", mod(func(p *Profile) { p.Top = Wall(7) }), 1, 1e4, 32, "wall"},
		{"negative stretch", mod(func(p *Profile) { p.Stretch = -1 }), 1, 1e4, 32, "Stretch"},
		{"profile NaN", mod(func(p *Profile) { p.U = func(float64) float64 { return math.NaN() } }), 1, 1e4, 32, "not finite"},
	}
	for _, tc := range cases {
		_, err := Solve(tc.p, tc.alpha, tc.re, tc.n)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: Solve error %v, want one mentioning %q", tc.name, err, tc.want)
		}
		if _, err := LeastStable(tc.p, tc.alpha, tc.re, tc.n); err == nil {
			t.Errorf("%s: LeastStable gave no error", tc.name)
		}
	}
	s, err := Solve(good, 1, 1e4, 32)
	if err != nil {
		t.Fatal(err)
	}
	for _, i := range []int{-1, len(s.C)} {
		if _, err := s.Mode(i); err == nil {
			t.Errorf("Mode(%d) gave no error", i)
		}
	}
	if _, err := (Spectrum{}).Mode(0); err == nil {
		t.Error("Mode of an empty Spectrum gave no error")
	}
	for _, r := range [][2]float64{{0, 10}, {10, 5}, {100, math.Inf(1)}, {5000, 5100}} {
		if _, err := NeutralRe(good, 1, r[0], r[1], 32); err == nil {
			t.Errorf("NeutralRe in [%g, %g] gave no error", r[0], r[1])
		}
	}
}

// The dense spectrum holds eigenvalues of the problem, not their conjugates
// from the real embedding: inverse iteration from each of the leading ones
// stays put. The second Poiseuille eigenvalue at α = 1, Re = 10⁴ is
// 0.96463092 − 0.03516728i (from memory, no source checked).
func TestSpectrumSelection(t *testing.T) {
	s, err := Solve(Poiseuille(), 1, 1e4, 80)
	if err != nil {
		t.Fatal(err)
	}
	if want := 0.96463092 - 0.03516728i; cmplx.Abs(s.C[1]-want) > 1e-8 {
		t.Errorf("second eigenvalue %.8f, want %.8f", s.C[1], want)
	}
	for i := 0; i < 12; i++ {
		m, err := s.Mode(i)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmplx.Abs(m.C - s.C[i]); d > 1e-7 {
			t.Errorf("mode %d: dense %.10f, refined %.10f", i, s.C[i], m.C)
		}
	}
}
