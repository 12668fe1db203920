// Package diskspace tells how many bytes a folder's disk still has room
// for, so that a run can refuse a write that would not fit (and `rollerbed
// check` can compare the expected output with the room left), and writes
// byte counts for people.
//
// Free uses statfs(2) on Linux, macOS and FreeBSD; elsewhere it reports
// that it cannot tell, and callers go ahead and report a failed write
// instead.
package diskspace
