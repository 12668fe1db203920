package h5

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
)

// A slab (the three-dimensional mode, periodic across the span y) keeps
// the slice's layout for its span-averaged x–z fields, so that every
// reader of a slice's file reads a slab's file unchanged, and adds:
//
//   - /grid/y (m, the Ny spanwise positions j·Ly/Ny), /grid/y_edges (the
//     Ny+1 edges of the cells around them), the attribute width (Ly, m) of
//     /grid, and the root dimension scale /y;
//   - per snapshot the group slab/ of three-dimensional datasets, extent
//     (z_centre, y, x), all at the cell centres (the vertical velocity
//     interpolated there from the faces as for the velocity vector), with
//     the velocity (u, v, w) as one dataset velocity of extent (z_centre,
//     y, x, component) when u, v and w are among them;
//   - in the sidecar a third temporal collection "slab" of 3DRectMesh
//     grids whose cells are the solver's cells, so a general viewer shows
//     the volume, and the velocity as one vector for glyphs and
//     streamlines.

// Layout of a slab's additions.
const (
	gridY      = "/grid/y"
	gridYEdges = "/grid/y_edges"
	scaleY     = "y"    // spanwise positions (m), /grid/y
	slabName   = "slab" // per snapshot: the group of 3-D datasets; the sidecar's third mesh

	slabVelocityDesc = "velocity at the cell centres: u, v as they are, w interpolated linearly in z from the faces"
)

// Volume is one three-dimensional field of a slab at the cell centres:
// Data holds Nz planes of Ny·Nx values, value (k, j, i) (z, y, x) at
// Data[(k·Ny + j)·Nx + i].
type Volume struct {
	Name        string // dataset name, as for Field
	Units       string // SI units
	Description string
	// Source names the published definition of a derived field (for
	// example the vortex-core criterion), stored as the attribute source;
	// "" for none.
	Source string
	Data   []float64
}

// Slab reports whether the grid is a slab's (Ny > 1 spanwise positions).
func (g *GridInfo) Slab() bool { return len(g.Y) > 1 }

// checkSlabGrid checks a slab's spanwise coordinates; nil for a slice.
func checkSlabGrid(g *GridInfo) error {
	if len(g.Y) == 0 && g.Ly == 0 {
		return nil
	}
	if len(g.Y) < 2 || !(g.Ly > 0) || math.IsInf(g.Ly, 0) {
		return fmt.Errorf("spanwise positions: %d on a width Ly = %g m: a slab needs at least 2 positions and a finite width > 0 (a slice neither)", len(g.Y), g.Ly)
	}
	for j, v := range g.Y {
		if math.IsNaN(v) || math.IsInf(v, 0) || j > 0 && !(v > g.Y[j-1]) {
			return fmt.Errorf("spanwise position Y[%d] = %g m: coordinates must be finite and increase", j, v)
		}
	}
	return nil
}

// yEdges returns the ny+1 edges y_j − Δy/2 of the cells around the
// spanwise positions, the last one period after the first.
func yEdges(g *GridInfo) []float64 {
	ny := len(g.Y)
	dy := g.Ly / float64(ny)
	e := make([]float64, ny+1)
	for j, v := range g.Y {
		e[j] = v - dy/2
	}
	e[ny] = g.Y[0] + g.Ly - dy/2
	return e
}

// writeSlabGrid writes a slab's spanwise coordinates (nothing for a slice).
func writeSlabGrid(f *file, g *GridInfo) error {
	if !g.Slab() {
		return nil
	}
	if err := f.setFloat(gridGroup, "width", g.Ly); err != nil {
		return err
	}
	if err := f.writeF64(gridY, g.Y, []int{len(g.Y)}, 0); err != nil {
		return err
	}
	for _, a := range [][2]string{{"units", "m"}, {"description", "spanwise positions of the samples (y is periodic with period width)"}} {
		if err := f.setString(gridY, a[0], a[1]); err != nil {
			return err
		}
	}
	if err := f.attach(gridY, "/"+scaleY, 0, true); err != nil {
		return err
	}
	return writeCoordinate(f, gridYEdges, coordinate{"y_edges", yEdges(g), "m", "edges of the cells around the y positions: y - width/(2 ny), the last one period after the first", "Y"})
}

// readSlabGrid reads a slab's spanwise coordinates into g, if the file has
// them.
func readSlabGrid(f *file, g *GridInfo) (string, error) {
	if !f.exists(gridY) {
		return "", nil
	}
	d, err := f.dims(gridY)
	if err == nil && len(d) != 1 {
		err = fmt.Errorf("%d dimensions, want a 1-D dataset", len(d))
	}
	if err != nil {
		return gridY, err
	}
	if g.Y, err = f.readF64(gridY, d[0]); err != nil {
		return gridY, err
	}
	g.Ly, err = f.getFloat(gridGroup, "width")
	return gridGroup, err
}

// WriteSlabSnapshot is WriteSnapshot for a slab: fields are the x–z
// fields (the span averages, under the names a slice uses) and volumes
// the three-dimensional fields at the cell centres, written to the
// snapshot's group slab/ with attributes units, description, location
// and source. When u, v and w are among the volumes the group also holds
// their vector, velocity. The grid must be a slab's.
func (fl *Fields) WriteSlabSnapshot(t float64, step int, fields []Field, volumes []Volume) error {
	g := fl.cat.grid
	if g == nil || g.ny < 2 {
		return fmt.Errorf("h5: slab snapshot at t = %g s for %s: the grid is not a slab's; write one with spanwise positions (GridInfo.Y) first", t, fl.path)
	}
	if len(volumes) == 0 {
		return fmt.Errorf("h5: slab snapshot at t = %g s for %s: no volumes; use WriteSnapshot for x–z fields alone", t, fl.path)
	}
	seen := map[string]bool{}
	n := g.nzc * g.ny * g.nx
	for _, v := range volumes {
		if err := checkName(v.Name); err != nil {
			return fmt.Errorf("h5: slab snapshot at t = %g s for %s: %v", t, fl.path, err)
		}
		switch {
		case seen[v.Name]:
			return fmt.Errorf("h5: slab snapshot at t = %g s for %s: volume %q given twice", t, fl.path, v.Name)
		case v.Name == velocityName || slices.Contains(reservedSnapshotNames, v.Name):
			return fmt.Errorf("h5: slab snapshot at t = %g s for %s: volume name %q is reserved; rename it", t, fl.path, v.Name)
		}
		seen[v.Name] = true
		if err := checkArray(v.Data, 1, n, v.Units, v.Description+v.Source); err != nil {
			return fmt.Errorf("h5: volume %q at t = %g s for %s: %v (want Nz·Ny·Nx = %d·%d·%d at the centres)", v.Name, t, fl.path, err, g.nzc, g.ny, g.nx)
		}
	}
	if err := checkSpace(filepath.Dir(fl.path), int64(8*n*(len(volumes)+3))+int64(len(volumes)+1)*4096, fmt.Sprintf("the volumes of snapshot %d", fl.next)); err != nil {
		return err
	}
	fl.volumes = volumes
	defer func() { fl.volumes = nil }()
	return fl.WriteSnapshot(t, step, fields)
}

// writeVolumes writes the volumes of a slab snapshot to group/slab and
// returns their descriptions and whether the velocity vector was written.
func (fl *Fields) writeVolumes(f *file, group string, volumes []Volume) ([]FieldInfo, bool, error) {
	if len(volumes) == 0 {
		return nil, false, nil
	}
	g, level := fl.cat.grid, fl.meta.Compress
	dir := group + "/" + slabName
	if err := f.createGroup(dir); err != nil {
		return nil, false, err
	}
	dims := []int{g.nzc, g.ny, g.nx}
	attachAll := func(path string, n int) error {
		for d, sc := range []string{scaleZc, scaleY, scaleX, scaleComponent}[:n] {
			if err := f.attach(path, group+"/"+sc, d, true); err != nil {
				return err
			}
		}
		return nil
	}
	var infos []FieldInfo
	byName := map[string][]float64{}
	for _, v := range volumes {
		path := dir + "/" + v.Name
		if err := f.writeF64(path, v.Data, dims, level); err != nil {
			return nil, false, err
		}
		attrs := [][2]string{{"units", v.Units}, {"description", v.Description}, {"long_name", v.Description}, {"location", LocationCentre}}
		if v.Source != "" {
			attrs = append(attrs, [2]string{"source", v.Source})
		}
		for _, a := range attrs {
			if a[1] == "" {
				continue
			}
			if err := f.setString(path, a[0], a[1]); err != nil {
				return nil, false, err
			}
		}
		if err := attachAll(path, 3); err != nil {
			return nil, false, err
		}
		infos = append(infos, FieldInfo{Name: v.Name, Units: v.Units, Description: v.Description, Location: LocationCentre, Rows: g.nzc, Cols: g.nx})
		byName[v.Name] = v.Data
	}
	slices.SortFunc(infos, func(a, b FieldInfo) int { return strings.Compare(a.Name, b.Name) })
	u, v, w := byName["u"], byName["v"], byName["w"]
	if u == nil || v == nil || w == nil {
		return infos, false, nil
	}
	vec := make([]float64, 3*len(u))
	for n := range u {
		vec[3*n], vec[3*n+1], vec[3*n+2] = u[n], v[n], w[n]
	}
	path := dir + "/" + velocityName
	if err := f.writeF64(path, vec, append(dims, 3), level); err != nil {
		return nil, false, err
	}
	for _, a := range [][2]string{{"units", "m/s"}, {"description", slabVelocityDesc}, {"long_name", slabVelocityDesc}, {"location", LocationCentre}} {
		if err := f.setString(path, a[0], a[1]); err != nil {
			return nil, false, err
		}
	}
	return infos, true, attachAll(path, 4)
}

// readVolumes lists the volumes of a snapshot group's slab/ group.
func readVolumes(f *file, group string) ([]FieldInfo, bool, error) {
	dir := group + "/" + slabName
	names, err := f.children(dir)
	if err != nil {
		return nil, false, err
	}
	var out []FieldInfo
	vector := false
	for _, n := range names {
		p := dir + "/" + n
		d, err := f.dims(p)
		if err != nil {
			return nil, false, err
		}
		switch {
		case n == velocityName && len(d) == 4:
			vector = true
			continue
		case len(d) != 3:
			return nil, false, fmt.Errorf("%s: %d dimensions, want 3 (z, y, x)", p, len(d))
		}
		fi := FieldInfo{Name: n, Location: LocationCentre, Rows: d[0], Cols: d[2]}
		fi.Units, _ = f.getString(p, "units")
		fi.Description, _ = f.getString(p, "description")
		out = append(out, fi)
	}
	return out, vector, nil
}

// ReadVolume reads the volume name of the snapshot at index (as in
// SnapshotInfo.Index) from the fields file h5path, with its attributes.
func ReadVolume(h5path string, index int, name string) (Volume, error) {
	defer enter()()
	f, err := openFile(h5path, false)
	if err != nil {
		return Volume{}, openReadError(h5path, err)
	}
	defer f.close()
	path := fmt.Sprintf("%s/%06d/%s/%s", snapGroup, index, slabName, name)
	if !f.exists(path) {
		return Volume{}, fmt.Errorf("h5: %s has no volume %s; list it with h5ls -r (a slice's file has none)", h5path, path)
	}
	d, err := f.dims(path)
	if err == nil && len(d) != 3 {
		err = fmt.Errorf("%d dimensions, want 3 (z, y, x)", len(d))
	}
	if err != nil {
		return Volume{}, fmt.Errorf("h5: reading %s from %s: %v", path, h5path, err)
	}
	data, err := f.readF64(path, d[0]*d[1]*d[2])
	if err != nil {
		return Volume{}, fmt.Errorf("h5: reading %s from %s: %v", path, h5path, err)
	}
	v := Volume{Name: name, Data: data}
	v.Units, _ = f.getString(path, "units")
	v.Description, _ = f.getString(path, "description")
	v.Source, _ = f.getString(path, "source")
	return v, nil
}

// slabGrid is the sidecar's uniform grid of the volumes of snapshot s;
// false when it has none.
func slabGrid(h5name string, cat *catalog, s SnapshotInfo) (xdmfGrid, bool) {
	g := cat.grid
	if len(s.Volumes) == 0 || g.ny < 2 || !cat.edges {
		return xdmfGrid{}, false
	}
	dims := fmt.Sprintf("%d %d %d", g.nzc, g.ny, g.nx)
	var attrs []xdmfAttribute
	for _, v := range s.Volumes {
		a := xdmfAttribute{Name: v.Name, AttributeType: "Scalar", Center: "Cell", Item: xdmfRef(h5name, s.Group+"/"+slabName+"/"+v.Name, dims)}
		if v.Units != "" {
			a.Info = append(a.Info, xdmfInfo{Name: "units", Value: v.Units})
		}
		attrs = append(attrs, a)
	}
	if s.slabVector {
		attrs = append(attrs, xdmfAttribute{Name: velocityName, AttributeType: "Vector", Center: "Cell",
			Info: []xdmfInfo{{Name: "units", Value: "m/s"}},
			Item: xdmfRef(h5name, s.Group+"/"+slabName+"/"+velocityName, dims+" 3")})
	}
	return xdmfGrid{
		Name:     slabName,
		GridType: "Uniform",
		Time:     &xdmfTime{Value: strconv.FormatFloat(s.Time, 'g', -1, 64)},
		Topology: &xdmfTopology{TopologyType: "3DRectMesh", Dimensions: fmt.Sprintf("%d %d %d", g.nzf, g.ny+1, g.nx+1)},
		Geometry: &xdmfGeometry{GeometryType: "VXVYVZ", Items: []xdmfItem{
			xdmfRef(h5name, gridXEdges, fmt.Sprint(g.nx+1)),
			xdmfRef(h5name, gridYEdges, fmt.Sprint(g.ny+1)),
			xdmfRef(h5name, gridZf, fmt.Sprint(g.nzf)),
		}},
		Attributes: attrs,
	}, true
}
