package runfolder

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"
)

// Column names of the run folder's tables: the header of a column is its
// name followed by its unit in brackets ("z [m]"); ColumnName strips the
// unit again. Every table starts with ColZ or ColT, the tables by phase
// (phases.go) with ColZ or ColPhase.
const (
	ColZ          = "z" // m, cell-centre height
	ColT          = "t" // s, simulated time
	ColU          = "U" // m/s, x-mean streamwise velocity
	ColUU         = "u'u'"
	ColWW         = "w'w'"
	ColUW         = "u'w'"
	ColSubgrid    = "subgrid stress"
	ColTKE        = "TKE"
	ColNuT        = "nu_t"
	ColDispersive = "dispersive stress"
	ColVV         = "v'v'" // a slab's only
	ColDt         = "dt"
	ColBulk       = "bulk velocity"
	ColGradient   = "pressure gradient"
	ColCourant    = "Courant number"
	ColFreq       = "f"    // Hz
	ColPSD        = "S_ww" // m²/s
	// Per scalar NAME the columns of scalars.csv are "NAME" followed by
	// these suffixes, and those of uptake.csv likewise.
	SuffixMean            = " mean"
	SuffixResolvedFlux    = " resolved flux w'c'"
	SuffixDiffusiveFlux   = " diffusive flux"
	SuffixEddyDiffusivity = " eddy diffusivity"
	SuffixElementUptake   = " element uptake"
	SuffixUptakePerArea   = " uptake per surface area"
)

// head writes a column header: name and unit.
func head(name, unit string) string { return name + " [" + unit + "]" }

// readTable reads table name of run folder dir, naming the file in errors.
func readTable(dir, name string) (Table, string, error) {
	path := filepath.Join(dir, name)
	t, err := ReadCSV(path)
	return t, path, err
}

// readColumns reads the named columns of table file of run folder dir
// and builds the typed table from them.
func readColumns[T any](dir, file string, build func([][]float64) T, names ...string) (T, error) {
	t, path, err := readTable(dir, file)
	if err == nil {
		var c [][]float64
		if c, err = pick(t, path, names...); err == nil {
			return build(c), nil
		}
	}
	var zero T
	return zero, err
}

// pick returns the named columns of t, naming the file on failure.
func pick(t Table, path string, names ...string) ([][]float64, error) {
	out := make([][]float64, len(names))
	for i, n := range names {
		c, err := t.Column(n)
		if err != nil {
			return nil, fmt.Errorf("runfolder: %s: %v", path, err)
		}
		out[i] = c
	}
	return out, nil
}

// ProfileTable is final_profile.csv: the x-mean streamwise velocity at the cell
// centres in the final state.
type ProfileTable struct {
	Z []float64 // m
	U []float64 // m/s
}

// Write writes final_profile.csv into run folder dir.
func (p ProfileTable) Write(dir string) error {
	return Table{
		Header:  []string{head(ColZ, "m"), head(ColU, "m/s")},
		Columns: [][]float64{p.Z, p.U},
	}.WriteCSV(filepath.Join(dir, ProfileFile))
}

// ReadProfile reads final_profile.csv of run folder dir.
func ReadProfile(dir string) (ProfileTable, error) {
	return readColumns(dir, ProfileFile, func(c [][]float64) ProfileTable { return ProfileTable{c[0], c[1]} }, ColZ, ColU)
}

// ProfilesTable is profiles.csv: the x- and time-mean statistics after the
// spin-up at the cell centres (face quantities interpolated there); in a
// slab the means are over x, y and time, TKE includes v'v', and a last
// column ColVV holds v'v'.
type ProfilesTable struct {
	Z          []float64 // m
	U          []float64 // m/s
	UU, WW, UW []float64 // m²/s², resolved Reynolds stresses
	Subgrid    []float64 // m²/s², the modelled part of the shear stress
	TKE        []float64 // m²/s², resolved turbulent kinetic energy
	NuT        []float64 // m²/s, mean subgrid viscosity
	Dispersive []float64 // m²/s², dispersive stress
	VV         []float64 // m²/s², resolved spanwise normal stress of a slab; nil for a slice (no column)
}

// Write writes profiles.csv into run folder dir.
func (p ProfilesTable) Write(dir string) error {
	t := Table{
		Header: []string{head(ColZ, "m"), head(ColU, "m/s"), head(ColUU, "m2/s2"), head(ColWW, "m2/s2"), head(ColUW, "m2/s2"),
			head(ColSubgrid, "m2/s2"), head(ColTKE, "m2/s2"), head(ColNuT, "m2/s"), head(ColDispersive, "m2/s2")},
		Columns: [][]float64{p.Z, p.U, p.UU, p.WW, p.UW, p.Subgrid, p.TKE, p.NuT, p.Dispersive},
	}
	if p.VV != nil {
		t.Header = append(t.Header, head(ColVV, "m2/s2"))
		t.Columns = append(t.Columns, p.VV)
	}
	return t.WriteCSV(filepath.Join(dir, ProfilesFile))
}

// ReadProfiles reads profiles.csv of run folder dir; VV is nil when the
// table has no ColVV (a slice's).
func ReadProfiles(dir string) (ProfilesTable, error) {
	t, path, err := readTable(dir, ProfilesFile)
	if err != nil {
		return ProfilesTable{}, err
	}
	c, err := pick(t, path, ColZ, ColU, ColUU, ColWW, ColUW, ColSubgrid, ColTKE, ColNuT, ColDispersive)
	if err != nil {
		return ProfilesTable{}, err
	}
	p := ProfilesTable{c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7], c[8], nil}
	if vv, err := t.Column(ColVV); err == nil {
		p.VV = vv
	}
	return p, nil
}

// TimeSeriesTable is timeseries.csv: a row every output.profile_every of
// simulated time.
type TimeSeriesTable struct {
	T        []float64 // s
	Dt       []float64 // s, the last step
	Bulk     []float64 // m/s, depth-mean velocity
	Gradient []float64 // m/s², driving pressure gradient
	Courant  []float64 // advective Courant number of the last step
	// BentHeight is the mean bent height of flexible blades (m), column
	// ColBentHeight; nil (no column) for rigid elements.
	BentHeight []float64
}

// Write writes timeseries.csv into run folder dir.
func (s TimeSeriesTable) Write(dir string) error {
	t := Table{
		Header:  []string{head(ColT, "s"), head(ColDt, "s"), head(ColBulk, "m/s"), head(ColGradient, "m/s2"), ColCourant},
		Columns: [][]float64{s.T, s.Dt, s.Bulk, s.Gradient, s.Courant},
	}
	if s.BentHeight != nil {
		t.Header = append(t.Header, head(ColBentHeight, "m"))
		t.Columns = append(t.Columns, s.BentHeight)
	}
	return t.WriteCSV(filepath.Join(dir, TimeSeriesFile))
}

// ReadTimeSeries reads timeseries.csv of run folder dir, with the bent
// height where it has the column.
func ReadTimeSeries(dir string) (TimeSeriesTable, error) {
	t, path, err := readTable(dir, TimeSeriesFile)
	if err != nil {
		return TimeSeriesTable{}, err
	}
	c, err := pick(t, path, ColT, ColDt, ColBulk, ColGradient, ColCourant)
	if err != nil {
		return TimeSeriesTable{}, err
	}
	out := TimeSeriesTable{c[0], c[1], c[2], c[3], c[4], nil}
	if h, err := t.Column(ColBentHeight); err == nil {
		out.BentHeight = h
	}
	return out, nil
}

// ProbeSeries is the record of one probe.
type ProbeSeries struct {
	// X and Z are the point asked for (m), as the header gives them (to 4
	// significant digits).
	X, Z float64
	// Y is the spanwise position (m) of a probe of a slab, as the header
	// gives it; nil for a slice, whose headers name x and z alone.
	Y    *float64
	U, W []float64 // m/s
}

// ProbesTable is probes.csv: u and w at the probes every step. The
// columns after ColT are u_N and w_N of probe N, named
// "u_N (x=X m, z=Z m) [m/s]".
type ProbesTable struct {
	T      []float64 // s
	Probes []ProbeSeries
}

// probeName is the name of a probe column.
func probeName(v string, n int, p ProbeSeries) string {
	if p.Y != nil {
		return v + "_" + strconv.Itoa(n) + " (x=" + shortFloat(p.X) + " m, y=" + shortFloat(*p.Y) + " m, z=" + shortFloat(p.Z) + " m)"
	}
	return v + "_" + strconv.Itoa(n) + " (x=" + shortFloat(p.X) + " m, z=" + shortFloat(p.Z) + " m)"
}

// shortFloat writes a probe coordinate to 4 significant digits.
func shortFloat(v float64) string { return fmt.Sprintf("%.4g", v) }

// Write writes probes.csv into run folder dir.
func (p ProbesTable) Write(dir string) error {
	t := Table{Header: []string{head(ColT, "s")}, Columns: [][]float64{p.T}}
	for n, pr := range p.Probes {
		t.Header = append(t.Header, head(probeName("u", n, pr), "m/s"), head(probeName("w", n, pr), "m/s"))
		t.Columns = append(t.Columns, pr.U, pr.W)
	}
	return t.WriteCSV(filepath.Join(dir, ProbesFile))
}

// ReadProbes reads probes.csv of run folder dir.
func ReadProbes(dir string) (ProbesTable, error) {
	t, path, err := readTable(dir, ProbesFile)
	if err != nil {
		return ProbesTable{}, err
	}
	c, err := pick(t, path, ColT)
	if err != nil {
		return ProbesTable{}, err
	}
	out := ProbesTable{T: c[0]}
	for n := 0; ; n++ {
		var pr ProbeSeries
		var found int
		for i, h := range t.Header {
			name := ColumnName(h)
			for _, v := range []string{"u", "w"} {
				prefix := v + "_" + strconv.Itoa(n) + " ("
				if !strings.HasPrefix(name, prefix) {
					continue
				}
				found++
				if v == "u" {
					pr.U = t.Columns[i]
				} else {
					pr.W = t.Columns[i]
				}
				x, y, z, err := parsePoint(strings.TrimPrefix(name, prefix))
				if err != nil {
					return ProbesTable{}, fmt.Errorf("runfolder: %s: column %q: %v", path, h, err)
				}
				pr.X, pr.Y, pr.Z = x, y, z
			}
		}
		if found == 0 {
			break
		}
		if pr.U == nil || pr.W == nil {
			return ProbesTable{}, fmt.Errorf("runfolder: %s: probe %d has a column of u or of w but not both", path, n)
		}
		out.Probes = append(out.Probes, pr)
	}
	if len(out.Probes) != (len(t.Header)-1)/2 || len(t.Header)%2 == 0 {
		return ProbesTable{}, fmt.Errorf("runfolder: %s: the columns after %q should be u_N and w_N of probes 0, 1, 2, …", path, ColT)
	}
	return out, nil
}

// parsePoint reads "x=X m, z=Z m)".
func parsePoint(s string) (x float64, y *float64, z float64, err error) {
	xs, rest, ok1 := strings.Cut(strings.TrimPrefix(s, "x="), " m, ")
	var ys string
	if after, ok := strings.CutPrefix(rest, "y="); ok {
		ys, rest, ok1 = strings.Cut(after, " m, ")
		ok1 = ok1 && ys != ""
	}
	zs, _, ok2 := strings.Cut(strings.TrimPrefix(rest, "z="), " m)")
	if !strings.HasPrefix(s, "x=") || !ok1 || !strings.HasPrefix(rest, "z=") || !ok2 {
		return 0, nil, 0, fmt.Errorf("the name should end in (x=X m, z=Z m), or (x=X m, y=Y m, z=Z m) in a slab")
	}
	if x, err = strconv.ParseFloat(xs, 64); err == nil {
		z, err = strconv.ParseFloat(zs, 64)
	}
	if err == nil && ys != "" {
		var v float64
		v, err = strconv.ParseFloat(ys, 64)
		y = &v
	}
	if err != nil {
		return 0, nil, 0, fmt.Errorf("the probe position is not a number: %v", err)
	}
	return x, y, z, nil
}

// SpectrumTable is spectrum.csv: the one-sided power spectral density of
// w at the probes after the spin-up, the mean over the probes, from f = 0
// up. Summary.Spectrum says how it was taken.
type SpectrumTable struct {
	Freq []float64 // Hz
	PSD  []float64 // m²/s
}

// Write writes spectrum.csv into run folder dir.
func (s SpectrumTable) Write(dir string) error {
	return Table{
		Header:  []string{head(ColFreq, "Hz"), head(ColPSD, "m2/s")},
		Columns: [][]float64{s.Freq, s.PSD},
	}.WriteCSV(filepath.Join(dir, SpectrumFile))
}

// ReadSpectrum reads spectrum.csv of run folder dir.
func ReadSpectrum(dir string) (SpectrumTable, error) {
	return readColumns(dir, SpectrumFile, func(c [][]float64) SpectrumTable { return SpectrumTable{c[0], c[1]} }, ColFreq, ColPSD)
}

// ScalarProfile is one scalar's columns of scalars.csv, at the cell
// centres (face fluxes interpolated there, the wall values at the end
// cells). Concentrations are in the scalar's unit.
type ScalarProfile struct {
	Name            string
	Mean            []float64 // unit
	Resolved        []float64 // unit·m/s, ⟨w′c′⟩
	Diffusive       []float64 // unit·m/s, molecular and subgrid flux
	EddyDiffusivity []float64 // m²/s
}

// ScalarsTable is scalars.csv: the mean profiles and fluxes of every
// scalar.
type ScalarsTable struct {
	Z       []float64 // m
	Scalars []ScalarProfile
}

// Write writes scalars.csv into run folder dir.
func (s ScalarsTable) Write(dir string) error {
	t := Table{Header: []string{head(ColZ, "m")}, Columns: [][]float64{s.Z}}
	for _, p := range s.Scalars {
		t.Header = append(t.Header, head(p.Name+SuffixMean, "unit"), head(p.Name+SuffixResolvedFlux, "unit m/s"),
			head(p.Name+SuffixDiffusiveFlux, "unit m/s"), head(p.Name+SuffixEddyDiffusivity, "m2/s"))
		t.Columns = append(t.Columns, p.Mean, p.Resolved, p.Diffusive, p.EddyDiffusivity)
	}
	return t.WriteCSV(filepath.Join(dir, ScalarsFile))
}

// ReadScalars reads scalars.csv of run folder dir.
func ReadScalars(dir string) (ScalarsTable, error) {
	z, gs, err := readGroups(dir, ScalarsFile, SuffixMean, SuffixResolvedFlux, SuffixDiffusiveFlux, SuffixEddyDiffusivity)
	out := ScalarsTable{Z: z}
	for _, g := range gs {
		out.Scalars = append(out.Scalars, ScalarProfile{g.name, g.cols[0], g.cols[1], g.cols[2], g.cols[3]})
	}
	return out, err
}

// group is the columns of one scalar in a table with a group of columns
// per scalar.
type group struct {
	name string
	cols [][]float64
}

// readGroups reads table file of run folder dir: ColZ, then for each
// scalar NAME the columns NAME+suffix, in order.
func readGroups(dir, file string, suffixes ...string) ([]float64, []group, error) {
	t, path, err := readTable(dir, file)
	if err != nil {
		return nil, nil, err
	}
	z, err := pick(t, path, ColZ)
	if err != nil {
		return nil, nil, err
	}
	var gs []group
	for _, name := range scalarNames(t, suffixes[0]) {
		c, err := pick(t, path, names(name, suffixes)...)
		if err != nil {
			return nil, nil, err
		}
		gs = append(gs, group{name, c})
	}
	if 1+len(suffixes)*len(gs) != len(t.Header) {
		return nil, nil, fmt.Errorf("runfolder: %s: the columns after %q should be %d per scalar NAME: %s", path, ColZ, len(suffixes), strings.Join(names("NAME", suffixes), ", "))
	}
	return z[0], gs, nil
}

// names returns prefix+suffix for each suffix.
func names(prefix string, suffixes []string) []string {
	out := make([]string, len(suffixes))
	for i, s := range suffixes {
		out[i] = prefix + s
	}
	return out
}

// scalarNames returns the scalar names of the columns that end in suffix,
// in order.
func scalarNames(t Table, suffix string) []string {
	var names []string
	for _, h := range t.Header {
		if n, ok := strings.CutSuffix(ColumnName(h), suffix); ok {
			names = append(names, n)
		}
	}
	return names
}

// ScalarUptake is one scalar's columns of uptake.csv.
type ScalarUptake struct {
	Name string
	// Element is the element uptake per unit volume over the statistics
	// period (unit/(m³ s)), the x-mean at each level.
	Element []float64
	// PerArea is Element over the mean element surface area per unit
	// volume (unit·m/s), 0 where there are no elements.
	PerArea []float64
}

// UptakeTable is uptake.csv: element uptake by height, per scalar.
type UptakeTable struct {
	Z       []float64 // m
	Scalars []ScalarUptake
}

// Write writes uptake.csv into run folder dir.
func (u UptakeTable) Write(dir string) error {
	t := Table{Header: []string{head(ColZ, "m")}, Columns: [][]float64{u.Z}}
	for _, s := range u.Scalars {
		t.Header = append(t.Header, head(s.Name+SuffixElementUptake, "unit/(m3 s)"), head(s.Name+SuffixUptakePerArea, "unit m/s"))
		t.Columns = append(t.Columns, s.Element, s.PerArea)
	}
	return t.WriteCSV(filepath.Join(dir, UptakeFile))
}

// ReadUptake reads uptake.csv of run folder dir.
func ReadUptake(dir string) (UptakeTable, error) {
	z, gs, err := readGroups(dir, UptakeFile, SuffixElementUptake, SuffixUptakePerArea)
	out := UptakeTable{Z: z}
	for _, g := range gs {
		out.Scalars = append(out.Scalars, ScalarUptake{g.name, g.cols[0], g.cols[1]})
	}
	return out, err
}
