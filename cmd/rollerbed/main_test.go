package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"

	"rollerbed/io/runfolder"
	"strings"
	"syscall"
	"testing"
	"time"
)

func runCmd(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	code = dispatch(args, &o, &e)
	return code, o.String(), e.String()
}

func TestUsageAndUnknownCommand(t *testing.T) {
	if code, _, e := runCmd(t); code != exitUsage || !strings.Contains(e, "Usage:") {
		t.Errorf("no arguments: code %d, stderr %q", code, e)
	}
	if code, _, e := runCmd(t, "frobnicate"); code != exitUsage || !strings.Contains(e, `unknown command "frobnicate"`) {
		t.Errorf("unknown command: code %d, stderr %q", code, e)
	}
	if code, o, _ := runCmd(t, "help"); code != exitOK || !strings.Contains(o, "verify") {
		t.Errorf("help: code %d, stdout %q", code, o)
	}
	if code, o, _ := runCmd(t, "help", "run"); code != exitOK || !strings.Contains(o, "--out") {
		t.Errorf("help run: code %d, stdout %q", code, o)
	}
}

// TestHelp checks that every way of asking for help prints to stdout and
// exits 0, with options spelled as the usage lines spell them.
func TestHelp(t *testing.T) {
	var topics [][]string
	for _, c := range commands {
		topics = append(topics, []string{"help", c.name}, []string{c.name, "--help"}, []string{c.name, "-h"})
	}
	for _, c := range sweepCommands {
		topics = append(topics, []string{"help", "sweep", c.name}, []string{"sweep", c.name, "--help"}, []string{"sweep", "help", c.name})
	}
	topics = append(topics, []string{"help"}, []string{"help", "help"}, []string{"--help"}, []string{"sweep", "--help"}, []string{"sweep", "help"})
	for _, args := range topics {
		code, o, e := runCmd(t, args...)
		if code != exitOK || e != "" || !strings.Contains(o, "Usage") {
			t.Errorf("%q: code %d, stdout %q, stderr %q", args, code, o, e)
		}
		if regexp.MustCompile(`\n  -[a-z]`).MatchString(o) {
			t.Errorf("%q: an option with one dash in\n%s", args, o)
		}
		for _, line := range strings.Split(o, "\n") {
			if strings.HasPrefix(line, "  --") && len(strings.Fields(line)) > 2 {
				t.Errorf("%q: option line %q names its argument with spaces (a backquote in the usage text?)", args, line)
			}
		}
		if strings.HasSuffix(strings.TrimSpace(o), "Options:") {
			t.Errorf("%q: empty Options section in\n%s", args, o)
		}
	}
	if _, o, _ := runCmd(t, "help", "check"); !strings.Contains(o, "  --out DIR") {
		t.Errorf("help check does not show --out:\n%s", o)
	}
	if _, o, _ := runCmd(t, "help"); !strings.Contains(o, "--resume DIR") || !strings.Contains(o, "75") {
		t.Errorf("usage lacks run --resume or the exit codes:\n%s", o)
	}
	for _, args := range [][]string{{"--version"}, {"version"}} {
		if code, o, _ := runCmd(t, args...); code != exitOK || !strings.HasPrefix(o, "rollerbed ") {
			t.Errorf("%q: code %d, stdout %q", args, code, o)
		}
	}
	if code, _, e := runCmd(t, "help", "frobnicate"); code != exitUsage || !strings.Contains(e, "frobnicate") {
		t.Errorf("help on an unknown command: code %d, stderr %q", code, e)
	}
}

// TestMissingArgumentsSayWhatFirst checks that a wrong command line names
// what is missing or extra on the first line of stderr, before the usage.
func TestMissingArgumentsSayWhatFirst(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"run", runfolder.CaseFile}, "missing --out DIR"},
		{[]string{"run", "--out", "a", "--resume", "b"}, "do not go together"},
		{[]string{"run", runfolder.CaseFile, "--resume", "b"}, "--resume takes no CASE"},
		{[]string{"run", "a.toml", "b.toml", "--out", "x"}, "at most one CASE"},
		{[]string{"init"}, "missing one FILE"},
		{[]string{"check"}, "missing one CASE file"},
		{[]string{"check", "a.toml", "b.toml"}, "got 2 arguments"},
		{[]string{"report", "r1", "r2"}, "takes one run folder"},
		{[]string{"report"}, "missing one run folder"},
		{[]string{"compare", "r1"}, "needs two or more run folders"},
		{[]string{"sweep"}, "missing a sub-command"},
		{[]string{"sweep", "plan", "s.toml"}, "missing --out DIR"},
		{[]string{"sweep", "run"}, "missing one sweep folder"},
		{[]string{"sweep", "status", "a", "b"}, "got 2 arguments"},
		{[]string{"run", "--frobnicate"}, "flag provided but not defined"},
		{[]string{}, "missing a command"},
		{[]string{"version", "extra"}, "takes no arguments"},
	} {
		code, o, e := runCmd(t, c.args...)
		first, _, _ := strings.Cut(e, "\n")
		if code != exitUsage || !strings.Contains(first, c.want) || o != "" {
			t.Errorf("%q: code %d, first line of stderr %q (want %q), stdout %q", c.args, code, first, c.want, o)
		}
	}
}

func TestInitCheckRun(t *testing.T) {
	dir := t.TempDir()
	cs := filepath.Join(dir, runfolder.CaseFile)
	if code, _, e := runCmd(t, "init", cs); code != exitOK {
		t.Fatalf("init: %d %s", code, e)
	}
	if code, _, e := runCmd(t, "init", cs); code != exitUsage || !strings.Contains(e, "already exists") {
		t.Errorf("init over an existing file: %d %q", code, e)
	}
	code, o, e := runCmd(t, "check", cs)
	if code != exitOK {
		t.Fatalf("check: %d %s", code, e)
	}
	for _, want := range []string{"Reynolds number", "time step", "estimated run time", "memory", "output size", "Δz"} {
		if !strings.Contains(o, want) {
			t.Errorf("check output lacks %q:\n%s", want, o)
		}
	}
	// A broken case names the key and exits 2.
	bad := filepath.Join(dir, "bad.toml")
	text, _ := os.ReadFile(cs)
	os.WriteFile(bad, bytes.Replace(text, []byte("nz = "), []byte("nz = 3 #"), 1), 0o644)
	if code, _, e := runCmd(t, "check", bad); code != exitUsage || !strings.Contains(e, "domain.nz") {
		t.Errorf("bad case: code %d, stderr %q", code, e)
	}
	// A small case runs and writes its folder; a second run needs --force.
	small := filepath.Join(dir, "small.toml")
	os.WriteFile(small, []byte(smallCase), 0o644)
	out := filepath.Join(dir, "small")
	if code, _, e := runCmd(t, "run", small, "--out", out, "--quiet"); code != exitOK {
		t.Fatalf("small run: %d %s", code, e)
	}
	// The run ends with its figures.
	if _, err := os.Stat(filepath.Join(out, "figures", "vorticity.png")); err != nil {
		t.Errorf("the run wrote no figures: %v", err)
	}
	var sum map[string]map[string]any
	b, err := os.ReadFile(filepath.Join(out, runfolder.SummaryFile))
	if err != nil || json.Unmarshal(b, &sum) != nil {
		t.Fatalf("summary.json: %v", err)
	}
	// A resume of a folder whose case.toml is gone takes the case from the
	// checkpoint; a folder that is no run folder is named as such.
	os.Remove(filepath.Join(out, "case.toml"))
	if code, o, e := runCmd(t, "run", "--resume", out, "--quiet"); code != exitOK || !strings.Contains(o, "already finished") || !strings.Contains(e, "written back from the checkpoint") {
		t.Errorf("resume without case.toml: code %d, stdout %q, stderr %q", code, o, e)
	}
	if b, err := os.ReadFile(filepath.Join(out, "case.toml")); err != nil || !strings.Contains(string(b), "test: small canopy") {
		t.Errorf("case.toml not written back: %v", err)
	}
	if code, _, e := runCmd(t, "run", "--resume", dir, "--quiet"); code != exitUsage || !strings.Contains(e, "not a run folder") || strings.Contains(e, "rollerbed init") {
		t.Errorf("resume of a folder that is no run: code %d, stderr %q", code, e)
	}
	// Resuming the finished run says so and changes nothing.
	if code, o, e := runCmd(t, "run", "--resume", out, "--quiet"); code != exitOK || !strings.Contains(o, "already finished") || strings.Contains(o, "steps/s") {
		t.Errorf("resume of a finished run: code %d, stdout %q, stderr %q", code, o, e)
	}
	if b2, _ := os.ReadFile(filepath.Join(out, "summary.json")); !bytes.Equal(b, b2) {
		t.Error("resuming a finished run rewrote summary.json")
	}
	if code, _, e := runCmd(t, "run", small, "--out", out, "--quiet"); code != exitUsage || !strings.Contains(e, "--force") {
		t.Errorf("second run: code %d, stderr %q", code, e)
	}
	if code, _, _ := runCmd(t, "run", "--quiet"); code != exitUsage {
		t.Errorf("run without --out: code %d", code)
	}
}

// smallCase is a small canopy case that runs in a second or two.
var smallCase = `
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
[forcing]
bulk_velocity = 0.05
[initial]
profile = "drag-balanced"
perturbation = 0.002
perturbation_at = 0.08
[time]
duration = DURATION
[output]
checkpoint_every = 0.5
[numerics]
workers = 1
`

func init() {
	smallCase = strings.Replace(smallCase, "DURATION", "3.0", 1)
}

// TestSignalLeavesResumableFolder starts the built command, stops it with
// SIGTERM part-way and resumes it to the end.
func TestSignalLeavesResumableFolder(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "rollerbed")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("build: %v\n%s", err, out)
	}
	long := strings.Replace(smallCase, "duration = 3.0", "duration = 400.0", 1)
	long = strings.Replace(long, "checkpoint_every = 0.5", "checkpoint_every = 100.0", 1)
	cs := filepath.Join(dir, "long.toml")
	os.WriteFile(cs, []byte(long), 0o644)
	out := filepath.Join(dir, "run")
	cmd := exec.Command(bin, "run", cs, "--out", out)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	// Wait until the run is stepping (its log says it started), then stop it.
	deadline := time.Now().Add(60 * time.Second)
	for {
		b, _ := os.ReadFile(filepath.Join(out, runfolder.LogFile))
		if bytes.Contains(b, []byte("started")) {
			break
		}
		if time.Now().After(deadline) {
			cmd.Process.Kill()
			t.Fatal("the run did not start")
		}
		time.Sleep(50 * time.Millisecond)
	}
	// A second writer, resuming or forcing, is refused at once, naming the
	// first; the folder stays as the first one writes it.
	holder := fmt.Sprintf("rollerbed process %d ", cmd.Process.Pid)
	for _, args := range [][]string{{"run", "--resume", out, "--quiet"}, {"run", cs, "--out", out, "--force", "--quiet"}} {
		var e2 bytes.Buffer
		second := exec.Command(bin, args...)
		second.Stderr = &e2
		err := second.Run()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != exitUsage || !strings.Contains(e2.String(), "is in use by "+holder) {
			t.Errorf("second writer %q: %v\n%s", args, err, e2.String())
		}
	}
	if _, err := os.Stat(filepath.Join(out, runfolder.FieldsFile)); err != nil {
		t.Errorf("the second writer removed the fields file: %v", err)
	}
	time.Sleep(300 * time.Millisecond)
	cmd.Process.Signal(syscall.SIGTERM)
	err := cmd.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != exitInterrupted {
		t.Fatalf("exit after SIGTERM: %v\n%s", err, stderr.String())
	}
	if !strings.Contains(stderr.String(), "rollerbed run --resume") {
		t.Errorf("no resume hint in:\n%s", stderr.String())
	}
	ckpts, _ := filepath.Glob(filepath.Join(out, "checkpoint-*.h5"))
	if len(ckpts) == 0 {
		t.Fatal("no checkpoint after SIGTERM")
	}
	// Resume, shortened: the case in the folder is what resumes, so stop
	// it again at once and just check that it continues from the checkpoint.
	res := exec.Command(bin, "run", "--resume", out, "--quiet")
	res.Stderr = &stderr
	if err := res.Start(); err != nil {
		t.Fatal(err)
	}
	// Wait until it logs the resume (on a busy machine that may take more
	// than a moment), then kill it.
	var b []byte
	for deadline := time.Now().Add(60 * time.Second); time.Now().Before(deadline); time.Sleep(20 * time.Millisecond) {
		if b, _ = os.ReadFile(filepath.Join(out, runfolder.LogFile)); bytes.Contains(b, []byte("resumed from checkpoint-")) {
			break
		}
	}
	// Killed outright, it releases nothing; the next resume takes over.
	res.Process.Signal(syscall.SIGKILL)
	res.Wait()
	if !bytes.Contains(b, []byte("resumed from checkpoint-")) {
		t.Errorf("the log does not show the resume:\n%s", b)
	}
	again := exec.Command(bin, "run", "--resume", out, "--quiet")
	var e3 bytes.Buffer
	again.Stderr = &e3
	if err := again.Start(); err != nil {
		t.Fatal(err)
	}
	time.Sleep(500 * time.Millisecond)
	again.Process.Signal(syscall.SIGTERM)
	if err := again.Wait(); strings.Contains(e3.String(), "in use") {
		t.Errorf("the lock of a killed run was not taken over: %v\n%s", err, e3.String())
	}
}

func TestVerifyJSON(t *testing.T) {
	code, o, e := runCmd(t, "verify", "--json", "projection")
	if code != exitOK {
		t.Fatalf("verify: %d %s", code, e)
	}
	var checks []map[string]any
	if err := json.Unmarshal([]byte(o), &checks); err != nil || len(checks) == 0 {
		t.Fatalf("verify --json output %q: %v", o, err)
	}
	for _, k := range []string{"name", "quantity", "measured", "expected", "tolerance", "pass", "source"} {
		if _, ok := checks[0][k]; !ok {
			t.Errorf("check lacks key %q: %v", k, checks[0])
		}
	}
	if code, _, e := runCmd(t, "verify", "no-such-case"); code != exitUsage || !strings.Contains(e, "no-such-case") {
		t.Errorf("unknown case: code %d, stderr %q", code, e)
	}
}

// TestCheckRefusesWhatCannotFit: cases valid key by key but impossible for
// the machine or absurd get one line naming the key and the fix, exit 2,
// and no table; nothing large is allocated on the way (the grid case would
// need tens of GiB).
func TestCheckRefusesWhatCannotFit(t *testing.T) {
	dir := t.TempDir()
	base := strings.Replace(smallCase, "workers = 1", "workers = 1\n", 1)
	for _, c := range []struct {
		name, from, to string
		want           []string
	}{
		{"huge grid", "nx = 32\nnz = 24", "nx = 16384\nnz = 8192", []string{"domain.nx = 16384", "memory", "fewer cells"}},
		{"rough bed", "nx = 32\nnz = 24", "nx = 32\nnz = 4096\n[bed]\ncondition = \"rough\"\nroughness = 0.001", []string{"bed.roughness = 0.001", "first cell centre", "domain.nz ="}},
		{"tiny length", "length = 0.4", "length = 1e-300", []string{"domain.length = 1e-300", "metres"}},
		{"endless", "duration = 3.0", "duration = 1e300", []string{"time.duration = 1e+300", "shorten time.duration"}},
	} {
		cs := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".toml")
		text := strings.Replace(base, c.from, c.to, 1)
		if text == base {
			t.Fatalf("%s: %q not in the case", c.name, c.from)
		}
		os.WriteFile(cs, []byte(text), 0o644)
		code, o, e := runCmd(t, "check", cs)
		if code != exitUsage || o != "" {
			t.Errorf("%s: code %d, stdout %q", c.name, code, o)
		}
		for _, w := range c.want {
			if !strings.Contains(e, w) {
				t.Errorf("%s: stderr lacks %q:\n%s", c.name, w, e)
			}
		}
		if strings.Contains(e, "solver:") || strings.Contains(e, "panic") {
			t.Errorf("%s: a message from inside the solver:\n%s", c.name, e)
		}
	}
}

// TestCheckFixedStep: a fixed step is checked against the stability limit
// √3 of the three-stage Runge–Kutta scheme (common practice, no source),
// and the table gives its own Courant number, not time.cfl.
func TestCheckFixedStep(t *testing.T) {
	dir := t.TempDir()
	cs := filepath.Join(dir, "fixed.toml")
	os.WriteFile(cs, []byte(strings.Replace(smallCase, "duration = 3.0", "duration = 3.0\nfixed_step = 0.5", 1)), 0o644)
	code, o, e := runCmd(t, "check", cs)
	if code != exitOK || !strings.Contains(o, "fixed; Courant number about") || !strings.Contains(e, "time.fixed_step = 0.5 s gives a Courant number") {
		t.Errorf("code %d, stdout %q, stderr %q", code, o, e)
	}
	os.WriteFile(cs, []byte(strings.Replace(smallCase, "duration = 3.0", "duration = 3.0\nfixed_step = 0.001", 1)), 0o644)
	if code, _, e := runCmd(t, "check", cs); code != exitOK || strings.Contains(e, "fixed_step") {
		t.Errorf("a small fixed step: code %d, stderr %q", code, e)
	}
}

// TestInterruptedHint: a run interrupted as a sweep's task says to
// resubmit the sweep; a lone run says to resume it.
func TestInterruptedHint(t *testing.T) {
	if h := interruptedHint(2, "S/members/0001/run", "S"); !strings.Contains(h, "rollerbed sweep submit S") || strings.Contains(h, "--resume") {
		t.Errorf("in a sweep: %q", h)
	}
	if h := interruptedHint(2, "R", ""); !strings.Contains(h, "rollerbed run --resume R") {
		t.Errorf("alone: %q", h)
	}
}
