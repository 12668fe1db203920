// Package h5 writes the HDF5 output of a run: fields.h5 (the grid, static
// canopy arrays and snapshots of the fields), its XDMF 3 sidecar
// fields.xmf for general viewers, and checkpoints to resume from.
//
// # fields.h5
//
// All values are float64 (IEEE little-endian in the file), in SI units
// named by a units attribute. 2-D arrays are stored rows × columns = z × x,
// row by row as in memory (value (k, i) at k·Nx+i).
//
//	/                      attributes: format ("rollerbed fields"), format_version (2),
//	                       title, version, case (the full case text), seed,
//	                       started (RFC 3339), compression (deflate level),
//	                       Conventions ("CF-1.8"); the provenance of the process
//	                       that created the file: revision, revision_time,
//	                       revision_modified, go_version, hdf5_version,
//	                       fftw_version, host, command_line (Meta.Provenance);
//	                       resumed, a line per resume: time and command line
//	/grid                  attributes: length (Lx, m), height (H, m), units, description
//	/grid/x                Nx streamwise positions (m)
//	/grid/z_centre         heights of the cell centres (m), where u, p and scalars sit
//	/grid/z_face           heights of the cell faces (m), where w sits
//	/grid/x_edges          Nx+1 edges of the cells around x: x_i − Δx/2, Δx = Lx/Nx,
//	                       the last one period after the first (m)
//	/grid/z_face_edges     Nz+2 edges of the cells around the faces: the bed, the
//	                       centres, the top (m)
//	/canopy/frontal_area   static arrays, e.g. the frontal area per volume (1/m)
//	/snapshots/NNNNNN      one group per snapshot, NNNNNN counting from 000000;
//	                       attributes time (s), time_units, step, complete
//	/snapshots/NNNNNN/u    one dataset per field; attributes units, description,
//	                       long_name, location ("centre" or "face")
//	/snapshots/NNNNNN/velocity  Nz × Nx × 3: (u, w, 0) at the cell centres, when
//	                       u and w are among the fields; w is interpolated
//	                       linearly in z from the faces below and above
//	/snapshots/NNNNNN/x, z_centre, z_face, component
//	                       the snapshot's coordinates (below)
//	/x, /z_centre, /z_face, /component, /time
//	                       the root coordinates; time holds the times of the
//	                       complete snapshots (s)
//	/u, /w, /p, /velocity, …  one stack per snapshot field: (time, z, x) or
//	                       (time, z, x, component), virtual datasets that map
//	                       the snapshots' datasets without copying them
//	                       (attribute stacked_snapshots)
//
// A slab (the three-dimensional mode, periodic across the span) keeps
// this layout for the span averages of its fields, so every reader of a
// slice's file reads a slab's, and adds (slab.go):
//
//	/grid                  attribute width (Ly, m)
//	/grid/y                Ny spanwise positions (m), with the root coordinate /y
//	/grid/y_edges          Ny+1 edges of the cells around y (m)
//	/snapshots/NNNNNN/slab/NAME  each field in three dimensions at the cell
//	                       centres, Nz × Ny × Nx (z, y, x; face fields
//	                       interpolated to the centres), with v and the Q
//	                       criterion (attribute source names its definition)
//	/snapshots/NNNNNN/slab/velocity  Nz × Ny × Nx × 3: (u, v, w) at the centres
//
// and a third temporal collection "slab" in the sidecar: a 3DRectMesh of
// the solver's cells (x edges, y edges, faces) with every volume and the
// velocity vector, so a general viewer opens the volume unconverted.
//
// With Meta.Compress from 1 to 9, 2-D datasets are stored in chunks of
// whole rows (about 1 MiB) with the shuffle and deflate filters, which
// every HDF5 reader decodes; values stay exact.
//
// # Coordinates for general array tools
//
// The coordinates are HDF5 dimension scales (the high-level H5DS
// interface), which netCDF-4 reads as dimensions with their coordinate
// variables, h5py as dims and array libraries as coordinates. They carry
// the climate-and-forecast (CF) attributes units, long_name, axis (X, Z,
// T) and positive ("up") for heights; fields carry units and long_name.
// Every dataset of a snapshot, every stack, every static array of a
// mesh's shape and the /grid datasets are attached to the coordinates of
// their dimensions, so that netCDF tools name every dimension.
//
// netCDF requires a variable's dimensions to be visible from its group
// (its own or an ancestor), so the stacks' coordinates sit at the root.
// The datasets of a snapshot are attached to coordinates in their own
// group rather than to the root ones: a dimension scale lists every
// dataset attached to it in one attribute, which the earliest file format
// (kept for crash safety, below) limits to 64 KiB, about 4000 datasets,
// so root coordinates shared by all snapshots would stop a long run.
// These names are therefore reserved and refused as field names: x,
// z_centre, z_face, component, time and velocity.
//
// The stacks let array libraries open one field over time as one array
// with its coordinates (ncdump -h lists u(time, z_centre, x)).
// They and the time coordinate are rebuilt after each snapshot, after
// TruncateAfter and at every Open (which so also mends stacks that a kill
// left out of date), so they list exactly the complete snapshots; a field missing from some
// snapshots reads as NaN there. A field whose name is taken at the root
// by something else (a static group of that name) gets no stack. Each
// rebuild leaves the previous stacks' mapping lists behind as unused
// space in the file, which so grows with the square of the number of
// snapshots: on an 8 × 5 grid with 7 stacks, 0.7 MB more than format
// version 1 after 50 snapshots and 13 MB after 400, small beside the
// fields of a real grid at the snapshot counts of the example cases (30
// to 60).
//
// Files of format version 1 (without coordinates, velocity and stacks)
// are read as before; Open, on resume, brings them to version 2 in place
// without changing their values.
//
// # Surviving kills, full disks and read-only disks
//
// A run may be killed at any moment (SIGKILL, a node failure, the
// scheduler's time limit), and its disk may fill or turn read-only. The
// strategy:
//
//   - fields.h5 is never held open. Each write (the grid, a static array,
//     a snapshot, a truncation) opens the file, makes its change, flushes
//     (H5Fflush), closes it and syncs it to disk. Between writes the file
//     on disk is complete and readable; a process killed between writes
//     loses nothing, and the file is readable by any HDF5 tool.
//   - A snapshot group gets its attribute complete = 1 after all its
//     datasets (and before the stacks that map them are rebuilt, in the
//     same flush). A group without it, left by a process killed in the middle
//     of a write, is ignored by the readers and the sidecar here and removed
//     by Open on resume.
//   - Before a snapshot is written, the free space of the disk is checked
//     against its size (plus a margin); when it is short, the file is not
//     touched and the error says how much is needed, so a full disk does
//     not leave a half-written group behind. If a write fails all the same,
//     the partial group is removed before the file is closed.
//   - The file uses the earliest HDF5 file format the library allows
//     (superblock version 0), which keeps no "open for writing" mark: a file
//     whose writer died opens in h5dump, h5py and viewers without h5clear.
//   - Files are opened without HDF5 file locks: a viewer holding fields.h5
//     open does not stop the run, and cluster filesystems without flock
//     work. One run must therefore not share its folder with another
//     (the run driver keeps to one run per folder).
//   - A read-only disk fails at the open, before anything is changed, and
//     the error says so; what is on the disk stays readable.
//   - The XDMF sidecar is rewritten (atomically, by rename) after every
//     change, so it matches the complete snapshots even if Close never
//     runs; WriteXDMF rebuilds it from the HDF5 file at any time.
//
// HDF5 keeps the metadata of a change (group indexes, object headers) in
// memory until the flush at its end, so a kill before that flush leaves
// the file as it was before the change. The one window left uncovered is
// the flush itself, a few milliseconds per snapshot, during which HDF5
// updates metadata in place; checkpoints, written atomically, are not
// exposed to it.
//
// # fields.xmf
//
// The sidecar is an XDMF 3 spatial collection "fields" (GridType=
// "Collection", CollectionType="Spatial") of two temporal collections,
// "centre" and "face", each holding one uniform grid per snapshot with
// its Time and the collection's name, so that a mesh is selected by the
// same name at every time. The grid "centre" carries the centre fields,
// the static arrays of their shape, and the velocity as a Vector
// attribute (/snapshots/NNNNNN/velocity); the grid "face" carries the face
// fields. Each is a 2DRectMesh of whole cells with cell-centred values,
// one cell per value, so that the cells tile one period in x and the
// whole depth, [−Δx/2, Lx − Δx/2] × [0, H]: its VXVY geometry reads the
// nodes from /grid/x_edges and /grid/z_face (centre) or
// /grid/z_face_edges (face); the topology's dimensions are the node
// counts, "Nz+1 Nx+1" and "Nz+2 Nx+1", slowest first. A viewer so shows
// u, p, w and the vector on meshes that cover the slice, and probes and
// line plots find every value. The sidecar of a version 1 file has no
// cell edges to refer to: its meshes are the points, with node-centred
// values and no vector. Every reference is "fields.h5:/path", relative to
// the sidecar, so the run folder can be moved or copied whole.
//
// # Checkpoints
//
// WriteCheckpoint writes checkpoint-NNNNNNNNN.h5 (NNNNNNNNN the step
// count) atomically — a temporary file in the same folder, flushed,
// closed, synced, renamed, and the folder synced — and keeps the two
// newest. Each holds a SHA-256 checksum (see checksum for the byte order)
// over all its values, which ReadCheckpoint verifies: it takes the newest
// valid checkpoint and reports the damaged ones it passed over.
//
//	/                      attributes: format ("rollerbed checkpoint"), format_version,
//	                       case, version, written (RFC 3339), sha256
//	/scalars/time          s          /scalars/last_step   s
//	/scalars/gradient      m/s^2      /scalars/steps       integer
//	/arrays/NAME           1-D float64 arrays
//	/complex/NAME          n × 2 float64: real and imaginary parts
//	/ints/NAME             scalar 64-bit integers
//
// Values read back equal those written bit for bit.
//
// All HDF5 calls of this package are serialised by one lock, so the
// functions may be called from several goroutines; a Fields value itself
// is for one goroutine at a time.
//
// # Its own binding to libhdf5
//
// The package calls libhdf5 (found by pkg-config) through a small binding
// of its own: binding.c holds the C side (one function per
// operation, each cleaning up after itself), binding.h declares it and
// binding.go is the Go side. It binds HDF5 itself rather than through an
// existing Go package because it needs:
//
//   - file locking off per file (H5Pset_file_locking, in HDF5 1.10.7 and
//     from 1.12.1 on), so that a viewer holding fields.h5 open does not
//     stop a run and filesystems without flock work; with older libraries
//     the package sets HDF5's own switch HDF5_USE_FILE_LOCKING=FALSE
//     before its first open instead, unless the user has set it;
//   - the shuffle filter before deflate for compressed snapshots;
//   - virtual datasets (HDF5 1.10 on) and dimension scales (the
//     high-level library libhdf5_hl, which Debian's libhdf5-dev ships
//     beside libhdf5);
//   - HDF5's own error text (the innermost and outermost messages of the
//     library's error stack) in every error, instead of a bare status;
//
// and gonum's binding (gonum.org/v1/hdf5) supports only the HDF5 1.8
// interface and has been unmaintained since 2021.
package h5
