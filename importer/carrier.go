package importer

import "github.com/fluecell/fluecell/importer/tables"

// carrier is energy bought rather than burned on site (Scope 2):
// electricity from a grid, or steam, hot water and cooling from a
// district network.
type carrier uint8

const (
	carrierNone carrier = iota
	carrierElectricity
	carrierSteam
	carrierHeat    // hot water, district heat
	carrierCooling // chilled water, district cooling
)

func (c carrier) String() string {
	return [...]string{"", "electricity", "steam", "hot water", "cooling"}[c]
}

// heatArg is the carrier argument of heat_co2e for c.
func (c carrier) heatArg() string {
	switch c {
	case carrierSteam:
		return "steam"
	case carrierHeat:
		return "hot_water"
	case carrierCooling:
		return "chilled_water"
	}
	return ""
}

// byTotal is the key of a carrier's rows in the totals by fuel.
func (c carrier) byTotal() string { return "Scope 2: " + c.String() }

// carrierOf reads the purchased energy a text names ("Electricity",
// "Elec kWh", "District steam", "Chilled Water"); carrierNone for fuels,
// for energy generated on site (solar, wind) and for anything else.
func (lx *lexicon) carrierOf(s string) carrier {
	if c, ok := lx.carriers[s]; ok {
		return c
	}
	c := lx.readCarrier(s)
	if len(lx.carriers) < maxCache {
		lx.carriers[s] = c
	}
	return c
}

func (lx *lexicon) readCarrier(s string) carrier {
	if lx.fuel(s).err == nil {
		return carrierNone // "Heating oil", "Power station coal": fuels
	}
	ws := words(s)
	if gridPurchase(ws) {
		return carrierElectricity
	}
	if len(ws) == 0 || len(ws) > 8 {
		return carrierNone
	}
	h := lx.vocab.Hints(ws)
	if h.Any(tables.HintRate|tables.HintOutput|tables.HintSupply) && !h.Any(tables.HintQty) {
		return carrierNone // "Electricity price", "Power generation"
	}
	switch {
	case hasWord(ws, "solar", "wind", "pv", "photovoltaic", "hydro", "nuclear", "geothermal", "generated", "generation", "export", "exported", "sold",
		"cogen", "cogeneration", "chp", "onsite", "self"):
		return carrierNone // made on site: its fuel is the emission, not the energy
	case hasPhrase(ws, "chilled water", "district cooling") || hasWord(ws, "chw", "cooling"):
		return carrierCooling
	case hasWord(ws, "steam", "pur"):
		return carrierSteam
	case hasPhrase(ws, "hot water", "district heat", "district heating", "heat network") || hasWord(ws, "heat") && len(ws) <= 3:
		return carrierHeat
	case hasWord(ws, "electricity", "electric", "elec", "electrical") || hasWord(ws, "power", "grid") && lx.fewUnknown(ws):
		return carrierElectricity
	case touPeriod(ws):
		return carrierElectricity // time-of-use periods are an electricity tariff's
	}
	return carrierNone
}

// perColumn reports a column of amounts, one kind per column (a fuel, a
// period, purchased energy), whose empty or dashed cells count as none
// while the row's other columns still count.
func (c *column) perColumn() bool {
	return c.role == roleWideFuel || c.role == rolePeriod || c.role == roleCarrier
}

// gridPurchase reports a header that names electricity bought from the
// grid outright ("Electricity Use - Grid Purchase and Generated from Onsite
// Renewable Systems (kWh)", the usual electricity column of an
// energy-benchmarking export; "Purchased electricity"), even where it also
// names energy made on site: the grid purchase is what Scope 2 counts, and
// the header-note says that on-site generation in the same figure has no
// Scope 2 emissions.
func gridPurchase(ws []string) bool {
	return hasWord(ws, "electricity", "electric", "elec", "electrical") &&
		(hasPhrase(ws, "grid purchase", "grid purchases", "grid purchased", "purchased from the grid") ||
			hasWord(ws, "purchased", "bought", "imported") && !hasWord(ws, "generated", "generation", "onsite", "exported", "sold"))
}

// withOnsite reports a purchased-electricity header that also counts
// electricity made on site (the benchmarking export's "Grid Purchase and
// Generated from Onsite Renewable Systems").
func withOnsite(ws []string) bool {
	return hasWord(ws, "onsite", "generated", "generation") || hasPhrase(ws, "on site")
}

// touPeriod reports a header naming a time-of-use period of an electricity
// tariff ("On Peak", "Partial Peak", "Off Peak Usage", "Super Off Peak",
// "Mid-Peak", "Shoulder"): the usage columns of a utility's billing export,
// which name no carrier because only electricity is billed by time of use
// (common practice of utility tariffs).
func touPeriod(ws []string) bool {
	return hasPhrase(ws, "on peak", "off peak", "partial peak", "mid peak", "super off peak", "part peak") ||
		len(ws) <= 3 && hasWord(ws, "onpeak", "offpeak", "shoulder")
}
