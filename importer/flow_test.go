package importer

import (
	"strings"
	"testing"
	"time"
)

// dieselBblT is t CO2 from barrels of distillate (diesel) oil.
func dieselBblT(bbl float64) float64 { return dieselT(bbl * galPerBbl * lPerGal) }

// TestFlowOverWeeks: "(Thousand Barrels per Day)" in the title over weekly
// dated rows is an amount over each row's 7 days.
func TestFlowOverWeeks(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2023, time.January, d, 0, 0, 0, 0, time.UTC) }
	rep, path := scanRows(t, "weekly.xlsx", "Weekly", [][]any{
		{"Weekly Product Supplied of Distillate Fuel Oil"},
		{"(Thousand Barrels per Day)"},
		{"Date", "Distillate Fuel Oil"},
		{day(6), 4000},
		{day(13), 4100},
		{day(20), 4200},
	})
	if tb := oneTable(t, rep); tb.Computed != 3 {
		t.Fatalf("computed %d of %d rows: %s", tb.Computed, tb.Rows, listFindings(rep))
	}
	got := annotatedColumn(t, path, "Weekly", "tCO2")
	// A week is 7 days (ISO 8601); thousand barrels: M = 10^3 as in the unit table.
	for row, kbd := range map[int]float64{4: 4000, 5: 4100, 6: 4200} {
		if want := dieselBblT(kbd * 1e3 * 7); !near(got[row], want) {
			t.Errorf("row %d: %v t CO2, want %v (%v thousand barrels a day over 7 days)", row, got[row], want, kbd)
		}
	}
}

// TestFlowOverMonths: a flow per day over monthly rows (YYYYMM) is an
// amount over the days of each row's month (Gregorian calendar: 2023 is not
// a leap year).
func TestFlowOverMonths(t *testing.T) {
	days := map[int]float64{202301: 31, 202302: 28, 202303: 31}
	cases := []struct {
		name   string
		months []int
	}{
		{"202301 to 202303", []int{202301, 202302, 202303}},
		{"202303 down to 202301", []int{202303, 202302, 202301}},
		{"202301 to 202304", []int{202301, 202302, 202303, 202304}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rows := [][]any{{"Month", "Diesel (Thousand Barrels per Day)"}}
			for _, m := range c.months {
				rows = append(rows, []any{m, 10})
			}
			rep, path := scanRows(t, "monthly.xlsx", "Monthly", rows)
			if tb := oneTable(t, rep); tb.Computed != len(c.months) {
				t.Fatalf("computed %d of %d rows: %s", tb.Computed, tb.Rows, listFindings(rep))
			}
			got := annotatedColumn(t, path, "Monthly", "tCO2")
			for i, m := range c.months {
				d, ok := days[m]
				if !ok {
					continue // the last row, 202304: the first case checks a last row
				}
				row := i + 2
				if want := dieselBblT(10e3 * d); !near(got[row], want) {
					t.Errorf("row %d (%d): %v t CO2, want %v (%v days)", row, m, got[row], want, d)
				}
			}
		})
	}
}

// TestFlowWithoutDates: a flow per day in a table without dates is a rate,
// not an amount: nothing is computed and the sheet says why.
func TestFlowWithoutDates(t *testing.T) {
	rep, _ := scanRows(t, "regions.xlsx", "Regions", [][]any{
		{"Region", "Diesel (Thousand Barrels per Day)"},
		{"East", 10},
		{"West", 12},
		{"North", 9},
	})
	if rep.Computed != 0 || rep.Totals != (Totals{}) {
		t.Errorf("computed %d rows, totals %+v: want nothing", rep.Computed, rep.Totals)
	}
	if len(rep.Sheets) != 1 || rep.Sheets[0].Status != StatusSkipped || !strings.Contains(rep.Sheets[0].Reason, "rates") {
		t.Errorf("sheets %+v, want Regions skipped as a table of rates", rep.Sheets)
	}
}

// TestFlowUnderWeekEnding: weekly statistics head their dates "Week
// ending"; the dates make the flow an amount.
func TestFlowUnderWeekEnding(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2023, time.January, d, 0, 0, 0, 0, time.UTC) }
	rep, _ := scanRows(t, "weekly.xlsx", "Weekly", [][]any{
		{"Week ending", "Weekly Product Supplied of Distillate Fuel Oil (Thousand Barrels per Day)"},
		{day(6), 4000},
		{day(13), 4100},
		{day(20), 4200},
	})
	wantTCO2(t, "diesel", rep.Totals.TCO2, dieselBblT(12300e3*7))
}
