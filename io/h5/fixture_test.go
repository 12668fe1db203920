package h5

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"
)

// The test grid: 8 points in x, 5 cells in z (5 centres, 6 faces),
// stretched towards the bed.
const (
	testNx   = 8
	testNz   = 5
	testLx   = 0.4 // m
	testH    = 0.1 // m
	testSeed = 20240611
)

func testGrid() GridInfo {
	g := GridInfo{Lx: testLx, H: testH}
	for i := 0; i < testNx; i++ {
		g.X = append(g.X, float64(i)*testLx/testNx)
	}
	for j := 0; j <= testNz; j++ {
		s := float64(j) / testNz
		g.Zf = append(g.Zf, testH*s*s)
	}
	for k := 0; k < testNz; k++ {
		g.Zc = append(g.Zc, (g.Zf[k]+g.Zf[k+1])/2)
	}
	return g
}

func testMeta(compress int) Meta {
	return Meta{
		Title:    "test run: sparse dowels",
		Version:  "rollerbed 0.0.0-test",
		CaseText: "[domain]\nlength = 0.4 # m\n\n[canopy]\nheight = 0.05 # m, ν = 1e-6\n",
		Seed:     testSeed,
		Started:  time.Date(2024, 6, 11, 8, 30, 0, 0, time.UTC),
		Compress: compress,
	}
}

// randomValues returns n values spread over many magnitudes, signs and
// bit patterns (no NaN).
func randomValues(r *rand.Rand, n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = (r.Float64() - 0.5) * math.Pow(10, float64(r.IntN(21)-10))
	}
	return v
}

// testFields returns u, p (centre) and w (face) for snapshot s.
func testFields(s int) []Field {
	r := rand.New(rand.NewPCG(testSeed, uint64(s)))
	return []Field{
		{Name: "u", Units: "m/s", Description: "streamwise velocity", Data: randomValues(r, testNz*testNx), Rows: testNz, Cols: testNx, Location: LocationCentre},
		{Name: "w", Units: "m/s", Description: "vertical velocity", Data: randomValues(r, (testNz+1)*testNx), Rows: testNz + 1, Cols: testNx, Location: LocationFace},
		{Name: "p", Units: "Pa", Description: "kinematic pressure times density", Data: randomValues(r, testNz*testNx), Rows: testNz, Cols: testNx, Location: LocationCentre},
	}
}

func testFrontalArea() []float64 {
	a := make([]float64, testNz*testNx)
	for k := 0; k < 3; k++ {
		for i := 0; i < testNx; i++ {
			a[k*testNx+i] = 12.5 // 1/m, below the canopy top
		}
	}
	return a
}

// writeTestRun writes a fields file with n snapshots at t = 1, 2, … s and
// closes it.
func writeTestRun(t *testing.T, dir string, compress, n int) string {
	t.Helper()
	path := filepath.Join(dir, "fields.h5")
	fl := startTestRun(t, path, compress)
	for s := 0; s < n; s++ {
		if err := fl.WriteSnapshot(float64(s+1), 100*(s+1), testFields(s)); err != nil {
			t.Fatal(err)
		}
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// startTestRun creates a fields file with its grid and canopy array.
func startTestRun(t *testing.T, path string, compress int) *Fields {
	t.Helper()
	fl, err := Create(path, testMeta(compress))
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.WriteGrid(testGrid()); err != nil {
		t.Fatal(err)
	}
	if err := fl.WriteStatic("/canopy/frontal_area", testFrontalArea(), testNz, testNx, "1/m", "frontal area of the elements per unit volume"); err != nil {
		t.Fatal(err)
	}
	return fl
}

// sameBits reports whether a and b hold the same float64 bit patterns.
func sameBits(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
			return false
		}
	}
	return true
}

// digestLE is the hex SHA-256 of the values as little-endian float64.
func digestLE(v []float64) string {
	var b bytes.Buffer
	for _, x := range v {
		binary.Write(&b, binary.LittleEndian, math.Float64bits(x))
	}
	s := sha256.Sum256(b.Bytes())
	return hex.EncodeToString(s[:])
}

// needTool returns the path of an independent reader, or skips the test.
func needTool(t *testing.T, name, pkg string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		t.Skipf("%s not found: install the Debian package %s (make deps does) to run this check", name, pkg)
	}
	return p
}

// needH5py returns a Python interpreter that imports h5py, or skips.
func needH5py(t *testing.T) string {
	t.Helper()
	for _, c := range []string{"python3", "/usr/bin/python3"} {
		p, err := exec.LookPath(c)
		if err != nil {
			continue
		}
		if exec.Command(p, "-c", "import h5py, numpy").Run() == nil {
			return p
		}
	}
	t.Skip("no python3 with h5py found: install the Debian package python3-h5py (make deps does) to run this check")
	return ""
}

// copyFile copies src to dst.
func copyFile(t *testing.T, src, dst string) {
	t.Helper()
	b, err := os.ReadFile(src)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(dst, b, 0o644); err != nil {
		t.Fatal(err)
	}
}
