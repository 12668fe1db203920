package casefile

import (
	"slices"
	"strconv"
	"strings"

	"rollerbed/io/stricttoml"
)

// Fields that a snapshot of fields.h5 may hold, for [output] fields. Case
// FieldNames lists them in this order.
const (
	// FieldU is the streamwise velocity u, m/s.
	FieldU = "u"
	// FieldW is the vertical velocity w, m/s.
	FieldW = "w"
	// FieldP is the kinematic pressure p (pressure over density), m²/s².
	FieldP = "p"
	// FieldVorticity is the spanwise vorticity of the x-z slice, 1/s.
	FieldVorticity = "vorticity"
	// FieldNuT is the subgrid eddy viscosity ν_t, m²/s (zero everywhere
	// with turbulence.closure = "none").
	FieldNuT = "nu_t"
)

// ReservedNames are names that fields.h5 keeps for its coordinates and the
// velocity vector beside the fields, so no scalar may take them (package
// io/h5 refuses them too; its tests hold the two lists equal).
var ReservedNames = []string{"x", "z_centre", "z_face", "component", "time", "velocity", "y", "slab"}

// Flow fields a slab (domain.width and domain.ny) writes besides those of
// the slice, in the three-dimensional group of each snapshot.
const (
	// FieldV is the spanwise velocity v, m/s.
	FieldV = "v"
	// FieldVortexCore is the Q criterion, the second invariant of the
	// velocity gradient, Q = ½(|Ω|² − |S|²) in 1/s² (Hunt, Wray & Moin
	// 1988): positive where rotation outweighs strain, in vortex cores.
	FieldVortexCore = "q_criterion"
)

// slabFields are the flow fields only a slab writes; no scalar may take
// their names either.
var slabFields = []string{FieldV, FieldVortexCore}

// baseFields are the fields every case may write, in the order of
// FieldNames and of the default of output.fields.
var baseFields = []string{FieldU, FieldW, FieldP, FieldVorticity, FieldNuT}

// FieldNames returns the names that output.fields may list for this case:
// the flow fields FieldU, FieldW, FieldP, FieldVorticity and FieldNuT, in
// that order, then the name of each of Case.Scalars in the order of the
// file (a name that is not valid, is a flow field's or repeats one before
// it is left out; Parse and Validate report it at the scalar). It is also
// the default of output.fields. The slice is new on each call.
func (c *Case) FieldNames() []string {
	return append(append([]string(nil), baseFields...), c.scalarNames()...)
}

// Output is the [output] table: what a run writes and how often. Cadences
// of simulated time are in s, at most Time.Duration.
type Output struct {
	// ProfileEvery is the simulated time in s between rows of mean
	// profiles written, > 0 and at most Time.Duration; default
	// Time.Duration/100.
	ProfileEvery float64 `toml:"profile_every"`
	// SnapshotEvery is the simulated time in s between snapshots of the
	// fields in fields.h5, 0 <= SnapshotEvery <= Time.Duration; 0 writes
	// none besides the initial and final fields, which are always
	// written. Default Time.Duration/50.
	SnapshotEvery float64 `toml:"snapshot_every"`
	// Fields are the fields each snapshot holds: names from
	// Case.FieldNames, each at most once, at least one. Default all of
	// Case.FieldNames: FieldU, FieldW, FieldP, FieldVorticity and
	// FieldNuT, in that order, then each scalar by its name.
	// Problems name entries from 0: output.fields[0] is the first.
	Fields []string `toml:"fields"`
	// Compression is the deflate level of fields.h5, an integer from 0
	// (none) to 9 (smallest file, slowest); default 4.
	Compression int `toml:"compression"`
	// CheckpointEvery is the simulated time in s between checkpoints,
	// > 0 and at most Time.Duration; default Time.Duration/10. A
	// checkpoint is written whenever this or CheckpointWallMinutes comes
	// due.
	CheckpointEvery float64 `toml:"checkpoint_every"`
	// CheckpointWallMinutes is the wall-clock time in minutes between
	// checkpoints, > 0 and at most 1440 (one day); default 30.
	CheckpointWallMinutes float64 `toml:"checkpoint_wall_minutes"`
	// Probes is the number of probes recording time series of u and w,
	// evenly spaced in x along the canopy top (at mid-depth without a
	// canopy), an integer from 1 to 64; default 8.
	Probes int `toml:"probes"`
	// PhaseBins is the number of equal bins of the forcing cycle
	// (Forcing.Period) in which phase-averaged statistics are gathered,
	// an integer from 2 to 360; default 12 when the forcing has waves or
	// tides, and 0 (none) otherwise, where it may not be given.
	PhaseBins int `toml:"phase_bins"`
}

// Defaults and limits of the output. The counts per run set the default
// cadences as fractions of time.duration; they, the deflate level and the
// wall-clock cadence are common practice, no source. A deflate level of 4
// gets most of the size reduction of level 9 at a fraction of its cost.
const (
	profilesPerRun               = 100
	snapshotsPerRun              = 50
	checkpointsPerRun            = 10
	defaultCompression           = 4
	maxCompression               = 9
	defaultCheckpointWallMinutes = 30.0
	maxCheckpointWallMinutes     = 1440.0 // one day
	defaultProbes                = 8
	maxProbes                    = 64
	defaultPhaseBins             = 12
	maxPhaseBins                 = 360
)

func checkOutput(c *Case, p *stricttoml.Problems) {
	o := &c.Output
	dur := c.Time.Duration
	durOK := p.OK("time.duration") && dur > 0 && stricttoml.Finite(dur)
	if p.Parsing {
		derived := func(key string, v *float64, perRun float64) {
			if !p.Has(key) {
				*v = dur / perRun
				p.Derive(key, "time.duration")
			}
		}
		derived("output.profile_every", &o.ProfileEvery, profilesPerRun)
		derived("output.snapshot_every", &o.SnapshotEvery, snapshotsPerRun)
		derived("output.checkpoint_every", &o.CheckpointEvery, checkpointsPerRun)
		if !p.Has("output.fields") {
			// Every field, the scalars too: a run with scalars is
			// usually run for them (and a list of flow fields only is
			// one line to write).
			o.Fields = c.FieldNames()
		}
		if !p.Has("output.compression") {
			o.Compression = defaultCompression
		}
		if !p.Has("output.checkpoint_wall_minutes") {
			o.CheckpointWallMinutes = defaultCheckpointWallMinutes
		}
		if !p.Has("output.probes") {
			o.Probes = defaultProbes
		}
		if !p.Has("output.phase_bins") && c.Forcing.Oscillating() {
			o.PhaseBins = defaultPhaseBins
		}
	}

	checkCadence(p, "output.profile_every", o.ProfileEvery, dur, durOK, false, profilesPerRun,
		"simulated time between mean-profile rows, s", "or no profile would be written")
	checkCadence(p, "output.snapshot_every", o.SnapshotEvery, dur, durOK, true, snapshotsPerRun,
		"simulated time between snapshots in fields.h5, s; 0 = none besides the initial and final fields",
		"or no snapshot would be written between the initial and final fields; 0 writes none between them")
	checkFields(c, p)
	if p.OK("output.compression") {
		p.IntRange("output.compression", int64(o.Compression), 0, maxCompression,
			"deflate level of fields.h5; 0 = none, 9 = smallest file and slowest", "e.g. compression = 4")
	}
	checkCadence(p, "output.checkpoint_every", o.CheckpointEvery, dur, durOK, false, checkpointsPerRun,
		"simulated time between checkpoints, s", "or no checkpoint would come due in simulated time")
	if m := o.CheckpointWallMinutes; p.OK("output.checkpoint_wall_minutes") && !(m > 0 && m <= maxCheckpointWallMinutes) {
		p.Add("output.checkpoint_wall_minutes", stricttoml.FormatFloat(m), "must be > 0 and <= 1440 (wall-clock time between checkpoints, minutes; 1440 = one day); e.g. checkpoint_wall_minutes = 30")
	}
	if p.OK("output.probes") {
		p.IntRange("output.probes", int64(o.Probes), 1, maxProbes,
			"probes recording u and w, evenly spaced in x along the canopy top, or at mid-depth without a canopy", "e.g. probes = 8")
	}
	if p.OK("output.phase_bins") {
		if c.Forcing.Oscillating() {
			p.IntRange("output.phase_bins", int64(o.PhaseBins), 2, maxPhaseBins,
				"bins of the forcing cycle for the phase-averaged statistics", "e.g. phase_bins = 12")
		} else {
			p.OnlyWith("output.phase_bins", o.PhaseBins != 0, strconv.Itoa(o.PhaseBins), "the forcing has [[forcing.wave]] or [[forcing.tide]] tables")
		}
	}
}

// checkCadence checks an interval of simulated time between outputs: > 0,
// or >= 0 with zeroOK, and at most time.duration (dur, when durOK). perRun
// gives the suggestion duration/perRun; why ends the message for a value
// above the duration.
func checkCadence(p *stricttoml.Problems, key string, v, dur float64, durOK, zeroOK bool, perRun float64, desc, why string) {
	if !p.OK(key) {
		return
	}
	name := stricttoml.LastComponent(key)
	hint := "at most time.duration"
	if durOK {
		hint += " = " + stricttoml.FormatFloat(dur) + " s; e.g. " + name + " = " + stricttoml.FormatRound(dur/perRun)
	}
	if zeroOK && !p.AtLeast(key, v, 0, desc, hint) || !zeroOK && !p.Positive(key, v, desc, hint) {
		return
	}
	if durOK && v > dur {
		p.Addf(key, stricttoml.FormatFloat(v), "must not exceed time.duration = %s s, %s; e.g. %s = %s", stricttoml.FormatFloat(dur), why, name, stricttoml.FormatRound(dur/perRun))
	}
}

// fieldKey names entry i of output.fields.
func fieldKey(i int) string { return "output.fields[" + strconv.Itoa(i) + "]" }

// fmtStrings writes a list of strings as a TOML array.
func fmtStrings(list []string) string {
	quoted := make([]string, len(list))
	for i, s := range list {
		quoted[i] = strconv.Quote(s)
	}
	return "[" + strings.Join(quoted, ", ") + "]"
}

// checkFields checks output.fields: at least one entry, each a name of
// c.FieldNames, none twice. Entries that failed to decode are skipped.
func checkFields(c *Case, p *stricttoml.Problems) {
	if !p.OK("output.fields") {
		return
	}
	fields := c.Output.Fields
	allowed := c.FieldNames()
	if len(fields) == 0 {
		p.Add("output.fields", fmtStrings(fields), "must list at least one field for the snapshots of fields.h5, from "+fmtStrings(allowed)+`; e.g. fields = ["u", "w", "vorticity"], or remove the key for all of them`)
		return
	}
	first := map[string]int{}
	for i, name := range fields {
		key := fieldKey(i)
		if !p.OK(key) {
			continue // a problem from decoding
		}
		if !slices.Contains(allowed, name) {
			if c.badScalarName(name) {
				continue // reported at the scalar that has the name
			}
			msg := "is not a field a snapshot can hold; must be one of " + strings.TrimSuffix(strings.TrimPrefix(fmtStrings(allowed), "["), "]")
			if s := stricttoml.Closest(name, allowed); s != "" {
				msg += "; did you mean " + strconv.Quote(s) + "?"
			} else {
				msg += "; correct the name or remove the entry"
			}
			p.Add(key, strconv.Quote(name), msg)
			continue
		}
		if j, seen := first[name]; seen {
			p.Addf(key, strconv.Quote(name), "repeats %s (the %s entry of output.fields); list each field once: remove this entry", fieldKey(j), stricttoml.Ordinal(j+1))
			continue
		}
		first[name] = i
	}
}

func outputTemplate() string {
	return `[output]
# Simulated time between rows of mean profiles written, s.
# Default duration/100; > 0 and at most duration.
# profile_every = 6.0
# Simulated time between snapshots of the fields in fields.h5, s. The
# initial and final fields are always written; 0 writes none between them.
# Default duration/50; from 0 to duration.
# snapshot_every = 12.0
# The fields each snapshot holds, each at most once, at least one. Default
# all of them, in this order: the five flow fields
#   "u"          streamwise velocity, m/s
#   "w"          vertical velocity, m/s
#   "p"          kinematic pressure (pressure over density), m²/s²
#   "vorticity"  spanwise vorticity, 1/s
#   "nu_t"       subgrid eddy viscosity, m²/s (zero with closure "none")
# and then each [[scalar]] by its name (its concentration, in its unit).
# In a slab (domain.width and domain.ny) the snapshot holds the span average
# of each, and each in three dimensions at the cell centres; with "u" also
# the spanwise velocity "v" (m/s) and the vortex-core field "q_criterion"
# (1/s²), and with "u" and "w" the velocity as one vector.
# Messages count entries from 0: output.fields[0] is the first.
# fields = ["u", "w", "p", "vorticity", "nu_t"]
# Deflate level of fields.h5: none at 0, smallest file and slowest at 9.
# Default 4; an integer from 0 to 9.
# compression = 4
#
# Checkpoints, from which an interrupted run continues, are written
# whenever either of the two cadences below comes due.
# Simulated time between checkpoints, s.
# Default duration/10; > 0 and at most duration.
# checkpoint_every = 60.0
# Wall-clock time between checkpoints, minutes.
# Default 30; > 0 and at most 1440 (one day).
# checkpoint_wall_minutes = 30.0
#
# Number of probes that record time series of u and w (m/s), evenly spaced
# in x along the canopy top, or at mid-depth without a canopy.
# Default 8; an integer from 1 to 64.
# probes = 8
#
# Number of equal bins of the forcing cycle (the period of the first
# [[forcing.wave]] or [[forcing.tide]]) in which profiles, stresses, fluxes
# and uptake are also averaged by phase. Only with waves or tides; default
# 12 then; an integer from 2 to 360.
# phase_bins = 12
`
}
