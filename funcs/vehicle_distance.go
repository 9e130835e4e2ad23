package funcs

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Distance-based emissions of road vehicles: vehicle_co2e(distance, unit, vehicle [, gwp_set
// [, set]]). When only the distance driven is known, published tables give emissions per
// vehicle-km or vehicle-mile by vehicle type. Each table is a set; its rows live in the common
// pack (data/vehicle_distance.csv) with the id <set>_<vehicle>. A set that splits the gases has
// co2_per_distance, ch4_per_distance and n2o_per_distance rows, weighted by the caller's GWP set;
// a set that publishes CO2e only has co2e_per_distance rows, weighted by the GWPs its publisher
// chose. Vehicle ids are unique across sets, so the vehicle names its set. Fuel burned is
// mobile_co2e's job; vehicle_embodied is the production of vehicles, not their use.

// distanceSet is one published table of distance-based factors.
type distanceSet struct {
	name   string // our name, the value of the set parameter
	title  string
	basis  string // "vehicle-km" or "vehicle-mile"
	perGas bool   // CO2, CH4 and N2O rows; else CO2e rows only
	gwp    string // for a CO2e-only set, the GWP set its CO2e uses
}

// distanceSets lists the sets; vehicle_co2e takes the vehicle's own set unless set names one.
func distanceSets() []distanceSet {
	return []distanceSet{
		{name: "epa2021", title: "US EPA GHG Emission Factors Hub (15 September 2021), Tables 8 and 10: CO2, CH4 and N2O per vehicle-mile",
			basis: "vehicle-mile", perGas: true},
		{name: "uk2024", title: "UK Government GHG conversion factors for company reporting 2024: kg CO2e per vehicle-km (from memory, two significant figures)",
			basis: "vehicle-km", gwp: "ar5"},
	}
}

func distanceSetByName(name string) *distanceSet {
	for _, s := range distanceSets() {
		if s.name == name {
			return &s
		}
	}
	return nil
}

func distanceSetNames() []string {
	var out []string
	for _, s := range distanceSets() {
		out = append(out, s.name)
	}
	return out
}

// resolveDistanceSet reads a set name, case-insensitively.
func resolveDistanceSet(s string) (*distanceSet, error) {
	k := strings.ToLower(strings.TrimSpace(s))
	if set := distanceSetByName(k); set != nil {
		return set, nil
	}
	msg := "unknown set " + quote(s) + ": accepted are " + strings.Join(distanceSetNames(), ", ")
	if sug := suggestFrom(k, distanceSetNames()); sug != "" {
		msg += " (did you mean " + sug + "?)"
	}
	return nil, &Error{Code: CodeBadArgument, Param: "set", Msg: msg}
}

func checkDistanceSet(_ *Engine, s string) error {
	_, err := resolveDistanceSet(s)
	return err
}

func checkDistanceVehicle(e *Engine, s string) error {
	_, err := e.vehNames.resolve(s)
	return err
}

// distanceQuantities are the quantities of data/vehicle_distance.csv: a mass of a gas per length.
func distanceQuantities() map[string]quantitySpec {
	length := []units.Dimension{units.Length}
	return map[string]quantitySpec{
		"co2_per_distance":  {numDim: units.Mass, species: "CO2", den: length, doc: "CO2 of a vehicle per distance driven, e.g. kg CO2/mi"},
		"ch4_per_distance":  {numDim: units.Mass, species: "CH4", den: length, doc: "CH4 of a vehicle per distance driven, e.g. g CH4/mi"},
		"n2o_per_distance":  {numDim: units.Mass, species: "N2O", den: length, doc: "N2O of a vehicle per distance driven, e.g. g N2O/mi"},
		"co2e_per_distance": {numDim: units.Mass, species: "CO2e", den: length, doc: "CO2e of a vehicle per distance driven as its table publishes it, e.g. kg CO2e/km"},
	}
}

// distanceUnit parses a length unit; another dimension is an error naming the function for it.
func distanceUnit(s string) (units.Unit, error) {
	u, err := units.ParseAs(s, units.Length)
	if err == nil {
		return u, nil
	}
	fe := unitError("unit", err).(*Error)
	if fe.UnitCode == units.CodeDimension {
		fe.Msg += ": give the distance driven in km or mi; for an amount of fuel burned use mobile_co2e(fuel, amount, unit, mode)"
	}
	return units.Unit{}, fe
}

// vehicleFactor is the row of a vehicle in a set, or an error when the pack lacks it.
func (e *Engine) vehicleFactor(fn string, set *distanceSet, id, quantity string) (*Factor, error) {
	f := e.packs.lookup(CommonPack, set.name+"_"+id, quantity)
	if f == nil {
		return nil, &Error{Code: CodeMissingFactor, Func: fn, Param: "vehicle",
			Msg: "no " + set.name + "_" + id + "/" + quantity + " row in the common pack: add it with --factors"}
	}
	return f, nil
}

// callVehicleCO2e reads distance, unit, vehicle [, gwp_set [, set]] and returns t CO2e.
func callVehicleCO2e(e *Engine, c *callCtx, a argList) (float64, string, error) {
	fn := a.fn.Name
	distance, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	vs, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	gwpArg, err := a.optStr(3, "")
	if err != nil {
		return 0, "", err
	}
	setArg, err := a.optStr(4, "")
	if err != nil {
		return 0, "", err
	}
	p, err := e.vehiclePlan(vehicleKey{fn, us, vs, gwpArg, setArg})
	if err != nil {
		return 0, "", err
	}
	c.use(p.factors...)
	c.note(p.notes...)
	if distance < 0 {
		c.note(NegativeAmountNote)
	}
	c.recordTerms(p.terms, &p.iv, distance, ActivityDistance)
	return distance * p.tPerUnit, "", nil
}

// vehicleKey identifies a vehicle_co2e computation by its arguments other
// than the distance, as given.
type vehicleKey struct{ fn, unit, vehicle, gwp, set string }

// vehiclePlan is a cached vehicle_co2e computation: result = distance x
// tPerUnit t CO2e, with the rows and notes behind it.
type vehiclePlan struct {
	tPerUnit float64
	factors  []*Factor
	notes    []string
	terms    []planTerm   // t CO2e per unit distance, from the rows (interval_record.go)
	iv       planInterval // the 95 % interval per unit distance, computed once
}

// vehiclePlan resolves the unit, vehicle, set and factors of a call once per
// distinct set of arguments; rows of a workbook then cost one lookup.
func (e *Engine) vehiclePlan(key vehicleKey) (*vehiclePlan, error) {
	if p, ok := e.plans.Load(key); ok {
		return p.(*vehiclePlan), nil
	}
	fn, us, vs, gwpArg, setArg := key.fn, key.unit, key.vehicle, key.gwp, key.set
	c := &callCtx{}
	u, err := distanceUnit(us)
	if err != nil {
		return nil, withFunc(err, fn)
	}
	v, err := e.vehNames.resolve(vs)
	if err != nil {
		return nil, withFunc(err, fn)
	}
	set := distanceSetByName(v.Set)
	if setArg != "" {
		asked, err := resolveDistanceSet(setArg)
		if err != nil {
			return nil, withFunc(err, fn)
		}
		if asked.name != set.name {
			return nil, &Error{Code: CodeBadArgument, Func: fn, Param: "set",
				Msg: "the table of " + asked.name + " has no row for " + v.ID + ", which is in set " + set.name + ": leave set out or choose a vehicle of " + asked.name + " (" + strings.Join(e.setVehicles(asked.name), ", ") + ")"}
		}
	}
	c.note("set " + set.name + " (" + set.title + "), vehicle " + v.ID + ", per " + set.basis + ": tailpipe emissions of the whole vehicle, not per passenger")
	if v.Note != "" {
		c.note(v.Note)
	}
	var kgPerMeter float64
	var terms []planTerm // kg per metre
	if set.perGas {
		gwpSet, err := e.resolveGWPSet(gwpArg)
		if err != nil {
			return nil, withFunc(err, fn)
		}
		var parts [3]float64
		var rows [3]*Factor
		for i, q := range []string{"co2_per_distance", "ch4_per_distance", "n2o_per_distance"} {
			f, err := e.vehicleFactor(fn, set, v.ID, q)
			if err != nil {
				return nil, err
			}
			c.use(f)
			parts[i], rows[i] = f.si, f
		}
		gCH4, gN2O := e.packs.lookup(CommonPack, "ch4", "gwp100_"+gwpSet), e.packs.lookup(CommonPack, "n2o", "gwp100_"+gwpSet)
		if gCH4 == nil || gN2O == nil {
			return nil, &Error{Code: CodeMissingFactor, Func: fn, Param: "gwp_set", Msg: "GWP set " + gwpSet + " has no value for ch4 or n2o"}
		}
		c.use(gCH4, gN2O)
		kgPerMeter = parts[0] + parts[1]*gCH4.Value + parts[2]*gN2O.Value
		terms = []planTerm{{perUnit: parts[0], uses: []factorUse{{rows[0], 1}}},
			{perUnit: parts[1] * gCH4.Value, uses: []factorUse{{rows[1], 1}, {gCH4, 1}}},
			{perUnit: parts[2] * gN2O.Value, uses: []factorUse{{rows[2], 1}, {gN2O, 1}}}}
		c.note("CO2 + CH4 x " + FormatNumber(gCH4.Value) + " + N2O x " + FormatNumber(gN2O.Value) + " (GWP-100, " + gwpSet + ")")
	} else {
		if gwpArg != "" {
			asked, err := e.resolveGWPSet(gwpArg)
			if err != nil {
				return nil, withFunc(err, fn)
			}
			if asked != set.gwp {
				return nil, &Error{Code: CodeBadArgument, Func: fn, Param: "gwp_set",
					Msg: "set " + set.name + " publishes CO2e only, weighted with " + set.gwp + " GWPs, so it cannot be reweighted with " + asked + ": leave gwp_set out or give " + set.gwp}
			}
		}
		f, err := e.vehicleFactor(fn, set, v.ID, "co2e_per_distance")
		if err != nil {
			return nil, err
		}
		c.use(f)
		kgPerMeter = f.si
		terms = []planTerm{{perUnit: f.si, uses: []factorUse{{f, 1}}}}
		c.note("set " + set.name + " publishes CO2e only, with CH4 and N2O weighted by " + set.gwp + " GWP-100 values (the publisher's choice; from memory)")
	}
	if strings.Contains(v.ID, "_bev") {
		c.note("battery-electric: no tailpipe emissions; the electricity it uses is Scope 2, computed with electricity_co2e")
	}
	p := &vehiclePlan{tPerUnit: u.SIFloat() * kgPerMeter / 1000, factors: c.factors, notes: c.notes, terms: scaleTerms(terms, u.SIFloat()/1000)}
	p.iv = newPlanInterval(p.terms)
	e.cachePlan(key, p)
	return p, nil
}

// setVehicles lists the vehicle ids of a set, sorted.
func (e *Engine) setVehicles(set string) []string {
	var out []string
	for _, id := range e.vehNames.ids {
		if e.vehNames.setOf[id] == set {
			out = append(out, id)
		}
	}
	return out
}

// vehicleDistanceFunctions declares vehicle_co2e.
func vehicleDistanceFunctions(e *Engine) []*Function {
	vehicle := paramStr("vehicle", "vehicle type of a distance table, or a name such as \"Medium petrol car\", \"Diesel van (Class II)\", \"Passenger Car\"; the vehicle names its set", e.vehNames.ids...).checked(checkDistanceVehicle)
	gwpSet := optional(paramStr("gwp_set", "IPCC assessment whose GWP-100 values weight CH4 and N2O (sets that publish CO2e only accept their own)", e.gwpSets()...), DefaultGWPSet).with(kindGWPSet)
	set := optional(paramStr("set", "published table: epa2021 (US EPA Hub 2021, per vehicle-mile, gases split) or uk2024 (UK conversion factors 2024, CO2e per vehicle-km, from memory)", distanceSetNames()...), "the vehicle's own set").checked(checkDistanceSet)
	return []*Function{
		{Name: "vehicle_co2e", Doc: "Tailpipe CO2e of a road vehicle from the distance driven (distance-based method), with the factor of its vehicle type; the set, vehicle and basis (vehicle-km or vehicle-mile) are named in the result. Battery-electric vehicles give 0: their electricity is Scope 2. For fuel burned use mobile_co2e.",
			ResultUnit: "t CO2e", Params: []Param{paramNum("distance", "the unit given in unit", "distance driven by the vehicle"),
				Param{Name: "unit", Type: typeString, Unit: unitParamUnit, Doc: "length unit of distance (km, mi)"}.checked(func(_ *Engine, s string) error { _, err := distanceUnit(s); return err }),
				vehicle, gwpSet, set},
			Example: `vehicle_co2e(1000, "mi", "us_passenger_car")`, ExampleResult: 1000 * (0.341 + 0.009e-3*28 + 0.008e-3*265) / 1000,
			Sources: []string{"US EPA GHG Emission Factors Hub (15 September 2021) Tables 8 and 10", "UK Government GHG conversion factors for company reporting 2024 (from memory)", "IPCC AR5 WG1 Ch 8 Table 8.A.1"},
			call:    callVehicleCO2e},
	}
}
