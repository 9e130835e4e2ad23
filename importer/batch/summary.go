package batch

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/fluecell/fluecell/importer/atomicfile"
	"github.com/fluecell/fluecell/importer/safetext"
)

// WriteSummaryCSV writes the summary as CSV (file, status, rows, computed,
// tCO2, tCO2e, warnings, error, seconds, output, sheets), atomically. The
// status is ok, partial, nothing computed, failed, up-to-date or
// unreadable (a folder, named with a trailing slash, that could not be
// listed); sheets says what happened to every sheet of the file. Names
// are written as they are (the CSV quoting keeps line breaks), except that
// a text field a spreadsheet would read as a formula (a file named
// =HYPERLINK(...).xlsx) starts with a single quote (safetext.CSVField);
// numbers stay numbers.
func WriteSummaryCSV(path string, s *Summary) error {
	return atomicfile.Write(path, func(out io.Writer) error {
		w := csv.NewWriter(out)
		w.Write([]string{"file", "status", "rows", "computed", "tCO2", "tCO2e", "warnings", "error", "seconds", "output", "sheets"})
		for _, f := range s.Files {
			rec := []string{f.File, f.Status, "", "", "", "", "", f.Error, strconv.FormatFloat(f.Seconds, 'f', 3, 64), f.Output, ""}
			if f.Status != StatusFailed && f.Status != StatusUnreadable {
				rec[2] = strconv.Itoa(f.Outcome.Rows)
				rec[3] = strconv.Itoa(f.Outcome.Computed)
				rec[4] = strconv.FormatFloat(f.Outcome.TCO2, 'f', -1, 64)
				rec[5] = strconv.FormatFloat(f.Outcome.TCO2e, 'f', -1, 64)
				rec[6] = strconv.Itoa(f.Outcome.Warnings)
				rec[10] = f.Outcome.Sheets
			}
			w.Write(safetext.CSVRecord(rec))
		}
		w.Flush()
		return w.Error()
	})
}
