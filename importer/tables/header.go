package tables

import (
	"regexp"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Header is what a header cell says: its name and a unit written in it
// ("Quantity (MWh)", "Diesel [L]", "Gas, MMBtu HHV", "NaturalGasUse_therms",
// "... Consumption  Million Cubic Feet", "(Thousand Barrels per Day)").
type Header struct {
	Text     string       // cleaned header text (Clean)
	Base     string       // the header without its unit
	UnitText string       // the unit as written, "" when none
	Unit     units.Unit   // parsed unit (zero when UnitErr is set)
	UnitErr  *units.Error // an ambiguous or otherwise unusable unit in the header
	Percent  bool         // the header says the values are percentages: "(%)"
	Flow     bool         // the unit is per day, week, month or year: an amount only over a dated row's period
	FlowDays float64      // days in the flow's time unit (1, 7, 365; 0 for a month)
	Scale    float64      // values in thousands ('000 L): 1000; else 1
}

var (
	reParenUnit = regexp.MustCompile(`^(.*?)\s*[(\[]\s*([^()\[\]]+?)\s*[)\]]\s*$`)
	AnyParen    = regexp.MustCompile(`[(\[]\s*([^()\[\]]+?)\s*[)\]]`)
	reMidUnit   = regexp.MustCompile(`^(.*?)\s*[(\[]\s*([^()\[\]]+?)\s*[)\]]\s*(.*)$`)
	reSepUnit   = regexp.MustCompile(`^(.+?)\s*(?:,|\s[-–—]|\sin|:)\s+(\S.*)$`)
)

// ParseHeader splits a header into name and unit. A unit counts only where
// it parses, or where it is a known ambiguous spelling ("ton", "MT",
// "MBtu"): then UnitErr says so and no amount is read with it.
func ParseHeader(raw string) Header {
	h := Header{Text: Clean(raw), Scale: 1}
	h.Base = h.Text
	try := func(base, u string, anyDim bool) bool {
		u = strings.TrimSpace(u)
		// A magnitude is taken off as a scale ("'000 L" is L times 1000)
		// where the rest is a unit; a unit that carries its magnitude
		// ("Million Cubic Feet" = MMcf) is read whole.
		u2, scale := SplitScale(u)
		if _, err := units.Lookup(u2); err == nil || scale == 1 {
			u = u2
		} else if _, err := units.Lookup(u); err == nil {
			scale = 1
		} else {
			u = u2
		}
		if u == "" {
			return false
		}
		h.Scale = scale
		if u == "%" || strings.EqualFold(u, "percent") {
			h.Base, h.Percent = base, true
			return true
		}
		pu, err := units.Lookup(u)
		if err != nil {
			if amount, days, ok := FlowUnit(u); ok {
				if fu, ferr := units.Lookup(amount); ferr == nil && (fu.Dim == units.Energy || fu.Dim == units.Mass || fu.Dim == units.Volume) {
					h.Base, h.UnitText, h.Unit, h.Flow, h.FlowDays = base, amount, fu, true, days
					return true
				}
			}
			ue, ok := err.(*units.Error)
			if ok && (ue.Code == units.CodeAmbiguous || ue.Code == units.CodeBasis) {
				h.Base, h.UnitText, h.UnitErr = base, u, ue
				return true
			}
			h.Scale = 1
			return false
		}
		if !anyDim && pu.Dim != units.Energy && pu.Dim != units.Mass && pu.Dim != units.Volume && pu.Dim != units.Power {
			h.Scale = 1
			return false
		}
		h.Base, h.UnitText, h.Unit = base, u, pu
		return true
	}
	if m := reParenUnit.FindStringSubmatch(h.Text); m != nil && try(m[1], m[2], true) {
		return h
	}
	if m := reSepUnit.FindStringSubmatch(h.Text); m != nil && try(m[1], m[2], true) {
		return h
	}
	// A unit in brackets inside the header, words after it:
	// "Total consumption (GWh): Domestic".
	if m := reMidUnit.FindStringSubmatch(h.Text); m != nil && m[3] != "" && try(strings.TrimSpace(m[1]+" "+m[3]), m[2], true) {
		return h
	}
	// The last two to four words: "... Consumption  Million Cubic Feet",
	// "coal thousand megawatthours"; then the last word alone.
	if fs := strings.Fields(h.Text); len(fs) >= 2 {
		for n := min(4, len(fs)-1); n >= 1; n-- {
			u := strings.Join(fs[len(fs)-n:], " ")
			if n == 1 && len(u) <= 2 {
				continue
			}
			if try(strings.Join(fs[:len(fs)-n], " "), u, false) {
				return h
			}
		}
	}
	// snake_case with the unit as its last part: "NaturalGasUse_therms".
	if i := strings.LastIndexByte(h.Text, '_'); i > 0 && i < len(h.Text)-1 {
		if try(h.Text[:i], h.Text[i+1:], false) {
			return h
		}
	}
	// The whole header is a unit: "Litres", "kWh", "MMBtu".
	if u, err := units.Lookup(h.Text); err == nil && (u.Dim == units.Energy || u.Dim == units.Mass || u.Dim == units.Volume) && len(h.Text) > 1 {
		h.UnitText, h.Unit = h.Text, u
	}
	return h
}

// SplitScale takes a thousands or millions marker off a header unit:
// "'000 L", "000s litres", "thousand m3", "m3 '000", "x1000 kWh", "million
// kWh". The scale is 1 when there is none.
func SplitScale(u string) (string, float64) {
	low := strings.ToLower(u)
	marks := []struct {
		mark  string
		scale float64
	}{{"'000s", 1e3}, {"'000", 1e3}, {"’000", 1e3}, {"000s", 1e3}, {"000", 1e3}, {"thousands of", 1e3}, {"thousand", 1e3},
		{"x1000", 1e3}, {"×1000", 1e3}, {"x 1000", 1e3}, {"millions of", 1e6}, {"million", 1e6}, {"mln", 1e6}, {"x1e6", 1e6}}
	for _, m := range marks {
		if strings.HasPrefix(low, m.mark+" ") {
			return strings.TrimSpace(u[len(m.mark):]), m.scale
		}
		if strings.HasSuffix(low, " "+m.mark) {
			return strings.TrimSpace(u[:len(u)-len(m.mark)]), m.scale
		}
	}
	return u, 1
}

var reFlow = regexp.MustCompile(`(?i)^(.+?)\s*(?:per|/)\s*(day|d|year|yr|annum|month|week)$`)

// FlowUnit splits "Thousand Barrels per Day" into the amount unit and the
// days one unit of time holds (1, 7, 365; a month is 0: its own length).
func FlowUnit(u string) (amount string, days float64, ok bool) {
	m := reFlow.FindStringSubmatch(strings.TrimSpace(u))
	if m == nil {
		return "", 0, false
	}
	switch strings.ToLower(m[2]) {
	case "day", "d":
		days = 1
	case "week":
		days = 7
	case "year", "yr", "annum":
		days = 365
	case "month":
		days = 0
	}
	return strings.TrimSpace(m[1]), days, true
}
