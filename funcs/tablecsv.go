package funcs

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"
)

// readTable parses a table whose header must be want; it returns the rows, trimmed, with their
// 1-based line numbers. Lines starting with # are comments.
func readTable(data []byte, name string, want []string) ([][]string, []int, error) {
	r := csv.NewReader(strings.NewReader(string(data)))
	r.Comment = '#'
	header, err := r.Read()
	if err != nil {
		return nil, nil, csvErr(name, err)
	}
	if strings.Join(header, ",") != strings.Join(want, ",") {
		return nil, nil, &PackFileError{File: name, Line: 1, Reason: "header must be " + strings.Join(want, ",")}
	}
	var rows [][]string
	var lines []int
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return rows, lines, nil
		}
		if err != nil {
			return nil, nil, csvErr(name, err)
		}
		line, _ := r.FieldPos(0)
		for i := range rec {
			rec[i] = strings.TrimSpace(rec[i])
		}
		rows, lines = append(rows, rec), append(lines, line)
	}
}

// eachRow calls row for every record of a table whose header must be want,
// with a bad function that builds the *PackFileError of that line; the first
// error returned stops the read.
func eachRow(data []byte, name string, want []string, row func(rec []string, line int, bad func(col, format string, args ...any) error) error) error {
	rows, lines, err := readTable(data, name, want)
	if err != nil {
		return err
	}
	for i, rec := range rows {
		line := lines[i]
		bad := func(col, format string, args ...any) error {
			return &PackFileError{File: name, Line: line, Column: col, Reason: fmt.Sprintf(format, args...)}
		}
		if err := row(rec, line, bad); err != nil {
			return err
		}
	}
	return nil
}

// checkSourceMemory checks a vocabulary row's source and from_memory columns:
// a source is given, and says "from memory" exactly when from_memory is true.
func checkSourceMemory(source, fromMemory string, bad func(col, format string, args ...any) error) error {
	switch {
	case source == "":
		return bad("source", "empty source: every row names its publication and table, or says common practice")
	case fromMemory != "true" && fromMemory != "false":
		return bad("from_memory", "from_memory %q: accepted are true or false", fromMemory)
	case (fromMemory == "true") != strings.Contains(source, "from memory"):
		return bad("from_memory", "from_memory is %q: a source says \"from memory\" exactly when from_memory is true", fromMemory)
	}
	return nil
}
