package batch

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/fluecell/fluecell/importer/atomicfile"
)

// WriteSummaryCSV writes the summary as CSV (file, status, rows, tCO2,
// tCO2e, warnings, error, seconds, output), atomically.
func WriteSummaryCSV(path string, s *Summary) error {
	return atomicfile.Write(path, func(out io.Writer) error {
		w := csv.NewWriter(out)
		w.Write([]string{"file", "status", "rows", "tCO2", "tCO2e", "warnings", "error", "seconds", "output"})
		for _, f := range s.Files {
			rec := []string{f.File, f.Status, "", "", "", "", f.Error, strconv.FormatFloat(f.Seconds, 'f', 3, 64), f.Output}
			if f.Status != StatusFailed {
				rec[2] = strconv.Itoa(f.Outcome.Rows)
				rec[3] = strconv.FormatFloat(f.Outcome.TCO2, 'f', -1, 64)
				rec[4] = strconv.FormatFloat(f.Outcome.TCO2e, 'f', -1, 64)
				rec[5] = strconv.Itoa(f.Outcome.Warnings)
			}
			w.Write(rec)
		}
		w.Flush()
		return w.Error()
	})
}
