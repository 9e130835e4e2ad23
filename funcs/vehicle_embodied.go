package funcs

import (
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Production emissions of vehicles and batteries. A vehicle class has a
// vehicle_production row (the vehicle without its traction battery, t CO2e) and,
// when it has a traction battery, a battery_capacity row (its usual kWh); the
// battery is battery_production of li_ion (kg CO2e per kWh of capacity) times its
// capacity.

// batteryID is the battery whose production row batteries use.
const batteryID = "li_ion"

// vehicles lists the vehicle classes of the common pack, sorted.
func (e *Engine) vehicles() []string {
	var out []string
	if c := e.packs.packs[CommonPack]; c != nil {
		for k := range c.rows {
			if k.quantity == "vehicle_production" {
				out = append(out, k.id)
			}
		}
	}
	sort.Strings(out)
	return out
}

// resolveVehicle folds case and separators ("Car medium BEV" is car_medium_bev)
// and checks the class has a production row.
func (e *Engine) resolveVehicle(s string) (string, error) {
	id := strings.ReplaceAll(techKey(s), " ", "_")
	if len(s) <= maxLookupBytes && e.packs.lookup(CommonPack, id, "vehicle_production") != nil {
		return id, nil
	}
	all := e.vehicles()
	msg := "unknown vehicle class " + quote(s) + ": accepted are " + strings.Join(all, ", ")
	if sug := suggestFrom(id, all); sug != "" && len(s) <= maxLookupBytes {
		msg = "unknown vehicle class " + quote(s) + ": did you mean " + sug + "? (accepted: " + strings.Join(all, ", ") + ")"
	}
	return "", &Error{Code: CodeBadArgument, Param: "vehicle", Msg: msg}
}

func checkVehicle(e *Engine, s string) error {
	_, err := e.resolveVehicle(s)
	return err
}

// batteryPerKWh is battery production in t CO2e per kWh of capacity for stat.
func (e *Engine) batteryPerKWh(c *callCtx, a argList, stat string) (float64, error) {
	f := e.packs.lookup(CommonPack, batteryID, "battery_production")
	if f == nil {
		return 0, &Error{Code: CodeMissingFactor, Func: a.fn.Name, Msg: "no " + batteryID + "/battery_production row in the common pack: add it with --factors"}
	}
	c.use(f)
	v, err := statValue(f, stat, a.fn.Name, "battery production")
	if err != nil {
		return 0, err
	}
	// the row's value in SI (kg CO2e per J) scaled by the statistic, in t per kWh
	return f.si * (v / f.Value) * 3.6e6 / 1000, nil
}

func callVehicleEmbodied(e *Engine, c *callCtx, a argList) (float64, string, error) {
	n, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	if n < 0 {
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "count", Msg: "must not be negative, got " + FormatNumber(n)}
	}
	vs, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	id, err := e.resolveVehicle(vs)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	stat, err := a.optStr(3, "median")
	if err != nil {
		return 0, "", err
	}
	body := e.packs.lookup(CommonPack, id, "vehicle_production")
	c.use(body)
	bv, err := statValue(body, stat, a.fn.Name, id)
	if err != nil {
		return 0, "", err
	}
	perVehicle := body.si * (bv / body.Value) / 1000 // t CO2e
	terms := []planTerm{{perUnit: body.si / 1000, uses: []factorUse{{body, 1}}}}
	kwh, given, err := a.optNum(2)
	if err != nil {
		return 0, "", err
	}
	capRow := e.packs.lookup(CommonPack, id, "battery_capacity")
	switch {
	case given && (kwh < 0 || kwh > 10000):
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "battery_kwh", Msg: "must lie in [0, 10000] kWh, got " + FormatNumber(kwh)}
	case given && kwh > 0 && capRow == nil:
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "battery_kwh",
			Msg: id + " has no traction battery: leave battery_kwh out or give 0, or choose a hybrid, plug-in or battery-electric class"}
	case !given && capRow != nil:
		kwh = capRow.si / 3.6e6
		c.use(capRow)
		c.note("battery " + FormatNumber(kwh) + " kWh is the usual capacity of " + id + " (" + capRow.Source + ")")
	}
	if kwh > 0 {
		per, err := e.batteryPerKWh(c, a, stat)
		if err != nil {
			return 0, "", err
		}
		perVehicle += kwh * per
		terms = append(terms, planTerm{perUnit: kwh * per, uses: []factorUse{{e.packs.lookup(CommonPack, batteryID, "battery_production"), 1}}})
	}
	c.note("production only (" + statName(stat) + "): use, fuel or electricity, maintenance and end of life are not included")
	if len(terms) > 1 && capRow != nil && !given {
		terms[1].uses = append(terms[1].uses, factorUse{capRow, 1}) // the usual capacity, a row of its own
	}
	c.recordBuild(terms, stat, n)
	return n * perVehicle, "", nil
}

func callBatteryEmbodied(e *Engine, c *callCtx, a argList) (float64, string, error) {
	capacity, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	if capacity < 0 {
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "capacity", Msg: "must not be negative, got " + FormatNumber(capacity)}
	}
	us, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	u, err := units.ParseAs(us, units.Energy)
	if err != nil {
		return 0, "", withFunc(unitError("unit", err), a.fn.Name)
	}
	stat, err := a.optStr(2, "median")
	if err != nil {
		return 0, "", err
	}
	per, err := e.batteryPerKWh(c, a, stat)
	if err != nil {
		return 0, "", err
	}
	c.recordBuild([]planTerm{{perUnit: u.SIFloat() / 3.6e6 * per, uses: []factorUse{{e.packs.lookup(CommonPack, batteryID, "battery_production"), 1}}}}, stat, capacity)
	return capacity * u.SIFloat() / 3.6e6 * per, "", nil
}
