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

// xdmfDocument builds the sidecar text. Layout: a temporal collection with
// one spatial collection per snapshot (carrying its Time), which holds a
// uniform grid "centre" on the (x, z_centre) mesh and, when there are face
// fields, a uniform grid "face" on the (x, z_face) mesh. Each field is a
// node-centred scalar on its mesh; static datasets of the mesh's shape
// are repeated in every time step. Dimensions run slowest first: z, x.
func xdmfDocument(h5name string, cat *catalog, title string) ([]byte, error) {
	if strings.ContainsAny(h5name, ":/\\") {
		return nil, fmt.Errorf("the file name %q holds ':' or a slash, which XDMF references cannot carry; rename it", h5name)
	}
	doc := xdmfDoc{Version: "3.0", Domain: xdmfDomain{
		Name: "rollerbed",
		Grid: xdmfGrid{Name: "snapshots", GridType: "Collection", CollectionType: "Temporal"},
	}}
	if title != "" {
		doc.Domain.Info = append(doc.Domain.Info, xdmfInfo{Name: "title", Value: title})
	}
	if cat.grid != nil {
		for _, s := range cat.snaps {
			doc.Domain.Grid.Grids = append(doc.Domain.Grid.Grids, snapshotGrid(h5name, cat, s))
		}
	}
	out, err := xml.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, err
	}
	return append([]byte(xml.Header+string(out)), '\n'), nil
}

func snapshotGrid(h5name string, cat *catalog, s SnapshotInfo) xdmfGrid {
	sg := xdmfGrid{
		Name:           fmt.Sprintf("snapshot %06d", s.Index),
		GridType:       "Collection",
		CollectionType: "Spatial",
		Time:           &xdmfTime{Value: strconv.FormatFloat(s.Time, 'g', -1, 64)},
	}
	for _, loc := range []struct {
		name, zpath string
		nz          int
	}{
		{LocationCentre, gridZc, cat.grid.nzc},
		{LocationFace, gridZf, cat.grid.nzf},
	} {
		var attrs []xdmfAttribute
		for _, fd := range s.Fields {
			if fd.Location == loc.name && fd.Rows == loc.nz && fd.Cols == cat.grid.nx {
				attrs = append(attrs, xdmfScalar(h5name, fd.Name, s.Group+"/"+fd.Name, fd))
			}
		}
		if len(attrs) == 0 {
			continue // no mesh without fields on it
		}
		for _, st := range cat.statics {
			if st.Location == loc.name && st.Rows == loc.nz && st.Cols == cat.grid.nx {
				attrs = append(attrs, xdmfScalar(h5name, strings.TrimPrefix(st.Name, "/"), st.Name, st))
			}
		}
		sg.Grids = append(sg.Grids, xdmfGrid{
			Name:     loc.name,
			GridType: "Uniform",
			Topology: &xdmfTopology{TopologyType: "2DRectMesh", Dimensions: fmt.Sprintf("%d %d", loc.nz, cat.grid.nx)},
			Geometry: &xdmfGeometry{GeometryType: "VXVY", Items: []xdmfItem{
				xdmfRef(h5name, gridX, strconv.Itoa(cat.grid.nx)),
				xdmfRef(h5name, loc.zpath, strconv.Itoa(loc.nz)),
			}},
			Attributes: attrs,
		})
	}
	return sg
}

func xdmfScalar(h5name, name, path string, fd FieldInfo) xdmfAttribute {
	a := xdmfAttribute{
		Name:          name,
		AttributeType: "Scalar",
		Center:        "Node",
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
