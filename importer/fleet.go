package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// Fuel burned by vehicles, and fuel burned in a named sector. A fleet log
// (a vehicle, registration, odometer or mileage column, or a title or
// sheet that speaks of a fleet or vehicles) is mobile combustion: its rows
// use mobile_co2 and mobile_co2e with road transport's CH4 and N2O by fuel
// instead of stationary combustion's. A sector column or the mapping's
// "sector" chooses fuel_co2e's sector; without either, fuel_co2e's default
// (energy industries) applies.

// Road modes of mobile_co2e (IPCC 2006 Vol 2 Ch 3 Table 3.2.2): one default
// per fuel for diesel, natural gas and LPG; gasoline by technology, of which
// light-duty vehicles of 1995 or later stand for a current fleet.
const (
	roadMode         = "road"
	roadModeGasoline = "road_low_mileage_1995"
)

// modeFor is the road mode of a fuel id.
func modeFor(fuelID string) string {
	if fuelID == "motor_gasoline" {
		return roadModeGasoline
	}
	return roadMode
}

// stationaryMode keys the rules of a fleet's rows whose fuel has no road
// CH4 and N2O in the pack (ethanol in ipcc2006): stationary combustion.
const stationaryMode = "stationary"

// roadModeOf is the road mode of a fuel id when the engine's default pack
// has mobile CH4 and N2O for it in that mode, else "" (cached).
func (lx *lexicon) roadModeOf(id string) string { return lx.roadModeOfName(id, id) }

// roadModeOfName is roadModeOf for a fuel as a cell names it: a blend
// ("E-85") has its components' factors, which the pack may lack.
func (lx *lexicon) roadModeOfName(name, id string) string {
	if m, ok := lx.modes[name]; ok {
		return m
	}
	m := modeFor(id)
	if _, err := lx.e.CallValues("mobile_co2e", name, 1.0, "GJ", m); err != nil {
		m = ""
	}
	if len(lx.modes) < maxCache {
		lx.modes[name] = m
	}
	return m
}

// fleetWords are title and sheet words that make a table a fleet's.
var fleetWords = []string{"fleet", "vehicle", "vehicles", "car", "cars", "van", "vans", "truck", "trucks", "lorry", "lorries", "mileage", "motor pool"}

// fleetEvidence marks t as a fleet log when a column header names vehicles
// or distances driven (registration, odometer, VMT) or a title or the sheet
// name speaks of a fleet; t.mobile says where, for the findings. Fuels the
// pack has no road CH4 and N2O for stay stationary (t.stationary).
func (d *detector) fleetEvidence(t *tableSpec) {
	if _, ok := d.sc.e.Function("mobile_co2e"); !ok {
		return
	}
	t.mobile = d.fleetWhy(t)
	if t.mobile == "" {
		return
	}
	t.stationary = map[string]bool{}
	siteTable := len(t.wide) > 0 && !d.vehicleRecords(t)
	for _, id := range append([]string{t.ctxFuel}, wideFuels(t)...) {
		if id != "" && (d.lx.roadModeOf(id) == "" || siteTable && !roadLiquid(id)) {
			t.stationary[id] = true
		}
	}
	if siteTable {
		t.mobile += "; only its diesel and petrol columns, the rows being sites with distances beside their heating fuels, whose row totals count as stationary combustion"
	}
}

// vehicleRecords reports a table whose rows are vehicles: a column naming
// vehicles (registration, vehicle, fleet number), or a title or sheet name
// about a fleet. A column of distances alone (a site table's "Business
// mileage (miles)") is not such evidence for its other columns.
func (d *detector) vehicleRecords(t *tableSpec) bool {
	for _, c := range t.cols {
		distance := c.st.hint.Any(tables.HintDistance) || c.hdr.UnitErr == nil && c.hdr.Unit.Dim == units.Length
		if c.st.hint.Any(tables.HintVehicle) && !distance && c.role != roleQuantity && !c.perColumn() {
			return true
		}
	}
	for _, s := range t.titles {
		if len(s) <= 120 && hasWord(words(s), fleetWords...) {
			return true
		}
	}
	return hasWord(words(d.sheet), fleetWords...)
}

// roadLiquid reports the fuels a site table's columns hold for its road
// vehicles: diesel, petrol and their bio blends (common practice: the gas,
// heating oil, LPG or coal of a site are burned in its boilers).
func roadLiquid(id string) bool {
	switch id {
	case "gas_diesel_oil", "motor_gasoline", "biodiesel", "ethanol", "renewable_diesel":
		return true
	}
	return false
}

// fleetWhy names the evidence that t is a fleet's; "" when there is none.
func (d *detector) fleetWhy(t *tableSpec) string {
	for _, c := range t.cols {
		// A column of amounts of one fuel ("Natural Gas Deliveries to
		// Commercial Consumers (Including Vehicle Fuel...)") names vehicles
		// among its consumers, not a fleet's records.
		if c.st.hint.Any(tables.HintVehicle|tables.HintDistance) && c.role != roleQuantity && !c.perColumn() && c.sameAs == nil && c.partOf == nil {
			return "the column " + quoteText(c.hdr.Text)
		}
	}
	for _, s := range t.titles {
		if len(s) <= 120 && hasWord(words(s), fleetWords...) {
			return "the title " + quoteText(s)
		}
	}
	if hasWord(words(d.sheet), fleetWords...) {
		return "the sheet name " + quoteText(d.sheet)
	}
	return ""
}

// wideFuels lists the fuels of t's per-fuel columns.
func wideFuels(t *tableSpec) []string {
	var out []string
	for _, c := range t.wide {
		out = append(out, c.fuelID)
	}
	return out
}

// findSectorCol gives the role sector to a column headed sector (or end
// use) whose values name sectors fuel_co2e knows.
func (d *detector) findSectorCol(t *tableSpec) {
	if t.fuel == nil && t.ctxFuel == "" && len(t.wide) == 0 {
		return
	}
	for _, c := range t.cols {
		if c.role != roleNone && c.role != roleGroup || !c.st.hint.Any(tables.HintSector) || len(c.st.distinct) == 0 ||
			len(words(c.hdr.Base)) > 4 || 2*c.st.text < c.st.nonEmpty || c.st.fill(t.sampled) < 0.5 {
			continue // a title over the table that says sector, or a column mostly blank
		}
		n := 0
		for s := range c.st.distinct {
			if _, ok := sectorName(s); ok {
				n++
			}
		}
		if frac(n, len(c.st.distinct)) >= 0.6 {
			if t.group == c {
				t.group = nil
			}
			c.role, t.sector = roleSector, c
			return
		}
	}
}

// chooseSector sets the sector argument of t's fuel_co2e calls: a sector
// column, else the mapping's sector; none for a fleet.
func (d *detector) chooseSector(t *tableSpec) {
	if t.mobile != "" {
		return
	}
	arg := ""
	switch mt := d.sc.mappedTable(t); {
	case t.sector != nil:
		arg = t.sector.ident
	case mt != nil && mt.sector != "":
		arg = quoteRuleString(mt.sector)
	default:
		return
	}
	t.sectorArgs = ", " + quoteRuleString(d.sc.gwpSetOrDefault()) + ", " + quoteRuleString(d.sc.e.DefaultPackName()) + ", " + arg
}

// combustionCalls returns the CO2 and CO2e calls of a fuel amount: mobile
// combustion in a fleet (mode by fuel), else stationary in the table's
// sector. fuel is the argument text; fuelID the fuel when every row has
// the same ("" for a fuel column: the main rule takes road, and rows of
// gasoline get their own, see compileModeRules).
func combustionCalls(t *tableSpec, fuel, fuelID, amount, unit string) (co2, co2e string) {
	args := fuel + ", " + amount + ", " + unit
	if t.mobile != "" && !t.stationary[fuelID] {
		mode := quoteRuleString(modeFor(fuelID))
		return "mobile_co2(" + args + ", " + mode + ")", "mobile_co2e(" + args + ", " + mode + ")"
	}
	return "fuel_co2(" + args + ")", "fuel_co2e(" + args + t.sectorArgs + ")"
}

// compileModeRules compiles, for a fleet log with a fuel column, the rules
// of the rows whose fuel takes another road mode than the main rules'
// (gasoline).
func (sc *scanCtx) compileModeRules(t *table) error {
	spec := t.spec
	if len(sc.userRules) > 0 || spec.kind != kindFuelLog || spec.fuel == nil || spec.mobile == "" || len(t.rules) == 0 {
		return nil
	}
	t.modes = map[string]*ruleSet{}
	for _, mode := range []string{roadModeGasoline, stationaryMode} {
		args := spec.fuel.ident + ", " + scaled(spec.qty) + ", " + fuelLogUnit(spec)
		co2, co2e := "mobile_co2("+args+", "+quoteRuleString(mode)+")", "mobile_co2e("+args+", "+quoteRuleString(mode)+")"
		if mode == stationaryMode {
			co2, co2e = "fuel_co2("+args+")", "fuel_co2e("+args+")"
		}
		var rules []*rule
		var at []int
		for ri, main := range t.rules {
			call := map[int]string{1: co2, 2: co2e}[main.total]
			if call == "" {
				continue
			}
			r, err := sc.compileRowRule(t, main, call)
			if err != nil {
				return err
			}
			rules, at = append(rules, r), append(at, ri)
		}
		t.modes[mode] = newRuleSet(rules, at, "")
	}
	return nil
}

// rowMode picks the rules of a fleet row whose fuel takes another road
// mode; nil for the main rules.
func (sc *scanCtx) rowMode(t *table, i int) *ruleSet {
	if t.modes == nil {
		return nil
	}
	v := t.val(i, t.slotOf[t.spec.fuel.col])
	if v.kind != kText {
		return nil
	}
	f := sc.fuelName(v.text) // "Unleaded Premium": the fuel inside a phrase
	if f.kind != nameFuel {
		return nil
	}
	mode := sc.roadModeOfName(f.name, f.id)
	switch mode {
	case roadMode:
		return nil
	case "":
		mode = stationaryMode
	}
	rs := t.modes[mode]
	if t.modeNoted == nil {
		t.modeNoted = map[string]bool{}
	}
	if rs != nil && !t.modeNoted[mode] {
		t.modeNoted[mode] = true
		msg := quoteText(v.text) + " in a fleet: road gasoline's CH4 and N2O are given by technology (IPCC 2006 Vol 2 Ch 3 Table 3.2.2); read as light-duty vehicles of 1995 or later (mode " +
			roadModeGasoline + "), as \"" + ruleCalls(rs) + "\""
		if mode == stationaryMode {
			msg = quoteText(v.text) + " in a fleet: pack " + sc.e.DefaultPackName() + " has no road CH4 and N2O for it, so rows of fuels without them take those of stationary combustion, as \"" + ruleCalls(rs) + "\""
		}
		sc.warn.add(t.spec.sheet, t.spec.fuel.col, t.rowNum(i), SevInfo, CodeReadAs, msg)
	}
	return rs
}

// fleetFindings says, at the amount's header, that a table is read as a
// fleet (mobile combustion) or with a sector, and from what evidence.
func (sc *scanCtx) fleetFindings(t *table) {
	spec := t.spec
	if len(sc.userRules) > 0 || len(t.rules) == 0 {
		return
	}
	if spec.kind == kindDistance {
		sc.warn.add(spec.sheet, spec.qty.col, spec.headerRow, SevInfo, CodeReadAs, quoteText(spec.qty.hdr.Text)+" read as distances driven by the vehicle types of "+
			quoteText(spec.vehicle.hdr.Text)+": the distance-based method (vehicle_co2e); where the fuel bought is known, it is the better basis (mobile_co2e)")
		return
	}
	col := spec.firstCol
	switch {
	case spec.qty != nil:
		col = spec.qty.col
	case len(spec.wide) > 0:
		col = spec.wide[0].col
	}
	switch {
	case spec.mobile != "":
		sc.warn.add(spec.sheet, col, spec.headerRow, SevInfo, CodeReadAs, "read as a vehicle fleet ("+spec.mobile+
			"): mobile combustion, with road transport's CH4 and N2O by fuel (mobile_co2e, mode road; gasoline "+roadModeGasoline+
			"), not those of stationary combustion; if the fuel is burned in boilers or generators, give the table's sector in a mapping")
	case spec.sector != nil:
		sc.warn.add(spec.sheet, spec.sector.col, spec.headerRow, SevInfo, CodeReadAs, "CH4 and N2O of each row's sector from "+quoteText(spec.sector.hdr.Text)+
			" (fuel_co2e sector: "+strings.Join(sectors[:], ", ")+")")
	case spec.sectorArgs != "":
		sc.warn.add(spec.sheet, col, spec.headerRow, SevInfo, CodeReadAs, "CH4 and N2O of stationary combustion in the sector the mapping gives ("+
			spec.sectorArgs[strings.LastIndex(spec.sectorArgs, ", ")+2:]+")")
	}
}

// sectorValue reads a sector cell as fuel_co2e names it ("Commercial /
// institutional" gives commercial). A cell naming no stationary sector
// ("Transportation") takes fuel_co2e's default, said once per text.
func (sc *scanCtx) sectorValue(t *table, c *column, v cellVal, r int) (any, bool) {
	text := cell{kind: v.kind, num: v.num, text: v.text}.display()
	switch {
	case v.kind == kEmpty && !v.noCache, v.kind == kText && strings.TrimSpace(v.text) == "":
		return "", true // fuel_co2e's default sector
	case v.kind == kText:
		if s, ok := sectorName(v.text); ok {
			return s, true
		}
	}
	sc.warn.addOnce("sector|"+t.spec.sheet+"|"+colName(c.col)+"|"+strings.ToLower(strings.TrimSpace(text)), t.spec.sheet, c.col, r, SevInfo, CodeReadAs,
		quoteText(text)+" names no sector of stationary combustion ("+strings.Join(sectors[:], ", ")+"): rows that say so take fuel_co2e's default, energy industries")
	return "", true
}
