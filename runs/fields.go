package runs

import (
	"errors"
	"fmt"
	"io/fs"

	"os"
	"path/filepath"
	"strings"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
)

// createFields makes a new fields.h5 in the run folder with the grid and
// the canopy arrays.
func (r *run) createFields() error {
	path := filepath.Join(r.opt.Dir, runfolder.FieldsFile)
	var err error
	r.fields, err = h5.Create(path, h5.Meta{Title: r.sp.Title, Version: Version, CaseText: r.sp.CaseText,
		Seed: r.sp.Initial.Seed, Compress: r.sp.Output.Compress, Provenance: Provenance()})
	if err != nil {
		return err
	}
	g := r.s.Grid()
	gi := h5.GridInfo{X: g.X, Zc: g.Zc, Zf: g.Zf, Lx: g.Lx, H: g.H}
	span := ""
	if g.Ny > 1 {
		gi.Ly = g.Ly
		for j := range g.Ny {
			gi.Y = append(gi.Y, g.Y(j))
		}
		span = ", averaged across the span"
	}
	if err := r.fields.WriteGrid(gi); err != nil {
		return err
	}
	if r.sp.Canopy != nil {
		m := canopyMesh(g)
		if err := r.fields.WriteStatic("canopy/frontal_area", spanAverage(r.sp.Canopy.OnGrid(m), g.Nz, g.Ny, g.Nx), g.Nz, g.Nx, "1/m",
			"canopy frontal area per unit volume a at the cell centres"+span); err != nil {
			return err
		}
		if err := r.fields.WriteStatic("canopy/surface_area", spanAverage(r.sp.Canopy.SurfaceArea(m), g.Nz, g.Ny, g.Nx), g.Nz, g.Nx, "1/m",
			"element surface area per unit volume a_s at the cell centres"+span); err != nil {
			return err
		}
	}
	return nil
}

// reopenFields opens the run folder's fields.h5 to continue it from a
// checkpoint at simulated time tcp (s). It first reads back every value the
// run will keep, the grid and each snapshot up to tcp, so a damaged block
// is found now rather than by a later reader. A fields file that is
// missing, cut short or damaged is rebuilt: the damaged file is moved
// aside, a new one is made from the checkpoint's case, and every snapshot
// of the old one that still reads whole is copied into it. What was lost is
// said in a warning.
func (r *run) reopenFields(tcp float64, res *Result) error {
	path := filepath.Join(r.opt.Dir, runfolder.FieldsFile)
	bad := damage(path, tcp)
	if bad == "" {
		var err error
		r.fields, err = h5.OpenToResume(path, h5.Resume{Time: time.Now(), CommandLine: CommandLine(os.Args)})
		return err
	}
	aside := ""
	if _, err := os.Lstat(path); err == nil {
		aside = path + ".damaged-" + time.Now().UTC().Format("20060102T150405")
		if err := os.Rename(path, aside); err != nil {
			return fmt.Errorf("%s %s, and it cannot be moved aside to rebuild it: %w", path, bad, err)
		}
		os.Remove(h5.SidecarPath(path))
	}
	if err := r.createFields(); err != nil {
		return err
	}
	kept, lost := 0, []string{}
	if aside != "" {
		kept, lost = salvage(aside, r.fields, tcp)
	}
	w := fmt.Sprintf("%s %s: rebuilt from the checkpoint at t = %.6g s, with %d snapshot(s) copied from the old file", runfolder.FieldsFile, bad, tcp, kept)
	switch {
	case aside == "":
		w += "; the snapshots before the checkpoint are lost"
	case len(lost) > 0:
		w += fmt.Sprintf("; lost the snapshot(s) at t = %s s", strings.Join(lost, ", "))
	}
	if aside != "" {
		w += "; the old file is kept as " + filepath.Base(aside)
	}
	res.Warnings = append(res.Warnings, w)
	r.log.printf("warning: %s", w)
	return nil
}

// damage says what is wrong with the fields file at path for a resume from
// time tcp ("is missing", "cannot be read: …"), or "" when the grid and
// every snapshot up to tcp read back whole.
func damage(path string, tcp float64) string {
	if _, err := os.Stat(path); errors.Is(err, fs.ErrNotExist) {
		return "is missing"
	}
	if _, err := h5.ReadGrid(path); err != nil {
		return "cannot be read (" + oneLine(err) + ")"
	}
	snaps, err := h5.ListSnapshots(path)
	if err != nil {
		return "cannot be read (" + oneLine(err) + ")"
	}
	for _, s := range snaps {
		if s.Time > tcp*(1+1e-12) {
			continue // TruncateAfter removes it anyway
		}
		for _, fi := range s.Fields {
			if _, err := h5.ReadField(path, s.Group+"/"+fi.Name); err != nil {
				return fmt.Sprintf("is damaged: %s/%s (t = %.6g s) does not read back (%s)", s.Group, fi.Name, s.Time, oneLine(err))
			}
		}
		for _, fi := range s.Volumes {
			if _, err := h5.ReadVolume(path, s.Index, fi.Name); err != nil {
				return fmt.Sprintf("is damaged: %s/slab/%s (t = %.6g s) does not read back (%s)", s.Group, fi.Name, s.Time, oneLine(err))
			}
		}
	}
	return ""
}

// salvage copies into fl every snapshot of the file at old, up to time tcp,
// whose fields all read back whole, and returns how many it copied and the
// times of those it could not.
func salvage(old string, fl *h5.Fields, tcp float64) (kept int, lost []string) {
	snaps, err := h5.ListSnapshots(old)
	if err != nil {
		return 0, nil
	}
	for _, s := range snaps {
		if s.Time > tcp*(1+1e-12) {
			continue
		}
		var fs []h5.Field
		ok := true
		for _, fi := range s.Fields {
			f, err := h5.ReadField(old, s.Group+"/"+fi.Name)
			if err != nil {
				ok = false
				break
			}
			fs = append(fs, f)
		}
		// A slab's volumes; WriteSlabSnapshot makes the velocity vector
		// again from u, v and w.
		var vs []h5.Volume
		for _, fi := range s.Volumes {
			if !ok {
				break
			}
			v, err := h5.ReadVolume(old, s.Index, fi.Name)
			ok = err == nil
			vs = append(vs, v)
		}
		write := func() error { return fl.WriteSnapshot(s.Time, s.Step, fs) }
		if len(vs) > 0 {
			write = func() error { return fl.WriteSlabSnapshot(s.Time, s.Step, fs, vs) }
		}
		if ok && write() == nil {
			kept++
		} else {
			lost = append(lost, fmt.Sprintf("%.6g", s.Time))
		}
	}
	return kept, lost
}

// oneLine shortens an error to one line of at most 200 characters.
func oneLine(err error) string {
	s := strings.Join(strings.Fields(err.Error()), " ")
	if len(s) > 200 {
		s = s[:200] + "…"
	}
	return s
}
