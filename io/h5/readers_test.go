package h5

// Checks with readers that share no code with this package: h5dump and
// h5ls (Debian hdf5-tools) and h5py (Debian python3-h5py).

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// expectedDataset is a dataset the test run must hold.
type expectedDataset struct {
	path     string
	shape    []int
	values   []float64
	units    string
	location string
}

func expectedDatasets(snapshots int) []expectedDataset {
	g := testGrid()
	out := []expectedDataset{
		{gridX, []int{testNx}, g.X, "m", ""},
		{gridZc, []int{testNz}, g.Zc, "m", ""},
		{gridZf, []int{testNz + 1}, g.Zf, "m", ""},
		{"/canopy/frontal_area", []int{testNz, testNx}, testFrontalArea(), "1/m", LocationCentre},
	}
	for s := 0; s < snapshots; s++ {
		for _, fd := range testFields(s) {
			out = append(out, expectedDataset{fmt.Sprintf("/snapshots/%06d/%s", s, fd.Name), []int{fd.Rows, fd.Cols}, fd.Data, fd.Units, fd.Location})
		}
	}
	return out
}

// h5dumpValues reads a dataset's values with h5dump at full precision.
func h5dumpValues(t *testing.T, h5dump, file, path string) []float64 {
	t.Helper()
	out, err := exec.Command(h5dump, "-d", path, "-m", "%.17g", "-y", "-w", "0", file).CombinedOutput()
	if err != nil {
		t.Fatalf("h5dump -d %s: %v\n%s", path, err, out)
	}
	var vals []float64
	in := false
	for _, line := range strings.Split(string(out), "\n") {
		l := strings.TrimSpace(line)
		switch {
		case !in && l == "DATA {":
			in = true
		case in && l == "}":
			return vals
		case in:
			for _, f := range strings.Split(l, ",") {
				if f = strings.TrimSpace(f); f == "" {
					continue
				}
				v, err := strconv.ParseFloat(f, 64)
				if err != nil {
					t.Fatalf("h5dump value %q: %v", f, err)
				}
				vals = append(vals, v)
			}
		}
	}
	t.Fatalf("no DATA block in h5dump output:\n%s", out)
	return nil
}

func TestH5dumpReadsFields(t *testing.T) {
	h5dump := needTool(t, "h5dump", "hdf5-tools")
	for _, tc := range []struct {
		name     string
		compress int
	}{{"uncompressed", 0}, {"deflate 6", 6}} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTestRun(t, t.TempDir(), tc.compress, 2)
			if out, err := exec.Command(h5dump, path).CombinedOutput(); err != nil || bytes.Contains(out, []byte("h5dump error")) {
				t.Fatalf("h5dump of the whole file: %v\n%s", err, out)
			}
			for _, d := range expectedDatasets(2) {
				if got := h5dumpValues(t, h5dump, path, d.path); !sameBits(got, d.values) {
					t.Errorf("h5dump %s: %v, want %v", d.path, got, d.values)
				}
				out, err := exec.Command(h5dump, "-a", d.path+"/units", path).CombinedOutput()
				if err != nil || !strings.Contains(string(out), fmt.Sprintf("%q", d.units)) {
					t.Errorf("h5dump units of %s: %v\n%s", d.path, err, out)
				}
			}
			out, err := exec.Command(h5dump, "-p", "-H", "-d", "/snapshots/000001/u", path).CombinedOutput()
			if err != nil {
				t.Fatalf("h5dump -p: %v\n%s", err, out)
			}
			deflate := strings.Contains(string(out), fmt.Sprintf("COMPRESSION DEFLATE { LEVEL %d }", tc.compress)) && strings.Contains(string(out), "SHUFFLE")
			if deflate != (tc.compress > 0) {
				t.Errorf("h5dump -p: filters do not match level %d:\n%s", tc.compress, out)
			}
			// The robustness strategy relies on the oldest superblock, which
			// keeps no mark of a writer that died with the file open.
			if out, err := exec.Command(h5dump, "-B", "-H", path).CombinedOutput(); err != nil || !strings.Contains(string(out), "SUPERBLOCK_VERSION 0") {
				t.Errorf("h5dump -B: want superblock version 0: %v\n%s", err, out)
			}
			for _, a := range []string{"/time", "/step", "/complete"} {
				if out, err := exec.Command(h5dump, "-a", "/snapshots/000001"+a, path).CombinedOutput(); err != nil {
					t.Errorf("h5dump attribute %s: %v\n%s", a, err, out)
				}
			}
		})
	}
}

func TestH5lsListsFields(t *testing.T) {
	h5ls := needTool(t, "h5ls", "hdf5-tools")
	path := writeTestRun(t, t.TempDir(), 2, 3)
	out, err := exec.Command(h5ls, "-r", path).CombinedOutput()
	if err != nil {
		t.Fatalf("h5ls -r: %v\n%s", err, out)
	}
	listed := map[string]string{}
	for _, line := range strings.Split(string(out), "\n") {
		if f := strings.Fields(line); len(f) >= 2 {
			listed[f[0]] = strings.Join(f[1:], " ")
		}
	}
	for _, d := range expectedDatasets(3) {
		want := "Dataset {" + strings.Trim(strings.ReplaceAll(fmt.Sprint(d.shape), " ", ", "), "[]") + "}"
		if listed[d.path] != want {
			t.Errorf("h5ls lists %s as %q, want %q", d.path, listed[d.path], want)
		}
	}
	for _, g := range []string{"/grid", "/canopy", "/snapshots", "/snapshots/000000", "/snapshots/000002"} {
		if listed[g] != "Group" {
			t.Errorf("h5ls lists %s as %q, want a group", g, listed[g])
		}
	}
}

// h5pyScript prints, as JSON, every dataset's shape, SHA-256 of its values
// as little-endian float64, first values (as float.hex), compression,
// attributes (those of text and numbers), the paths of the dimension
// scales attached to each dimension, whether it is a dimension scale and
// whether it is virtual, and every group's attributes.
const h5pyScript = `
import sys, json, hashlib, h5py, numpy as np
def attrs(o):
    d = {}
    for k, v in o.attrs.items():
        if isinstance(v, bytes):
            v = v.decode()
        elif isinstance(v, np.generic):
            v = v.item()
        elif not isinstance(v, (str, int, float)):
            continue
        d[k] = v
    return d
out = {"datasets": {}, "groups": {}}
with h5py.File(sys.argv[1], "r") as f:
    out["groups"]["/"] = attrs(f)
    def visit(name, obj):
        if isinstance(obj, h5py.Dataset):
            a = np.ascontiguousarray(obj[()], dtype="<f8")
            out["datasets"]["/" + name] = {
                "shape": list(obj.shape),
                "sha256": hashlib.sha256(a.tobytes()).hexdigest(),
                "first": [float(x).hex() for x in a.ravel()[:3]],
                "compression": obj.compression or "",
                "attrs": attrs(obj),
                "dims": [[s.name for s in d.values()] for d in obj.dims],
                "scale": bool(h5py.h5ds.is_scale(obj.id)),
                "virtual": obj.is_virtual,
            }
        else:
            out["groups"]["/" + name] = attrs(obj)
    f.visititems(visit)
print(json.dumps(out))
`

type h5pyReport struct {
	Datasets map[string]struct {
		Shape       []int
		SHA256      string
		First       []string
		Compression string
		Attrs       map[string]any
		Dims        [][]string
		Scale       bool
		Virtual     bool
	}
	Groups map[string]map[string]any
}

func runH5py(t *testing.T, file string) h5pyReport {
	t.Helper()
	py := needH5py(t)
	cmd := exec.Command(py, "-c", h5pyScript, file)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("h5py: %v\n%s", err, stderr.String())
	}
	var r h5pyReport
	dec := json.NewDecoder(bytes.NewReader(out))
	dec.UseNumber()
	if err := dec.Decode(&r); err != nil {
		t.Fatalf("h5py output: %v\n%s", err, out)
	}
	return r
}

// num converts a JSON number from h5py, or NaN.
func num(v any) float64 {
	n, ok := v.(json.Number)
	if !ok {
		return math.NaN()
	}
	f, err := n.Float64()
	if err != nil {
		return math.NaN()
	}
	return f
}

// checkFirst compares h5py's float.hex values with the first of want.
func checkFirst(t *testing.T, path string, got []string, want []float64) {
	t.Helper()
	for i, h := range got {
		v, err := strconv.ParseFloat(h, 64)
		if err != nil || math.Float64bits(v) != math.Float64bits(want[i]) {
			t.Errorf("h5py %s[%d] = %s, want %v", path, i, h, want[i])
		}
	}
}

func TestH5pyReadsFields(t *testing.T) {
	for _, tc := range []struct {
		name     string
		compress int
	}{{"uncompressed", 0}, {"deflate 9", 9}} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTestRun(t, t.TempDir(), tc.compress, 2)
			r := runH5py(t, path)
			want := expectedDatasets(2)
			if n := len(want) + len(addedDatasets(2)); len(r.Datasets) != n {
				t.Errorf("h5py sees %d datasets, want %d", len(r.Datasets), n)
			}
			for _, d := range want {
				got, ok := r.Datasets[d.path]
				if !ok {
					t.Errorf("h5py: no dataset %s", d.path)
					continue
				}
				if fmt.Sprint(got.Shape) != fmt.Sprint(d.shape) {
					t.Errorf("h5py %s: shape %v, want %v", d.path, got.Shape, d.shape)
				}
				if got.SHA256 != digestLE(d.values) {
					t.Errorf("h5py %s: values differ (SHA-256 %s, want %s)", d.path, got.SHA256, digestLE(d.values))
				}
				checkFirst(t, d.path, got.First, d.values)
				if got.Attrs["units"] != d.units || got.Attrs["description"] == "" {
					t.Errorf("h5py %s: attributes %v", d.path, got.Attrs)
				}
				if d.location != "" && got.Attrs["location"] != d.location {
					t.Errorf("h5py %s: location %v, want %s", d.path, got.Attrs["location"], d.location)
				}
				if gzip := got.Compression == "gzip"; len(d.shape) == 2 && gzip != (tc.compress > 0) {
					t.Errorf("h5py %s: compression %q at level %d", d.path, got.Compression, tc.compress)
				}
			}
			m := testMeta(tc.compress)
			root := r.Groups["/"]
			for k, v := range map[string]string{"title": m.Title, "version": m.Version, "case": m.CaseText, "started": "2024-06-11T08:30:00Z", "format": fieldsFormat} {
				if root[k] != v {
					t.Errorf("h5py root attribute %s = %q, want %q", k, root[k], v)
				}
			}
			if fmt.Sprint(root["seed"]) != strconv.FormatUint(m.Seed, 10) {
				t.Errorf("h5py root attribute seed = %v, want %d", root["seed"], m.Seed)
			}
			for s := 0; s < 2; s++ {
				g := r.Groups[fmt.Sprintf("/snapshots/%06d", s)]
				if num(g["time"]) != float64(s+1) || num(g["step"]) != float64(100*(s+1)) || num(g["complete"]) != 1 || g["time_units"] != "s" {
					t.Errorf("h5py snapshot %d attributes %v", s, g)
				}
			}
			if r.Groups["/grid"]["units"] != "m" || num(r.Groups["/grid"]["length"]) != testLx || num(r.Groups["/grid"]["height"]) != testH {
				t.Errorf("h5py /grid attributes %v", r.Groups["/grid"])
			}
		})
	}
}

func TestIndependentReadersReadCheckpoints(t *testing.T) {
	dir := t.TempDir()
	cp := testCheckpoint(5, 42)
	if err := WriteCheckpoint(dir, cp); err != nil {
		t.Fatal(err)
	}
	file := CheckpointPath(dir, 42)
	t.Run("h5dump", func(t *testing.T) {
		h5dump := needTool(t, "h5dump", "hdf5-tools")
		if out, err := exec.Command(h5dump, file).CombinedOutput(); err != nil {
			t.Fatalf("h5dump: %v\n%s", err, out)
		}
		if got := h5dumpValues(t, h5dump, file, "/arrays/u"); !sameBits(got, cp.Arrays["u"]) {
			t.Errorf("h5dump /arrays/u differs")
		}
	})
	t.Run("h5py", func(t *testing.T) {
		r := runH5py(t, file)
		for n, a := range cp.Arrays {
			if got := r.Datasets["/arrays/"+n]; got.SHA256 != digestLE(a) || fmt.Sprint(got.Shape) != fmt.Sprint([]int{len(a)}) {
				t.Errorf("h5py /arrays/%s: shape %v SHA-256 %s", n, got.Shape, got.SHA256)
			}
		}
		p := cp.Complex["pressure"]
		pairs := make([]float64, 0, 2*len(p))
		for _, v := range p {
			pairs = append(pairs, real(v), imag(v))
		}
		if got := r.Datasets["/complex/pressure"]; got.SHA256 != digestLE(pairs) || fmt.Sprint(got.Shape) != fmt.Sprint([]int{len(p), 2}) {
			t.Errorf("h5py /complex/pressure: shape %v, values differ", got.Shape)
		}
		checkFirst(t, "/scalars/time", r.Datasets["/scalars/time"].First, []float64{cp.Time})
		sum := checksum(cp)
		if r.Groups["/"][checksumAttr] != fmt.Sprintf("%x", sum) {
			t.Errorf("h5py checksum attribute %v", r.Groups["/"][checksumAttr])
		}
		if r.Datasets["/scalars/gradient"].Attrs["units"] != "m/s^2" {
			t.Errorf("h5py gradient units %v", r.Datasets["/scalars/gradient"].Attrs)
		}
	})
}

// h5dumpReadable runs h5dump over the whole file, the strictest of the
// independent readers.
func h5dumpReadable(t *testing.T, file string) {
	t.Helper()
	h5dump := needTool(t, "h5dump", "hdf5-tools")
	out, err := exec.Command(h5dump, "-H", file).CombinedOutput()
	if err != nil || bytes.Contains(out, []byte("error")) {
		t.Fatalf("h5dump cannot read %s: %v\n%s", filepath.Base(file), err, out)
	}
	if out, err := exec.Command(h5dump, file).CombinedOutput(); err != nil {
		t.Fatalf("h5dump cannot read the data of %s: %v\n%s", filepath.Base(file), err, out)
	}
}
