package importer

import (
	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// Distance-based vehicle tables: a column of vehicle types ("Medium petrol
// car", "Diesel van", "Passenger Car") and a distance driven in km or
// miles give tCO2e = vehicle_co2e(distance, unit, vehicle), in a table that
// gives no fuel burned (fuel wins: it is the better method).

// kindDistance is the kind of a distance-based vehicle table.
const kindDistance = "vehicle-distance"

// vehicleFunc is the catalog function of distance-based vehicle rows.
const vehicleFunc = "vehicle_co2e"

// vehicleName resolves a cell text as a vehicle type of vehicle_co2e,
// cached: its id, or "" when it names none.
func (lx *lexicon) vehicleName(s string) string {
	if id, ok := lx.vehicles[s]; ok {
		return id
	}
	id := ""
	if v, err := lx.e.ResolveVehicle(s); err == nil {
		id = v.ID
	}
	if len(lx.vehicles) < maxCache {
		lx.vehicles[s] = id
	}
	return id
}

// assignDistance finds a distance-based vehicle table in a table without a
// fuel, amount, per-fuel, purchased-energy, gas or technology column.
func (d *detector) assignDistance(t *tableSpec) {
	if t.fuel != nil || t.qty != nil || len(t.wide) > 0 || len(t.scope2) > 0 || t.gas != nil || t.tech != nil {
		return
	}
	if _, ok := d.sc.e.Function(vehicleFunc); !ok {
		return
	}

	var veh *column
	best := 0.0
	for _, c := range t.cols {
		if c.role != roleNone && c.role != roleGroup || c.st.text == 0 || len(c.st.distinct) == 0 || 2*c.st.text < c.st.nonEmpty {
			continue
		}
		n := 0
		for s := range c.st.distinct {
			if d.lx.vehicleName(s) != "" {
				n++
			}
		}
		share := frac(n, len(c.st.distinct))
		if c.st.hint.Any(tables.HintVehicle) {
			share += 0.2
		}
		if share >= 0.6 && share > best {
			veh, best = c, share
		}
	}
	if veh == nil {
		return
	}
	var dist *column
	for _, c := range t.cols {
		if c.role != roleNone || c.st.nonEmpty > 0 && !c.numeric {
			continue
		}
		if c.hdr.UnitErr == nil && c.hdr.Unit.Dim == units.Length || c.hdr.UnitText == "" && c.st.hint.Any(tables.HintDistance) && d.lengthUnits(t) {
			dist = c
			break
		}
		if u := lengthWord(c.hdr.Base); c.hdr.UnitText == "" && u != "" && c.st.hint.Any(tables.HintDistance|tables.HintVehicle) && !tableIdents(t)[c.ident+"_unit"] {
			setHeaderUnit(c, u) // "Miles driven": the unit is a word of the header
			c.unitIdent = c.ident + "_unit"
			dist = c
			break
		}
	}
	if dist == nil {
		return
	}
	if t.group == veh {
		t.group = nil
	}
	veh.role, t.vehicle = roleVehicle, veh
	dist.role, t.qty = roleQuantity, dist
}

// lengthUnits reports a unit column that holds lengths (km, mi).
func (d *detector) lengthUnits(t *tableSpec) bool {
	if t.unit == nil {
		return false
	}
	for s := range t.unit.st.distinct {
		if u := d.lx.unit(s); u.err == nil && u.u.Dim == units.Length {
			return true
		}
	}
	return false
}

// distanceRule is the rule of a distance-based vehicle table; "" when it
// has no unit.
func distanceRule(t *tableSpec) string {
	unit := ""
	switch {
	case t.unit != nil:
		unit = t.unit.ident
	case t.qty.unitIdent != "":
		unit = t.qty.unitIdent
	default:
		return ""
	}
	return "tCO2e = " + vehicleFunc + "(" + scaled(t.qty) + ", " + unit + ", " + t.vehicle.ident + ")"
}

// lengthWord returns the word of a header that is a unit of length
// ("Miles driven", "Km travelled"), or "".
func lengthWord(h string) string {
	for _, w := range words(h) {
		if u, err := units.Lookup(w); err == nil && u.Dim == units.Length {
			return w
		}
	}
	return ""
}
