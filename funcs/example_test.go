package funcs_test

import (
	"fmt"

	"github.com/fluecell/fluecell/funcs"
)

// A single call with named arguments, as the HTTP endpoint makes it.
func ExampleEngine_Call() {
	e, err := funcs.New()
	if err != nil {
		panic(err)
	}
	r, err := e.Call("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "1000", "unit": "GJ"})
	if err != nil {
		panic(err)
	}
	fmt.Println(funcs.FormatNumber(r.Value), r.Unit)
	fmt.Println(r.Sources[0].Citation())
	// Output:
	// 56.1 t CO2
	// 56100 kg CO2/TJ NCV (IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4)
}

// Compile once, run per row: the workbook path.
func ExampleEngine_Compile() {
	e, _ := funcs.New()
	p, err := e.Compile(`fuel_co2e(fuel, amount, unit)`, funcs.WithVariables("fuel", "amount", "unit"))
	if err != nil {
		panic(err)
	}
	r := p.NewRunner()
	for _, row := range []map[string]any{
		{"fuel": "natural_gas", "amount": 1000.0, "unit": "GJ"},
		{"fuel": "diesel", "amount": 2.0, "unit": "t"},
	} {
		res, err := r.Run(row)
		if err != nil {
			panic(err)
		}
		fmt.Println(funcs.FormatNumber(res.Value), res.Unit, res.Notes)
	}
	// Output:
	// 56.1545 t CO2e [CO2e with GWP-100 AR5: CH4 28, N2O 265 CH4 and N2O of stationary combustion in energy industries (sector energy, the default)]
	// 6.393498 t CO2e [fuel "diesel" read as gas_diesel_oil CO2e with GWP-100 AR5: CH4 28, N2O 265 CH4 and N2O of stationary combustion in energy industries (sector energy, the default)]
}

// Compile errors point at the column.
func ExampleEngine_Compile_error() {
	e, _ := funcs.New()
	_, err := e.Compile(`fuel_co2("natural_gas", q, "ton")`, funcs.WithVariables("q"))
	fmt.Println(err)
	// Output:
	// fuel_co2: unit: ambiguous unit "ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb) (character 28)
	//  | fuel_co2("natural_gas", q, "ton")
	//  |                            ^
}

func ExampleFormatNumber() {
	third := 1.0 / 3
	fmt.Println(funcs.FormatNumber(third))
	fmt.Println(funcs.FormatNumber(2.6612935425))
	fmt.Println(funcs.FormatNumber(1e-9))
	// Output:
	// 0.3333333333333333
	// 2.6612935425
	// 1e-09
}
