package units

import (
	"strings"
	"testing"
)

// TestGasVolumeUnits checks the gas units at reference conditions and their spellings.
func TestGasVolumeUnits(t *testing.T) {
	for in, want := range map[string]string{
		"Sm3": "Sm3", "Sm³": "Sm3", "standard m3": "Sm3", "standard cubic metres": "Sm3", "SM3": "Sm3",
		"Nm3": "Nm3", "Nm³": "Nm3", "normal m3": "Nm3", "Normal Cubic Meters": "Nm3", "NM3": "Nm3",
		"kNm3": "kNm3", "MNm3": "MNm3", "kSm3": "kSm3", "MSm3": "MSm3",
		"thousand Nm3": "kNm3", "million Sm3": "MSm3", "million standard cubic metres": "MSm3",
		"billion Nm3": "billion Nm3",
	} {
		u, err := Parse(in)
		if err != nil || u.String() != want {
			t.Errorf("Parse(%q) = %q, %v; want %s", in, u.String(), err, want)
		}
	}
	// 1 Nm3 = 288.15/273.15 Sm3 = 1.054915... Sm3 (ISO 13443 15 °C against 0 °C at 101.325 kPa,
	// ideal gas); 1000 Nm3 in Sm3 is therefore 1054.9149...
	got, err := Convert(1000, mustParse(t, "Nm3"), mustParse(t, "Sm3"))
	if want := 1000 * 288.15 / 273.15; err != nil || abs64(got-want) > 1e-9 {
		t.Errorf("1000 Nm3 = %v Sm3, %v; want %v (ISO 13443 / normal conditions, ideal gas)", got, err, want)
	}
	got, err = Convert(1, mustParse(t, "MNm3"), mustParse(t, "Sm3"))
	if err != nil || got < 1054914.88 || got > 1054914.89 {
		t.Errorf("1 MNm3 = %v Sm3, %v; want 1054914.88... (288.15/273.15 x 10^6)", got, err)
	}
	// Sm3 is the m3 at ISO 13443 standard reference conditions: factor 1.
	if got, err := Convert(5, mustParse(t, "Sm3"), mustParse(t, "m3")); err != nil || got != 5 {
		t.Errorf("5 Sm3 = %v m3, %v; want 5 (ISO 13443)", got, err)
	}
}

func abs64(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// TestReference checks Unit.Reference and GasVolumeNote.
func TestReference(t *testing.T) {
	for in, want := range map[string]string{
		"Sm3": StandardReference, "MSm3": StandardReference, "million Sm3": StandardReference,
		"Nm3": "0 °C, 101.325 kPa (normal conditions)", "kNm3": "0 °C, 101.325 kPa (normal conditions)",
		"scf": "60 °F, 14.696 psia (40 CFR 98.6)", "Mcf": "60 °F, 14.696 psia (40 CFR 98.6)",
		"MMcf": "60 °F, 14.696 psia (40 CFR 98.6)", "ccf": "60 °F, 14.696 psia (40 CFR 98.6)",
		"m3": "", "L": "", "gal": "", "GJ": "", "t": "",
	} {
		if got := mustParse(t, in).Reference(); got != want {
			t.Errorf("%s.Reference() = %q, want %q", in, got, want)
		}
	}
	if got := (Unit{}).Reference(); got != "" {
		t.Errorf("zero Unit Reference = %q", got)
	}
	if !strings.Contains(StandardReference, "15 °C") || !strings.Contains(StandardReference, "101.325 kPa") {
		t.Errorf("StandardReference %q does not state the ISO 13443 conditions", StandardReference)
	}
	const m3Note = "gas volume in m3 read at standard reference conditions 15 °C, 101.325 kPa (ISO 13443); write Nm3 for 0 °C"
	if got := GasVolumeNote(mustParse(t, "m³")); got != m3Note {
		t.Errorf("GasVolumeNote(m3) = %q, want %q", got, m3Note)
	}
	for _, s := range []string{"Sm3", "Nm3", "scf", "Mcf", "GJ", "kg"} {
		if got := GasVolumeNote(mustParse(t, s)); got != "" {
			t.Errorf("GasVolumeNote(%s) = %q, want none", s, got)
		}
	}
	if got := GasVolumeNote(mustParse(t, "thousand m3")); !strings.HasPrefix(got, "gas volume in thousand m3 read") {
		t.Errorf("GasVolumeNote(thousand m3) = %q", got)
	}
	if got := GasVolumeNote(Unit{}); got != "" {
		t.Errorf("GasVolumeNote(zero Unit) = %q", got)
	}
}

// TestLengthAndArea checks the length and area units, their spellings and conversions.
func TestLengthAndArea(t *testing.T) {
	for in, want := range map[string]string{
		"m": "m", "metres": "m", "km": "km", "KM": "km", "kilometres": "km", "mi": "mi", "miles": "mi",
		"nmi": "nmi", "nautical miles": "nmi",
		"m2": "m2", "m²": "m2", "sq m": "m2", "square metres": "m2", "km²": "km2", "ha": "ha", "hectares": "ha",
		"ft2": "ft2", "sq ft": "ft2", "sqft": "ft2", "square feet": "ft2", "ft²": "ft2",
	} {
		u, err := Parse(in)
		if err != nil || u.String() != want {
			t.Errorf("Parse(%q) = %q, %v; want %s", in, u.String(), err, want)
		}
	}
	if u := mustParse(t, "km"); u.Dim != Length || u.Dim.String() != "length" {
		t.Errorf("km.Dim = %v", u.Dim)
	}
	if u := mustParse(t, "ha"); u.Dim != Area || u.Dim.article() != "an area" {
		t.Errorf("ha.Dim = %v (%s)", u.Dim, u.Dim.article())
	}
	// "M" is not the metre.
	if _, err := Parse("M"); err == nil {
		t.Error(`Parse("M") succeeded; "M" is no spelling of the metre`)
	}
	// NIST SP 811 Appendix B.8: 1 mi = 1.609344 km exactly; 1 nmi = 1.852 km; 1 ft2 = 0.09290304 m2.
	for _, c := range []struct {
		v        float64
		from, to string
		want     float64
	}{
		{100, "mi", "km", 160.9344},
		{10, "nmi", "km", 18.52},
		{1000, "ft2", "m2", 92.90304},
		{1, "km2", "ha", 100}, // SI Brochure Table 8 (ha = 10^4 m2)
	} {
		got, err := Convert(c.v, mustParse(t, c.from), mustParse(t, c.to))
		if err != nil || abs64(got-c.want) > 1e-9*c.want {
			t.Errorf("%v %s = %v %s, %v; want %v", c.v, c.from, got, c.to, err, c.want)
		}
	}
	if _, err := Convert(1, mustParse(t, "km"), mustParse(t, "km2")); err == nil ||
		err.Error() != `cannot convert "km" to "km2": "km" is a length and "km2" is an area` {
		t.Errorf("km to km2: %v", err)
	}
}
