package funcs

import (
	"errors"
	"strconv"
	"strings"
)

// Error codes. Every error returned by this package is an *Error with one of
// these codes; a caller maps them to its own surface (exit code, HTTP status).
const (
	CodeUnknownFunction = "unknown-function" // the name is not in the catalog
	CodeBadArgument     = "bad-argument"     // a value of the wrong type or outside its range
	CodeUnknownFuel     = "fuel-unknown"     // no fuel id or alias matches
	CodeUnit            = "unit"             // a unit string could not be used (see Unit for the units code)
	CodeMissingFactor   = "missing-factor"   // the pack lacks a value the computation needs
	CodeCompile         = "compile"          // the expression does not parse or uses something not allowed
	CodeVariable        = "unknown-variable" // a variable the expression uses is not given
	CodeArithmetic      = "arithmetic"       // division by zero, NaN or an infinity
	CodeLimit           = "limit"            // an expression over the length or node limits
	CodePack            = "pack"             // a factor file could not be loaded
)

// Error is the error type of package funcs.
type Error struct {
	Code  string // one of the Code constants
	Func  string // the catalog function concerned, if any
	Param string // the parameter concerned, if any
	Msg   string // the message, naming the input and what is accepted
	// UnitCode is the code of the units package (unit-unknown, unit-ambiguous,
	// unit-dimension, unit-basis) when Code is CodeUnit.
	UnitCode string
	// Position is the 1-based character position in the expression source
	// (a character, not a byte; not a sheet column), 0 when unknown.
	Position int
	// Source is the expression source the position refers to.
	Source string
	Err    error // the cause, if any
}

// Error returns the message, prefixed by the function and parameter, and
// followed by the expression line with a caret under the character position
// when known: "... (character 28)".
func (e *Error) Error() string {
	var b strings.Builder
	if e.Func != "" {
		b.WriteString(e.Func)
		b.WriteString(": ")
	}
	if e.Param != "" && !strings.HasPrefix(e.Msg, e.Param) {
		b.WriteString(e.Param)
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	if e.Position > 0 && e.Source != "" {
		b.WriteString(" (character ")
		b.WriteString(strconv.Itoa(e.Position))
		b.WriteString(")\n | ")
		line, col := sourceLine(e.Source, e.Position)
		b.WriteString(line)
		b.WriteString("\n | ")
		b.WriteString(strings.Repeat(" ", col-1))
		b.WriteString("^")
	}
	return b.String()
}

// Headline is the first line of Error(): the message without the caret snippet.
func (e *Error) Headline() string {
	s := e.Error()
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		return s[:i]
	}
	return s
}

func (e *Error) Unwrap() error { return e.Err }

// AsError returns err as an *Error if it is one (or wraps one).
func AsError(err error) (*Error, bool) {
	var fe *Error
	ok := errors.As(err, &fe)
	return fe, ok
}

// sourceLine returns the single line of src holding the 1-based rune column
// col, and the column within that line.
func sourceLine(src string, col int) (string, int) {
	runes := []rune(src)
	if col > len(runes)+1 {
		col = len(runes) + 1
	}
	start := 0
	for i := 0; i < col-1 && i < len(runes); i++ {
		if runes[i] == '\n' {
			start = i + 1
		}
	}
	end := len(runes)
	for i := start; i < len(runes); i++ {
		if runes[i] == '\n' {
			end = i
			break
		}
	}
	line := strings.Map(func(r rune) rune {
		if r == '\t' {
			return ' '
		}
		return r
	}, string(runes[start:end]))
	return line, col - start
}
