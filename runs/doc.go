// Package runs holds the example case files of the project (embedded in the
// binary, so the demo and `rollerbed init` need no files on disk) and drives
// runs: it turns a checked case into a solver, sets the initial state, steps
// to the end while reporting progress, and writes the run folder.
package runs
