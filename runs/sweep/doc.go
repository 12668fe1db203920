// Package sweep plans and drives parameter sweeps: families of rollerbed
// runs made from one base case by changing some of its keys, run on this
// machine a few at a time (Run) or on a Slurm cluster as a job array, one
// member per task, and collected into one table.
//
// # Sweep files
//
// A sweep file is TOML, read by the same strict reader as a case file
// (rollerbed/io/stricttoml, into the struct document in file.go): unknown
// keys and values of the wrong type are errors with their line, and all
// problems are reported at once (*Errors, one *Problem per line, each
// naming the key, the value and the fix). Axis keys are checked against
// the case file's schema (stricttoml.SchemaOf(casefile.Case)), and file
// names in member cases are resolved through casefile.FileKeys.
//
//	title = "canopy density sweep"   # optional, free text
//	base = "flume.toml"              # the base case, relative to this file
//	combine = "product"              # or "zip"; default "product"
//	replicates = 2                   # optional; or seeds = [3, 8, 21]
//
//	[[axis]]
//	key = "canopy.frontal_area"      # a dotted case key
//	log = { from = 0.625, to = 25.0, count = 7 }
//
//	[[axis]]
//	key = "forcing.bulk_velocity"
//	values = [0.05, 0.1]             # or linear = { from, to, count }
//
//	[slurm]                          # optional: for `rollerbed sweep submit`
//	time_limit = "01:00:00"          # per member; minutes, H:M:S or D-H:M:S
//	cpus_per_task = 4                # cores per member; default 1
//	memory = "4G"                    # per member
//	max_concurrent = 8               # the %N cap of --array; 0 = none
//	partition = "normal"             # default: the cluster's default
//	extra = ["--account=lab42"]      # more sbatch options, one per entry
//
// The base is always a separate case file, never inline: it stays a case
// file that `rollerbed check` and `rollerbed run` take on its own.
//
// Each [[axis]] names one key of the case schema and gives exactly one of
// values (a list; numbers, strings, booleans or arrays, of the key's type),
// linear (count values evenly spaced from from to to, ends included) or
// log (evenly spaced in the logarithm; both ends > 0). count = 1 gives
// from alone. Values between the ends of a range are rounded to 12
// significant digits. Keys inside arrays of tables take an index from 0:
// canopy.patch[1].end (the element must exist in the base). An integer
// key takes a range only when every value is whole.
//
// With combine = "product" the members are every combination of the axes'
// values, the first axis varying slowest; with "zip" member i takes value
// i of every axis, and the axes must have equal lengths. Replicates repeat
// every combination with initial.seed = base seed + 0, 1, ..., N-1
// (innermost, varying fastest); seeds = [...] gives the seeds instead.
// Two members that would be the same run are an error, as are more than
// MaxMembers.
//
// # Planning
//
// NewPlan reads the base case, makes each member at the TOML level (the
// base decoded into a map, the dotted keys set, the map encoded again with
// the TOML library, with a header comment listing the member's values; the
// base's own comments are not kept) and checks each member with
// casefile.Parse and runs.FromCase, exactly as `rollerbed check` would.
// Problems in members are reported at the line of the axis that set the
// key at fault, the same problem in several members once. Only when every
// member passes does Plan.Write create the sweep folder:
//
//	DIR/manifest.json             the plan: members, their values, the sweep and base texts
//	DIR/members/NNNN/case.toml    each member's complete case
//	DIR/members/NNNN/run/         its run folder, made when it runs
//	DIR/slurm/array.sh            the job array (sweep submit)
//	DIR/slurm/jobs.json           the submitted job ids
//	DIR/slurm/logs/JOB_TASK.out   the tasks' output and errors
//	DIR/sweep.csv                 the collected table (sweep collect)
//	DIR/figures/Y-vs-X.png        figures (sweep collect --plot)
//
// File names in a case (canopy.profile_file) are made absolute in the
// members: a name from the base against the base's folder, a name an axis
// gives against the sweep file's folder. When the members leave
// numerics.workers at 0 (all cores), the plan sets it to the [slurm]
// table's cpus_per_task (default 1), so a Slurm task uses the cores it was
// given and no more; `sweep run` chooses its own count without changing
// the text.
//
// # Running on this machine
//
// Run drives the members in this process with runs.Run, Jobs at a time,
// each in its own run folder. It is resumable: a member whose summary.json
// says it finished (run.interrupted false, no run.error) is skipped, a
// member with a checkpoint resumes from it, the rest start afresh; a
// failed member (a blow-up) is not rerun. Cancelling the context (Ctrl-C in
// `rollerbed sweep run`) stops every running member after its step with a
// checkpoint and starts no more. Unless the members fix numerics.workers,
// Jobs defaults to the cores (at most one per member left) and each run
// gets max(1, cores/Jobs) solver workers: the runs never oversubscribe the
// cores. The worker count only reorders independent work in the solver, so
// it changes no number, and the case text stays as planned, so a member
// may resume under another Jobs.
//
// # Slurm
//
// Submit writes DIR/slurm/array.sh with #SBATCH --array (the unfinished
// member indices, "0-13%8" or "3,5,7"), the time limit, cores, memory,
// partition, extra options and log paths, the [slurm] setup lines (module
// loads, environment), and a body that maps SLURM_ARRAY_TASK_ID to
// members/NNNN and runs the rollerbed binary ([slurm] binary, or the one
// that submits, checked to exist and be executable, with a warning when
// it lies in a temporary folder or the Go build cache): `rollerbed run
// --resume` when the run folder holds a checkpoint, `rollerbed run CASE
// --out` otherwise, nothing for a member already done. It submits with
// `sbatch --parsable` and records each job, with the settings it asked
// for, in DIR/slurm/jobs.json. Members whose index reaches the cluster's
// MaxArraySize (read from `scontrol show config`) go in further arrays of
// the same script, the offset of their indices given as its argument.
// Members done, failed or still in the queue are left out, so submitting
// again after a time limit or a node failure sends only what is left
// (Slurm's SIGTERM at the time limit makes rollerbed checkpoint and exit
// with runs.ExitInterrupted). The settings are the plan's [slurm] table at
// first and those of the last submission after; SubmitOptions.Slurm
// replaces them without a new plan (CurrentSlurm returns them to start
// from). Each task records its exit code in members/NNNN/TaskExitFile.
// Status combines the run folders, these records (a task that failed
// outside its run, e.g. for a missing binary, is failed with the reason;
// an interrupted one waits for a resubmission) and `squeue --me` (one line
// per array task, no accounting database), and without Slurm reports from
// the folders alone, saying so.
//
// # Collecting
//
// Collect gathers every done member's summary.json into one table: the
// member index, the varied values, then every numeric summary value under
// its flattened dotted name (run.steps, flow.penetration_depth_m, and
// later scalars.NAME.*), in the order of summary.json. Plot draws a
// metric against a varied parameter for the done members, with the
// published scaling where one applies: the penetration depth against
// min(h, 0.23/(C_D a)) (Nepf et al. 2007) for block canopies with a fixed
// drag coefficient, and the roller spacing against 8.1 Ls (Raupach,
// Finnigan & Brunet 1996) with each member's shear length.
package sweep
