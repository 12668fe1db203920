package h5

import (
	"encoding/xml"
	"fmt"
	"path/filepath"
	"rollerbed/io/runfolder"
	"strconv"
	"strings"
)

// The XDMF 3 sidecar. Element and attribute names below are those of the
// XDMF format (xdmf.org); Name values are ours.

type xdmfDoc struct {
	XMLName xml.Name   `xml:"Xdmf"`
	Version string     `xml:"Version,attr"`
	Domain  xdmfDomain `xml:"Domain"`
}

type xdmfDomain struct {
	Name string     `xml:"Name,attr"`
	Info []xdmfInfo `xml:"Information"`
	Grid xdmfGrid   `xml:"Grid"`
}

type xdmfInfo struct {
	Name  string `xml:"Name,attr"`
	Value string `xml:"Value,attr"`
}

type xdmfGrid struct {
	Name           string          `xml:"Name,attr"`
	GridType       string          `xml:"GridType,attr"`
	CollectionType string          `xml:"CollectionType,attr,omitempty"`
	Time           *xdmfTime       `xml:"Time"`
	Topology       *xdmfTopology   `xml:"Topology"`
	Geometry       *xdmfGeometry   `xml:"Geometry"`
	Attributes     []xdmfAttribute `xml:"Attribute"`
	Grids          []xdmfGrid      `xml:"Grid"`
}

type xdmfTime struct {
	Value string `xml:"Value,attr"`
}

type xdmfTopology struct {
	TopologyType string `xml:"TopologyType,attr"`
	Dimensions   string `xml:"Dimensions,attr"`
}

type xdmfGeometry struct {
	GeometryType string     `xml:"GeometryType,attr"`
	Items        []xdmfItem `xml:"DataItem"`
}

type xdmfAttribute struct {
	Name          string     `xml:"Name,attr"`
	AttributeType string     `xml:"AttributeType,attr"`
	Center        string     `xml:"Center,attr"`
	Info          []xdmfInfo `xml:"Information"`
	Item          xdmfItem   `xml:"DataItem"`
}

type xdmfItem struct {
	Dimensions string `xml:"Dimensions,attr"`
	NumberType string `xml:"NumberType,attr"`
	Precision  string `xml:"Precision,attr"`
	Format     string `xml:"Format,attr"`
	Path       string `xml:",chardata"`
}

// SidecarPath returns the path of the XDMF sidecar of the fields file
// h5path: the same folder and name with the extension .xmf.
func SidecarPath(h5path string) string {
	return strings.TrimSuffix(h5path, filepath.Ext(h5path)) + ".xmf"
}

// WriteXDMF regenerates the XDMF sidecar of the fields file h5path from
// what the file holds (its complete snapshots); it is written by Fields
// as the run goes, and this serves after a resume or to repair one.
func WriteXDMF(h5path string) error {
	cat, meta, err := readCatalogAt(h5path)
	if err != nil {
		return err
	}
	return writeSidecar(h5path, &cat, meta.Title)
}

// writeSidecar writes the sidecar of h5path for cat, atomically.
func writeSidecar(h5path string, cat *catalog, title string) error {
	doc, err := xdmfDocument(filepath.Base(h5path), cat, title)
	if err != nil {
		return fmt.Errorf("h5: XDMF sidecar for %s: %v", h5path, err)
	}
	side := SidecarPath(h5path)
	if err := runfolder.WriteFileAtomic(side, doc); err != nil {
		return fmt.Errorf("h5: cannot write the XDMF sidecar %s: %v; the fields file is intact, and h5.WriteXDMF (or resuming) writes the sidecar again", side, err)
	}
	return nil
}

// xdmfDocument builds the sidecar text. Layout: a spatial collection
// "fields" of two temporal collections, "centre" and "face", one uniform
// grid of the same name per snapshot (carrying its Time), so that a mesh
// keeps its name at every time. Each field is a scalar on its mesh, and
// the velocity vector (u, w at the centres, 0) a vector on the centre
// mesh; static datasets of the mesh's shape are repeated in every time
// step. The meshes are made of whole cells, one per value, that tile the
// period in x and the depth in z: the centre mesh's nodes are the x cell
// edges and the faces, the face mesh's the x cell edges and the edges
// around the faces (see cellEdges). A file of format version 1 has no
// cell edges; its meshes are the points themselves, with node-centred
// values. Dimensions run slowest first: z, x.
func xdmfDocument(h5name string, cat *catalog, title string) ([]byte, error) {
	if strings.ContainsAny(h5name, ":/\\") {
		return nil, fmt.Errorf("the file name %q holds ':' or a slash, which XDMF references cannot carry; rename it", h5name)
	}
	doc := xdmfDoc{Version: "3.0", Domain: xdmfDomain{
		Name: "rollerbed",
		Grid: xdmfGrid{Name: "fields", GridType: "Collection", CollectionType: "Spatial"},
	}}
	if title != "" {
		doc.Domain.Info = append(doc.Domain.Info, xdmfInfo{Name: "title", Value: title})
	}
	if cat.grid != nil {
		for _, m := range xdmfMeshes(cat) {
			series := xdmfGrid{Name: m.name, GridType: "Collection", CollectionType: "Temporal"}
			for _, s := range cat.snaps {
				if g, ok := snapshotGrid(h5name, cat, m, s); ok {
					series.Grids = append(series.Grids, g)
				}
			}
			if len(series.Grids) > 0 {
				doc.Domain.Grid.Grids = append(doc.Domain.Grid.Grids, series)
			}
		}
		series := xdmfGrid{Name: slabName, GridType: "Collection", CollectionType: "Temporal"}
		for _, s := range cat.snaps {
			if g, ok := slabGrid(h5name, cat, s); ok {
				series.Grids = append(series.Grids, g)
			}
		}
		if len(series.Grids) > 0 {
			doc.Domain.Grid.Grids = append(doc.Domain.Grid.Grids, series)
		}
	}
	out, err := xml.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, err
	}
	return append([]byte(xml.Header+string(out)), '\n'), nil
}

// xdmfMesh is one of the two meshes of the sidecar.
type xdmfMesh struct {
	name         string // the location its values have
	nz           int    // rows of its values
	xPath, zPath string // node coordinates
	nodesX       int
	nodesZ       int
	center       string // XDMF centring of its values
}

func xdmfMeshes(cat *catalog) []xdmfMesh {
	g := cat.grid
	if !cat.edges {
		return []xdmfMesh{
			{LocationCentre, g.nzc, gridX, gridZc, g.nx, g.nzc, "Node"},
			{LocationFace, g.nzf, gridX, gridZf, g.nx, g.nzf, "Node"},
		}
	}
	return []xdmfMesh{
		{LocationCentre, g.nzc, gridXEdges, gridZf, g.nx + 1, g.nzf, "Cell"},
		{LocationFace, g.nzf, gridXEdges, gridZfEdges, g.nx + 1, g.nzf + 1, "Cell"},
	}
}

// snapshotGrid is the uniform grid of mesh m at snapshot s; false when
// the snapshot has no field on it.
func snapshotGrid(h5name string, cat *catalog, m xdmfMesh, s SnapshotInfo) (xdmfGrid, bool) {
	var attrs []xdmfAttribute
	for _, fd := range s.Fields {
		if fd.Location == m.name && fd.Rows == m.nz && fd.Cols == cat.grid.nx {
			attrs = append(attrs, xdmfScalar(h5name, fd.Name, s.Group+"/"+fd.Name, fd, m.center))
		}
	}
	if len(attrs) == 0 {
		return xdmfGrid{}, false
	}
	if s.vector && m.name == LocationCentre && cat.edges {
		attrs = append(attrs, xdmfAttribute{
			Name:          velocityName,
			AttributeType: "Vector",
			Center:        m.center,
			Info:          []xdmfInfo{{Name: "units", Value: "m/s"}},
			Item:          xdmfRef(h5name, s.Group+"/"+velocityName, fmt.Sprintf("%d %d 3", m.nz, cat.grid.nx)),
		})
	}
	for _, st := range cat.statics {
		if st.Location == m.name && st.Rows == m.nz && st.Cols == cat.grid.nx {
			attrs = append(attrs, xdmfScalar(h5name, strings.TrimPrefix(st.Name, "/"), st.Name, st, m.center))
		}
	}
	return xdmfGrid{
		Name:     m.name,
		GridType: "Uniform",
		Time:     &xdmfTime{Value: strconv.FormatFloat(s.Time, 'g', -1, 64)},
		Topology: &xdmfTopology{TopologyType: "2DRectMesh", Dimensions: fmt.Sprintf("%d %d", m.nodesZ, m.nodesX)},
		Geometry: &xdmfGeometry{GeometryType: "VXVY", Items: []xdmfItem{
			xdmfRef(h5name, m.xPath, strconv.Itoa(m.nodesX)),
			xdmfRef(h5name, m.zPath, strconv.Itoa(m.nodesZ)),
		}},
		Attributes: attrs,
	}, true
}

func xdmfScalar(h5name, name, path string, fd FieldInfo, center string) xdmfAttribute {
	a := xdmfAttribute{
		Name:          name,
		AttributeType: "Scalar",
		Center:        center,
		Item:          xdmfRef(h5name, path, fmt.Sprintf("%d %d", fd.Rows, fd.Cols)),
	}
	if fd.Units != "" {
		a.Info = append(a.Info, xdmfInfo{Name: "units", Value: fd.Units})
	}
	return a
}

// xdmfRef refers to dataset path of the HDF5 file by the file's name
// alone, so that the reference holds wherever the run folder goes.
func xdmfRef(h5name, path, dims string) xdmfItem {
	return xdmfItem{Dimensions: dims, NumberType: "Float", Precision: "8", Format: "HDF", Path: h5name + ":" + path}
}
