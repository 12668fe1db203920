package sweep

import (
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"rollerbed/io/runfolder"
	"rollerbed/runs"
)

const (
	manifestName   = "manifest.json"
	manifestFormat = "rollerbed sweep plan"
)

// Manifest is the content of a sweep folder's manifest.json: what was
// planned, from which files, and each member's varied values.
type Manifest struct {
	Format  string `json:"format"`
	Version string `json:"version"`
	Title   string `json:"title,omitempty"`
	// SweepFile and BaseFile are absolute paths; the texts are kept too,
	// so the folder documents itself when the files change or move.
	SweepFile string `json:"sweep_file"`
	SweepText string `json:"sweep_text"`
	BaseFile  string `json:"base_file"`
	BaseText  string `json:"base_text"`
	Combine   string `json:"combine"`
	// Keys are the varied keys, in the order of each member's values.
	Keys []string `json:"keys"`
	// FixedWorkers is the largest numerics.workers the members set
	// themselves; 0 when `sweep run` chooses the workers per run.
	FixedWorkers int            `json:"fixed_workers"`
	Slurm        *Slurm         `json:"slurm,omitempty"`
	Members      []MemberRecord `json:"members"`
}

// MemberRecord is one member in the manifest.
type MemberRecord struct {
	Index  int     `json:"index"`
	Name   string  `json:"name"`
	Values []Value `json:"values"`
	// MemoryBytes is the expected peak memory of the member's run (bytes,
	// runs.MemoryBytes); 0 in plans made before it was recorded.
	MemoryBytes int64 `json:"memory_bytes,omitempty"`
}

// MemberMemory returns the largest expected peak memory of a member
// (bytes), 0 when the plan does not record it.
func (m *Manifest) MemberMemory() int64 {
	var most int64
	for _, mem := range m.Members {
		most = max(most, mem.MemoryBytes)
	}
	return most
}

func (pl *Plan) manifest() *Manifest {
	m := &Manifest{Format: manifestFormat, Version: runs.Version, Title: pl.File.Title,
		SweepFile: absOr(pl.File.Path), SweepText: pl.File.Text, BaseFile: pl.BasePath, BaseText: pl.BaseText,
		Combine: pl.File.Combine, Keys: append([]string{}, pl.Keys...), FixedWorkers: pl.FixedWorkers, Slurm: pl.File.Slurm}
	if m.Keys == nil {
		m.Keys = []string{}
	}
	for _, mem := range pl.Members {
		vals := mem.Values
		if vals == nil {
			vals = []Value{}
		}
		m.Members = append(m.Members, MemberRecord{Index: mem.Index, Name: mem.Name, Values: vals, MemoryBytes: mem.MemoryBytes})
	}
	return m
}

func writeManifest(dir string, m *Manifest) error {
	return runfolder.WriteJSON(filepath.Join(dir, manifestName), m)
}

// ReadManifest reads the manifest of the sweep folder dir.
func ReadManifest(dir string) (*Manifest, error) {
	b, err := os.ReadFile(filepath.Join(dir, manifestName))
	if errors.Is(err, os.ErrNotExist) {
		return nil, fmt.Errorf("%s holds no sweep plan (no %s); make one with `rollerbed sweep plan SWEEP.toml --out %s`", dir, manifestName, dir)
	}
	if err != nil {
		return nil, fmt.Errorf("cannot read the sweep plan: %w", err)
	}
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, fmt.Errorf("%s is damaged (%v); plan the sweep again into a new folder", filepath.Join(dir, manifestName), err)
	}
	if m.Format != manifestFormat {
		return nil, fmt.Errorf("%s is not a rollerbed sweep plan (format %q)", filepath.Join(dir, manifestName), m.Format)
	}
	for i, mem := range m.Members {
		if mem.Index != i || mem.Name != MemberName(i) {
			return nil, fmt.Errorf("%s is damaged: member %d is listed as %d (%q); plan the sweep again into a new folder", filepath.Join(dir, manifestName), i, mem.Index, mem.Name)
		}
	}
	return &m, nil
}
