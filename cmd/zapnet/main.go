// Command zapnet estimates what an electrostatic discharge does to a
// protection network: it reads a deck, injects standard discharge waveforms,
// solves the nonlinear transient and reports peaks, clamp energy, the residual
// pulse at the protected pin and a verdict.
//
// main is thin on purpose: every subcommand is a function that tests call
// directly, and exit codes are decided in one place, exitCode.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"zapnet/cmd/internal/report"
	"zapnet/netlist"

	"github.com/spf13/pflag"
)

// Version is the tool's version, shown by `zapnet version` and in every
// machine-readable output.
var Version = "0.1.0-dev"

// Exit statuses (OUTPUT.md).
const (
	exitPass     = 0 // every run passed, or the command completed
	exitFail     = 1 // completed, at least one verdict FAIL
	exitUnusable = 2 // unusable input or failed solve
)

// errVerdictFail is returned by commands that completed and printed their
// report but found at least one FAIL.
var errVerdictFail = errors.New("at least one run failed its verdict")

// command is one subcommand: a name, a one-line summary for the overview and
// the function that runs it.
type command struct {
	name    string
	summary string
	run     func(args []string, stdout, stderr io.Writer) error
}

func commands() []command {
	return []command{
		{"check", "read a deck, report its problems or show the circuit and the study plan", runCheck},
		{"run", "run the study a deck describes and report peaks, energies and verdicts", runRun},
		{"waveform", "show a standard waveform's calibration checks, or export it as CSV", runWaveform},
		{"margin", "find the highest level that still passes, per variant and polarity", runMargin},
		{"sensitivity", "rank parameters by how much ±10 % moves the worst margin", runSensitivity},
		{"spread", "draw circuits from the deck's tolerances and report the distribution", runSpread},
		{"ac", "the signal's side: transfer, impedance, peaking, loading, S-parameters, edge rise", runAC},
		{"merge", "join the JSON results of sharded sweeps into one", runMerge},
		{"fit", "turn TLP curves, datasheet points, impedance, Touchstone and IBIS files into part lines", runFit},
		{"version", "print the version", runVersion},
	}
}

func main() {
	os.Exit(Main(os.Args[1:], os.Stdout, os.Stderr))
}

// Main runs the tool with args (without the program name) and returns the
// exit status.
func Main(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		if len(args) > 1 {
			return Main([]string{args[1], "--help"}, stdout, stderr)
		}
		usage(stdout)
		return exitPass
	}
	if args[0] == "--version" {
		args = []string{"version"}
	}
	for _, c := range commands() {
		if c.name == args[0] {
			out := &report.CheckedWriter{W: stdout}
			err := c.run(args[1:], out, stderr)
			if out.Err != nil && (err == nil || errors.Is(err, errVerdictFail)) {
				// Results that did not reach their reader are lost
				// results, whatever the verdict.
				err = fmt.Errorf("cannot write to standard output: %w", out.Err)
			}
			return exitCode(err, stderr)
		}
	}
	fmt.Fprintf(stderr, "zapnet: unknown command %q\n\n", args[0])
	usage(stderr)
	return exitUnusable
}

// exitCode is the one place where an error becomes an exit status.
func exitCode(err error, stderr io.Writer) int {
	switch {
	case err == nil, errors.Is(err, pflag.ErrHelp):
		return exitPass
	case errors.Is(err, errVerdictFail):
		return exitFail
	}
	// A path or a word from the user may hold an escape character: it is
	// shown, never obeyed by the terminal.
	fmt.Fprintf(stderr, "zapnet: %s\n", netlist.Printable(err.Error()))
	return exitUnusable
}

func usage(w io.Writer) {
	fmt.Fprint(w, `zapnet estimates what an electrostatic discharge does to a protection network.

Usage:
  zapnet COMMAND [options] ...

Commands:
`)
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-12s %s\n", c.name, c.summary)
	}
	fmt.Fprint(w, `
Run 'zapnet COMMAND --help' for a command's options and a worked example.

Example:
  zapnet check testdata/demo.zap
  zapnet run testdata/demo.zap --json result.json

A simulation is an estimate, not a compliance result. See SAFETY.md.
`)
}

// newFlags returns a flag set for a subcommand whose --help prints the
// synopsis, the options and a worked example.
func newFlags(name, synopsis, example string, stderr io.Writer) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.SortFlags = false
	fs.Usage = func() {
		fmt.Fprintf(stderr, "Usage:\n  zapnet %s\n\nOptions:\n%s\nExample:\n%s\n", synopsis, fs.FlagUsages(), example)
	}
	return fs
}

func runVersion(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("version", "version", "  zapnet version", stderr)
	if err := fs.Parse(args); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "zapnet %s\n", Version)
	return nil
}
