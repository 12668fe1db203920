package transform

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Backend names a transform implementation.
type Backend int

const (
	// FFTW is FFTW 3 through cgo, the default.
	FFTW Backend = iota
	// Gonum is gonum's pure-Go dsp/fourier.
	Gonum
)

// Plan transforms a fixed batch of Rows() rows of N() real samples each,
// or, for a plan made by NewPlanes, Rows() planes of Ny()×N() samples
// (two-dimensional transforms over x and y; see the package doc).
//
// The buffers returned by Real and Spec are owned by the plan and stay at the
// same address for the plan's life; callers write their input into them and
// read the output from them. Forward and Inverse act on all rows. ForwardPart
// and InversePart act on the rows of one part only (see PartRows); calls for
// different parts may run concurrently, calls for the same part may not.
type Plan interface {
	N() int
	// Ny is the number of samples along y in a plane: 1 for a plan of rows.
	Ny() int
	Rows() int
	// Parts is the number of row blocks the batch is split into.
	Parts() int
	// PartRows returns the half-open row range [lo, hi) of part i.
	PartRows(i int) (lo, hi int)

	// Real is the physical-space buffer, Rows()*Ny()*N() values.
	Real() []float64
	// Spec is the spectral buffer, Rows()*Ny()*(N()/2+1) values.
	Spec() []complex128

	Forward()
	Inverse()
	ForwardPart(i int)
	InversePart(i int)

	// Close releases the plan and its buffers; the slices returned by Real
	// and Spec must not be used afterwards.
	Close()
}

// backendNames are the backends' names, indexed by Backend: the one list
// of them, which case files and flags are checked against.
var backendNames = [...]string{FFTW: "fftw", Gonum: "gonum"}

// Names returns the backends' names as ParseBackend accepts them, in the
// order of the Backend constants: "fftw", "gonum".
func Names() []string { return append([]string(nil), backendNames[:]...) }

// String returns the backend's name as ParseBackend accepts it: "fftw" or
// "gonum"; an unknown value prints as "Backend(k)".
func (b Backend) String() string {
	if b >= 0 && int(b) < len(backendNames) {
		return backendNames[b]
	}
	return "Backend(" + strconv.Itoa(int(b)) + ")"
}

// ParseBackend returns the backend named s, exactly one of Names
// ("fftw", "gonum"; case-sensitive, as case files are), or an error naming
// s.
func ParseBackend(s string) (Backend, error) {
	for b, name := range backendNames {
		if s == name {
			return Backend(b), nil
		}
	}
	quoted := make([]string, len(backendNames))
	for i, name := range backendNames {
		quoted[i] = strconv.Quote(name)
	}
	return 0, fmt.Errorf("transform: unknown backend %q (want %s)", s, strings.Join(quoted, " or "))
}

// Available reports whether this build has backend b: Gonum always, FFTW
// only in builds with cgo.
func Available(b Backend) bool {
	switch b {
	case FFTW:
		return haveFFTW
	case Gonum:
		return true
	}
	return false
}

// New returns a plan for rows rows of n real samples each, split into parts
// contiguous row blocks, using backend b.
//
// n must be even and at least 4, rows at least 1 and parts between 1 and rows;
// otherwise New returns an error naming the bad argument. The rows are split
// as evenly as possible: with q, r = rows/parts, rows%parts, the first r parts
// hold q+1 rows and the others q, in order, so part i starts at row
// i*q + min(i, r).
//
// Both buffers start zeroed. The plan must be released with Close; its
// buffers are not reclaimed by the garbage collector for the FFTW backend.
func New(b Backend, n, rows, parts int) (Plan, error) {
	return NewPlanes(b, n, 1, rows, parts)
}

// NewPlanes returns a plan for planes planes of ny rows of n real samples
// (ny·n values, point (i, j) of a plane at j·n + i), transformed in two
// dimensions, split into parts contiguous blocks of planes, using backend
// b. With ny = 1 it is New. Otherwise ny must be even and at least 4; the
// other arguments are as for New, with planes in place of rows.
func NewPlanes(b Backend, n, ny, planes, parts int) (Plan, error) {
	l, err := newLayout(n, planes, parts)
	if err == nil && ny != 1 {
		err = l.setPlane(ny)
	}
	if err != nil {
		return nil, err
	}
	switch b {
	case FFTW:
		return newFFTW(l)
	case Gonum:
		return newGonum(l), nil
	}
	return nil, fmt.Errorf("transform: unknown backend %v", b)
}

// layout is the shape of a batch and its split into parts, shared by the
// backends.
type layout struct {
	n, h, rows int
	// ny is the number of rows in a plane (1 for one-dimensional
	// transforms); a plane holds ny·n reals and ny·h coefficients.
	ny int
	// start[i] is the first row of part i; start[len(start)-1] == rows.
	start []int
}

// maxBytes bounds one buffer so that element counts and byte sizes fit in
// both Go int and FFTW's C int arguments.
const maxBytes = 1 << 40

func newLayout(n, rows, parts int) (layout, error) {
	switch {
	case n < 4 || n%2 != 0:
		return layout{}, fmt.Errorf("transform: n = %d, want an even number >= 4", n)
	case n > math.MaxInt32/2:
		return layout{}, fmt.Errorf("transform: n = %d, too large", n)
	case rows < 1:
		return layout{}, fmt.Errorf("transform: rows = %d, want >= 1", rows)
	case rows > math.MaxInt32:
		return layout{}, fmt.Errorf("transform: rows = %d, too large", rows)
	case parts < 1 || parts > rows:
		return layout{}, fmt.Errorf("transform: parts = %d, want 1 <= parts <= rows = %d", parts, rows)
	}
	h := n/2 + 1
	if rows > maxBytes/(16*h) {
		return layout{}, fmt.Errorf("transform: rows = %d of n = %d, field too large", rows, n)
	}
	q, r := rows/parts, rows%parts
	start := make([]int, parts+1)
	for i := range start {
		start[i] = i*q + min(i, r)
	}
	return layout{n: n, h: h, rows: rows, ny: 1, start: start}, nil
}

// setPlane makes l a layout of planes of ny rows.
func (l *layout) setPlane(ny int) error {
	switch {
	case ny < 4 || ny%2 != 0:
		return fmt.Errorf("transform: ny = %d, want an even number >= 4", ny)
	case ny > math.MaxInt32/l.n || l.rows > maxBytes/(16*l.h*ny):
		return fmt.Errorf("transform: %d planes of %d×%d, field too large", l.rows, ny, l.n)
	}
	l.ny = ny
	return nil
}

func (l *layout) N() int     { return l.n }
func (l *layout) Ny() int    { return l.ny }
func (l *layout) Rows() int  { return l.rows }
func (l *layout) Parts() int { return len(l.start) - 1 }

// PartRows panics if i is not in [0, Parts()).
func (l *layout) PartRows(i int) (lo, hi int) {
	l.checkPart(i)
	return l.start[i], l.start[i+1]
}

// checkPart panics if i is not a part index; a bad index is a programmer
// error.
func (l *layout) checkPart(i int) {
	if i < 0 || i >= len(l.start)-1 {
		badPart(i, len(l.start)-1)
	}
}

//go:noinline
func badPart(i, parts int) {
	panic(fmt.Sprintf("transform: part %d out of range [0, %d)", i, parts))
}

// errClosed is the panic value for a transform on a closed plan.
const errClosed = "transform: plan used after Close"

// hermitian makes the spectrum of one plane (ny rows of h coefficients)
// exactly Hermitian where the two-dimensional real transform stores both
// halves: the columns k = 0 and k = N/2 hold c(k, −l) = conj(c(k, l)). The
// upper half of each column is set from the lower half, and the four
// self-conjugate coefficients get zero imaginary parts, so that every
// backend's inverse transforms the same real field.
func hermitian(c []complex128, ny, h int) {
	for _, k := range [2]int{0, h - 1} {
		for l := 1; l < ny/2; l++ {
			v := c[l*h+k]
			c[(ny-l)*h+k] = complex(real(v), -imag(v))
		}
		c[k] = complex(real(c[k]), 0)
		c[(ny/2)*h+k] = complex(real(c[(ny/2)*h+k]), 0)
	}
}
