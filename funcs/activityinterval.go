package funcs

import (
	"math"
	"path"
	"slices"
	"strconv"
)

// activityTableFile holds the default activity-data uncertainty per kind of record.
const activityTableFile = "activity_uncertainty_table.csv"

// MaxActivityPercent bounds an activity-data uncertainty: a 95 % half-width of 100 % or more
// would let an amount be nothing or negative, which no range of the guidance describes.
const MaxActivityPercent = 100

// ActivityDefault is the default uncertainty of the amounts of one kind of record: the
// half-width of their 95 % interval in per cent of the amount.
type ActivityDefault struct {
	Kind       string  `json:"kind"` // ActivityStationaryFuel ...
	Percent    float64 `json:"percent"`
	Basis      string  `json:"basis"`
	Source     string  `json:"source"`
	FromMemory bool    `json:"from_memory"`
}

// ActivityKinds lists the kinds of record functions give their amounts, in table order.
func ActivityKinds() []string {
	return []string{ActivityStationaryFuel, ActivityMobileFuel, ActivityDistance, ActivityElectricity, ActivityHeat,
		ActivityRefrigerantTopUp, ActivityRefrigerantCharge, ActivityBuildPlan}
}

// ActivityDefaults reads the embedded table data/activity_uncertainty_table.csv: one row per
// kind of ActivityKinds, each with a percentage in [0, MaxActivityPercent), its basis and
// source. Errors are *PackFileError naming the line and column.
func ActivityDefaults() ([]ActivityDefault, error) {
	b, err := embeddedData.ReadFile(path.Join("data", activityTableFile))
	if err != nil {
		return nil, err
	}
	return parseActivityTable(b, "embedded:"+activityTableFile)
}

func parseActivityTable(b []byte, name string) ([]ActivityDefault, error) {
	var out []ActivityDefault
	kinds := ActivityKinds()
	err := eachRow(b, name, []string{"kind", "value_pct", "basis", "source", "from_memory"}, func(rec []string, _ int, bad func(col, format string, args ...any) error) error {
		d := ActivityDefault{Kind: rec[0], Basis: rec[2], Source: rec[3], FromMemory: rec[4] == "true"}
		if !slices.Contains(kinds, d.Kind) {
			return bad("kind", "unknown kind %q: accepted are %v", d.Kind, kinds)
		}
		for _, o := range out {
			if o.Kind == d.Kind {
				return bad("kind", "kind %q given twice", d.Kind)
			}
		}
		v, err := strconv.ParseFloat(rec[1], 64)
		if err != nil || math.IsNaN(v) || v < 0 || v >= MaxActivityPercent {
			return bad("value_pct", "%q: give a percentage from 0 to below %d", rec[1], MaxActivityPercent)
		}
		if d.Basis == "" {
			return bad("basis", "empty basis: say what records the amounts come from")
		}
		if err := checkSourceMemory(d.Source, rec[4], bad); err != nil {
			return err
		}
		d.Percent = v
		out = append(out, d)
		return nil
	})
	if err != nil {
		return nil, err
	}
	for _, k := range kinds {
		if !slices.ContainsFunc(out, func(d ActivityDefault) bool { return d.Kind == k }) {
			return nil, &PackFileError{File: name, Reason: "no row for kind " + k}
		}
	}
	return out, nil
}
