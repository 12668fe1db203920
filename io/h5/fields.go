package h5

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"slices"
	"strings"
	"time"
)

// Where a field's values sit on the staggered grid.
const (
	LocationCentre = "centre" // cell centres: rows are /grid/z_centre (u, p, scalars)
	LocationFace   = "face"   // cell faces: rows are /grid/z_face (w)
)

// Meta is the provenance of a run, stored as attributes of the root group
// of fields.h5.
type Meta struct {
	Title    string    // a line naming the run (attribute "title")
	Version  string    // program version (attribute "version")
	CaseText string    // the full case file text (attribute "case")
	Seed     uint64    // seed of the initial perturbations (attribute "seed")
	Started  time.Time // wall-clock start (attribute "started", RFC 3339); zero means now
	Compress int       // deflate level of the 2-D datasets: 0 none, 1 (fast) to 9 (small)
	// Provenance is the build, libraries, host and command line of the
	// process that created the file, one root attribute per fact named by
	// its key (runfolder.Provenance.Facts), e.g. "revision", "hdf5_version",
	// "command_line"; empty facts are not written. Its Version is not
	// stored twice: the attribute "version" (Version above) holds it, and
	// reading sets both.
	Provenance runfolder.Provenance
	// Resumes lists the processes that continued the run (attribute
	// "resumed", one line per resume: the time, RFC 3339, a space and the
	// command line), oldest first; Create ignores it, OpenToResume adds to
	// it.
	Resumes []Resume
}

// GridInfo is the mesh of the slice: x is periodic and streamwise, z is the
// height above the bed. A slab's mesh also has the spanwise positions Y
// (periodic with period Ly); a slice's has none.
type GridInfo struct {
	X  []float64 // m, Nx streamwise sample positions
	Zc []float64 // m, heights of the cell centres (u, p, scalars)
	Zf []float64 // m, heights of the cell faces (w)
	Lx float64   // m, streamwise length (the period)
	H  float64   // m, depth of the domain
	Y  []float64 // m, Ny spanwise sample positions of a slab; nil for a slice
	Ly float64   // m, spanwise width (the period) of a slab; 0 for a slice
}

// Field is one named 2-D array, stored row by row: Rows levels in z, Cols
// points in x, value (k, i) at Data[k*Cols+i].
type Field struct {
	Name        string // dataset name: letters, digits, '_', '-', '.'; not starting with '.'
	Units       string // SI units, e.g. "m/s", "1/s", "Pa", "1" for dimensionless
	Description string // what the values are, for people
	Data        []float64
	Rows, Cols  int
	Location    string // LocationCentre or LocationFace
}

// FieldInfo describes a stored 2-D dataset without its values.
type FieldInfo struct {
	Name        string // dataset name; for static datasets, the absolute path
	Units       string
	Description string
	Location    string // LocationCentre, LocationFace, or "" when the rows match neither
	Rows, Cols  int
}

// SnapshotInfo describes one complete snapshot group.
type SnapshotInfo struct {
	Index  int         // NNNNNN in the group name, from 0
	Group  string      // "/snapshots/NNNNNN"
	Time   float64     // s, simulated time
	Step   int         // number of steps taken
	Fields []FieldInfo // in name order; the 2-D datasets only
	// Volumes are a slab's three-dimensional fields (group slab/), in
	// name order, each Rows = Nz centres by Cols = Nx points per spanwise
	// row; empty for a slice.
	Volumes []FieldInfo

	vector     bool // holds the velocity vector (format version 2)
	slabVector bool // holds the three-dimensional velocity vector
}

// File layout: names of groups, datasets and attributes.
const (
	fieldsFormat  = "rollerbed fields"
	formatVersion = 2 // 2 adds coordinates, the velocity vector and the stacks to 1

	gridGroup    = "/grid"
	gridX        = "/grid/x"
	gridZc       = "/grid/z_centre"
	gridZf       = "/grid/z_face"
	snapGroup    = "/snapshots"
	completeAttr = "complete"
)

// Fields writes fields.h5, the field output of one run. The file is not
// held open: each method opens it, writes one complete unit (the grid, a
// static dataset, a snapshot, a truncation), flushes, closes and syncs it,
// so the file on disk is whole between calls whatever happens to the
// process (see the package documentation). After each change the XDMF
// sidecar is rewritten, so a viewer can follow a run while it goes.
//
// A Fields is not safe for use by several goroutines at once.
type Fields struct {
	path   string
	meta   Meta
	cat    catalog
	next   int // index of the next snapshot
	closed bool
	// volumes are the slab volumes of the snapshot being written (set by
	// WriteSlabSnapshot for its call of WriteSnapshot).
	volumes []Volume
}

// catalog is what a fields file holds, as the sidecar needs it.
type catalog struct {
	version int
	grid    *gridShape
	coords  *GridInfo   // the grid's values, when grid is not nil
	edges   bool        // the cell edges of the sidecar's meshes are written
	statics []FieldInfo // sorted by path
	snaps   []SnapshotInfo
}

type gridShape struct{ nx, nzc, nzf, ny int } // ny: 0 for a slice

func (c *catalog) rowsFor(location string) int {
	switch {
	case c.grid == nil:
		return -1
	case location == LocationCentre:
		return c.grid.nzc
	case location == LocationFace:
		return c.grid.nzf
	}
	return -1
}

// Create makes a new fields file at path (normally <run folder>/fields.h5)
// with meta as root attributes. It refuses to replace an existing file
// (the error wraps fs.ErrExist): remove it to start over, or use Open to
// continue it.
func Create(path string, meta Meta) (*Fields, error) {
	if meta.Compress < 0 || meta.Compress > 9 {
		return nil, fmt.Errorf("h5: compression level %d for %s: use 0 (none) or a deflate level from 1 (fast) to 9 (small)", meta.Compress, path)
	}
	texts := map[string]string{"title": meta.Title, "version": meta.Version, "case text": meta.CaseText}
	for _, fact := range meta.Provenance.Facts() {
		texts[fact.Label] = *fact.Value
	}
	for name, s := range texts {
		if strings.IndexByte(s, 0) >= 0 {
			return nil, fmt.Errorf("h5: the %s for %s holds a NUL byte, which HDF5 strings cannot carry; remove it", name, path)
		}
	}
	if err := checkFolder(filepath.Dir(path), path); err != nil {
		return nil, err
	}
	if _, err := os.Lstat(path); err == nil {
		return nil, fmt.Errorf("h5: %s already exists: remove it (or choose a new run folder) to start over, or resume the run to continue it: %w", path, fs.ErrExist)
	}
	if meta.Started.IsZero() {
		meta.Started = time.Now()
	}
	defer enter()()
	f, err := createFile(path, true)
	if err != nil {
		return nil, fmt.Errorf("h5: cannot create %s: %v; check that the folder is writable and the disk not full", path, err)
	}
	werr := writeMeta(f, meta)
	if werr == nil {
		werr = f.createGroup(snapGroup)
	}
	if werr == nil {
		werr = f.flush()
	}
	if cerr := f.close(); werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = runfolder.SyncFile(path)
	}
	if werr == nil {
		werr = runfolder.SyncDir(filepath.Dir(path))
	}
	if werr != nil {
		os.Remove(path)
		return nil, fmt.Errorf("h5: cannot create %s: %v; check that the folder is writable and the disk not full", path, werr)
	}
	return &Fields{path: path, meta: meta, cat: catalog{version: formatVersion}}, nil
}

func writeMeta(f *file, m Meta) error {
	for _, a := range []struct{ name, value string }{
		{"format", fieldsFormat},
		{"title", m.Title},
		{"version", m.Version},
		{"case", m.CaseText},
		{"started", m.Started.Format(time.RFC3339)},
		{"Conventions", conventions},
	} {
		if err := f.setString("/", a.name, a.value); err != nil {
			return err
		}
	}
	for _, fact := range m.Provenance.Facts() {
		if fact.Key == "version" || *fact.Value == "" {
			continue
		}
		if err := f.setString("/", fact.Key, *fact.Value); err != nil {
			return err
		}
	}
	if err := f.setInt("/", "format_version", formatVersion); err != nil {
		return err
	}
	if err := f.setUint("/", "seed", m.Seed); err != nil {
		return err
	}
	return f.setInt("/", "compression", int64(m.Compress))
}

// checkFolder returns a clear error when dir, the folder for file, is
// missing or not a folder.
func checkFolder(dir, file string) error {
	st, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("h5: cannot write %s: the folder %s does not exist; create it first (or check the run folder path)", file, dir)
	case err != nil:
		return fmt.Errorf("h5: cannot write %s: %v", file, err)
	case !st.IsDir():
		return fmt.Errorf("h5: cannot write %s: %s is a file, not a folder; choose another run folder", file, dir)
	}
	return nil
}

// Open opens an existing fields file to append to it (on resume).
// Snapshot groups left incomplete by a run that was killed while writing
// them are removed, and the sidecar is rewritten. Call TruncateAfter with
// the checkpoint's time before writing new snapshots.
func Open(path string) (*Fields, error) { return open(path, nil) }

// OpenToResume is Open for a process that continues the run: it also adds
// r to the resumed attribute (see Meta.Resumes), in the same update of the
// file. The provenance of the process that created the file is kept.
func OpenToResume(path string, r Resume) (*Fields, error) {
	if strings.ContainsAny(r.CommandLine, "\x00\n") {
		return nil, fmt.Errorf("h5: the command line to note in %s holds a NUL byte or a line break; quote the arguments (strconv.Quote) first", path)
	}
	r.Time = r.Time.Truncate(time.Second)
	return open(path, &r)
}

// open is Open, adding the resume note to the file when it is not nil.
func open(path string, note *Resume) (*Fields, error) {
	if _, err := os.Stat(path); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("h5: %s does not exist: start a new run instead of resuming: %w", path, fs.ErrNotExist)
		}
		return nil, fmt.Errorf("h5: cannot open %s: %v", path, err)
	}
	fl := &Fields{path: path}
	var incomplete []string
	upgraded := false
	err := func() error {
		defer enter()()
		f, err := openFile(path, true)
		if err != nil {
			r, rerr := openFile(path, false)
			if rerr != nil {
				return openReadError(path, rerr)
			}
			r.close()
			return fmt.Errorf("h5: cannot open %s for writing: %v; %s", path, err, openWriteFix(err))
		}
		defer f.close()
		if fl.meta, err = readMeta(f); err != nil {
			return err
		}
		if fl.cat, incomplete, err = readCatalog(f); err != nil {
			return err
		}
		for _, g := range incomplete {
			if err := f.remove(g); err != nil {
				return fmt.Errorf("h5: cannot remove the incomplete snapshot %s from %s: %v", g, path, err)
			}
		}
		switch {
		case fl.cat.version < formatVersion:
			from := fl.cat.version
			if err := upgrade(f, &fl.cat, fl.meta.Compress); err != nil {
				return fmt.Errorf("h5: cannot bring %s (format version %d) to format version %d: %v; its fields are unchanged: check the disk (free space, permissions) and resume again, or start a new run", path, from, formatVersion, err)
			}
			upgraded = true
		default:
			// Also mends stacks that a kill in the flush of a snapshot
			// left out of date.
			if err := rebuildStacks(f, &fl.cat); err != nil {
				return fmt.Errorf("h5: cannot update %s: %v", path, err)
			}
		}
		if note != nil {
			if err := addResume(f, *note); err != nil {
				return fmt.Errorf("h5: cannot note the resume in %s: %v", path, err)
			}
			fl.meta.Resumes = append(fl.meta.Resumes, *note)
		}
		if err := f.flush(); err != nil {
			return fmt.Errorf("h5: cannot update %s: %v", path, err)
		}
		if err := f.close(); err != nil {
			return fmt.Errorf("h5: cannot update %s: %v", path, err)
		}
		return runfolder.SyncFile(path)
	}()
	if err != nil {
		return nil, err
	}
	if n := len(fl.cat.snaps); n > 0 {
		fl.next = fl.cat.snaps[n-1].Index + 1
	}
	if len(incomplete) > 0 || upgraded {
		if err := fl.writeSidecar(); err != nil {
			return nil, err
		}
	}
	return fl, nil
}

// Path returns the file's path.
func (fl *Fields) Path() string { return fl.path }

// Meta returns the provenance stored in the file.
func (fl *Fields) Meta() Meta { return fl.meta }

// Snapshots describes the complete snapshots in the file, oldest first.
func (fl *Fields) Snapshots() []SnapshotInfo { return slices.Clone(fl.cat.snaps) }

// update opens the file for writing, runs fn, and flushes, closes and
// syncs the file. fn must undo its own partial changes when it fails.
func (fl *Fields) update(what string, fn func(f *file) error) error {
	if fl.closed {
		panic("h5: " + what + " after Close of " + fl.path)
	}
	defer enter()()
	f, err := openFile(fl.path, true)
	if err != nil {
		return fmt.Errorf("h5: cannot open %s to write %s: %v; %s", fl.path, what, err, openWriteFix(err))
	}
	werr := fn(f)
	if werr == nil {
		werr = f.flush()
	}
	if cerr := f.close(); werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = runfolder.SyncFile(fl.path)
	}
	if werr != nil {
		return fmt.Errorf("h5: writing %s to %s failed: %v; what was written before is intact: free disk space or fix the permissions", what, fl.path, werr)
	}
	return nil
}

// WriteGrid stores the mesh as /grid/x, /grid/z_centre and /grid/z_face
// (m), with Lx and H as the attributes length and height (m) of /grid,
// the cell edges of the sidecar's meshes (/grid/x_edges,
// /grid/z_face_edges) and the root coordinates /x, /z_centre, /z_face and
// /component. It must come before the first static dataset or snapshot,
// once.
func (fl *Fields) WriteGrid(g GridInfo) error {
	if fl.cat.grid != nil {
		return fmt.Errorf("h5: %s already has its grid; a fields file holds one grid", fl.path)
	}
	for _, c := range []struct {
		name string
		v    []float64
	}{{"X", g.X}, {"Zc", g.Zc}, {"Zf", g.Zf}} {
		if len(c.v) == 0 {
			return fmt.Errorf("h5: grid for %s: %s is empty", fl.path, c.name)
		}
		for i, v := range c.v {
			if math.IsNaN(v) || math.IsInf(v, 0) || i > 0 && !(v > c.v[i-1]) {
				return fmt.Errorf("h5: grid for %s: %s[%d] = %g m: coordinates must be finite and increase", fl.path, c.name, i, v)
			}
		}
	}
	for _, c := range []struct {
		name string
		v    float64
	}{{"Lx", g.Lx}, {"H", g.H}} {
		if !(c.v > 0) || math.IsInf(c.v, 0) {
			return fmt.Errorf("h5: grid for %s: %s = %g m: need a finite length > 0", fl.path, c.name, c.v)
		}
	}
	if err := checkSlabGrid(&g); err != nil {
		return fmt.Errorf("h5: grid for %s: %v", fl.path, err)
	}
	err := fl.update("the grid", func(f *file) error {
		err := writeGrid(f, g)
		if err == nil {
			err = decorateGrid(f, &g)
		}
		if err == nil {
			err = writeSlabGrid(f, &g)
		}
		if err != nil {
			for _, p := range gridCoordinates(&g) {
				if f.exists("/" + p.name) {
					f.remove("/" + p.name)
				}
			}
			if f.exists(gridGroup) {
				f.remove(gridGroup)
			}
		}
		return err
	})
	if err != nil {
		return err
	}
	g.X, g.Zc, g.Zf, g.Y = slices.Clone(g.X), slices.Clone(g.Zc), slices.Clone(g.Zf), slices.Clone(g.Y)
	fl.cat.grid = &gridShape{nx: len(g.X), nzc: len(g.Zc), nzf: len(g.Zf), ny: len(g.Y)}
	fl.cat.coords, fl.cat.edges = &g, true
	return fl.writeSidecar()
}

func writeGrid(f *file, g GridInfo) error {
	if err := f.createGroup(gridGroup); err != nil {
		return err
	}
	for _, a := range []struct {
		name string
		v    float64
	}{{"length", g.Lx}, {"height", g.H}} {
		if err := f.setFloat(gridGroup, a.name, a.v); err != nil {
			return err
		}
	}
	if err := f.setString(gridGroup, "units", "m"); err != nil {
		return err
	}
	if err := f.setString(gridGroup, "description", "mesh of the x-z slice; length: streamwise period Lx, height: depth H of the domain"); err != nil {
		return err
	}
	for _, d := range []struct {
		path, desc string
		v          []float64
	}{
		{gridX, "streamwise positions of the samples (x is periodic with period length)", g.X},
		{gridZc, "heights above the bed of the cell centres, where u, p and scalars sit", g.Zc},
		{gridZf, "heights above the bed of the cell faces, where w sits", g.Zf},
	} {
		if err := f.writeF64(d.path, d.v, []int{len(d.v)}, 0); err != nil {
			return err
		}
		if err := f.setString(d.path, "units", "m"); err != nil {
			return err
		}
		if err := f.setString(d.path, "description", d.desc); err != nil {
			return err
		}
	}
	return nil
}

// WriteStatic stores a 2-D array that does not change in time, such as
// the canopy's frontal-area density, as dataset name (e.g.
// "/canopy/frontal_area", units "1/m"), rows × cols (z × x), with
// attributes units and description. Arrays whose rows match the centre or
// face heights get that location and appear in every time step of the
// sidecar. The grid must be written first.
func (fl *Fields) WriteStatic(name string, data []float64, rows, cols int, units, desc string) error {
	if fl.cat.grid == nil {
		return fmt.Errorf("h5: static dataset %s for %s: write the grid (WriteGrid) first", name, fl.path)
	}
	path := "/" + strings.Trim(name, "/")
	parts := strings.Split(path[1:], "/")
	for _, p := range parts {
		if err := checkName(p); err != nil {
			return fmt.Errorf("h5: static dataset %q for %s: %v", name, fl.path, err)
		}
	}
	if len(parts) > 0 && (parts[0] == "grid" || parts[0] == "snapshots" || slices.Contains(reservedSnapshotNames, parts[0])) {
		return fmt.Errorf("h5: static dataset %q for %s: /%s is reserved; put it in another group, e.g. /canopy", name, fl.path, parts[0])
	}
	if err := checkArray(data, rows, cols, units, desc); err != nil {
		return fmt.Errorf("h5: static dataset %s for %s: %v", path, fl.path, err)
	}
	info := FieldInfo{Name: path, Units: units, Description: desc, Rows: rows, Cols: cols}
	if cols == fl.cat.grid.nx {
		switch rows {
		case fl.cat.grid.nzc:
			info.Location = LocationCentre
		case fl.cat.grid.nzf:
			info.Location = LocationFace
		}
	}
	if err := checkSpace(filepath.Dir(fl.path), int64(8*len(data)), "static dataset "+path); err != nil {
		return err
	}
	err := fl.update("static dataset "+path, func(f *file) error {
		if f.exists(path) {
			return fmt.Errorf("%s already exists; a static dataset is written once", path)
		}
		err := writeArray(f, path, data, info, fl.meta.Compress)
		if err == nil && fl.cat.version >= 2 {
			err = attachField(f, "/", path, info)
		}
		if err != nil && f.exists(path) {
			f.remove(path)
		}
		return err
	})
	if err != nil {
		return err
	}
	fl.cat.statics = append(fl.cat.statics, info)
	slices.SortFunc(fl.cat.statics, func(a, b FieldInfo) int { return strings.Compare(a.Name, b.Name) })
	return fl.writeSidecar()
}

// writeArray writes one 2-D dataset with its attributes.
func writeArray(f *file, path string, data []float64, info FieldInfo, level int) error {
	if err := f.writeF64(path, data, []int{info.Rows, info.Cols}, level); err != nil {
		return err
	}
	if err := f.setString(path, "units", info.Units); err != nil {
		return err
	}
	if err := f.setString(path, "description", info.Description); err != nil {
		return err
	}
	if info.Location != "" {
		return f.setString(path, "location", info.Location)
	}
	return nil
}

// checkName accepts dataset and group names that are safe in HDF5 paths,
// XDMF references and file names.
func checkName(name string) error {
	if name == "" {
		return errors.New("empty name")
	}
	if name[0] == '.' {
		return fmt.Errorf("name %q starts with '.'; start with a letter, digit or '_'", name)
	}
	for _, r := range name {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '_' || r == '-' || r == '.') {
			return fmt.Errorf("name %q holds %q; use letters, digits, '_', '-' and '.'", name, r)
		}
	}
	return nil
}

func checkArray(data []float64, rows, cols int, units, desc string) error {
	switch {
	case rows < 1 || cols < 1:
		return fmt.Errorf("%d × %d values: need at least one row and one column", rows, cols)
	case len(data) != rows*cols:
		return fmt.Errorf("%d values for %d rows × %d columns (%d)", len(data), rows, cols, rows*cols)
	case units == "":
		return errors.New(`no units: give SI units, "1" for a dimensionless quantity`)
	case strings.IndexByte(units+desc, 0) >= 0:
		return errors.New("units or description hold a NUL byte")
	}
	return nil
}

// WriteSnapshot stores the fields at time t (s) after step steps as the
// group /snapshots/NNNNNN with attributes time (s), time_units and step,
// one rows × cols float64 dataset per field with attributes units,
// description and location, and last the attribute complete = 1. Centre
// fields have one row per /grid/z_centre, face fields one per
// /grid/z_face, and one column per /grid/x. t must be later than the last
// snapshot's time. The names x, z_centre, z_face, component, time and
// velocity are reserved: the group also holds its coordinates and, when
// u (centre) and w (face) are among the fields, the velocity vector
// "velocity" at the centres. The root stacks and time coordinate are then
// rebuilt to include the snapshot.
//
// Before writing, the free disk space is checked; when it is short, the
// file is not touched and the error says so.
func (fl *Fields) WriteSnapshot(t float64, step int, fields []Field) error {
	if fl.cat.grid == nil {
		return fmt.Errorf("h5: snapshot at t = %g s for %s: write the grid (WriteGrid) first", t, fl.path)
	}
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return fmt.Errorf("h5: snapshot for %s: time %g s is not finite", fl.path, t)
	}
	if n := len(fl.cat.snaps); n > 0 && !(t > fl.cat.snaps[n-1].Time) {
		return fmt.Errorf("h5: snapshot at t = %g s for %s: not after the last snapshot (t = %g s); on resume call TruncateAfter with the checkpoint's time first", t, fl.path, fl.cat.snaps[n-1].Time)
	}
	if len(fields) == 0 {
		return fmt.Errorf("h5: snapshot at t = %g s for %s: no fields", t, fl.path)
	}
	info := SnapshotInfo{Index: fl.next, Group: fmt.Sprintf("%s/%06d", snapGroup, fl.next), Time: t, Step: step}
	seen := make(map[string]bool, len(fields))
	need := int64(0)
	for _, fd := range fields {
		if err := checkName(fd.Name); err != nil {
			return fmt.Errorf("h5: snapshot at t = %g s for %s: %v", t, fl.path, err)
		}
		if seen[fd.Name] {
			return fmt.Errorf("h5: snapshot at t = %g s for %s: field %q given twice", t, fl.path, fd.Name)
		}
		if slices.Contains(reservedSnapshotNames, fd.Name) {
			return fmt.Errorf("h5: snapshot at t = %g s for %s: field name %q is reserved for a coordinate or the velocity vector (reserved: %s); rename the field", t, fl.path, fd.Name, strings.Join(reservedSnapshotNames, ", "))
		}
		seen[fd.Name] = true
		if err := checkArray(fd.Data, fd.Rows, fd.Cols, fd.Units, fd.Description); err != nil {
			return fmt.Errorf("h5: field %q at t = %g s for %s: %v", fd.Name, t, fl.path, err)
		}
		rows := fl.cat.rowsFor(fd.Location)
		switch {
		case rows < 0:
			return fmt.Errorf("h5: field %q at t = %g s for %s: location %q: use %q or %q", fd.Name, t, fl.path, fd.Location, LocationCentre, LocationFace)
		case fd.Rows != rows || fd.Cols != fl.cat.grid.nx:
			return fmt.Errorf("h5: field %q at t = %g s for %s: %d × %d values, but the grid has %d × %d at the %s", fd.Name, t, fl.path, fd.Rows, fd.Cols, rows, fl.cat.grid.nx, fd.Location)
		}
		info.Fields = append(info.Fields, FieldInfo{Name: fd.Name, Units: fd.Units, Description: fd.Description, Location: fd.Location, Rows: fd.Rows, Cols: fd.Cols})
		need += int64(8*len(fd.Data)) + 4096
	}
	slices.SortFunc(info.Fields, func(a, b FieldInfo) int { return strings.Compare(a.Name, b.Name) })
	if fl.cat.version >= 2 {
		// The coordinates and the velocity vector.
		g := fl.cat.grid
		need += int64(8*(3*g.nzc*g.nx+g.nx+g.nzc+g.nzf+3)) + 5*4096
	}
	what := fmt.Sprintf("snapshot %d (t = %g s)", info.Index, t)
	if err := checkSpace(filepath.Dir(fl.path), need, what); err != nil {
		return err
	}
	err := fl.update(what, func(f *file) error {
		err := fl.writeSnapshot(f, &info, fields)
		if err == nil && fl.cat.version >= 2 {
			cat := fl.cat
			cat.snaps = append(slices.Clip(cat.snaps), info)
			err = rebuildStacks(f, &cat)
		}
		if err != nil && f.exists(info.Group) {
			f.remove(info.Group)
			if fl.cat.version >= 2 {
				rebuildStacks(f, &fl.cat)
			}
		}
		return err
	})
	if err != nil {
		return err
	}
	fl.cat.snaps = append(fl.cat.snaps, info)
	fl.next++
	return fl.writeSidecar()
}

// writeSnapshot writes the snapshot group info.Group with fields and, in
// format version 2, its coordinates and velocity vector (setting
// info.vector), and marks it complete.
func (fl *Fields) writeSnapshot(f *file, info *SnapshotInfo, fields []Field) error {
	level := fl.meta.Compress
	if f.exists(info.Group) {
		// Left by a writer that stopped half way and was not reopened.
		if err := f.remove(info.Group); err != nil {
			return err
		}
	}
	if err := f.createGroup(info.Group); err != nil {
		return err
	}
	if err := f.setFloat(info.Group, "time", info.Time); err != nil {
		return err
	}
	if err := f.setString(info.Group, "time_units", "s"); err != nil {
		return err
	}
	if err := f.setInt(info.Group, "step", int64(info.Step)); err != nil {
		return err
	}
	for _, fd := range fields {
		fi := FieldInfo{Units: fd.Units, Description: fd.Description, Location: fd.Location, Rows: fd.Rows, Cols: fd.Cols}
		if err := writeArray(f, info.Group+"/"+fd.Name, fd.Data, fi, level); err != nil {
			return err
		}
	}
	if fl.cat.version >= 2 {
		var u, w []float64
		for _, fd := range fields {
			switch {
			case fd.Name == "u" && fd.Location == LocationCentre:
				u = fd.Data
			case fd.Name == "w" && fd.Location == LocationFace:
				w = fd.Data
			}
		}
		var err error
		if info.vector, err = decorateSnapshot(f, fl.cat.coords, *info, u, w, level); err != nil {
			return err
		}
		if info.Volumes, info.slabVector, err = fl.writeVolumes(f, info.Group, fl.volumes); err != nil {
			return err
		}
	}
	// Written last: a group without it was cut short and is ignored.
	return f.setInt(info.Group, completeAttr, 1)
}

// TruncateAfter removes the snapshots later than t (s), used on resume so
// that the file matches the checkpoint the run continues from. The next
// snapshot takes the index after the last one kept, so a resumed run
// names its groups as an uninterrupted one would. HDF5 does not give the
// space of removed groups back to the disk; the file stays as large.
func (fl *Fields) TruncateAfter(t float64) error {
	if math.IsNaN(t) {
		return fmt.Errorf("h5: truncating %s: time is NaN", fl.path)
	}
	keep := len(fl.cat.snaps)
	for keep > 0 && fl.cat.snaps[keep-1].Time > t {
		keep--
	}
	if keep == len(fl.cat.snaps) {
		return nil
	}
	drop := fl.cat.snaps[keep:]
	err := fl.update(fmt.Sprintf("the removal of %d snapshots after t = %g s", len(drop), t), func(f *file) error {
		for _, s := range drop {
			if err := f.remove(s.Group); err != nil {
				return err
			}
		}
		if fl.cat.version < 2 {
			return nil
		}
		cat := fl.cat
		cat.snaps = cat.snaps[:keep]
		return rebuildStacks(f, &cat)
	})
	if err != nil {
		// Some groups may be gone: read back what is there.
		if cat, _, rerr := fl.reread(); rerr == nil {
			fl.cat = cat
		}
		return err
	}
	fl.cat.snaps = slices.Clone(fl.cat.snaps[:keep])
	fl.next = 0
	if keep > 0 {
		fl.next = fl.cat.snaps[keep-1].Index + 1
	}
	return fl.writeSidecar()
}

func (fl *Fields) reread() (catalog, []string, error) {
	defer enter()()
	f, err := openFile(fl.path, false)
	if err != nil {
		return catalog{}, nil, err
	}
	defer f.close()
	return readCatalog(f)
}

// Close writes the XDMF sidecar a last time. The HDF5 file itself is
// already complete after every call. Further writes are programmer errors
// and panic; a second Close does nothing.
func (fl *Fields) Close() error {
	if fl.closed {
		return nil
	}
	fl.closed = true
	return fl.writeSidecar()
}

func (fl *Fields) writeSidecar() error {
	return writeSidecar(fl.path, &fl.cat, fl.meta.Title)
}

// readMeta reads the root attributes and checks that the file is ours.
func readMeta(f *file) (Meta, error) {
	var m Meta
	format, err := f.getString("/", "format")
	if err != nil || format != fieldsFormat {
		return m, fmt.Errorf("h5: %s is not a rollerbed fields file (no format attribute %q); check the path", f.path, fieldsFormat)
	}
	if v, err := f.getInt("/", "format_version"); err != nil || v > formatVersion {
		return m, fmt.Errorf("h5: %s is of format version %d, newer than this program reads (%d); use a newer rollerbed", f.path, v, formatVersion)
	}
	m.Title, _ = f.getString("/", "title")
	m.Version, _ = f.getString("/", "version")
	m.CaseText, _ = f.getString("/", "case")
	m.Seed, _ = f.getUint("/", "seed")
	if s, err := f.getString("/", "started"); err == nil {
		m.Started, _ = time.Parse(time.RFC3339, s)
	}
	if c, err := f.getInt("/", "compression"); err == nil && c >= 0 && c <= 9 {
		m.Compress = int(c)
	}
	for _, fact := range m.Provenance.Facts() {
		if fact.Key != "version" {
			*fact.Value, _ = f.getString("/", fact.Key)
		}
	}
	m.Provenance.Version = m.Version
	m.Resumes = readResumes(f)
	return m, nil
}

// readCatalog reads the grid shape, the static datasets and the complete
// snapshots; incomplete lists the snapshot groups that lack the complete
// attribute.
func readCatalog(f *file) (cat catalog, incomplete []string, err error) {
	if _, err := readMeta(f); err != nil {
		return cat, nil, err
	}
	bad := func(what string, err error) error {
		return fmt.Errorf("h5: %s in %s is unreadable: %v; the file may be damaged (try h5dump on it)", what, f.path, err)
	}
	v, _ := f.getInt("/", "format_version")
	cat.version = int(v)
	if f.exists(gridGroup) {
		g, p, err := readGridValues(f)
		if err != nil {
			return cat, nil, bad(p, err)
		}
		cat.coords = &g
		cat.grid = &gridShape{nx: len(g.X), nzc: len(g.Zc), nzf: len(g.Zf), ny: len(g.Y)}
		cat.edges = f.exists(gridXEdges) && f.exists(gridZfEdges)
	}
	if err := walkStatics(f, "/", &cat.statics); err != nil {
		return cat, nil, bad("a static dataset", err)
	}
	slices.SortFunc(cat.statics, func(a, b FieldInfo) int { return strings.Compare(a.Name, b.Name) })
	if !f.exists(snapGroup) {
		return cat, nil, nil
	}
	names, err := f.children(snapGroup)
	if err != nil {
		return cat, nil, bad(snapGroup, err)
	}
	for _, name := range names {
		idx, ok := snapshotIndex(name)
		g := snapGroup + "/" + name
		if !ok {
			continue
		}
		if k, err := f.kind(g); err != nil || k != kindGroup {
			continue
		}
		if !f.hasAttr(g, completeAttr) {
			incomplete = append(incomplete, g)
			continue
		}
		s := SnapshotInfo{Index: idx, Group: g}
		if s.Time, err = f.getFloat(g, "time"); err != nil {
			return cat, nil, bad(g, err)
		}
		step, err := f.getInt(g, "step")
		if err != nil {
			return cat, nil, bad(g, err)
		}
		s.Step = int(step)
		ds, err := f.children(g)
		if err != nil {
			return cat, nil, bad(g, err)
		}
		for _, d := range ds {
			if d == slabName {
				if s.Volumes, s.slabVector, err = readVolumes(f, g); err != nil {
					return cat, nil, bad(g+"/"+slabName, err)
				}
				continue
			}
			if dims, err := f.dims(g + "/" + d); err == nil && len(dims) != 2 {
				// Coordinates and the velocity vector (format version 2).
				s.vector = s.vector || d == velocityName && len(dims) == 3
				continue
			}
			fi, err := readInfo(f, g+"/"+d)
			if err != nil {
				return cat, nil, bad(g+"/"+d, err)
			}
			fi.Name = d
			s.Fields = append(s.Fields, fi)
		}
		cat.snaps = append(cat.snaps, s)
	}
	slices.SortFunc(cat.snaps, func(a, b SnapshotInfo) int { return a.Index - b.Index })
	return cat, incomplete, nil
}

// snapshotIndex parses a snapshot group name: six or more digits.
func snapshotIndex(name string) (int, bool) {
	if len(name) < 6 {
		return 0, false
	}
	n := 0
	for _, r := range name {
		if r < '0' || r > '9' || n > math.MaxInt32 {
			return 0, false
		}
		n = 10*n + int(r-'0')
	}
	return n, true
}

// readInfo reads the extent and attributes of a 2-D dataset.
func readInfo(f *file, path string) (FieldInfo, error) {
	d, err := f.dims(path)
	if err != nil {
		return FieldInfo{}, err
	}
	if len(d) != 2 {
		return FieldInfo{}, fmt.Errorf("%d dimensions, want 2 (z, x)", len(d))
	}
	fi := FieldInfo{Name: path, Rows: d[0], Cols: d[1]}
	fi.Units, _ = f.getString(path, "units")
	fi.Description, _ = f.getString(path, "description")
	fi.Location, _ = f.getString(path, "location")
	return fi, nil
}

// walkStatics collects the 2-D datasets under group g outside /grid and
// /snapshots.
func walkStatics(f *file, g string, out *[]FieldInfo) error {
	names, err := f.children(g)
	if err != nil {
		return err
	}
	for _, n := range names {
		p := strings.TrimSuffix(g, "/") + "/" + n
		if p == gridGroup || p == snapGroup {
			continue
		}
		k, err := f.kind(p)
		if err != nil {
			return err
		}
		switch k {
		case kindGroup:
			if err := walkStatics(f, p, out); err != nil {
				return err
			}
		case kindDataset:
			if d, err := f.dims(p); err == nil && len(d) == 2 {
				fi, err := readInfo(f, p)
				if err != nil {
					return err
				}
				*out = append(*out, fi)
			}
		}
	}
	return nil
}

// ListSnapshots describes the complete snapshots of the fields file at
// h5path, oldest first, opening it read-only.
func ListSnapshots(h5path string) ([]SnapshotInfo, error) {
	cat, _, err := readCatalogAt(h5path)
	if err != nil {
		return nil, err
	}
	return cat.snaps, nil
}

// ReadMeta reads the provenance stored in the fields file at h5path (its
// root attributes), opening it read-only.
func ReadMeta(h5path string) (Meta, error) {
	defer enter()()
	f, err := openFile(h5path, false)
	if err != nil {
		return Meta{}, openReadError(h5path, err)
	}
	defer f.close()
	return readMeta(f)
}

func readCatalogAt(h5path string) (catalog, Meta, error) {
	defer enter()()
	f, err := openFile(h5path, false)
	if err != nil {
		return catalog{}, Meta{}, openReadError(h5path, err)
	}
	defer f.close()
	meta, err := readMeta(f)
	if err != nil {
		return catalog{}, meta, err
	}
	cat, _, err := readCatalog(f)
	return cat, meta, err
}

// openWriteFix says what to do when an existing file cannot be opened for
// writing.
func openWriteFix(err error) string {
	if strings.Contains(err.Error(), "lock") {
		return "another program holds it open with a lock (HDF5_USE_FILE_LOCKING is set in the environment): close that program or unset the variable, then resume"
	}
	return "check that the file is writable and its disk mounted read-write and not full (on a read-only disk, copy the run folder elsewhere), then resume"
}

func openReadError(path string, err error) error {
	if _, serr := os.Stat(path); serr != nil {
		return fmt.Errorf("h5: cannot read %s: %v", path, serr)
	}
	if why := notAFile(path); why != "" {
		return fmt.Errorf("h5: cannot read %s: it %s; move it aside", path, why)
	}
	return fmt.Errorf("h5: cannot read %s: %v; it may not be an HDF5 file, or be damaged or cut short (try h5dump on it)", path, err)
}

// ReadField reads the 2-D dataset at path in the fields file h5path (for
// example "/snapshots/000003/u" or "/canopy/frontal_area") with its
// attributes.
func ReadField(h5path, path string) (Field, error) {
	defer enter()()
	f, err := openFile(h5path, false)
	if err != nil {
		return Field{}, openReadError(h5path, err)
	}
	defer f.close()
	if !f.exists(path) {
		return Field{}, fmt.Errorf("h5: %s has no dataset %s; list it with h5ls -r", h5path, path)
	}
	fi, err := readInfo(f, path)
	if err != nil {
		return Field{}, fmt.Errorf("h5: reading %s from %s: %v", path, h5path, err)
	}
	data, err := f.readF64(path, fi.Rows*fi.Cols)
	if err != nil {
		return Field{}, fmt.Errorf("h5: reading %s from %s: %v", path, h5path, err)
	}
	return Field{Name: path[strings.LastIndexByte(path, '/')+1:], Units: fi.Units, Description: fi.Description,
		Data: data, Rows: fi.Rows, Cols: fi.Cols, Location: fi.Location}, nil
}

// ReadGrid reads the mesh of the fields file h5path.
func ReadGrid(h5path string) (GridInfo, error) {
	defer enter()()
	f, err := openFile(h5path, false)
	if err != nil {
		return GridInfo{}, openReadError(h5path, err)
	}
	defer f.close()
	g, p, err := readGridValues(f)
	if err != nil {
		return g, fmt.Errorf("h5: reading the grid (%s) of %s: %v; was the grid written?", p, h5path, err)
	}
	return g, nil
}

// readGridValues reads the mesh; on failure it names the dataset or
// group at fault.
func readGridValues(f *file) (GridInfo, string, error) {
	var g GridInfo
	for _, c := range []struct {
		path string
		dst  *[]float64
	}{{gridX, &g.X}, {gridZc, &g.Zc}, {gridZf, &g.Zf}} {
		d, err := f.dims(c.path)
		if err == nil && len(d) != 1 {
			err = fmt.Errorf("%d dimensions, want a 1-D dataset", len(d))
		}
		if err != nil {
			return g, c.path, err
		}
		if *c.dst, err = f.readF64(c.path, d[0]); err != nil {
			return g, c.path, err
		}
	}
	var err1, err2 error
	g.Lx, err1 = f.getFloat(gridGroup, "length")
	g.H, err2 = f.getFloat(gridGroup, "height")
	if err := errors.Join(err1, err2); err != nil {
		return g, gridGroup, err
	}
	p, err := readSlabGrid(f, &g)
	return g, p, err
}
