package sweep

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"

	"rollerbed/runs"
	"time"
)

// runTask runs the array script for one array task, as Slurm would, and
// returns its exit code and output.
func runTask(t *testing.T, script, task string, args ...string) (int, string) {
	t.Helper()
	cmd := exec.Command("bash", append([]string{script}, args...)...)
	cmd.Env = append(os.Environ(), "SLURM_ARRAY_TASK_ID="+task, "SLURM_ARRAY_JOB_ID=4711", "SLURM_JOB_ID=4799")
	out, err := cmd.CombinedOutput()
	if ee, ok := err.(*exec.ExitError); ok {
		return ee.ExitCode(), string(out)
	} else if err != nil {
		t.Fatal(err)
	}
	return 0, string(out)
}

// TestTaskExitCodes runs the array script's tasks with a rollerbed binary
// that is missing, that fails outside its run, and that is interrupted,
// and checks what each task says, records and how Status shows it.
func TestTaskExitCodes(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash")
	}
	dir := planSmall(t)
	abs, _ := filepath.Abs(dir)
	bin := t.TempDir()
	man, err := ReadManifest(dir)
	if err != nil {
		t.Fatal(err)
	}
	os.MkdirAll(filepath.Join(abs, "slurm", "logs"), 0o755)
	os.WriteFile(filepath.Join(abs, "slurm", "jobs.json"), []byte(`[{"job_id": "4711", "members": [0, 1, 2, 3]}]`), 0o644)
	write := func(name, exe string) string {
		p := filepath.Join(bin, name)
		os.WriteFile(p, []byte(ArrayScript(abs, man, man.Slurm, "0-3", exe)), 0o755)
		return p
	}
	// Interrupted: the run writes a checkpoint and exits 75; like
	// rollerbed, it words its hint for a sweep when the task says it runs in
	// one (runs.SweepTaskEnv), else for a lone run.
	interrupted := fakeCommand(t, bin, "rollerbed-interrupted", `mkdir -p "$4"; touch "$4/checkpoint-000000010.h5"
if [ -n "${`+runs.SweepTaskEnv+`:-}" ]; then
	printf 'interrupted at t = 2 s; a checkpoint is in %s. Resubmit the unfinished members of the sweep with:\n  rollerbed sweep submit %s\n' "$4" "$`+runs.SweepTaskEnv+`" >&2
else
	printf 'interrupted at t = 2 s; a checkpoint is in %s. Continue with:\n  rollerbed run --resume %s\n' "$4" "$4" >&2
fi
exit 75`+"\n")
	failing := fakeCommand(t, bin, "rollerbed-failing", "echo 'panic: something' >&2; exit 3\n")
	tests := []struct {
		name, exe, task string
		code            int
		says            string
		state           State
		detail          string
	}{
		{"missing binary", filepath.Join(bin, "gone"), "0", 127, "task 4711_0 (member 0000): the rollerbed binary " + filepath.Join(bin, "gone") + " is missing",
			StateFailed, "Slurm task 4711_0 exited with code 127 (the rollerbed binary or a command of the set-up lines was not found"},
		{"interrupted", interrupted, "1", 75, "Resubmit the unfinished members, this one resuming, with: rollerbed sweep submit " + abs,
			StateInterrupted, "Slurm task 4711_1 was interrupted (exit code 75"},
		{"crash", failing, "2", 3, "task 4711_2 (member 0002) failed with exit code 3",
			StateFailed, "exited with code 3"},
	}
	for _, tc := range tests {
		code, out := runTask(t, write(tc.name+".sh", tc.exe), tc.task)
		if code != tc.code || !strings.Contains(out, tc.says) || strings.Contains(out, "rollerbed run --resume") {
			t.Errorf("%s: exit %d, output %q; want %d and %q", tc.name, code, out, tc.code, tc.says)
		}
		b, _ := os.ReadFile(filepath.Join(MemberDir(abs, MemberName(int(tc.task[0]-'0'))), TaskExitFile))
		if f := strings.Fields(string(b)); len(f) != 3 || f[0] != strconv.Itoa(tc.code) || f[1] != "4711_"+tc.task {
			t.Errorf("%s: %s holds %q", tc.name, TaskExitFile, b)
		}
	}
	// Slurm's logs of the failing tasks.
	os.WriteFile(filepath.Join(abs, "slurm", "logs", "4711_0.err"), []byte("missing\n"), 0o644)
	rep, err := Status(context.Background(), dir, StatusOptions{Squeue: filepath.Join(bin, "none")})
	if err != nil {
		t.Fatal(err)
	}
	for i, tc := range tests {
		m := rep.Members[i]
		if m.State != tc.state || !strings.Contains(m.Error, tc.detail) || m.ExitCode == nil || *m.ExitCode != tc.code || m.Task != "4711_"+tc.task {
			t.Errorf("%s: status %+v (exit %v), want %s and %q", tc.name, m, m.ExitCode, tc.state, tc.detail)
		}
	}
	if rep.Members[0].Log != filepath.Join(abs, "slurm", "logs", "4711_0.err") {
		t.Errorf("log of the failed task: %q", rep.Members[0].Log)
	}
	if rep.Members[3].State != StatePending || rep.Members[3].ExitCode != nil {
		t.Errorf("untouched member: %+v", rep.Members[3])
	}
	// The offset argument picks the member: task 0 of an array with
	// offset 3 runs member 0003.
	code, out := runTask(t, write("offset.sh", failing), "0", "3")
	if code != 3 || !strings.Contains(out, "task 4711_0 (member 0003)") {
		t.Errorf("offset: %d %q", code, out)
	}
	// A member run again drops the record of its last task.
	code, _ = runTask(t, write("again.sh", fakeCommand(t, bin, "rollerbed-ok", "exit 0\n")), "0")
	if b, _ := os.ReadFile(filepath.Join(MemberDir(abs, "0000"), TaskExitFile)); code != 0 || !strings.HasPrefix(string(b), "0 4711_0 ") {
		t.Errorf("rerun: %d, %q", code, b)
	}
}

// TestTaskForwardsSIGTERM: a SIGTERM to the batch script (Slurm's at the
// time limit) reaches the run, and the run's exit code is recorded.
func TestTaskForwardsSIGTERM(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash")
	}
	dir := planSmall(t)
	abs, _ := filepath.Abs(dir)
	bin := t.TempDir()
	man, _ := ReadManifest(dir)
	started := filepath.Join(bin, "started")
	exe := fakeCommand(t, bin, "rollerbed", `trap 'echo got TERM >&2; exit 75' TERM
touch "`+started+`"
while :; do sleep 0.05; done
`)
	script := filepath.Join(bin, "array.sh")
	os.WriteFile(script, []byte(ArrayScript(abs, man, man.Slurm, "0-3", exe)), 0o755)
	cmd := exec.Command("bash", script)
	cmd.Env = append(os.Environ(), "SLURM_ARRAY_TASK_ID=2", "SLURM_ARRAY_JOB_ID=9")
	var out strings.Builder
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(10 * time.Second)
	for {
		if _, err := os.Stat(started); err == nil {
			break
		}
		if time.Now().After(deadline) {
			cmd.Process.Kill()
			t.Fatalf("the run did not start: %s", out.String())
		}
		time.Sleep(20 * time.Millisecond)
	}
	cmd.Process.Signal(syscall.SIGTERM)
	err := cmd.Wait()
	ee, ok := err.(*exec.ExitError)
	if !ok || ee.ExitCode() != runs.ExitInterrupted || !strings.Contains(out.String(), "got TERM") {
		t.Errorf("exit %v, output %q", err, out.String())
	}
	if b, _ := os.ReadFile(filepath.Join(MemberDir(abs, "0002"), TaskExitFile)); !strings.HasPrefix(string(b), "75 9_2 ") {
		t.Errorf("recorded %q", b)
	}
}
