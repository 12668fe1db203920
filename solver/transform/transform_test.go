package transform

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"sync"
	"testing"
)

// Tolerances. The 1e-13 and 1e-12 bounds are several hundred ulps at the
// sizes tested, the usual margin for FFTs of O(log N) rounding growth:
// common practice, no source.
const (
	tolExact  = 1e-13 // analytic coefficients, round trip, Parseval
	tolAgreed = 1e-12 // FFTW against gonum
)

// backends lists the backends this build has.
func backends() []Backend {
	if haveFFTW {
		return []Backend{FFTW, Gonum}
	}
	return []Backend{Gonum}
}

// shapes are the (n, rows, parts) the tests run over: the smallest legal n,
// non-powers of two, one row per part, uneven splits, and solver sizes.
var shapes = []struct{ n, rows, parts int }{
	{4, 1, 1},
	{6, 3, 2},
	{8, 5, 5},
	{48, 7, 3},
	{250, 4, 4},
	{256, 65, 4},
	{1024, 9, 2},
}

func newPlan(t testing.TB, b Backend, n, rows, parts int) Plan {
	t.Helper()
	p, err := New(b, n, rows, parts)
	if err != nil {
		t.Fatalf("New(%v, %d, %d, %d): %v", b, n, rows, parts, err)
	}
	t.Cleanup(p.Close)
	return p
}

func fillRandom(rng *rand.Rand, x []float64) {
	for j := range x {
		x[j] = 2*rng.Float64() - 1 + 0.25
	}
}

func fillRandomSpec(rng *rand.Rand, c []complex128) {
	for k := range c {
		c[k] = complex(2*rng.Float64()-1, 2*rng.Float64()-1)
	}
}

// relErr is max|a−b| / max|b|.
func relErr(a, b []float64) float64 {
	var d, s float64
	for i := range b {
		d = max(d, math.Abs(a[i]-b[i]))
		s = max(s, math.Abs(b[i]))
	}
	return d / s
}

// cRelErr is max|a−b| / max|b|.
func cRelErr(a, b []complex128) float64 {
	var d, s float64
	for i := range b {
		d = max(d, cmplx.Abs(a[i]-b[i]))
		s = max(s, cmplx.Abs(b[i]))
	}
	return d / s
}

func TestBackendString(t *testing.T) {
	tests := []struct {
		b    Backend
		want string
	}{
		{FFTW, "fftw"},
		{Gonum, "gonum"},
		{Backend(7), "Backend(7)"},
	}
	for _, tt := range tests {
		if got := tt.b.String(); got != tt.want {
			t.Errorf("Backend(%d).String() = %q, want %q", int(tt.b), got, tt.want)
		}
	}
}

func TestParseBackend(t *testing.T) {
	tests := []struct {
		in      string
		want    Backend
		wantErr bool
	}{
		{"fftw", FFTW, false},
		{"gonum", Gonum, false},
		{" FFTW ", 0, true}, // names are case-sensitive, as in case files
		{"Gonum", 0, true},
		{"fftw ", 0, true},
		{"", 0, true},
		{"fftw3", 0, true},
		{"cufft", 0, true},
	}
	for _, tt := range tests {
		got, err := ParseBackend(tt.in)
		if tt.wantErr {
			if err == nil || !strings.Contains(err.Error(), "unknown backend") {
				t.Errorf("ParseBackend(%q) error = %v, want an unknown-backend error", tt.in, err)
			}
			continue
		}
		if err != nil || got != tt.want {
			t.Errorf("ParseBackend(%q) = %v, %v; want %v, nil", tt.in, got, err, tt.want)
		}
	}
	for _, b := range []Backend{FFTW, Gonum} {
		if got, err := ParseBackend(b.String()); err != nil || got != b {
			t.Errorf("ParseBackend(%v.String()) = %v, %v", b, got, err)
		}
	}
	if names := Names(); len(names) != 2 || names[FFTW] != "fftw" || names[Gonum] != "gonum" {
		t.Errorf("Names() = %q, want one name per backend in the order of the constants", names)
	}
}

func TestNewBadArguments(t *testing.T) {
	tests := []struct {
		name             string
		b                Backend
		n, rows, parts   int
		wantErrSubstring string
	}{
		{"n odd", Gonum, 7, 4, 1, "n = 7"},
		{"n too small", Gonum, 2, 4, 1, "n = 2"},
		{"n zero", Gonum, 0, 4, 1, "n = 0"},
		{"n negative", Gonum, -8, 4, 1, "n = -8"},
		{"n too large", Gonum, 1 << 40, 1, 1, "n = 1099511627776"},
		{"rows zero", Gonum, 8, 0, 1, "rows = 0"},
		{"rows negative", Gonum, 8, -1, 1, "rows = -1"},
		{"field too large", Gonum, 1 << 20, 1 << 30, 1, "too large"},
		{"parts zero", Gonum, 8, 4, 0, "parts = 0"},
		{"parts above rows", Gonum, 8, 4, 5, "parts = 5"},
		{"fftw n odd", FFTW, 9, 4, 1, "n = 9"},
		{"fftw parts above rows", FFTW, 8, 2, 3, "parts = 3"},
		{"unknown backend", Backend(9), 8, 4, 2, "unknown backend"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p, err := New(tt.b, tt.n, tt.rows, tt.parts)
			if err == nil {
				p.Close()
				t.Fatalf("New(%v, %d, %d, %d) returned no error", tt.b, tt.n, tt.rows, tt.parts)
			}
			if p != nil {
				t.Errorf("New returned a non-nil plan with error %v", err)
			}
			if !strings.Contains(err.Error(), tt.wantErrSubstring) {
				t.Errorf("error %q does not mention %q", err, tt.wantErrSubstring)
			}
		})
	}
}

func TestPartRows(t *testing.T) {
	tests := []struct {
		rows, parts int
		want        [][2]int
	}{
		{1, 1, [][2]int{{0, 1}}},
		{5, 5, [][2]int{{0, 1}, {1, 2}, {2, 3}, {3, 4}, {4, 5}}},
		{10, 3, [][2]int{{0, 4}, {4, 7}, {7, 10}}},
		{65, 4, [][2]int{{0, 17}, {17, 33}, {33, 49}, {49, 65}}},
		{8, 2, [][2]int{{0, 4}, {4, 8}}},
	}
	for _, tt := range tests {
		p := newPlan(t, Gonum, 8, tt.rows, tt.parts)
		if p.Parts() != tt.parts {
			t.Errorf("rows %d parts %d: Parts() = %d", tt.rows, tt.parts, p.Parts())
		}
		for i, w := range tt.want {
			if lo, hi := p.PartRows(i); lo != w[0] || hi != w[1] {
				t.Errorf("rows %d parts %d: PartRows(%d) = [%d, %d), want [%d, %d)", tt.rows, tt.parts, i, lo, hi, w[0], w[1])
			}
		}
	}
}

// TestPartRowsEven checks, for many splits, that the parts are contiguous,
// cover the rows, and differ in size by at most one, larger parts first.
func TestPartRowsEven(t *testing.T) {
	for rows := 1; rows <= 40; rows++ {
		for parts := 1; parts <= rows; parts++ {
			l, err := newLayout(8, rows, parts)
			if err != nil {
				t.Fatal(err)
			}
			next, prev := 0, rows+1
			for i := range parts {
				lo, hi := l.PartRows(i)
				if lo != next || hi-lo > prev || hi-lo < rows/parts || hi-lo > rows/parts+1 {
					t.Fatalf("rows %d parts %d: part %d = [%d, %d) after row %d", rows, parts, i, lo, hi, next)
				}
				next, prev = hi, hi-lo
			}
			if next != rows {
				t.Fatalf("rows %d parts %d: parts end at %d", rows, parts, next)
			}
		}
	}
}

func TestBadPartPanics(t *testing.T) {
	for _, b := range backends() {
		p := newPlan(t, b, 8, 4, 2)
		calls := map[string]func(int){
			"ForwardPart": p.ForwardPart,
			"InversePart": p.InversePart,
			"PartRows":    func(i int) { p.PartRows(i) },
		}
		for name, f := range calls {
			for _, i := range []int{-1, 2} {
				func() {
					defer func() {
						if recover() == nil {
							t.Errorf("%v %s(%d) did not panic", b, name, i)
						}
					}()
					f(i)
				}()
			}
		}
	}
}

// TestModes writes a cosine, a sine and a mean into each row, with the mode
// number varying from row to row, and checks the coefficients against the
// package doc's table and the round trip against the samples.
func TestModes(t *testing.T) {
	for _, b := range backends() {
		for _, s := range shapes {
			p := newPlan(t, b, s.n, s.rows, s.parts)
			n, h := s.n, s.n/2+1
			modes := []int{0, 1, 2, n / 4, n/2 - 1, n / 2}
			x, c := p.Real(), p.Spec()
			want := make([]complex128, len(c))
			for r := range s.rows {
				m := modes[r%len(modes)]
				A, B, C := 1+0.5*float64(r), -0.75+0.1*float64(r), 0.3-0.2*float64(r)
				for j := range n {
					// Reduce m*j modulo n so that the angle is accurate.
					th := 2 * math.Pi * float64(m*j%n) / float64(n)
					x[r*n+j] = A*math.Cos(th) + B*math.Sin(th) + C
				}
				// DFT of a cosine, sine and constant: common practice, no
				// source (the DFT definition in doc.go).
				w := want[r*h : (r+1)*h]
				switch m {
				case 0:
					w[0] = complex(A+C, 0)
				case n / 2:
					w[0] = complex(C, 0)
					w[n/2] = complex(A, 0)
				default:
					w[0] = complex(C, 0)
					w[m] = complex(A/2, -B/2)
				}
			}
			orig := append([]float64(nil), x...)
			p.Forward()
			for r := range s.rows {
				for k := range h {
					if d := cmplx.Abs(c[r*h+k] - want[r*h+k]); d > tolExact*(1+0.5*float64(r)) {
						t.Errorf("%v n=%d row %d: c_%d = %v, want %v", b, n, r, k, c[r*h+k], want[r*h+k])
					}
				}
			}
			// Forward leaves Real as it was (doc.go's contract).
			for j := range x {
				if x[j] != orig[j] {
					t.Fatalf("%v n=%d: Forward changed Real()[%d] from %v to %v", b, n, j, orig[j], x[j])
				}
			}
			p.Inverse()
			// Inverse(Forward(x)) = x: common practice, no source.
			if e := relErr(x, orig); e > tolExact {
				t.Errorf("%v n=%d rows=%d: round trip of modes off by %.3g relative", b, n, s.rows, e)
			}
		}
	}
}

func TestRoundTripRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, b := range backends() {
		for _, s := range shapes {
			p := newPlan(t, b, s.n, s.rows, s.parts)
			x := p.Real()
			fillRandom(rng, x)
			orig := append([]float64(nil), x...)
			p.Forward()
			p.Inverse()
			// Inverse(Forward(x)) = x: common practice, no source.
			if e := relErr(x, orig); e > tolExact {
				t.Errorf("%v %+v: round trip off by %.3g relative", b, s, e)
			}
		}
	}
}

func TestParseval(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, b := range backends() {
		for _, s := range shapes {
			p := newPlan(t, b, s.n, s.rows, s.parts)
			n, h := s.n, s.n/2+1
			x, c := p.Real(), p.Spec()
			fillRandom(rng, x)
			p.Forward()
			for r := range s.rows {
				var lhs, rhs float64
				for _, v := range x[r*n : (r+1)*n] {
					lhs += v * v
				}
				lhs /= float64(n)
				row := c[r*h : (r+1)*h]
				for k, v := range row {
					a := real(v)*real(v) + imag(v)*imag(v)
					if k != 0 && k != n/2 {
						a *= 2
					}
					rhs += a
				}
				// Parseval's identity for the DFT in doc.go's scaling:
				// common practice, no source.
				if e := math.Abs(lhs-rhs) / lhs; e > tolExact {
					t.Errorf("%v %+v row %d: Parseval off by %.3g relative (%v vs %v)", b, s, r, e, lhs, rhs)
				}
			}
		}
	}
}

func TestNyquistAndMean(t *testing.T) {
	for _, b := range backends() {
		for _, s := range shapes {
			p := newPlan(t, b, s.n, s.rows, s.parts)
			n, h := s.n, s.n/2+1
			x, c := p.Real(), p.Spec()
			// Odd rows: a constant; even rows: an alternating sequence
			// around a mean.
			for r := range s.rows {
				for j := range n {
					if r%2 == 1 {
						x[r*n+j] = 2.5
					} else {
						x[r*n+j] = -0.5 + 1.5*float64(1-2*(j%2))
					}
				}
			}
			p.Forward()
			for r := range s.rows {
				// DFT of a constant and of (−1)^j: common practice, no
				// source.
				want0, wantNyq := complex(-0.5, 0), complex(1.5, 0)
				if r%2 == 1 {
					want0, wantNyq = 2.5, 0
				}
				row := c[r*h : (r+1)*h]
				if cmplx.Abs(row[0]-want0) > tolExact || cmplx.Abs(row[h-1]-wantNyq) > tolExact {
					t.Errorf("%v %+v row %d: c_0 = %v, c_N/2 = %v; want %v, %v", b, s, r, row[0], row[h-1], want0, wantNyq)
				}
				for k := 1; k < h-1; k++ {
					if cmplx.Abs(row[k]) > tolExact {
						t.Errorf("%v %+v row %d: c_%d = %v, want 0", b, s, r, k, row[k])
					}
				}
			}
			// Inverse ignores the imaginary parts of c_0 and c_(N/2)
			// (doc.go's contract): x_j = Re c_0 + Re c_(N/2) (−1)^j.
			for r := range s.rows {
				row := c[r*h : (r+1)*h]
				clear(row)
				row[0] = complex(0.75, 3)
				row[h-1] = complex(-0.25, -7)
			}
			p.Inverse()
			for r := range s.rows {
				for j := range n {
					want := 0.75 - 0.25*float64(1-2*(j%2))
					if math.Abs(x[r*n+j]-want) > tolExact {
						t.Fatalf("%v %+v row %d: x_%d = %v, want %v", b, s, r, j, x[r*n+j], want)
					}
				}
			}
		}
	}
}

func TestBuffersStartZeroed(t *testing.T) {
	for _, b := range backends() {
		p := newPlan(t, b, 64, 9, 3)
		for j, v := range p.Real() {
			if v != 0 {
				t.Fatalf("%v: Real()[%d] = %v, want 0", b, j, v)
			}
		}
		for k, v := range p.Spec() {
			if v != 0 {
				t.Fatalf("%v: Spec()[%d] = %v, want 0", b, k, v)
			}
		}
		if len(p.Real()) != 64*9 || len(p.Spec()) != 33*9 {
			t.Errorf("%v: buffer lengths %d, %d", b, len(p.Real()), len(p.Spec()))
		}
	}
}

// TestBackendsAgree holds FFTW against gonum on random batches.
func TestBackendsAgree(t *testing.T) {
	if !haveFFTW {
		t.Skip("built without cgo")
	}
	rng := rand.New(rand.NewPCG(5, 6))
	for _, s := range shapes {
		f := newPlan(t, FFTW, s.n, s.rows, s.parts)
		g := newPlan(t, Gonum, s.n, s.rows, s.parts)
		fillRandom(rng, f.Real())
		copy(g.Real(), f.Real())
		f.Forward()
		g.Forward()
		// Two independent FFTs of the same data: common practice, no source.
		if e := cRelErr(f.Spec(), g.Spec()); e > tolAgreed {
			t.Errorf("%+v: forward spectra differ by %.3g relative", s, e)
		}
		// Random spectra, including imaginary parts at k = 0 and N/2 that
		// both must ignore.
		fillRandomSpec(rng, f.Spec())
		copy(g.Spec(), f.Spec())
		f.Inverse()
		g.Inverse()
		if e := relErr(f.Real(), g.Real()); e > tolAgreed {
			t.Errorf("%+v: inverse rows differ by %.3g relative", s, e)
		}
	}
}

// TestPartsMatchWhole checks that the part calls over every part give bit for
// bit what Forward and Inverse give, and that a part call touches only its
// own rows.
func TestPartsMatchWhole(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for _, b := range backends() {
		for _, s := range shapes {
			p := newPlan(t, b, s.n, s.rows, s.parts)
			n, h := s.n, s.n/2+1
			x, c := p.Real(), p.Spec()
			fillRandom(rng, x)
			x0 := append([]float64(nil), x...)

			p.Forward()
			whole := append([]complex128(nil), c...)
			for i := range s.parts {
				lo, hi := p.PartRows(i)
				const sentinel = complex(-9, 9)
				for k := range c {
					c[k] = sentinel
				}
				p.ForwardPart(i)
				for k, v := range c {
					inPart := k >= lo*h && k < hi*h
					if inPart && v != whole[k] || !inPart && v != sentinel {
						t.Fatalf("%v %+v ForwardPart(%d): Spec()[%d] = %v, whole %v", b, s, i, k, v, whole[k])
					}
				}
			}

			fillRandomSpec(rng, c)
			spec := append([]complex128(nil), c...)
			p.Inverse()
			wholeX := append([]float64(nil), x...)
			for i := range s.parts {
				lo, hi := p.PartRows(i)
				copy(c, spec)
				copy(x, x0)
				p.InversePart(i)
				for j, v := range x {
					inPart := j >= lo*n && j < hi*n
					if inPart && v != wholeX[j] || !inPart && v != x0[j] {
						t.Fatalf("%v %+v InversePart(%d): Real()[%d] = %v, whole %v", b, s, i, j, v, wholeX[j])
					}
				}
				for k := range c {
					if (k < lo*h || k >= hi*h) && c[k] != spec[k] {
						t.Fatalf("%v %+v InversePart(%d) changed Spec()[%d] outside its part", b, s, i, k)
					}
				}
			}
		}
	}
}

// TestConcurrentParts runs each part's transforms in its own goroutine and
// compares with the same calls made serially on the same plan. Run it under
// -race too.
func TestConcurrentParts(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for _, b := range backends() {
		p := newPlan(t, b, 256, 65, 8)
		x, c := p.Real(), p.Spec()
		fillRandom(rng, x)
		x0 := append([]float64(nil), x...)
		steps := func(i int) {
			p.ForwardPart(i)
			p.InversePart(i)
			p.ForwardPart(i)
		}

		for i := range p.Parts() {
			steps(i)
		}
		serialX := append([]float64(nil), x...)
		serialC := append([]complex128(nil), c...)

		for round := range 4 {
			copy(x, x0)
			clear(c)
			var wg sync.WaitGroup
			for i := range p.Parts() {
				wg.Go(func() { steps(i) })
			}
			wg.Wait()
			for j := range x {
				if x[j] != serialX[j] {
					t.Fatalf("%v round %d: Real()[%d] = %v concurrently, %v serially", b, round, j, x[j], serialX[j])
				}
			}
			for k := range c {
				if c[k] != serialC[k] {
					t.Fatalf("%v round %d: Spec()[%d] = %v concurrently, %v serially", b, round, k, c[k], serialC[k])
				}
			}
		}
	}
}

func TestZeroAllocs(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, b := range backends() {
		p := newPlan(t, b, 128, 17, 3)
		fillRandom(rng, p.Real())
		calls := []struct {
			name string
			f    func()
		}{
			{"Forward", p.Forward},
			{"Inverse", p.Inverse},
			{"ForwardPart", func() { p.ForwardPart(1) }},
			{"InversePart", func() { p.InversePart(2) }},
		}
		for _, call := range calls {
			// The contract in doc.go: no transform call allocates.
			if a := testing.AllocsPerRun(50, call.f); a != 0 {
				t.Errorf("%v %s: %v allocations per call, want 0", b, call.name, a)
			}
		}
	}
}

func TestClose(t *testing.T) {
	for _, b := range backends() {
		p, err := New(b, 16, 3, 2)
		if err != nil {
			t.Fatal(err)
		}
		p.Close()
		p.Close() // idempotent
		if p.Real() != nil || p.Spec() != nil {
			t.Errorf("%v: buffers still returned after Close", b)
		}
		for name, f := range map[string]func(){
			"Forward":     p.Forward,
			"Inverse":     p.Inverse,
			"ForwardPart": func() { p.ForwardPart(0) },
			"InversePart": func() { p.InversePart(1) },
		} {
			func() {
				defer func() {
					if r := recover(); r != errClosed {
						t.Errorf("%v %s after Close: recovered %v, want %q", b, name, r, errClosed)
					}
				}()
				f()
			}()
		}
	}
}

// TestAvailable: gonum is in every build, FFTW exactly when the build has
// it, an unknown backend in none.
func TestAvailable(t *testing.T) {
	for _, tc := range []struct {
		b    Backend
		want bool
	}{{Gonum, true}, {FFTW, haveFFTW}, {Backend(7), false}} {
		if got := Available(tc.b); got != tc.want {
			t.Errorf("Available(%v) = %v, want %v", tc.b, got, tc.want)
		}
	}
}
