package h5

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"slices"
	"strconv"
	"strings"
	"time"
)

// Checkpoint is everything a run needs to continue bit for bit: the
// solver's scalars and a generic set of named arrays. The solver's state
// maps onto it as Arrays "u", "w", "dudx", "dwdx" (m/s, 1/s) and Complex
// "pressure" (the Fourier coefficients of p); scalars and running
// statistics add arrays of their own names.
type Checkpoint struct {
	Time     float64 // s, simulated time
	Steps    int     // steps taken; names the file
	LastStep float64 // s, size of the last step
	Gradient float64 // m/s², the mean pressure gradient Π
	CaseText string  // the case file text the run was started with
	Version  string  // program version that wrote it

	Arrays  map[string][]float64
	Complex map[string][]complex128
	Ints    map[string]int64

	// Warnings is filled by ReadCheckpoint: the newer checkpoints it
	// passed over because they were damaged, and why. It is not written.
	Warnings []string
}

// ErrNoCheckpoint is wrapped by ReadCheckpoint's error when the folder
// holds no checkpoint file at all.
var ErrNoCheckpoint = errors.New("no checkpoint")

// Checkpoint file layout.
const (
	checkpointFormat  = "rollerbed checkpoint"
	checkpointVersion = 1
	checksumAttr      = "sha256"
	checksumDomain    = "rollerbed checkpoint v1\x00"

	ckTime     = "/scalars/time"
	ckSteps    = "/scalars/steps"
	ckLastStep = "/scalars/last_step"
	ckGradient = "/scalars/gradient"
	ckArrays   = "/arrays"
	ckComplex  = "/complex"
	ckInts     = "/ints"

	// keepCheckpoints is how many checkpoints WriteCheckpoint leaves.
	keepCheckpoints = 2
)

// CheckpointPath returns the file WriteCheckpoint writes for a checkpoint
// after steps steps: dir/checkpoint-NNNNNNNNN.h5.
func CheckpointPath(dir string, steps int) string {
	return filepath.Join(dir, fmt.Sprintf("%s%09d%s", runfolder.CheckpointPrefix, steps, runfolder.CheckpointSuffix))
}

// WriteCheckpoint writes cp to CheckpointPath(dir, cp.Steps) atomically:
// into a temporary file in dir, which is flushed, closed, synced to disk
// and renamed over the final name, and then the folder is synced. A crash
// at any moment leaves either the complete new checkpoint or none of it.
// After the write, only the new checkpoint and the newest older one are
// kept; others, and checkpoints of later steps left from an abandoned
// continuation, are removed. dir must exist.
func WriteCheckpoint(dir string, cp *Checkpoint) error {
	if cp == nil {
		panic("h5: WriteCheckpoint of a nil checkpoint")
	}
	final := CheckpointPath(dir, cp.Steps)
	if err := checkCheckpoint(cp); err != nil {
		return fmt.Errorf("h5: checkpoint %s: %v", final, err)
	}
	if err := checkFolder(dir, final); err != nil {
		return err
	}
	need := int64(1 << 16)
	for _, a := range cp.Arrays {
		need += int64(8*len(a)) + 1024
	}
	for _, a := range cp.Complex {
		need += int64(16*len(a)) + 1024
	}
	if err := checkSpace(dir, need, "checkpoint "+filepath.Base(final)); err != nil {
		return err
	}
	tf, err := os.CreateTemp(dir, "."+filepath.Base(final)+".tmp-*")
	if err != nil {
		return fmt.Errorf("h5: cannot write a checkpoint in %s: %v; make the folder writable (or choose another run folder)", dir, err)
	}
	tmp := tf.Name()
	tf.Close()
	fail := func(err error) error {
		os.Remove(tmp)
		return fmt.Errorf("h5: writing checkpoint %s failed: %v; earlier checkpoints are intact: free disk space or fix the permissions", final, err)
	}
	sum := checksum(cp)
	if err := writeCheckpointFile(tmp, cp, hex.EncodeToString(sum[:])); err != nil {
		return fail(err)
	}
	if err := os.Chmod(tmp, 0o644); err != nil {
		return fail(err)
	}
	if err := runfolder.SyncFile(tmp); err != nil {
		return fail(err)
	}
	if err := os.Rename(tmp, final); err != nil {
		return fail(err)
	}
	if err := runfolder.SyncDir(dir); err != nil {
		return fmt.Errorf("h5: checkpoint %s written, but syncing its folder failed: %v", final, err)
	}
	if err := pruneCheckpoints(dir, cp.Steps); err != nil {
		return fmt.Errorf("h5: checkpoint %s written, but removing older ones failed: %v; remove them by hand", final, err)
	}
	return nil
}

func checkCheckpoint(cp *Checkpoint) error {
	if cp.Steps < 0 {
		return fmt.Errorf("step count %d < 0", cp.Steps)
	}
	if strings.IndexByte(cp.CaseText+cp.Version, 0) >= 0 {
		return errors.New("the case text or version holds a NUL byte, which HDF5 strings cannot carry")
	}
	for _, names := range [][]string{mapKeys(cp.Arrays), mapKeys(cp.Complex), mapKeys(cp.Ints)} {
		for _, n := range names {
			if err := checkName(n); err != nil {
				return fmt.Errorf("array %v", err)
			}
		}
	}
	return nil
}

// mapKeys returns the keys of m in sorted order.
func mapKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	return keys
}

func writeCheckpointFile(path string, cp *Checkpoint, sum string) error {
	defer enter()()
	f, err := createFile(path, false)
	if err != nil {
		return err
	}
	defer f.close()
	for _, a := range []struct{ name, value string }{
		{"format", checkpointFormat},
		{"case", cp.CaseText},
		{"version", cp.Version},
		{"written", time.Now().UTC().Format(time.RFC3339)},
		{checksumAttr, sum},
	} {
		if err := f.setString("/", a.name, a.value); err != nil {
			return err
		}
	}
	if err := f.setInt("/", "format_version", checkpointVersion); err != nil {
		return err
	}
	for _, s := range []struct {
		path, units string
		v           float64
	}{{ckTime, "s", cp.Time}, {ckLastStep, "s", cp.LastStep}, {ckGradient, "m/s^2", cp.Gradient}} {
		if err := f.writeF64(s.path, []float64{s.v}, nil, 0); err != nil {
			return err
		}
		if err := f.setString(s.path, "units", s.units); err != nil {
			return err
		}
	}
	if err := f.writeI64(ckSteps, int64(cp.Steps)); err != nil {
		return err
	}
	for _, g := range []string{ckArrays, ckComplex, ckInts} {
		if err := f.createGroup(g); err != nil {
			return err
		}
	}
	for _, n := range mapKeys(cp.Arrays) {
		a := cp.Arrays[n]
		if err := f.writeF64(ckArrays+"/"+n, a, []int{len(a)}, 0); err != nil {
			return err
		}
	}
	for _, n := range mapKeys(cp.Complex) {
		c := cp.Complex[n]
		pairs := make([]float64, 2*len(c))
		for i, v := range c {
			pairs[2*i], pairs[2*i+1] = real(v), imag(v)
		}
		p := ckComplex + "/" + n
		if err := f.writeF64(p, pairs, []int{len(c), 2}, 0); err != nil {
			return err
		}
		if err := f.setString(p, "layout", "one row per value: real part, imaginary part"); err != nil {
			return err
		}
	}
	for _, n := range mapKeys(cp.Ints) {
		if err := f.writeI64(ckInts+"/"+n, cp.Ints[n]); err != nil {
			return err
		}
	}
	if err := f.flush(); err != nil {
		return err
	}
	return f.close()
}

// checksum is the SHA-256 of, in order: the bytes "rollerbed checkpoint
// v1\0"; Time, LastStep, Gradient as IEEE 754 bits and Steps, each as 8
// little-endian bytes; CaseText and Version, each as its byte length (8
// bytes) and bytes; then Arrays, Complex and Ints, each as the number of
// entries (8 bytes) and, in byte order of the names, the name (length and
// bytes), the number of values (8 bytes, not for Ints) and the values
// (float bits, real then imaginary part for complex, as 8 little-endian
// bytes each).
func checksum(cp *Checkpoint) [32]byte {
	w := sumWriter{h: sha256.New()}
	w.buf = append(w.buf, checksumDomain...)
	w.u64(math.Float64bits(cp.Time))
	w.u64(math.Float64bits(cp.LastStep))
	w.u64(math.Float64bits(cp.Gradient))
	w.u64(uint64(int64(cp.Steps)))
	w.str(cp.CaseText)
	w.str(cp.Version)
	w.u64(uint64(len(cp.Arrays)))
	for _, n := range mapKeys(cp.Arrays) {
		a := cp.Arrays[n]
		w.str(n)
		w.u64(uint64(len(a)))
		for _, v := range a {
			w.u64(math.Float64bits(v))
		}
	}
	w.u64(uint64(len(cp.Complex)))
	for _, n := range mapKeys(cp.Complex) {
		c := cp.Complex[n]
		w.str(n)
		w.u64(uint64(len(c)))
		for _, v := range c {
			w.u64(math.Float64bits(real(v)))
			w.u64(math.Float64bits(imag(v)))
		}
	}
	w.u64(uint64(len(cp.Ints)))
	for _, n := range mapKeys(cp.Ints) {
		w.str(n)
		w.u64(uint64(cp.Ints[n]))
	}
	w.flush()
	var out [32]byte
	w.h.Sum(out[:0])
	return out
}

// sumWriter feeds a hash through a buffer.
type sumWriter struct {
	h   hash.Hash
	buf []byte
}

func (w *sumWriter) u64(v uint64) {
	w.buf = binary.LittleEndian.AppendUint64(w.buf, v)
	if len(w.buf) >= 1<<16 {
		w.flush()
	}
}

func (w *sumWriter) str(s string) {
	w.u64(uint64(len(s)))
	w.buf = append(w.buf, s...)
}

func (w *sumWriter) flush() {
	w.h.Write(w.buf)
	w.buf = w.buf[:0]
}

// ReadCheckpoint reads the newest valid checkpoint in dir and returns it
// with the file it came from. A checkpoint is valid when it opens, holds
// everything a checkpoint holds, and its contents match its checksum.
// Newer checkpoints that are damaged are passed over, each with a line in
// the returned checkpoint's Warnings. With no checkpoint file the error
// wraps ErrNoCheckpoint; with only damaged ones it lists what is wrong
// with each.
func ReadCheckpoint(dir string) (*Checkpoint, string, error) {
	files, err := listCheckpoints(dir)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, "", fmt.Errorf("h5: the checkpoint folder %s does not exist; check the run folder path, or start the run afresh: %w", dir, ErrNoCheckpoint)
		}
		return nil, "", fmt.Errorf("h5: cannot list checkpoints in %s: %v", dir, err)
	}
	if len(files) == 0 {
		return nil, "", fmt.Errorf("h5: no checkpoint in %s (no checkpoint-NNNNNNNNN.h5 file); start the run afresh instead of resuming: %w", dir, ErrNoCheckpoint)
	}
	var damaged []string
	for i := len(files) - 1; i >= 0; i-- {
		cp, err := readCheckpointFile(files[i].path)
		if err != nil {
			damaged = append(damaged, fmt.Sprintf("%s is damaged: %v", filepath.Base(files[i].path), err))
			continue
		}
		for _, d := range damaged {
			cp.Warnings = append(cp.Warnings, d+"; resuming from "+filepath.Base(files[i].path)+" instead")
		}
		return cp, files[i].path, nil
	}
	return nil, "", fmt.Errorf("h5: no valid checkpoint in %s: %s; start the run afresh (or restore the folder from a backup)", dir, strings.Join(damaged, "; "))
}

type checkpointFile struct {
	steps int64
	path  string
}

// listCheckpoints returns the checkpoint files in dir, oldest step first.
func listCheckpoints(dir string) ([]checkpointFile, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	var out []checkpointFile
	for _, e := range entries {
		if s, ok := checkpointSteps(e.Name()); ok && e.Type().IsRegular() {
			out = append(out, checkpointFile{steps: s, path: filepath.Join(dir, e.Name())})
		}
	}
	slices.SortFunc(out, func(a, b checkpointFile) int {
		switch {
		case a.steps < b.steps:
			return -1
		case a.steps > b.steps:
			return 1
		}
		return 0
	})
	return out, nil
}

// checkpointSteps parses "checkpoint-NNNNNNNNN.h5" (nine or more digits).
func checkpointSteps(name string) (int64, bool) {
	digits, ok := strings.CutPrefix(name, runfolder.CheckpointPrefix)
	if !ok {
		return 0, false
	}
	if digits, ok = strings.CutSuffix(digits, runfolder.CheckpointSuffix); !ok || len(digits) < 9 {
		return 0, false
	}
	for _, r := range digits {
		if r < '0' || r > '9' {
			return 0, false
		}
	}
	n, err := strconv.ParseInt(digits, 10, 64)
	return n, err == nil
}

// isCheckpointTemp reports whether name is a temporary file of
// WriteCheckpoint.
func isCheckpointTemp(name string) bool {
	return strings.HasPrefix(name, ".checkpoint-") && strings.Contains(name, ".h5.tmp-")
}

// pruneCheckpoints removes, after the checkpoint of step steps was
// written, all other checkpoints but the newest older one, and temporary
// files left by interrupted writes.
func pruneCheckpoints(dir string, steps int) error {
	files, err := listCheckpoints(dir)
	if err != nil {
		return err
	}
	kept := 0
	var errs []error
	for i := len(files) - 1; i >= 0; i-- {
		c := files[i]
		if c.steps <= int64(steps) && kept < keepCheckpoints {
			kept++
			continue
		}
		if err := os.Remove(c.path); err != nil && !errors.Is(err, fs.ErrNotExist) {
			errs = append(errs, err)
		}
	}
	entries, err := os.ReadDir(dir)
	if err == nil {
		for _, e := range entries {
			if isCheckpointTemp(e.Name()) {
				os.Remove(filepath.Join(dir, e.Name()))
			}
		}
	}
	if err := runfolder.SyncDir(dir); err != nil {
		errs = append(errs, err)
	}
	return errors.Join(errs...)
}

// RemoveCheckpoints removes every checkpoint (and temporary checkpoint
// file) in dir, for a run started afresh in an old run folder, so that a
// later resume cannot pick up the old run. A missing folder is no error.
func RemoveCheckpoints(dir string) error {
	entries, err := os.ReadDir(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("h5: cannot list checkpoints in %s: %v", dir, err)
	}
	var errs []error
	for _, e := range entries {
		if _, ok := checkpointSteps(e.Name()); ok || isCheckpointTemp(e.Name()) {
			if err := os.Remove(filepath.Join(dir, e.Name())); err != nil && !errors.Is(err, fs.ErrNotExist) {
				errs = append(errs, err)
			}
		}
	}
	if err := errors.Join(errs...); err != nil {
		return fmt.Errorf("h5: removing old checkpoints in %s: %v; make the folder writable", dir, err)
	}
	return runfolder.SyncDir(dir)
}

// readCheckpointFile reads and verifies one checkpoint.
func readCheckpointFile(path string) (*Checkpoint, error) {
	cp, sum, err := loadCheckpoint(path)
	if err != nil {
		return nil, err
	}
	got := checksum(cp)
	if hex.EncodeToString(got[:]) != sum {
		return nil, errors.New("its contents do not match its checksum (the file changed after it was written)")
	}
	return cp, nil
}

func loadCheckpoint(path string) (*Checkpoint, string, error) {
	defer enter()()
	f, err := openFile(path, false)
	if err != nil {
		return nil, "", fmt.Errorf("cannot open it: %v", err)
	}
	defer f.close()
	if s, err := f.getString("/", "format"); err != nil || s != checkpointFormat {
		return nil, "", fmt.Errorf("not a rollerbed checkpoint (no format attribute %q)", checkpointFormat)
	}
	if v, err := f.getInt("/", "format_version"); err != nil || v > checkpointVersion {
		return nil, "", fmt.Errorf("format version %d, newer than this program reads (%d); use a newer rollerbed", v, checkpointVersion)
	}
	cp := &Checkpoint{Arrays: map[string][]float64{}, Complex: map[string][]complex128{}, Ints: map[string]int64{}}
	sum, err := f.getString("/", checksumAttr)
	if err != nil {
		return nil, "", err
	}
	if cp.CaseText, err = f.getString("/", "case"); err != nil {
		return nil, "", err
	}
	if cp.Version, err = f.getString("/", "version"); err != nil {
		return nil, "", err
	}
	for _, s := range []struct {
		path string
		dst  *float64
	}{{ckTime, &cp.Time}, {ckLastStep, &cp.LastStep}, {ckGradient, &cp.Gradient}} {
		v, err := f.readF64(s.path, 1)
		if err != nil {
			return nil, "", fmt.Errorf("%s: %v", s.path, err)
		}
		*s.dst = v[0]
	}
	steps, err := f.readI64(ckSteps)
	if err != nil {
		return nil, "", fmt.Errorf("%s: %v", ckSteps, err)
	}
	cp.Steps = int(steps)
	read := func(group string, fn func(path string) error) error {
		names, err := f.children(group)
		if err != nil {
			return fmt.Errorf("%s: %v", group, err)
		}
		for _, n := range names {
			if err := fn(group + "/" + n); err != nil {
				return fmt.Errorf("%s/%s: %v", group, n, err)
			}
		}
		return nil
	}
	base := func(p string) string { return p[strings.LastIndexByte(p, '/')+1:] }
	err = read(ckArrays, func(p string) error {
		d, err := f.dims(p)
		if err != nil {
			return err
		}
		if len(d) != 1 {
			return fmt.Errorf("%d dimensions, want 1", len(d))
		}
		cp.Arrays[base(p)], err = f.readF64(p, d[0])
		return err
	})
	if err == nil {
		err = read(ckComplex, func(p string) error {
			d, err := f.dims(p)
			if err != nil {
				return err
			}
			if len(d) != 2 || d[1] != 2 {
				return fmt.Errorf("extent %v, want (n, 2)", d)
			}
			pairs, err := f.readF64(p, 2*d[0])
			if err != nil {
				return err
			}
			c := make([]complex128, d[0])
			for i := range c {
				c[i] = complex(pairs[2*i], pairs[2*i+1])
			}
			cp.Complex[base(p)] = c
			return nil
		})
	}
	if err == nil {
		err = read(ckInts, func(p string) error {
			v, err := f.readI64(p)
			cp.Ints[base(p)] = v
			return err
		})
	}
	if err != nil {
		return nil, "", err
	}
	return cp, sum, nil
}
