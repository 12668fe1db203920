package h5

import (
	"fmt"
	"slices"
)

// Coordinates that general array tools read: HDF5 dimension scales (which
// netCDF-4 reads as dimensions and their coordinate variables) with the
// attributes of the climate-and-forecast (CF) conventions, and the cell
// edges the sidecar's meshes are built on.

// Layout of format version 2, added to version 1's.
const (
	conventions = "CF-1.8" // root attribute Conventions

	scaleX         = "x"         // streamwise positions (m), /grid/x
	scaleZc        = "z_centre"  // heights of the cell centres (m), /grid/z_centre
	scaleZf        = "z_face"    // heights of the cell faces (m), /grid/z_face
	scaleComponent = "component" // index of a velocity component
	scaleTime      = "time"      // s, times of the complete snapshots (root only)

	velocityName = "velocity" // per snapshot: (u, w at the centres, 0)
	velocityDesc = "velocity at the cell centres: u, w interpolated linearly in z from the faces, 0 across the slice"

	gridXEdges  = "/grid/x_edges"      // nx+1 edges of the cells around the x positions
	gridZfEdges = "/grid/z_face_edges" // nz+2 edges of the cells around the faces

	stackAttr = "stacked_snapshots" // marks the root virtual datasets
)

// reservedSnapshotNames may not name snapshot fields: the datasets of these
// names in a snapshot group are its coordinates and velocity vector.
var reservedSnapshotNames = []string{scaleX, scaleZc, scaleZf, scaleComponent, scaleTime, velocityName, scaleY, slabName}

// coordinate is a 1-D dimension scale with its CF attributes.
type coordinate struct {
	name     string
	values   []float64
	units    string
	longName string
	axis     string // CF axis: "X", "Z", "T", or ""
}

// gridCoordinates returns the coordinates of the mesh g, as written at the
// root and in every snapshot group. The velocity components are numbered
// in the order of the sidecar's vectors: 0 streamwise (u), 1 vertical (w),
// 2 across the slice (zero).
//
// A slab adds the spanwise positions y. Its three-dimensional velocity
// (group slab/) orders the same three components as (u, v, w), the order
// of the axes x, y, z.
func gridCoordinates(g *GridInfo) []coordinate {
	cs := []coordinate{
		{scaleX, g.X, "m", "streamwise position (periodic with period Lx)", "X"},
		{scaleZc, g.Zc, "m", "height above the bed of the cell centres (u, p, scalars)", "Z"},
		{scaleZf, g.Zf, "m", "height above the bed of the cell faces (w)", "Z"},
		{scaleComponent, []float64{0, 1, 2}, "1", "velocity component: 0 streamwise u, 1 vertical w, 2 across the slice (zero)", ""},
	}
	if g.Slab() {
		cs[3].longName = "velocity component: in velocity (the span average) 0 streamwise u, 1 vertical w, 2 spanwise (zero); in slab/velocity 0 streamwise u, 1 spanwise v, 2 vertical w"
		cs = append(cs, coordinate{scaleY, g.Y, "m", "spanwise position (periodic with period width)", "Y"})
	}
	return cs
}

// writeCoordinate writes c as the dataset at path and makes it a
// dimension scale with its CF attributes.
func writeCoordinate(f *file, path string, c coordinate) error {
	if err := f.writeF64(path, c.values, []int{len(c.values)}, 0); err != nil {
		return err
	}
	if err := f.makeScale(path, c.name); err != nil {
		return err
	}
	attrs := [][2]string{{"units", c.units}, {"long_name", c.longName}}
	if c.axis != "" {
		attrs = append(attrs, [2]string{"axis", c.axis})
	}
	if c.axis == "Z" {
		attrs = append(attrs, [2]string{"positive", "up"})
	}
	for _, a := range attrs {
		if err := f.setString(path, a[0], a[1]); err != nil {
			return err
		}
	}
	return nil
}

// cellEdges returns the edges of the cells that the sidecar's meshes are
// made of, so that cell-centred values tile the whole slice: in x, the
// nx+1 edges x_i − Δx/2 (Δx = Lx/nx, the last edge one period after the
// first); around the faces in z, the first face, the centres and the last
// face (the bed 0 and the top H). The cells around the centres are bounded
// by the faces themselves.
func cellEdges(g *GridInfo) (x, zFace []float64) {
	nx := len(g.X)
	dx := g.Lx / float64(nx)
	x = make([]float64, nx+1)
	for i, v := range g.X {
		x[i] = v - dx/2
	}
	x[nx] = g.X[0] + g.Lx - dx/2
	zFace = make([]float64, 0, len(g.Zc)+2)
	zFace = append(zFace, g.Zf[0])
	zFace = append(zFace, g.Zc...)
	zFace = append(zFace, g.Zf[len(g.Zf)-1])
	return x, zFace
}

// decorateGrid adds to a file whose /grid is written the root coordinates
// x, z_centre, z_face and component, attaches them to the /grid datasets
// and writes the cell edges.
func decorateGrid(f *file, g *GridInfo) error {
	for _, c := range gridCoordinates(g) {
		if err := writeCoordinate(f, "/"+c.name, c); err != nil {
			return err
		}
	}
	for _, d := range []struct{ path, scale string }{{gridX, scaleX}, {gridZc, scaleZc}, {gridZf, scaleZf}} {
		if err := f.attach(d.path, "/"+d.scale, 0, true); err != nil {
			return err
		}
	}
	xe, zfe := cellEdges(g)
	for _, c := range []coordinate{
		{"x_edges", xe, "m", "edges of the cells around the x positions: x - Lx/(2 nx), the last one period after the first", "X"},
		{"z_face_edges", zfe, "m", "edges of the cells around the faces in z: the bed, the cell centres, the top", "Z"},
	} {
		if err := writeCoordinate(f, "/grid/"+c.name, c); err != nil {
			return err
		}
	}
	return nil
}

// attachField attaches the coordinates in group g (the root or a snapshot
// group) to the 2-D field at path of the given location, and gives it a
// CF long_name.
func attachField(f *file, g, path string, fi FieldInfo) error {
	z := scaleZc
	if fi.Location == LocationFace {
		z = scaleZf
	}
	if fi.Location != "" {
		if err := f.attach(path, joinPath(g, z), 0, true); err != nil {
			return err
		}
		if err := f.attach(path, joinPath(g, scaleX), 1, true); err != nil {
			return err
		}
	}
	if fi.Description == "" {
		return nil
	}
	return f.setString(path, "long_name", fi.Description)
}

func joinPath(g, name string) string {
	if g == "/" {
		return "/" + name
	}
	return g + "/" + name
}

// decorateSnapshot writes the coordinates of the snapshot group s.Group,
// attaches them to its fields, and writes the velocity vector when u and w
// are among the fields (u and w are their values, nil otherwise). It
// returns whether it wrote the vector.
func decorateSnapshot(f *file, g *GridInfo, s SnapshotInfo, u, w []float64, level int) (bool, error) {
	for _, c := range gridCoordinates(g) {
		if err := writeCoordinate(f, s.Group+"/"+c.name, c); err != nil {
			return false, err
		}
	}
	for _, fi := range s.Fields {
		if err := attachField(f, s.Group, s.Group+"/"+fi.Name, fi); err != nil {
			return false, err
		}
	}
	if u == nil || w == nil {
		return false, nil
	}
	path := s.Group + "/" + velocityName
	v := velocityVector(g, u, w)
	info := FieldInfo{Units: "m/s", Description: velocityDesc, Location: LocationCentre}
	if err := f.writeF64(path, v, []int{len(g.Zc), len(g.X), 3}, level); err != nil {
		return false, err
	}
	for _, a := range [][2]string{{"units", info.Units}, {"description", info.Description}, {"long_name", info.Description}, {"location", info.Location}} {
		if err := f.setString(path, a[0], a[1]); err != nil {
			return false, err
		}
	}
	for d, sc := range []string{scaleZc, scaleX, scaleComponent} {
		if err := f.attach(path, s.Group+"/"+sc, d, true); err != nil {
			return false, err
		}
	}
	return true, nil
}

// velocityVector returns the velocity at the cell centres, nz × nx × 3
// values (u, w, 0) row by row: u as it is, and w interpolated linearly in
// z between the faces below and above each centre,
// w_k + (zc_k − zf_k)/(zf_{k+1} − zf_k)·(w_{k+1} − w_k).
func velocityVector(g *GridInfo, u, w []float64) []float64 {
	nx, nz := len(g.X), len(g.Zc)
	v := make([]float64, 3*nz*nx)
	for k := 0; k < nz; k++ {
		a := (g.Zc[k] - g.Zf[k]) / (g.Zf[k+1] - g.Zf[k])
		for i := 0; i < nx; i++ {
			lo, hi := w[k*nx+i], w[(k+1)*nx+i]
			j := 3 * (k*nx + i)
			v[j] = u[k*nx+i]
			v[j+1] = lo + float64(a*(hi-lo)) // no fused multiply-add: readers recompute it exactly
		}
	}
	return v
}

// stackSource is one snapshot dataset mapped into a root stack.
type stackSource struct {
	path string
	at   int // index along time
}

// rebuildStacks replaces the root coordinate time and the root virtual
// datasets, one per snapshot field (and the velocity), of extent (time,
// z, x) or (time, z, x, component), that map the datasets of the complete
// snapshots without copying them. A field whose name is taken at the root
// by something else gets no stack.
func rebuildStacks(f *file, cat *catalog) error {
	root, err := f.children("/")
	if err != nil {
		return err
	}
	for _, n := range root {
		p := "/" + n
		if k, err := f.kind(p); err != nil || k != kindDataset || !f.hasAttr(p, stackAttr) {
			continue
		}
		loc, _ := f.getString(p, "location")
		d, err := f.dims(p)
		if err != nil {
			return err
		}
		// A stack whose time coordinate is gone (a kill in a flush) cannot
		// be detached; its entries in the coordinates' lists of users
		// stay behind, which readers pass over.
		detachStack(f, p, loc, len(d))
		if err := f.remove(p); err != nil {
			return err
		}
	}
	if f.exists("/" + scaleTime) {
		if err := f.remove("/" + scaleTime); err != nil {
			return err
		}
	}
	times := make([]float64, len(cat.snaps))
	for j, s := range cat.snaps {
		times[j] = s.Time
	}
	if err := writeCoordinate(f, "/"+scaleTime, coordinate{scaleTime, times, "s", "simulated time of the snapshot", "T"}); err != nil {
		return err
	}
	if len(cat.snaps) == 0 || cat.coords == nil {
		return nil
	}
	infos := map[string]FieldInfo{}
	srcs := map[string][]stackSource{}
	for j, s := range cat.snaps {
		fields := s.Fields
		if s.vector {
			fields = append(slices.Clone(fields), FieldInfo{Name: velocityName, Units: "m/s", Location: LocationCentre,
				Description: velocityDesc, Rows: cat.grid.nzc, Cols: cat.grid.nx})
		}
		for _, fi := range fields {
			if first, ok := infos[fi.Name]; ok && (first.Rows != fi.Rows || first.Cols != fi.Cols || first.Location != fi.Location) {
				continue // a stack holds one shape
			}
			if _, ok := infos[fi.Name]; !ok {
				infos[fi.Name] = fi
			}
			srcs[fi.Name] = append(srcs[fi.Name], stackSource{s.Group + "/" + fi.Name, j})
		}
	}
	names := make([]string, 0, len(infos))
	for n := range infos {
		names = append(names, n)
	}
	slices.Sort(names)
	for _, n := range names {
		fi := infos[n]
		if fi.Location == "" || f.exists("/"+n) {
			continue
		}
		if err := writeStack(f, n, fi, srcs[n], len(cat.snaps)); err != nil {
			return fmt.Errorf("stack of %s: %w", n, err)
		}
	}
	return nil
}

func writeStack(f *file, name string, fi FieldInfo, srcs []stackSource, n int) error {
	p := "/" + name
	dims := []int{n, fi.Rows, fi.Cols}
	if name == velocityName {
		dims = append(dims, 3)
	}
	paths := make([]string, len(srcs))
	at := make([]int, len(srcs))
	for j, s := range srcs {
		paths[j], at[j] = s.path, s.at
	}
	if err := f.writeVirtual(p, dims, paths, at); err != nil {
		return err
	}
	for _, a := range [][2]string{{"units", fi.Units}, {"description", fi.Description}, {"long_name", fi.Description}, {"location", fi.Location}} {
		if a[1] == "" {
			continue
		}
		if err := f.setString(p, a[0], a[1]); err != nil {
			return err
		}
	}
	if err := f.setString(p, stackAttr, "/snapshots/*/"+name+" stacked along time; NaN where a snapshot lacks it"); err != nil {
		return err
	}
	for d, sc := range stackScales(fi.Location, len(dims)) {
		if err := f.attach(p, sc, d, true); err != nil {
			return err
		}
	}
	return nil
}

// stackScales lists the root coordinates of a stack's dimensions.
func stackScales(location string, rank int) []string {
	z := "/" + scaleZc
	if location == LocationFace {
		z = "/" + scaleZf
	}
	s := []string{"/" + scaleTime, z, "/" + scaleX, "/" + scaleComponent}
	return s[:rank]
}

// detachStack detaches a stack from the root coordinates that outlive it,
// so that their lists of users hold no stale entries; it goes on past a
// dimension that fails and returns the first failure.
func detachStack(f *file, p, location string, rank int) error {
	var first error
	for d, sc := range stackScales(location, min(rank, 4)) {
		if d == 0 || !f.exists(sc) {
			continue // time is replaced with the stacks
		}
		if err := f.attach(p, sc, d, false); err != nil && first == nil {
			first = err
		}
	}
	return first
}

// upgrade brings a file of format version 1, read into cat, to version 2
// in place: the coordinates, the cell edges, the velocity vector of each
// snapshot that has u and w, and the stacks. The values of version 1 stay
// as they are. A step found done (by an upgrade cut short) is skipped.
func upgrade(f *file, cat *catalog, level int) error {
	if cat.grid != nil {
		if !f.exists("/" + scaleX) {
			if err := decorateGrid(f, cat.coords); err != nil {
				return err
			}
		}
		for _, st := range cat.statics {
			if f.hasAttr(st.Name, "long_name") {
				continue
			}
			if err := attachField(f, "/", st.Name, st); err != nil {
				return err
			}
		}
		for i := range cat.snaps {
			s := &cat.snaps[i]
			if f.exists(s.Group + "/" + scaleX) {
				continue
			}
			for _, fi := range s.Fields {
				if slices.Contains(reservedSnapshotNames, fi.Name) {
					return fmt.Errorf("%s/%s: the name is reserved for a coordinate or the velocity vector in format version %d", s.Group, fi.Name, formatVersion)
				}
			}
			u, err := readVelocityPart(f, cat, s, "u", LocationCentre)
			if err != nil {
				return err
			}
			w, err := readVelocityPart(f, cat, s, "w", LocationFace)
			if err != nil {
				return err
			}
			if s.vector, err = decorateSnapshot(f, cat.coords, *s, u, w, level); err != nil {
				return err
			}
		}
		cat.edges = true
	}
	if err := f.setString("/", "Conventions", conventions); err != nil {
		return err
	}
	cat.version = formatVersion
	if err := rebuildStacks(f, cat); err != nil {
		return err
	}
	return f.setInt("/", "format_version", formatVersion)
}

// readVelocityPart reads field name of snapshot s when it is there at the
// given location; nil when it is not.
func readVelocityPart(f *file, cat *catalog, s *SnapshotInfo, name, location string) ([]float64, error) {
	for _, fi := range s.Fields {
		if fi.Name == name && fi.Location == location && fi.Rows == cat.rowsFor(location) && fi.Cols == cat.grid.nx {
			return f.readF64(s.Group+"/"+name, fi.Rows*fi.Cols)
		}
	}
	return nil, nil
}
