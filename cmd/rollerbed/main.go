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
//	rollerbed bench                  time the solver against the transforms it
//	                                 cannot avoid
//	rollerbed version                print the version
//
// Run `rollerbed help COMMAND` for the options of each command. The command
// only parses flags, calls the packages (io/casefile, runs, runs/sweep,
// validation, io/report) and prints; a failure prints one line starting
// "rollerbed: " and exits with 1 (the work failed) or 2 (the command line
// or the case file is wrong).
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"
)

// exit codes
const (
	exitOK    = 0
	exitFail  = 1 // the work failed (a blow-up, a failed check)
	exitUsage = 2 // the command line or the case file is wrong
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
		{"run", "[CASE] --out DIR [--force] [--quiet]", "run a case; without CASE the built-in demo", cmdRun},
		{"verify", "[--json] [--keep DIR] [--full] [NAME...]", "run the verification cases against exact and published solutions", cmdVerify},
		{"sweep", "plan|run|submit|status|collect|example", "parameter sweeps: plan, run here or as a Slurm job array, collect", cmdSweep},
		{"report", reportArgs, reportSummary, cmdReport},
		{"compare", compareArgs, compareSummary, cmdCompare},
		{"bench", "[--json] [--steps N] [--grid NXxNZ,...]", "time the solver against the transforms it cannot avoid", cmdBench},
		{"version", "", "print the version", cmdVersion},
	}
}

func main() {
	os.Exit(dispatch(os.Args[1:], os.Stdout, os.Stderr))
}

func dispatch(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stderr)
		return exitUsage
	}
	name := args[0]
	if name == "help" || name == "-h" || name == "--help" || name == "-help" {
		if len(args) > 1 {
			return dispatch([]string{args[1], "--help"}, stdout, stderr)
		}
		usage(stdout)
		return exitOK
	}
	for _, c := range commands {
		if c.name == name {
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "rollerbed: unknown command %q\n\n", name)
	usage(stderr)
	return exitUsage
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "rollerbed: 2-D large-eddy simulation of flow over porous canopies and the scalars they take up")
	fmt.Fprintln(w, "\nUsage:")
	for _, c := range commands {
		fmt.Fprintf(w, "  rollerbed %-8s %-42s %s\n", c.name, c.args, c.summary)
	}
	fmt.Fprintln(w, "\nRun 'rollerbed help COMMAND' for a command's options.")
}

// newFlags makes a flag set that prints its usage to stderr.
func newFlags(name, args, summary string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintf(stderr, "Usage: rollerbed %s %s\n\n%s\n\nOptions:\n", name, args, summary)
		fs.PrintDefaults()
	}
	return fs
}

// parse parses flags that may stand before, between or after the positional
// arguments, and returns the positional ones.
func parse(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, err
		}
		args = fs.Args()
		if len(args) == 0 {
			return pos, nil
		}
		if args[0] == "--" {
			return append(pos, args[1:]...), nil
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}

// parseOrExit handles the help request and usage errors uniformly.
func parseOrExit(fs *flag.FlagSet, args []string) ([]string, int, bool) {
	pos, err := parse(fs, args)
	if errors.Is(err, flag.ErrHelp) {
		return nil, exitOK, false
	}
	if err != nil {
		return nil, exitUsage, false
	}
	return pos, 0, true
}

func fail(stderr io.Writer, code int, format string, a ...any) int {
	msg := fmt.Sprintf(format, a...)
	fmt.Fprintln(stderr, "rollerbed: "+strings.TrimRight(msg, "\n"))
	return code
}
