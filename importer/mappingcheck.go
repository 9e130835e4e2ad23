package importer

import (
	"bytes"
	"encoding/json"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// mapParser checks the parts of a mapping document.
type mapParser struct {
	e    *funcs.Engine
	fail func(at, format string, args ...any) error
}

func (p *mapParser) table(v any, at string) (mapTable, error) {
	obj, err := p.object(v, at, "sheet", "header_row", "kind", "fuel", "unit", "grid", "sector", "gallons", "activity_uncertainty", "columns")
	if err != nil {
		return mapTable{}, err
	}
	t := mapTable{at: at}
	if t.sheet, err = p.str(obj["sheet"], at+".sheet"); err != nil {
		return t, err
	}
	if t.sheet == "" {
		return t, p.fail(at+".sheet", "no sheet name: write the sheet the table is on")
	}
	if _, ok := obj["header_row"]; !ok {
		return t, p.fail(at, "no header_row: write the row number of the table's header, e.g. 4")
	}
	if t.headerRow, err = p.integer(obj["header_row"], at+".header_row"); err != nil {
		return t, err
	}
	if t.headerRow < 1 || t.headerRow > 1048576 {
		return t, p.fail(at+".header_row", "%d is not a row: rows are 1 to 1048576", t.headerRow)
	}
	if t.kind, err = p.optStr(obj, "kind", at); err != nil {
		return t, err
	}
	switch t.kind {
	case "", kindFuelLog, kindWide, kindPeriods, kindBuildPlan, kindRefrigerant, kindCharge, kindDistance, kindCustom:
	default:
		return t, p.fail(at+".kind", "unknown kind %q: accepted are %s, %s, %s, %s, %s, %s, %s and %s", t.kind, kindFuelLog, kindWide, kindPeriods, kindBuildPlan, kindRefrigerant, kindCharge, kindDistance, kindCustom)
	}
	if f, err := p.optStr(obj, "fuel", at); err != nil {
		return t, err
	} else if f != "" {
		if t.fuel, err = p.fuel(f, at+".fuel"); err != nil {
			return t, err
		}
	}
	if t.unit, err = p.optStr(obj, "unit", at); err != nil {
		return t, err
	}
	if err := p.unit(t.unit, at+".unit"); err != nil {
		return t, err
	}
	if t.grid, err = p.grid(obj, at); err != nil {
		return t, err
	}
	if t.sector, err = p.sector(obj, at); err != nil {
		return t, err
	}
	if t.gallons, err = p.gallons(obj, at); err != nil {
		return t, err
	}
	if t.activity, err = p.activity(obj, at); err != nil {
		return t, err
	}
	list, ok := obj["columns"].([]any)
	if !ok && obj["columns"] != nil {
		return t, p.fail(at+".columns", "expected a list of columns, found %s", jsonKind(obj["columns"]))
	}
	byCol := map[int]string{}
	byRole := map[role]int{} // the column of each one-per-table role
	for i, x := range list {
		c, err := p.column(x, at+".columns["+strconv.Itoa(i)+"]")
		if err != nil {
			return t, err
		}
		if first, dup := byCol[c.col]; dup {
			return t, p.fail(c.at+".column", "column %s is mapped twice (first at %s): keep one", colName(c.col), first)
		}
		byCol[c.col] = c.at
		if c.role != roleNone && c.role != roleWideFuel && c.role != rolePeriod && c.role != roleExisting && c.role != roleCarrier {
			if first := byRole[c.role]; first != 0 {
				return t, p.fail(c.at+".role", "a second %q column (the first is %s): a table has one", c.role, colName(first))
			}
			byRole[c.role] = c.col
		}
		t.cols = append(t.cols, c)
	}
	if t.fuel != "" && byRole[roleFuel] != 0 {
		return t, p.fail(at+".fuel", "the table has a fuel column (%s): give either \"fuel\" or a column of role fuel", colName(byRole[roleFuel]))
	}
	if t.unit != "" && byRole[roleUnit] != 0 {
		return t, p.fail(at+".unit", "the table has a unit column (%s): give either \"unit\" or a column of role unit", colName(byRole[roleUnit]))
	}
	return t, nil
}

func (p *mapParser) column(v any, at string) (mapCol, error) {
	obj, err := p.object(v, at, "column", "header", "role", "unit", "basis", "fuel")
	if err != nil {
		return mapCol{}, err
	}
	c := mapCol{at: at}
	letters, err := p.str(obj["column"], at+".column")
	if err != nil {
		return c, err
	}
	col, _, ok := parseRef(letters + "1")
	if !ok || strings.ContainsAny(letters, "$0123456789") {
		return c, p.fail(at+".column", "%q is not a column: write its letters, A to XFD", letters)
	}
	c.col = col
	if c.header, err = p.optStr(obj, "header", at); err != nil {
		return c, err
	}
	name, err := p.optStr(obj, "role", at)
	if err != nil {
		return c, err
	}
	if c.role, ok = roleByName(name); !ok {
		return c, p.fail(at+".role", "unknown role %q: accepted are none, %s", name, strings.Join(roleNames(), ", "))
	}
	amount := c.role == roleQuantity || c.role == roleWideFuel || c.role == roleCapacity || c.role == roleCarrier
	if c.unit, err = p.optStr(obj, "unit", at); err != nil {
		return c, err
	}
	if c.unit != "" && !amount {
		return c, p.fail(at+".unit", "a unit applies to a quantity, fuel-column or capacity column, not to role %q%s", roleLabel(c.role), periodHint(c.role))
	}
	if err := p.unit(c.unit, at+".unit"); err != nil {
		return c, err
	}
	b, err := p.optStr(obj, "basis", at)
	if err != nil {
		return c, err
	}
	if b != "" {
		if !amount {
			return c, p.fail(at+".basis", "a basis applies to a quantity, fuel-column or capacity column, not to role %q%s", roleLabel(c.role), periodHint(c.role))
		}
		switch strings.ToUpper(b) {
		case "HHV", "GCV", "GROSS":
			c.basis = units.HHV
		case "NCV", "LHV", "NET":
			c.basis = units.NCV
		default:
			return c, p.fail(at+".basis", "unknown basis %q: accepted are HHV (GCV, gross) and NCV (LHV, net)", b)
		}
	}
	f, err := p.optStr(obj, "fuel", at)
	if err != nil {
		return c, err
	}
	switch {
	case f != "" && c.role != roleWideFuel:
		return c, p.fail(at+".fuel", "a fuel applies to a column of role fuel-column (one fuel per column), not to role %q", roleLabel(c.role))
	case f == "" && c.role == roleWideFuel:
		return c, p.fail(at, "role fuel-column needs \"fuel\": the fuel of every amount in the column, e.g. \"gas_diesel_oil\"")
	case f != "":
		if c.fuel, err = p.fuel(f, at+".fuel"); err != nil {
			return c, err
		}
	}
	return c, nil
}

func periodHint(r role) string {
	if r == rolePeriod {
		return " (give the unit of the amounts by period as the table's \"unit\")"
	}
	return ""
}

// fuel resolves a fuel id or name through the engine.
func (p *mapParser) fuel(name, at string) (string, error) {
	f, _, err := p.e.ResolveFuel(name)
	if err != nil {
		msg := err.Error()
		if fe, ok := funcs.AsError(err); ok {
			msg = fe.Msg
		}
		return "", p.fail(at, "%s", msg)
	}
	return f.ID, nil
}

// unit checks a unit text as a header would read it ("L", "'000 L",
// "MMBtu HHV").
func (p *mapParser) unit(s, at string) error {
	if s == "" {
		return nil
	}
	h := parseHeader("x (" + s + ")")
	switch {
	case h.UnitErr != nil:
		return p.fail(at, "%s", h.UnitErr.Msg)
	case h.UnitText == "" || h.Percent:
		msg := "not a unit"
		if _, err := units.Parse(s); err != nil {
			msg = err.Error()
		}
		return p.fail(at, "%q: %s; write one such as L, kWh, t, GJ or MMBtu HHV", s, msg)
	}
	return nil
}

func (p *mapParser) object(v any, at string, keys ...string) (map[string]any, error) {
	obj, ok := v.(map[string]any)
	if !ok {
		where := at
		if where == "" {
			where = "the document"
		}
		return nil, p.fail(at, "expected an object for %s, found %s", where, jsonKind(v))
	}
	for _, k := range sortedKeys(obj) {
		known := false
		for _, x := range keys {
			known = known || k == x
		}
		if !known {
			return nil, p.fail(joinPath(at, k), "unknown key %q: accepted are %s", k, strings.Join(keys, ", "))
		}
	}
	return obj, nil
}

func (p *mapParser) str(v any, at string) (string, error) {
	s, ok := v.(string)
	if !ok {
		return "", p.fail(at, "expected text, found %s", jsonKind(v))
	}
	return s, nil
}

func (p *mapParser) optStr(obj map[string]any, key, at string) (string, error) {
	v, ok := obj[key]
	if !ok {
		return "", nil
	}
	return p.str(v, joinPath(at, key))
}

func (p *mapParser) integer(v any, at string) (int, error) {
	n, ok := v.(json.Number)
	if ok {
		if i, err := strconv.Atoi(n.String()); err == nil {
			return i, nil
		}
	}
	return 0, p.fail(at, "expected a whole number, found %s", jsonKind(v))
}

func joinPath(at, key string) string {
	if at == "" {
		return key
	}
	return at + "." + key
}

// jsonKind names a decoded JSON value for a message.
func jsonKind(v any) string {
	switch x := v.(type) {
	case nil:
		return "null"
	case string:
		return "text " + quoteText(x)
	case json.Number:
		return "the number " + x.String()
	case bool:
		return "true/false"
	case []any:
		return "a list"
	}
	return "an object"
}

// jsonErr adds the line of a syntax error.
func jsonErr(data []byte, err error) string {
	if se, ok := err.(*json.SyntaxError); ok {
		line := 1 + bytes.Count(data[:min(int(se.Offset), len(data))], []byte("\n"))
		return "line " + strconv.Itoa(line) + ": " + se.Error()
	}
	return err.Error()
}

func sortedKeys(m map[string]any) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// roleByName reads a role name; "" and "none" are roleNone.
func roleByName(s string) (role, bool) {
	if s == "" || s == "none" {
		return roleNone, true
	}
	for _, r := range allRoles() {
		if r.String() == s {
			return r, true
		}
	}
	return roleNone, false
}

func roleNames() []string {
	var out []string
	for _, r := range allRoles() {
		out = append(out, r.String())
	}
	return out
}

// allRoles lists the roles after roleNone in their order: those that
// role.String names (the roles are declared with iota, the names in an
// array of the same order).
func allRoles() []role {
	var out []role
	for r := roleNone + 1; named(r); r++ {
		out = append(out, r)
	}
	return out
}

func named(r role) (ok bool) {
	defer func() {
		if recover() != nil {
			ok = false
		}
	}()
	return r.String() != ""
}

// roleLabel is a role's name in a mapping file.
func roleLabel(r role) string {
	if r == roleNone {
		return "none"
	}
	return r.String()
}
