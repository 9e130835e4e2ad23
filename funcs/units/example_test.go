package units_test

import (
	"errors"
	"fmt"

	"github.com/fluecell/fluecell/funcs/units"
)

func ExampleParse() {
	u, err := units.Parse("MMBtu (GCV)")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(u, "|", u.Name, "|", u.Dim, "|", u.Source)

	_, err = units.Parse("ton")
	var e *units.Error
	if errors.As(err, &e) {
		fmt.Println(e.Code, e.Alternatives)
		fmt.Println(e)
	}
	// Output:
	// MMBtu HHV | million Btu | energy | NIST SP 811 (Btu IT)
	// unit-ambiguous [t short_ton long_ton]
	// ambiguous unit "ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)
}

func ExampleParseAs() {
	_, err := units.ParseAs("kW", units.Energy)
	fmt.Println(err)
	// Output:
	// unit "kW" is a power, but an energy is needed here (did you mean kWh?)
}

func ExampleFactor() {
	mmbtu, _ := units.Parse("MMBtu")
	gj, _ := units.Parse("GJ")
	f, _ := units.Factor(mmbtu, gj)
	fmt.Println(f)

	r, _ := units.Ratio(mmbtu, gj)
	fmt.Println(r.FloatString(11))

	hhv, _ := units.Parse("MMBtu HHV")
	ncv, _ := units.Parse("GJ NCV")
	_, err := units.Factor(hhv, ncv)
	fmt.Println(err)
	// Output:
	// 1.05505585262
	// 1.05505585262
	// cannot convert "MMBtu HHV" to "GJ NCV": converting between HHV and NCV depends on the fuel (use fuel_energy)
}

func ExampleConvert() {
	st, _ := units.Parse("short tons")
	t, _ := units.Parse("t")
	v, _ := units.Convert(250, st, t)
	fmt.Println(v)

	twyr, _ := units.Parse("TWyr")
	ej, _ := units.Parse("EJ")
	v, _ = units.Convert(1, twyr, ej)
	fmt.Println(v)
	// Output:
	// 226.796185
	// 31.536
}

func ExampleParse_magnitude() {
	for _, s := range []string{"Thousand Gallons", "Million kWh", "Billion Btu", "Thousand Short Tons", "Million cubic feet"} {
		u, _ := units.Parse(s)
		fmt.Printf("%s: %s = %s %s\n", s, u.Symbol, u.SI().FloatString(3), map[units.Dimension]string{units.Energy: "J", units.Mass: "kg", units.Volume: "m3"}[u.Dim])
	}
	// Output:
	// Thousand Gallons: kgal = 3.785 m3
	// Million kWh: million kWh = 3600000000000.000 J
	// Billion Btu: billion Btu = 1055055852620.000 J
	// Thousand Short Tons: thousand short_ton = 907184.740 kg
	// Million cubic feet: MMcf = 28316.847 m3
}

func ExampleList() {
	for _, e := range units.List() {
		if e.Dim == units.Mass {
			fmt.Println(e.Symbol, e.Exact)
		}
	}
	// Output:
	// g 0.001
	// lb 0.45359237
	// kg 1
	// klb 453.59237
	// short_ton 907.18474
	// t 1000
	// long_ton 1016.0469088
	// MMlb 453592.37
	// kt 1000000
	// Mt 1000000000
	// Gt 1000000000000
}
