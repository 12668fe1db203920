package casefile

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strings"
)

const templateHeader = `# rollerbed case file
#
# One run of rollerbed: a two-dimensional large-eddy simulation of a vertical
# x-z slice of water or air. x runs downstream and is periodic; z runs up from
# the bed (z = 0) to the top of the domain (z = depth).
#
# All values are SI: lengths in m, times in s, velocities in m/s, kinematic
# viscosity in m²/s, pressure gradients in m/s². Keys are case-sensitive, and
# a key that rollerbed does not know is an error, so a typo is never silently
# ignored. A commented-out key shows its default or an example; remove the #
# to set it.
#
# Demo scenario (invented for this template): a tidal seagrass meadow. An
# open channel of seawater 2 m long and 0.5 m deep over a rough bed, with a
# meadow of flat blades 0.25 m tall covering the bed, driven by a slope and
# started from the drag-balanced profile with small random perturbations at
# the canopy top, where the shear layer rolls up into vortices.

# Free text describing the run, copied into the outputs. Optional.
title = "Tidal seagrass meadow in a seawater channel (demo)"
`

// Template returns a fully commented case file that documents every key
// (meaning, unit, default and allowed range) and sets up a demo run of its
// own: a tidal seagrass meadow, flat blades 0.25 m tall in an open channel
// of seawater 2 m long and 0.5 m deep. Parse accepts it as it is.
func Template() string {
	var b strings.Builder
	b.WriteString(templateHeader)
	for _, s := range sections {
		b.WriteString("\n")
		b.WriteString(s.template())
	}
	return b.String()
}

// WriteTemplate writes Template to a new file at path. It never overwrites:
// if path exists it returns an error that says so.
func WriteTemplate(path string) (err error) {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		if errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("%s already exists and was left as it is; choose another file name, or move the existing file away first", path)
		}
		return fmt.Errorf("writing case template: %w", err)
	}
	defer func() {
		if cerr := f.Close(); err == nil && cerr != nil {
			err = fmt.Errorf("writing case template: %w", cerr)
		}
		if err != nil {
			os.Remove(path) // the file is ours and incomplete
		}
	}()
	if _, err := f.WriteString(Template()); err != nil {
		return fmt.Errorf("writing case template: %w", err)
	}
	return nil
}
