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
//	/                      attributes: format ("rollerbed fields"), format_version,
//	                       title, version, case (the full case text), seed,
//	                       started (RFC 3339), compression (deflate level)
//	/grid                  attributes: length (Lx, m), height (H, m), units, description
//	/grid/x                Nx streamwise positions (m)
//	/grid/z_centre         heights of the cell centres (m), where u, p and scalars sit
//	/grid/z_face           heights of the cell faces (m), where w sits
//	/canopy/frontal_area   static arrays, e.g. the frontal area per volume (1/m)
//	/snapshots/NNNNNN      one group per snapshot, NNNNNN counting from 000000;
//	                       attributes time (s), time_units, step, complete
//	/snapshots/NNNNNN/u    one dataset per field; attributes units,
//	                       description, location ("centre" or "face")
//
// With Meta.Compress from 1 to 9, 2-D datasets are stored in chunks of
// whole rows (about 1 MiB) with the shuffle and deflate filters, which
// every HDF5 reader decodes; values stay exact.
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
//     datasets. A group without it, left by a process killed in the middle
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
// The sidecar is an XDMF 3 temporal collection (GridType="Collection",
// CollectionType="Temporal") with one spatial collection per snapshot
// holding its Time. In it, a uniform grid "centre" carries the centre
// fields on the (x, z_centre) mesh and a uniform grid "face" the face
// fields on the (x, z_face) mesh: each a 2DRectMesh topology of
// dimensions "Nz Nx" (slowest first) with a VXVY geometry read from
// /grid/x and /grid/z_centre or /grid/z_face. Fields are node-centred
// scalars; static arrays of a mesh's shape appear in every time step.
// Every reference is "fields.h5:/path", relative to the sidecar, so the
// run folder can be moved or copied whole.
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
//   - HDF5's own error text (the innermost and outermost messages of the
//     library's error stack) in every error, instead of a bare status;
//
// and gonum's binding (gonum.org/v1/hdf5) supports only the HDF5 1.8
// interface and has been unmaintained since 2021.
package h5
