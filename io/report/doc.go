// Package report writes the analysis files of a run folder: summary.json,
// CSV tables of profiles and time series. Files are written atomically
// (temporary file, fsync, rename), so a reader never sees half a file and an
// interrupted write leaves the previous version in place.
package report
