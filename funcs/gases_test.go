package funcs

import (
	"math"
	"math/big"
	"strings"
	"testing"
)

// TestResolveGas reads names as refrigerant logs write them.
func TestResolveGas(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct{ name, id string }{
		{"R-410A", "r410a"}, {"R410a", "r410a"}, {"r 410 a", "r410a"}, {"410A", "r410a"}, {"HFC-410A", "r410a"}, {"R-410B", "r410b"},
		{"HFC-134a", "hfc_134a"}, {"R-134a", "hfc_134a"}, {"R134A", "hfc_134a"}, {"134a", "hfc_134a"}, {"HFC 134a", "hfc_134a"},
		{"hfc_134a", "hfc_134a"}, {"1,1,1,2-tetrafluoroethane", "hfc_134a"}, {"R-134", "hfc_134"},
		{"SF6", "sf6"}, {"SF₆", "sf6"}, {"sulphur hexafluoride", "sf6"}, {"NF3", "nf3"},
		{"R-22", "hcfc_22"}, {"22", "hcfc_22"}, {"HCFC-22", "hcfc_22"}, {"Freon 22", "hcfc_22"},
		{"c-C4F8", "c_c4f8"}, {"R-C318", "c_c4f8"}, {"PFC-C-318", "c_c4f8"}, {"PFC-14", "cf4"}, {"R-116", "c2f6"},
		{"HFO-1234ze(E)", "hfo_1234ze_e"}, {"R-1234ze", "hfo_1234ze_e"}, {"HFC-1234yf", "hfo_1234yf"}, {"R1234yf", "hfo_1234yf"},
		{"HFC-43-10mee", "hfc_43_10mee"}, {"HFC-4310mee", "hfc_43_10mee"},
		{"R-744", "co2"}, {"CO₂", "co2"}, {"carbon dioxide", "co2"}, {"R-290", "propane"}, {"R-600a", "isobutane"}, {"R-717", "ammonia"},
		{"ch4_non_fossil", "ch4_nonfossil"}, {"CH4 biogenic", "ch4_nonfossil"}, {"CH4 fossil", "ch4_fossil"},
		{"R-507A", "r507a"}, {"507a", "r507a"}, {"R-508B", "r508b"}, {"R-513A", "r513a"},
	} {
		g, err := e.ResolveGas(c.name)
		if err != nil {
			t.Errorf("ResolveGas(%q): %v", c.name, err)
			continue
		}
		if g.ID != c.id {
			t.Errorf("ResolveGas(%q) = %s, want %s", c.name, g.ID, c.id)
		}
	}
	for _, c := range []struct{ name, suggestion string }{
		{"R-410", "R-410A or R-410B"}, {"R-404", "R-404A"}, {"sf7", "SF6"}, {"HFC-134b", "HFC-134"},
		{"HFO-1234ze(Z)", "HFO-1234ze(E)"}, {"R-999X", ""}, {"", ""}, {strings.Repeat("R", 500), ""},
	} {
		_, err := e.ResolveGas(c.name)
		fe, ok := AsError(err)
		if !ok || fe.Code != CodeBadArgument || fe.Param != "gas" {
			t.Errorf("ResolveGas(%q): %v, want a bad-argument error for gas", c.name, err)
			continue
		}
		if has := strings.Contains(fe.Msg, "(did you mean "); has != (c.suggestion != "") || has && !strings.Contains(fe.Msg, "(did you mean "+c.suggestion+"?)") {
			t.Errorf("ResolveGas(%q): %s; want suggestion %q", c.name, fe.Msg, c.suggestion)
		}
	}
	// a family prefix is dropped before blend numbers only: HFC-22 is not quietly HCFC-22
	if _, err := e.ResolveGas("HFC-22"); err == nil {
		t.Error("HFC-22 resolved")
	}
}

// TestGases checks the listing: every blend's fractions sum to 1, every component is a pure gas
// of the listing, and the counts the documentation states.
func TestGases(t *testing.T) {
	e := newTestEngine(t)
	gases := e.Gases()
	byID := map[string]GasInfo{}
	kinds := map[string]int{}
	for _, g := range gases {
		byID[g.ID] = g
		kinds[g.Kind]++
	}
	if kinds["blend"] != 44 || kinds["hfc"] != 19 || kinds["pfc"] != 7 || kinds["sf6"] != 1 || kinds["nf3"] != 1 {
		t.Errorf("kinds %v", kinds)
	}
	for _, g := range gases {
		if g.Kind != "blend" {
			if len(g.Components) != 0 {
				t.Errorf("%s: a pure gas with components", g.ID)
			}
			continue
		}
		sum := 0.0
		for _, c := range g.Components {
			sum += c.MassFraction
			if p, ok := byID[c.Gas]; !ok || p.Kind == "blend" {
				t.Errorf("%s: component %s is not a pure gas", g.ID, c.Gas)
			}
		}
		if math.Abs(sum-1) > 1e-12 || g.Source == "" {
			t.Errorf("%s: fractions sum to %v, source %q", g.ID, sum, g.Source)
		}
	}
	r410a := byID["r410a"]
	if r410a.Name != "R-410A" || len(r410a.Components) != 2 || r410a.Components[0] != (GasComponent{Gas: "hfc_32", Name: "HFC-32", MassFraction: 0.5}) {
		t.Errorf("r410a: %+v", r410a)
	}
	// the listing is a copy
	gases[0].Name = "changed"
	r410a.Components[0].Gas = "changed"
	if e.Gases()[0].Name == "changed" || e.Gases()[len(gases)-1].Components == nil {
		t.Error("Gases shares its slices")
	}
	if g, _ := e.ResolveGas("R-410A"); g.Components[0].Gas != "hfc_32" {
		t.Error("ResolveGas shares its components")
	}
}

// TestGasTablesErrors: the loaders refuse malformed tables, naming file, line and column.
func TestGasTablesErrors(t *testing.T) {
	base, err := embeddedGasTables()
	if err != nil {
		t.Fatal(err)
	}
	ps, err := loadPacks(nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	const blendHeader = "blend,name,component,mass_fraction,source,from_memory\n"
	for _, c := range []struct {
		blends, names, want string
	}{
		{blends: blendHeader + "r410a,R-410A,hfc_32,0.5,ASHRAE 34,false\nr410a,R-410A,hfc_125,0.49,ASHRAE 34,false\n",
			want: "b.csv:2: column mass_fraction: the mass fractions of R-410A sum to 0.99, not 1"},
		{blends: blendHeader + "r410a,R-410A,hfc_32,0.5,ASHRAE 34,false\nr410a,R-410A,hfc_125,0.6,ASHRAE 34,false\n",
			want: "b.csv:2: column mass_fraction: the mass fractions of R-410A sum to 1.1, not 1"},
		{blends: blendHeader + "r410a,R-410A,hfc_32,0.5,ASHRAE 34,false\nr410a,R-410A,hfc_999,0.5,ASHRAE 34,false\n",
			want: `b.csv:3: column component: component "hfc_999" is not a gas of gases_table.csv`},
		{blends: blendHeader + "r410a,R-410A,hfc_32,1.5,ASHRAE 34,false\n",
			want: `b.csv:2: column mass_fraction: mass_fraction "1.5" must be a decimal in (0, 1]`},
		{blends: blendHeader + "r410a,R-410A,hfc_32,1,ASHRAE 34,true\n",
			want: `b.csv:2: column from_memory: from_memory is "true": a source says "from memory" exactly when from_memory is true`},
		{blends: blendHeader + "r410a,R-410A,hfc_32,1,ASHRAE 34,false\nr404a,R-404A,hfc_125,1,ASHRAE 34,false\nr410a,R-410A,hfc_32,1,ASHRAE 34,false\n",
			want: `b.csv:4: column blend: r410a is listed twice or is also a gas id; the rows of a blend stay together`},
		{blends: "blend,component\n", want: "b.csv:1: header must be blend,name,component,mass_fraction,source,from_memory"},
		{names: "name,gas,source,from_memory\nR-410A,r404a,common practice,false\n",
			want: `n.csv:2: column name: name "R-410A" is already a name of R-410A (id r410a)`},
		{names: "name,gas,source,from_memory\nR-9,hfc_999,common practice,false\n",
			want: `n.csv:2: column gas: no gas "hfc_999" in gases_table.csv or refrigerant_blends_table.csv`},
		{names: "name,gas,source,from_memory\nR-9,hfc_32,,false\n",
			want: `n.csv:2: column source: empty source: every name says where it comes from, or common practice`},
	} {
		tables := base
		tables.blendFile, tables.nameFile = "b.csv", "n.csv"
		if c.blends != "" {
			tables.blends = []byte(c.blends)
		}
		if c.names != "" {
			tables.names = []byte(c.names)
		}
		_, err := newGasIndex(ps, tables)
		if err == nil || err.Error() != c.want {
			t.Errorf("got %v\nwant %s", err, c.want)
		}
	}
}

// TestUserPackGases: a user pack adds a gas of its own (kind custom) and can replace a blend's
// computed GWP with a row for the blend id.
func TestUserPackGases(t *testing.T) {
	e, err := New(WithFactorData("mine.csv", []byte("pack,id,quantity,value,unit,source\n"+
		"common,test_gas,gwp100_ar5,42,1,a lab report\n"+
		"common,r410a,gwp100_ar5,2000,1,a supplier sheet\n")))
	if err != nil {
		t.Fatal(err)
	}
	g, err := e.ResolveGas("Test Gas")
	if err != nil || g.Kind != "custom" {
		t.Fatalf("custom gas: %+v %v", g, err)
	}
	if r, err := evalExpr(e, `refrigerant_co2e("test_gas", 1000, "kg")`); err != nil || r.Value != 42 {
		t.Errorf("custom gas: %v %v", r.Value, err)
	}
	if r, err := evalExpr(e, `gwp("R-410A")`); err != nil || r.Value != 2000 || r.FactorKeys()[0] != "common/r410a/gwp100_ar5" {
		t.Errorf("blend row: %v %v %v", r.Value, r.FactorKeys(), err)
	}
	if r, err := evalExpr(e, `gwp("R-410A", "ar4")`); err != nil || r.Value != 2087.5 {
		t.Errorf("blend in another set: %v %v", r.Value, err)
	}
	// an id that reads as another gas's name would be unreachable: refused, naming the row
	_, err = New(WithFactorData("mine.csv", []byte("pack,id,quantity,value,unit,source\ncommon,r_1234ze,gwp100_ar5,1,1,a lab report\n")))
	want := `factors: mine.csv:2: column id: GWP-100 row for "r_1234ze": name "r_1234ze" is already a name of HFO-1234ze(E) (id hfo_1234ze_e); give that gas's id to replace its value, or choose another id`
	if err == nil || err.Error() != want {
		t.Errorf("got %v\nwant %s", err, want)
	}
}

// TestGWPRowsCited: every GWP row of the gas pack names an IPCC table and agrees with its
// from_memory flag; a bound row ("<1") has low 0 and high = value.
func TestGWPRowsCited(t *testing.T) {
	e := newTestEngine(t)
	n := 0
	for _, f := range e.packs.packs[CommonPack].sorted() {
		if !strings.HasSuffix(f.File, "gwp100.csv") {
			continue
		}
		n++
		if !strings.HasPrefix(f.Source, "IPCC AR") || !strings.Contains(f.Source, "Table") {
			t.Errorf("%s: source %q", f.Key(), f.Source)
		}
		if f.FromMemory != strings.Contains(f.Source, "from memory") {
			t.Errorf("%s: from_memory %v, source %q", f.Key(), f.FromMemory, f.Source)
		}
		if f.Low != nil && (*f.Low != 0 || f.High == nil || *f.High != f.Value) {
			t.Errorf("%s: a range is used only for a bound", f.Key())
		}
		if e.gases.byID[f.ID] == nil || e.gases.byID[f.ID].info.Kind == "custom" {
			t.Errorf("%s: not a gas of gases_table.csv", f.Key())
		}
	}
	if n != 124 {
		t.Errorf("%d rows in gwp100.csv, want 124", n)
	}
	one := big.NewRat(1, 1)
	for _, g := range e.gases.ordered {
		sum := new(big.Rat)
		for _, p := range g.parts {
			sum.Add(sum, p.frac)
		}
		if g.parts != nil && sum.Cmp(one) != 0 {
			t.Errorf("%s sums to %s", g.info.ID, sum)
		}
	}
}
