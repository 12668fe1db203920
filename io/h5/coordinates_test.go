package h5

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"rollerbed/io/casefile"
)

// addedDatasets lists the datasets that format version 2 adds to those of
// expectedDatasets for the test run of n snapshots (all with u, w and p).
func addedDatasets(n int) []string {
	out := []string{"/x", "/z_centre", "/z_face", "/component", "/time", gridXEdges, gridZfEdges, "/p", "/u", "/w", "/velocity"}
	for s := 0; s < n; s++ {
		for _, d := range []string{"x", "z_centre", "z_face", "component", "velocity"} {
			out = append(out, fmt.Sprintf("/snapshots/%06d/%s", s, d))
		}
	}
	return out
}

// h5pyCoordinatesScript checks with numpy, bit for bit, that each root
// stack equals the snapshot datasets it maps and that each velocity
// vector is u, w interpolated linearly in z to the centres, and 0; it
// prints the results as JSON.
const h5pyCoordinatesScript = `
import sys, json, h5py, numpy as np
def same(a, b):
    a, b = np.asarray(a, dtype="<f8"), np.asarray(b, dtype="<f8")
    return a.shape == b.shape and a.view("<u8").tolist() == b.view("<u8").tolist()
out = {"stacks": {}, "velocity": {}}
with h5py.File(sys.argv[1], "r") as f:
    zc, zf = f["grid/z_centre"][()], f["grid/z_face"][()]
    groups = sorted(f["snapshots"].keys())
    out["time"] = f["time"][()].tolist()
    for name in ["u", "w", "p", "velocity"]:
        st = f[name]
        out["stacks"][name] = st.shape[0] == len(groups) and all(same(st[j], f["snapshots"][g][name][()]) for j, g in enumerate(groups))
    for g in groups:
        s = f["snapshots"][g]
        u, w, v = s["u"][()], s["w"][()], s["velocity"][()]
        a = ((zc - zf[:-1]) / (zf[1:] - zf[:-1]))[:, None]
        wc = w[:-1] + a * (w[1:] - w[:-1])
        out["velocity"][g] = same(v[..., 0], u) and same(v[..., 1], wc) and same(v[..., 2], np.zeros_like(u))
print(json.dumps(out))
`

func TestH5pyReadsCoordinates(t *testing.T) {
	path := writeTestRun(t, t.TempDir(), 4, 3)
	r := runH5py(t, path)
	root := r.Groups["/"]
	if root["Conventions"] != conventions || num(root["format_version"]) != 2 {
		t.Errorf("root attributes Conventions %v, format_version %v", root["Conventions"], root["format_version"])
	}
	// Coordinates, from memory of the CF conventions (1.8, section 4):
	// axis X/Z/T, positive "up" for heights, units and long_name.
	g := testGrid()
	for _, c := range []struct {
		path, axis, positive, units string
		values                      []float64
	}{
		{"/x", "X", "", "m", g.X},
		{"/z_centre", "Z", "up", "m", g.Zc},
		{"/z_face", "Z", "up", "m", g.Zf},
		{"/time", "T", "", "s", []float64{1, 2, 3}},
		{"/snapshots/000002/x", "X", "", "m", g.X},
		{"/snapshots/000002/z_face", "Z", "up", "m", g.Zf},
	} {
		d, ok := r.Datasets[c.path]
		if !ok || !d.Scale {
			t.Errorf("h5py: %s is not a dimension scale", c.path)
			continue
		}
		if d.SHA256 != digestLE(c.values) {
			t.Errorf("h5py: %s holds other values than %v", c.path, c.values)
		}
		a := d.Attrs
		if a["axis"] != c.axis || a["units"] != c.units || a["long_name"] == nil || (c.positive != "") != (a["positive"] == c.positive) {
			t.Errorf("h5py: %s attributes %v", c.path, a)
		}
	}
	dims := func(path string) string {
		return fmt.Sprint(r.Datasets[path].Dims)
	}
	for s := 0; s < 3; s++ {
		gp := fmt.Sprintf("/snapshots/%06d", s)
		for _, c := range []struct{ name, want string }{
			{"u", fmt.Sprintf("[[%[1]s/z_centre] [%[1]s/x]]", gp)},
			{"w", fmt.Sprintf("[[%[1]s/z_face] [%[1]s/x]]", gp)},
			{"velocity", fmt.Sprintf("[[%[1]s/z_centre] [%[1]s/x] [%[1]s/component]]", gp)},
		} {
			if got := dims(gp + "/" + c.name); got != c.want {
				t.Errorf("h5py: dimensions of %s/%s are %s, want %s", gp, c.name, got, c.want)
			}
		}
	}
	for _, c := range []struct{ path, want string }{
		{"/u", "[[/time] [/z_centre] [/x]]"},
		{"/w", "[[/time] [/z_face] [/x]]"},
		{"/velocity", "[[/time] [/z_centre] [/x] [/component]]"},
		{"/canopy/frontal_area", "[[/z_centre] [/x]]"},
		{gridX, "[[/x]]"},
	} {
		if got := dims(c.path); got != c.want {
			t.Errorf("h5py: dimensions of %s are %s, want %s", c.path, got, c.want)
		}
	}
	for _, n := range []string{"/u", "/w", "/p", "/velocity"} {
		if d := r.Datasets[n]; !d.Virtual || d.Attrs["long_name"] == nil || d.Attrs["units"] == nil {
			t.Errorf("h5py: %s virtual %v, attributes %v", n, d.Virtual, d.Attrs)
		}
	}

	py := needH5py(t)
	out, err := exec.Command(py, "-c", h5pyCoordinatesScript, path).CombinedOutput()
	if err != nil {
		t.Fatalf("h5py: %v\n%s", err, out)
	}
	var c struct {
		Time     []float64
		Stacks   map[string]bool
		Velocity map[string]bool
	}
	if err := json.Unmarshal(out, &c); err != nil {
		t.Fatalf("h5py output: %v\n%s", err, out)
	}
	if !equalFloats(c.Time, []float64{1, 2, 3}) {
		t.Errorf("h5py: time %v, want 1 2 3", c.Time)
	}
	for _, n := range []string{"u", "w", "p", "velocity"} {
		if !c.Stacks[n] {
			t.Errorf("h5py: the stack /%s differs from the snapshot datasets", n)
		}
	}
	if len(c.Velocity) != 3 {
		t.Errorf("h5py: velocity checked in %d snapshots, want 3", len(c.Velocity))
	}
	for g, ok := range c.Velocity {
		if !ok {
			t.Errorf("h5py: the velocity vector of snapshot %s is not (u, interpolated w, 0)", g)
		}
	}
}

func TestH5dumpReadsCoordinates(t *testing.T) {
	h5dump := needTool(t, "h5dump", "hdf5-tools")
	path := writeTestRun(t, t.TempDir(), 0, 2)
	var stack []float64
	for s := 0; s < 2; s++ {
		stack = append(stack, testFields(s)[1].Data...)
	}
	if got := h5dumpValues(t, h5dump, path, "/w"); !sameBits(got, stack) {
		t.Errorf("h5dump /w: %v, want the snapshots' w one after the other", got)
	}
	if got := h5dumpValues(t, h5dump, path, "/time"); !equalFloats(got, []float64{1, 2}) {
		t.Errorf("h5dump /time: %v", got)
	}
	out, err := exec.Command(h5dump, "-p", "-H", "-d", "/u", path).CombinedOutput()
	if err != nil {
		t.Fatalf("h5dump -p /u: %v\n%s", err, out)
	}
	for _, want := range []string{"VIRTUAL", "DIMENSION_LIST", "/snapshots/000001/u", "( 2, 5, 8 )"} {
		if !bytes.Contains(out, []byte(want)) {
			t.Errorf("h5dump -p /u lacks %q:\n%s", want, out)
		}
	}
	out, err = exec.Command(h5dump, "-A", "-d", "/x", path).CombinedOutput()
	if err != nil || !bytes.Contains(out, []byte(`"DIMENSION_SCALE"`)) || !bytes.Contains(out, []byte("REFERENCE_LIST")) {
		t.Errorf("h5dump -A /x: want a dimension scale with its users: %v\n%s", err, out)
	}
}

func TestNcdumpNamesDimensions(t *testing.T) {
	ncdump := needTool(t, "ncdump", "netcdf-bin")
	path := writeTestRun(t, t.TempDir(), 1, 2)
	out, err := exec.Command(ncdump, "-h", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ncdump -h: %v\n%s", err, out)
	}
	if bytes.Contains(out, []byte("phony_dim")) {
		t.Errorf("ncdump -h names dimensions phony_dim_*:\n%s", out)
	}
	for _, want := range []string{
		"time = 2 ;", "x = 8 ;", "z_centre = 5 ;", "z_face = 6 ;",
		"double u(time, z_centre, x) ;", "double w(time, z_face, x) ;",
		"double velocity(time, z_centre, x, component) ;", "double time(time) ;",
		`:Conventions = "CF-1.8" ;`, `u:units = "m/s" ;`, `time:axis = "T" ;`, `z_face:positive = "up" ;`,
		"double frontal_area(z_centre, x) ;", "double u(z_centre, x) ;", "double w(z_face, x) ;",
	} {
		if !bytes.Contains(out, []byte(want)) {
			t.Errorf("ncdump -h lacks %q", want)
		}
	}
	if t.Failed() {
		t.Logf("ncdump -h:\n%s", out)
	}
}

// stackShape reads the extent of the root stack name and the time
// coordinate with this package's binding.
func stackShape(t *testing.T, path, name string) ([]int, []float64) {
	t.Helper()
	defer enter()()
	f, err := openFile(path, false)
	if err != nil {
		t.Fatal(err)
	}
	defer f.close()
	d, err := f.dims("/" + name)
	if err != nil {
		t.Fatalf("stack /%s: %v", name, err)
	}
	tn, err := f.dims("/time")
	if err != nil {
		t.Fatal(err)
	}
	times, err := f.readF64("/time", tn[0])
	if err != nil {
		t.Fatal(err)
	}
	return d, times
}

func TestStacksFollowTruncation(t *testing.T) {
	path := writeTestRun(t, t.TempDir(), 0, 3)
	fl, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.TruncateAfter(1.5); err != nil {
		t.Fatal(err)
	}
	if d, times := stackShape(t, path, "velocity"); fmt.Sprint(d) != "[1 5 8 3]" || !equalFloats(times, []float64{1}) {
		t.Errorf("after truncation: /velocity %v, time %v", d, times)
	}
	if err := fl.WriteSnapshot(2.5, 250, testFields(7)); err != nil {
		t.Fatal(err)
	}
	if d, times := stackShape(t, path, "w"); fmt.Sprint(d) != "[2 6 8]" || !equalFloats(times, []float64{1, 2.5}) {
		t.Errorf("after a new snapshot: /w %v, time %v", d, times)
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	h5dumpReadable(t, path)
}

func TestSnapshotNamesReserved(t *testing.T) {
	for _, name := range reservedSnapshotNames {
		fl := startTestRun(t, filepath.Join(t.TempDir(), "fields.h5"), 0)
		f := testFields(0)[0]
		f.Name = name
		err := fl.WriteSnapshot(1, 1, []Field{f})
		if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("field name %q is reserved", name)) || !strings.Contains(err.Error(), "rename") {
			t.Errorf("field %q: error %v", name, err)
		}
	}
}

func TestSnapshotWithoutVelocity(t *testing.T) {
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl := startTestRun(t, path, 0)
	if err := fl.WriteSnapshot(1, 1, testFields(0)[1:]); err != nil { // w and p, no u
		t.Fatal(err)
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	snaps, err := ListSnapshots(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(snaps) != 1 || snaps[0].vector || len(snaps[0].Fields) != 2 {
		t.Errorf("snapshots %+v, want one of p and w without a velocity vector", snaps)
	}
}

// The fixture testdata/fields-v1.h5 was written by format version 1 (the
// test run of writeTestRun, deflate level 1, two snapshots).
const fixtureV1 = "testdata/fields-v1.h5"

// copyFixtureV1 copies the version 1 fixture to a new folder as fields.h5.
func copyFixtureV1(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "fields.h5")
	copyFile(t, fixtureV1, path)
	return path
}

func TestReadsFormatVersion1(t *testing.T) {
	path := copyFixtureV1(t)
	snaps, err := ListSnapshots(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(snaps) != 2 {
		t.Fatalf("%d snapshots in the version 1 file, want 2", len(snaps))
	}
	for s, info := range snaps {
		for _, want := range testFields(s) {
			got, err := ReadField(path, info.Group+"/"+want.Name)
			if err != nil || !sameBits(got.Data, want.Data) {
				t.Errorf("version 1 %s/%s: %v", info.Group, want.Name, err)
			}
		}
	}
	g, err := ReadGrid(path)
	if err != nil || !sameBits(g.Zf, testGrid().Zf) {
		t.Errorf("version 1 grid %+v: %v", g, err)
	}
	// Its sidecar, rebuilt without writing to it, has node-centred meshes
	// on the points (there are no cell edges in version 1).
	if err := WriteXDMF(path); err != nil {
		t.Fatal(err)
	}
	for _, sg := range checkSidecar(t, SidecarPath(path)) {
		if sg.centred != "Node" || slices.Contains(sg.attrs, "velocity(vector)") {
			t.Errorf("version 1 sidecar mesh %s at %g: %s values %v", sg.mesh, sg.time, sg.centred, sg.attrs)
		}
	}
}

func TestOpenUpgradesFormatVersion1(t *testing.T) {
	path := copyFixtureV1(t)
	fl, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.WriteSnapshot(3, 300, testFields(2)); err != nil {
		t.Fatal(err)
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	// Read back as a file written in version 2 from the start.
	fresh := writeTestRun(t, t.TempDir(), 1, 3)
	got, want := runH5py(t, path), runH5py(t, fresh)
	if len(got.Datasets) != len(want.Datasets) {
		t.Errorf("upgraded file holds %d datasets, a new one %d", len(got.Datasets), len(want.Datasets))
	}
	for p, w := range want.Datasets {
		g := got.Datasets[p]
		if g.SHA256 != w.SHA256 || fmt.Sprint(g.Dims) != fmt.Sprint(w.Dims) || g.Virtual != w.Virtual || g.Scale != w.Scale {
			t.Errorf("upgraded %s: dims %v virtual %v scale %v, want dims %v virtual %v scale %v, or values differ", p, g.Dims, g.Virtual, g.Scale, w.Dims, w.Virtual, w.Scale)
		}
	}
	if num(got.Groups["/"]["format_version"]) != 2 || got.Groups["/"]["Conventions"] != conventions {
		t.Errorf("upgraded root attributes %v", got.Groups["/"])
	}
	if a, b := readAll(t, SidecarPath(path)), readAll(t, SidecarPath(fresh)); !bytes.Equal(a, b) {
		t.Errorf("the upgraded file's sidecar differs from a new file's:\n%s\n---\n%s", a, b)
	}
}

func TestCellEdges(t *testing.T) {
	g := testGrid()
	x, zf := cellEdges(&g)
	dx := testLx / testNx
	if len(x) != testNx+1 || x[0] != -dx/2 || math.Abs(x[testNx]-(testLx-dx/2)) > 1e-15 {
		t.Errorf("x edges %v, want %d from %g to %g", x, testNx+1, -dx/2, testLx-dx/2)
	}
	for i := range testNx {
		if !(x[i] < g.X[i] && g.X[i] < x[i+1]) {
			t.Errorf("x[%d] = %g not inside its cell [%g, %g]", i, g.X[i], x[i], x[i+1])
		}
	}
	if len(zf) != testNz+2 || zf[0] != 0 || zf[testNz+1] != testH {
		t.Errorf("face cell edges %v, want %d from 0 to %g", zf, testNz+2, testH)
	}
	for k := range testNz + 1 {
		if !(zf[k] <= g.Zf[k] && g.Zf[k] <= zf[k+1]) {
			t.Errorf("face %d at %g not inside its cell [%g, %g]", k, g.Zf[k], zf[k], zf[k+1])
		}
	}
}

func readAll(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestReservedNamesAgree: the case file refuses, at check time, exactly
// the names this package keeps for its coordinates and the velocity.
func TestReservedNamesAgree(t *testing.T) {
	a, b := slices.Clone(reservedSnapshotNames), slices.Clone(casefile.ReservedNames)
	slices.Sort(a)
	slices.Sort(b)
	if !slices.Equal(a, b) {
		t.Errorf("io/h5 reserves %v, io/casefile refuses %v", a, b)
	}
}
