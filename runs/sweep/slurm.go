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
	"rollerbed/runs"
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
	// Executable is the rollerbed binary the array tasks run when the
	// settings name none (Slurm.Binary), an absolute path the compute
	// nodes can reach (the command passes its own, os.Executable).
	Executable string
	// Slurm replaces the settings of the last submission (or, before the
	// first, the plan's [slurm] table) for this submission and the later
	// ones; nil keeps them. CurrentSlurm returns them to start from.
	Slurm *Slurm
	// DryRun writes the script without submitting it.
	DryRun bool
	// Sbatch, Squeue and Scontrol are the commands to use; "" for
	// "sbatch", "squeue" and "scontrol" on PATH.
	Sbatch, Squeue, Scontrol string
	// MaxArraySize is the cluster's limit on array indices (indices run
	// from 0 to MaxArraySize-1); 0 to read it with `scontrol show config`.
	MaxArraySize int
}

// Submission is what Submit did.
type Submission struct {
	Script  string // the array script, absolute
	Members []int  // the members submitted, in all parts
	// Parts are the job arrays submitted, one unless the members' indices
	// reach the cluster's MaxArraySize.
	Parts []ArrayPart
	// MaxArraySize is the cluster's limit the parts fit.
	MaxArraySize int
	// Slurm are the settings the script asks for, and Binary the rollerbed
	// binary the tasks run.
	Slurm  *Slurm
	Binary string
	// Skipped says which members were left out and why.
	Done, Failed, InQueue []int
	// QueueNote says what the queue check found ("" when it worked), and
	// LimitNote what reading the array limit found ("" when it worked).
	QueueNote, LimitNote string
	// Warnings are things in the plan a Slurm user should know.
	Warnings []string
}

// ArrayPart is one job array of a submission: the members from Offset on,
// as array indices member - Offset.
type ArrayPart struct {
	Offset  int
	Members []int  // member indices
	Array   string // the --array value, of indices member - Offset
	JobID   string // "" for a dry run
}

// JobRecord is one submission in slurm/jobs.json.
type JobRecord struct {
	JobID     string    `json:"job_id"`
	Submitted time.Time `json:"submitted"`
	Array     string    `json:"array"`
	// Offset is added to an array index to give the member index.
	Offset  int    `json:"offset,omitempty"`
	Members []int  `json:"members"`
	Script  string `json:"script"`
	// Slurm are the settings the job was submitted with, and Binary the
	// rollerbed binary its tasks run.
	Slurm  *Slurm `json:"slurm,omitempty"`
	Binary string `json:"binary,omitempty"`
}

// DefaultMaxArraySize is Slurm's default MaxArraySize, assumed when the
// cluster's cannot be read (slurm.conf(5)).
const DefaultMaxArraySize = 1001

// maxParts bounds the job arrays of one submission.
const maxParts = 64

// CurrentSlurm returns the Slurm settings the next submission of the sweep
// folder dir starts from: those of its last submission, or the plan's
// [slurm] table before the first (nil when the plan has none), and where
// they come from.
func CurrentSlurm(dir string) (*Slurm, string, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, "", err
	}
	jobs, err := ReadJobs(dir)
	if err != nil {
		return nil, "", err
	}
	for i := len(jobs) - 1; i >= 0; i-- {
		if jobs[i].Slurm != nil {
			return jobs[i].Slurm.clone(), "the last submission (job " + jobs[i].JobID + ")", nil
		}
	}
	if man.Slurm == nil {
		return nil, "", nil
	}
	return man.Slurm.clone(), "the plan's [slurm] table", nil
}

// clone returns a copy of s that shares no slices with it.
func (s *Slurm) clone() *Slurm {
	c := *s
	c.Extra = append([]string(nil), s.Extra...)
	c.Setup = append([]string(nil), s.Setup...)
	return &c
}

// Set sets the [slurm] key (time_limit, memory, partition, cpus_per_task,
// max_concurrent, binary: a string or int as the key takes; setup: a
// []string, whose blank lines are dropped) to v, checking it as the sweep file's reader does. The error
// says what is wrong with the value and the fix.
func (s *Slurm) Set(key string, v any) error {
	if lines, ok := v.([]string); ok && key == "setup" {
		s.Setup = nil
		for _, l := range lines {
			if msg := slurmValueProblem(key, l); msg != "" {
				return fmt.Errorf("%q %s", l, msg)
			}
			if strings.TrimSpace(l) != "" {
				s.Setup = append(s.Setup, l)
			}
		}
		return nil
	}
	if msg := slurmValueProblem(key, v); msg != "" {
		return fmt.Errorf("%s %s", slurmValueText(v), msg)
	}
	switch key {
	case "time_limit":
		s.TimeLimit = v.(string)
	case "memory":
		s.Memory = v.(string)
	case "partition":
		s.Partition = v.(string)
	case "cpus_per_task":
		s.CPUsPerTask = v.(int)
	case "max_concurrent":
		s.MaxConcurrent = v.(int)
	case "binary":
		b, err := filepath.Abs(v.(string))
		if err != nil {
			return err
		}
		s.Binary = b
	default:
		panic("sweep: Slurm.Set of unknown key " + key)
	}
	return nil
}

// Submit writes slurm/array.sh for the members of the sweep folder dir that
// are not done, not failed and not already in the Slurm queue, and submits
// it with sbatch (unless DryRun), recording the job ids in slurm/jobs.json.
// Each array task runs one member with `rollerbed run`: resuming it when
// its run folder holds a checkpoint, afresh otherwise. The array index is
// the member index, so a resubmission lists only the unfinished members
// (--array=3,5,7). Members whose index reaches the cluster's MaxArraySize
// go in further arrays of the same script, each with an offset added to
// its indices (the script's argument), so that every array fits.
func Submit(ctx context.Context, dir string, opt SubmitOptions) (*Submission, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, err
	}
	lock, err := runfolder.TakeLock(dir)
	if err != nil {
		return nil, err
	}
	defer lock.Release()
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	sub := &Submission{}
	s := opt.Slurm
	if s == nil {
		if s, _, err = CurrentSlurm(abs); err != nil {
			return nil, err
		}
	}
	if s == nil {
		s = &Slurm{CPUsPerTask: 1}
		sub.Warnings = append(sub.Warnings, "the sweep file has no [slurm] table: each task asks for 1 core and the partition's default time limit and memory; add [slurm] with time_limit, cpus_per_task and memory to choose (or give --time, --cpus and --mem)")
	}
	sub.Slurm = s
	sub.Binary = s.Binary
	if sub.Binary == "" {
		sub.Binary = opt.Executable
	}
	if err := checkBinary(sub.Binary); err != nil {
		return nil, err
	}
	if strings.ContainsAny(abs+sub.Binary, " \t\n'\"") {
		return nil, fmt.Errorf("the sweep folder %q or the binary %q holds a space or quote, which #SBATCH lines cannot carry; move the sweep or the binary to a plain path", abs, sub.Binary)
	}
	if w := binaryPlace(sub.Binary); w != "" {
		sub.Warnings = append(sub.Warnings, w)
	}
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
	sub.Warnings = append(sub.Warnings, settingsWarnings(man, s)...)
	sub.MaxArraySize = opt.MaxArraySize
	if sub.MaxArraySize == 0 {
		sub.MaxArraySize, sub.LimitNote = MaxArraySize(ctx, opt.Scontrol)
	}
	sub.Parts, err = splitArray(sub.Members, sub.MaxArraySize, s.MaxConcurrent)
	if err != nil {
		return sub, err
	}
	if len(sub.Parts) > 1 && s.MaxConcurrent > 0 {
		sub.Warnings = append(sub.Warnings, fmt.Sprintf("the members go in %d job arrays (the cluster's MaxArraySize is %d); [slurm] max_concurrent = %d caps each array, so up to %d members may run at once", len(sub.Parts), sub.MaxArraySize, s.MaxConcurrent, len(sub.Parts)*s.MaxConcurrent))
	}
	script := ArrayScript(abs, man, s, sub.Parts[0].Array, sub.Binary)
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
	for k := range sub.Parts {
		part := &sub.Parts[k]
		args := []string{"--parsable", sub.Script}
		if len(sub.Parts) > 1 {
			args = []string{"--parsable", "--array=" + part.Array, sub.Script, strconv.Itoa(part.Offset)}
		}
		cmd := exec.CommandContext(ctx, sbatch, args...)
		cmd.Dir = abs
		var out, stderr bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &stderr
		if err := cmd.Run(); err != nil {
			return sub, fmt.Errorf("sbatch failed (%v): %s; the script is %s%s", err, oneLine(stderr.String()+" "+out.String()), sub.Script, submittedNote(sub.Parts[:k]))
		}
		id, err := ParseJobID(out.String())
		if err != nil {
			return sub, fmt.Errorf("sbatch: %v; the job may have been submitted: check `squeue --me`", err)
		}
		part.JobID = id
		for _, i := range part.Members {
			os.Remove(filepath.Join(MemberDir(abs, man.Members[i].Name), TaskExitFile))
		}
		jobs = append(jobs, JobRecord{JobID: id, Submitted: time.Now().UTC().Truncate(time.Second), Array: part.Array, Offset: part.Offset,
			Members: part.Members, Script: sub.Script, Slurm: s, Binary: sub.Binary})
		if err := runfolder.WriteJSON(filepath.Join(abs, slurmDir, jobsName), jobs); err != nil {
			return sub, fmt.Errorf("job %s was submitted, but recording it failed: %w", id, err)
		}
	}
	return sub, nil
}

// submittedNote names the arrays submitted before a failure.
func submittedNote(done []ArrayPart) string {
	if len(done) == 0 {
		return ""
	}
	var ids []string
	for _, p := range done {
		ids = append(ids, p.JobID)
	}
	return fmt.Sprintf("; job(s) %s of this submission were submitted and are recorded, so submitting again sends the rest", strings.Join(ids, ", "))
}

// splitArray groups the members into job arrays whose indices stay below
// the cluster's limit: members from k*limit to (k+1)*limit-1 go in array
// k, with offset k*limit. max is the %N cap of each array (0 for none).
func splitArray(members []int, limit, max int) ([]ArrayPart, error) {
	if limit < 1 {
		return nil, fmt.Errorf("the cluster takes no job arrays (MaxArraySize = %d in `scontrol show config`); ask its administrators, or run the sweep with `rollerbed sweep run`", limit)
	}
	var parts []ArrayPart
	for _, i := range members {
		off := i / limit * limit
		if len(parts) == 0 || parts[len(parts)-1].Offset != off {
			parts = append(parts, ArrayPart{Offset: off})
		}
		p := &parts[len(parts)-1]
		p.Members = append(p.Members, i)
	}
	if len(parts) > maxParts {
		return nil, fmt.Errorf("the cluster's MaxArraySize is %d (`scontrol show config`), so the %d members would need %d job arrays, more than %d; submit from a cluster with a larger limit, or split the sweep into several", limit, len(members), len(parts), maxParts)
	}
	for k := range parts {
		rel := make([]int, len(parts[k].Members))
		for j, i := range parts[k].Members {
			rel[j] = i - parts[k].Offset
		}
		parts[k].Array = indexList(rel)
		if max > 0 {
			parts[k].Array += "%" + strconv.Itoa(max)
		}
	}
	return parts, nil
}

var maxArrayRE = regexp.MustCompile(`(?m)^\s*MaxArraySize\s*=\s*(\d+)`)

// MaxArraySize reads the cluster's MaxArraySize from `scontrol show
// config` (scontrol "" for the one on PATH). When it cannot, it returns
// Slurm's default, DefaultMaxArraySize, and a note saying why.
func MaxArraySize(ctx context.Context, scontrol string) (int, string) {
	if scontrol == "" {
		scontrol = "scontrol"
	}
	assume := fmt.Sprintf("; assuming Slurm's default MaxArraySize of %d", DefaultMaxArraySize)
	if _, err := exec.LookPath(scontrol); err != nil {
		return DefaultMaxArraySize, "cannot read the cluster's array limit (no " + scontrol + " on PATH)" + assume
	}
	ctx, cancel := context.WithTimeout(ctx, 30*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, scontrol, "show", "config")
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		return DefaultMaxArraySize, fmt.Sprintf("cannot read the cluster's array limit (`%s show config`: %v: %s)%s", scontrol, err, oneLine(stderr.String()), assume)
	}
	m := maxArrayRE.FindStringSubmatch(stdout.String())
	if m == nil {
		return DefaultMaxArraySize, "`" + scontrol + " show config` names no MaxArraySize" + assume
	}
	n, err := strconv.Atoi(m[1])
	if err != nil {
		return DefaultMaxArraySize, "`" + scontrol + " show config` gives MaxArraySize = " + m[1] + assume
	}
	return n, ""
}

// checkBinary checks that the rollerbed binary the tasks run is an
// absolute path to an executable file.
func checkBinary(path string) error {
	fix := "name the rollerbed binary the compute nodes run with --binary PATH or [slurm] binary"
	if path == "" || !filepath.IsAbs(path) {
		return fmt.Errorf("the rollerbed binary for the array tasks must be an absolute path, not %q; %s", path, fix)
	}
	fi, err := os.Stat(path)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return fmt.Errorf("the rollerbed binary for the array tasks, %s, does not exist; %s", path, fix)
	case err != nil:
		return fmt.Errorf("cannot check the rollerbed binary for the array tasks: %v; %s", err, fix)
	case !fi.Mode().IsRegular():
		return fmt.Errorf("the rollerbed binary for the array tasks, %s, is not a file; %s", path, fix)
	case fi.Mode().Perm()&0o111 == 0:
		return fmt.Errorf("the rollerbed binary for the array tasks, %s, is not executable; make it so (chmod +x %s) or %s", path, path, fix)
	}
	return nil
}

// binaryPlace returns a warning when the binary lies in a folder that is
// temporary or local to this machine (the system's temporary folder, the
// Go build cache, where `go run` and `go test` build), which compute nodes
// may not see and which may be emptied before the tasks start; "" otherwise.
func binaryPlace(path string) string {
	real, err := filepath.EvalSymlinks(path)
	if err != nil {
		real = path
	}
	type place struct{ dir, what string }
	var places []place
	if c := os.Getenv("GOCACHE"); c != "" {
		places = append(places, place{c, "the Go build cache"})
	}
	if c, err := os.UserCacheDir(); err == nil {
		places = append(places, place{filepath.Join(c, "go-build"), "the Go build cache"})
	}
	if t := os.Getenv("GOTMPDIR"); t != "" {
		places = append(places, place{t, "Go's temporary build folder"})
	}
	for _, t := range []string{os.TempDir(), "/tmp", "/var/tmp", "/dev/shm"} {
		places = append(places, place{t, "the temporary folder"})
	}
	for _, p := range places {
		for _, cand := range []string{path, real} {
			dir := filepath.Clean(p.dir)
			if r, err := filepath.EvalSymlinks(dir); err == nil {
				dir = r
			}
			if strings.HasPrefix(cand, dir+string(filepath.Separator)) {
				return fmt.Sprintf("the array tasks run %s, which lies in %s (%s): compute nodes may not see it, and it may be gone before the tasks start; build the binary into a shared, persistent folder (e.g. go build -o ~/bin/rollerbed ./cmd/rollerbed) and name it with --binary PATH or [slurm] binary", path, p.what, p.dir)
			}
		}
	}
	return ""
}

// settingsWarnings are the warnings about the settings s for the members
// of man: cores and workers, memory asked against memory needed.
func settingsWarnings(man *Manifest, s *Slurm) []string {
	var w []string
	cpus := max(1, s.CPUsPerTask)
	if man.FixedWorkers > cpus {
		w = append(w, fmt.Sprintf("the members set numerics.workers up to %d, more than the %d core(s) a task asks for ([slurm] cpus_per_task); the runs will oversubscribe their cores", man.FixedWorkers, cpus))
	}
	if planned := plannedCPUs(man); man.FixedWorkers == 0 && planned != cpus {
		w = append(w, fmt.Sprintf("the members were planned with numerics.workers = %d (the cpus_per_task of the plan), so they run %d worker(s) on the %d core(s) a task now asks for; plan again to change the workers", planned, planned, cpus))
	}
	if m := memoryWarning(man.MemberMemory(), s.Memory); m != "" {
		w = append(w, m)
	}
	return w
}

// plannedCPUs returns the cores per task the plan wrote into the members'
// numerics.workers.
func plannedCPUs(man *Manifest) int {
	if man.Slurm == nil {
		return 1
	}
	return max(1, man.Slurm.CPUsPerTask)
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

// TaskExitFile is the file in a member's folder (members/NNNN/) where its
// last Slurm task records how it ended: "CODE JOB_TASK TIME", e.g.
// "127 4711_3 2026-01-02T03:04:05Z". Status reads it, as a task that never
// started its run leaves nothing in the run folder.
const TaskExitFile = "slurm-task-exit"

// ArrayScript returns the sbatch script of a sweep folder (absolute path
// dir) for the given --array value. The script maps SLURM_ARRAY_TASK_ID,
// plus the offset given as its first argument (0 without), to the member
// folder and runs the member with the given rollerbed binary: `rollerbed
// run --resume` when the run folder holds a checkpoint, `rollerbed run
// CASE --out` otherwise; a member already done exits at once. The set-up
// lines of s run first. The script records the run's exit code in the
// member's TaskExitFile and, for an interrupted run, says how to go on.
func ArrayScript(dir string, man *Manifest, s *Slurm, array, exe string) string {
	var b strings.Builder
	logs := filepath.Join(dir, slurmDir, logsDir)
	b.WriteString("#!/bin/bash\n")
	fmt.Fprintf(&b, "# Slurm job array of the rollerbed sweep in %s\n", dir)
	fmt.Fprintf(&b, "# (%d members; written by `rollerbed sweep submit`, which submits it).\n", len(man.Members))
	b.WriteString("# Task N runs member N + OFFSET (members/NNNN), OFFSET being the script's\n# argument (0 without), with `rollerbed run`, resuming it from its\n# checkpoint when it has one.\n")
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
	if len(s.Setup) > 0 {
		// Before set -u: module scripts often read unset variables.
		b.WriteString("\n# Set-up ([slurm] setup)\n")
		for _, l := range s.Setup {
			b.WriteString(l + "\n")
		}
	}
	fmt.Fprintf(&b, scriptNames.Replace(`
set -u
rollerbed=%s
sweep=%s
export @SWEEPENV@="$sweep"
offset=${1:-0}
task="${SLURM_ARRAY_JOB_ID:-${SLURM_JOB_ID:-0}}_$SLURM_ARRAY_TASK_ID"
member=$(printf '%%04d' "$((SLURM_ARRAY_TASK_ID + offset))")
dir="$sweep/members/$member"
run="$dir/run"
if [ ! -f "$dir/@CASE@" ]; then
	echo "rollerbed sweep: task $task: no member $member in $sweep" >&2
	exit 2
fi
rm -f "$dir/@EXIT@"
finish() {
	printf '%%s %%s %%s\n' "$1" "$task" "$(date -u +%%Y-%%m-%%dT%%H:%%M:%%SZ)" > "$dir/@EXIT@"
	exit "$1"
}
if [ -f "$run/@SUMMARY@" ] && grep -q '"interrupted": false' "$run/@SUMMARY@" && ! grep -q '"error":' "$run/@SUMMARY@"; then
	echo "rollerbed sweep: member $member is done already"
	finish 0
fi
if [ ! -f "$rollerbed" ] || [ ! -x "$rollerbed" ]; then
	echo "rollerbed sweep: task $task (member $member): the rollerbed binary $rollerbed is missing or not executable on $(hostname); put it where the compute nodes see it and resubmit with: rollerbed sweep submit $sweep --binary PATH" >&2
	finish 127
fi
echo "rollerbed sweep: member $member (task $task) on $(hostname) from $(date -u +%%Y-%%m-%%dT%%H:%%M:%%SZ)"
if ls "$run"/@CHECKPOINT@ >/dev/null 2>&1; then
	set -- run --resume "$run" --quiet --no-figures
elif [ -d "$run" ] && [ -n "$(ls -A "$run")" ]; then
	set -- run "$dir/@CASE@" --out "$run" --force --quiet --no-figures
else
	set -- run "$dir/@CASE@" --out "$run" --quiet --no-figures
fi
# The run goes in the background so that a signal to this script (Slurm's
# SIGTERM at the time limit) reaches it and the exit code is still kept.
# With @SWEEPENV@ set, an interrupted run says to resubmit the sweep.
child=
trap 'signalled=1; [ -z "$child" ] || kill -TERM "$child" 2>/dev/null' TERM INT
"$rollerbed" "$@" &
child=$!
while :; do
	signalled=0
	wait "$child"
	code=$?
	[ "$signalled" = 1 ] || break
done
case $code in
0) ;;
@INTERRUPTED@)
	echo "rollerbed sweep: task $task (member $member) was interrupted (the time limit, or a signal); its checkpoint is kept. Resubmit the unfinished members, this one resuming, with: rollerbed sweep submit $sweep" >&2 ;;
*)
	echo "rollerbed sweep: task $task (member $member) failed with exit code $code (see above); every member: rollerbed sweep status $sweep" >&2 ;;
esac
finish "$code"
`), shellQuote(exe), shellQuote(dir))
	return b.String()
}

// QueueTask is a member's entry in the Slurm queue.
type QueueTask struct {
	JobID string // the array job id
	State State  // StateQueued or StateRunning (or StateFailed for a task Slurm reports as such)
	Slurm string // Slurm's state name, e.g. PENDING, RUNNING, COMPLETING
	Task  string // the array task, JOB_INDEX
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
	ours := map[string]int{} // job id → offset of its indices
	for _, j := range jobs {
		ours[j.JobID] = j.Offset
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
		off, ok := ours[f[0]]
		if len(f) != 3 || !ok {
			continue
		}
		idx, err := strconv.Atoi(f[1])
		if err != nil {
			continue
		}
		idx += off
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
		out[idx] = QueueTask{JobID: f[0], State: st, Slurm: f[2], Task: f[0] + "_" + f[1]}
	}
	return out, ""
}

// scriptNames puts the run folder's file names into the job script.
var scriptNames = strings.NewReplacer("@CASE@", runfolder.CaseFile, "@SUMMARY@", runfolder.SummaryFile,
	"@CHECKPOINT@", runfolder.CheckpointPrefix+"*"+runfolder.CheckpointSuffix, "@EXIT@", TaskExitFile,
	"@INTERRUPTED@", strconv.Itoa(runs.ExitInterrupted), "@SWEEPENV@", runs.SweepTaskEnv)

// oneLine joins the lines and runs of blanks of a tool's output into one
// line for a message.
func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// MemoryBytes returns the bytes of a Slurm memory size ("4G", "500M",
// "2048": megabytes without a unit; K, M, G and T are powers of 1024, as
// sbatch(1) reads them), and false when mem is not one.
func MemoryBytes(mem string) (int64, bool) {
	if !memoryRE.MatchString(mem) {
		return 0, false
	}
	unit := int64(1) << 20
	switch mem[len(mem)-1] {
	case 'K':
		unit = 1 << 10
	case 'M':
		unit = 1 << 20
	case 'G':
		unit = 1 << 30
	case 'T':
		unit = 1 << 40
	}
	n, err := strconv.ParseInt(strings.TrimRight(mem, "KMGT"), 10, 64)
	if err != nil || n > (1<<62)/unit {
		return 0, false
	}
	return n * unit, true
}

// memoryWarning returns a warning when a member is expected to need more
// memory (need, bytes) than the Slurm memory size asked; "" when it fits,
// or when either is unknown.
func memoryWarning(need int64, asked string) string {
	have, ok := MemoryBytes(asked)
	if !ok || need == 0 || need <= have {
		return ""
	}
	return fmt.Sprintf("a member is expected to need %s of memory (`rollerbed check` gives each run's estimate) but [slurm] memory = %q asks for %s: Slurm may stop it for want of memory; ask for more, e.g. memory = %q (or --mem)",
		memoryText(need), asked, memoryText(have), suggestMemory(need))
}

// memoryText writes bytes in MiB or GiB.
func memoryText(b int64) string {
	if b >= 1<<30 {
		return fmt.Sprintf("%.1f GiB", float64(b)/(1<<30))
	}
	return fmt.Sprintf("%.0f MiB", float64(b)/(1<<20))
}

// suggestMemory returns a Slurm memory size of the need plus a quarter of
// headroom, rounded up to whole units.
func suggestMemory(need int64) string {
	want := need + need/4
	if want >= 1<<30 {
		return strconv.FormatInt((want+(1<<30)-1)>>30, 10) + "G"
	}
	return strconv.FormatInt(((want+(1<<20)-1)>>20+99)/100*100, 10) + "M"
}
