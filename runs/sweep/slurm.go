package sweep

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"time"

	"rollerbed/io/runfolder"
)

// Files of the Slurm side of a sweep folder, under slurm/.
const (
	slurmDir   = "slurm"
	scriptName = "array.sh"
	jobsName   = "jobs.json"
	logsDir    = "logs"
)

// SubmitOptions controls Submit.
type SubmitOptions struct {
	// Executable is the rollerbed binary the array tasks run, an absolute
	// path the compute nodes can reach (the command passes its own,
	// os.Executable).
	Executable string
	// DryRun writes the script without submitting it.
	DryRun bool
	// Sbatch and Squeue are the commands to use; "" for "sbatch" and
	// "squeue" on PATH.
	Sbatch, Squeue string
}

// Submission is what Submit did.
type Submission struct {
	Script  string // the array script, absolute
	Members []int  // the members in the array
	Array   string // the --array value
	JobID   string // "" for a dry run
	// Skipped says which members were left out and why.
	Done, Failed, InQueue []int
	// QueueNote says what the queue check found ("" when it worked).
	QueueNote string
	// Warnings are things in the plan a Slurm user should know.
	Warnings []string
}

// JobRecord is one submission in slurm/jobs.json.
type JobRecord struct {
	JobID     string    `json:"job_id"`
	Submitted time.Time `json:"submitted"`
	Array     string    `json:"array"`
	Members   []int     `json:"members"`
	Script    string    `json:"script"`
}

// Submit writes slurm/array.sh for the members of the sweep folder dir that
// are not done, not failed and not already in the Slurm queue, and submits
// it with sbatch (unless DryRun), recording the job id in slurm/jobs.json.
// Each array task runs one member with `rollerbed run`: resuming it when
// its run folder holds a checkpoint, afresh otherwise. The array index is
// the member index, so a resubmission lists only the unfinished members
// (--array=3,5,7).
func Submit(ctx context.Context, dir string, opt SubmitOptions) (*Submission, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	if opt.Executable == "" || !filepath.IsAbs(opt.Executable) {
		return nil, fmt.Errorf("the rollerbed binary for the array tasks must be an absolute path, not %q", opt.Executable)
	}
	if strings.ContainsAny(abs+opt.Executable, " \t\n'\"") {
		return nil, fmt.Errorf("the sweep folder %q or the binary %q holds a space or quote, which #SBATCH lines cannot carry; move the sweep or the binary to a plain path", abs, opt.Executable)
	}
	sub := &Submission{}
	inQueue := map[int]bool{}
	jobs, err := ReadJobs(abs)
	if err != nil {
		return nil, err
	}
	if len(jobs) > 0 {
		q, note := queueStates(ctx, opt.Squeue, jobs)
		sub.QueueNote = note
		for i, s := range q {
			if s.State == StateQueued || s.State == StateRunning {
				inQueue[i] = true
			}
		}
	}
	for i, m := range man.Members {
		switch ReadFolderState(RunDir(abs, m.Name)).State {
		case StateDone:
			sub.Done = append(sub.Done, i)
		case StateFailed:
			sub.Failed = append(sub.Failed, i)
		default:
			if inQueue[i] {
				sub.InQueue = append(sub.InQueue, i)
			} else {
				sub.Members = append(sub.Members, i)
			}
		}
	}
	if len(sub.Members) == 0 {
		switch {
		case len(sub.InQueue) > 0:
			return sub, fmt.Errorf("nothing to submit: the unfinished members (%s) are already queued or running; see `rollerbed sweep status %s`", indexList(sub.InQueue), dir)
		case len(sub.Failed) > 0:
			return sub, fmt.Errorf("nothing to submit: every member is done but %s, which failed; fix the case and plan again, or delete their run folders to retry them", indexList(sub.Failed))
		}
		return sub, fmt.Errorf("nothing to submit: every member is done; gather them with `rollerbed sweep collect %s`", dir)
	}
	s := man.Slurm
	if s == nil {
		s = &Slurm{CPUsPerTask: 1}
		sub.Warnings = append(sub.Warnings, "the sweep file has no [slurm] table: each task asks for 1 core and the partition's default time limit and memory; add [slurm] with time_limit, cpus_per_task and memory to choose")
	}
	if man.FixedWorkers > max(1, s.CPUsPerTask) {
		sub.Warnings = append(sub.Warnings, fmt.Sprintf("the members set numerics.workers up to %d, more than the %d core(s) a task asks for ([slurm] cpus_per_task); the runs will oversubscribe their cores", man.FixedWorkers, max(1, s.CPUsPerTask)))
	}
	sub.Array = indexList(sub.Members)
	if s.MaxConcurrent > 0 {
		sub.Array += "%" + strconv.Itoa(s.MaxConcurrent)
	}
	script := ArrayScript(abs, man, s, sub.Array, opt.Executable)
	if err := os.MkdirAll(filepath.Join(abs, slurmDir, logsDir), 0o755); err != nil {
		return nil, fmt.Errorf("cannot make the Slurm folder: %w", err)
	}
	sub.Script = filepath.Join(abs, slurmDir, scriptName)
	if err := runfolder.WriteFileAtomic(sub.Script, []byte(script)); err != nil {
		return nil, err
	}
	if err := os.Chmod(sub.Script, 0o755); err != nil {
		return nil, err
	}
	if opt.DryRun {
		return sub, nil
	}
	sbatch := opt.Sbatch
	if sbatch == "" {
		sbatch = "sbatch"
	}
	if _, err := exec.LookPath(sbatch); err != nil {
		return sub, fmt.Errorf("cannot submit: %s is not installed here (%v); the script is written: %s; submit it where Slurm is, or use --dry-run", sbatch, err, sub.Script)
	}
	cmd := exec.CommandContext(ctx, sbatch, "--parsable", sub.Script)
	cmd.Dir = abs
	var out, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &stderr
	if err := cmd.Run(); err != nil {
		return sub, fmt.Errorf("sbatch failed (%v): %s; the script is %s", err, oneLine(stderr.String()+" "+out.String()), sub.Script)
	}
	id, err := ParseJobID(out.String())
	if err != nil {
		return sub, fmt.Errorf("sbatch: %v; the job may have been submitted: check `squeue --me`", err)
	}
	sub.JobID = id
	jobs = append(jobs, JobRecord{JobID: id, Submitted: time.Now().UTC().Truncate(time.Second), Array: sub.Array, Members: sub.Members, Script: sub.Script})
	if err := runfolder.WriteJSON(filepath.Join(abs, slurmDir, jobsName), jobs); err != nil {
		return sub, fmt.Errorf("job %s was submitted, but recording it failed: %w", id, err)
	}
	return sub, nil
}

var (
	submittedRE = regexp.MustCompile(`Submitted batch job (\d+)`)
	parsableRE  = regexp.MustCompile(`^(\d+)(;\S+)?$`)
)

// ParseJobID reads the job id from sbatch's output: "Submitted batch job
// 123", or with --parsable "123" or "123;cluster".
func ParseJobID(out string) (string, error) {
	if m := submittedRE.FindStringSubmatch(out); m != nil {
		return m[1], nil
	}
	for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
		if m := parsableRE.FindStringSubmatch(strings.TrimSpace(line)); m != nil {
			return m[1], nil
		}
	}
	return "", fmt.Errorf("no job id in its output %q", oneLine(out))
}

// ReadJobs reads slurm/jobs.json of a sweep folder; none yet is no error.
func ReadJobs(dir string) ([]JobRecord, error) {
	b, err := os.ReadFile(filepath.Join(dir, slurmDir, jobsName))
	if errors.Is(err, os.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var jobs []JobRecord
	if err := json.Unmarshal(b, &jobs); err != nil {
		return nil, fmt.Errorf("%s is damaged (%v); remove it to start the Slurm record afresh", filepath.Join(dir, slurmDir, jobsName), err)
	}
	return jobs, nil
}

// indexList writes member indices as Slurm's --array does: ranges and
// single indices, "0-3" or "3,5,7" or "0-2,5".
func indexList(idx []int) string {
	s := append([]int{}, idx...)
	sort.Ints(s)
	var parts []string
	for i := 0; i < len(s); {
		j := i
		for j+1 < len(s) && s[j+1] == s[j]+1 {
			j++
		}
		switch {
		case j == i:
			parts = append(parts, strconv.Itoa(s[i]))
		case j == i+1:
			parts = append(parts, strconv.Itoa(s[i]), strconv.Itoa(s[j]))
		default:
			parts = append(parts, strconv.Itoa(s[i])+"-"+strconv.Itoa(s[j]))
		}
		i = j + 1
	}
	return strings.Join(parts, ",")
}

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	if s != "" && regexp.MustCompile(`^[A-Za-z0-9_./:=,+@%-]+$`).MatchString(s) {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// jobName makes a Slurm job name from the sweep file's name.
func jobName(man *Manifest) string {
	base := strings.TrimSuffix(filepath.Base(man.SweepFile), filepath.Ext(man.SweepFile))
	clean := regexp.MustCompile(`[^A-Za-z0-9_.-]+`).ReplaceAllString(base, "-")
	if clean == "" || clean == "." {
		clean = "sweep"
	}
	return "rollerbed-" + clean
}

// ArrayScript returns the sbatch script of a sweep folder (absolute path
// dir) for the given --array value. The script maps SLURM_ARRAY_TASK_ID to
// the member folder and runs the member with the given rollerbed binary:
// `rollerbed run --resume` when the run folder holds a checkpoint,
// `rollerbed run CASE --out` otherwise; a member already done exits at
// once.
func ArrayScript(dir string, man *Manifest, s *Slurm, array, exe string) string {
	var b strings.Builder
	logs := filepath.Join(dir, slurmDir, logsDir)
	b.WriteString("#!/bin/bash\n")
	fmt.Fprintf(&b, "# Slurm job array of the rollerbed sweep in %s\n", dir)
	fmt.Fprintf(&b, "# (%d members; written by `rollerbed sweep submit`, which submits it).\n", len(man.Members))
	b.WriteString("# Task N runs member N (members/NNNN) with `rollerbed run`, resuming it\n# from its checkpoint when it has one.\n")
	fmt.Fprintf(&b, "#SBATCH --job-name=%s\n", jobName(man))
	fmt.Fprintf(&b, "#SBATCH --array=%s\n", array)
	if s.TimeLimit != "" {
		fmt.Fprintf(&b, "#SBATCH --time=%s\n", s.TimeLimit)
	}
	fmt.Fprintf(&b, "#SBATCH --ntasks=1\n")
	fmt.Fprintf(&b, "#SBATCH --cpus-per-task=%d\n", max(1, s.CPUsPerTask))
	if s.Memory != "" {
		fmt.Fprintf(&b, "#SBATCH --mem=%s\n", s.Memory)
	}
	if s.Partition != "" {
		fmt.Fprintf(&b, "#SBATCH --partition=%s\n", s.Partition)
	}
	fmt.Fprintf(&b, "#SBATCH --output=%s\n", filepath.Join(logs, "%A_%a.out"))
	fmt.Fprintf(&b, "#SBATCH --error=%s\n", filepath.Join(logs, "%A_%a.err"))
	// Slurm sends SIGTERM at the time limit; rollerbed then checkpoints,
	// and a resubmission resumes.
	for _, e := range s.Extra {
		fmt.Fprintf(&b, "#SBATCH %s\n", e)
	}
	fmt.Fprintf(&b, scriptNames.Replace(`
set -u
rollerbed=%s
sweep=%s
member=$(printf '%%04d' "$SLURM_ARRAY_TASK_ID")
dir="$sweep/members/$member"
run="$dir/run"
if [ ! -f "$dir/@CASE@" ]; then
	echo "rollerbed sweep: no member $member in $sweep" >&2
	exit 2
fi
if [ -f "$run/@SUMMARY@" ] && grep -q '"interrupted": false' "$run/@SUMMARY@" && ! grep -q '"error":' "$run/@SUMMARY@"; then
	echo "rollerbed sweep: member $member is done already"
	exit 0
fi
echo "rollerbed sweep: member $member on $(hostname) from $(date -u +%%Y-%%m-%%dT%%H:%%M:%%SZ)"
if ls "$run"/@CHECKPOINT@ >/dev/null 2>&1; then
	exec "$rollerbed" run --resume "$run" --quiet --no-figures
elif [ -d "$run" ] && [ -n "$(ls -A "$run")" ]; then
	exec "$rollerbed" run "$dir/@CASE@" --out "$run" --force --quiet --no-figures
else
	exec "$rollerbed" run "$dir/@CASE@" --out "$run" --quiet --no-figures
fi
`), shellQuote(exe), shellQuote(dir))
	return b.String()
}

// QueueTask is a member's entry in the Slurm queue.
type QueueTask struct {
	JobID string // the array job id
	State State  // StateQueued or StateRunning (or StateFailed for a task Slurm reports as such)
	Slurm string // Slurm's state name, e.g. PENDING, RUNNING, COMPLETING
}

// queueStates asks squeue about the jobs recorded for the sweep and maps
// member index to queue state. It returns a note instead of an error when
// squeue cannot be asked (Slurm not installed, controller down).
func queueStates(ctx context.Context, squeue string, jobs []JobRecord) (map[int]QueueTask, string) {
	if squeue == "" {
		squeue = "squeue"
	}
	out := map[int]QueueTask{}
	if len(jobs) == 0 {
		return out, ""
	}
	if _, err := exec.LookPath(squeue); err != nil {
		return out, "Slurm is not installed here (no " + squeue + " on PATH): states from the run folders only"
	}
	ours := map[string]bool{}
	for _, j := range jobs {
		ours[j.JobID] = true
	}
	ctx, cancel := context.WithTimeout(ctx, 30*time.Second)
	defer cancel()
	// One line per array task (-r), pending ones too: array job id,
	// task id, state.
	cmd := exec.CommandContext(ctx, squeue, "--me", "-h", "-r", "-o", "%F|%K|%T")
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		return out, fmt.Sprintf("squeue failed (%v: %s): states from the run folders only", err, oneLine(stderr.String()))
	}
	for _, line := range strings.Split(stdout.String(), "\n") {
		f := strings.Split(strings.TrimSpace(line), "|")
		if len(f) != 3 || !ours[f[0]] {
			continue
		}
		idx, err := strconv.Atoi(f[1])
		if err != nil {
			continue
		}
		st := StateRunning
		switch f[2] {
		case "PENDING", "REQUEUED", "REQUEUE_HOLD", "REQUEUE_FED", "RESV_DEL_HOLD", "SUSPENDED", "STOPPED", "CONFIGURING", "RESIZING", "SPECIAL_EXIT":
			st = StateQueued
		case "FAILED", "NODE_FAIL", "OUT_OF_MEMORY", "BOOT_FAIL", "DEADLINE", "TIMEOUT", "PREEMPTED", "CANCELLED", "COMPLETED":
			continue // leaving the queue: the run folder tells
		}
		if prev, ok := out[idx]; ok && prev.State == StateRunning {
			continue
		}
		out[idx] = QueueTask{JobID: f[0], State: st, Slurm: f[2]}
	}
	return out, ""
}

// scriptNames puts the run folder's file names into the job script.
var scriptNames = strings.NewReplacer("@CASE@", runfolder.CaseFile, "@SUMMARY@", runfolder.SummaryFile,
	"@CHECKPOINT@", runfolder.CheckpointPrefix+"*"+runfolder.CheckpointSuffix)

// oneLine joins the lines and runs of blanks of a tool's output into one
// line for a message.
func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }
