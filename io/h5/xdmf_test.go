package h5

import (
	"bytes"
	"encoding/xml"
	"fmt"
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
	time  float64
	mesh  string
	attrs []string
}

// checkSidecar decodes the sidecar at xmf, checks its structure and that
// every HDF5 reference is relative, exists and has the stated extent, and
// returns the meshes it describes.
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
	series := doms[0].children("Grid")[0]
	if series.attr("GridType") != "Collection" || series.attr("CollectionType") != "Temporal" {
		t.Fatalf("top grid %v, want a temporal collection", series.Attrs)
	}
	var out []sidecarGrid
	for _, step := range series.children("Grid") {
		times := step.children("Time")
		if len(times) != 1 {
			t.Fatalf("grid %q has %d Time elements", step.attr("Name"), len(times))
		}
		tv, err := strconv.ParseFloat(times[0].attr("Value"), 64)
		if err != nil {
			t.Fatal(err)
		}
		if step.attr("GridType") != "Collection" || step.attr("CollectionType") != "Spatial" {
			t.Fatalf("time step %v, want a spatial collection", step.Attrs)
		}
		for _, g := range step.children("Grid") {
			topo := g.children("Topology")
			geo := g.children("Geometry")
			if g.attr("GridType") != "Uniform" || len(topo) != 1 || len(geo) != 1 {
				t.Fatalf("mesh %q: want a uniform grid with a topology and a geometry", g.attr("Name"))
			}
			dims := topo[0].attr("Dimensions")
			if topo[0].attr("TopologyType") != "2DRectMesh" || geo[0].attr("GeometryType") != "VXVY" {
				t.Fatalf("mesh %q: topology %v geometry %v", g.attr("Name"), topo[0].Attrs, geo[0].Attrs)
			}
			var nz, nx int
			if _, err := fmt.Sscanf(dims, "%d %d", &nz, &nx); err != nil {
				t.Fatalf("topology dimensions %q: %v", dims, err)
			}
			coords := geo[0].children("DataItem")
			if len(coords) != 2 || coords[0].attr("Dimensions") != strconv.Itoa(nx) || coords[1].attr("Dimensions") != strconv.Itoa(nz) {
				t.Fatalf("mesh %q: geometry items %v, want x (%d) then z (%d)", g.attr("Name"), coords, nx, nz)
			}
			sg := sidecarGrid{time: tv, mesh: g.attr("Name")}
			for _, a := range g.children("Attribute") {
				items := a.children("DataItem")
				if a.attr("Center") != "Node" || a.attr("AttributeType") != "Scalar" || len(items) != 1 {
					t.Fatalf("attribute %q: %v", a.attr("Name"), a.Attrs)
				}
				if items[0].attr("Dimensions") != dims {
					t.Errorf("attribute %q of dimensions %q on a %q mesh", a.attr("Name"), items[0].attr("Dimensions"), dims)
				}
				sg.attrs = append(sg.attrs, a.attr("Name"))
			}
			out = append(out, sg)
		}
	}
	// Every reference, wherever it sits.
	var refs []xnode
	var walk func(n xnode)
	walk = func(n xnode) {
		if n.XMLName.Local == "DataItem" {
			refs = append(refs, n)
		}
		for _, c := range n.Nodes {
			walk(c)
		}
	}
	walk(root)
	defer enter()()
	open := map[string]*file{}
	defer func() {
		for _, f := range open {
			f.close()
		}
	}()
	for _, r := range refs {
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
			t.Errorf("reference %q: no such dataset", r.Text)
			continue
		}
		d, err := f.dims(path)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Trim(fmt.Sprint(d), "[]"); got != r.attr("Dimensions") {
			t.Errorf("reference %q: dataset of extent %s, sidecar says %s", r.Text, got, r.attr("Dimensions"))
		}
	}
	return out
}

// sidecarTimes checks the sidecar and returns its times.
func sidecarTimes(t *testing.T, xmf string) []float64 {
	t.Helper()
	var times []float64
	for _, g := range checkSidecar(t, xmf) {
		if len(times) == 0 || times[len(times)-1] != g.time {
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
		"1 centre p,u,canopy/frontal_area", "1 face w",
		"2 centre p,u,canopy/frontal_area", "2 face w",
		"3 centre p,u,canopy/frontal_area", "3 face w",
	}
	if !slices.Equal(got, want) {
		t.Errorf("sidecar meshes\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
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
	if err := WriteXDMF(filepath.Join(filepath.Dir(path), "missing.h5")); err == nil || !strings.Contains(err.Error(), "missing.h5") {
		t.Errorf("WriteXDMF of a missing file: error %v", err)
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
		{"both", func() []Field { return testFields(0) }, []string{"centre p,u,canopy/frontal_area", "face w"}},
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
