package runs

import (
	"os"
	"runtime/debug"
	"strconv"
	"strings"
	"unicode"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/solver/transform"
)

// Version is the program version written into every run folder (fields.h5,
// checkpoints, summary.json) and printed by `rollerbed version`.
const Version = "0.2.0"

// unknown is the value of a provenance fact that cannot be known.
const unknown = "unknown"

// Provenance gathers what made this process's output: the program
// version; the build's version-control revision, its commit time and
// whether the tree held uncommitted changes ("unknown" for each when the
// binary was built without version-control stamping, as by `go run` or
// `go test`); the Go toolchain; the HDF5 library in use (as it reports
// itself at run time); the FFTW library linked ("not linked" without cgo);
// the host name; and the command line. Every fact is filled, with
// "unknown" where it cannot be had.
func Provenance() runfolder.Provenance {
	p := runfolder.Provenance{
		Version:      Version,
		Revision:     unknown,
		RevisionTime: unknown,
		Modified:     unknown,
		GoVersion:    unknown,
		FFTW:         transform.FFTWVersion(),
		Host:         unknown,
		CommandLine:  CommandLine(os.Args),
	}
	if bi, ok := debug.ReadBuildInfo(); ok {
		setBuild(&p, bi)
	}
	p.HDF5, _ = h5.LibraryVersion()
	if h, err := os.Hostname(); err == nil && h != "" {
		p.Host = h
	}
	return p
}

// CommandLine joins args with spaces, quoting (Go syntax, strconv.Quote)
// each argument that is empty or holds a space, a quote, a backslash or a
// character that does not print, so that the line reads back into the
// same arguments.
func CommandLine(args []string) string {
	out := make([]string, len(args))
	for i, a := range args {
		if a == "" || strings.ContainsFunc(a, needsQuote) {
			a = strconv.Quote(a)
		}
		out[i] = a
	}
	return strings.Join(out, " ")
}

func needsQuote(r rune) bool {
	return unicode.IsSpace(r) || r == '"' || r == '\'' || r == '\\' || !unicode.IsPrint(r)
}

// setBuild fills the toolchain and the version-control facts of p from the
// build information bi, leaving those it lacks as they are.
func setBuild(p *runfolder.Provenance, bi *debug.BuildInfo) {
	if bi.GoVersion != "" {
		p.GoVersion = bi.GoVersion
	}
	for _, s := range bi.Settings {
		if s.Value == "" {
			continue
		}
		switch s.Key {
		case "vcs.revision":
			p.Revision = s.Value
		case "vcs.time":
			p.RevisionTime = s.Value
		case "vcs.modified":
			p.Modified = s.Value
		}
	}
}
