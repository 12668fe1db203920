package main

import (
	"bytes"
	"crypto/rand"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// sweepBase is a tiny canopy case, a fraction of a second per run, and
// sweepFile four members of it: two densities with two seeds each.
const sweepBase = `
title = "test: small canopy"
[domain]
length = 0.4
depth = 0.2
nx = 32
nz = 24
[fluid]
viscosity = 1.0e-5
[canopy]
height = 0.08
frontal_area = 15.0
drag_coefficient = 1.0
[forcing]
bulk_velocity = 0.05
[initial]
profile = "drag-balanced"
perturbation = 0.002
perturbation_at = 0.08
perturbation_width = 0.03
seed = 3
[time]
duration = 4.0
spin_up = 1.0
[output]
profile_every = 0.5
snapshot_every = 1.0
checkpoint_every = 1.0
probes = 4
[numerics]
workers = 1
`

const sweepFile = `
title = "test: four members"
base = "base.toml"
replicates = 2
[[axis]]
key = "canopy.frontal_area"
values = [10.0, 15.0]
[slurm]
time_limit = "00:05:00"
cpus_per_task = 1
memory = "200M"
max_concurrent = 2
`

// writeSweep writes the test sweep and its base case into dir and returns
// the sweep file.
func writeSweep(t *testing.T, dir, text string) string {
	t.Helper()
	if err := os.WriteFile(filepath.Join(dir, "base.toml"), []byte(sweepBase), 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "sweep.toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestSweepUsage(t *testing.T) {
	tests := []struct {
		args   []string
		code   int
		stdout string
		stderr string
	}{
		{[]string{"sweep"}, exitUsage, "", "rollerbed sweep plan"},
		{[]string{"sweep", "help"}, exitOK, "rollerbed sweep collect", ""},
		{[]string{"help", "sweep"}, exitOK, "[[axis]]", ""},
		{[]string{"sweep", "frobnicate"}, exitUsage, "", `unknown sub-command "frobnicate"`},
		{[]string{"sweep", "plan", "--help"}, exitOK, "--out", ""},
		{[]string{"sweep", "plan", "x.toml"}, exitUsage, "", "Usage: rollerbed sweep plan"},
		{[]string{"sweep", "run"}, exitUsage, "", "--jobs"},
		{[]string{"sweep", "run", "--jobs", "-1", "x"}, exitUsage, "", "--jobs"},
		{[]string{"sweep", "collect", "x", "--plot", "flow.x"}, exitUsage, "", "write the metric and the parameter as Y:X"},
		{[]string{"sweep", "status", t.TempDir()}, exitUsage, "", "holds no sweep plan"},
		{[]string{"sweep", "example", "nope"}, exitUsage, "", "the examples are canopy-density, filter-garden-height"},
	}
	for _, tc := range tests {
		code, o, e := runCmd(t, tc.args...)
		if code != tc.code || !strings.Contains(o, tc.stdout) || !strings.Contains(e, tc.stderr) {
			t.Errorf("%v: code %d, stdout %q, stderr %q", tc.args, code, o, e)
		}
	}
	if _, o, _ := runCmd(t, "help"); !strings.Contains(o, "sweep") {
		t.Errorf("help does not list sweep:\n%s", o)
	}
}

// TestSweepPlanMistakes: a bad sweep exits 2 with the key, the value and
// the fix, and writes nothing.
func TestSweepPlanMistakes(t *testing.T) {
	tests := []struct {
		name, from, to string
		want           []string
	}{
		{"unknown key", `key = "canopy.frontal_area"`, `key = "canopy.frontal_areas"`, []string{"sweep.toml line 6", `axis[0].key = "canopy.frontal_areas"`, "did you mean canopy.frontal_area?"}},
		{"wrong type", `values = [10.0, 15.0]`, `values = [10.0, "15"]`, []string{`axis[0].values[1] = "15"`, "must be a number"}},
		{"empty", `values = [10.0, 15.0]`, `values = []`, []string{"axis[0].values = []", "is empty"}},
		{"count", `values = [10.0, 15.0]`, `linear = { from = 1.0, to = 2.0, count = 0 }`, []string{"axis[0].linear.count = 0", "must be from 1"}},
		{"log", `values = [10.0, 15.0]`, `log = { from = -1.0, to = 2.0, count = 3 }`, []string{"axis[0].log.from = -1.0", "must be > 0"}},
		{"zip", `replicates = 2`, "combine = \"zip\"\n[[axis]]\nkey = \"canopy.height\"\nvalues = [0.05, 0.06, 0.07]", []string{"equal length", "has 2", "has 3"}},
		{"member", `values = [10.0, 15.0]`, `values = [10.0, -15.0]`, []string{"2 members (0002 with canopy.frontal_area = -15.0, initial.seed = 3, 0003 with canopy.frontal_area = -15.0, initial.seed = 4): canopy.frontal_area: must be"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			text := strings.Replace(sweepFile, tc.from, tc.to, 1)
			if text == sweepFile {
				t.Fatalf("%q is not in the sweep file", tc.from)
			}
			sw := writeSweep(t, dir, text)
			out := filepath.Join(dir, "out")
			code, _, e := runCmd(t, "sweep", "plan", sw, "--out", out)
			if code != exitUsage {
				t.Errorf("code %d, want %d", code, exitUsage)
			}
			for _, w := range tc.want {
				if !strings.Contains(e, w) {
					t.Errorf("stderr lacks %q:\n%s", w, e)
				}
			}
			if _, err := os.Stat(out); !os.IsNotExist(err) {
				t.Errorf("the sweep folder was made: %v", err)
			}
		})
	}
}

// TestSweepLocal plans, runs, reports and collects the test sweep through
// the command, in this process.
func TestSweepLocal(t *testing.T) {
	dir := t.TempDir()
	sw := writeSweep(t, dir, sweepFile)
	out := filepath.Join(dir, "sweep")
	code, o, e := runCmd(t, "sweep", "plan", sw, "--out", out)
	if code != exitOK || !strings.Contains(o, "planned 4 members") || !strings.Contains(o, "0003  canopy.frontal_area = 15.0, initial.seed = 4") {
		t.Fatalf("plan: %d\n%s%s", code, o, e)
	}
	if code, _, e := runCmd(t, "sweep", "plan", sw, "--out", out); code != exitUsage || !strings.Contains(e, "--force") {
		t.Errorf("plan again: %d %s", code, e)
	}
	code, o, _ = runCmd(t, "sweep", "status", out)
	if code != exitOK || !strings.Contains(o, "4 members: 4 pending") {
		t.Errorf("status before: %d\n%s", code, o)
	}
	if code, _, e := runCmd(t, "sweep", "collect", out); code != exitUsage || !strings.Contains(e, "no member") {
		t.Errorf("collect before running: %d %s", code, e)
	}
	code, o, e = runCmd(t, "sweep", "run", out, "--jobs", "2")
	if code != exitOK || !strings.Contains(o, "finished now   4") || !strings.Contains(e, "member 0003: finished") || !strings.Contains(e, "4/4 done") {
		t.Fatalf("run: %d\n%s\n%s", code, o, e)
	}
	code, o, _ = runCmd(t, "sweep", "run", out, "--quiet")
	if code != exitOK || !strings.Contains(o, "done before    4 (skipped)") {
		t.Errorf("second run: %d\n%s", code, o)
	}
	code, o, _ = runCmd(t, "sweep", "status", out, "--json")
	var rep struct {
		Members []struct {
			State string `json:"state"`
		} `json:"members"`
		Counts map[string]int `json:"counts"`
	}
	if code != exitOK || json.Unmarshal([]byte(o), &rep) != nil || rep.Counts["done"] != 4 {
		t.Errorf("status --json: %d\n%s", code, o)
	}
	if code, _, e := runCmd(t, "sweep", "collect", out, "--plot", "flow.penetration_depth:canopy.frontal_area"); code != exitUsage || !strings.Contains(e, "did you mean flow.penetration_depth_m?") {
		t.Errorf("collect with a bad plot: %d %s", code, e)
	}
	if _, err := os.Stat(filepath.Join(out, "sweep.csv")); !os.IsNotExist(err) {
		t.Error("a bad --plot still wrote sweep.csv")
	}
	code, o, e = runCmd(t, "sweep", "collect", out, "--plot", "flow.penetration_depth_m:canopy.frontal_area", "--plot", "flow.roller_spacing_correlation_m:canopy.frontal_area")
	if code != exitOK || !strings.Contains(o, "4 members, 2 varied") || !strings.Contains(o, "Nepf") {
		t.Fatalf("collect: %d\n%s%s", code, o, e)
	}
	recs := readCSV(t, filepath.Join(out, "sweep.csv"))
	if len(recs) != 5 || !reflect.DeepEqual(recs[0][:3], []string{"member", "canopy.frontal_area", "initial.seed"}) {
		t.Errorf("sweep.csv: %v", recs)
	}
	for _, f := range []string{"flow.penetration_depth_m-vs-canopy.frontal_area.png", "flow.roller_spacing_correlation_m-vs-canopy.frontal_area.png"} {
		if _, err := os.Stat(filepath.Join(out, "figures", f)); err != nil {
			t.Error(err)
		}
	}
	code, o, e = runCmd(t, "sweep", "submit", out, "--dry-run")
	if code != exitUsage || !strings.Contains(e, "every member is done") {
		t.Errorf("submit with everything done: %d %s %s", code, o, e)
	}
	// Examples: listed, written, refused over existing files.
	code, o, _ = runCmd(t, "sweep", "example")
	if code != exitOK || !strings.Contains(o, "canopy-density") || !strings.Contains(o, "filter-garden-height") {
		t.Errorf("example list: %d %s", code, o)
	}
	ex := filepath.Join(dir, "ex")
	if code, o, e := runCmd(t, "sweep", "example", "canopy-density", "--out", ex); code != exitOK || !strings.Contains(o, "density-flume.toml") {
		t.Errorf("example: %d %s %s", code, o, e)
	}
	if code, _, e := runCmd(t, "sweep", "example", "canopy-density", "--out", ex); code != exitUsage || !strings.Contains(e, "already exists") {
		t.Errorf("example again: %d %s", code, e)
	}
	if code, o, e := runCmd(t, "sweep", "plan", filepath.Join(ex, "canopy-density.toml"), "--out", filepath.Join(dir, "density")); code != exitOK || !strings.Contains(o, "planned 14 members") {
		t.Errorf("plan the example: %d %s %s", code, o, e)
	}
	code, o, e = runCmd(t, "sweep", "submit", filepath.Join(dir, "density"), "--dry-run")
	if code != exitOK || !strings.Contains(o, "--array=0-13%8") {
		t.Errorf("submit --dry-run: %d %s %s", code, o, e)
	}
}

// TestSweepRunSignal stops the built command's sweep run with SIGINT: the
// running members stop with checkpoints, and the message says how to
// continue.
func TestSweepRunSignal(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "rollerbed")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("build: %v\n%s", err, out)
	}
	sw := writeSweep(t, dir, sweepFile)
	long := strings.Replace(sweepBase, "duration = 4.0", "duration = 400.0", 1)
	long = strings.Replace(long, "checkpoint_every = 1.0", "checkpoint_every = 100.0", 1)
	os.WriteFile(filepath.Join(dir, "base.toml"), []byte(long), 0o644)
	out := filepath.Join(dir, "sweep")
	if code, o, e := runCmd(t, "sweep", "plan", sw, "--out", out); code != exitOK {
		t.Fatalf("plan: %d %s %s", code, o, e)
	}
	cmd := exec.Command(bin, "sweep", "run", out, "--jobs", "2")
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	stepping := func(m string) bool {
		b, _ := os.ReadFile(filepath.Join(out, "members", m, "run", "run.log"))
		return bytes.Contains(b, []byte("started"))
	}
	if !waitFor(60*time.Second, func() bool { return stepping("0000") && stepping("0001") }) {
		cmd.Process.Kill()
		cmd.Wait()
		t.Fatal("the members did not start")
	}
	// A second runner of the same sweep folder is refused at once.
	var e2 bytes.Buffer
	second := exec.Command(bin, "sweep", "run", out, "--jobs", "2")
	second.Stderr = &e2
	if err := second.Run(); !strings.Contains(e2.String(), fmt.Sprintf("is in use by rollerbed process %d ", cmd.Process.Pid)) {
		t.Errorf("a second sweep run: %v\n%s", err, e2.String())
	}
	time.Sleep(300 * time.Millisecond)
	cmd.Process.Signal(os.Interrupt)
	err := cmd.Wait()
	if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != exitInterrupted {
		t.Fatalf("exit after SIGINT: %v\n%s%s", err, stdout.String(), stderr.String())
	}
	if !strings.Contains(stderr.String(), "rollerbed sweep run "+out) || !strings.Contains(stdout.String(), "interrupted    0000, 0001 (checkpointed)") {
		t.Errorf("no continue hint:\n%s%s", stdout.String(), stderr.String())
	}
	code, o, _ := runCmd(t, "sweep", "status", out)
	if code != exitOK || !strings.Contains(o, "2 interrupted, 2 pending") {
		t.Errorf("status after the interrupt:\n%s", o)
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

// withoutWallTime drops the columns of wall-clock times, which differ
// from run to run.
func withoutWallTime(recs [][]string) [][]string {
	var keep []int
	for i, h := range recs[0] {
		if !strings.Contains(h, "wall_time") {
			keep = append(keep, i)
		}
	}
	out := make([][]string, len(recs))
	for r, rec := range recs {
		for _, i := range keep {
			out[r] = append(out[r], rec[i])
		}
	}
	return out
}

// TestSweepSlurmCluster starts a one-node Slurm cluster of its own (munged,
// slurmctld and slurmd on 127.0.0.1, everything in a temporary folder),
// submits the test sweep to it as a job array, waits on `sweep status`,
// resubmits a member whose run was lost, and checks that the collected
// table equals that of a local run value for value (wall-clock times
// apart). The cluster's MaxArraySize is 3, so the four members go in two
// arrays; resubmissions change the Slurm settings and the binary without
// a new plan, and a task whose binary is gone shows as failed. It skips when Slurm and munge are not installed
// (scripts/install-slurm.sh installs them), when not run as root, or when
// the daemons do not come up.
func TestSweepSlurmCluster(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a Slurm cluster (-short)")
	}
	cl := startSlurm(t, "MaxArraySize=3")
	dir := t.TempDir()
	cl.roots = append(cl.roots, dir)
	bin := filepath.Join(dir, "rollerbed")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("build: %v\n%s", err, out)
	}
	sw := writeSweep(t, dir, sweepFile)
	local, remote := filepath.Join(dir, "local"), filepath.Join(dir, "slurm")
	for _, d := range []string{local, remote} {
		if code, o, e := runCmd(t, "sweep", "plan", sw, "--out", d); code != exitOK {
			t.Fatalf("plan: %d %s %s", code, o, e)
		}
	}
	started := time.Now()
	if code, o, e := runCmd(t, "sweep", "run", local, "--quiet"); code != exitOK {
		t.Fatalf("local run: %d %s %s", code, o, e)
	}
	t.Logf("local run: %s", time.Since(started).Round(time.Millisecond))

	run := func(args ...string) string {
		t.Helper()
		cmd := exec.Command(bin, args...)
		cmd.Env = cl.env
		var stdout, stderr bytes.Buffer
		cmd.Stdout, cmd.Stderr = &stdout, &stderr
		if err := cmd.Run(); err != nil {
			t.Fatalf("rollerbed %s: %v\n%s%s", strings.Join(args, " "), err, stdout.String(), stderr.String())
		}
		return stdout.String()
	}
	type statusReport struct {
		Members []struct {
			Name  string `json:"name"`
			State string `json:"state"`
			Log   string `json:"log"`
			Error string `json:"error"`
		} `json:"members"`
		Counts    map[string]int `json:"counts"`
		QueueNote string         `json:"queue_note"`
	}
	// waitFailed waits until n members failed and the rest are done.
	waitFailed := func(n int) statusReport {
		t.Helper()
		deadline := time.Now().Add(90 * time.Second)
		for {
			var rep statusReport
			if err := json.Unmarshal([]byte(run("sweep", "status", remote, "--json")), &rep); err != nil {
				t.Fatal(err)
			}
			if rep.QueueNote != "" {
				t.Fatalf("status could not ask the queue: %s", rep.QueueNote)
			}
			if rep.Counts["failed"] > n {
				t.Fatalf("members failed: %+v\n%s", rep.Members, cl.logs())
			}
			if rep.Counts["done"]+n == len(rep.Members) && rep.Counts["failed"] == n {
				return rep
			}
			if time.Now().After(deadline) {
				t.Fatalf("the array did not finish in time: %+v\n%s\n%s", rep.Counts, run("sweep", "status", remote), cl.logs())
			}
			time.Sleep(250 * time.Millisecond)
		}
	}
	wait := func() { t.Helper(); waitFailed(0) }

	started = time.Now()
	o := run("sweep", "submit", remote)
	if !strings.Contains(o, "MaxArraySize is 3") || !strings.Contains(o, "3 member(s), 0000 to 0002, --array=0-2%2, offset 0") ||
		!strings.Contains(o, "1 member(s), 0003 to 0003, --array=0%2, offset 3") {
		t.Fatalf("submit: %s", o)
	}
	wait()
	t.Logf("Slurm arrays of 3 and 1: %s", time.Since(started).Round(time.Millisecond))
	script, _ := os.ReadFile(filepath.Join(remote, "slurm", "array.sh"))
	for _, want := range []string{"#SBATCH --array=0-2%2", "#SBATCH --time=00:05:00", "#SBATCH --cpus-per-task=1", "#SBATCH --mem=200M", "rollerbed=" + bin} {
		if !strings.Contains(string(script), want) {
			t.Errorf("array.sh lacks %q", want)
		}
	}
	logs, _ := filepath.Glob(filepath.Join(remote, "slurm", "logs", "*_*.out"))
	if len(logs) != 4 {
		t.Errorf("%d task logs, want 4: %v", len(logs), logs)
	}

	// A member whose run is lost goes again, alone, with a set-up line
	// and another time limit given at submission, without a new plan;
	// its binary is gone when the task starts (the set-up line waits for
	// that), so the task fails and status says why.
	if err := os.RemoveAll(filepath.Join(remote, "members", "0002", "run")); err != nil {
		t.Fatal(err)
	}
	gone := filepath.Join(dir, "bin", "rollerbed")
	os.MkdirAll(filepath.Dir(gone), 0o755)
	if b, err := os.ReadFile(bin); err != nil || os.WriteFile(gone, b, 0o755) != nil {
		t.Fatal(err)
	}
	o = run("sweep", "submit", remote, "--time", "00:06:00", "--setup", "echo set-up line ran; sleep 2", "--binary", gone)
	if !strings.Contains(o, "--array=2%2") || !strings.Contains(o, "3 done") || !strings.Contains(o, "--time=00:06:00") {
		t.Fatalf("resubmit: %s", o)
	}
	os.Remove(gone)
	rep := waitFailed(1)
	if m := rep.Members[2]; m.State != "failed" || !strings.Contains(m.Error, "exited with code 127") {
		t.Errorf("member with its binary gone: %+v", m)
	}
	if b, _ := os.ReadFile(rep.Members[2].Log); !strings.Contains(string(b), "(member 0002): the rollerbed binary "+gone+" is missing") {
		t.Errorf("its error log %s: %s", rep.Members[2].Log, b)
	}
	script, _ = os.ReadFile(filepath.Join(remote, "slurm", "array.sh"))
	if !strings.Contains(string(script), "#SBATCH --time=00:06:00\n") || !strings.Contains(string(script), "\necho set-up line ran; sleep 2\n") {
		t.Errorf("array.sh:\n%s", script)
	}
	// Submitted again with a binary that is there, it runs.
	o = run("sweep", "submit", remote, "--binary", bin)
	if !strings.Contains(o, "--array=2%2") || !strings.Contains(o, "--time=00:06:00") {
		t.Fatalf("resubmit: %s", o)
	}
	wait()
	var jobs []struct {
		JobID   string `json:"job_id"`
		Members []int  `json:"members"`
		Offset  int    `json:"offset"`
	}
	b, _ := os.ReadFile(filepath.Join(remote, "slurm", "jobs.json"))
	if json.Unmarshal(b, &jobs) != nil || len(jobs) != 4 || !reflect.DeepEqual(jobs[3].Members, []int{2}) || jobs[1].Offset != 3 || jobs[2].JobID == jobs[3].JobID {
		t.Errorf("jobs.json: %s", b)
	}
	outs, _ := filepath.Glob(filepath.Join(remote, "slurm", "logs", jobs[3].JobID+"_2.out"))
	if b, _ := os.ReadFile(strings.Join(outs, "")); !strings.Contains(string(b), "set-up line ran") {
		t.Errorf("the set-up line did not run: %q", b)
	}
	if o := run("sweep", "status", remote); !strings.Contains(o, "4 members: 4 done") || !strings.Contains(o, "Slurm jobs: "+jobs[0].JobID+", "+jobs[1].JobID+", "+jobs[2].JobID+", "+jobs[3].JobID) {
		t.Errorf("status: %s", o)
	}

	run("sweep", "collect", remote)
	if code, o, e := runCmd(t, "sweep", "collect", local); code != exitOK {
		t.Fatalf("collect local: %d %s %s", code, o, e)
	}
	got, want := readCSV(t, filepath.Join(remote, "sweep.csv")), readCSV(t, filepath.Join(local, "sweep.csv"))
	if !reflect.DeepEqual(got[0], want[0]) {
		t.Fatalf("headers differ:\n%v\n%v", got[0], want[0])
	}
	if len(want[0]) < 20 || len(got) != 5 {
		t.Fatalf("the table is too small: %v", got)
	}
	if g, w := withoutWallTime(got), withoutWallTime(want); !reflect.DeepEqual(g, w) {
		t.Errorf("the Slurm table differs from the local one:\n%v\n%v", g, w)
	}
}

// slurmCluster is a one-node Slurm cluster started by a test.
type slurmCluster struct {
	t     *testing.T
	dir   string
	env   []string       // the environment of client commands (SLURM_CONF)
	procs []*exec.Cmd    // the daemons, in start order
	roots []string       // folders whose users belong to the cluster
	found map[int]string // processes of the cluster found while stopping it
}

// startSlurm starts munged, slurmctld and slurmd in the foreground as
// children of the test (more holds further slurm.conf lines), bound to 127.0.0.1, with configuration, munge key,
// socket, state and logs in a temporary folder. It skips the test when
// that cannot be done here, and stops the cluster when the test ends.
func startSlurm(t *testing.T, more ...string) *slurmCluster {
	t.Helper()
	if runtime.GOOS != "linux" {
		t.Skip("the Slurm test runs on Linux")
	}
	paths := map[string]string{}
	for _, name := range []string{"munged", "slurmctld", "slurmd", "sbatch", "squeue", "sinfo", "scancel"} {
		p, err := exec.LookPath(name)
		if err != nil {
			if _, err2 := os.Stat("/usr/sbin/" + name); err2 == nil {
				p, err = "/usr/sbin/"+name, nil
			}
		}
		if err != nil {
			t.Skipf("Slurm and munge are not installed (no %s); scripts/install-slurm.sh installs Debian's slurm-wlm and munge", name)
		}
		paths[name] = p
	}
	if os.Geteuid() != 0 {
		t.Skip("the one-node Slurm cluster runs its daemons as root (SlurmUser=root); run the test as root")
	}
	if _, err := exec.LookPath("go"); err != nil {
		t.Skip("no go command to build the rollerbed binary the array tasks run")
	}
	// Short paths: the munge socket path must fit a Unix socket name.
	dir, err := os.MkdirTemp("", "rbslurm")
	if err != nil {
		t.Fatal(err)
	}
	cl := &slurmCluster{t: t, dir: dir, roots: []string{dir}, found: map[int]string{}}
	t.Cleanup(func() {
		cl.stop()
		if !t.Failed() {
			os.RemoveAll(dir)
		} else {
			t.Logf("the cluster's configuration, state and logs are kept in %s", dir)
		}
	})
	for _, d := range []string{"munge", "state", "spool", "log"} {
		if err := os.MkdirAll(filepath.Join(dir, d), 0o700); err != nil {
			t.Fatal(err)
		}
	}
	sockDir := filepath.Join(dir, "munge", "run")
	os.MkdirAll(sockDir, 0o755)
	os.Chmod(sockDir, 0o755)
	os.Chmod(dir, 0o755)
	key := make([]byte, 1024)
	rand.Read(key)
	keyFile := filepath.Join(dir, "munge", "munge.key")
	if err := os.WriteFile(keyFile, key, 0o400); err != nil {
		t.Fatal(err)
	}
	sock := filepath.Join(sockDir, "munge.sock")
	cl.daemon(paths["munged"], "--foreground", "--force", "--key-file="+keyFile, "--socket="+sock,
		"--pid-file="+filepath.Join(dir, "munge", "munged.pid"), "--log-file="+filepath.Join(dir, "log", "munged.log"),
		"--seed-file="+filepath.Join(dir, "munge", "munged.seed"))
	if !waitFor(10*time.Second, func() bool { _, err := os.Stat(sock); return err == nil }) {
		cl.skip("munged did not make its socket")
	}

	host, _ := os.Hostname()
	host, _, _ = strings.Cut(host, ".")
	if host == "" {
		host = "localhost"
	}
	ctldPort, slurmdPort := freePort(t), freePort(t)
	cores := max(4, runtime.NumCPU())
	conf := filepath.Join(dir, "slurm.conf")
	text := fmt.Sprintf(`# A one-node test cluster on 127.0.0.1, started by a rollerbed test.
ClusterName=rollerbedtest
SlurmctldHost=%[1]s(127.0.0.1)
SlurmctldPort=%[2]d
SlurmdPort=%[3]d
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=%[4]s
CommunicationParameters=NoInAddrAny,NoCtldInAddrAny
StateSaveLocation=%[5]s/state
SlurmdSpoolDir=%[5]s/spool
SlurmctldPidFile=%[5]s/slurmctld.pid
SlurmdPidFile=%[5]s/slurmd.pid
SlurmctldLogFile=%[5]s/log/slurmctld.log
SlurmdLogFile=%[5]s/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
MailProg=/bin/true
KillWait=5
ReturnToService=2
MpiDefault=none
SlurmdParameters=config_overrides
NodeName=%[1]s NodeAddr=127.0.0.1 Boards=1 SocketsPerBoard=1 CoresPerSocket=%[6]d ThreadsPerCore=1 RealMemory=2048 State=UNKNOWN
PartitionName=test Nodes=%[1]s Default=YES MaxTime=INFINITE State=UP
%[7]s`, host, ctldPort, slurmdPort, sock, dir, cores, strings.Join(append(more, ""), "\n"))
	if err := os.WriteFile(conf, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, e := range os.Environ() {
		if !strings.HasPrefix(e, "SLURM_") {
			cl.env = append(cl.env, e)
		}
	}
	cl.env = append(cl.env, "SLURM_CONF="+conf)
	cl.daemon(paths["slurmctld"], "-D", "-i", "-f", conf)
	cl.daemon(paths["slurmd"], "-D", "-f", conf, "-N", host)
	started := time.Now()
	up := waitFor(30*time.Second, func() bool {
		cmd := exec.Command(paths["sinfo"], "-h", "-o", "%t")
		cmd.Env = cl.env
		out, err := cmd.Output()
		return err == nil && strings.TrimSpace(string(out)) == "idle"
	})
	if !up {
		cl.skip("the node did not come up idle within 30 s")
	}
	t.Logf("one-node Slurm cluster up in %s (%s, %d cores, ports %d and %d)", time.Since(started).Round(time.Millisecond), host, cores, ctldPort, slurmdPort)
	return cl
}

// daemon starts a daemon in the foreground as a child of the test, its
// output into the log folder.
func (cl *slurmCluster) daemon(path string, args ...string) {
	out, err := os.Create(filepath.Join(cl.dir, "log", filepath.Base(path)+".out"))
	if err != nil {
		cl.t.Fatal(err)
	}
	cmd := exec.Command(path, args...)
	cmd.Env = cl.env
	if cmd.Env == nil {
		cmd.Env = os.Environ()
	}
	cmd.Stdout, cmd.Stderr = out, out
	cmd.Dir = cl.dir
	if err := cmd.Start(); err != nil {
		out.Close()
		cl.skip(fmt.Sprintf("cannot start %s: %v", path, err))
	}
	out.Close()
	cl.procs = append(cl.procs, cmd)
}

// skip gives up on the cluster: the daemons are stopped (by the cleanup)
// and the test skipped, with the logs.
func (cl *slurmCluster) skip(why string) {
	cl.t.Helper()
	cl.t.Skipf("could not start a one-node Slurm cluster here: %s\n%s", why, cl.logs())
}

// logs returns the tails of the daemons' logs.
func (cl *slurmCluster) logs() string {
	var b strings.Builder
	files, _ := filepath.Glob(filepath.Join(cl.dir, "log", "*"))
	for _, f := range files {
		data, _ := os.ReadFile(f)
		lines := strings.Split(strings.TrimSpace(string(data)), "\n")
		if len(lines) > 15 {
			lines = lines[len(lines)-15:]
		}
		fmt.Fprintf(&b, "--- %s\n%s\n", f, strings.Join(lines, "\n"))
	}
	return b.String()
}

// stop cancels what is left in the queue, then stops slurmd, slurmctld and
// munged by their process ids (SIGTERM, then SIGKILL), and kills by id the
// processes the cluster left (slurmstepd outlives slurmd and ignores
// SIGTERM). A process counts as stopped when it is gone or a zombie.
func (cl *slurmCluster) stop() {
	t := cl.t
	if len(cl.procs) >= 2 {
		run := func(name string, args ...string) string {
			cmd := exec.Command(name, args...)
			cmd.Env = cl.env
			out, _ := cmd.Output()
			return string(out)
		}
		if ids := strings.Fields(run("squeue", "-h", "-o", "%A")); len(ids) > 0 {
			run("scancel", ids...)
			waitFor(10*time.Second, func() bool { return strings.TrimSpace(run("squeue", "-h", "-o", "%A")) == "" })
		}
	}
	cl.scan()
	// slurmd, slurmctld, then munged: the reverse of the start order.
	for i := len(cl.procs) - 1; i >= 0; i-- {
		cmd := cl.procs[i]
		done := make(chan struct{})
		go func() { cmd.Wait(); close(done) }()
		cmd.Process.Signal(syscall.SIGTERM)
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			cmd.Process.Kill()
			<-done
		}
		if st := processState(cmd.Process.Pid); st != "" && st != "Z" {
			t.Errorf("%s (pid %d) is still %s after the stop", cmd.Path, cmd.Process.Pid, st)
		}
		if i == len(cl.procs)-1 || i == 1 {
			cl.scan()
		}
	}
	cl.scan()
	if len(cl.found) > 0 {
		var list []string
		for pid, what := range cl.found {
			list = append(list, fmt.Sprintf("%s (%d)", what, pid))
		}
		t.Logf("stopping what the cluster left: %s", strings.Join(list, ", "))
	}
	for pid, what := range cl.found {
		if p, err := os.FindProcess(pid); err == nil {
			p.Signal(syscall.SIGKILL)
		}
		if !waitFor(5*time.Second, func() bool { st := processState(pid); return st == "" || st == "Z" }) {
			t.Errorf("%s (pid %d) left by the cluster did not stop", what, pid)
		}
	}
}

// scan records the processes, other than the test and its daemons, whose
// working folder or open files lie in the cluster's folders: slurmstepd,
// the batch scripts and the runs they started.
func (cl *slurmCluster) scan() {
	own := map[int]bool{os.Getpid(): true}
	for _, c := range cl.procs {
		own[c.Process.Pid] = true
	}
	ents, _ := os.ReadDir("/proc")
	for _, e := range ents {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || own[pid] {
			continue
		}
		if st := processState(pid); st == "" || st == "Z" {
			continue
		}
		var links []string
		if l, err := os.Readlink(filepath.Join("/proc", e.Name(), "cwd")); err == nil {
			links = append(links, l)
		}
		fds, _ := os.ReadDir(filepath.Join("/proc", e.Name(), "fd"))
		for _, fd := range fds {
			if l, err := os.Readlink(filepath.Join("/proc", e.Name(), "fd", fd.Name())); err == nil {
				links = append(links, l)
			}
		}
		for _, l := range links {
			for _, root := range cl.roots {
				if l == root || strings.HasPrefix(l, root+"/") {
					comm, _ := os.ReadFile(filepath.Join("/proc", e.Name(), "comm"))
					cl.found[pid] = strings.TrimSpace(string(comm))
				}
			}
		}
	}
}

// processState returns the state letter of a process (R, S, D, Z, ...),
// or "" when there is no such process.
func processState(pid int) string {
	b, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "stat"))
	if err != nil {
		return ""
	}
	// pid (comm) state ...; comm may hold spaces and parentheses
	s := string(b)
	i := strings.LastIndexByte(s, ')')
	if i < 0 || i+2 >= len(s) {
		return ""
	}
	return s[i+2 : i+3]
}

func waitFor(d time.Duration, ok func() bool) bool {
	deadline := time.Now().Add(d)
	for {
		if ok() {
			return true
		}
		if time.Now().After(deadline) {
			return false
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// freePort returns a TCP port on 127.0.0.1 that was free a moment ago.
func freePort(t *testing.T) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Skipf("cannot listen on 127.0.0.1: %v", err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

// TestWrongKindOfFile: a sweep file given to check or run, and a case file
// given to sweep plan, are named as what they are, with the command they
// take, in one line instead of a list of unknown keys.
func TestWrongKindOfFile(t *testing.T) {
	dir := t.TempDir()
	code, _, e := runCmd(t, "sweep", "example", "canopy-density", "--out", dir)
	if code != exitOK {
		t.Fatalf("sweep example: %d %s", code, e)
	}
	sw := filepath.Join(dir, "canopy-density.toml")
	cs := filepath.Join(dir, "meadow.toml")
	if code, _, e := runCmd(t, "init", cs); code != exitOK {
		t.Fatalf("init: %s", e)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"check", sw}, "is a sweep file"},
		{[]string{"run", sw, "--out", filepath.Join(dir, "r")}, "rollerbed sweep plan"},
		{[]string{"sweep", "plan", cs, "--out", filepath.Join(dir, "s")}, "is a case file"},
	} {
		code, _, e := runCmd(t, c.args...)
		if code != exitUsage || !strings.Contains(e, c.want) || strings.Count(strings.TrimSpace(e), "\n") > 0 || strings.Contains(e, "unknown key") {
			t.Errorf("%q: code %d, stderr %q", c.args, code, e)
		}
	}
}

// TestSweepSubmitSettings: `sweep submit` takes the Slurm settings anew
// from the edited sweep file and from options, without a new plan, and
// refuses wrong values naming the option.
func TestSweepSubmitSettings(t *testing.T) {
	dir := t.TempDir()
	sw := writeSweep(t, dir, sweepFile)
	sd := filepath.Join(dir, "sweep")
	if code, o, e := runCmd(t, "sweep", "plan", sw, "--out", sd); code != exitOK || e != "" {
		t.Fatalf("plan: %d %s %s", code, o, e)
	}
	edited := strings.Replace(sweepFile, `time_limit = "00:05:00"`, "time_limit = \"00:09:00\"\nsetup = [\"module load hdf5\"]", 1)
	if err := os.WriteFile(sw, []byte(edited), 0o644); err != nil {
		t.Fatal(err)
	}
	script := func() string {
		b, _ := os.ReadFile(filepath.Join(sd, "slurm", "array.sh"))
		return string(b)
	}
	code, o, e := runCmd(t, "sweep", "submit", sd, "--dry-run")
	if code != exitOK || !strings.Contains(e, "has another [slurm] table than this submission uses; take it with --slurm-from "+sw) || !strings.Contains(script(), "--time=00:05:00\n") {
		t.Errorf("plain dry run: %d %s %s\n%s", code, o, e, script())
	}
	code, o, e = runCmd(t, "sweep", "submit", sd, "--dry-run", "--slurm-from", sw, "--mem", "300M", "--cpus", "2")
	if code != exitOK || strings.Contains(e, "has another [slurm]") || !strings.Contains(o, "Slurm settings from the [slurm] table of "+sw+", --mem, --cpus: --time=00:09:00 --mem=300M --cpus-per-task=2, at most 2 at once, 1 set-up line(s); binary ") {
		t.Errorf("--slurm-from: %d %s %s", code, o, e)
	}
	for _, want := range []string{"#SBATCH --time=00:09:00\n", "#SBATCH --mem=300M\n", "#SBATCH --cpus-per-task=2\n", "\nmodule load hdf5\n"} {
		if !strings.Contains(script(), want) {
			t.Errorf("array.sh lacks %q:\n%s", want, script())
		}
	}
	for _, tc := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--time", "2h"}, exitUsage, `--time "2h" is not a Slurm time limit`},
		{[]string{"--mem", "1GB"}, exitUsage, `--mem "1GB" is not a Slurm memory size`},
		{[]string{"--cpus", "0"}, exitUsage, "--cpus 0 must be from 1 to 4096"},
		{[]string{"--setup", "a\nb"}, exitUsage, "must be one line"},
		{[]string{"--binary", filepath.Join(dir, "none")}, exitUsage, filepath.Join(dir, "none") + ", does not exist"},
		{[]string{"--slurm-from", filepath.Join(dir, "base.toml")}, exitUsage, "--slurm-from " + filepath.Join(dir, "base.toml")},
	} {
		code, o, e := runCmd(t, append([]string{"sweep", "submit", sd, "--dry-run"}, tc.args...)...)
		if code != tc.code || !strings.Contains(e, tc.want) {
			t.Errorf("%v: %d %s %s; want %d and %q", tc.args, code, o, e, tc.code, tc.want)
		}
	}
	// Planning warns when a member needs more memory than [slurm] asks.
	small := strings.Replace(sweepFile, `memory = "200M"`, `memory = "8M"`, 1)
	os.WriteFile(sw, []byte(small), 0o644)
	code, _, e = runCmd(t, "sweep", "plan", sw, "--out", filepath.Join(dir, "small-mem"))
	if code != exitOK || !strings.Contains(e, `warning: a member is expected to need`) || !strings.Contains(e, `[slurm] memory = "8M"`) {
		t.Errorf("plan with too little memory: %d %s", code, e)
	}
}

// TestSweepSubmitManyMembers: 1 100 members do not fit one array of a
// cluster whose MaxArraySize is Slurm's default, 1001: the dry run says
// so and shows the two arrays that fit.
func TestSweepSubmitManyMembers(t *testing.T) {
	if testing.Short() {
		t.Skip("plans 1 100 members (-short)")
	}
	dir := t.TempDir()
	sw := writeSweep(t, dir, "base = \"base.toml\"\nreplicates = 1100\n[slurm]\nmemory = \"200M\"\n")
	bin := filepath.Join(dir, "bin")
	os.MkdirAll(bin, 0o755)
	os.WriteFile(filepath.Join(bin, "scontrol"), []byte("#!/bin/sh\necho 'MaxArraySize            = 1001'\n"), 0o755)
	t.Setenv("PATH", bin+string(os.PathListSeparator)+os.Getenv("PATH"))
	sd := filepath.Join(dir, "sweep")
	if code, o, e := runCmd(t, "sweep", "plan", sw, "--out", sd); code != exitOK {
		t.Fatalf("plan: %d %s %s", code, o, e)
	}
	code, o, e := runCmd(t, "sweep", "submit", sd, "--dry-run", "--binary", "/bin/true")
	script := filepath.Join(sd, "slurm", "array.sh")
	for _, want := range []string{"MaxArraySize is 1001, so the 1100 member(s) go in 2 job arrays",
		"sbatch --array=0-1000 " + script + " 0   # members 0000 to 1000", "sbatch --array=0-98 " + script + " 1001   # members 1001 to 1099"} {
		if code != exitOK || !strings.Contains(o, want) {
			t.Errorf("dry run lacks %q: %d\n%s\n%s", want, code, o, e)
		}
	}
	if strings.Contains(e, "note:") {
		t.Errorf("the limit was not read: %s", e)
	}
}
