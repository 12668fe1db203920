package transform

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// planeShapes are the (n, ny, planes, parts) of the plane tests: the
// smallest legal sizes, non-powers of two, uneven splits and a solver size.
var planeShapes = []struct{ n, ny, planes, parts int }{
	{4, 4, 1, 1},
	{6, 8, 3, 2},
	{12, 6, 5, 3},
	{64, 32, 9, 4},
}

func newPlanes(t testing.TB, b Backend, n, ny, planes, parts int) Plan {
	t.Helper()
	p, err := NewPlanes(b, n, ny, planes, parts)
	if err != nil {
		t.Fatalf("NewPlanes(%v, %d, %d, %d, %d): %v", b, n, ny, planes, parts, err)
	}
	t.Cleanup(p.Close)
	return p
}

// TestPlaneModes: x = A cos(2π(jk/N + ml/Ny)) has c_(k,l) = A/2 (and its
// conjugate partner), every other coefficient zero (the definition in the
// package doc; a discrete Fourier identity).
func TestPlaneModes(t *testing.T) {
	for _, b := range backends() {
		for _, sh := range planeShapes {
			p := newPlanes(t, b, sh.n, sh.ny, sh.planes, sh.parts)
			h := sh.n/2 + 1
			for _, mode := range [][2]int{{0, 0}, {1, 0}, {0, 1}, {1, 1}, {sh.n/2 - 1, sh.ny - 1}, {0, sh.ny / 2}} {
				k, l := mode[0], mode[1]
				x := p.Real()
				for r := 0; r < sh.planes; r++ {
					a := float64(r + 1)
					for m := 0; m < sh.ny; m++ {
						for j := 0; j < sh.n; j++ {
							ph := 2 * math.Pi * (float64(j*k)/float64(sh.n) + float64(m*l)/float64(sh.ny))
							x[(r*sh.ny+m)*sh.n+j] = a * math.Cos(ph)
						}
					}
				}
				keep := append([]float64(nil), x...)
				p.Forward()
				c := p.Spec()
				for r := 0; r < sh.planes; r++ {
					a := float64(r + 1)
					for m := 0; m < sh.ny; m++ {
						for j := 0; j < h; j++ {
							want := 0.0
							if j == k && m == l {
								want += a / 2
							}
							// the partner (−k, −l) is stored where k = 0 or N/2
							if (k == 0 || 2*k == sh.n) && j == k && m == (sh.ny-l)%sh.ny {
								want += a / 2
							}
							if got := c[(r*sh.ny+m)*h+j]; cmplx.Abs(got-complex(want, 0)) > tolExact*a {
								t.Fatalf("%v %v mode %v plane %d: c(%d,%d) = %v, want %g", b, sh, mode, r, j, m, got, want)
							}
						}
					}
				}
				p.Inverse()
				if e := relErr(p.Real(), keep); e > tolExact {
					t.Fatalf("%v %v mode %v: round trip error %g", b, sh, mode, e)
				}
			}
		}
	}
}

// TestPlanesAgree: FFTW and gonum give the same spectra and fields to 1e-12
// for random planes (common practice, no source).
func TestPlanesAgree(t *testing.T) {
	if !haveFFTW {
		t.Skip("built without FFTW")
	}
	for _, sh := range planeShapes {
		f := newPlanes(t, FFTW, sh.n, sh.ny, sh.planes, sh.parts)
		g := newPlanes(t, Gonum, sh.n, sh.ny, sh.planes, 1)
		rng := rand.New(rand.NewPCG(1, 2))
		fillRandom(rng, f.Real())
		copy(g.Real(), f.Real())
		keep := append([]float64(nil), f.Real()...)
		f.Forward()
		g.Forward()
		if e := cRelErr(f.Spec(), g.Spec()); e > tolAgreed {
			t.Errorf("%v: spectra differ by %g", sh, e)
		}
		f.Inverse()
		g.Inverse()
		if e := relErr(f.Real(), g.Real()); e > tolAgreed {
			t.Errorf("%v: inverses differ by %g", sh, e)
		}
		if e := relErr(f.Real(), keep); e > tolExact {
			t.Errorf("%v: FFTW round trip error %g", sh, e)
		}
	}
}

// TestPlanesPartsAndAllocs: the parts give bit for bit what the whole
// transforms give, and no transform allocates (common practice, no source).
func TestPlanesPartsAndAllocs(t *testing.T) {
	for _, b := range backends() {
		sh := planeShapes[3]
		whole := newPlanes(t, b, sh.n, sh.ny, sh.planes, sh.parts)
		parts := newPlanes(t, b, sh.n, sh.ny, sh.planes, sh.parts)
		fillRandom(rand.New(rand.NewPCG(3, 4)), whole.Real())
		copy(parts.Real(), whole.Real())
		whole.Forward()
		for i := range parts.Parts() {
			parts.ForwardPart(i)
		}
		for i, v := range whole.Spec() {
			if parts.Spec()[i] != v {
				t.Fatalf("%v: part spectrum differs at %d", b, i)
			}
		}
		if a := testing.AllocsPerRun(3, func() { whole.Forward(); whole.Inverse() }); a != 0 {
			t.Errorf("%v: %v allocations per transform pair, want 0", b, a)
		}
	}
}

func TestNewPlanesBadArguments(t *testing.T) {
	for _, ny := range []int{0, 2, 3, 7, -4} {
		if _, err := NewPlanes(Gonum, 8, ny, 2, 1); err == nil {
			t.Errorf("NewPlanes accepted ny = %d", ny)
		}
	}
}
