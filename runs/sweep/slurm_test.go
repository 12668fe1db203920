package sweep

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"rollerbed/io/runfolder"
	"strings"
	"testing"
)

func TestIndexList(t *testing.T) {
	tests := []struct {
		in   []int
		want string
	}{
		{[]int{0, 1, 2, 3}, "0-3"},
		{[]int{3, 5, 7}, "3,5,7"},
		{[]int{7, 0, 1, 2, 5, 9, 8}, "0-2,5,7-9"},
		{[]int{4, 5}, "4,5"},
		{[]int{6}, "6"},
	}
	for _, tc := range tests {
		if got := indexList(tc.in); got != tc.want {
			t.Errorf("indexList(%v) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestParseJobID(t *testing.T) {
	for out, want := range map[string]string{
		"Submitted batch job 4711\n": "4711",
		"4711\n":                     "4711",
		"4711;cluster2\n":            "4711",
		"sbatch: warning: x\n12\n":   "12",
	} {
		if got, err := ParseJobID(out); err != nil || got != want {
			t.Errorf("ParseJobID(%q) = %q, %v; want %q", out, got, err, want)
		}
	}
	if _, err := ParseJobID("sbatch: error: Batch job submission failed"); err == nil {
		t.Error("no job id accepted")
	}
}

// planSweep plans the sweep file text over the small base case with the
// replacements of repl (old, new, ...) into a new folder, and returns the
// sweep folder and the plan.
func planSweep(t *testing.T, text string, repl ...string) (string, *Plan) {
	t.Helper()
	dir := t.TempDir()
	b, err := os.ReadFile(filepath.Join("testdata", "small", "base.toml"))
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "base.toml"), []byte(strings.NewReplacer(repl...).Replace(string(b))), 0o644)
	os.WriteFile(filepath.Join(dir, "sweep.toml"), []byte(text), 0o644)
	f, err := Load(filepath.Join(dir, "sweep.toml"))
	if err != nil {
		t.Fatal(err)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	sd := filepath.Join(dir, "sweep")
	if err := pl.Write(sd, false); err != nil {
		t.Fatal(err)
	}
	return sd, pl
}

// fakeCommand writes an executable shell script into dir.
func fakeCommand(t *testing.T, dir, name, body string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, []byte("#!/bin/sh\n"+body), 0o755); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestSubmitAndStatusWithFakeSlurm(t *testing.T) {
	if _, err := exec.LookPath("sh"); err != nil {
		t.Skip("no sh")
	}
	dir := planSmall(t)
	bin := t.TempDir()
	exe := fakeCommand(t, bin, "rollerbed", "")

	// A dry run writes the script for every member, and submits nothing.
	sub, err := Submit(context.Background(), dir, SubmitOptions{Executable: exe, DryRun: true, Sbatch: filepath.Join(bin, "none")})
	if err != nil {
		t.Fatal(err)
	}
	if len(sub.Parts) != 1 || sub.Parts[0].Array != "0-3%2" || sub.Parts[0].JobID != "" || !reflect.DeepEqual(sub.Members, []int{0, 1, 2, 3}) {
		t.Errorf("dry run: %+v", sub)
	}
	script, _ := os.ReadFile(sub.Script)
	abs, _ := filepath.Abs(dir)
	for _, want := range []string{
		"#SBATCH --array=0-3%2\n", "#SBATCH --time=00:05:00\n", "#SBATCH --cpus-per-task=1\n", "#SBATCH --mem=200M\n",
		"#SBATCH --output=" + abs + "/slurm/logs/%A_%a.out\n", "#SBATCH --error=" + abs + "/slurm/logs/%A_%a.err\n",
		"rollerbed=" + exe + "\n", "SLURM_ARRAY_TASK_ID",
	} {
		if !strings.Contains(string(script), want) {
			t.Errorf("script lacks %q:\n%s", want, script)
		}
	}
	if strings.Contains(string(script), "--partition") {
		t.Error("script names a partition the sweep does not")
	}
	if _, err := os.Stat(filepath.Join(dir, "slurm", "jobs.json")); !os.IsNotExist(err) {
		t.Error("a dry run recorded a job")
	}

	// Member 1 is done and member 2 has a checkpoint: a submission takes
	// 0, 2 and 3.
	os.MkdirAll(RunDir(dir, "0001"), 0o755)
	os.WriteFile(filepath.Join(RunDir(dir, "0001"), "summary.json"), []byte(`{"run": {"interrupted": false}}`), 0o644)
	os.MkdirAll(RunDir(dir, "0002"), 0o755)
	os.WriteFile(filepath.Join(RunDir(dir, "0002"), "checkpoint-000000010.h5"), nil, 0o644)
	sbatch := fakeCommand(t, bin, "sbatch", `echo "$@" > "`+bin+`/sbatch.args"; echo 77`)
	squeue := fakeCommand(t, bin, "squeue", "printf '77|3|PENDING\\n77|0|RUNNING\\n12|2|RUNNING\\n'\n")
	sub, err = Submit(context.Background(), dir, SubmitOptions{Executable: exe, Sbatch: sbatch, Squeue: squeue})
	if err != nil {
		t.Fatal(err)
	}
	if len(sub.Parts) != 1 || sub.Parts[0].JobID != "77" || sub.Parts[0].Array != "0,2,3%2" || !reflect.DeepEqual(sub.Done, []int{1}) {
		t.Errorf("submission %+v", sub)
	}
	if args, _ := os.ReadFile(filepath.Join(bin, "sbatch.args")); strings.TrimSpace(string(args)) != "--parsable "+sub.Script {
		t.Errorf("sbatch called with %q", args)
	}
	jobs, err := ReadJobs(dir)
	if err != nil || len(jobs) != 1 || jobs[0].JobID != "77" || !reflect.DeepEqual(jobs[0].Members, []int{0, 2, 3}) {
		t.Fatalf("jobs.json: %+v, %v", jobs, err)
	}

	// squeue says 0 runs and 3 waits; job 12 is not this sweep's.
	rep, err := Status(context.Background(), dir, StatusOptions{Squeue: squeue})
	if err != nil {
		t.Fatal(err)
	}
	var states []State
	for _, m := range rep.Members {
		states = append(states, m.State)
	}
	if want := []State{StateRunning, StateDone, StateInterrupted, StateQueued}; !reflect.DeepEqual(states, want) || rep.QueueNote != "" {
		t.Errorf("states %v (%q), want %v", states, rep.QueueNote, want)
	}
	if rep.Finished() {
		t.Error("Finished with members left")
	}
	// A second submission leaves out the queued and running members.
	sub, err = Submit(context.Background(), dir, SubmitOptions{Executable: exe, Sbatch: sbatch, Squeue: squeue})
	if err != nil || len(sub.Parts) != 1 || sub.Parts[0].Array != "2%2" || !reflect.DeepEqual(sub.InQueue, []int{0, 3}) {
		t.Errorf("resubmission %+v, %v", sub, err)
	}

	// Without Slurm: from the folders, saying so.
	rep, err = Status(context.Background(), dir, StatusOptions{Squeue: filepath.Join(bin, "no-squeue")})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(rep.QueueNote, "not installed") || rep.Members[0].State != StatePending || rep.Members[3].State != StatePending {
		t.Errorf("without squeue: %q %+v", rep.QueueNote, rep.Members)
	}
	// A failing squeue is a note too.
	broken := fakeCommand(t, bin, "squeue-broken", "echo 'slurm_load_jobs error: Unable to contact slurm controller' >&2; exit 1\n")
	rep, _ = Status(context.Background(), dir, StatusOptions{Squeue: broken})
	if !strings.Contains(rep.QueueNote, "Unable to contact") || !strings.Contains(rep.QueueNote, "run folders only") {
		t.Errorf("broken squeue: %q", rep.QueueNote)
	}
}

// TestArrayScriptTasks runs the array script's body for each kind of
// member with a fake rollerbed that prints its arguments.
func TestArrayScriptTasks(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash")
	}
	dir := planSmall(t)
	abs, _ := filepath.Abs(dir)
	bin := t.TempDir()
	exe := fakeCommand(t, bin, "rollerbed", `echo "$@"`+"\n")
	man, err := ReadManifest(dir)
	if err != nil {
		t.Fatal(err)
	}
	script := filepath.Join(bin, "array.sh")
	os.WriteFile(script, []byte(ArrayScript(abs, man, man.Slurm, "0-3", exe)), 0o755)

	os.MkdirAll(RunDir(dir, "0001"), 0o755)
	os.WriteFile(filepath.Join(RunDir(dir, "0001"), "summary.json"), []byte("{\n  \"run\": {\n    \"interrupted\": false\n  }\n}\n"), 0o644)
	os.MkdirAll(RunDir(dir, "0002"), 0o755)
	os.WriteFile(filepath.Join(RunDir(dir, "0002"), "checkpoint-000000010.h5"), nil, 0o644)
	os.MkdirAll(RunDir(dir, "0003"), 0o755)
	os.WriteFile(filepath.Join(RunDir(dir, "0003"), "run.log"), nil, 0o644)
	md := func(n string) string { return filepath.Join(abs, "members", n) }
	tests := []struct {
		task, want string
		code       int
	}{
		{"0", "run " + md("0000") + "/" + runfolder.CaseFile + " --out " + md("0000") + "/run --quiet", 0},
		{"1", "member 0001 is done already", 0},
		{"2", "run --resume " + md("0002") + "/run --quiet", 0},
		{"3", "run " + md("0003") + "/" + runfolder.CaseFile + " --out " + md("0003") + "/run --force --quiet", 0},
		{"9", "no member 0009", 2},
	}
	for _, tc := range tests {
		cmd := exec.Command("bash", script)
		cmd.Env = append(os.Environ(), "SLURM_ARRAY_TASK_ID="+tc.task)
		out, err := cmd.CombinedOutput()
		code := 0
		if ee, ok := err.(*exec.ExitError); ok {
			code = ee.ExitCode()
		} else if err != nil {
			t.Fatal(err)
		}
		if code != tc.code || !strings.Contains(string(out), tc.want) {
			t.Errorf("task %s: exit %d, output %q; want %d and %q", tc.task, code, out, tc.code, tc.want)
		}
	}
}

func TestSubmitNothingLeft(t *testing.T) {
	dir := planSmall(t)
	for _, m := range []string{"0000", "0001", "0002", "0003"} {
		os.MkdirAll(RunDir(dir, m), 0o755)
		os.WriteFile(filepath.Join(RunDir(dir, m), "summary.json"), []byte(`{"run": {"interrupted": false}}`), 0o644)
	}
	_, err := Submit(context.Background(), dir, SubmitOptions{Executable: "/bin/true", DryRun: true})
	if err == nil || !strings.Contains(err.Error(), "every member is done") || !strings.Contains(err.Error(), "sweep collect") {
		t.Errorf("nothing left: %v", err)
	}
	if _, err := Submit(context.Background(), dir, SubmitOptions{Executable: "rollerbed"}); err == nil || !strings.Contains(err.Error(), "absolute path") {
		t.Errorf("relative binary: %v", err)
	}
}

// TestRunLeavesQueuedMembersToSlurm: a local run does not run members that
// a Slurm job of the sweep holds.
func TestRunLeavesQueuedMembersToSlurm(t *testing.T) {
	dir := planSmall(t)
	bin := t.TempDir()
	squeue := fakeCommand(t, bin, "squeue", "printf '5|0|RUNNING\\n5|1|PENDING\\n6|2|RUNNING\\n'\n")
	os.MkdirAll(filepath.Join(dir, "slurm"), 0o755)
	os.WriteFile(filepath.Join(dir, "slurm", "jobs.json"), []byte(`[{"job_id": "5", "members": [0, 1, 2, 3]}]`), 0o644)
	var events []string
	res, err := Run(context.Background(), dir, RunOptions{Squeue: squeue, Event: func(s string) { events = append(events, s) }})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.InQueue, []int{0, 1}) || !reflect.DeepEqual(res.Finished, []int{2, 3}) || res.Complete() {
		t.Errorf("in queue %v, finished %v (job 6 is not this sweep's)", res.InQueue, res.Finished)
	}
	if !strings.Contains(strings.Join(events, "\n"), "member 0001: queued in Slurm job 5; left to Slurm") {
		t.Errorf("events:\n%s", strings.Join(events, "\n"))
	}
}

func TestSubmitWarnings(t *testing.T) {
	tests := []struct {
		name, workers, slurm, want string
	}{
		{"no slurm table", "1", "", "no [slurm] table"},
		{"oversubscribed", "4", "[slurm]\ncpus_per_task = 2\n", "numerics.workers up to 4, more than the 2 core(s)"},
		{"fits", "2", "[slurm]\ncpus_per_task = 2\n", ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sd, _ := planSweep(t, "base = \"base.toml\"\nreplicates = 2\n"+tc.slurm, "workers = 1", "workers = "+tc.workers)
			sub, err := Submit(context.Background(), sd, SubmitOptions{Executable: "/bin/true", DryRun: true})
			if err != nil {
				t.Fatal(err)
			}
			got := strings.Join(sub.Warnings, "\n")
			if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
				t.Errorf("warnings %q, want %q", got, tc.want)
			}
		})
	}
}

func TestSplitArray(t *testing.T) {
	tests := []struct {
		name    string
		members []int
		limit   int
		max     int
		want    []ArrayPart
	}{
		{"fits", []int{0, 1, 2, 3}, 1001, 2, []ArrayPart{{Offset: 0, Members: []int{0, 1, 2, 3}, Array: "0-3%2"}}},
		{"last index at the limit", []int{0, 1, 2, 3}, 3, 0, []ArrayPart{
			{Offset: 0, Members: []int{0, 1, 2}, Array: "0-2"}, {Offset: 3, Members: []int{3}, Array: "0"}}},
		{"gaps", []int{1, 4, 5, 9}, 4, 1, []ArrayPart{
			{Offset: 0, Members: []int{1}, Array: "1%1"}, {Offset: 4, Members: []int{4, 5}, Array: "0,1%1"}, {Offset: 8, Members: []int{9}, Array: "1%1"}}},
		{"one index per array", []int{0, 1}, 1, 0, []ArrayPart{
			{Offset: 0, Members: []int{0}, Array: "0"}, {Offset: 1, Members: []int{1}, Array: "0"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := splitArray(tc.members, tc.limit, tc.max)
			if err != nil || !reflect.DeepEqual(got, tc.want) {
				t.Errorf("splitArray = %+v, %v; want %+v", got, err, tc.want)
			}
		})
	}
	// 1 100 members under Slurm's default limit: two arrays, the second
	// from 1001 on (the case).
	var many []int
	for i := 0; i < 1100; i++ {
		many = append(many, i)
	}
	got, err := splitArray(many, DefaultMaxArraySize, 0)
	if err != nil || len(got) != 2 || got[0].Array != "0-1000" || got[1].Array != "0-98" || got[1].Offset != 1001 {
		t.Errorf("1 100 members: %v, %v", got, err)
	}
	for _, tc := range []struct {
		limit int
		want  string
	}{{0, "takes no job arrays (MaxArraySize = 0"}, {10, "MaxArraySize is 10"}} {
		if _, err := splitArray(many, tc.limit, 0); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("limit %d: %v, want %q", tc.limit, err, tc.want)
		}
	}
}

func TestMaxArraySize(t *testing.T) {
	bin := t.TempDir()
	tests := []struct {
		name, body string
		want       int
		note       string
	}{
		{"set", "printf 'Configuration data as of now\\nMaxArraySize            = 300\\nMaxJobCount             = 10000\\n'\n", 300, ""},
		{"missing key", "echo 'MaxJobCount = 10'\n", DefaultMaxArraySize, "names no MaxArraySize"},
		{"failing", "echo 'Unable to contact slurm controller' >&2; exit 1\n", DefaultMaxArraySize, "Unable to contact"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sc := fakeCommand(t, bin, "scontrol-"+strings.ReplaceAll(tc.name, " ", "-"), tc.body)
			n, note := MaxArraySize(context.Background(), sc)
			if n != tc.want || (tc.note == "") != (note == "") || !strings.Contains(note, tc.note) {
				t.Errorf("MaxArraySize = %d, %q; want %d, %q", n, note, tc.want, tc.note)
			}
		})
	}
	if n, note := MaxArraySize(context.Background(), filepath.Join(bin, "none")); n != DefaultMaxArraySize || !strings.Contains(note, "assuming Slurm's default MaxArraySize of 1001") {
		t.Errorf("no scontrol: %d, %q", n, note)
	}
}

// TestSubmitSplitsArrays: with a cluster limit of 3 the four members go in
// two arrays of one script, the second with offset 3; squeue's lines of
// the second map back to member 3.
func TestSubmitSplitsArrays(t *testing.T) {
	dir := planSmall(t)
	bin := t.TempDir()
	exe := fakeCommand(t, bin, "rollerbed", "")
	scontrol := fakeCommand(t, bin, "scontrol", "echo 'MaxArraySize = 3'\n")
	sbatch := fakeCommand(t, bin, "sbatch", `echo "$@" >> "`+bin+`/sbatch.args"; n=$(wc -l < "`+bin+`/sbatch.args"); echo $((40 + n))`)
	sub, err := Submit(context.Background(), dir, SubmitOptions{Executable: exe, Sbatch: sbatch, Scontrol: scontrol, Squeue: filepath.Join(bin, "none")})
	if err != nil {
		t.Fatal(err)
	}
	want := []ArrayPart{{Offset: 0, Members: []int{0, 1, 2}, Array: "0-2%2", JobID: "41"}, {Offset: 3, Members: []int{3}, Array: "0%2", JobID: "42"}}
	if !reflect.DeepEqual(sub.Parts, want) || sub.MaxArraySize != 3 {
		t.Fatalf("parts %+v (limit %d), want %+v", sub.Parts, sub.MaxArraySize, want)
	}
	args, _ := os.ReadFile(filepath.Join(bin, "sbatch.args"))
	if w := "--parsable --array=0-2%2 " + sub.Script + " 0\n--parsable --array=0%2 " + sub.Script + " 3\n"; string(args) != w {
		t.Errorf("sbatch calls:\n%s\nwant\n%s", args, w)
	}
	if !strings.Contains(strings.Join(sub.Warnings, "\n"), "2 job arrays") {
		t.Errorf("no warning on the cap per array: %q", sub.Warnings)
	}
	jobs, err := ReadJobs(dir)
	if err != nil || len(jobs) != 2 || jobs[1].Offset != 3 || jobs[1].Slurm == nil || jobs[1].Binary != exe {
		t.Fatalf("jobs.json: %+v, %v", jobs, err)
	}
	squeue := fakeCommand(t, bin, "squeue", "printf '42|0|RUNNING\\n41|1|PENDING\\n'\n")
	rep, err := Status(context.Background(), dir, StatusOptions{Squeue: squeue})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Members[3].State != StateRunning || rep.Members[1].State != StateQueued || rep.Members[0].State != StatePending || rep.Members[3].Task != "42_0" {
		t.Errorf("status: %+v", rep.Members)
	}
}

func TestSubmitBinary(t *testing.T) {
	dir := planSmall(t)
	bin := t.TempDir()
	notExec := filepath.Join(bin, "rollerbed-plain")
	os.WriteFile(notExec, []byte("x"), 0o644)
	tests := []struct {
		name, exe, binary, want string
	}{
		{"missing", filepath.Join(bin, "gone"), "", "does not exist; name the rollerbed binary the compute nodes run with --binary PATH"},
		{"not executable", notExec, "", "is not executable"},
		{"a folder", bin, "", "is not a file"},
		{"relative", "rollerbed", "", "must be an absolute path"},
		{"[slurm] binary wins", "/bin/true", filepath.Join(bin, "gone"), "gone, does not exist"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := &Slurm{CPUsPerTask: 1, Binary: tc.binary}
			_, err := Submit(context.Background(), dir, SubmitOptions{Executable: tc.exe, Slurm: s, DryRun: true, MaxArraySize: 10})
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want %q", err, tc.want)
			}
		})
	}
	// A binary in the temporary folder is taken, with a warning; one
	// elsewhere without.
	tmp, err := os.MkdirTemp("", "rbbin")
	if err != nil {
		t.Fatal(err)
	}
	defer os.RemoveAll(tmp)
	exe := fakeCommand(t, tmp, "rollerbed", "")
	sub, err := Submit(context.Background(), dir, SubmitOptions{Executable: exe, DryRun: true, MaxArraySize: 10})
	if err != nil || !strings.Contains(strings.Join(sub.Warnings, "\n"), "lies in the temporary folder") {
		t.Errorf("binary under the temporary folder: %v, %q", err, sub.Warnings)
	}
	if w := binaryPlace("/usr/bin/true"); w != "" {
		t.Errorf("/usr/bin/true: %q", w)
	}
	cache := t.TempDir()
	t.Setenv("GOCACHE", cache)
	if w := binaryPlace(filepath.Join(cache, "ab", "rollerbed")); !strings.Contains(w, "Go build cache") {
		t.Errorf("binary in the build cache: %q", w)
	}
}

func TestSlurmSet(t *testing.T) {
	tests := []struct {
		key  string
		v    any
		want string // "" for accepted
	}{
		{"time_limit", "02:00:00", ""},
		{"time_limit", "2h", "is not a Slurm time limit"},
		{"memory", "8G", ""},
		{"memory", "8 GB", "is not a Slurm memory size"},
		{"cpus_per_task", 0, "must be from 1 to 4096"},
		{"max_concurrent", -1, "must be >= 0"},
		{"partition", "long queue", "is not a partition name"},
		{"binary", "", "must be the path of the rollerbed binary"},
		{"setup", []string{"module load hdf5", "export A=1\nexport B=2"}, "must be one line"},
	}
	for _, tc := range tests {
		s := &Slurm{CPUsPerTask: 1}
		err := s.Set(tc.key, tc.v)
		if (tc.want == "") != (err == nil) || (err != nil && !strings.Contains(err.Error(), tc.want)) {
			t.Errorf("Set(%s, %v) = %v, want %q", tc.key, tc.v, err, tc.want)
		}
	}
	s := &Slurm{}
	if err := s.Set("setup", []string{"module load hdf5"}); err != nil || !reflect.DeepEqual(s.Setup, []string{"module load hdf5"}) {
		t.Errorf("setup: %v %v", s.Setup, err)
	}
	if err := s.Set("setup", []string{""}); err != nil || s.Setup != nil {
		t.Errorf("no setup: %v %v", s.Setup, err)
	}
}

// TestSubmitTakesNewSettings: settings given to Submit go into the script
// and jobs.json, and the next submission starts from them, not from the
// plan's.
func TestSubmitTakesNewSettings(t *testing.T) {
	dir := planSmall(t)
	bin := t.TempDir()
	exe := fakeCommand(t, bin, "rollerbed", "")
	s, source, err := CurrentSlurm(dir)
	if err != nil || s.TimeLimit != "00:05:00" || source != "the plan's [slurm] table" {
		t.Fatalf("plan's settings: %+v %q %v", s, source, err)
	}
	s.Set("time_limit", "02:00:00")
	s.Set("setup", []string{"module load hdf5", "export OMP_NUM_THREADS=1"})
	sbatch := fakeCommand(t, bin, "sbatch", "echo 5\n")
	sub, err := Submit(context.Background(), dir, SubmitOptions{Executable: exe, Slurm: s, Sbatch: sbatch, Squeue: filepath.Join(bin, "none"), MaxArraySize: 100})
	if err != nil {
		t.Fatal(err)
	}
	script, _ := os.ReadFile(sub.Script)
	if !strings.Contains(string(script), "#SBATCH --time=02:00:00\n") || !strings.Contains(string(script), "\nmodule load hdf5\nexport OMP_NUM_THREADS=1\n\nset -u\n") {
		t.Errorf("script:\n%s", script)
	}
	s2, source, err := CurrentSlurm(dir)
	if err != nil || s2.TimeLimit != "02:00:00" || len(s2.Setup) != 2 || !strings.Contains(source, "job 5") {
		t.Errorf("after the submission: %+v %q %v", s2, source, err)
	}
	// The plan itself is unchanged.
	if man, _ := ReadManifest(dir); man.Slurm.TimeLimit != "00:05:00" {
		t.Errorf("the manifest changed: %+v", man.Slurm)
	}
}

func TestMemoryBytes(t *testing.T) {
	for in, want := range map[string]int64{"1G": 1 << 30, "500M": 500 << 20, "2048": 2048 << 20, "64K": 64 << 10, "1T": 1 << 40} {
		if got, ok := MemoryBytes(in); !ok || got != want {
			t.Errorf("MemoryBytes(%q) = %d, %v; want %d", in, got, ok, want)
		}
	}
	for _, in := range []string{"", "1GB", "-1G", "99999999999999999999T"} {
		if _, ok := MemoryBytes(in); ok {
			t.Errorf("MemoryBytes(%q) accepted", in)
		}
	}
	if w := memoryWarning(900<<20, "1G"); w != "" {
		t.Errorf("fits: %q", w)
	}
	if w := memoryWarning(3<<30, "1G"); !strings.Contains(w, "3.0 GiB") || !strings.Contains(w, `memory = "4G"`) {
		t.Errorf("too little: %q", w)
	}
}

// TestPlanWarnsOnMemory: a plan whose members need more memory than
// [slurm] memory asks says so (runs.MemoryBytes gives the need; the small
// case needs about 34 MiB, most of it the fixed part).
func TestPlanWarnsOnMemory(t *testing.T) {
	for _, tc := range []struct{ mem, want string }{{"10M", "asks for 10 MiB"}, {"200M", ""}} {
		_, pl := planSweep(t, "base = \"base.toml\"\nreplicates = 2\n[slurm]\nmemory = \""+tc.mem+"\"\n")
		got := strings.Join(pl.Warnings, "\n")
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("memory %s: warnings %q, want %q", tc.mem, got, tc.want)
		}
		if pl.Members[0].MemoryBytes < 30<<20 {
			t.Errorf("member memory %d bytes", pl.Members[0].MemoryBytes)
		}
	}
}

// TestSubmitWarnsOnPlannedWorkers: members that leave the workers to the
// plan got the plan's cpus_per_task; other cores at submission say so.
func TestSubmitWarnsOnPlannedWorkers(t *testing.T) {
	sd, _ := planSweep(t, "base = \"base.toml\"\nreplicates = 2\n[slurm]\ncpus_per_task = 2\n", "workers = 1", "workers = 0")
	for _, tc := range []struct {
		cpus int
		want string
	}{{2, ""}, {4, "planned with numerics.workers = 2 (the cpus_per_task of the plan), so they run 2 worker(s) on the 4 core(s)"}} {
		sub, err := Submit(context.Background(), sd, SubmitOptions{Executable: "/bin/true", DryRun: true, MaxArraySize: 10, Slurm: &Slurm{CPUsPerTask: tc.cpus}})
		if err != nil {
			t.Fatal(err)
		}
		got := strings.Join(sub.Warnings, "\n")
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("cpus %d: warnings %q, want %q", tc.cpus, got, tc.want)
		}
	}
}
