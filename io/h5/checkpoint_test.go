package h5

import (
	"bytes"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// testCheckpoint returns a checkpoint shaped like the solver's state on
// the test grid, with random values drawn from seed.
func testCheckpoint(seed uint64, steps int) *Checkpoint {
	r := rand.New(rand.NewPCG(seed, 7))
	nc := testNx/2 + 1
	p := make([]complex128, testNz*nc)
	for i := range p {
		p[i] = complex(r.NormFloat64(), r.NormFloat64()*1e-3)
	}
	return &Checkpoint{
		Time:     0.1 * float64(steps) * (1 + r.Float64()),
		Steps:    steps,
		LastStep: 1e-3 * r.Float64(),
		Gradient: -2.5e-4 * r.Float64(),
		CaseText: testMeta(0).CaseText,
		Version:  "rollerbed 0.0.0-test",
		Arrays: map[string][]float64{
			"u":    randomValues(r, testNz*testNx),
			"w":    randomValues(r, (testNz+1)*testNx),
			"dudx": randomValues(r, testNz*testNx),
			"dwdx": randomValues(r, (testNz+1)*testNx),
		},
		Complex: map[string][]complex128{"pressure": p},
		Ints:    map[string]int64{"samples": int64(steps / 10)},
	}
}

// sameCheckpoint reports, bit for bit, how got differs from want.
func sameCheckpoint(t *testing.T, got, want *Checkpoint) {
	t.Helper()
	for _, s := range []struct {
		name string
		g, w float64
	}{{"Time", got.Time, want.Time}, {"LastStep", got.LastStep, want.LastStep}, {"Gradient", got.Gradient, want.Gradient}} {
		if math.Float64bits(s.g) != math.Float64bits(s.w) {
			t.Errorf("%s read back as %v, want %v", s.name, s.g, s.w)
		}
	}
	if got.Steps != want.Steps || got.CaseText != want.CaseText || got.Version != want.Version {
		t.Errorf("read back steps %d, version %q, case %q; want %d, %q, %q", got.Steps, got.Version, got.CaseText, want.Steps, want.Version, want.CaseText)
	}
	if !slices.Equal(mapKeys(got.Arrays), mapKeys(want.Arrays)) || !slices.Equal(mapKeys(got.Complex), mapKeys(want.Complex)) {
		t.Errorf("arrays %v %v, want %v %v", mapKeys(got.Arrays), mapKeys(got.Complex), mapKeys(want.Arrays), mapKeys(want.Complex))
	}
	for n, w := range want.Arrays {
		if !sameBits(got.Arrays[n], w) {
			t.Errorf("array %s differs", n)
		}
	}
	for n, w := range want.Complex {
		g := got.Complex[n]
		if len(g) != len(w) {
			t.Errorf("complex array %s: %d values, want %d", n, len(g), len(w))
			continue
		}
		for i := range w {
			if math.Float64bits(real(g[i])) != math.Float64bits(real(w[i])) || math.Float64bits(imag(g[i])) != math.Float64bits(imag(w[i])) {
				t.Errorf("complex array %s[%d] = %v, want %v", n, i, g[i], w[i])
				break
			}
		}
	}
	if len(got.Ints) != len(want.Ints) {
		t.Errorf("ints %v, want %v", got.Ints, want.Ints)
	}
	for n, w := range want.Ints {
		if got.Ints[n] != w {
			t.Errorf("int %s = %d, want %d", n, got.Ints[n], w)
		}
	}
}

func TestCheckpointRoundTrip(t *testing.T) {
	special := []float64{0, math.Copysign(0, -1), math.Inf(1), math.Inf(-1), math.MaxFloat64, -math.SmallestNonzeroFloat64,
		0x1p-1060, math.Nextafter(1, 2), math.Float64frombits(0x7ff8000000000001), math.Float64frombits(0xfff4000000abcdef)}
	for _, tc := range []struct {
		name string
		mod  func(cp *Checkpoint)
	}{
		{"solver state", func(cp *Checkpoint) {}},
		{"large arrays", func(cp *Checkpoint) {
			r := rand.New(rand.NewPCG(3, 4))
			cp.Arrays["u"] = randomValues(r, 300_000)
			big := make([]complex128, 100_000)
			for i := range big {
				big[i] = complex(r.NormFloat64(), r.ExpFloat64())
			}
			cp.Complex["pressure"] = big
		}},
		{"special values and NaN payloads", func(cp *Checkpoint) {
			cp.Arrays["special"] = special
			cp.Complex["special"] = []complex128{complex(special[1], special[8]), complex(special[6], special[9])}
			cp.Gradient = math.Copysign(0, -1)
			cp.Ints["min"], cp.Ints["max"] = math.MinInt64, math.MaxInt64
		}},
		{"empty and missing", func(cp *Checkpoint) {
			cp.Arrays["empty"] = []float64{}
			cp.Complex = nil
			cp.Ints = nil
			cp.CaseText = ""
		}},
		{"unicode case text", func(cp *Checkpoint) {
			cp.CaseText = "# ν = 1.0e-6 m²/s, ρ = 1000 kg/m³\n[canopy]\nlabel = \"Zostera — meadow\"\n" + strings.Repeat("x = 1\n", 20000)
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			cp := testCheckpoint(1, 1234)
			tc.mod(cp)
			if err := WriteCheckpoint(dir, cp); err != nil {
				t.Fatal(err)
			}
			got, file, err := ReadCheckpoint(dir)
			if err != nil {
				t.Fatal(err)
			}
			if file != filepath.Join(dir, "checkpoint-000001234.h5") || file != CheckpointPath(dir, 1234) {
				t.Errorf("read from %s", file)
			}
			if len(got.Warnings) != 0 {
				t.Errorf("warnings %v", got.Warnings)
			}
			sameCheckpoint(t, got, cp)
		})
	}
}

func TestChecksumCoversEverything(t *testing.T) {
	base := checksum(testCheckpoint(1, 10))
	for _, tc := range []struct {
		name string
		mod  func(cp *Checkpoint)
	}{
		{"time", func(cp *Checkpoint) { cp.Time = math.Nextafter(cp.Time, 1e9) }},
		{"steps", func(cp *Checkpoint) { cp.Steps++ }},
		{"last step", func(cp *Checkpoint) { cp.LastStep *= 2 }},
		{"gradient sign of zero", func(cp *Checkpoint) { cp.Gradient = math.Copysign(0, -1) }},
		{"case text", func(cp *Checkpoint) { cp.CaseText += " " }},
		{"version", func(cp *Checkpoint) { cp.Version = "other" }},
		{"array value", func(cp *Checkpoint) { cp.Arrays["u"][3] = math.Nextafter(cp.Arrays["u"][3], 0) }},
		{"array renamed", func(cp *Checkpoint) { cp.Arrays["v"] = cp.Arrays["u"]; delete(cp.Arrays, "u") }},
		{"array moved between maps", func(cp *Checkpoint) { cp.Ints = nil; cp.Arrays["samples"] = []float64{} }},
		{"complex imaginary part", func(cp *Checkpoint) {
			v := cp.Complex["pressure"][0]
			cp.Complex["pressure"][0] = complex(real(v), math.Nextafter(imag(v), 1))
		}},
		{"int", func(cp *Checkpoint) { cp.Ints["samples"]++ }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			cp := testCheckpoint(1, 10)
			tc.mod(cp)
			if checksum(cp) == base {
				t.Error("the checksum did not change")
			}
		})
	}
}

func checkpointSet(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	return names
}

func TestCheckpointKeepsTwo(t *testing.T) {
	for _, tc := range []struct {
		name  string
		steps []int
		want  []string
	}{
		{"one", []int{10}, []string{"checkpoint-000000010.h5"}},
		{"in order", []int{10, 20, 30, 40}, []string{"checkpoint-000000030.h5", "checkpoint-000000040.h5"}},
		{"same step again", []int{10, 20, 20}, []string{"checkpoint-000000010.h5", "checkpoint-000000020.h5"}},
		{"fresh run over a later one", []int{100, 200, 300, 150}, []string{"checkpoint-000000150.h5"}},
		{"after a resume from the previous", []int{100, 200, 300, 250}, []string{"checkpoint-000000200.h5", "checkpoint-000000250.h5"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			// A temporary file left by a write that was killed.
			os.WriteFile(filepath.Join(dir, ".checkpoint-000000005.h5.tmp-123"), []byte("partial"), 0o644)
			os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("kept"), 0o644)
			for _, s := range tc.steps {
				if err := WriteCheckpoint(dir, testCheckpoint(uint64(s), s)); err != nil {
					t.Fatal(err)
				}
			}
			if got, want := checkpointSet(t, dir), append(slices.Clone(tc.want), "notes.txt"); !slices.Equal(got, want) {
				t.Errorf("folder holds %v, want %v", got, want)
			}
		})
	}
}

// damage changes a checkpoint file in place.
type damage func(t *testing.T, path string, cp *Checkpoint)

func truncateTo(frac float64) damage {
	return func(t *testing.T, path string, _ *Checkpoint) {
		st, err := os.Stat(path)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.Truncate(path, int64(frac*float64(st.Size()))); err != nil {
			t.Fatal(err)
		}
	}
}

// flipInArray flips one bit of the stored value u[5].
func flipInArray(t *testing.T, path string, cp *Checkpoint) {
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var pat [8]byte
	binary.LittleEndian.PutUint64(pat[:], math.Float64bits(cp.Arrays["u"][5]))
	i := bytes.Index(b, pat[:])
	if i < 0 || bytes.Contains(b[i+1:], pat[:]) {
		t.Fatal("cannot find the stored value once in the file")
	}
	b[i] ^= 0x01
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

func overwrite(data []byte) damage {
	return func(t *testing.T, path string, _ *Checkpoint) {
		if err := os.WriteFile(path, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// missingArray rewrites the checkpoint without one array but with the old
// checksum, as a writer that lost a dataset would leave it.
func missingArray(t *testing.T, path string, cp *Checkpoint) {
	sum := checksum(cp)
	short := *cp
	short.Arrays = map[string][]float64{"u": cp.Arrays["u"]}
	if err := writeCheckpointFile(path, &short, hex.EncodeToString(sum[:])); err != nil {
		t.Fatal(err)
	}
}

func TestCheckpointDamagedFallsBack(t *testing.T) {
	for _, tc := range []struct {
		name   string
		damage damage
		reason string
	}{
		{"cut to half", truncateTo(0.5), "cannot open"},
		{"cut to a few bytes", truncateTo(0.01), "cannot open"},
		{"empty file", truncateTo(0), "cannot open"},
		{"one bit flipped in an array", flipInArray, "checksum"},
		{"not HDF5", overwrite([]byte("this is not a checkpoint")), "cannot open"},
		{"array missing", missingArray, "checksum"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			older, newer := testCheckpoint(1, 100), testCheckpoint(2, 200)
			for _, cp := range []*Checkpoint{older, newer} {
				if err := WriteCheckpoint(dir, cp); err != nil {
					t.Fatal(err)
				}
			}
			tc.damage(t, CheckpointPath(dir, 200), newer)
			got, file, err := ReadCheckpoint(dir)
			if err != nil {
				t.Fatal(err)
			}
			if file != CheckpointPath(dir, 100) {
				t.Errorf("read %s, want the older checkpoint", file)
			}
			sameCheckpoint(t, got, older)
			if len(got.Warnings) != 1 || !strings.Contains(got.Warnings[0], "checkpoint-000000200.h5 is damaged") ||
				!strings.Contains(got.Warnings[0], tc.reason) || !strings.Contains(got.Warnings[0], "resuming from checkpoint-000000100.h5") {
				t.Errorf("warnings %q, want one naming the damaged file and saying %q", got.Warnings, tc.reason)
			}
		})
	}
}

func TestReadCheckpointErrors(t *testing.T) {
	t.Run("no checkpoint", func(t *testing.T) {
		dir := t.TempDir()
		os.WriteFile(filepath.Join(dir, "fields.h5"), nil, 0o644)
		_, _, err := ReadCheckpoint(dir)
		if !errors.Is(err, ErrNoCheckpoint) || !strings.Contains(err.Error(), dir) {
			t.Errorf("error %v, want ErrNoCheckpoint naming the folder", err)
		}
	})
	t.Run("missing folder", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "gone")
		_, _, err := ReadCheckpoint(dir)
		if !errors.Is(err, ErrNoCheckpoint) || !strings.Contains(err.Error(), "does not exist") {
			t.Errorf("error %v", err)
		}
	})
	t.Run("all damaged", func(t *testing.T) {
		dir := t.TempDir()
		for _, s := range []int{100, 200} {
			if err := WriteCheckpoint(dir, testCheckpoint(1, s)); err != nil {
				t.Fatal(err)
			}
			truncateTo(0.3)(t, CheckpointPath(dir, s), nil)
		}
		_, _, err := ReadCheckpoint(dir)
		if err == nil || errors.Is(err, ErrNoCheckpoint) || !strings.Contains(err.Error(), "checkpoint-000000100.h5 is damaged") ||
			!strings.Contains(err.Error(), "checkpoint-000000200.h5 is damaged") {
			t.Errorf("error %v, want one listing both damaged files", err)
		}
	})
}

func TestWriteCheckpointErrors(t *testing.T) {
	base := t.TempDir()
	aFile := filepath.Join(base, "a-file")
	os.WriteFile(aFile, []byte("x"), 0o644)
	for _, tc := range []struct {
		name string
		dir  string
		mod  func(cp *Checkpoint)
		want string
	}{
		{"folder is a file", aFile, nil, "is a file, not a folder"},
		{"missing parent", filepath.Join(base, "no", "such", "run"), nil, "does not exist"},
		{"negative steps", base, func(cp *Checkpoint) { cp.Steps = -1 }, "step count -1"},
		{"bad array name", base, func(cp *Checkpoint) { cp.Arrays["a/b"] = nil }, "use letters"},
		{"NUL in version", base, func(cp *Checkpoint) { cp.Version = "1\x00" }, "NUL"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			cp := testCheckpoint(1, 10)
			if tc.mod != nil {
				tc.mod(cp)
			}
			err := WriteCheckpoint(tc.dir, cp)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one saying %q", err, tc.want)
			}
		})
	}
	if got := checkpointSet(t, base); !slices.Equal(got, []string{"a-file"}) {
		t.Errorf("the refused writes left %v", got)
	}
	t.Run("read-only folder", func(t *testing.T) {
		if os.Geteuid() == 0 {
			t.Skip("running as root, for whom folder permissions do not stop writes; the cases above cover unwritable paths")
		}
		dir := filepath.Join(base, "ro")
		os.Mkdir(dir, 0o555)
		defer os.Chmod(dir, 0o755)
		err := WriteCheckpoint(dir, testCheckpoint(1, 10))
		if err == nil || !strings.Contains(err.Error(), "writable") {
			t.Fatalf("error %v, want one asking for a writable folder", err)
		}
	})
}

func TestRemoveCheckpoints(t *testing.T) {
	dir := t.TempDir()
	for _, s := range []int{1, 2} {
		if err := WriteCheckpoint(dir, testCheckpoint(1, s)); err != nil {
			t.Fatal(err)
		}
	}
	os.WriteFile(filepath.Join(dir, ".checkpoint-000000003.h5.tmp-9"), nil, 0o644)
	os.WriteFile(filepath.Join(dir, "fields.h5"), nil, 0o644)
	if err := RemoveCheckpoints(dir); err != nil {
		t.Fatal(err)
	}
	if got := checkpointSet(t, dir); !slices.Equal(got, []string{"fields.h5"}) {
		t.Errorf("left %v", got)
	}
	if err := RemoveCheckpoints(filepath.Join(dir, "none")); err != nil {
		t.Errorf("missing folder: %v", err)
	}
}

// The package's lock lets a run write checkpoints and snapshots while
// another goroutine reads.
func TestConcurrentUse(t *testing.T) {
	base := t.TempDir()
	path := writeTestRun(t, base, 0, 1)
	done := make(chan error)
	for g := 0; g < 4; g++ {
		go func() {
			dir := filepath.Join(base, "ck", string(rune('a'+g)))
			err := os.MkdirAll(dir, 0o755)
			for s := 1; s <= 5 && err == nil; s++ {
				want := testCheckpoint(uint64(g), s)
				if err = WriteCheckpoint(dir, want); err != nil {
					break
				}
				var got *Checkpoint
				if got, _, err = ReadCheckpoint(dir); err == nil && !sameBits(got.Arrays["u"], want.Arrays["u"]) {
					err = errors.New("checkpoint read back differs")
				}
				if _, err2 := ListSnapshots(path); err == nil {
					err = err2
				}
			}
			done <- err
		}()
	}
	for g := 0; g < 4; g++ {
		if err := <-done; err != nil {
			t.Error(err)
		}
	}
}
