// Package casefile reads rollerbed case files: TOML documents that describe
// one run (the slice and its grid, the fluid, the bed and top boundaries, the
// canopy, the subgrid closure, the passive scalars, what drives the flow,
// the initial state, the time span, numerics and output).
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
//   - Text that nests tables, arrays and dotted keys more than 128 levels
//     deep (stricttoml.MaxDepth) gives a single problem with its line,
//     before the TOML library parses it.
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
//     (bed.roughness without bed.condition = "rough", turbulence.smagorinsky
//     without the Smagorinsky closure).
//   - A table that is optional as a whole, [canopy], is a pointer in Case:
//     nil when the file has no such table. An array of tables that may be
//     absent, [[scalar]], is a slice: nil when the file has none.
//   - Rows of numbers (canopy.profile = [[z, a], ...]), arrays of strings
//     (output.fields = ["u", "w"]) and arrays of tables ([[canopy.patch]],
//     or inline [{...}, {...}]) are decoded element by element. Problems
//     name elements from 0, canopy.profile[2], output.fields[1] or
//     canopy.patch[1].start, and give the line of the element itself.
//   - A list whose allowed entries depend on the case (output.fields) takes
//     them from a method of Case (Case.FieldNames), so that a later section
//     can add to them: each [[scalar]] adds its name.
//   - File names in a case (canopy.profile_file) are relative to the folder
//     of the case file; Load stores them resolved, Parse as written.
//
// All values are SI: lengths in m, times in s, velocities in m/s, kinematic
// viscosity and diffusivities in m²/s, the kinematic pressure gradient in
// m/s², frontal area per unit volume in 1/m, drag rates in 1/s, uptake
// capacities in m/s. Concentrations of a scalar are in a unit the user
// chooses for it (mol/m³, for example; "unit"), its fluxes in unit·m/s and
// its sources in unit/s.
//
// An uptake capacity may be inf (TOML's infinity), a perfect sink; it is
// the one place where a case holds an infinite value.
//
// # How the file is decoded
//
// Case files and sweep files are read by one strict-TOML reader,
// rollerbed/io/stricttoml: it checks the syntax, refuses absurd nesting,
// finds the line of every key with its own scanner (the TOML library keeps
// key positions unexported), and walks the schema of Case (its toml tags)
// over the decoded document, so that keys match exactly, unknown keys and
// values of the wrong type are all reported, with suggestions. This
// package holds what is particular to case files: the sections, their
// checks and defaults, and the template. A key the file does not contain
// (a missing required key, a default) is reported at the line of its table
// header when the table is present, and without a line otherwise.
//
// Names of things another package owns are checked against that package's
// list: uptake laws against canopy.ElementTransfers, transform backends
// against transform.Names.
//
// # Adding a section
//
// A section is one struct with toml tags (a field of Case; a pointer to the
// struct when the whole table is optional), one check
// function that applies its defaults and validates it through the problems
// collector (stricttoml.Problems: Positive, AtLeast, FloatRange, IntRange,
// OneOf, ...), and one block of the template, all in one file; the section
// is then listed in the sections table in casefile.go. The schema walk
// knows strings, integers, floats, booleans, tables (structs and pointers
// to them), arrays of tables (slices of structs), rows of floats (slices of
// [N]float64, with a row tag such as `row:"[z, a]"` for the messages) and
// arrays of strings ([]string); see package stricttoml for the rest. A
// string key that holds a file name relative to the case file is tagged
// `path:"relative"`: Load, runs.FromCase and sweep plans resolve it
// (FileKeys, ResolvePath).
//
// TestTemplateMentionsEveryKey fails until the template documents each new
// key.
package casefile
