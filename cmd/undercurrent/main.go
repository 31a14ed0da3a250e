// Command undercurrent surveys, themes, trends and reports on collections of incident
// narratives: police incident and call-for-service narratives, use-of-force and complaint
// narratives, safety reports.
//
// Usage:
//
//	undercurrent <command> [options] [files]
//
// Run "undercurrent help" for the list of commands and "undercurrent help <command>" (or
// "undercurrent <command> -h") for one command's options and an example.
//
// Exit status: 0 success, 1 failure (bad input, I/O), 2 usage error, 130 interrupted.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"strings"
)

// version is the program version, written into every model file and report.
const version = "0.1.0"

// Exit codes, documented in every command's help.
const (
	exitOK          = 0
	exitFailure     = 1
	exitUsage       = 2
	exitInterrupted = 130
)

const exitStatusHelp = `Exit status:
  0    success
  1    failure (unreadable or bad input, I/O error)
  2    usage error (unknown command or option, missing argument)
  130  interrupted (Ctrl-C); no half-written file is left under its final name`

// env is what a command needs from its surroundings; tests pass buffers.
type env struct {
	stdin          io.Reader
	stdout, stderr io.Writer
	// quiet switches off progress output; it is also off when stderr is not a terminal.
	quiet bool
}

// command is one subcommand, after the go command's base.Command.
type command struct {
	name  string
	usage string // "survey [options] file..."
	short string
	long  string // description and example
	// setup registers the command's flags and returns the function that runs it.
	setup func(fs *flag.FlagSet) func(ctx context.Context, e *env, args []string) error
}

var commands []*command

func register(c *command) {
	commands = append(commands, c)
	sort.Slice(commands, func(i, j int) bool { return commands[i].name < commands[j].name })
}

func lookup(name string) *command {
	for _, c := range commands {
		if c.name == name {
			return c
		}
	}
	return nil
}

// usageError marks an error in how the command was called (exit status 2).
type usageError struct{ msg string }

func (u usageError) Error() string { return u.msg }

func usagef(format string, a ...any) error { return usageError{fmt.Sprintf(format, a...)} }

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	e := &env{stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr}
	os.Exit(run(ctx, e, os.Args[1:]))
}

// run parses args, runs the command and maps its error to an exit status.
func run(ctx context.Context, e *env, args []string) int {
	if len(args) == 0 {
		printTopUsage(e.stderr)
		return exitUsage
	}
	switch args[0] {
	case "-h", "-help", "--help", "help":
		if len(args) > 1 {
			c := lookup(args[1])
			if c == nil {
				fmt.Fprintf(e.stderr, "undercurrent help %s: unknown command\nRun 'undercurrent help' for usage.\n", args[1])
				return exitUsage
			}
			fs := newFlagSet(c, e)
			c.setup(fs)
			printCommandHelp(e.stdout, c, fs)
			return exitOK
		}
		printTopUsage(e.stdout)
		return exitOK
	case "-version", "--version", "version":
		fmt.Fprintf(e.stdout, "undercurrent %s\n", version)
		return exitOK
	}
	c := lookup(args[0])
	if c == nil {
		fmt.Fprintf(e.stderr, "undercurrent %s: unknown command\nRun 'undercurrent help' for usage.\n", args[0])
		return exitUsage
	}
	fs := newFlagSet(c, e)
	runFn := c.setup(fs)
	if err := fs.Parse(args[1:]); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			printCommandHelp(e.stdout, c, fs)
			return exitOK
		}
		fmt.Fprintf(e.stderr, "Run 'undercurrent help %s' for usage.\n", c.name)
		return exitUsage
	}
	for _, a := range fs.Args() {
		if len(a) > 1 && a[0] == '-' {
			return exitFor(e, c, usagef("%s after the files: options must come before the files", a))
		}
	}
	err := runFn(ctx, e, fs.Args())
	return exitFor(e, c, err)
}

func exitFor(e *env, c *command, err error) int {
	var ue usageError
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &ue):
		fmt.Fprintf(e.stderr, "undercurrent %s: %v\nRun 'undercurrent help %s' for usage.\n", c.name, err, c.name)
		return exitUsage
	case errors.Is(err, context.Canceled):
		fmt.Fprintf(e.stderr, "undercurrent %s: interrupted\n", c.name)
		return exitInterrupted
	default:
		fmt.Fprintf(e.stderr, "undercurrent %s: %v\n", c.name, err)
		return exitFailure
	}
}

func newFlagSet(c *command, e *env) *flag.FlagSet {
	fs := flag.NewFlagSet(c.name, flag.ContinueOnError)
	fs.SetOutput(e.stderr)
	fs.BoolVar(&e.quiet, "q", e.quiet, "quiet: no progress bars (they are off anyway when stderr is not a terminal)")
	fs.Usage = func() {
		fmt.Fprintf(e.stderr, "usage: undercurrent %s\n", c.usage)
	}
	return fs
}

func printTopUsage(w io.Writer) {
	fmt.Fprintf(w, `undercurrent %s — themes, trends and a community-review report from incident narratives

Usage:

	undercurrent <command> [options] [files]

Commands:
`, version)
	for _, c := range commands {
		fmt.Fprintf(w, "\t%-10s %s\n", c.name, c.short)
	}
	fmt.Fprintf(w, `
Run 'undercurrent help <command>' for a command's options and an example.
Run 'undercurrent --version' for the version.

%s
`, exitStatusHelp)
}

func printCommandHelp(w io.Writer, c *command, fs *flag.FlagSet) {
	fmt.Fprintf(w, "usage: undercurrent %s\n\n%s\n\n", c.usage, strings.TrimSpace(c.long))
	var b strings.Builder
	fs.SetOutput(&b)
	fs.PrintDefaults()
	if b.Len() > 0 {
		fmt.Fprintf(w, "Options:\n%s\n", b.String())
	}
	fmt.Fprintf(w, "%s\n", exitStatusHelp)
}
