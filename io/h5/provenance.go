package h5

import (
	"strings"
	"time"
)

// Resume is one continuation of a run, as OpenToResume records it.
type Resume struct {
	Time        time.Time // wall-clock time of the resume
	CommandLine string    // the resuming process's command line
}

// resumedAttr is the root attribute that lists the resumes.
const resumedAttr = "resumed"

// readResumes reads the resumed attribute (see parseResumes).
func readResumes(f *file) []Resume {
	text, err := f.getString("/", resumedAttr)
	if err != nil {
		return nil
	}
	return parseResumes(text)
}

// parseResumes reads the text of the resumed attribute: a line per resume,
// the time (RFC 3339), a space and the command line. Lines that do not
// start with a time are left out.
func parseResumes(text string) []Resume {
	var rs []Resume
	for line := range strings.Lines(text) {
		at, cmd, _ := strings.Cut(strings.TrimSuffix(line, "\n"), " ")
		t, err := time.Parse(time.RFC3339, at)
		if err != nil {
			continue
		}
		rs = append(rs, Resume{Time: t, CommandLine: cmd})
	}
	return rs
}

// line is r as a line of the resumed attribute.
func (r Resume) line() string {
	return r.Time.Format(time.RFC3339) + " " + r.CommandLine + "\n"
}

// addResume appends r to the resumed attribute of f.
func addResume(f *file, r Resume) error {
	text, _ := f.getString("/", resumedAttr)
	return f.setString("/", resumedAttr, text+r.line())
}
