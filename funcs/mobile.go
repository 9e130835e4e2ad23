package funcs

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Mobile combustion: fuel burned in vehicles, machines, trains, ships and aircraft. CO2
// depends on the fuel alone; CH4 and N2O depend on the engine and its emission controls,
// so they are chosen by a mode (IPCC 2006 Guidelines Vol 2 Ch 3). A pack holds a mode's
// factors as rows ch4_ef_<mode> and n2o_ef_<mode> of the fuel (data/*_mobile.csv). CO2 is
// the pack's co2_ef_mobile row when it has one (the US EPA Hub's Table 2, per gallon as
// printed), else its stationary co2_ef row: the IPCC mobile tables repeat the Table 1.4
// defaults.

// mobileMode is a way of burning fuel in transport, with the tables that give its factors.
type mobileMode struct {
	name  string // our name, the value of the mode parameter
	title string
	ipcc  string // the IPCC 2006 table of the mode's CO2 defaults (equal to Vol 2 Ch 1 Table 1.4)
}

// mobileModes lists the modes in the order of IPCC 2006 Vol 2 Ch 3.
func mobileModes() []mobileMode {
	const ch3 = "IPCC 2006 Guidelines Vol 2 Ch 3 "
	road, offroad := ch3+"Table 3.2.1", ch3+"Table 3.3.1"
	return []mobileMode{
		{name: "road", title: "road vehicles, one default per fuel", ipcc: road},
		{name: "road_uncontrolled", title: "road vehicles without emission controls", ipcc: road},
		{name: "road_oxidation_catalyst", title: "road vehicles with an oxidation catalyst", ipcc: road},
		{name: "road_low_mileage_1995", title: "low-mileage light-duty road vehicles of 1995 or later", ipcc: road},
		{name: "offroad_agriculture", title: "off-road machinery in agriculture (diesel)", ipcc: offroad},
		{name: "offroad_forestry", title: "off-road machinery in forestry (diesel)", ipcc: offroad},
		{name: "offroad_industry", title: "off-road machinery in industry (diesel)", ipcc: offroad},
		{name: "offroad_household", title: "off-road machinery in households (diesel)", ipcc: offroad},
		{name: "offroad_agriculture_4stroke", title: "four-stroke gasoline machinery in agriculture", ipcc: offroad},
		{name: "offroad_industry_4stroke", title: "four-stroke gasoline machinery in industry", ipcc: offroad},
		{name: "offroad_household_4stroke", title: "four-stroke gasoline machinery in households", ipcc: offroad},
		{name: "offroad_agriculture_2stroke", title: "two-stroke gasoline machinery in agriculture", ipcc: offroad},
		{name: "offroad_forestry_2stroke", title: "two-stroke gasoline machinery in forestry", ipcc: offroad},
		{name: "offroad_industry_2stroke", title: "two-stroke gasoline machinery in industry", ipcc: offroad},
		{name: "offroad_household_2stroke", title: "two-stroke gasoline machinery in households", ipcc: offroad},
		{name: "rail", title: "railway locomotives", ipcc: ch3 + "Table 3.4.1"},
		{name: "navigation", title: "ships and boats (ocean-going ships)", ipcc: ch3 + "Table 3.5.2"},
		{name: "aviation", title: "aircraft", ipcc: ch3 + "Table 3.6.4"},
	}
}

func modeNames() []string {
	var out []string
	for _, m := range mobileModes() {
		out = append(out, m.name)
	}
	return out
}

// mobileCO2 is the quantity of a pack's CO2 factor per unit of fuel as its mobile table prints it.
const mobileCO2 = "co2_ef_mobile"

// mobileQuantities are the quantities of mobile combustion rows.
func mobileQuantities() map[string]quantitySpec {
	m := map[string]quantitySpec{
		mobileCO2: {numDim: units.Mass, species: "CO2", den: anyAmount(), doc: "CO2 emission factor of a fuel in transport as a mobile table prints it, e.g. kg CO2/gal"},
	}
	for _, md := range mobileModes() {
		m["ch4_ef_"+md.name] = quantitySpec{numDim: units.Mass, species: "CH4", den: anyAmount(), doc: "CH4 emission factor of " + md.title + ", e.g. kg CH4/TJ"}
		m["n2o_ef_"+md.name] = quantitySpec{numDim: units.Mass, species: "N2O", den: anyAmount(), doc: "N2O emission factor of " + md.title + ", e.g. kg N2O/TJ"}
	}
	return m
}

// resolveMode reads a mode name, case-insensitively, with "-" or " " for "_".
func resolveMode(s string) (mobileMode, error) {
	k := strings.ToLower(strings.TrimSpace(s))
	k = strings.NewReplacer("-", "_", " ", "_").Replace(k)
	for _, m := range mobileModes() {
		if m.name == k {
			return m, nil
		}
	}
	msg := "unknown mode " + quote(s) + ": accepted are " + strings.Join(modeNames(), ", ")
	if g := suggestFrom(k, modeNames()); g != "" {
		msg += " (did you mean " + g + "?)"
	}
	return mobileMode{}, &Error{Code: CodeBadArgument, Param: "mode", Msg: msg}
}

func checkMode(_ *Engine, s string) error {
	_, err := resolveMode(s)
	return err
}

const (
	kindMobileCO2 planKind = iota + 16
	kindMobileCO2e
)

// mobilePlan fills p with the CO2 (kindMobileCO2) or CO2e of fuel burned in the mode key.sector.
func (e *Engine) mobilePlan(p *plan, key planKey, packName string, fuel *Fuel, u units.Unit) error {
	mode, err := resolveMode(key.sector)
	if err != nil {
		return err
	}
	co2, co2Note := mobileCO2, "CO2 of "+fuel.ID+" in transport as the pack's mobile table prints it"
	if e.fuelRow(packName, fuel, mobileCO2) == nil {
		co2, co2Note = "co2_ef", "CO2 from the fuel's default factor (IPCC 2006 Vol 2 Ch 1 Table 1.4; "+mode.ipcc+" gives the same default)"
		if packName != DefaultPack {
			co2Note = "CO2 from the fuel's stationary factor of pack " + packName + " (the pack has no mobile CO2 row for " + fuel.ID + ")"
		}
	}
	modeNote := "mode " + mode.name + ": CH4 and N2O of " + mode.title
	if key.kind == kindMobileCO2 {
		k, fs, uses, notes, err := e.emission(packName, fuel, u, co2)
		if err != nil {
			return err
		}
		p.exact, p.unit = k, "t CO2"
		p.terms = []planTerm{newTerm(k, uses)}
		p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)
		p.notes = append(p.notes, co2Note, "mode "+mode.name+" ("+mode.title+"): CO2 depends on the fuel alone")
		if bio := e.biogenicFraction(packName, fuel); bio.Sign() > 0 {
			p.notes = append(p.notes, biogenicNote(fuel, bio)+"; mobile_co2e leaves it out")
		}
		return nil
	}
	ch4, n2o := "ch4_ef_"+mode.name, "n2o_ef_"+mode.name
	if e.fuelRow(packName, fuel, ch4) == nil || e.fuelRow(packName, fuel, n2o) == nil {
		return e.missingMode(packName, fuel, mode)
	}
	set, err := e.resolveGWPSet(key.to)
	if err != nil {
		return err
	}
	if err := e.co2ePlan(p, packName, fuel, u, set, co2, ch4, n2o); err != nil {
		return err
	}
	p.notes = append(p.notes, co2Note, modeNote)
	return nil
}

// missingMode is the error for a fuel without CH4 and N2O factors in a mode: it names the
// modes the pack has for the fuel and the packs that have the mode.
func (e *Engine) missingMode(packName string, fuel *Fuel, mode mobileMode) error {
	msg := "pack " + packName + " has no CH4 and N2O factors for " + fuel.ID + " in mode " + mode.name + " (" + mode.title + ")"
	var have []string
	for _, m := range mobileModes() {
		if e.fuelRow(packName, fuel, "ch4_ef_"+m.name) != nil {
			have = append(have, m.name)
		}
	}
	if len(have) > 0 {
		msg += "; its modes for " + fuel.ID + ": " + strings.Join(have, ", ")
	} else {
		msg += "; it has no mobile CH4 and N2O for " + fuel.ID
	}
	if others := e.packs.packsWith(fuel.ID, "ch4_ef_"+mode.name); len(others) > 0 {
		msg += "; pack " + strings.Join(others, ", ") + " has this mode (pass it as pack)"
	}
	if packName == "epa2025" && strings.HasPrefix(mode.name, "road") {
		msg += "; the US EPA Hub gives on-road CH4 and N2O per vehicle-mile, not per gallon"
	}
	return &Error{Code: CodeMissingFactor, Param: "mode", Msg: msg}
}

// callMobile reads fuel, amount, unit, mode [, gwp_set] [, pack].
func callMobile(kind planKind) func(e *Engine, c *callCtx, a argList) (float64, string, error) {
	return func(e *Engine, c *callCtx, a argList) (float64, string, error) {
		fuel, err := a.str(0)
		if err != nil {
			return 0, "", err
		}
		amount, err := a.num(1)
		if err != nil {
			return 0, "", err
		}
		unit, err := a.str(2)
		if err != nil {
			return 0, "", err
		}
		mode, err := a.str(3)
		if err != nil {
			return 0, "", err
		}
		set, packIndex := "", 4
		if kind == kindMobileCO2e {
			if set, err = a.optStr(4, DefaultGWPSet); err != nil {
				return 0, "", err
			}
			packIndex = 5
		}
		pack, err := a.optStr(packIndex, "")
		if err != nil {
			return 0, "", err
		}
		p, err := e.planFor(c, planKey{kind: kind, pack: pack, fuel: fuel, unit: unit, to: set, sector: mode})
		if err != nil {
			return 0, "", withFunc(err, a.fn.Name)
		}
		c.use(p.factors...)
		c.note(p.notes...)
		if p.memoPrefix != "" {
			c.note(p.memoNote(amount))
		}
		c.recordTerms(p.terms, &p.iv, amount, ActivityMobileFuel)
		return p.apply(amount), p.unit, nil
	}
}

// mobileFunctions declares mobile_co2 and mobile_co2e.
func mobileFunctions(e *Engine) []*Function {
	fuel := paramStr("fuel", "fuel id or alias, e.g. diesel, gasoline, jet fuel (case- and space-insensitive)").with(kindFuel)
	amount := paramNum("amount", "the unit given in unit", "quantity of fuel used")
	amountUnit := Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "unit of amount: energy (GJ, MMBtu HHV...), mass (t, kg...) or volume (L, gal, Sm3, scf...)", kind: kindAmountUnit}
	mode := paramStr("mode", "how the fuel is burned, choosing the CH4 and N2O factors: road (diesel, natural gas, LPG), road_uncontrolled / road_oxidation_catalyst / road_low_mileage_1995 (gasoline), offroad_<agriculture|forestry|industry|household> (diesel) with _4stroke or _2stroke for gasoline, rail, navigation, aviation", modeNames()...).checked(checkMode)
	gwpSet := optional(paramStr("gwp_set", "IPCC assessment whose GWP-100 values weight CH4 and N2O", e.gwpSets()...), DefaultGWPSet).with(kindGWPSet)
	pack := optional(paramStr("pack", "factor pack", e.PackNames()...), e.defaultPack).with(kindPack)
	sources := []string{"IPCC 2006 Guidelines Vol 2 Ch 3 Tables 3.2.1-3.2.2, 3.3.1, 3.4.1, 3.5.2-3.5.3, 3.6.4-3.6.5", "IPCC 2006 Guidelines Vol 2 Ch 1 Tables 1.2, 1.4",
		"US EPA GHG Emission Factors Hub 2025 Tables 2 and 5"}
	return []*Function{
		{Name: "mobile_co2", Doc: "CO2 from fuel burned in transport or machinery (mobile combustion, Tier 1); the mode is named in the result. Biogenic CO2 is returned with a note to report it separately.",
			ResultUnit: "t CO2", Params: []Param{fuel, amount, amountUnit, mode, pack},
			Example: `mobile_co2("diesel", 1000, "GJ", "road")`, ExampleResult: 74.1, Sources: sources, call: callMobile(kindMobileCO2)},
		{Name: "mobile_co2e", Doc: "CO2e from fuel burned in transport or machinery: CO2 + CH4 x GWP + N2O x GWP with the CH4 and N2O factors of the mode. Biogenic CO2 is excluded.",
			ResultUnit: "t CO2e", Params: []Param{fuel, amount, amountUnit, mode, gwpSet, pack},
			Example: `mobile_co2e("diesel", 1000, "GJ", "road")`, ExampleResult: 74.1 + 3.9e-3*28 + 3.9e-3*265, Sources: append(sources, "IPCC AR5 WG1 Ch 8 Table 8.A.1"), call: callMobile(kindMobileCO2e)},
	}
}
