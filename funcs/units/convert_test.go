package units

import (
	"errors"
	"math"
	"math/big"
	"testing"
)

func TestFactorValues(t *testing.T) {
	tests := []struct {
		from, to string
		want     float64
		source   string
	}{
		{"MWh", "GJ", 3.6, "SI (1 MWh = 3.6e9 J)"},
		{"GJ", "MWh", 1 / 3.6, "SI"},
		{"MMBtu", "GJ", 1.05505585262, "NIST SP 811 Appendix B.8 (Btu IT)"},
		{"therm", "MJ", 105.505585262, "definition (10^5 Btu IT)"},
		{"toe", "GJ", 41.868, "IEA (toe)"},
		{"Mtoe", "PJ", 41.868, "IEA (toe)"},
		{"tce", "GJ", 29.3076, "IEA/UN (tce)"},
		{"TWyr", "EJ", 31.536, "definition (365-day year)"},
		{"quad", "EJ", 1.05505585262, "definition (10^15 Btu IT)"},
		{"short_ton", "t", 0.90718474, "NIST SP 811 Appendix B.8 (ton, short)"},
		{"long_ton", "kg", 1016.0469088, "NIST SP 811 Appendix B.8 (ton, long)"},
		{"lb", "kg", 0.45359237, "NIST SP 811 Appendix B.8 (pound)"},
		{"Gt", "Mt", 1000, "SI prefixes"},
		{"bbl", "L", 158.987294928, "NIST SP 811 Appendix B.8 (barrel for petroleum)"},
		{"gal", "L", 3.785411784, "NIST SP 811 Appendix B.8 (gallon US)"},
		{"gal_imp", "L", 4.54609, "UK Weights and Measures Act 1985"},
		{"Mcf", "m3", 28.316846592, "NIST SP 811 Appendix B.8 (cubic foot)"},
		{"GW", "kW", 1e6, "SI prefixes"},
		{"yr", "h", 8760, "definition (365-day year)"},
		{"d", "min", 1440, "SI Brochure (day, minute)"},
	}
	for _, tt := range tests {
		got, err := Factor(mustParse(t, tt.from), mustParse(t, tt.to))
		if err != nil {
			t.Errorf("Factor(%s, %s): %v", tt.from, tt.to, err)
			continue
		}
		if got != tt.want {
			t.Errorf("Factor(%s, %s) = %v, want %v (%s)", tt.from, tt.to, got, tt.want, tt.source)
		}
	}
}

// TestFactorRoundedOnce: for every pair of the same dimension Factor is the exact ratio
// rounded once, and Ratio is that exact ratio.
func TestFactorRoundedOnce(t *testing.T) {
	list := List()
	for _, a := range list {
		for _, b := range list {
			if a.Dim != b.Dim {
				continue
			}
			exact := new(big.Rat).Quo(a.SI(), b.SI())
			want, _ := exact.Float64()
			got, err := Factor(a.Unit, b.Unit)
			if err != nil || got != want {
				t.Errorf("Factor(%s, %s) = %v, %v; want %v", a.Symbol, b.Symbol, got, err, want)
			}
			r, err := Ratio(a.Unit, b.Unit)
			if err != nil || r.Cmp(exact) != 0 {
				t.Errorf("Ratio(%s, %s) = %v, %v; want %v", a.Symbol, b.Symbol, r, err, exact)
			}
		}
	}
}

func TestFactorBasis(t *testing.T) {
	tests := []struct {
		from, to string
		code     string
	}{
		{"MMBtu HHV", "GJ", ""},
		{"MMBtu", "GJ NCV", ""},
		{"GJ NCV", "MWh NCV", ""},
		{"MMBtu HHV", "GJ (GCV)", ""},
		{"MMBtu HHV", "GJ NCV", CodeBasis},
		{"TJ LHV", "MWh HHV", CodeBasis},
	}
	for _, tt := range tests {
		from, to := mustParse(t, tt.from), mustParse(t, tt.to)
		_, errF := Factor(from, to)
		_, errR := Ratio(from, to)
		_, errC := Convert(1, from, to)
		for _, err := range []error{errF, errR, errC} {
			if tt.code == "" {
				if err != nil {
					t.Errorf("%s -> %s: %v, want no error", tt.from, tt.to, err)
				}
				continue
			}
			var e *Error
			if !errors.As(err, &e) || e.Code != tt.code {
				t.Errorf("%s -> %s: %v, want code %s", tt.from, tt.to, err, tt.code)
			}
		}
	}
	_, err := Factor(mustParse(t, "MMBtu HHV"), mustParse(t, "GJ NCV"))
	if want := `cannot convert "MMBtu HHV" to "GJ NCV": converting between HHV and NCV depends on the fuel (use fuel_energy)`; err == nil || err.Error() != want {
		t.Errorf("basis error = %v\nwant %s", err, want)
	}
}

func TestFactorErrors(t *testing.T) {
	mwh, kg := mustParse(t, "MWh"), mustParse(t, "kg")
	tests := []struct {
		name     string
		from, to Unit
		code     string
		msg      string
	}{
		{"dimension", mwh, kg, CodeDimension, `cannot convert "MWh" to "kg": "MWh" is an energy and "kg" is a mass`},
		{"power to energy", mustParse(t, "kW"), mwh, CodeDimension, `cannot convert "kW" to "MWh": "kW" is a power and "MWh" is an energy`},
		{"zero from", Unit{}, kg, CodeUnknown, `empty unit: give a unit such as GJ, kWh, t or L`},
		{"zero to", mwh, Unit{}, CodeUnknown, `empty unit: give a unit such as GJ, kWh, t or L`},
		{"hand-made", Unit{Symbol: "kg", Dim: Mass}, kg, CodeUnknown,
			`unit "kg" was not made by this package: get units from Parse, ParseAs or List`},
		{"forged symbol", func() Unit { u := kg; u.Symbol = "lb"; return u }(), kg, CodeUnknown,
			`unit "lb" was not made by this package: get units from Parse, ParseAs or List`},
	}
	for _, tt := range tests {
		f, err := Factor(tt.from, tt.to)
		var e *Error
		if !errors.As(err, &e) || e.Code != tt.code || e.Msg != tt.msg {
			t.Errorf("%s: Factor = %v, %v\nwant %s: %s", tt.name, f, err, tt.code, tt.msg)
		}
		if r, err := Ratio(tt.from, tt.to); err == nil || r != nil {
			t.Errorf("%s: Ratio = %v, %v; want an error", tt.name, r, err)
		}
	}
}

func TestConvert(t *testing.T) {
	mwh, gj := mustParse(t, "MWh"), mustParse(t, "GJ")
	if got, err := Convert(2.5, mwh, gj); err != nil || got != 9 {
		t.Errorf("Convert(2.5 MWh -> GJ) = %v, %v; want 9 (SI)", got, err)
	}
	if got, err := Convert(-1, mustParse(t, "bbl"), mustParse(t, "gal")); err != nil || got != -42 {
		t.Errorf("Convert(-1 bbl -> gal) = %v, %v; want -42 (NIST SP 811 B.8)", got, err)
	}
	for _, tt := range []struct {
		v        float64
		from, to Unit
		msg      string
	}{
		{math.NaN(), mwh, gj, "value NaN is not a finite number: give a finite number"},
		{math.Inf(1), mwh, gj, "value +Inf is not a finite number: give a finite number"},
		{math.Inf(-1), mwh, gj, "value -Inf is not a finite number: give a finite number"},
		{1e300, mustParse(t, "EJ"), mustParse(t, "J"), "value 1e+300 EJ in J is beyond the float64 range"},
	} {
		got, err := Convert(tt.v, tt.from, tt.to)
		var e *Error
		if !errors.As(err, &e) || e.Code != CodeNotANumber || e.Msg != tt.msg {
			t.Errorf("Convert(%v, %s, %s) = %v, %v\nwant %s: %s", tt.v, tt.from, tt.to, got, err, CodeNotANumber, tt.msg)
		}
	}
	if _, err := Convert(1, mwh, mustParse(t, "t")); err == nil || err.(*Error).Code != CodeDimension {
		t.Errorf("Convert(MWh -> t) = %v, want unit-dimension", err)
	}
}

// TestExactValuesAreCopies: callers cannot change the table through SI or Ratio.
func TestExactValuesAreCopies(t *testing.T) {
	btu := mustParse(t, "Btu")
	btu.SI().SetInt64(7)
	r, _ := Ratio(btu, mustParse(t, "J"))
	r.SetInt64(7)
	if got := btu.SI().FloatString(8); got != "1055.05585262" {
		t.Errorf("Btu factor changed to %s through a returned value", got)
	}
	if f, _ := Factor(btu, mustParse(t, "J")); f != 1055.05585262 {
		t.Errorf("Factor(Btu, J) = %v after changing returned values", f)
	}
	if (Unit{}).SI() != nil || !math.IsNaN((Unit{}).SIFloat()) {
		t.Errorf("zero Unit: SI() = %v, SIFloat() = %v; want nil and NaN", (Unit{}).SI(), (Unit{}).SIFloat())
	}
}

func TestFactorAllocs(t *testing.T) {
	a, b := mustParse(t, "MMBtu HHV"), mustParse(t, "GJ")
	if n := testing.AllocsPerRun(100, func() { _, _ = Factor(a, b) }); n != 0 {
		t.Errorf("Factor allocates %v times per call, want 0", n)
	}
	if n := testing.AllocsPerRun(100, func() { _, _ = Convert(3, a, b) }); n != 0 {
		t.Errorf("Convert allocates %v times per call, want 0", n)
	}
}
