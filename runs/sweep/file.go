package sweep

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"rollerbed/io/casefile"
	"rollerbed/io/stricttoml"
)

// Ways to combine the axes of a sweep (the combine key).
const (
	// CombineProduct makes one member for every combination of the axes'
	// values: the first axis varies slowest, the last fastest.
	CombineProduct = "product"
	// CombineZip makes member i from value i of every axis; the axes must
	// have equal lengths.
	CombineZip = "zip"
)

// Spacings of an axis: how its values are given.
const (
	SpacingValues = "values" // a list of values
	SpacingLinear = "linear" // count values evenly spaced from from to to
	SpacingLog    = "log"    // count values evenly spaced in log(value)
)

// SeedKey is the case key that replicates vary.
const SeedKey = "initial.seed"

// MaxMembers bounds the members of one sweep: more is almost surely a
// mistake in the axes (and more than a Slurm array usually takes).
const MaxMembers = 10000

// File is a parsed sweep file.
type File struct {
	// Path is the sweep file's name as given to Load; "" for Parse.
	Path string
	// Text is the sweep file as read, kept in the manifest.
	Text string
	// Title is free text describing the sweep; optional.
	Title string
	// Base is the base case file as written in the sweep file, and
	// BasePath the same resolved against the sweep file's folder.
	Base, BasePath string
	// Combine is CombineProduct (the default) or CombineZip.
	Combine string
	// Axes are the [[axis]] tables in the order of the file.
	Axes []Axis
	// Replicates is the number of runs of every combination, each with
	// initial.seed = base seed + replicate index (0, 1, ...); 1 (the
	// default) for none. Seeds, when given, lists the seeds instead.
	Replicates int
	Seeds      []int64
	// Slurm holds the job-array settings; nil without a [slurm] table.
	Slurm *Slurm

	pos  map[string]stricttoml.Pos // where the keys sit in Text
	keys []*caseKey                // resolved keys of Axes
}

// Axis is one [[axis]] table: a case key and its values.
type Axis struct {
	Key string
	// Spacing is SpacingValues, SpacingLinear or SpacingLog.
	Spacing string
	// From, To and Count are the range of a linear or log axis.
	From, To float64
	Count    int
	// Values are the values the axis takes, expanded from the range, in
	// the type the case file holds (float64, int64, string, bool or an
	// array).
	Values []any
}

// Slurm is the [slurm] table: what sbatch is asked for, per member.
type Slurm struct {
	// TimeLimit is the wall time per member in Slurm's notation
	// ("30", "01:00:00", "1-12:00:00"); "" leaves the partition default.
	TimeLimit string `json:"time_limit,omitempty" toml:"time_limit" example:"time_limit = \"01:00:00\""`
	// CPUsPerTask is the cores per member, >= 1; default 1. Members whose
	// numerics.workers is 0 (all cores) get this many workers.
	CPUsPerTask int `json:"cpus_per_task" toml:"cpus_per_task" example:"cpus_per_task = 4"`
	// Memory is the memory per member ("4G", "500M"); "" leaves the
	// partition default.
	Memory string `json:"memory,omitempty" toml:"memory" example:"memory = \"4G\""`
	// MaxConcurrent caps the members running at once (the %N of
	// --array); 0 for no cap.
	MaxConcurrent int `json:"max_concurrent,omitempty" toml:"max_concurrent" example:"max_concurrent = 8"`
	// Partition is the partition to submit to; "" for the default one.
	Partition string `json:"partition,omitempty" toml:"partition" example:"partition = \"normal\""`
	// Extra holds more sbatch options, one per entry ("--account=lab",
	// "--qos=short"), written as #SBATCH lines.
	Extra []string `json:"extra,omitempty" toml:"extra" example:"extra = [\"--account=lab42\", \"--qos=short\"]"`
	// Setup holds shell lines the batch script runs before the member
	// ("module load hdf5", "export OMP_NUM_THREADS=1"), in order, before
	// the script turns on `set -u`.
	Setup []string `json:"setup,omitempty" toml:"setup" example:"setup = [\"module load hdf5\", \"export OMP_NUM_THREADS=1\"]"`
	// Binary is the rollerbed binary the array tasks run, an absolute path
	// the compute nodes reach (a relative one in a sweep file is taken
	// from the file's folder); "" for the binary that submits.
	Binary string `json:"binary,omitempty" toml:"binary" example:"binary = \"/home/me/bin/rollerbed\""`
}

// Load reads and parses the sweep file at path. The base case path in it
// is resolved against the folder of path.
func Load(path string) (*File, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("reading sweep file: %w", err)
	}
	return Parse(text, path)
}

// Problem is one mistake in a sweep file, or in a member case the sweep
// makes from its base: the case file's problem type, so both print alike
// (FILE line N: key = value: what is wrong and the fix). Problems of a
// sweep given without a file name name it "sweep file".
type Problem = stricttoml.Problem

// Errors is every problem found in a sweep, in the order of their lines
// (problems without a line last). Parse, Load and NewPlan return it.
type Errors = stricttoml.Errors

// lineOf returns the line of key in the sweep file, or of the nearest
// enclosing table; 0 when the file holds neither.
func (f *File) lineOf(key string) int { return stricttoml.LineOf(f.pos, key) }

// format is how sweep files name themselves in problems.
var format = stricttoml.Format{Doc: "sweep file", Example: "an example that `rollerbed sweep example` writes"}

// document is a sweep file as the reader decodes it: the keys, their
// types and the examples its messages suggest.
type document struct {
	Title      string      `toml:"title" example:"title = \"canopy density sweep\""`
	Base       string      `toml:"base" example:"base = \"flume.toml\""`
	Combine    string      `toml:"combine" example:"combine = \"product\""`
	Replicates int         `toml:"replicates" example:"replicates = 3"`
	Seeds      []int64     `toml:"seeds" example:"seeds = [1, 2, 3]"`
	Axes       []axisTable `toml:"axis"`
	Slurm      *Slurm      `toml:"slurm"`
}

// axisTable is one [[axis]] table as written: the values stay as decoded
// until the case key says what type they must have.
type axisTable struct {
	Key    string      `toml:"key" example:"key = \"canopy.frontal_area\""`
	Values any         `toml:"values"`
	Linear *rangeTable `toml:"linear"`
	Log    *rangeTable `toml:"log"`
}

// rangeTable is a linear or log range of an axis.
type rangeTable struct {
	From  float64 `toml:"from" example:"from = 1.0"`
	To    float64 `toml:"to" example:"to = 8.0"`
	Count int     `toml:"count" example:"count = 4"`
}

// Parse reads a sweep from TOML text; path is the file's name, for
// messages and for resolving the base case ("" resolves against the
// working folder). It rejects syntax errors, unknown keys, values of the
// wrong type and bad axes (an axis key that is not in the case schema,
// values of the wrong type for it, an empty list, a count below 1, zip
// axes of unequal lengths, a log range with an end <= 0), and reports all
// of them at once as *Errors. It does not read the base case; NewPlan does.
func Parse(text []byte, path string) (*File, error) {
	doc, err := format.Read(text, path)
	if err != nil {
		return nil, err
	}
	var d document
	doc.Decode(&d)
	p := doc.Problems
	f := &File{Path: path, Text: string(text), Title: d.Title, Combine: CombineProduct, Replicates: 1, pos: doc.Positions()}
	f.checkBase(p, d.Base)
	f.checkCombine(p, d.Combine)
	f.checkReplicates(p, d)
	f.parseAxes(p, d.Axes)
	f.checkSeedAxis(p)
	if d.Slurm != nil {
		f.Slurm = checkSlurm(p, d.Slurm)
		if b := f.Slurm.Binary; b != "" && f.Path != "" {
			f.Slurm.Binary = absOr(casefile.ResolvePath(b, filepath.Dir(f.Path)))
		}
	}
	f.checkSize(p)
	if err := p.Err(); err != nil {
		return nil, err
	}
	return f, nil
}

// checkCombine checks the combine key.
func (f *File) checkCombine(p *stricttoml.Problems, combine string) {
	if !p.Has("combine") || !p.OK("combine") {
		return
	}
	if combine != CombineProduct && combine != CombineZip {
		p.Add("combine", strconv.Quote(combine), `must be "product" (every combination of the axes' values) or "zip" (the i-th value of every axis together)`)
		return
	}
	f.Combine = combine
}

// checkSeedAxis refuses an axis that varies the seed when replicates or
// seeds vary it too.
func (f *File) checkSeedAxis(p *stricttoml.Problems) {
	if !p.Has("seeds") && f.Replicates == 1 {
		return
	}
	for i, k := range f.keys {
		if k != nil && k.text == SeedKey {
			p.Add(fmt.Sprintf("axis[%d].key", i), strconv.Quote(SeedKey), "is varied by an axis and by replicates/seeds at once; drop the axis, or the replicates and seeds keys")
		}
	}
}

// checkSize refuses a sweep that varies nothing or makes too many members;
// it only looks once the rest is right.
func (f *File) checkSize(p *stricttoml.Problems) {
	if !p.Empty() {
		return
	}
	if len(f.Axes) == 0 && f.Replicates == 1 && len(f.Seeds) == 0 {
		p.Add("", "", `the sweep varies nothing; add an [[axis]] table with a key and its values, e.g. key = "canopy.frontal_area" and values = [2.0, 4.0, 8.0], or replicates = N`)
	} else if n := f.size(); n > MaxMembers {
		p.Add("", "", fmt.Sprintf("the sweep makes %d members, more than %d; use fewer values, or split it into several sweeps", n, MaxMembers))
	}
}

// checkBase checks the base key and resolves it against the sweep file's
// folder.
func (f *File) checkBase(p *stricttoml.Problems, base string) {
	switch {
	case !p.Has("base"):
		p.Add("base", "", `is missing; name the base case file, relative to this sweep file, e.g. base = "flume.toml"`)
	case !p.OK("base"):
	case strings.TrimSpace(base) == "":
		p.Add("base", `""`, `is empty; name the base case file, e.g. base = "flume.toml"`)
	default:
		f.Base = base
		f.BasePath = base
		if f.Path != "" {
			f.BasePath = casefile.ResolvePath(base, filepath.Dir(f.Path))
		}
	}
}

// checkReplicates checks replicates and seeds, which give the seeds of the
// replicates two ways.
func (f *File) checkReplicates(p *stricttoml.Problems, d document) {
	if p.Has("replicates") && p.OK("replicates") {
		if n := d.Replicates; n < 1 || n > MaxMembers {
			p.Add("replicates", strconv.Itoa(n), fmt.Sprintf("must be from 1 to %d: the runs of each combination, with initial.seed = base seed + 0, 1, ...", MaxMembers))
		} else {
			f.Replicates = n
		}
	}
	if !p.Has("seeds") {
		return
	}
	if p.Has("replicates") {
		p.Add("seeds", "", "is given together with replicates; give one of them: replicates = N for seeds base + 0 .. N-1, or seeds = [...] for your own")
		return
	}
	if p.OK("seeds") && len(d.Seeds) == 0 {
		p.Add("seeds", "[]", "is empty; give at least one seed, e.g. seeds = [1, 2, 3], or leave the key out")
		return
	}
	seen := map[int64]bool{}
	for i, n := range d.Seeds {
		key := fmt.Sprintf("seeds[%d]", i)
		switch {
		case !p.OK(key):
		case n < 0:
			p.Add(key, strconv.FormatInt(n, 10), "must be >= 0 (seeds are non-negative integers)")
		case seen[n]:
			p.Add(key, strconv.FormatInt(n, 10), "appears twice in seeds; each seed once, or two members would be the same run")
		default:
			seen[n] = true
			f.Seeds = append(f.Seeds, n)
		}
	}
}

// parseAxes reads the [[axis]] tables.
func (f *File) parseAxes(p *stricttoml.Problems, axes []axisTable) {
	seen := map[string]int{}
	for i, t := range axes {
		a, k := parseAxis(p, i, t)
		if a == nil {
			f.Axes = append(f.Axes, Axis{})
			f.keys = append(f.keys, nil)
			continue
		}
		if j, dup := seen[a.Key]; dup {
			p.Add(fmt.Sprintf("axis[%d].key", i), strconv.Quote(a.Key), fmt.Sprintf("is varied by axis[%d] already; vary each key in one axis", j))
		}
		seen[a.Key] = i
		f.Axes = append(f.Axes, *a)
		f.keys = append(f.keys, k)
	}
	f.checkRepeats(p)
	if f.Combine != CombineZip || len(axes) < 2 {
		return
	}
	var lens []string
	equal := true
	for i, a := range f.Axes {
		if a.Values == nil {
			return // already a problem
		}
		lens = append(lens, fmt.Sprintf("axis[%d] (%s) has %d", i, a.Key, len(a.Values)))
		equal = equal && len(a.Values) == len(f.Axes[0].Values)
	}
	if !equal {
		p.Add("combine", `"zip"`, "needs axes of equal length, but "+strings.Join(lens, ", ")+`; give every axis the same number of values, or use combine = "product"`)
	}
}

// size returns the number of members the sweep makes (the axes are known
// to be consistent).
func (f *File) size() int {
	n := 1
	if f.Combine == CombineZip && len(f.Axes) > 0 {
		n = len(f.Axes[0].Values)
	} else {
		for _, a := range f.Axes {
			n *= len(a.Values)
			if n > MaxMembers {
				return n
			}
		}
	}
	return n * max(f.Replicates, len(f.Seeds))
}

// checkRepeats finds values that would make two members the same run: a
// value given twice in an axis of a product, or the same values at two
// positions of zipped axes.
func (f *File) checkRepeats(p *stricttoml.Problems) {
	for i, a := range f.Axes {
		if a.Values == nil {
			return // already a problem
		}
		if f.Combine == CombineZip && len(f.Axes) > 1 {
			continue
		}
		seen := map[string]int{}
		for j, v := range a.Values {
			t := valueText(v)
			if k, dup := seen[t]; dup {
				key := fmt.Sprintf("axis[%d].%s", i, a.Spacing)
				if a.Spacing == SpacingValues {
					key = fmt.Sprintf("axis[%d].values[%d]", i, j)
				}
				p.Add(key, t, fmt.Sprintf("repeats the value at position %d of this axis; give each value once, or two members would be the same run", k))
				break
			}
			seen[t] = j
		}
	}
	if f.Combine != CombineZip || len(f.Axes) < 2 {
		return
	}
	n := len(f.Axes[0].Values)
	seen := map[string]int{}
	for j := 0; j < n; j++ {
		var parts []string
		for _, a := range f.Axes {
			if j >= len(a.Values) {
				return // unequal lengths, reported by the caller
			}
			parts = append(parts, valueText(a.Values[j]))
		}
		t := strings.Join(parts, "\x00")
		if k, dup := seen[t]; dup {
			p.Add("combine", `"zip"`, fmt.Sprintf("gives the same values at positions %d and %d of every axis, so two members would be the same run; change one of them", k, j))
			return
		}
		seen[t] = j
	}
}

// parseAxis reads one [[axis]] table.
func parseAxis(p *stricttoml.Problems, i int, t axisTable) (*Axis, *caseKey) {
	prefix := fmt.Sprintf("axis[%d]", i)
	if !p.Has(prefix + ".key") {
		p.Add(prefix, "", `has no key; name the case key to vary, e.g. key = "canopy.frontal_area"`)
		return nil, nil
	}
	if !p.OK(prefix + ".key") {
		return nil, nil
	}
	ck, err := resolveKey(t.Key)
	if err != nil {
		p.Add(prefix+".key", strconv.Quote(t.Key), err.Error())
		return nil, nil
	}
	var given []string
	for _, s := range []string{SpacingValues, SpacingLinear, SpacingLog} {
		if p.Has(prefix + "." + s) {
			given = append(given, s)
		}
	}
	switch len(given) {
	case 0:
		p.Add(prefix, "", "gives no values for "+t.Key+"; add one of values = [...], linear = { from = 1.0, to = 4.0, count = 4 } or log = { from = 0.5, to = 8.0, count = 5 }")
		return nil, nil
	case 1:
	default:
		p.Add(prefix, "", "gives "+strings.Join(given, " and ")+" for "+t.Key+"; give exactly one of values, linear and log")
		return nil, nil
	}
	a := &Axis{Key: t.Key, Spacing: given[0]}
	key := prefix + "." + a.Spacing
	switch {
	case !p.OK(key):
	case a.Spacing == SpacingValues:
		a.Values = parseValues(p, key, t.Values, ck)
	case a.Spacing == SpacingLinear:
		a.Values = parseRange(p, key, a, t.Linear, ck)
	default:
		a.Values = parseRange(p, key, a, t.Log, ck)
	}
	if a.Values == nil {
		return nil, nil
	}
	return a, ck
}

func parseValues(p *stricttoml.Problems, key string, v any, ck *caseKey) []any {
	list, ok := v.([]any)
	if !ok {
		p.Add(key, stricttoml.FormatValue(v), "must be an array of values for "+ck.text+", e.g. values = [2.0, 4.0, 8.0]")
		return nil
	}
	if len(list) == 0 {
		p.Add(key, "[]", "is empty; give at least one value for "+ck.text+", e.g. values = [2.0, 4.0, 8.0]")
		return nil
	}
	out := make([]any, 0, len(list))
	for j, e := range list {
		c, err := ck.convert(e)
		if err != nil {
			p.Add(fmt.Sprintf("%s[%d]", key, j), stricttoml.FormatValue(e), err.Error())
			continue
		}
		out = append(out, c)
	}
	if len(out) < len(list) {
		return nil
	}
	return out
}

// parseRange checks a linear or log range table and expands it.
func parseRange(p *stricttoml.Problems, key string, a *Axis, r *rangeTable, ck *caseKey) []any {
	if ck.leaf.Kind != stricttoml.Float && ck.leaf.Kind != stricttoml.Int {
		p.Add(key, "", fmt.Sprintf("cannot make a range of %s, which is %s; give its values = [...]", ck.text, ck.leaf.Kind))
		return nil
	}
	if !checkRange(p, key, a.Spacing, r) {
		return nil
	}
	a.From, a.To, a.Count = r.From, r.To, r.Count
	vals := expandRange(a.Spacing, r.From, r.To, a.Count)
	if ck.leaf.Kind == stricttoml.Int {
		return wholeValues(p, key, vals, ck)
	}
	out := make([]any, len(vals))
	for j, x := range vals {
		out[j] = x
	}
	return out
}

// checkRange checks the keys of a linear or log range table at key.
func checkRange(p *stricttoml.Problems, key, spacing string, r *rangeTable) bool {
	for _, k := range []string{"from", "to", "count"} {
		if !p.Has(key + "." + k) {
			p.Add(key, "", "has no "+k+"; a range needs from, to and count, e.g. "+spacing+" = { from = 1.0, to = 8.0, count = 4 }")
			return false
		}
		if !p.OK(key + "." + k) {
			return false
		}
	}
	ok := p.FiniteValue(key+".from", r.From, "", "write e.g. from = 1.0")
	ok = p.FiniteValue(key+".to", r.To, "", "write e.g. to = 8.0") && ok
	if r.Count < 1 || r.Count > MaxMembers {
		p.Add(key+".count", strconv.Itoa(r.Count), fmt.Sprintf("must be from 1 to %d: the number of values from from to to (1 gives from alone)", MaxMembers))
		return false
	}
	for _, end := range []struct {
		k string
		v float64
	}{{"from", r.From}, {"to", r.To}} {
		if spacing == SpacingLog && end.v <= 0 {
			p.Add(key+"."+end.k, stricttoml.FormatValue(end.v), "must be > 0: a log range needs positive ends; use linear = {...} for a range through zero")
			ok = false
		}
	}
	if ok && r.Count > 1 && r.From == r.To {
		p.Add(key, "", fmt.Sprintf("has from = to = %s with count = %d, which gives the same value %d times; widen the range or set count = 1", stricttoml.FormatValue(r.From), r.Count, r.Count))
		return false
	}
	return ok
}

// wholeValues turns the values of a range for an integer key into
// integers, refusing values that are not whole or that repeat.
func wholeValues(p *stricttoml.Problems, key string, vals []float64, ck *caseKey) []any {
	out := make([]any, len(vals))
	for j, x := range vals {
		r := math.Round(x)
		if math.Abs(x-r) > 1e-9*math.Max(1, math.Abs(x)) {
			p.Add(key, "", fmt.Sprintf("gives %s, not a whole number, for the integer key %s; choose from, to and count so every value is whole, or give values = [...]", stricttoml.FormatValue(x), ck.text))
			return nil
		}
		out[j] = int64(r)
		if j > 0 && out[j] == out[j-1] {
			p.Add(key, "", fmt.Sprintf("gives %d twice for the integer key %s; use a smaller count", out[j], ck.text))
			return nil
		}
	}
	return out
}

// expandRange returns count values from from to to, evenly spaced in the
// value (linear) or in its logarithm (log). The ends are exact; the values
// between are rounded to 12 significant digits, so that a linear range
// from 0.1 in steps of 0.1 gives 0.3 and not 0.30000000000000004.
func expandRange(spacing string, from, to float64, count int) []float64 {
	out := make([]float64, count)
	if count == 1 {
		out[0] = from
		return out
	}
	n := float64(count - 1)
	for i := range out {
		t := float64(i) / n
		if spacing == SpacingLog {
			out[i] = math.Exp(math.Log(from) + t*(math.Log(to)-math.Log(from)))
		} else {
			out[i] = from + t*(to-from)
		}
		out[i] = round12(out[i])
	}
	out[0], out[count-1] = from, to
	return out
}

// round12 rounds x to 12 significant digits.
func round12(x float64) float64 {
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 12, 64), 64)
	if err != nil {
		return x
	}
	return r
}

var (
	timeLimitRE = regexp.MustCompile(`^(\d+-\d{1,2}(:\d{1,2}(:\d{1,2})?)?|\d+(:\d{1,2}(:\d{1,2})?)?)$`)
	memoryRE    = regexp.MustCompile(`^\d+[KMGT]?$`)
	partitionRE = regexp.MustCompile(`^[A-Za-z0-9_.,-]+$`)
)

// slurmPatterns are the forms of the [slurm] keys that hold Slurm's own
// notation, with the fix for a value of another form.
var slurmPatterns = []struct {
	key string
	re  *regexp.Regexp
	msg string
}{
	{"time_limit", timeLimitRE, `is not a Slurm time limit; write minutes ("90"), hours:minutes:seconds ("01:30:00") or days-hours:minutes:seconds ("1-12:00:00")`},
	{"memory", memoryRE, `is not a Slurm memory size; write a whole number with an optional unit K, M, G or T, e.g. "4G" or "500M"`},
	{"partition", partitionRE, "is not a partition name; use letters, digits, _ . , and - only (sinfo lists the partitions)"},
}

// slurmValueProblem returns what is wrong with the value v of the [slurm]
// key (time_limit, memory, partition, cpus_per_task, max_concurrent, a
// setup line or binary), and the fix; "" when it is right.
func slurmValueProblem(key string, v any) string {
	for _, c := range slurmPatterns {
		if c.key == key && !c.re.MatchString(v.(string)) {
			return c.msg
		}
	}
	switch key {
	case "cpus_per_task":
		if n := v.(int); n < 1 || n > 4096 {
			return "must be from 1 to 4096: the cores each member gets"
		}
	case "max_concurrent":
		if n := v.(int); n < 0 || n > 1<<20 {
			return "must be >= 0: the most members running at once; 0 for no cap"
		}
	case "setup":
		if strings.ContainsAny(v.(string), "\r\n\x00") {
			return "must be one line; give each set-up line as its own entry, e.g. setup = [\"module load hdf5\", \"export OMP_NUM_THREADS=1\"]"
		}
	case "binary":
		if b := v.(string); strings.TrimSpace(b) == "" || strings.ContainsAny(b, " \t\r\n'\"\x00") {
			return "must be the path of the rollerbed binary the compute nodes run, without spaces or quotes, e.g. \"/home/me/bin/rollerbed\""
		}
	}
	return ""
}

// slurmValueText writes a [slurm] value as a sweep file holds it.
func slurmValueText(v any) string {
	if n, ok := v.(int); ok {
		return strconv.Itoa(n)
	}
	return strconv.Quote(fmt.Sprint(v))
}

// checkSlurm checks the [slurm] table and applies its defaults.
func checkSlurm(p *stricttoml.Problems, s *Slurm) *Slurm {
	if !p.Has("slurm.cpus_per_task") {
		s.CPUsPerTask = 1
	}
	values := []struct {
		key string
		v   any
	}{{"time_limit", s.TimeLimit}, {"memory", s.Memory}, {"partition", s.Partition},
		{"cpus_per_task", s.CPUsPerTask}, {"max_concurrent", s.MaxConcurrent}, {"binary", s.Binary}}
	for _, c := range values {
		if key := "slurm." + c.key; p.Has(key) && p.OK(key) {
			if msg := slurmValueProblem(c.key, c.v); msg != "" {
				p.Add(key, slurmValueText(c.v), msg)
			}
		}
	}
	s.Extra = checkExtra(p, s.Extra)
	var setup []string
	for i, line := range s.Setup {
		key := fmt.Sprintf("slurm.setup[%d]", i)
		if !p.OK(key) {
			continue
		}
		if msg := slurmValueProblem("setup", line); msg != "" {
			p.Add(key, strconv.Quote(line), msg)
			continue
		}
		setup = append(setup, line)
	}
	s.Setup = setup
	return s
}

// checkExtra checks the sbatch options of slurm.extra and returns the good
// ones.
func checkExtra(p *stricttoml.Problems, list []string) []string {
	var extra []string
	for i, t := range list {
		key := fmt.Sprintf("slurm.extra[%d]", i)
		switch {
		case !p.OK(key):
		case strings.ContainsAny(t, "\r\n\x00"):
			p.Add(key, strconv.Quote(t), "must be one line; give each sbatch option as its own entry")
		case strings.HasPrefix(t, "#SBATCH"):
			p.Add(key, strconv.Quote(t), "must be the option alone; #SBATCH is written for you: write "+strconv.Quote(strings.TrimSpace(strings.TrimPrefix(t, "#SBATCH"))))
		case !strings.HasPrefix(t, "-"):
			p.Add(key, strconv.Quote(t), "must be an sbatch option starting with - or --, e.g. \"--account=lab42\"")
		default:
			extra = append(extra, t)
		}
	}
	return extra
}

// contains reports whether list holds s.
func contains(list []string, s string) bool { return slices.Contains(list, s) }
