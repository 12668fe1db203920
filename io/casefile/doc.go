// Package casefile reads rollerbed case files: TOML documents that describe
// one run (the slice and its grid, the fluid, the bed and top boundaries, what
// drives the flow, the initial state, the time span, numerics and output).
//
// Parse and Load are strict. They report every problem they find in one
// error of type *Errors, one *Problem per line, each naming the key, the
// value as written, the allowed range and the fix, and the line of the case
// file where the key sits:
//
//	case file line 12: domain.nz = 3: must be an integer from 8 to 8192 (cells along z); use at least 8, e.g. nz = 64
//
// Rules:
//
//   - TOML syntax errors give a single problem with the line and column that
//     the TOML library reports.
//   - Keys are matched exactly (case-sensitive). A key that is not in the
//     schema is an error, with a suggestion when a known key is close to it
//     (edit distance) or the same key belongs in another table.
//   - A value of the wrong TOML type is an error (nx = "256", nx = 256.0).
//     Integers are accepted where a float is expected.
//   - Required keys that are missing are errors; optional keys get their
//     documented defaults, some derived from other keys (for example
//     domain.cluster.bed_width defaults to domain.depth/10). The *Case that
//     Parse returns has every default filled in.
//   - Keys that only make sense with another setting are errors without it
//     (bed.roughness without bed.condition = "rough").
//
// All values are SI: lengths in m, times in s, velocities in m/s, kinematic
// viscosity in m²/s, the kinematic pressure gradient in m/s².
//
// # How the file is decoded
//
// The TOML text is parsed by github.com/BurntSushi/toml into a generic map,
// and this package walks its own schema (the toml tags of Case and its
// section structs) over that map. It does not decode straight into the
// structs because the library then matches keys case-insensitively (NX
// would fill nx and not count as undecoded, so MetaData.Undecoded cannot
// catch it) and stops at the first type mismatch, while a case file should
// get all its problems reported at once. Unknown keys are the map keys that
// the schema walk does not consume, which is what MetaData.Undecoded would
// give for an exact-match decoder.
//
// # Line numbers
//
// The TOML library (v1.6.0) records key positions only in unexported
// metadata and exposes them only inside its own errors. Line numbers of keys
// therefore come from a small scanner in this package (positions.go) that
// runs over text the library has already accepted. It follows table
// headers, arrays of tables, dotted and quoted keys, inline tables, arrays
// and multi-line strings, and skips comments, so a key inside a comment or a
// string never matches. A key the file does not contain (a missing required
// key, a default) is reported at the line of its table header when the
// table is present, and without a line otherwise.
//
// # Adding a section
//
// A section is one struct with toml tags (a field of Case), one check
// function that applies its defaults and validates it through the problems
// collector (problems.go: positive, atLeast, floatRange, intRange, oneOf,
// ...), and one block of the template, all in one file; the section is then
// listed in the sections table in casefile.go. TestTemplateMentionsEveryKey
// fails until the template documents each new key.
package casefile
