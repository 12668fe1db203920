package h5

import (
	"bytes"
	"math/rand/v2"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

const testNy = 4

// testSlabGrid is testGrid with 4 spanwise positions on a width of 0.2 m.
func testSlabGrid() GridInfo {
	g := testGrid()
	g.Ly = 0.2
	for j := range testNy {
		g.Y = append(g.Y, float64(j)*g.Ly/testNy)
	}
	return g
}

// testVolumes returns u, v, w and the vortex-core field of snapshot s.
func testVolumes(s int) []Volume {
	r := rand.New(rand.NewPCG(testSeed, uint64(100+s)))
	n := testNz * testNy * testNx
	return []Volume{
		{Name: "u", Units: "m/s", Description: "streamwise velocity", Data: randomValues(r, n)},
		{Name: "v", Units: "m/s", Description: "spanwise velocity", Data: randomValues(r, n)},
		{Name: "w", Units: "m/s", Description: "vertical velocity at the centres", Data: randomValues(r, n)},
		{Name: "q_criterion", Units: "1/s2", Description: "vortex cores", Source: "Hunt, Wray & Moin 1988", Data: randomValues(r, n)},
	}
}

// writeSlabRun writes a slab's fields file with two snapshots and closes it.
func writeSlabRun(t *testing.T, dir string) string {
	t.Helper()
	path := filepath.Join(dir, "fields.h5")
	fl, err := Create(path, testMeta(1))
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.WriteGrid(testSlabGrid()); err != nil {
		t.Fatal(err)
	}
	for s := range 2 {
		if err := fl.WriteSlabSnapshot(float64(s+1), 10*(s+1), testFields(s), testVolumes(s)); err != nil {
			t.Fatal(err)
		}
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestSlabRoundTrip(t *testing.T) {
	path := writeSlabRun(t, t.TempDir())
	g, err := ReadGrid(path)
	if err != nil {
		t.Fatal(err)
	}
	if want := testSlabGrid(); !sameBits(g.Y, want.Y) || g.Ly != want.Ly || !g.Slab() {
		t.Errorf("grid Y %v width %g, want %v and %g", g.Y, g.Ly, want.Y, want.Ly)
	}
	snaps, err := ListSnapshots(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(snaps) != 2 {
		t.Fatalf("%d snapshots, want 2", len(snaps))
	}
	var names []string
	for _, v := range snaps[1].Volumes {
		names = append(names, v.Name)
	}
	if want := []string{"q_criterion", "u", "v", "w"}; !slices.Equal(names, want) {
		t.Errorf("volumes %v, want %v", names, want)
	}
	if len(snaps[1].Fields) != 3 {
		t.Errorf("x–z fields %v, want u, w and p as in a slice", snaps[1].Fields)
	}
	for _, want := range testVolumes(1) {
		got, err := ReadVolume(path, 1, want.Name)
		if err != nil {
			t.Fatal(err)
		}
		if !sameBits(got.Data, want.Data) || got.Units != want.Units || got.Source != want.Source {
			t.Errorf("volume %s read back differs (units %q source %q)", want.Name, got.Units, got.Source)
		}
	}
	if _, err := ReadVolume(path, 1, "nope"); err == nil || !strings.Contains(err.Error(), "no volume /snapshots/000001/slab/nope") {
		t.Errorf("missing volume: %v", err)
	}
}

// TestSlabSidecar: the third mesh is a 3DRectMesh of the solver's cells
// with every volume and the velocity as one vector; rebuilt from the file
// it is the same text.
func TestSlabSidecar(t *testing.T) {
	path := writeSlabRun(t, t.TempDir())
	var slab []sidecarGrid
	for _, g := range checkSidecar(t, SidecarPath(path)) {
		if g.mesh == slabName {
			slab = append(slab, g)
		}
	}
	if len(slab) != 2 {
		t.Fatalf("%d slab grids, want one per snapshot", len(slab))
	}
	if want := []string{"q_criterion", "u", "v", "w", "velocity(vector)"}; !slices.Equal(slab[0].attrs, want) || slab[0].centred != "Cell" {
		t.Errorf("slab attributes %v centred %q, want %v on cells", slab[0].attrs, slab[0].centred, want)
	}
	// Derived: edges y_j − Δy/2 with Δy = 0.05 m, the last one period on.
	if want := []float64{-0.025, 0.025, 0.075, 0.125, 0.175}; !approxAll(slab[0].y, want, 1e-15) {
		t.Errorf("y edges %v, want %v", slab[0].y, want)
	}
	sameSidecarRebuilt(t, path)
}

func approxAll(a, b []float64, tol float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if d := a[i] - b[i]; d > tol || d < -tol {
			return false
		}
	}
	return true
}

// TestSlabReaders: h5dump reads a volume's values and the vector's extent;
// ncdump names the volume's dimensions (z_centre, y, x).
func TestSlabReaders(t *testing.T) {
	path := writeSlabRun(t, t.TempDir())
	h5dump := needTool(t, "h5dump", "hdf5-tools")
	want := testVolumes(0)[1]
	if got := h5dumpValues(t, h5dump, path, "/snapshots/000000/slab/v"); !sameBits(got, want.Data) {
		t.Errorf("h5dump of v differs from what was written")
	}
	out, err := exec.Command(h5dump, "-H", "-d", "/snapshots/000000/slab/velocity", path).CombinedOutput()
	if err != nil || !bytes.Contains(out, []byte("( 5, 4, 8, 3 )")) {
		t.Errorf("h5dump -H of the velocity: %v\n%s", err, out)
	}
	ncdump := needTool(t, "ncdump", "netcdf-bin")
	out, err = exec.Command(ncdump, "-h", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ncdump -h: %v\n%s", err, out)
	}
	for _, w := range []string{"double y(y)", "y:axis = \"Y\"", "double q_criterion(z_centre, y, x)", "q_criterion:source = \"Hunt, Wray & Moin 1988\""} {
		if !bytes.Contains(out, []byte(w)) {
			t.Errorf("ncdump -h lacks %q:\n%s", w, out)
		}
	}
}

func TestSlabMistakes(t *testing.T) {
	dir := t.TempDir()
	fl := startTestRun(t, filepath.Join(dir, "fields.h5"), 0)
	if err := fl.WriteSlabSnapshot(1, 1, testFields(0), testVolumes(0)); err == nil || !strings.Contains(err.Error(), "the grid is not a slab's") {
		t.Errorf("volumes on a slice's grid: %v", err)
	}
	fl.Close()
	fl, err := Create(filepath.Join(dir, "slab.h5"), testMeta(0))
	if err != nil {
		t.Fatal(err)
	}
	defer fl.Close()
	bad := testSlabGrid()
	bad.Ly = 0
	if err := fl.WriteGrid(bad); err == nil || !strings.Contains(err.Error(), "finite width > 0") {
		t.Errorf("slab grid without a width: %v", err)
	}
	if err := fl.WriteGrid(testSlabGrid()); err != nil {
		t.Fatal(err)
	}
	vs := testVolumes(0)
	vs[0].Data = vs[0].Data[:10]
	if err := fl.WriteSlabSnapshot(1, 1, testFields(0), vs); err == nil || !strings.Contains(err.Error(), "want Nz·Ny·Nx = 5·4·8") {
		t.Errorf("short volume: %v", err)
	}
	vs = testVolumes(0)
	vs[1].Name = "velocity"
	if err := fl.WriteSlabSnapshot(1, 1, testFields(0), vs); err == nil || !strings.Contains(err.Error(), "reserved") {
		t.Errorf("reserved volume name: %v", err)
	}
	if snaps := fl.Snapshots(); len(snaps) != 0 {
		t.Errorf("refused snapshots were written: %v", snaps)
	}
}
