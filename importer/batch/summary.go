package batch

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/fluecell/fluecell/importer/atomicfile"
	"github.com/fluecell/fluecell/importer/safetext"
)

// WriteSummaryCSV writes the summary as CSV (file, status, rows, computed,
// tCO2, tCO2e, warnings, error, seconds, output, sheets, then one column per
// kind of total: see KindNames), atomically. tCO2 and tCO2e are Scope 1
// (stationary and mobile combustion, fugitive); Scope 2, embodied and
// biogenic CO2 are in their own columns, never added in. The
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
		w.Write(summaryColumns())
		for _, f := range s.Files {
			rec := make([]string, len(summaryColumns()))
			rec[fieldFile], rec[fieldStatus], rec[fieldError], rec[fieldOutput] = f.File, f.Status, f.Error, f.Output
			rec[fieldSeconds] = strconv.FormatFloat(f.Seconds, 'f', 3, 64)
			if f.Status != StatusFailed && f.Status != StatusUnreadable {
				rec[2] = strconv.Itoa(f.Outcome.Rows)
				rec[3] = strconv.Itoa(f.Outcome.Computed)
				rec[4] = strconv.FormatFloat(f.Outcome.TCO2, 'f', -1, 64)
				rec[5] = strconv.FormatFloat(f.Outcome.TCO2e, 'f', -1, 64)
				rec[6] = strconv.Itoa(f.Outcome.Warnings)
				rec[10] = f.Outcome.Sheets
				for k, v := range f.Outcome.ByKind {
					rec[fieldKinds+k] = strconv.FormatFloat(v, 'f', -1, 64)
				}
			}
			w.Write(safetext.CSVRecord(rec))
		}
		w.Flush()
		return w.Error()
	})
}

// NumKinds is the number of kind columns of a summary.
const NumKinds = 7

// KindNames are the kinds a summary keeps apart, in column order: t CO2e of
// stationary and mobile combustion and fugitive releases (Scope 1), of
// purchased electricity and heat (Scope 2), of embodied emissions (build
// plans) and of tables computed with the user's own rules, then the t of
// biogenic CO2 (a memo item).
func KindNames() [NumKinds]string {
	return [NumKinds]string{"stationary_combustion", "mobile_combustion", "fugitive", "electricity_heat", "embodied", "other", "biogenic"}
}

// kindColumns are the headers of the kind columns.
func kindColumns() []string {
	var out []string
	for _, k := range KindNames() {
		if k == "biogenic" {
			out = append(out, "tCO2 biogenic")
			continue
		}
		out = append(out, k+" tCO2e")
	}
	return out
}
