package runfolder

import (
	"fmt"
	"path/filepath"
	"strconv"
)

// Files, columns and summary of the statistics by phase of a periodic
// forcing (waves, tides) and of flexible blades.
const (
	// PhaseProfilesFile holds the profiles of every phase bin
	// (PhaseProfilesTable).
	PhaseProfilesFile = "phase_profiles.csv"
	// PhaseCycleFile holds one row per phase bin: the in-canopy and
	// above-canopy velocities, their ratio, the bent height and the
	// uptake (PhaseCycleTable).
	PhaseCycleFile = "phase_cycle.csv"

	// ColPhase is the phase as a fraction of the forcing period, the
	// middle of its bin; the first column of phase_cycle.csv.
	ColPhase = "phase"
	// ColPhaseTime is the averaging time of a bin (s).
	ColPhaseTime = "averaging time"
	// ColUInCanopy and ColUAbove are the layer means of the phase-mean
	// velocity below and above the canopy top (m/s), ColVelocityRatio
	// their ratio (NaN where the velocity above is 0).
	ColUInCanopy     = "U in canopy"
	ColUAbove        = "U above canopy"
	ColVelocityRatio = "velocity ratio"
	// ColBentHeight is the mean bent height of flexible blades (m).
	ColBentHeight = "bent height"
	// SuffixBedUptake follows the scalar NAME in the bed uptake column of
	// phase_cycle.csv (its element uptake column uses
	// SuffixElementUptake).
	SuffixBedUptake = " bed uptake"
	// SuffixFlux follows the scalar NAME in its flux column of
	// phase_profiles.csv.
	SuffixFlux = " flux w'c'"
)

// PhaseColumn returns the name of column name of phase bin n (from 0) in
// phase_profiles.csv: "name (phase n)".
func PhaseColumn(name string, n int) string { return name + " (phase " + strconv.Itoa(n) + ")" }

// PhaseProfile is the profiles of one phase bin at the cell centres.
type PhaseProfile struct {
	U  []float64 // m/s, x- and phase-mean streamwise velocity
	UW []float64 // m²/s², resolved shear stress about the phase mean
	// Flux is, per scalar of PhaseProfilesTable.Scalars, the resolved
	// vertical flux ⟨w′c′⟩ (unit·m/s).
	Flux [][]float64
}

// PhaseProfilesTable is phase_profiles.csv: ColZ, then for each bin n the
// columns U, u'w' and, per scalar NAME, "NAME flux w'c'", each named
// through PhaseColumn. A bin without samples yet holds NaN, in this table
// and in PhaseCycleTable.
type PhaseProfilesTable struct {
	Z       []float64 // m
	Scalars []string
	Bins    []PhaseProfile
}

// Write writes phase_profiles.csv into run folder dir.
func (p PhaseProfilesTable) Write(dir string) error {
	t := Table{Header: []string{head(ColZ, "m")}, Columns: [][]float64{p.Z}}
	for n, b := range p.Bins {
		t.Header = append(t.Header, head(PhaseColumn(ColU, n), "m/s"), head(PhaseColumn(ColUW, n), "m2/s2"))
		t.Columns = append(t.Columns, b.U, b.UW)
		for i, name := range p.Scalars {
			t.Header = append(t.Header, head(PhaseColumn(name+SuffixFlux, n), "unit m/s"))
			t.Columns = append(t.Columns, b.Flux[i])
		}
	}
	return t.WriteCSV(filepath.Join(dir, PhaseProfilesFile))
}

// ReadPhaseProfiles reads phase_profiles.csv of run folder dir; it has no
// Scalars or Flux (the figures draw the velocity only).
func ReadPhaseProfiles(dir string) (PhaseProfilesTable, error) {
	t, path, err := readTable(dir, PhaseProfilesFile)
	if err != nil {
		return PhaseProfilesTable{}, err
	}
	z, err := pick(t, path, ColZ)
	if err != nil {
		return PhaseProfilesTable{}, err
	}
	out := PhaseProfilesTable{Z: z[0]}
	for n := 0; ; n++ {
		if _, err := t.Column(PhaseColumn(ColU, n)); err != nil {
			break
		}
		c, err := pick(t, path, PhaseColumn(ColU, n), PhaseColumn(ColUW, n))
		if err != nil {
			return out, err
		}
		out.Bins = append(out.Bins, PhaseProfile{U: c[0], UW: c[1]})
	}
	if len(out.Bins) < 2 {
		return out, fmt.Errorf("runfolder: %s: need the columns of at least 2 phase bins, %q and after", path, PhaseColumn(ColU, 0))
	}
	return out, nil
}

// PhaseUptake is one scalar's uptake per phase bin, per unit bed area
// (unit·m/s).
type PhaseUptake struct {
	Name         string
	Element, Bed []float64
}

// PhaseCycleTable is phase_cycle.csv: a row per phase bin with ColPhase,
// ColPhaseTime, ColUInCanopy, ColUAbove and ColVelocityRatio (without a
// canopy these three are absent), ColBentHeight with flexible blades, and
// per scalar NAME "NAME element uptake" and "NAME bed uptake".
type PhaseCycleTable struct {
	Phase, Time        []float64 // fraction of the period; s
	UIn, UAbove, Ratio []float64 // m/s, m/s, dimensionless; nil without a canopy
	BentHeight         []float64 // m; nil without flexible blades
	Scalars            []PhaseUptake
}

// Write writes phase_cycle.csv into run folder dir.
func (c PhaseCycleTable) Write(dir string) error {
	t := Table{Header: []string{head(ColPhase, "1"), head(ColPhaseTime, "s")}, Columns: [][]float64{c.Phase, c.Time}}
	if c.UIn != nil {
		t.Header = append(t.Header, head(ColUInCanopy, "m/s"), head(ColUAbove, "m/s"), head(ColVelocityRatio, "1"))
		t.Columns = append(t.Columns, c.UIn, c.UAbove, c.Ratio)
	}
	if c.BentHeight != nil {
		t.Header = append(t.Header, head(ColBentHeight, "m"))
		t.Columns = append(t.Columns, c.BentHeight)
	}
	for _, s := range c.Scalars {
		t.Header = append(t.Header, head(s.Name+SuffixElementUptake, "unit m/s"), head(s.Name+SuffixBedUptake, "unit m/s"))
		t.Columns = append(t.Columns, s.Element, s.Bed)
	}
	return t.WriteCSV(filepath.Join(dir, PhaseCycleFile))
}

// ReadPhaseCycle reads phase_cycle.csv of run folder dir: the phase, the
// time, and the velocity and bent-height columns where the table has them
// (the uptake columns are left out).
func ReadPhaseCycle(dir string) (PhaseCycleTable, error) {
	t, path, err := readTable(dir, PhaseCycleFile)
	if err != nil {
		return PhaseCycleTable{}, err
	}
	c, err := pick(t, path, ColPhase, ColPhaseTime)
	if err != nil {
		return PhaseCycleTable{}, err
	}
	out := PhaseCycleTable{Phase: c[0], Time: c[1]}
	if v, err := pick(t, path, ColUInCanopy, ColUAbove, ColVelocityRatio); err == nil {
		out.UIn, out.UAbove, out.Ratio = v[0], v[1], v[2]
	}
	if v, err := t.Column(ColBentHeight); err == nil {
		out.BentHeight = v
	}
	return out, nil
}

// PhaseSummary is the summary of the statistics by phase.
type PhaseSummary struct {
	Bins   int     `json:"bins"`
	Period float64 `json:"period_s"`
	// Cycles is the averaging time over the period: how many cycles the
	// statistics hold.
	Cycles float64 `json:"cycles_averaged"`
	// OscillatingRatio is the ratio of the first-harmonic amplitudes of
	// the in-canopy and above-canopy velocities over the cycle: the
	// attenuation of the oscillating flow inside the canopy; null
	// without a canopy or before every bin holds samples.
	OscillatingRatio *float64 `json:"velocity_ratio_oscillating"`
	// OscillatingLead is the phase by which the in-canopy oscillation
	// leads the one above (rad); null without a canopy.
	OscillatingLead *float64 `json:"velocity_phase_lead_rad"`
	// MeanRatio is the ratio of the cycle means of the in-canopy and
	// above-canopy velocities (the current); null without a canopy or
	// where the mean above is 0.
	MeanRatio *float64 `json:"velocity_ratio_mean"`
}

// FlexibleSummary describes flexible blades and how far they bent.
type FlexibleSummary struct {
	Length   float64 `json:"blade_length_m"`
	Buoyancy float64 `json:"buoyancy_number"`
	// MinHeight, MaxHeight and MeanHeight are over the rows of the time
	// series (m); FinalHeight and FinalLengthRatio (l_e/l) are the final
	// state's, averaged over the columns that hold blades.
	MinHeight        float64 `json:"bent_height_min_m"`
	MaxHeight        float64 `json:"bent_height_max_m"`
	MeanHeight       float64 `json:"bent_height_mean_m"`
	FinalHeight      float64 `json:"bent_height_final_m"`
	FinalLengthRatio float64 `json:"effective_length_ratio_final"`
}
