package batch

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
)

// WriteSummaryCSV writes the summary as CSV (file, status, rows, tCO2,
// tCO2e, warnings, error, seconds), atomically.
func WriteSummaryCSV(path string, s *Summary) error {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	w := csv.NewWriter(tmp)
	w.Write([]string{"file", "status", "rows", "tCO2", "tCO2e", "warnings", "error", "seconds"})
	for _, f := range s.Files {
		rec := []string{f.File, f.Status, "", "", "", "", f.Error, strconv.FormatFloat(f.Seconds, 'f', 3, 64)}
		if f.Status != StatusFailed {
			rec[2] = strconv.Itoa(f.Outcome.Rows)
			rec[3] = strconv.FormatFloat(f.Outcome.TCO2, 'f', -1, 64)
			rec[4] = strconv.FormatFloat(f.Outcome.TCO2e, 'f', -1, 64)
			rec[5] = strconv.Itoa(f.Outcome.Warnings)
		}
		w.Write(rec)
	}
	w.Flush()
	if err := w.Error(); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	if err := tmp.Close(); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	return os.Rename(tmp.Name(), path)
}
