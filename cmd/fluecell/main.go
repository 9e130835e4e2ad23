// Command fluecell adds carbon functions to spreadsheets and notebooks over
// HTTP and annotates workbooks with computed carbon columns and unit checks.
//
// Default factors are Tier 1 estimates; regulated reporting follows the
// jurisdiction's rules and accredited verification.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

// caution is printed in the help of every command that produces figures.
const caution = `Default factors are Tier 1 estimates (IPCC 2006 defaults, EPA Hub averages).
Regulated reporting follows the jurisdiction's rules and accredited verification.`

// stdio is where a command reads and writes; tests pass buffers.
type stdio struct {
	in       io.Reader
	out, err io.Writer
}

// command is one subcommand: its name, a one-line summary and its entry point.
type command struct {
	name    string
	summary string
	run     func(ctx context.Context, s stdio, args []string) int
}

func commands() []command {
	return []command{
		{"serve", "serve the carbon functions over HTTP for sheets and notebooks", cmdServe},
		{"eval", "evaluate one expression, e.g. fuel_co2(\"diesel\", 1000, \"L\")", cmdEval},
		{"annotate", "add tCO2/tCO2e columns and unit warnings to a workbook (.xlsx, .xlsm, .xls, .csv)", cmdAnnotate},
		{"batch", "annotate every workbook below a folder into a mirror folder, in parallel", cmdBatch},
		{"inspect", "show how a workbook's tables and columns are read; write that reading as a mapping to edit", cmdInspect},
		{"functions", "list the carbon functions with parameters and examples", cmdFunctions},
		{"factors", "list factor rows with their sources", cmdFactors},
		{"grids", "list the electricity grids (Scope 2) with their sets and years", cmdGrids},
		{"units", "list the accepted units with their exact factors", cmdUnits},
		{"demo", "write and annotate the workbooks of an invented dairy co-operative", cmdDemo},
	}
}

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], stdio{in: os.Stdin, out: os.Stdout, err: os.Stderr})
	stop()
	os.Exit(code)
}

// run dispatches to a subcommand and returns the exit code: 0 on success, 1
// when the command failed, 2 for a usage mistake.
func run(ctx context.Context, args []string, s stdio) int {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		usage(s.out)
		if len(args) == 0 {
			return 2
		}
		return 0
	}
	if args[0] == "version" || args[0] == "--version" {
		fmt.Fprintln(s.out, "fluecell", version)
		return 0
	}
	for _, c := range commands() {
		if c.name == args[0] {
			return c.run(ctx, s, args[1:])
		}
	}
	fmt.Fprintf(s.err, "fluecell: unknown command %q (commands: %s); see fluecell --help\n", args[0], commandNames())
	return 2
}

// version is the program version; it is part of the batch up-to-date check.
const version = "0.1.0"

func commandNames() string {
	var names string
	for i, c := range commands() {
		if i > 0 {
			names += ", "
		}
		names += c.name
	}
	return names
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "fluecell: carbon functions for spreadsheets, notebooks and workbooks")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Usage: fluecell COMMAND [flags] [args]   (fluecell COMMAND --help for one command)")
	fmt.Fprintln(w)
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-10s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, caution)
}
