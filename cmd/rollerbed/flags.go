package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
)

// commandFlags is the flag set of one command or sub-command together with
// the text of its help. Help goes to stdout (exit 0); a mistake on the
// command line goes to stderr, reason first (exit 2).
type commandFlags struct {
	*flag.FlagSet
	path   string // the command as typed after "rollerbed", e.g. "sweep plan"
	args   string // the arguments in the usage line
	about  string // what the command does, one or more lines
	stdout io.Writer
	stderr io.Writer
}

// newFlags makes the flag set of the command path ("run", "sweep plan").
// The flag package itself prints nothing: parse prints help and mistakes.
func newFlags(path, args, about string, stdout, stderr io.Writer) *commandFlags {
	fs := flag.NewFlagSet(path, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	return &commandFlags{FlagSet: fs, path: path, args: args, about: about, stdout: stdout, stderr: stderr}
}

// help writes the usage line, the description and, when the command has
// any, its options spelled with two dashes as the usage line spells them.
func (f *commandFlags) help(w io.Writer) {
	fmt.Fprintf(w, "Usage: rollerbed %s %s\n\n%s\n", f.path, f.args, f.about)
	first := true
	f.VisitAll(func(fl *flag.Flag) {
		if first {
			fmt.Fprintln(w, "\nOptions:")
			first = false
		}
		arg, usage := flag.UnquoteUsage(fl)
		line := "  --" + fl.Name
		if arg != "" {
			line += " " + arg
		}
		fmt.Fprintln(w, line)
		fmt.Fprintf(w, "        %s", strings.ReplaceAll(usage, "\n", "\n        "))
		if d := fl.DefValue; d != "" && d != "false" && d != "0" {
			fmt.Fprintf(w, " (default %s)", d)
		}
		fmt.Fprintln(w)
	})
}

// usageError says what is wrong with the command line, then how it is
// used, on stderr, and returns exitUsage.
func (f *commandFlags) usageError(format string, a ...any) int {
	fmt.Fprintf(f.stderr, "rollerbed %s: %s\n", f.path, fmt.Sprintf(format, a...))
	fmt.Fprintf(f.stderr, "Usage: rollerbed %s %s\nRun 'rollerbed help %s' for its options.\n", f.path, f.args, f.path)
	return exitUsage
}

// parse parses flags that may stand before, between or after the
// positional arguments and returns the positional ones. On a help request
// it prints the help to stdout and returns ok false with exitOK; on a
// mistake it says what is wrong and returns ok false with exitUsage.
func (f *commandFlags) parse(args []string) (pos []string, code int, ok bool) {
	for {
		err := f.Parse(args)
		if errors.Is(err, flag.ErrHelp) {
			f.help(f.stdout)
			return nil, exitOK, false
		}
		if err != nil {
			return nil, f.usageError("%v", err), false
		}
		args = f.Args()
		if len(args) == 0 {
			return pos, 0, true
		}
		if args[0] == "--" {
			return append(pos, args[1:]...), 0, true
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}

// wantArgs checks the number of positional arguments: exactly n, naming
// what is wanted (e.g. "one CASE file") in the message when it is not.
func (f *commandFlags) wantArgs(pos []string, n int, what string) (int, bool) {
	switch {
	case len(pos) < n:
		return f.usageError("missing %s", what), false
	case len(pos) > n:
		return f.usageError("takes %s, got %d arguments: %s", what, len(pos), strings.Join(pos, " ")), false
	}
	return 0, true
}
