package funcs

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const packHeader = "pack,id,quantity,value,unit,low,high,basis,source,from_memory\n"

func writeFile(t *testing.T, name, content string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestUserPackErrors: a malformed file is refused with file:line and the
// reason, and nothing is half-loaded.
func TestUserPackErrors(t *testing.T) {
	tests := []struct {
		name, content, want string
	}{
		{"empty", "", "empty.csv:1: empty file: expected a header row with id, quantity, value, unit, source"},
		{"nocol", "id,quantity,value,unit\nnatural_gas,co2_ef,1,kg CO2/TJ\n", "nocol.csv:1: missing column source (required: id, quantity, value, unit, source)"},
		{"badcol", "id,quantity,value,unit,source,colour\n", `badcol.csv:1: unknown column "colour": accepted are pack, id, quantity, value, unit, low, high, basis, source, from_memory, note`},
		{"value", packHeader + "acme,natural_gas,co2_ef,abc,kg CO2/TJ,,,NCV,Acme audit 2026,false\n", `value.csv:2: column value: value "abc" is not a number`},
		{"unit", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/furlong,,,NCV,Acme audit 2026,false\n", `unit.csv:2: unit "kg CO2/furlong" for co2_ef: unknown unit "furlong": accepted units are listed by 'fluecell units'`},
		{"species", packHeader + "acme,natural_gas,co2_ef,56100,kg CH4/TJ,,,NCV,Acme audit 2026,false\n", `species.csv:2: unit "kg CH4/TJ" for co2_ef: expected CO2 emission factor, e.g. kg CO2/TJ`},
		{"basis", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,,,,Acme audit 2026,false\n", "basis.csv:2: co2_ef per energy needs a basis: write NCV or HHV in the basis column"},
		{"range", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,57000,58000,NCV,Acme audit 2026,false\n", "range.csv:2: value 56100 lies outside its range low..high"},
		{"quantity", packHeader + "acme,natural_gas,colour,1,1,,,,Acme,false\n", `quantity.csv:2: unknown quantity "colour": accepted are ncv, gcv, density, co2_ef, ch4_ef, n2o_ef, carbon_content, ncv_per_gcv, biogenic_fraction, capacity_factor, lifecycle, direct, lifetime, gtc_per_ppm, molar_mass, gwp100_<set>`},
		{"source", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,,,NCV,,false\n", "source.csv:2: column source: empty source: every row names its publication and table"},
		{"dup", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,,,NCV,A,false\nacme,natural_gas,co2_ef,56000,kg CO2/TJ,,,NCV,A,false\n", "dup.csv:3: natural_gas/co2_ef is given twice in this file (also line 2)"},
		{"id", packHeader + "acme,Natural Gas,co2_ef,56100,kg CO2/TJ,,,NCV,A,false\n", `id.csv:2: column id: id "Natural Gas" must be lower-case letters, digits and underscores, such as natural_gas`},
		{"fraction", packHeader + ",coal,ncv_per_gcv,1.2,1,,,,A,false\n", "fraction.csv:2: value 1.2 for ncv_per_gcv must lie in (0, 1]"},
		{"memory", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,,,NCV,A,maybe\n", `memory.csv:2: column from_memory: from_memory "maybe": accepted are true or false`},
		{"quote", packHeader + "acme,natural_gas,co2_ef,56100,\"kg CO2/TJ,,,NCV,A,false\n", "quote.csv:2: extraneous or missing \" in quoted-field"},
		{"fields", packHeader + "acme,natural_gas,co2_ef,56100,kg CO2/TJ,,,NCV,A,false,extra\n", "fields.csv:2: 11 fields, but the header has 10"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := writeFile(t, tt.name+".csv", tt.content)
			_, err := New(WithFactorFiles(path))
			if err == nil {
				t.Fatal("loaded")
			}
			fe, ok := AsError(err)
			if !ok || fe.Code != CodePack {
				t.Fatalf("error %v is not a pack error", err)
			}
			got := strings.TrimPrefix(fe.Msg, filepath.Dir(path)+string(filepath.Separator))
			if !strings.HasPrefix(got, tt.want) {
				t.Errorf("got  %s\nwant %s", got, tt.want)
			}
		})
	}
	if _, err := New(WithFactorFiles(filepath.Join(t.TempDir(), "missing.csv"))); err == nil || !strings.Contains(err.Error(), "cannot read factor file") {
		t.Errorf("missing file: %v", err)
	}
}

// TestUserPackOverrides: later files override earlier ones row by row; an
// empty pack column applies to every pack; a new pack becomes selectable;
// a new fuel id becomes a fuel.
func TestUserPackOverrides(t *testing.T) {
	first := writeFile(t, "supplier.csv", packHeader+
		",natural_gas,co2_ef,56000,kg CO2/TJ,,,NCV,Hollinsmere Gas supply contract 2026 (demo),false\n"+
		"acme,acme_blend,ncv,40,TJ/Gg,,,NCV,Acme lab report 7 (demo),false\n"+
		"acme,acme_blend,co2_ef,70000,kg CO2/TJ,,,NCV,Acme lab report 7 (demo),false\n")
	second := writeFile(t, "later.csv", "id,quantity,value,unit,basis,source\n"+
		"natural_gas,co2_ef,55900,kg CO2/TJ,NCV,Hollinsmere Gas revised 2026 (demo)\n")
	e, err := New(WithFactorFiles(first, second))
	if err != nil {
		t.Fatal(err)
	}
	r, err := e.CallValues("fuel_co2", "natural_gas", 1.0, "TJ")
	if err != nil || r.Value != 55.9 {
		t.Errorf("override: %v %v", r.Value, err)
	}
	if got := r.Sources[0].Source; got != "Hollinsmere Gas revised 2026 (demo)" {
		t.Errorf("source %q", got)
	}
	r, err = e.CallValues("fuel_co2", "natural_gas", 1.0, "TJ", "epa2025")
	if err != nil || r.Value != 55.9 {
		t.Errorf("empty pack applies to epa2025 too: %v %v", r.Value, err)
	}
	r, err = e.CallValues("fuel_co2", "acme blend", 1.0, "Gg", "acme")
	if err != nil || r.Value != 2800 {
		t.Errorf("user pack and fuel: %v %v", r.Value, err)
	}
	if got := strings.Join(e.PackNames(), ","); got != "acme,epa2025,ipcc2006" {
		t.Errorf("packs %s", got)
	}
	base := newTestEngine(t)
	if base.Version() == e.Version() {
		t.Error("version does not change with user rows")
	}
	// The embedded engine is untouched by another engine's user packs.
	if r, _ := base.CallValues("fuel_co2", "natural_gas", 1.0, "TJ"); r.Value != 56.1 {
		t.Errorf("base engine changed: %v", r.Value)
	}
}

// TestEmbeddedPacks checks the shape of the embedded packs: every row has
// a source; the design's fuel ids are present; from-memory rows say so.
func TestEmbeddedPacks(t *testing.T) {
	e := newTestEngine(t)
	for _, p := range []string{"ipcc2006", "epa2025"} {
		rows, err := e.Factors(p, "")
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range rows {
			if f.Source == "" {
				t.Errorf("%s: no source", f.Key())
			}
			if f.FromMemory != strings.Contains(strings.ToLower(f.Source), "memory") {
				t.Errorf("%s: from_memory %v but source %q", f.Key(), f.FromMemory, f.Source)
			}
		}
	}
	ipcc := []string{"crude_oil", "motor_gasoline", "jet_kerosene", "other_kerosene", "gas_diesel_oil", "residual_fuel_oil", "lpg",
		"natural_gas", "anthracite", "coking_coal", "other_bituminous_coal", "sub_bituminous_coal", "lignite", "peat", "wood", "petroleum_coke"}
	for _, id := range ipcc {
		for _, q := range []string{"ncv", "co2_ef", "ch4_ef", "n2o_ef", "carbon_content"} {
			if e.packs.lookup("ipcc2006", id, q) == nil {
				t.Errorf("ipcc2006 lacks %s/%s", id, q)
			}
		}
	}
	epa := []string{"anthracite", "other_bituminous_coal", "sub_bituminous_coal", "lignite", "natural_gas", "gas_diesel_oil",
		"residual_fuel_oil", "propane", "lpg", "motor_gasoline", "other_kerosene"}
	for _, id := range epa {
		for _, q := range []string{"gcv", "co2_ef", "ch4_ef", "n2o_ef"} {
			if f := e.packs.lookup("epa2025", id, q); f == nil || f.BasisName != "HHV" {
				t.Errorf("epa2025 lacks %s/%s on HHV", id, q)
			}
		}
	}
	infos := e.Packs()
	if len(infos) != 3 || infos[len(infos)-1].Name != CommonPack {
		t.Errorf("packs %+v", infos)
	}
}
