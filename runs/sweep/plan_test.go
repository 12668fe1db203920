package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"rollerbed/io/casefile"
	"rollerbed/io/stricttoml"
)

// planText parses a sweep text as if it were the file testdata/NAME and
// expands it.
func planText(t *testing.T, text string) (*Plan, error) {
	t.Helper()
	f, err := Parse([]byte(text), filepath.Join("testdata", "test.toml"))
	if err != nil {
		return nil, err
	}
	return NewPlan(f)
}

// memberValues lists each member's varied values as "key=text" strings.
func memberValues(pl *Plan) [][]string {
	var out [][]string
	for _, m := range pl.Members {
		var row []string
		for _, v := range m.Values {
			row = append(row, v.Key+"="+v.Text)
		}
		out = append(out, row)
	}
	return out
}

func TestPlanExpands(t *testing.T) {
	const base = "base = \"small/base.toml\"\n"
	tests := []struct {
		name string
		text string
		keys []string
		want [][]string
	}{
		{"values", base + `
[[axis]]
key = "canopy.frontal_area"
values = [10, 15.5]`,
			[]string{"canopy.frontal_area"},
			[][]string{{"canopy.frontal_area=10.0"}, {"canopy.frontal_area=15.5"}}},
		{"product, first axis slowest", base + `
[[axis]]
key = "canopy.frontal_area"
values = [10.0, 20.0]
[[axis]]
key = "forcing.bulk_velocity"
values = [0.04, 0.05, 0.06]`,
			[]string{"canopy.frontal_area", "forcing.bulk_velocity"},
			[][]string{
				{"canopy.frontal_area=10.0", "forcing.bulk_velocity=0.04"},
				{"canopy.frontal_area=10.0", "forcing.bulk_velocity=0.05"},
				{"canopy.frontal_area=10.0", "forcing.bulk_velocity=0.06"},
				{"canopy.frontal_area=20.0", "forcing.bulk_velocity=0.04"},
				{"canopy.frontal_area=20.0", "forcing.bulk_velocity=0.05"},
				{"canopy.frontal_area=20.0", "forcing.bulk_velocity=0.06"},
			}},
		{"zip", base + `combine = "zip"
[[axis]]
key = "canopy.height"
values = [0.06, 0.08, 0.1]
[[axis]]
key = "initial.perturbation_at"
values = [0.06, 0.08, 0.1]`,
			[]string{"canopy.height", "initial.perturbation_at"},
			[][]string{
				{"canopy.height=0.06", "initial.perturbation_at=0.06"},
				{"canopy.height=0.08", "initial.perturbation_at=0.08"},
				{"canopy.height=0.1", "initial.perturbation_at=0.1"},
			}},
		{"linear, rounded to 12 digits", base + `
[[axis]]
key = "forcing.bulk_velocity"
linear = { from = 0.1, to = 0.5, count = 5 }`,
			[]string{"forcing.bulk_velocity"},
			[][]string{{"forcing.bulk_velocity=0.1"}, {"forcing.bulk_velocity=0.2"}, {"forcing.bulk_velocity=0.3"}, {"forcing.bulk_velocity=0.4"}, {"forcing.bulk_velocity=0.5"}}},
		{"linear of one", base + `
[[axis]]
key = "forcing.bulk_velocity"
linear = { from = 0.07, to = 0.5, count = 1 }`,
			[]string{"forcing.bulk_velocity"},
			[][]string{{"forcing.bulk_velocity=0.07"}}},
		{"log", base + `
[[axis]]
key = "canopy.frontal_area"
log = { from = 1, to = 1000, count = 4 }`,
			[]string{"canopy.frontal_area"},
			[][]string{{"canopy.frontal_area=1.0"}, {"canopy.frontal_area=10.0"}, {"canopy.frontal_area=100.0"}, {"canopy.frontal_area=1000.0"}}},
		{"descending log", base + `
[[axis]]
key = "canopy.frontal_area"
log = { from = 16.0, to = 4.0, count = 3 }`,
			[]string{"canopy.frontal_area"},
			[][]string{{"canopy.frontal_area=16.0"}, {"canopy.frontal_area=8.0"}, {"canopy.frontal_area=4.0"}}},
		{"integer linear", base + `
[[axis]]
key = "domain.nz"
linear = { from = 16, to = 32, count = 3 }`,
			[]string{"domain.nz"},
			[][]string{{"domain.nz=16"}, {"domain.nz=24"}, {"domain.nz=32"}}},
		{"strings", base + `
[[axis]]
key = "turbulence.closure"
values = ["smagorinsky", "none"]`,
			[]string{"turbulence.closure"},
			[][]string{{`turbulence.closure="smagorinsky"`}, {`turbulence.closure="none"`}}},
		{"replicates: base seed 3 plus 0 and 1, innermost", base + `replicates = 2
[[axis]]
key = "canopy.frontal_area"
values = [10.0, 20.0]`,
			[]string{"canopy.frontal_area", "initial.seed"},
			[][]string{
				{"canopy.frontal_area=10.0", "initial.seed=3"},
				{"canopy.frontal_area=10.0", "initial.seed=4"},
				{"canopy.frontal_area=20.0", "initial.seed=3"},
				{"canopy.frontal_area=20.0", "initial.seed=4"},
			}},
		{"replicates alone", base + "replicates = 3",
			[]string{"initial.seed"},
			[][]string{{"initial.seed=3"}, {"initial.seed=4"}, {"initial.seed=5"}}},
		{"seeds with zip", base + `combine = "zip"
seeds = [100, 7]
[[axis]]
key = "canopy.height"
values = [0.06, 0.1]
[[axis]]
key = "canopy.frontal_area"
values = [10.0, 20.0]`,
			[]string{"canopy.height", "canopy.frontal_area", "initial.seed"},
			[][]string{
				{"canopy.height=0.06", "canopy.frontal_area=10.0", "initial.seed=100"},
				{"canopy.height=0.06", "canopy.frontal_area=10.0", "initial.seed=7"},
				{"canopy.height=0.1", "canopy.frontal_area=20.0", "initial.seed=100"},
				{"canopy.height=0.1", "canopy.frontal_area=20.0", "initial.seed=7"},
			}},
		{"zip may repeat a value in one axis", base + `combine = "zip"
[[axis]]
key = "turbulence.closure"
values = ["smagorinsky", "none", "smagorinsky"]
[[axis]]
key = "forcing.bulk_velocity"
values = [0.04, 0.04, 0.05]`,
			[]string{"turbulence.closure", "forcing.bulk_velocity"},
			[][]string{
				{`turbulence.closure="smagorinsky"`, "forcing.bulk_velocity=0.04"},
				{`turbulence.closure="none"`, "forcing.bulk_velocity=0.04"},
				{`turbulence.closure="smagorinsky"`, "forcing.bulk_velocity=0.05"},
			}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pl, err := planText(t, tc.text)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(pl.Keys, tc.keys) {
				t.Errorf("keys %v, want %v", pl.Keys, tc.keys)
			}
			if got := memberValues(pl); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("members\n got %v\nwant %v", got, tc.want)
			}
			// Every member's case carries its values, as casefile reads them.
			for _, m := range pl.Members {
				c, err := casefile.Parse([]byte(m.CaseText))
				if err != nil {
					t.Fatalf("member %s: %v", m.Name, err)
				}
				for _, v := range m.Values {
					if got := caseValue(t, c, v.Key); got != v.Text {
						t.Errorf("member %s: %s = %s in its case, want %s", m.Name, v.Key, got, v.Text)
					}
					if !strings.Contains(m.CaseText, "# varied: ") || !strings.Contains(m.CaseText, v.Key+" = "+v.Text) {
						t.Errorf("member %s: the header does not list %s = %s:\n%s", m.Name, v.Key, v.Text, m.CaseText)
					}
				}
			}
		})
	}
}

// caseValue reads one key of a parsed case back, through the plan's own
// key walk over the case re-encoded as TOML.
func caseValue(t *testing.T, c *casefile.Case, key string) string {
	t.Helper()
	switch key {
	case "canopy.frontal_area":
		return stricttoml.FormatValue(c.Canopy.FrontalArea)
	case "canopy.height":
		return stricttoml.FormatValue(c.Canopy.Height)
	case "forcing.bulk_velocity":
		return stricttoml.FormatValue(c.Forcing.BulkVelocity)
	case "initial.perturbation_at":
		return stricttoml.FormatValue(c.Initial.PerturbationAt)
	case "initial.seed":
		return stricttoml.FormatValue(c.Initial.Seed)
	case "domain.nz":
		return stricttoml.FormatValue(int64(c.Domain.Nz))
	case "turbulence.closure":
		return stricttoml.FormatValue(c.Turbulence.Closure)
	}
	t.Fatalf("caseValue: no accessor for %s", key)
	return ""
}

func TestPlanKeepsTheRestOfTheBase(t *testing.T) {
	pl, err := planText(t, "base = \"small/base.toml\"\n[[axis]]\nkey = \"canopy.frontal_area\"\nvalues = [20.0]\n")
	if err != nil {
		t.Fatal(err)
	}
	base, err := casefile.Load(filepath.Join("testdata", "small", "base.toml"))
	if err != nil {
		t.Fatal(err)
	}
	got, err := casefile.Parse([]byte(pl.Members[0].CaseText))
	if err != nil {
		t.Fatal(err)
	}
	// Only the varied key and the title differ.
	base.Canopy.FrontalArea = 20
	base.Title += " (sweep member 0000)"
	base.Text, got.Text = "", ""
	if !reflect.DeepEqual(base, got) {
		t.Errorf("member case differs from the base beyond the varied key:\n got %+v\nwant %+v", got, base)
	}
	if pl.FixedWorkers != 1 {
		t.Errorf("FixedWorkers = %d, want 1 (the base sets numerics.workers = 1)", pl.FixedWorkers)
	}
}

func TestPlanFileNamesAndPatches(t *testing.T) {
	f, err := Load(filepath.Join("testdata", "patches", "sweep.toml"))
	if err != nil {
		t.Fatal(err)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := memberValues(pl), [][]string{{"canopy.patch[1].end=0.25"}, {"canopy.patch[1].end=0.3"}, {"canopy.patch[1].end=0.35"}}; !reflect.DeepEqual(got, want) {
		t.Fatalf("members %v, want %v", got, want)
	}
	want, _ := filepath.Abs(filepath.Join("testdata", "patches", "profile.csv"))
	for _, m := range pl.Members {
		c, err := casefile.Parse([]byte(m.CaseText))
		if err != nil {
			t.Fatal(err)
		}
		if c.Canopy.ProfileFile != want {
			t.Errorf("member %s: profile_file = %q, want the absolute %q", m.Name, c.Canopy.ProfileFile, want)
		}
		if len(c.Canopy.Patches) != 2 || c.Canopy.Patches[0].End != 0.1 {
			t.Errorf("member %s: patches %+v", m.Name, c.Canopy.Patches)
		}
	}
	if pl.FixedWorkers != 1 {
		t.Errorf("FixedWorkers = %d, want 1", pl.FixedWorkers)
	}
}

func TestPlanSlurmSetsWorkers(t *testing.T) {
	// A base that leaves numerics.workers at 0 (all cores) gets
	// cpus_per_task workers in every member when the sweep has [slurm].
	dir := t.TempDir()
	b, _ := os.ReadFile(filepath.Join("testdata", "small", "base.toml"))
	text := strings.Replace(string(b), "workers = 1", "workers = 0", 1)
	os.WriteFile(filepath.Join(dir, "base.toml"), []byte(text), 0o644)
	sw := filepath.Join(dir, "sweep.toml")
	os.WriteFile(sw, []byte("base = \"base.toml\"\nreplicates = 2\n[slurm]\ncpus_per_task = 3\n"), 0o644)
	f, err := Load(sw)
	if err != nil {
		t.Fatal(err)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	if pl.FixedWorkers != 0 {
		t.Errorf("FixedWorkers = %d, want 0", pl.FixedWorkers)
	}
	for _, m := range pl.Members {
		c, err := casefile.Parse([]byte(m.CaseText))
		if err != nil {
			t.Fatal(err)
		}
		if c.Numerics.Workers != 3 {
			t.Errorf("member %s: numerics.workers = %d, want 3", m.Name, c.Numerics.Workers)
		}
		if !strings.Contains(m.CaseText, "# set:    numerics.workers = 3, the cores of a Slurm task") {
			t.Errorf("member %s: header does not say workers were set:\n%s", m.Name, m.CaseText)
		}
	}
}

func TestPlanErrors(t *testing.T) {
	const base = "base = \"small/base.toml\"\n"
	axis := func(body string) string { return base + "[[axis]]\n" + body + "\n" }
	tests := []struct {
		name string
		text string
		line int      // of the first problem; 0 to skip
		want []string // in the message
	}{
		{"syntax", "base = \"x.toml\"\n[[axis]\n", 0, []string{"TOML syntax error"}},
		{"unknown top-level key", base + "combin = \"zip\"\n", 2, []string{"combin", "unknown key", "did you mean combine?"}},
		{"no base", "[[axis]]\nkey = \"canopy.height\"\nvalues = [0.1]\n", 0, []string{"base", "is missing", `base = "flume.toml"`}},
		{"base not found", "base = \"nope.toml\"\nreplicates = 2\n", 1, []string{`base = "nope.toml"`, "cannot read the base case", "sweep file's folder"}},
		{"bad combine", base + "combine = \"cross\"\n" + "replicates = 2\n", 2, []string{`combine = "cross"`, `"product"`, `"zip"`}},
		{"varies nothing", base, 0, []string{"varies nothing", "[[axis]]"}},
		{"unknown case key", axis("key = \"canopy.hieght\"\nvalues = [0.1]"), 3, []string{`axis[0].key = "canopy.hieght"`, "not a key of the case file", "did you mean canopy.height?"}},
		{"key elsewhere", axis("key = \"frontal_area\"\nvalues = [1.0]"), 3, []string{`"frontal_area"`, "did you mean canopy.frontal_area?"}},
		{"a table", axis("key = \"canopy\"\nvalues = [1.0]"), 3, []string{`"canopy"`, "names the table [canopy]", "canopy.height"}},
		{"array element without index", axis("key = \"canopy.patch.start\"\nvalues = [0.1]"), 3, []string{"without its index", "canopy.patch[0].start"}},
		{"index on a plain table", axis("key = \"canopy[0].height\"\nvalues = [0.1]"), 3, []string{"not an array of tables"}},
		{"index beyond the base", axis("key = \"canopy.patch[0].start\"\nvalues = [0.1]"), 3, []string{"0 [[canopy.patch]] element(s)", "canopy.patch[0] does not exist"}},
		{"wrong type for a float key", axis("key = \"canopy.frontal_area\"\nvalues = [1.0, \"2\"]"), 4, []string{`axis[0].values[1] = "2"`, "must be a number for canopy.frontal_area, not a string"}},
		{"float for an integer key", axis("key = \"domain.nx\"\nvalues = [32, 64.0]"), 4, []string{"axis[0].values[1] = 64.0", "write 64 without a decimal point"}},
		{"number for a string key", axis("key = \"turbulence.closure\"\nvalues = [1]"), 4, []string{"must be a string for turbulence.closure", "double quotes"}},
		{"empty list", axis("key = \"canopy.height\"\nvalues = []"), 4, []string{"axis[0].values = []", "is empty", "at least one value"}},
		{"values not a list", axis("key = \"canopy.height\"\nvalues = 0.1"), 4, []string{"axis[0].values = 0.1", "must be an array"}},
		{"no values", axis("key = \"canopy.height\""), 2, []string{"gives no values for canopy.height", "values = [...]", "linear", "log"}},
		{"two kinds of values", axis("key = \"canopy.height\"\nvalues = [0.1]\nlinear = { from = 0.1, to = 0.2, count = 2 }"), 2, []string{"gives values and linear", "exactly one"}},
		{"count below 1", axis("key = \"canopy.height\"\nlinear = { from = 0.1, to = 0.2, count = 0 }"), 4, []string{"axis[0].linear.count = 0", "must be from 1"}},
		{"count not an integer", axis("key = \"canopy.height\"\nlinear = { from = 0.1, to = 0.2, count = 2.5 }"), 4, []string{"axis[0].linear.count = 2.5", "must be an integer"}},
		{"range without to", axis("key = \"canopy.height\"\nlinear = { from = 0.1, count = 2 }"), 4, []string{"axis[0].linear", "has no to"}},
		{"range key unknown", axis("key = \"canopy.height\"\nlinear = { from = 0.1, to = 0.2, count = 2, step = 1 }"), 4, []string{"axis[0].linear.step", "unknown key"}},
		{"log through zero", axis("key = \"canopy.frontal_area\"\nlog = { from = 0.0, to = 8.0, count = 4 }"), 4, []string{"axis[0].log.from = 0.0", "must be > 0", "positive ends"}},
		{"log negative end", axis("key = \"canopy.frontal_area\"\nlog = { from = 2.0, to = -8.0, count = 4 }"), 4, []string{"axis[0].log.to = -8.0", "must be > 0"}},
		{"range of a string key", axis("key = \"turbulence.closure\"\nlinear = { from = 1, to = 2, count = 2 }"), 4, []string{"cannot make a range of turbulence.closure"}},
		{"range of whole numbers not whole", axis("key = \"domain.nz\"\nlinear = { from = 16, to = 33, count = 3 }"), 4, []string{"24.5", "not a whole number", "domain.nz"}},
		{"same value twice", axis("key = \"canopy.height\"\nvalues = [0.1, 0.1]"), 4, []string{"axis[0].values[1] = 0.1", "repeats", "same run"}},
		{"same range ends", axis("key = \"canopy.height\"\nlinear = { from = 0.1, to = 0.1, count = 3 }"), 4, []string{"from = to = 0.1", "count = 3"}},
		{"zip of unequal length", base + "combine = \"zip\"\n[[axis]]\nkey = \"canopy.height\"\nvalues = [0.06, 0.08]\n[[axis]]\nkey = \"canopy.frontal_area\"\nvalues = [1.0, 2.0, 3.0]\n", 2,
			[]string{`combine = "zip"`, "equal length", "axis[0] (canopy.height) has 2", "axis[1] (canopy.frontal_area) has 3"}},
		{"zip repeats a member", base + "combine = \"zip\"\n[[axis]]\nkey = \"canopy.height\"\nvalues = [0.06, 0.06]\n[[axis]]\nkey = \"canopy.frontal_area\"\nvalues = [1.0, 1.0]\n", 2,
			[]string{"positions 0 and 1", "same run"}},
		{"key twice", base + "[[axis]]\nkey = \"canopy.height\"\nvalues = [0.06]\n[[axis]]\nkey = \"canopy.height\"\nvalues = [0.07]\n", 6, []string{"axis[1].key", "varied by axis[0] already"}},
		{"seed axis with replicates", base + "replicates = 2\n[[axis]]\nkey = \"initial.seed\"\nvalues = [1, 2]\n", 4, []string{`axis[0].key = "initial.seed"`, "replicates"}},
		{"replicates and seeds", base + "replicates = 2\nseeds = [1, 2]\n", 3, []string{"seeds", "together with replicates"}},
		{"replicates zero", base + "replicates = 0\n", 2, []string{"replicates = 0", "must be from 1"}},
		{"negative seed", base + "seeds = [1, -2]\n", 2, []string{"seeds[1] = -2", ">= 0"}},
		{"axis key in the wrong place", base + "[[axis]]\nkey = \"canopy.height\"\nvalue = [0.1]\n", 2, []string{"axis[0].value", "unknown key in the 1st [[axis]]", "did you mean axis[0].values?"}},
		{"bad slurm time", base + "replicates = 2\n[slurm]\ntime_limit = \"1 hour\"\n", 4, []string{`slurm.time_limit = "1 hour"`, "01:30:00"}},
		{"bad slurm memory", base + "replicates = 2\n[slurm]\nmemory = \"4GB\"\n", 4, []string{`slurm.memory = "4GB"`, `"4G"`}},
		{"slurm cpus zero", base + "replicates = 2\n[slurm]\ncpus_per_task = 0\n", 4, []string{"slurm.cpus_per_task = 0", "from 1"}},
		{"slurm extra with #SBATCH", base + "replicates = 2\n[slurm]\nextra = [\"#SBATCH --qos=x\"]\n", 4, []string{"slurm.extra[0]", `"--qos=x"`}},
		{"slurm setup of two lines", base + "replicates = 2\n[slurm]\nsetup = [\"module load a\", \"module load b\\nmodule load c\"]\n", 4, []string{`slurm.setup[1] = "module load b\nmodule load c"`, "must be one line"}},
		{"slurm setup not a list", base + "replicates = 2\n[slurm]\nsetup = \"module load a\"\n", 4, []string{"slurm.setup"}},
		{"slurm binary with a space", base + "replicates = 2\n[slurm]\nbinary = \"/my bin/rollerbed\"\n", 4, []string{`slurm.binary = "/my bin/rollerbed"`, "without spaces"}},
		{"slurm unknown key", base + "replicates = 2\n[slurm]\ntime = \"01:00:00\"\n", 4, []string{"slurm.time", "unknown key in [slurm]", "did you mean slurm.time_limit?"}},
		{"too many members", base + "[[axis]]\nkey = \"canopy.height\"\nlinear = { from = 0.01, to = 0.1, count = 200 }\n[[axis]]\nkey = \"canopy.frontal_area\"\nlinear = { from = 1.0, to = 10.0, count = 200 }\n", 0, []string{"40000 members", "more than 10000"}},
		// Values the sweep file allows but the case file rejects, at the
		// line of the axis.
		{"member value out of range", axis("key = \"canopy.frontal_area\"\nvalues = [10.0, -1.0]"), 3, []string{"member 0001 with canopy.frontal_area = -1.0", "canopy.frontal_area = -1", "> 0"}},
		{"canopy above the top in several members", axis("key = \"canopy.height\"\nvalues = [0.1, 0.3, 0.4, 0.5]"), 3, []string{"3 members (0001 with canopy.height = 0.3, ..., 0003 with canopy.height = 0.5): canopy.height: the canopy is taller than the domain"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := planText(t, tc.text)
			if err == nil {
				t.Fatal("no error")
			}
			msg := err.Error()
			for _, w := range tc.want {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
			var es *Errors
			if !errors.As(err, &es) {
				t.Fatalf("error is %T, not *Errors", err)
			}
			if tc.line > 0 && es.Problems[0].Line != tc.line {
				t.Errorf("line %d, want %d: %s", es.Problems[0].Line, tc.line, msg)
			}
			for _, p := range es.Problems {
				if strings.ContainsAny(p.Error(), "\n\r") {
					t.Errorf("problem spans lines: %q", p.Error())
				}
			}
		})
	}
}

func TestPlanBaseProblems(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "base.toml"), []byte("[domain]\nnx = 3\n"), 0o644)
	sw := filepath.Join(dir, "sweep.toml")
	os.WriteFile(sw, []byte("base = \"base.toml\"\nreplicates = 2\n"), 0o644)
	f, err := Load(sw)
	if err != nil {
		t.Fatal(err)
	}
	_, err = NewPlan(f)
	if err == nil || !strings.Contains(err.Error(), "the base case") || !strings.Contains(err.Error(), "domain.nx") || !strings.Contains(err.Error(), "rollerbed check") {
		t.Fatalf("base problems: %v", err)
	}
}

func TestWriteRefusesAFolderInUse(t *testing.T) {
	f, err := Load(filepath.Join("testdata", "small", "sweep.toml"))
	if err != nil {
		t.Fatal(err)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(t.TempDir(), "sweep")
	if err := pl.Write(dir, false); err != nil {
		t.Fatal(err)
	}
	if err := pl.Write(dir, false); err == nil || !strings.Contains(err.Error(), "--force") {
		t.Errorf("second write: %v", err)
	}
	// --force replaces only a plan.
	os.MkdirAll(filepath.Join(dir, "members", "0000", "run"), 0o755)
	os.WriteFile(filepath.Join(dir, "members", "0000", "run", "x"), nil, 0o644)
	os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o644)
	if err := pl.Write(dir, true); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "members", "0000", "run")); !os.IsNotExist(err) {
		t.Errorf("--force kept the old run folder: %v", err)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "notes.txt")); string(b) != "mine" {
		t.Error("--force removed a file the plan did not write")
	}
	other := t.TempDir()
	os.WriteFile(filepath.Join(other, "x"), nil, 0o644)
	if err := pl.Write(other, true); err == nil || !strings.Contains(err.Error(), "holds no sweep plan") {
		t.Errorf("--force over a foreign folder: %v", err)
	}
	man, err := ReadManifest(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(man.Members) != 4 || man.Keys[0] != "canopy.frontal_area" || man.Keys[1] != SeedKey || man.SweepText != f.Text {
		t.Errorf("manifest: %+v", man)
	}
	if _, err := ReadManifest(t.TempDir()); err == nil || !strings.Contains(err.Error(), "rollerbed sweep plan") {
		t.Errorf("no manifest: %v", err)
	}
}
