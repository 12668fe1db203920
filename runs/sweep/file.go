package sweep

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
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

	lines map[string]int
	keys  []*caseKey // resolved keys of Axes
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
	TimeLimit string `json:"time_limit,omitempty"`
	// CPUsPerTask is the cores per member, >= 1; default 1. Members whose
	// numerics.workers is 0 (all cores) get this many workers.
	CPUsPerTask int `json:"cpus_per_task"`
	// Memory is the memory per member ("4G", "500M"); "" leaves the
	// partition default.
	Memory string `json:"memory,omitempty"`
	// MaxConcurrent caps the members running at once (the %N of
	// --array); 0 for no cap.
	MaxConcurrent int `json:"max_concurrent,omitempty"`
	// Partition is the partition to submit to; "" for the default one.
	Partition string `json:"partition,omitempty"`
	// Extra holds more sbatch options, one per entry ("--account=lab",
	// "--qos=short"), written as #SBATCH lines.
	Extra []string `json:"extra,omitempty"`
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

// Parse reads a sweep from TOML text; path is the file's name, for
// messages and for resolving the base case ("" resolves against the
// working folder). It rejects syntax errors, unknown keys, values of the
// wrong type and bad axes (an axis key that is not in the case schema,
// values of the wrong type for it, an empty list, a count below 1, zip
// axes of unequal lengths, a log range with an end <= 0), and reports all
// of them at once as *Errors. It does not read the base case; NewPlan does.
func Parse(text []byte, path string) (*File, error) {
	var raw map[string]any
	if _, err := toml.Decode(string(text), &raw); err != nil {
		return nil, syntaxError(err, fileLabel(path))
	}
	lines := scanLines(string(text))
	p := &problems{file: fileLabel(path), lines: lines}
	f := &File{Path: path, Text: string(text), Combine: CombineProduct, Replicates: 1, lines: lines}
	known := []string{"title", "base", "combine", "replicates", "seeds", "axis", "slurm"}
	unknownKeys(p, raw, "", known)

	if v, ok := raw["title"]; ok {
		f.Title, _ = stringValue(p, "title", v, `title = "canopy density sweep"`)
	}
	if v, ok := raw["base"]; !ok {
		p.add("base", "", `is missing; name the base case file, relative to this sweep file, e.g. base = "case.toml"`)
	} else if s, ok := stringValue(p, "base", v, `base = "case.toml"`); ok {
		if strings.TrimSpace(s) == "" {
			p.add("base", `""`, `is empty; name the base case file, e.g. base = "case.toml"`)
		} else {
			f.Base = s
			f.BasePath = s
			if !filepath.IsAbs(s) && path != "" {
				f.BasePath = filepath.Join(filepath.Dir(path), s)
			}
		}
	}
	if v, ok := raw["combine"]; ok {
		if s, ok := stringValue(p, "combine", v, `combine = "product"`); ok {
			if s != CombineProduct && s != CombineZip {
				p.add("combine", strconv.Quote(s), `must be "product" (every combination of the axes' values) or "zip" (the i-th value of every axis together)`)
			} else {
				f.Combine = s
			}
		}
	}
	seedsGiven := false
	if v, ok := raw["replicates"]; ok {
		if n, ok := intValue(p, "replicates", v, "replicates = 3"); ok {
			if n < 1 || n > MaxMembers {
				p.add("replicates", strconv.FormatInt(n, 10), fmt.Sprintf("must be from 1 to %d: the runs of each combination, with initial.seed = base seed + 0, 1, ...", MaxMembers))
			} else {
				f.Replicates = int(n)
			}
		}
	}
	if v, ok := raw["seeds"]; ok {
		seedsGiven = true
		f.Seeds = parseSeeds(p, v)
		if _, both := raw["replicates"]; both {
			p.add("seeds", "", "is given together with replicates; give one of them: replicates = N for seeds base + 0 .. N-1, or seeds = [...] for your own")
		}
	}
	f.parseAxes(p, raw["axis"])
	if seedsGiven || f.Replicates > 1 {
		for i, k := range f.keys {
			if k != nil && k.text == SeedKey {
				p.add(fmt.Sprintf("axis[%d].key", i), strconv.Quote(SeedKey), "is varied by an axis and by replicates/seeds at once; drop the axis, or the replicates and seeds keys")
			}
		}
	}
	if len(f.Axes) == 0 && f.Replicates == 1 && len(f.Seeds) == 0 && len(p.list) == 0 {
		p.add("", "", `the sweep varies nothing; add an [[axis]] table with a key and its values, e.g. key = "canopy.frontal_area" and values = [2.0, 4.0, 8.0], or replicates = N`)
	}
	if v, ok := raw["slurm"]; ok {
		f.Slurm = parseSlurm(p, v)
	}
	if len(p.list) == 0 {
		if n := f.size(); n > MaxMembers {
			p.add("", "", fmt.Sprintf("the sweep makes %d members, more than %d; use fewer values, or split it into several sweeps", n, MaxMembers))
		}
	}
	if err := p.err(); err != nil {
		return nil, err
	}
	return f, nil
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

func syntaxError(err error, path string) error {
	var pe toml.ParseError
	if !errors.As(err, &pe) {
		return &Errors{Problems: []*Problem{{File: path, Msg: oneLine("cannot read the TOML: " + err.Error())}}}
	}
	msg := "TOML syntax error: " + pe.Message
	if pe.LastKey != "" {
		msg += " (after key " + pe.LastKey + ")"
	}
	msg += "; see https://toml.io for the syntax, or compare with an example that `rollerbed sweep example` writes"
	return &Errors{Problems: []*Problem{{File: path, Line: pe.Position.Line, Col: pe.Position.Col, Msg: oneLine(msg)}}}
}

// unknownKeys records the keys of table m (at prefix) not in known.
func unknownKeys(p *problems, m map[string]any, prefix string, known []string) {
	var names []string
	for k := range m {
		if !contains(known, k) {
			names = append(names, k)
		}
	}
	sort.Strings(names)
	where := "at the top level"
	if prefix != "" {
		where = "in [" + prefix + "]"
		if base, n, err := splitIndex(prefix); err == nil && n >= 0 {
			where = "in the " + ordinal(n+1) + " [[" + base + "]]"
		}
	}
	for _, k := range names {
		key := k
		if prefix != "" {
			key = prefix + "." + k
		}
		msg := "unknown key " + where
		if s := closest(k, known); s != "" {
			msg += "; did you mean " + s + "?"
		}
		value := ""
		if _, table := m[k].(map[string]any); !table {
			value = fmtValue(m[k])
		}
		p.add(key, value, msg+" (known here: "+strings.Join(known, ", ")+")")
	}
}

func contains(list []string, s string) bool {
	for _, e := range list {
		if e == s {
			return true
		}
	}
	return false
}

func stringValue(p *problems, key string, v any, example string) (string, bool) {
	s, ok := v.(string)
	if !ok {
		p.add(key, fmtValue(v), "must be a string, not "+tomlType(v)+"; write e.g. "+example)
	}
	return s, ok
}

func intValue(p *problems, key string, v any, example string) (int64, bool) {
	switch x := v.(type) {
	case int64:
		return x, true
	case float64:
		if x == math.Trunc(x) && math.Abs(x) < 1<<53 {
			p.add(key, fmtValue(v), fmt.Sprintf("must be an integer; write %d without a decimal point", int64(x)))
			return 0, false
		}
	}
	p.add(key, fmtValue(v), "must be an integer, not "+tomlType(v)+"; write e.g. "+example)
	return 0, false
}

func numberValue(p *problems, key string, v any, example string) (float64, bool) {
	switch x := v.(type) {
	case int64:
		return float64(x), true
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			p.add(key, fmtValue(v), "must be a finite number; write e.g. "+example)
			return 0, false
		}
		return x, true
	}
	p.add(key, fmtValue(v), "must be a number, not "+tomlType(v)+"; write e.g. "+example)
	return 0, false
}

func parseSeeds(p *problems, v any) []int64 {
	list, ok := v.([]any)
	if !ok {
		p.add("seeds", fmtValue(v), "must be an array of integers, e.g. seeds = [1, 2, 3]")
		return nil
	}
	if len(list) == 0 {
		p.add("seeds", "[]", "is empty; give at least one seed, e.g. seeds = [1, 2, 3], or leave the key out")
		return nil
	}
	seen := map[int64]bool{}
	var out []int64
	for i, e := range list {
		key := fmt.Sprintf("seeds[%d]", i)
		n, ok := e.(int64)
		if !ok {
			p.add(key, fmtValue(e), "must be an integer >= 0 (a seed of the random perturbations), not "+tomlType(e))
			continue
		}
		if n < 0 {
			p.add(key, strconv.FormatInt(n, 10), "must be >= 0 (seeds are non-negative integers)")
			continue
		}
		if seen[n] {
			p.add(key, strconv.FormatInt(n, 10), "appears twice in seeds; each seed once, or two members would be the same run")
			continue
		}
		seen[n] = true
		out = append(out, n)
	}
	return out
}

// parseAxes reads the [[axis]] tables.
func (f *File) parseAxes(p *problems, v any) {
	if v == nil {
		return
	}
	var elems []map[string]any
	switch x := v.(type) {
	case []map[string]any:
		elems = x
	case []any:
		for _, e := range x {
			m, ok := e.(map[string]any)
			if !ok {
				p.add("axis", "", "must be an array of tables; write each axis under its own [[axis]] header (two brackets)")
				return
			}
			elems = append(elems, m)
		}
	default:
		p.add("axis", "", "must be an array of tables, not "+tomlType(v)+"; write each axis under its own [[axis]] header (two brackets)")
		return
	}
	seen := map[string]int{}
	for i, m := range elems {
		a, k := parseAxis(p, i, m)
		if a == nil {
			f.Axes = append(f.Axes, Axis{})
			f.keys = append(f.keys, nil)
			continue
		}
		if j, dup := seen[a.Key]; dup {
			p.add(fmt.Sprintf("axis[%d].key", i), strconv.Quote(a.Key), fmt.Sprintf("is varied by axis[%d] already; vary each key in one axis", j))
		}
		seen[a.Key] = i
		f.Axes = append(f.Axes, *a)
		f.keys = append(f.keys, k)
	}
	f.checkRepeats(p)
	if f.Combine == CombineZip && len(elems) > 1 {
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
			p.add("combine", `"zip"`, "needs axes of equal length, but "+strings.Join(lens, ", ")+`; give every axis the same number of values, or use combine = "product"`)
		}
	}
}

// checkRepeats finds values that would make two members the same run: a
// value given twice in an axis of a product, or the same values at two
// positions of zipped axes.
func (f *File) checkRepeats(p *problems) {
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
				p.add(key, t, fmt.Sprintf("repeats the value at position %d of this axis; give each value once, or two members would be the same run", k))
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
			p.add("combine", `"zip"`, fmt.Sprintf("gives the same values at positions %d and %d of every axis, so two members would be the same run; change one of them", k, j))
			return
		}
		seen[t] = j
	}
}

// parseAxis reads one [[axis]] table.
func parseAxis(p *problems, i int, m map[string]any) (*Axis, *caseKey) {
	prefix := fmt.Sprintf("axis[%d]", i)
	unknownKeys(p, m, prefix, []string{"key", "values", "linear", "log"})
	kv, ok := m["key"]
	if !ok {
		p.add(prefix, "", `has no key; name the case key to vary, e.g. key = "canopy.frontal_area"`)
		return nil, nil
	}
	key, ok := stringValue(p, prefix+".key", kv, `key = "canopy.frontal_area"`)
	if !ok {
		return nil, nil
	}
	ck, err := resolveKey(key)
	if err != nil {
		p.add(prefix+".key", strconv.Quote(key), err.Error())
		return nil, nil
	}
	var given []string
	for _, s := range []string{SpacingValues, SpacingLinear, SpacingLog} {
		if _, ok := m[s]; ok {
			given = append(given, s)
		}
	}
	switch len(given) {
	case 0:
		p.add(prefix, "", "gives no values for "+key+"; add one of values = [...], linear = { from = 1.0, to = 4.0, count = 4 } or log = { from = 0.5, to = 8.0, count = 5 }")
		return nil, nil
	case 1:
	default:
		p.add(prefix, "", "gives "+strings.Join(given, " and ")+" for "+key+"; give exactly one of values, linear and log")
		return nil, nil
	}
	a := &Axis{Key: key, Spacing: given[0]}
	if a.Spacing == SpacingValues {
		a.Values = parseValues(p, prefix+".values", m["values"], ck)
	} else {
		a.Values = parseRange(p, prefix+"."+a.Spacing, a, m[a.Spacing], ck)
	}
	if a.Values == nil {
		return nil, nil
	}
	return a, ck
}

func parseValues(p *problems, key string, v any, ck *caseKey) []any {
	list, ok := v.([]any)
	if !ok {
		p.add(key, fmtValue(v), "must be an array of values for "+ck.text+", e.g. values = [2.0, 4.0, 8.0]")
		return nil
	}
	if len(list) == 0 {
		p.add(key, "[]", "is empty; give at least one value for "+ck.text+", e.g. values = [2.0, 4.0, 8.0]")
		return nil
	}
	out := make([]any, 0, len(list))
	bad := false
	for j, e := range list {
		ek := fmt.Sprintf("%s[%d]", key, j)
		c, err := ck.convert(e)
		if err != nil {
			p.add(ek, fmtValue(e), err.Error())
			bad = true
			continue
		}
		out = append(out, c)
	}
	if bad {
		return nil
	}
	return out
}

// parseRange reads a linear or log range table and expands it.
func parseRange(p *problems, key string, a *Axis, v any, ck *caseKey) []any {
	example := a.Spacing + " = { from = 1.0, to = 8.0, count = 4 }"
	m, ok := v.(map[string]any)
	if !ok {
		p.add(key, fmtValue(v), "must be a table of from, to and count, e.g. "+example)
		return nil
	}
	if ck.leaf.kind != kindFloat && ck.leaf.kind != kindInt {
		p.add(key, "", fmt.Sprintf("cannot make a range of %s, which is %s; give its values = [...]", ck.text, ck.leaf.kind))
		return nil
	}
	unknownKeys(p, m, key, []string{"from", "to", "count"})
	ok = true
	for _, k := range []string{"from", "to", "count"} {
		if _, has := m[k]; !has {
			p.add(key, "", "has no "+k+"; a range needs from, to and count, e.g. "+example)
			ok = false
		}
	}
	if !ok {
		return nil
	}
	from, ok1 := numberValue(p, key+".from", m["from"], "from = 1.0")
	to, ok2 := numberValue(p, key+".to", m["to"], "to = 8.0")
	count, ok3 := intValue(p, key+".count", m["count"], "count = 4")
	if !ok1 || !ok2 || !ok3 {
		return nil
	}
	a.From, a.To = from, to
	if count < 1 || count > MaxMembers {
		p.add(key+".count", strconv.FormatInt(count, 10), fmt.Sprintf("must be from 1 to %d: the number of values from from to to (1 gives from alone)", MaxMembers))
		return nil
	}
	a.Count = int(count)
	if a.Spacing == SpacingLog {
		bad := false
		if from <= 0 {
			p.add(key+".from", fmtFloat(from), "must be > 0: a log range needs positive ends; use linear = {...} for a range through zero")
			bad = true
		}
		if to <= 0 {
			p.add(key+".to", fmtFloat(to), "must be > 0: a log range needs positive ends; use linear = {...} for a range through zero")
			bad = true
		}
		if bad {
			return nil
		}
	}
	if count > 1 && from == to {
		p.add(key, "", fmt.Sprintf("has from = to = %s with count = %d, which gives the same value %d times; widen the range or set count = 1", fmtFloat(from), count, count))
		return nil
	}
	vals := expandRange(a.Spacing, from, to, a.Count)
	out := make([]any, len(vals))
	for j, x := range vals {
		if ck.leaf.kind == kindInt {
			r := math.Round(x)
			if math.Abs(x-r) > 1e-9*math.Max(1, math.Abs(x)) {
				p.add(key, "", fmt.Sprintf("gives %s, not a whole number, for the integer key %s; choose from, to and count so every value is whole, or give values = [...]", fmtFloat(x), ck.text))
				return nil
			}
			out[j] = int64(r)
			continue
		}
		out[j] = x
	}
	if ck.leaf.kind == kindInt {
		for j := 1; j < len(out); j++ {
			if out[j] == out[j-1] {
				p.add(key, "", fmt.Sprintf("gives %d twice for the integer key %s; use a smaller count", out[j], ck.text))
				return nil
			}
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

func parseSlurm(p *problems, v any) *Slurm {
	m, ok := v.(map[string]any)
	if !ok {
		p.add("slurm", fmtValue(v), "must be a table; write it as a [slurm] section with its keys below")
		return nil
	}
	unknownKeys(p, m, "slurm", []string{"time_limit", "cpus_per_task", "memory", "max_concurrent", "partition", "extra"})
	s := &Slurm{CPUsPerTask: 1}
	if v, ok := m["time_limit"]; ok {
		if t, ok := stringValue(p, "slurm.time_limit", v, `time_limit = "01:00:00"`); ok {
			if !timeLimitRE.MatchString(t) {
				p.add("slurm.time_limit", strconv.Quote(t), `is not a Slurm time limit; write minutes ("90"), hours:minutes:seconds ("01:30:00") or days-hours:minutes:seconds ("1-12:00:00")`)
			} else {
				s.TimeLimit = t
			}
		}
	}
	if v, ok := m["cpus_per_task"]; ok {
		if n, ok := intValue(p, "slurm.cpus_per_task", v, "cpus_per_task = 4"); ok {
			if n < 1 || n > 4096 {
				p.add("slurm.cpus_per_task", strconv.FormatInt(n, 10), "must be from 1 to 4096: the cores each member gets")
			} else {
				s.CPUsPerTask = int(n)
			}
		}
	}
	if v, ok := m["memory"]; ok {
		if t, ok := stringValue(p, "slurm.memory", v, `memory = "4G"`); ok {
			if !memoryRE.MatchString(t) {
				p.add("slurm.memory", strconv.Quote(t), `is not a Slurm memory size; write a whole number with an optional unit K, M, G or T, e.g. "4G" or "500M"`)
			} else {
				s.Memory = t
			}
		}
	}
	if v, ok := m["max_concurrent"]; ok {
		if n, ok := intValue(p, "slurm.max_concurrent", v, "max_concurrent = 8"); ok {
			if n < 0 || n > 1<<20 {
				p.add("slurm.max_concurrent", strconv.FormatInt(n, 10), "must be >= 0: the most members running at once; 0 for no cap")
			} else {
				s.MaxConcurrent = int(n)
			}
		}
	}
	if v, ok := m["partition"]; ok {
		if t, ok := stringValue(p, "slurm.partition", v, `partition = "normal"`); ok {
			if !partitionRE.MatchString(t) {
				p.add("slurm.partition", strconv.Quote(t), "is not a partition name; use letters, digits, _ . , and - only (sinfo lists the partitions)")
			} else {
				s.Partition = t
			}
		}
	}
	if v, ok := m["extra"]; ok {
		list, ok := v.([]any)
		if !ok {
			p.add("slurm.extra", fmtValue(v), `must be an array of sbatch options, e.g. extra = ["--account=lab42", "--qos=short"]`)
		} else {
			for i, e := range list {
				key := fmt.Sprintf("slurm.extra[%d]", i)
				t, ok := e.(string)
				switch {
				case !ok:
					p.add(key, fmtValue(e), "must be a string holding one sbatch option, e.g. \"--account=lab42\"")
				case strings.ContainsAny(t, "\r\n"):
					p.add(key, strconv.Quote(t), "must be one line; give each sbatch option as its own entry")
				case strings.HasPrefix(t, "#SBATCH"):
					p.add(key, strconv.Quote(t), "must be the option alone; #SBATCH is written for you: write "+strconv.Quote(strings.TrimSpace(strings.TrimPrefix(t, "#SBATCH"))))
				case !strings.HasPrefix(t, "-"):
					p.add(key, strconv.Quote(t), "must be an sbatch option starting with - or --, e.g. \"--account=lab42\"")
				default:
					s.Extra = append(s.Extra, t)
				}
			}
		}
	}
	return s
}
