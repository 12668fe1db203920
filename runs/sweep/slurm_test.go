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
	if sub.Array != "0-3%2" || sub.JobID != "" || !reflect.DeepEqual(sub.Members, []int{0, 1, 2, 3}) {
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
	if sub.JobID != "77" || sub.Array != "0,2,3%2" || !reflect.DeepEqual(sub.Done, []int{1}) {
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
	if err != nil || sub.Array != "2%2" || !reflect.DeepEqual(sub.InQueue, []int{0, 3}) {
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
			dir := t.TempDir()
			b, _ := os.ReadFile(filepath.Join("testdata", "small", "base.toml"))
			os.WriteFile(filepath.Join(dir, "base.toml"), []byte(strings.Replace(string(b), "workers = 1", "workers = "+tc.workers, 1)), 0o644)
			os.WriteFile(filepath.Join(dir, "sweep.toml"), []byte("base = \"base.toml\"\nreplicates = 2\n"+tc.slurm), 0o644)
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
