package units

import (
	"strings"
	"testing"
)

// TestWorkbookSpellings covers spellings seen in real fuel logs.
func TestWorkbookSpellings(t *testing.T) {
	for in, want := range map[string]string{
		"ltr": "L", "ltrs": "L", "lts": "L",
		"kWh (gross)": "kWh HHV", "GJ net": "GJ NCV", "MWh, Net": "MWh NCV", "therm [gross]": "therm HHV",
	} {
		u, err := Parse(in)
		if err != nil || u.String() != want {
			t.Errorf("%q -> %q, %v; want %s", in, u.String(), err, want)
		}
	}
	for in, want := range map[string]string{
		"lt":  `ambiguous unit "lt": write L (litre) or long_ton (2240 lb)`,
		"scm": `ambiguous unit "scm": standard cubic metre at 15 °C (ISO 13443) or at 20 °C (US EPA); write Sm3`,
	} {
		_, err := Parse(in)
		if err == nil || !strings.HasPrefix(err.Error(), want) {
			t.Errorf("%q: %v, want %q", in, err, want)
		}
	}
}
