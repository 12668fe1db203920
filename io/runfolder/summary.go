package runfolder

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
)

// Summary is the content of summary.json. Keys carry their unit; metrics
// that do not apply to a run (no canopy, no statistics yet) are null.
type Summary struct {
	Run     RunSummary               `json:"run"`
	Flow    FlowSummary              `json:"flow"`
	Scalars map[string]ScalarSummary `json:"scalars,omitempty"`
	// Canopy describes the canopy as the run used it; nil without one.
	Canopy *CanopySummary `json:"canopy,omitempty"`
	// Spectrum says how spectrum.csv was taken; nil when the run wrote
	// none (too few probe samples after the spin-up).
	Spectrum *SpectrumSummary `json:"spectrum,omitempty"`
	// Phases is the summary of the statistics by phase of a periodic
	// forcing; nil for a steady one.
	Phases *PhaseSummary `json:"phases,omitempty"`
	// Provenance is the program, build, libraries, host and command line
	// of the process that wrote the summary; nil in summaries written
	// before it was added.
	Provenance *Provenance `json:"provenance,omitempty"`
}

// Provenance says what made a file: the program and its build, the
// libraries it linked, the host and the command line. Every value is text
// (so that comparisons of runs, which line up numbers, leave it out); a
// fact that cannot be known is "unknown".
type Provenance struct {
	Version      string `json:"version"`           // program version
	Revision     string `json:"revision"`          // version-control revision of the build
	RevisionTime string `json:"revision_time"`     // commit time of Revision, RFC 3339
	Modified     string `json:"revision_modified"` // "true" when the build had uncommitted changes, "false", or "unknown"
	GoVersion    string `json:"go_version"`        // toolchain that built the program
	HDF5         string `json:"hdf5_version"`      // HDF5 library in use, e.g. "1.10.8"
	FFTW         string `json:"fftw_version"`      // FFTW library linked, e.g. "fftw-3.3.10", or "not linked"
	Host         string `json:"host"`              // host name
	CommandLine  string `json:"command_line"`      // the arguments, each quoted where it needs to be
}

// ProvenanceFact is one fact of a Provenance: its key (the JSON key, also
// the fields.h5 attribute), a label for people and the value's address.
type ProvenanceFact struct {
	Key, Label string
	Value      *string
}

// Facts lists the facts of p in a fixed order, the program version
// first; writing through Value changes p.
func (p *Provenance) Facts() []ProvenanceFact {
	return []ProvenanceFact{
		{"version", "version", &p.Version},
		{"revision", "revision", &p.Revision},
		{"revision_time", "revision time", &p.RevisionTime},
		{"revision_modified", "modified", &p.Modified},
		{"go_version", "Go", &p.GoVersion},
		{"hdf5_version", "HDF5", &p.HDF5},
		{"fftw_version", "FFTW", &p.FFTW},
		{"host", "host", &p.Host},
		{"command_line", "command line", &p.CommandLine},
	}
}

// ScalarSummary holds a scalar's uptake over the statistics period (after
// the spin-up), per unit bed area, in unit·m/s (unit: the scalar's
// concentration unit, e.g. mol/m³ gives mol/(m² s)).
type ScalarSummary struct {
	ElementUptake float64 `json:"element_uptake_per_bed_area"`
	BedUptake     float64 `json:"bed_uptake_per_bed_area"`
	TotalUptake   float64 `json:"total_uptake_per_bed_area"`
	TopSupply     float64 `json:"top_supply_per_bed_area"`
	// MeanInCanopy and MeanAbove are the time- and space-mean
	// concentrations below and above the canopy top (unit).
	MeanInCanopy *float64 `json:"mean_in_canopy"`
	MeanAbove    *float64 `json:"mean_above_canopy"`
	// ExchangeVelocity is the uptake inside the canopy over the
	// concentration difference between the water above and inside it
	// (m/s): the flux across the canopy top in a statistically steady run.
	ExchangeVelocity *float64 `json:"exchange_velocity_m_s"`
	// FlushingTime is h/k_ex, the time to exchange the canopy water at the
	// exchange velocity (s).
	FlushingTime *float64 `json:"flushing_time_s"`
	// BoundaryLayerShare is the uptake-weighted share of the element
	// transfer resistance in the boundary layer around the elements,
	// (1/k_bl)/(1/k_bl + 1/k_s), from the final state.
	BoundaryLayerShare *float64 `json:"boundary_layer_share"`
	// Imbalance is the budget residual over its largest term, from the
	// start of the run.
	Imbalance float64 `json:"budget_relative_imbalance"`
}

// RunSummary describes the run itself.
type RunSummary struct {
	Title       string  `json:"title,omitempty"`
	Steps       int     `json:"steps"`
	SimTime     float64 `json:"sim_time_s"`
	WallTime    float64 `json:"wall_time_s"`
	Nx          int     `json:"nx"`
	Nz          int     `json:"nz"`
	Version     string  `json:"version"`
	Interrupted bool    `json:"interrupted"`
	StatsTime   float64 `json:"statistics_time_s"`
	Error       string  `json:"error,omitempty"`
	// Warnings are what the run found that may spoil its results: a flow
	// still spinning up while statistics were gathered, rollers as long as
	// the domain, a fixed step beyond the stability limit.
	Warnings []string `json:"warnings,omitempty"`
	// SpinUp is the time after which statistics are gathered (s).
	SpinUp float64 `json:"spin_up_s"`
	// Depth is the domain depth H (m).
	Depth float64 `json:"domain_depth_m"`
	// Ny and Width are a slab's spanwise cells and period Ly (m); absent
	// for the x–z slice.
	Ny    int     `json:"ny,omitempty"`
	Width float64 `json:"domain_width_m,omitempty"`
}

// FlowSummary holds the flow numbers.
type FlowSummary struct {
	BulkVelocity       float64  `json:"bulk_velocity_m_s"`
	Gradient           float64  `json:"pressure_gradient_m_s2"`
	MaxDivergence      float64  `json:"max_divergence"`
	CanopyHeight       *float64 `json:"canopy_height_m"`
	UTop               *float64 `json:"u_top_m_s"`
	U1                 *float64 `json:"u1_m_s"`
	U2                 *float64 `json:"u2_m_s"`
	MomentumThickness  *float64 `json:"momentum_thickness_m"`
	VorticityThickness *float64 `json:"vorticity_thickness_m"`
	ShearLength        *float64 `json:"shear_length_m"`
	PenetrationDepth   *float64 `json:"penetration_depth_m"`
	RollerFrequency    *float64 `json:"roller_frequency_hz"`
	Strouhal           *float64 `json:"strouhal"`
	RollerSpacing      *float64 `json:"roller_spacing_m"`
	// RollerFrequencyNote says why RollerFrequency, Strouhal and
	// RollerSpacing are null when the run has a spectrum but it does not
	// resolve the rollers' frequency.
	RollerFrequencyNote string `json:"roller_frequency_note,omitempty"`
	// RollerSpacingCorrelation is the spacing from the two-point
	// correlation of w along the canopy top in the final state.
	RollerSpacingCorrelation *float64 `json:"roller_spacing_correlation_m"`
	SweepEjectionRatio       *float64 `json:"sweep_ejection_ratio"`
	// SpanCorrelationLength is how far across the span a roller stays
	// coherent in a slab: the integral length of the spanwise two-point
	// correlation of w at the canopy top in the final state (m,
	// stats.SpanCorrelationLength); absent for the slice. When the
	// correlation does not fall to zero within half the span it is a lower
	// bound, and SpanCorrelationNote says so.
	SpanCorrelationLength *float64 `json:"span_correlation_length_m,omitempty"`
	SpanCorrelationNote   string   `json:"span_correlation_note,omitempty"`
}

// CanopySummary is the canopy as the run used it, with the published
// prediction of its penetration depth where one applies.
type CanopySummary struct {
	// Height is the canopy height h (m), known whether or not statistics
	// were gathered (flow.canopy_height_m is null without them).
	Height float64 `json:"height_m"`
	// DragDensity is C_D a (1/m) of a uniform block canopy with a fixed
	// drag coefficient; null for any other canopy, and DragDensityNote
	// says why.
	DragDensity     *float64 `json:"drag_density_1_m"`
	DragDensityNote string   `json:"drag_density_note,omitempty"`
	// PredictedPenetrationDepth is δe = 0.23/(C_D a) (m) from DragDensity
	// (canopy.PredictedPenetrationDepth), not capped at h: where it
	// exceeds h the stress is predicted to reach the bed.
	PredictedPenetrationDepth *float64 `json:"predicted_penetration_depth_m"`
	// Flexible describes the bending of flexible blades; nil for rigid
	// elements.
	Flexible *FlexibleSummary `json:"flexible,omitempty"`
}

// SpectrumSummary says how the spectrum of spectrum.csv was taken: the
// probe series after the spin-up, resampled evenly, cut into
// half-overlapping Hann-windowed segments (Welch).
type SpectrumSummary struct {
	Probes   int     `json:"probes"`
	Samples  int     `json:"samples"`         // resampled samples per probe
	Segment  int     `json:"segment_samples"` // samples per Welch segment
	Interval float64 `json:"interval_s"`      // resampled interval
	// ProbeHeight is the height of the probes (m).
	ProbeHeight float64 `json:"probe_height_m"`
	// Peak is the frequency of the largest density above f = 0 (Hz),
	// null when there is none.
	Peak *float64 `json:"peak_frequency_hz"`
}

// Flattened keys (see Entry) of summary.json that readers name: the
// sweep plots draw published scalings for the first two.
const (
	KeyPenetrationDepth = "flow.penetration_depth_m"
	KeyRollerSpacing    = "flow.roller_spacing_m"
	// KeyRollerSpacingCorrelation is the roller spacing from the two-point
	// correlation of w along the canopy top.
	KeyRollerSpacingCorrelation = "flow.roller_spacing_correlation_m"
	// KeySpanCorrelationLength is a slab's spanwise correlation length of
	// w at the canopy top.
	KeySpanCorrelationLength = "flow.span_correlation_length_m"
	KeyTitle                 = "run.title"
)

// Num returns a pointer to v for a nullable summary value, or nil when v
// is NaN or infinite (JSON null).
func Num(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// Value returns *p, or NaN for nil.
func Value(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

// Write writes the summary into run folder dir as summary.json.
func (s *Summary) Write(dir string) error {
	return WriteJSON(filepath.Join(dir, SummaryFile), s)
}

// ReadSummary reads summary.json of run folder dir. Its errors say what
// to do: resume a run that has not written one yet, or whose file is
// damaged.
func ReadSummary(dir string) (*Summary, error) {
	return readSummaryAs(dir, parseSummary)
}

// parseSummary decodes the text of summary.json.
func parseSummary(data []byte) (*Summary, error) {
	var s Summary
	if err := json.Unmarshal(data, &s); err != nil {
		return nil, err
	}
	return &s, nil
}

// readSummaryAs reads summary.json of run folder dir and decodes it with
// parse.
func readSummaryAs[T any](dir string, parse func([]byte) (T, error)) (T, error) {
	var zero T
	if err := Check(dir); err != nil {
		return zero, err
	}
	path := filepath.Join(dir, SummaryFile)
	data, err := os.ReadFile(path)
	if errors.Is(err, os.ErrNotExist) {
		return zero, fmt.Errorf("runfolder: %s has no %s: the run has not written its results yet (it may still be running, or have been killed before its end); continue it with `rollerbed run --resume %s`, which writes %s when it stops", dir, SummaryFile, dir, SummaryFile)
	}
	if err != nil {
		return zero, fmt.Errorf("runfolder: cannot read %s: %w", path, err)
	}
	v, err := parse(data)
	if err != nil {
		return zero, fmt.Errorf("runfolder: %s: %v; the file is damaged: rebuild it by resuming the run (`rollerbed run --resume %s`)", path, err, dir)
	}
	return v, nil
}
