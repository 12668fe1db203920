package sweep

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"rollerbed/io/casefile"
	"rollerbed/io/runfolder"
	"rollerbed/io/stricttoml"
	"rollerbed/runs"
)

// WorkersKey is the case key of the solver's goroutines per run.
const WorkersKey = "numerics.workers"

// Plan is a sweep expanded into its members, each a complete case that
// has passed the same checks as `rollerbed check`.
type Plan struct {
	File *File
	// BasePath is the base case file, absolute; BaseText its text.
	BasePath, BaseText string
	// Keys are the varied keys, in the order of the members' Values: the
	// axes, then initial.seed for replicates or seeds.
	Keys []string
	// FixedWorkers is the largest numerics.workers the members set
	// themselves (in the base case or through an axis); 0 when they leave
	// it to the default (all cores), and `sweep run` then chooses.
	FixedWorkers int
	Members      []Member
	// Warnings are things about the plan a user should know that do not
	// stop it: a member needing more memory than [slurm] memory asks.
	Warnings []string
}

// Member is one run of a sweep.
type Member struct {
	Index int
	// Name is the member's folder under members/: the index, four digits.
	Name string
	// Values are the values this member takes for the plan's Keys.
	Values []Value
	// CaseText is the complete case file of the member.
	CaseText string
	// MemoryBytes is the expected peak memory of its run (bytes,
	// runs.MemoryBytes).
	MemoryBytes int64
}

// Value is one varied value of a member.
type Value struct {
	Key string `json:"key"`
	// Value is as the case file holds it: a number, string, boolean or
	// array.
	Value any `json:"value"`
	// Text is the value written as in a TOML file.
	Text string `json:"text"`
}

// MemberName returns the folder name of member i.
func MemberName(i int) string { return fmt.Sprintf("%04d", i) }

// NewPlan reads the base case of f, makes every member and checks each in
// full (casefile.Parse and runs.FromCase). Problems of the base case are
// reported against the base case file, problems of members against the
// axis that set the key at fault; all of them at once, before anything is
// written.
func NewPlan(f *File) (*Plan, error) {
	basePath, err := filepath.Abs(f.BasePath)
	if err != nil {
		return nil, err
	}
	baseText, err := os.ReadFile(basePath)
	if err != nil {
		return nil, &Errors{Problems: []*Problem{{Doc: format.Doc, File: f.Path, Line: f.lineOf("base"), Key: "base", Value: strconv.Quote(f.Base),
			Msg: stricttoml.OneLine(fmt.Sprintf("cannot read the base case: %v; the path is taken from the sweep file's folder (%s)", errors.Unwrap(err), filepath.Dir(absOr(f.Path))))}}}
	}
	base, err := casefile.Load(basePath)
	if err != nil {
		return nil, fmt.Errorf("the base case %s has problems; fix them first (`rollerbed check %s` checks it alone):\n%w", basePath, basePath, err)
	}
	var raw map[string]any
	if _, err := toml.Decode(string(baseText), &raw); err != nil {
		return nil, err // casefile.Load accepted it, so this does not happen
	}
	// Member cases are run from their own folders, so the plan makes the
	// file names in them absolute: a name in the base case against the
	// base case's folder, a name an axis gives against the sweep file's
	// folder.
	baseDir := filepath.Dir(basePath)
	sweepDir := filepath.Dir(absOr(f.Path))
	fileKeys := casefile.FileKeys()
	for _, k := range fileKeys {
		ck, _ := resolveKey(k)
		if v, ok := ck.get(raw); ok {
			if s, ok := v.(string); ok {
				ck.set(raw, casefile.ResolvePath(s, baseDir))
			}
		}
	}

	pl := &Plan{File: f, BasePath: basePath, BaseText: string(baseText)}
	for _, a := range f.Axes {
		pl.Keys = append(pl.Keys, a.Key)
	}
	seeds := f.Seeds
	if len(seeds) == 0 && f.Replicates > 1 {
		for r := 0; r < f.Replicates; r++ {
			seeds = append(seeds, base.Initial.Seed+int64(r))
		}
	}
	if len(seeds) > 0 {
		pl.Keys = append(pl.Keys, SeedKey)
	}
	seedKey, _ := resolveKey(SeedKey)
	workersKey, _ := resolveKey(WorkersKey)

	// Workers: fixed by the members when the base sets a positive count
	// or an axis varies it.
	fixed := base.Numerics.Workers
	for _, a := range f.Axes {
		if a.Key == WorkersKey {
			fixed = 0
			for _, v := range a.Values {
				fixed = max(fixed, int(v.(int64)))
			}
			if fixed == 0 {
				fixed = -1 // varied, if only among 0
			}
		}
	}
	// Members that leave the workers to the default (all cores) get one
	// per core a Slurm task is given, so that a task never oversubscribes
	// its cores; `sweep run` chooses its own without changing the text.
	setWorkers := fixed == 0
	cpus := 1
	if f.Slurm != nil {
		cpus = max(1, f.Slurm.CPUsPerTask)
	}
	pl.FixedWorkers = max(fixed, 0)

	combos := f.combinations()
	n := len(combos) * max(1, len(seeds))
	var mp memberProblems
	for i := 0; i < n; i++ {
		combo := combos[i/max(1, len(seeds))]
		m := Member{Index: i, Name: MemberName(i)}
		doc := deepCopy(raw).(map[string]any)
		for j, a := range f.Axes {
			v := a.Values[combo[j]]
			m.Values = append(m.Values, Value{Key: a.Key, Value: v, Text: valueText(v)})
			if contains(fileKeys, a.Key) {
				if s, ok := v.(string); ok {
					v = casefile.ResolvePath(s, sweepDir)
				}
			}
			if err := f.keys[j].set(doc, v); err != nil {
				key := fmt.Sprintf("axis[%d].key", j)
				return nil, &Errors{Problems: []*Problem{{Doc: format.Doc, File: f.Path, Line: f.lineOf(key), Key: key, Value: strconv.Quote(a.Key), Msg: stricttoml.OneLine(err.Error())}}}
			}
		}
		if len(seeds) > 0 {
			s := seeds[i%len(seeds)]
			m.Values = append(m.Values, Value{Key: SeedKey, Value: s, Text: strconv.FormatInt(s, 10)})
			seedKey.set(doc, s)
		}
		var notes []string
		if setWorkers {
			workersKey.set(doc, int64(cpus))
			notes = append(notes, fmt.Sprintf("%s = %d, the cores of a Slurm task ([slurm] cpus_per_task); `rollerbed sweep run` sets its own", WorkersKey, cpus))
		}
		title := "sweep member " + m.Name
		if t, ok := doc["title"].(string); ok && t != "" {
			title = t + " (" + title + ")"
		}
		doc["title"] = title
		text, err := memberText(f, basePath, m, n, notes, doc)
		if err != nil {
			return nil, err
		}
		m.CaseText = text
		if c, err := casefile.Parse([]byte(text)); err != nil {
			mp.addCase(f, m, err)
		} else if sp, err := runs.FromCase(c, baseDir); err != nil {
			mp.add(f, m, 0, err.Error(), err.Error())
		} else {
			m.MemoryBytes = runs.MemoryBytes(sp)
		}
		pl.Members = append(pl.Members, m)
	}
	if err := mp.err(f.Path); err != nil {
		return nil, err
	}
	if f.Slurm != nil {
		var most int64
		for _, m := range pl.Members {
			most = max(most, m.MemoryBytes)
		}
		if w := memoryWarning(most, f.Slurm.Memory); w != "" {
			pl.Warnings = append(pl.Warnings, w)
		}
	}
	return pl, nil
}

func absOr(path string) string {
	if path == "" {
		path = "."
	}
	if a, err := filepath.Abs(path); err == nil {
		return a
	}
	return path
}

// combinations returns, for each combination of the axes in member
// order, the index of each axis' value.
func (f *File) combinations() [][]int {
	if len(f.Axes) == 0 {
		return [][]int{{}}
	}
	if f.Combine == CombineZip {
		out := make([][]int, len(f.Axes[0].Values))
		for i := range out {
			out[i] = make([]int, len(f.Axes))
			for j := range f.Axes {
				out[i][j] = i
			}
		}
		return out
	}
	total := 1
	for _, a := range f.Axes {
		total *= len(a.Values)
	}
	out := make([][]int, total)
	for i := range out {
		c := make([]int, len(f.Axes))
		r := i
		for j := len(f.Axes) - 1; j >= 0; j-- {
			n := len(f.Axes[j].Values)
			c[j] = r % n
			r /= n
		}
		out[i] = c
	}
	return out
}

// memberText writes the case file of a member: a header comment that says
// where it comes from and what it varies, then the base case with the
// member's values (the base case's comments are not kept).
func memberText(f *File, basePath string, m Member, n int, notes []string, doc map[string]any) (string, error) {
	var b bytes.Buffer
	fmt.Fprintf(&b, "# rollerbed sweep member %s (%d of %d)\n", m.Name, m.Index+1, n)
	if f.Title != "" {
		fmt.Fprintf(&b, "# sweep: %s\n", f.Title)
	}
	if f.Path != "" {
		fmt.Fprintf(&b, "# sweep file: %s\n", absOr(f.Path))
	}
	fmt.Fprintf(&b, "# base case: %s\n", basePath)
	if len(m.Values) == 0 {
		b.WriteString("# varied: nothing\n")
	}
	for i, v := range m.Values {
		lead := "# varied: "
		if i > 0 {
			lead = "#         "
		}
		fmt.Fprintf(&b, "%s%s = %s\n", lead, v.Key, v.Text)
	}
	for _, s := range notes {
		fmt.Fprintf(&b, "# set:    %s\n", s)
	}
	b.WriteString("# The keys below are the base case's with these values; its comments\n# are not kept. `rollerbed check` checks this file like any case file.\n\n")
	enc := toml.NewEncoder(&b)
	enc.Indent = ""
	if err := enc.Encode(doc); err != nil {
		return "", fmt.Errorf("member %s: cannot write its case: %w", m.Name, err)
	}
	return b.String(), nil
}

// valueText writes a case value as TOML.
func valueText(v any) string {
	switch x := v.(type) {
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = valueText(e)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	}
	return stricttoml.FormatValue(v)
}

// memberProblems groups the problems of members: the same problem in many
// members is reported once, naming them.
type memberProblems struct {
	groups []*problemGroup
	byKey  map[string]*problemGroup
}

type problemGroup struct {
	line    int
	single  string // the message for one member
	many    string // the message for several, without values
	members []Member
}

// add records a problem of member m; problems with the same line and
// group text are reported once for all the members that have them.
func (mp *memberProblems) add(f *File, m Member, line int, single, many string) {
	if mp.byKey == nil {
		mp.byKey = map[string]*problemGroup{}
	}
	k := strconv.Itoa(line) + "\x00" + many
	g, ok := mp.byKey[k]
	if !ok {
		g = &problemGroup{line: line, single: single, many: many}
		mp.byKey[k] = g
		mp.groups = append(mp.groups, g)
	}
	g.members = append(g.members, m)
}

// addCase adds the problems casefile found in a member's case, each at the
// line of the axis that varies its key, when one does.
func (mp *memberProblems) addCase(f *File, m Member, err error) {
	var es *casefile.Errors
	if !errors.As(err, &es) {
		mp.add(f, m, 0, err.Error(), err.Error())
		return
	}
	for _, p := range es.Problems {
		line := 0
		for j, a := range f.Axes {
			if p.Key == a.Key || strings.HasPrefix(p.Key, a.Key+".") || strings.HasPrefix(p.Key, a.Key+"[") {
				line = f.lineOf(fmt.Sprintf("axis[%d].key", j))
				break
			}
		}
		if line == 0 && p.Key == SeedKey {
			line = f.lineOf("replicates")
			if line == 0 {
				line = f.lineOf("seeds")
			}
		}
		single, many := p.Msg, p.Msg
		if p.Key != "" {
			many = p.Key + ": " + p.Msg
			single = many
			if p.Value != "" {
				single = p.Key + " = " + p.Value + ": " + p.Msg
			}
		}
		mp.add(f, m, line, single, many)
	}
}

// maxMemberProblems bounds the distinct member problems reported.
const maxMemberProblems = 30

func (mp *memberProblems) err(file string) error {
	if len(mp.groups) == 0 {
		return nil
	}
	var list []*Problem
	for i, g := range mp.groups {
		if i == maxMemberProblems {
			list = append(list, &Problem{Doc: format.Doc, File: file, Msg: fmt.Sprintf("and %d more problems", len(mp.groups)-i)})
			break
		}
		msg := "member " + describe(g.members[0]) + ": " + g.single
		if k := len(g.members); k > 1 {
			who := fmt.Sprintf("%d members (%s", k, describe(g.members[0]))
			if k > 2 {
				who += fmt.Sprintf(", ..., %s)", describe(g.members[k-1]))
			} else {
				who += ", " + describe(g.members[1]) + ")"
			}
			msg = who + ": " + g.many
		}
		list = append(list, &Problem{Doc: format.Doc, File: file, Line: g.line, Msg: stricttoml.OneLine(msg)})
	}
	return stricttoml.Sorted(list)
}

// describe names a member with its varied values: 0003 (canopy.height = 0.4).
func describe(m Member) string {
	if len(m.Values) == 0 {
		return m.Name
	}
	parts := make([]string, len(m.Values))
	for i, v := range m.Values {
		parts[i] = v.Key + " = " + v.Text
	}
	return m.Name + " with " + strings.Join(parts, ", ")
}

// Write writes the plan into the sweep folder dir: each member's case file
// (runfolder.CaseFile) in members/NNNN/, and manifest.json. dir must be new or empty; with force
// a previous plan in it is replaced, and its run folders, Slurm files and
// collected tables are deleted.
func (pl *Plan) Write(dir string, force bool) error {
	// Not while a runner or a submission holds the folder: force would
	// delete what it writes.
	lock, err := runfolder.TakeLock(dir)
	if err != nil {
		return err
	}
	defer lock.Release()
	if err := prepareSweepDir(dir, force); err != nil {
		return err
	}
	for _, m := range pl.Members {
		md := MemberDir(dir, m.Name)
		if err := os.MkdirAll(md, 0o755); err != nil {
			return fmt.Errorf("cannot make the member folder: %w", err)
		}
		if err := runfolder.WriteFileAtomic(filepath.Join(md, runfolder.CaseFile), []byte(m.CaseText)); err != nil {
			return err
		}
	}
	return writeManifest(dir, pl.manifest())
}

// prepareSweepDir makes dir, refusing a folder that holds files unless
// force, and then only removing what a plan writes.
func prepareSweepDir(dir string, force bool) error {
	ents, err := os.ReadDir(dir)
	ents = slices.DeleteFunc(ents, func(e os.DirEntry) bool { return e.Name() == runfolder.LockFile })
	switch {
	case errors.Is(err, os.ErrNotExist):
		return os.MkdirAll(dir, 0o755)
	case err != nil:
		return fmt.Errorf("cannot use the sweep folder %s: %w", dir, err)
	case len(ents) == 0:
		return nil
	}
	_, merr := os.Stat(filepath.Join(dir, manifestName))
	if !force {
		if merr == nil {
			return fmt.Errorf("%s already holds a sweep plan (%s); choose another --out folder, or add --force to replace the plan and delete its runs", dir, manifestName)
		}
		return fmt.Errorf("%s is not empty; plan into a new or empty folder (--out)", dir)
	}
	if merr != nil {
		return fmt.Errorf("%s is not empty and holds no sweep plan; --force replaces only a previous plan, so choose a new or empty folder", dir)
	}
	for _, name := range []string{"members", "slurm", "figures", manifestName, CSVName} {
		if err := os.RemoveAll(filepath.Join(dir, name)); err != nil {
			return fmt.Errorf("cannot remove the previous plan: %w", err)
		}
	}
	return nil
}

// MemberDir returns the folder of the named member in the sweep folder.
func MemberDir(dir, name string) string { return filepath.Join(dir, "members", name) }

// RunDir returns the run folder of the named member.
func RunDir(dir, name string) string { return filepath.Join(dir, "members", name, "run") }
