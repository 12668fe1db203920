// Command rollerbed runs two-dimensional large-eddy simulations of flow over
// and through a porous canopy layer and the scalars it takes up.
//
// Usage:
//
//	rollerbed init FILE              write a commented case file to start from
//	rollerbed check CASE             validate a case and print derived numbers
//	rollerbed run [CASE] --out DIR   run a case (no CASE: the built-in demo);
//	                                 --resume DIR continues an interrupted run
//	rollerbed verify [NAME...]       run the verification cases against exact
//	                                 and published solutions
//	rollerbed sweep SUBCOMMAND       parameter sweeps: plan, run here, submit
//	                                 as a Slurm job array, status, collect,
//	                                 example
//	rollerbed report RUNDIR          print a run's summary and rebuild its figures
//	rollerbed compare RUNDIR...      compare runs side by side, with overlay figures
//	rollerbed watch RUNDIR           serve a live page of a run in a browser
//	rollerbed bench                  time the solver against the transforms it
//	                                 cannot avoid
//	rollerbed version                print the version, the build's revision, the
//	                                 Go, HDF5 and FFTW versions and the host
//
// Run `rollerbed help COMMAND` for the options of each command. The command
// only parses flags, calls the packages (io/casefile, runs, runs/sweep,
// validation, io/runfolder, io/report) and prints; a failure prints one
// line starting "rollerbed: " and exits with 1 (the work failed), 2 (the
// command line or the case file is wrong) or 75 (interrupted after a
// checkpoint: resume it). Help goes to standard output, mistakes to standard error.
package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"rollerbed/runs"
)

// Exit codes, documented in the README and in `rollerbed help run`.
const (
	exitOK    = 0
	exitFail  = 1 // the work failed (a blow-up, a failed check)
	exitUsage = 2 // the command line or the case file is wrong
	// exitInterrupted: a run or sweep stopped on a signal after writing a
	// checkpoint; resuming it continues where it stopped.
	exitInterrupted = runs.ExitInterrupted
)

type command struct {
	name, args, summary string
	run                 func(args []string, stdout, stderr io.Writer) int
}

var commands []command

func init() {
	commands = []command{
		{"init", "FILE", "write a commented case file to start from", cmdInit},
		{"check", "CASE", "validate a case file and print the derived numbers", cmdCheck},
		{"run", runArgs, "run a case (without CASE the built-in demo), or resume one", cmdRun},
		{"verify", "[--json] [--keep DIR] [--full] [NAME...]", "run the verification cases against exact and published solutions", cmdVerify},
		{"sweep", "plan|run|submit|status|collect|example", "parameter sweeps: plan, run here or as a Slurm job array, collect", cmdSweep},
		{"report", reportArgs, reportSummary, cmdReport},
		{"compare", compareArgs, compareSummary, cmdCompare},
		{"watch", watchArgs, "serve the live page of a run folder, read from its files", cmdWatch},
		{"bench", "[--json] [--steps N] [--grid NXxNZ,...]", "time the solver against the transforms it cannot avoid", cmdBench},
		{"version", "[--json]", "print the version with the build's revision, libraries and host", cmdVersion},
	}
}

func main() {
	os.Exit(dispatch(os.Args[1:], os.Stdout, os.Stderr))
}

func dispatch(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprintln(stderr, "rollerbed: missing a command")
		usage(stderr)
		return exitUsage
	}
	switch name := args[0]; name {
	case "help", "-h", "--help", "-help":
		return help(args[1:], stdout, stderr)
	case "--version", "-version":
		return cmdVersion(args[1:], stdout, stderr)
	}
	if c, ok := findCommand(args[0]); ok {
		return c.run(args[1:], stdout, stderr)
	}
	fmt.Fprintf(stderr, "rollerbed: unknown command %q\n\n", args[0])
	usage(stderr)
	return exitUsage
}

func findCommand(name string) (command, bool) {
	for _, c := range commands {
		if c.name == name {
			return c, true
		}
	}
	return command{}, false
}

// help prints the usage (no topic, or "help") or a command's help, with
// its sub-command's where one is named, on stdout.
func help(topic []string, stdout, stderr io.Writer) int {
	if len(topic) == 0 || topic[0] == "help" {
		usage(stdout)
		return exitOK
	}
	c, ok := findCommand(topic[0])
	if !ok {
		fmt.Fprintf(stderr, "rollerbed help: unknown command %q\n\n", topic[0])
		usage(stderr)
		return exitUsage
	}
	return c.run(append(topic[1:], "--help"), stdout, stderr)
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "rollerbed: 2-D large-eddy simulation of flow over porous canopies and the scalars they take up")
	fmt.Fprintln(w, "\nUsage:")
	for _, c := range commands {
		fmt.Fprintf(w, "  rollerbed %-8s %-42s %s\n", c.name, c.args, c.summary)
	}
	fmt.Fprintln(w, "\nRun 'rollerbed help COMMAND' for a command's options. Exit codes: 0 done, 1 failed,")
	fmt.Fprintln(w, "2 a mistake in the command line or case file, 75 interrupted (resume it).")
}

func fail(stderr io.Writer, code int, format string, a ...any) int {
	msg := fmt.Sprintf(format, a...)
	fmt.Fprintln(stderr, "rollerbed: "+strings.TrimRight(msg, "\n"))
	return code
}
