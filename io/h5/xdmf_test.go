package h5

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// xnode is any XML element, for checking the sidecar without this
// package's own types.
type xnode struct {
	XMLName xml.Name
	Attrs   []xml.Attr `xml:",any,attr"`
	Text    string     `xml:",chardata"`
	Nodes   []xnode    `xml:",any"`
}

func (n xnode) attr(name string) string {
	for _, a := range n.Attrs {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}

func (n xnode) children(name string) []xnode {
	var out []xnode
	for _, c := range n.Nodes {
		if c.XMLName.Local == name {
			out = append(out, c)
		}
	}
	return out
}

// sidecarGrid is what checkSidecar found for one mesh of one time.
type sidecarGrid struct {
	time    float64
	mesh    string
	attrs   []string  // in order; vectors as NAME(vector)
	x, y, z []float64 // y only on a slab's mesh
	centred string    // XDMF centring of the values
}

// checkSidecar decodes the sidecar at xmf and checks its structure: one
// spatial collection of temporal collections, each of uniform grids that
// bear the collection's name at every time, 2-D rectilinear meshes whose
// values match their centring (cell values one fewer than the nodes each
// way), and every HDF5 reference relative, existing and of the stated
// extent. It returns the meshes it describes, collection by collection.
func checkSidecar(t *testing.T, xmf string) []sidecarGrid {
	t.Helper()
	b, err := os.ReadFile(xmf)
	if err != nil {
		t.Fatal(err)
	}
	var root xnode
	if err := xml.NewDecoder(bytes.NewReader(b)).Decode(&root); err != nil {
		t.Fatalf("%s is not well-formed XML: %v", xmf, err)
	}
	if root.XMLName.Local != "Xdmf" || root.attr("Version") != "3.0" {
		t.Fatalf("root element %s version %q, want Xdmf 3.0", root.XMLName.Local, root.attr("Version"))
	}
	doms := root.children("Domain")
	if len(doms) != 1 || len(doms[0].children("Grid")) != 1 {
		t.Fatal("want one Domain holding one Grid")
	}
	top := doms[0].children("Grid")[0]
	if top.attr("GridType") != "Collection" || top.attr("CollectionType") != "Spatial" {
		t.Fatalf("top grid %v, want a spatial collection", top.Attrs)
	}
	defer enter()()
	open := map[string]*file{}
	defer func() {
		for _, f := range open {
			f.close()
		}
	}()
	// read checks a reference and returns its values and extent.
	read := func(r xnode) ([]float64, string) {
		if r.attr("Format") != "HDF" || r.attr("NumberType") != "Float" || r.attr("Precision") != "8" {
			t.Errorf("data item %v", r.Attrs)
		}
		name, path, ok := strings.Cut(strings.TrimSpace(r.Text), ":")
		if !ok || name == "" || filepath.IsAbs(name) || strings.ContainsAny(name, `/\`) || !strings.HasPrefix(path, "/") {
			t.Fatalf("reference %q: want FILE:/PATH with FILE a name in the sidecar's folder", r.Text)
		}
		f := open[name]
		if f == nil {
			var err error
			if f, err = openFile(filepath.Join(filepath.Dir(xmf), name), false); err != nil {
				t.Fatalf("reference %q: %v", r.Text, err)
			}
			open[name] = f
		}
		if !f.exists(path) {
			t.Fatalf("reference %q: no such dataset", r.Text)
		}
		d, err := f.dims(path)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Trim(fmt.Sprint(d), "[]"); got != r.attr("Dimensions") {
			t.Errorf("reference %q: dataset of extent %s, sidecar says %s", r.Text, got, r.attr("Dimensions"))
		}
		if len(d) != 1 {
			return nil, r.attr("Dimensions")
		}
		v, err := f.readF64(path, d[0])
		if err != nil {
			t.Fatal(err)
		}
		return v, r.attr("Dimensions")
	}
	var out []sidecarGrid
	for _, series := range top.children("Grid") {
		name := series.attr("Name")
		if series.attr("GridType") != "Collection" || series.attr("CollectionType") != "Temporal" {
			t.Fatalf("collection %q %v, want a temporal collection", name, series.Attrs)
		}
		for _, g := range series.children("Grid") {
			if g.attr("Name") != name {
				t.Errorf("a grid of collection %q is named %q: names must stay the same at every time", name, g.attr("Name"))
			}
			times := g.children("Time")
			topo := g.children("Topology")
			geo := g.children("Geometry")
			if g.attr("GridType") != "Uniform" || len(times) != 1 || len(topo) != 1 || len(geo) != 1 {
				t.Fatalf("mesh %q: want a uniform grid with a time, a topology and a geometry", name)
			}
			tv, err := strconv.ParseFloat(times[0].attr("Value"), 64)
			if err != nil {
				t.Fatal(err)
			}
			// A slab's volumes lie on a 3DRectMesh (nodes z, y, x; geometry
			// x, y, z); the slice's fields on a 2DRectMesh (nodes z, x;
			// geometry x, z).
			var nz, ny, nx int
			sg := sidecarGrid{time: tv, mesh: name}
			switch tt, gt := topo[0].attr("TopologyType"), geo[0].attr("GeometryType"); {
			case tt == "2DRectMesh" && gt == "VXVY":
				if _, err := fmt.Sscanf(topo[0].attr("Dimensions"), "%d %d", &nz, &nx); err != nil {
					t.Fatalf("topology dimensions %q: %v", topo[0].attr("Dimensions"), err)
				}
				coords := geo[0].children("DataItem")
				if len(coords) != 2 {
					t.Fatalf("mesh %q: %d geometry items, want x then z", name, len(coords))
				}
				var dx, dz string
				sg.x, dx = read(coords[0])
				sg.z, dz = read(coords[1])
				if dx != strconv.Itoa(nx) || dz != strconv.Itoa(nz) {
					t.Fatalf("mesh %q: geometry of %s × %s nodes, topology %d × %d", name, dz, dx, nz, nx)
				}
			case tt == "3DRectMesh" && gt == "VXVYVZ":
				if _, err := fmt.Sscanf(topo[0].attr("Dimensions"), "%d %d %d", &nz, &ny, &nx); err != nil {
					t.Fatalf("topology dimensions %q: %v", topo[0].attr("Dimensions"), err)
				}
				coords := geo[0].children("DataItem")
				if len(coords) != 3 {
					t.Fatalf("mesh %q: %d geometry items, want x, y then z", name, len(coords))
				}
				var dx, dy, dz string
				sg.x, dx = read(coords[0])
				sg.y, dy = read(coords[1])
				sg.z, dz = read(coords[2])
				if dx != strconv.Itoa(nx) || dy != strconv.Itoa(ny) || dz != strconv.Itoa(nz) {
					t.Fatalf("mesh %q: geometry of %s × %s × %s nodes, topology %d × %d × %d", name, dz, dy, dx, nz, ny, nx)
				}
			default:
				t.Fatalf("mesh %q: topology %v geometry %v", name, topo[0].Attrs, geo[0].Attrs)
			}
			// extent gives the dimensions of values on the mesh: one per
			// node, or one per cell (one fewer each way).
			extent := func(cell bool) string {
				d := 0
				if cell {
					d = 1
				}
				if ny > 0 {
					return fmt.Sprintf("%d %d %d", nz-d, ny-d, nx-d)
				}
				return fmt.Sprintf("%d %d", nz-d, nx-d)
			}
			for _, a := range g.children("Attribute") {
				items := a.children("DataItem")
				if len(items) != 1 {
					t.Fatalf("attribute %q: %d data items", a.attr("Name"), len(items))
				}
				c := a.attr("Center")
				if sg.centred == "" {
					sg.centred = c
				}
				want := extent(c == "Cell")
				switch {
				case c != sg.centred || c != "Cell" && c != "Node":
					t.Errorf("attribute %q centred %q on a mesh of %q values", a.attr("Name"), c, sg.centred)
				case a.attr("AttributeType") == "Vector":
					want += " 3"
					sg.attrs = append(sg.attrs, a.attr("Name")+"(vector)")
				case a.attr("AttributeType") == "Scalar":
					sg.attrs = append(sg.attrs, a.attr("Name"))
				default:
					t.Errorf("attribute %q of type %q", a.attr("Name"), a.attr("AttributeType"))
				}
				if _, dims := read(items[0]); dims != want {
					t.Errorf("attribute %q of dimensions %q on a %d × %d-node mesh of %s values, want %q", a.attr("Name"), dims, nz, nx, c, want)
				}
			}
			out = append(out, sg)
		}
	}
	return out
}

// sidecarTimes checks the sidecar and returns its times, each once, in
// the order they first appear.
func sidecarTimes(t *testing.T, xmf string) []float64 {
	t.Helper()
	var times []float64
	for _, g := range checkSidecar(t, xmf) {
		if !slices.Contains(times, g.time) {
			times = append(times, g.time)
		}
	}
	return times
}

func TestSidecar(t *testing.T) {
	dir := t.TempDir()
	path := writeTestRun(t, dir, 0, 3)
	if SidecarPath(path) != filepath.Join(dir, "fields.xmf") {
		t.Fatalf("sidecar path %s", SidecarPath(path))
	}
	grids := checkSidecar(t, SidecarPath(path))
	var got []string
	for _, g := range grids {
		got = append(got, fmt.Sprintf("%g %s %s", g.time, g.mesh, strings.Join(g.attrs, ",")))
	}
	want := []string{
		"1 centre p,u,velocity(vector),canopy/frontal_area",
		"2 centre p,u,velocity(vector),canopy/frontal_area",
		"3 centre p,u,velocity(vector),canopy/frontal_area",
		"1 face w", "2 face w", "3 face w",
	}
	if !slices.Equal(got, want) {
		t.Errorf("sidecar meshes\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	// Cell-centred values on meshes of whole cells that tile one period
	// and the whole depth, [−Δx/2, Lx − Δx/2] × [0, H], with every point
	// inside its cell.
	g := testGrid()
	dx := testLx / testNx
	for _, sg := range grids {
		pts := g.Zc
		if sg.mesh == LocationFace {
			pts = g.Zf
		}
		nx, nz := len(sg.x), len(sg.z)
		if sg.centred != "Cell" || nx != testNx+1 || nz != len(pts)+1 {
			t.Errorf("mesh %s at %g: %d × %d nodes of %s values, want cells around %d × %d points", sg.mesh, sg.time, nz, nx, sg.centred, len(pts), testNx)
			continue
		}
		if math.Abs(sg.x[0]+dx/2) > 1e-15 || math.Abs(sg.x[nx-1]-(testLx-dx/2)) > 1e-15 || sg.z[0] != 0 || sg.z[nz-1] != testH {
			t.Errorf("mesh %s covers [%g, %g] × [%g, %g], want [%g, %g] × [0, %g]", sg.mesh, sg.x[0], sg.x[nx-1], sg.z[0], sg.z[nz-1], -dx/2, testLx-dx/2, testH)
		}
		for i, x := range g.X {
			if !(sg.x[i] < x && x < sg.x[i+1]) {
				t.Errorf("mesh %s: x = %g outside its cell [%g, %g]", sg.mesh, x, sg.x[i], sg.x[i+1])
			}
		}
		for k, z := range pts {
			if !(sg.z[k] <= z && z <= sg.z[k+1] && sg.z[k] < sg.z[k+1]) {
				t.Errorf("mesh %s: z = %g outside its cell [%g, %g]", sg.mesh, z, sg.z[k], sg.z[k+1])
			}
		}
	}
	b, _ := os.ReadFile(SidecarPath(path))
	if bytes.Contains(b, []byte(dir)) {
		t.Error("the sidecar holds an absolute path")
	}
}

func TestSidecarSurvivesMove(t *testing.T) {
	base := t.TempDir()
	run := filepath.Join(base, "run")
	if err := os.Mkdir(run, 0o755); err != nil {
		t.Fatal(err)
	}
	writeTestRun(t, run, 0, 2)
	moved := filepath.Join(base, "elsewhere", "moved-run")
	if err := os.MkdirAll(filepath.Dir(moved), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Rename(run, moved); err != nil {
		t.Fatal(err)
	}
	if got := sidecarTimes(t, filepath.Join(moved, "fields.xmf")); !equalFloats(got, []float64{1, 2}) {
		t.Errorf("moved sidecar times %v", got)
	}
}

func TestWriteXDMFRegenerates(t *testing.T) {
	path := writeTestRun(t, t.TempDir(), 3, 4)
	sameSidecarRebuilt(t, path)
	if err := WriteXDMF(filepath.Join(filepath.Dir(path), "missing.h5")); err == nil || !strings.Contains(err.Error(), "missing.h5") {
		t.Errorf("WriteXDMF of a missing file: error %v", err)
	}
}

// sameSidecarRebuilt checks that the sidecar of the fields file at path,
// removed and written again from the file alone, is the same text.
func sameSidecarRebuilt(t *testing.T, path string) {
	t.Helper()
	written, err := os.ReadFile(SidecarPath(path))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.Remove(SidecarPath(path)); err != nil {
		t.Fatal(err)
	}
	if err := WriteXDMF(path); err != nil {
		t.Fatal(err)
	}
	again, err := os.ReadFile(SidecarPath(path))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(written, again) {
		t.Errorf("the sidecar rebuilt from the file differs from the one written as the run went:\n%s\n---\n%s", written, again)
	}
}

func TestSidecarMeshes(t *testing.T) {
	for _, tc := range []struct {
		name   string
		fields func() []Field
		want   []string
	}{
		{"centre only", func() []Field { return testFields(0)[:1] }, []string{"centre u,canopy/frontal_area"}},
		{"face only", func() []Field { return testFields(0)[1:2] }, []string{"face w"}},
		{"both", func() []Field { return testFields(0) }, []string{"centre p,u,velocity(vector),canopy/frontal_area", "face w"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "fields.h5")
			fl := startTestRun(t, path, 0)
			if err := fl.WriteSnapshot(0.25, 3, tc.fields()); err != nil {
				t.Fatal(err)
			}
			if err := fl.Close(); err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, g := range checkSidecar(t, SidecarPath(path)) {
				got = append(got, g.mesh+" "+strings.Join(g.attrs, ","))
			}
			if !slices.Equal(got, tc.want) {
				t.Errorf("meshes %v, want %v", got, tc.want)
			}
		})
	}
}
