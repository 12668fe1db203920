package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
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
	if code, _, e := runCmd(t, "help", "run"); code != exitOK || !strings.Contains(e, "--out") {
		t.Errorf("help run: code %d, stderr %q", code, e)
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
	var sum map[string]map[string]any
	b, err := os.ReadFile(filepath.Join(out, runfolder.SummaryFile))
	if err != nil || json.Unmarshal(b, &sum) != nil {
		t.Fatalf("summary.json: %v", err)
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
	time.Sleep(300 * time.Millisecond)
	cmd.Process.Signal(syscall.SIGTERM)
	err := cmd.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != exitFail {
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
	time.Sleep(500 * time.Millisecond)
	res.Process.Signal(syscall.SIGTERM)
	res.Wait()
	b, _ := os.ReadFile(filepath.Join(out, runfolder.LogFile))
	if !bytes.Contains(b, []byte("resumed from checkpoint-")) {
		t.Errorf("the log does not show the resume:\n%s", b)
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
