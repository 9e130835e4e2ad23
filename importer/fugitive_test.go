package importer

import (
	"strings"
	"testing"
)

// GWP-100 values of the checks below: HFC-32 677, HFC-125 3170, HFC-134a
// 1300, HFC-143a 4800 (IPCC AR5 WG1 Ch 8 Table 8.A.1, the default set);
// R-410A is 50 % HFC-32 + 50 % HFC-125 and R-404A 44 % HFC-125 + 52 %
// HFC-143a + 4 % HFC-134a by mass (ANSI/ASHRAE Standard 34).
const (
	gwpR410A   = 0.5*677 + 0.5*3170
	gwpR404A   = 0.44*3170 + 0.52*4800 + 0.04*1300
	gwpHFC134a = 1300
	kgPerLb    = 0.45359237 // NIST SP 811 (exact)
)

// TestRefrigerantTopUps: a log of top-ups by gas is computed with
// refrigerant_co2e, each row from its own unit.
func TestRefrigerantTopUps(t *testing.T) {
	rep := scanWith(t, "fgas.xlsx", "F-gas log", [][]any{
		{"Refrigerant log 2024"},
		{},
		{"Unit ID", "Location", "Refrigerant", "Top-up", "Unit"},
		{"AC-01", "Office", "R-410A", 2.5, "kg"},
		{"CH-02", "Kitchen", "R-404A", 1.2, "kg"},
		{"AC-03", "Server room", "HFC-134a", 3, "lb"},
	}, Options{})
	if len(rep.Tables) != 1 || rep.Tables[0].Kind != kindRefrigerant {
		t.Fatalf("tables %+v, want one refrigerant table; findings %s", rep.Tables, listFindings(rep))
	}
	if rep.Computed != 3 {
		t.Errorf("computed %d rows, want 3; findings %s", rep.Computed, listFindings(rep))
	}
	want := (2.5*gwpR410A + 1.2*gwpR404A + 3*kgPerLb*gwpHFC134a) / 1000
	if got := rep.Totals.TCO2e; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g", got, want)
	}
	if got := rep.Totals.TCO2; got != 0 {
		t.Errorf("tCO2 %g, want 0: a refrigerant is no CO2", got)
	}
	if got, want := rep.Rules, "tCO2e = refrigerant_co2e(refrigerant, top_up, unit)"; len(got) != 1 || got[0] != want {
		t.Errorf("rules %q, want %q", got, want)
	}
}

// TestRefrigerantChargesOnly: an equipment list with full charges and no
// top-up is read, and each row says why it is not an emission.
func TestRefrigerantChargesOnly(t *testing.T) {
	rep := scanWith(t, "assets.xlsx", "Equipment", [][]any{
		{"Asset", "Refrigerant", "Full charge (kg)"},
		{"Chiller 1", "R-134a", 120},
		{"Split AC 4", "R-410A", 3.2},
	}, Options{})
	if len(rep.Tables) != 1 || rep.Tables[0].Kind != kindCharge {
		t.Fatalf("tables %+v, want one %s table; findings %s", rep.Tables, kindCharge, listFindings(rep))
	}
	if rep.Computed != 0 || rep.Totals.TCO2e != 0 {
		t.Errorf("computed %d rows, %g t CO2e; want none", rep.Computed, rep.Totals.TCO2e)
	}
	for _, cell := range []string{"C2", "C3"} {
		if w := wantFinding(t, rep, "Equipment", cell, SevInfo, CodeNotComputed); !strings.Contains(w.Message, "not what leaked") {
			t.Errorf("%s: %q", cell, w.Message)
		}
	}
}

// TestRefrigerantUnknownGas: a gas the tables do not know is an error at
// its cell; the other rows are computed.
func TestRefrigerantUnknownGas(t *testing.T) {
	rep := scanWith(t, "fgas.xlsx", "Leaks", [][]any{
		{"Refrigerant", "Leak (kg)"},
		{"R-410A", 1},
		{"R-134a", 2},
		{"R-9999Z", 1},
	}, Options{})
	if rep.Computed != 2 {
		t.Errorf("computed %d rows, want 2; findings %s", rep.Computed, listFindings(rep))
	}
	wantFinding(t, rep, "Leaks", "A4", SevError, CodeRuleError)
}

// TestRefrigerantQuantityColumn: "Quantity (kg)" beside a refrigerant
// column is the mass released; a charge beside it is not read.
func TestRefrigerantQuantityColumn(t *testing.T) {
	rep := scanWith(t, "service.xlsx", "Service log", [][]any{
		{"Asset", "Gas", "Full charge (kg)", "Quantity (kg)"},
		{"AC-1", "R-410A", 4, 0.5},
		{"AC-2", "R-410A", 6, 1.5},
	}, Options{})
	if got, want := rep.Totals.TCO2e, 2*gwpR410A/1000; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; rules %v findings %s", got, want, rep.Rules, listFindings(rep))
	}
}
