package main

import (
	"fmt"
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/batch"
	"github.com/fluecell/fluecell/importer/safetext"
)

// overflowText stands for a total that float64 cannot hold.
const overflowText = "exceeds the float64 range"

// totalText formats a total in tonnes with format, after rounding to
// three decimals; a total beyond the float64 range (rows that are each
// finite can add up to more than about 1.8e308) is said in words instead
// of printed as +Inf.
func totalText(v float64, format func(float64) string) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return overflowText
	}
	return format(round3(v))
}

// notComputableText is the total of a report whose sum the importer found
// past the float64 range (Totals.NotComputable).
const notComputableText = "not computable (the rows add up to more than the float64 range holds)"

// totalsText is the "x tCO2, y tCO2e" part of a report's total line.
func totalsText(t importer.Totals, format func(float64) string) string {
	if t.NotComputable != "" {
		return "total " + notComputableText
	}
	return totalText(t.TCO2, format) + " tCO2, " + totalText(t.TCO2e, format) + " tCO2e"
}

// totalsError says which total of t is not a finite number, or nil.
func totalsError(t importer.Totals) error {
	if t.NotComputable != "" {
		return fmt.Errorf("total %s: %s (check the amounts and units of the largest rows)", overflowText, t.NotComputable)
	}
	for _, x := range []struct {
		name string
		v    float64
	}{{"tCO2", t.TCO2}, {"tCO2e", t.TCO2e}} {
		if math.IsInf(x.v, 0) || math.IsNaN(x.v) {
			return fmt.Errorf("total %s: the computed %s rows add up to beyond ±%.3g (check the amounts and units of the largest rows)", overflowText, x.name, math.MaxFloat64)
		}
	}
	return nil
}

// kindLines are the report's totals by kind, one line each, never added
// together: fossil tCO2, tCO2e, biogenic CO2 where there is some, and how
// complete each is ("13 of 16 rows computed: incomplete", the first rows left out).
func kindLines(rep *importer.Report, format func(float64) string) []string {
	var out []string
	for _, k := range rep.ByKind {
		line := importer.KindLabel(k.Kind) + ": "
		if k.NotComputable != "" {
			line += notComputableText
		} else {
			line += totalText(k.TCO2, format) + " tCO2 (fossil), " + totalText(k.TCO2e, format) + " tCO2e" + intervalText(k.TotalInterval)
			if k.Biogenic != 0 {
				line += "; biogenic " + totalText(k.Biogenic, format) + " tCO2 (memo item, in no total)"
			}
		}
		line += "; " + k.Completeness()
		if len(k.LeftOut) > 0 {
			line += " (left out: " + strings.Join(k.LeftOut, ", ")
			if n := k.Rows - k.Computed; n > len(k.LeftOut) {
				line += fmt.Sprintf(" and %d more", n-len(k.LeftOut))
			}
			line += ")"
		}
		out = append(out, safetext.Line(line))
	}
	return out
}

// intervalText is " (95 %: 321.4–362.5)", the interval of a total to four significant
// digits, or "" when it has none.
func intervalText(ti importer.TotalInterval) string {
	if !ti.HasInterval() {
		return ""
	}
	return " (95 %: " + sig4(ti.Low) + "–" + sig4(ti.High) + ")"
}

// hasInterval reports whether a total of ks has an interval.
func hasInterval(ks []importer.KindTotal) bool {
	for _, k := range ks {
		if k.HasInterval() {
			return true
		}
	}
	return false
}

// activityText lists the activity-data uncertainty of each table: "Fuel log!A4 stationary_fuel ±5 %".
func activityText(u *importer.UncertaintyInfo) string {
	var parts []string
	for _, a := range u.Activity {
		parts = append(parts, a.Table+" "+a.Kind+" ±"+funcs.FormatNumber(a.Percent)+" %")
	}
	if len(parts) == 0 {
		return "exact"
	}
	if len(parts) > 6 {
		parts = append(parts[:6], fmt.Sprintf("and %d more", len(parts)-6))
	}
	return strings.Join(parts, ", ")
}

// outcomeKinds are the totals by kind of a report in the order of
// batch.KindNames: t CO2e per kind, then the biogenic CO2.
func outcomeKinds(rep *importer.Report) [batch.NumKinds]float64 {
	var out [batch.NumKinds]float64
	for i, name := range batch.KindNames() {
		if name == "biogenic" {
			out[i] = rep.Biogenic
			continue
		}
		for _, k := range rep.ByKind {
			if k.Kind == name {
				out[i] = k.TCO2e
			}
		}
	}
	return out
}

// batchKindsLine sums the kinds of the outcomes apart: "by kind (never
// added together): stationary_combustion 344.206 tCO2e, embodied ...".
func batchKindsLine(sums [batch.NumKinds]float64) string {
	var parts []string
	for i, name := range batch.KindNames() {
		if sums[i] == 0 {
			continue
		}
		unit := " tCO2e"
		if name == "biogenic" {
			name, unit = "biogenic (memo)", " tCO2"
		}
		parts = append(parts, name+" "+totalText(sums[i], fmtTonnes)+unit)
	}
	if len(parts) == 0 {
		return ""
	}
	return "by kind (never added together): " + strings.Join(parts, ", ")
}
