package main

import (
	"flag"
	"fmt"
	"io"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/regfile"
	"github.com/fluecell/fluecell/importer/safetext"
)

// listFlag is a repeatable string flag.
type listFlag []string

func (l *listFlag) String() string     { return strings.Join(*l, ",") }
func (l *listFlag) Set(v string) error { *l = append(*l, v); return nil }

// newFlags returns a FlagSet whose usage prints synopsis, the flags and,
// when withCaution, the cautions on default factors.
func newFlags(name, synopsis string, w io.Writer, withCaution bool) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(w)
	fs.Usage = func() {
		fmt.Fprintf(w, "Usage: fluecell %s\n\nFlags:\n", synopsis)
		fs.PrintDefaults()
		if withCaution {
			fmt.Fprintln(w)
			fmt.Fprintln(w, caution)
		}
	}
	return fs
}

// parseArgs parses flags that may come before or after the positional
// arguments ("--" ends the flags). It returns the positionals, or ok=false
// after printing a message (exit code 2; 0 for --help).
func parseArgs(fs *flag.FlagSet, args []string) (pos []string, code int, ok bool) {
	for {
		if err := fs.Parse(args); err != nil {
			if err == flag.ErrHelp {
				return nil, 0, false
			}
			return nil, 2, false
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, 0, true
		}
		if len(args) > len(rest) && args[len(args)-len(rest)-1] == "--" {
			return append(pos, rest...), 0, true
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// engineFlags are the flags shared by commands that load factor packs.
type engineFlags struct {
	factors listFlag
	pack    string
}

func (f *engineFlags) register(fs *flag.FlagSet) {
	fs.Var(&f.factors, "factors", "load a user factor pack `FILE` (CSV, same columns as the embedded packs); repeatable, later files override earlier ones")
	fs.StringVar(&f.pack, "pack", "", "factor `PACK` used when a call names none (default "+funcs.DefaultPack+"; see fluecell factors)")
}

func (f *engineFlags) engine() (*funcs.Engine, error) {
	for _, p := range f.factors {
		if err := regfile.Check(p); err != nil {
			return nil, fmt.Errorf("--factors: %w", err)
		}
	}
	opts := []funcs.Option{funcs.WithFactorFiles(f.factors...)}
	if f.pack != "" {
		opts = append(opts, funcs.WithDefaultPack(f.pack))
	}
	return funcs.New(opts...)
}

// fail prints a one-line error and returns exit code 1. Expression errors
// keep their caret lines, which point at the character position. Control characters
// (a file name's line break or escape sequence) are printed escaped.
func fail(s stdio, cmd string, err error) int {
	msg := err.Error()
	if fe, ok := funcs.AsError(err); ok && fe.Position == 0 {
		msg = fe.Headline()
	} else if !ok {
		msg = strings.ReplaceAll(msg, "\n", " ")
	}
	lines := strings.Split(msg, "\n")
	for i, l := range lines {
		lines[i] = safetext.Line(l)
	}
	fmt.Fprintf(s.err, "fluecell %s: %s\n", cmd, strings.Join(lines, "\n"))
	return 1
}
