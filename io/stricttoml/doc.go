// Package stricttoml reads the project's TOML files (case files and sweep
// files) strictly, and reports every mistake at once with the key, the
// value as written, the line and the fix.
//
// A file kind describes itself with a Format (what the file is called,
// where a correct one is found) and a struct with toml tags. Format.Read
// checks the syntax with github.com/BurntSushi/toml and finds the line of
// every key with this package's own scanner (Scan); Document.Decode then
// walks the struct's schema (SchemaOf) over the decoded map:
//
//   - Keys are matched exactly (case-sensitive). A key that is not in the
//     schema is a problem, with a suggestion when a known key is close to
//     it (edit distance) or the same key belongs in another table.
//   - A value of the wrong TOML type is a problem (nx = "256", nx = 256.0).
//     Integers are accepted where a float is expected.
//   - Arrays of tables ([[t]] or inline [{...}]), arrays of strings, of
//     integers and of rows of numbers are decoded element by element;
//     problems name elements from 0, t[1].key, and give the element's line.
//   - A field of type any takes the decoded value as it is, for the file
//     kind to check.
//
// The file kind then checks its values through the Problems collector
// (Positive, IntRange, OneOf, Require, OnlyWith, ...) and returns
// Problems.Err: nil or an *Errors, one *Problem per line, sorted by line.
//
// # Why a scanner of its own
//
// The TOML library decodes straight into structs only case-insensitively
// (NX would fill nx) and stops at the first type mismatch, and it keeps the
// positions of keys in unexported metadata. So the text is decoded into a
// generic map, and the lines of keys come from Scan, which follows table
// headers, arrays of tables, dotted and quoted keys, inline tables, arrays
// and multi-line strings and skips comments. Each element of an array is
// placed too, as key[0], key[1], ..., at the line where it starts. A key
// the file does not hold (a missing required key, a default) is reported
// at the line of its table header when the table is present. The fuzz test
// holds the scanner to the library's MetaData.Keys.
//
// # Nesting
//
// The TOML library's time and memory grow with the square of the nesting
// depth (20 000 nested inline tables take minutes and tens of GB). Read
// scans first and refuses text that nests tables, arrays and dotted keys
// more than MaxDepth (128) levels deep, naming the line; the scan itself is
// linear in the length of the text.
package stricttoml
