package importer

import (
	"strconv"
	"strings"

	"github.com/expr-lang/expr/ast"
	"github.com/expr-lang/expr/parser"
	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// userRule is a rule given in Options.Rules, parsed and compiled once
// without a variable list (to learn its variables).
type userRule struct {
	src    string // as given, trimmed
	column string
	expr   string
	vars   []string
}

// splitRule splits "COLUMN = EXPR" at the first "=" that is not part of a
// comparison operator.
func splitRule(s string) (column, expr string, ok bool) {
	for i := 0; i < len(s); i++ {
		if s[i] != '=' {
			continue
		}
		if i+1 < len(s) && s[i+1] == '=' {
			return "", "", false
		}
		if i > 0 && strings.ContainsRune("<>!=", rune(s[i-1])) {
			return "", "", false
		}
		return strings.TrimSpace(s[:i]), strings.TrimSpace(s[i+1:]), true
	}
	return "", "", false
}

// parseUserRules checks and compiles the rules of the options.
func parseUserRules(e *funcs.Engine, rules []string, opts ...funcs.CompileOption) ([]*userRule, error) {
	var out []*userRule
	seen := map[string]bool{}
	for _, src := range rules {
		src = strings.TrimSpace(src)
		col, ex, ok := splitRule(src)
		if !ok || col == "" || ex == "" {
			return nil, &Error{Code: ErrRule, Msg: "rule " + quoteText(src) + ": write COLUMN = EXPR, e.g. 'tCO2e = fuel_co2e(fuel, quantity, unit)'"}
		}
		if len(col) > 100 || strings.ContainsAny(col, "\"'`[]{}\n\t") {
			return nil, &Error{Code: ErrRule, Msg: "rule " + quoteText(src) + ": the column name " + quoteText(col) + " must be short text without quotes or brackets, e.g. tCO2e"}
		}
		key := strings.ToLower(col)
		if seen[key] {
			return nil, &Error{Code: ErrRule, Msg: "rule " + quoteText(src) + ": column " + col + " is computed by two rules; keep one"}
		}
		seen[key] = true
		p, err := e.Compile(ex, opts...)
		if err != nil {
			return nil, &Error{Code: ErrRule, Msg: "rule " + quoteText(col+" = "+ex) + ": " + err.Error(), Err: err}
		}
		out = append(out, &userRule{src: col + " = " + ex, column: col, expr: ex, vars: p.Variables()})
	}
	return out, nil
}

// rulesFit reports whether t has every variable of every user rule.
func (sc *scanCtx) rulesFit(t *tableSpec) bool {
	have := tableIdents(t)
	for _, r := range sc.userRules {
		for _, v := range r.vars {
			if !have[v] {
				if sc.missed == nil {
					sc.missed, sc.missedAt = identList(t), t.sheet+"!"+cellRef(t.firstCol, t.headerRow)
				}
				return false
			}
		}
	}
	return true
}

func tableIdents(t *tableSpec) map[string]bool {
	have := map[string]bool{}
	for _, c := range t.cols {
		have[c.ident] = true
		if c.unitIdent != "" {
			have[c.unitIdent] = true
		}
	}
	return have
}

func identList(t *tableSpec) []string {
	var out []string
	for _, c := range t.cols {
		out = append(out, c.ident)
		if c.unitIdent != "" {
			out = append(out, c.unitIdent)
		}
	}
	if hasFlow(t) && t.when != nil {
		out = append(out, periodDaysIdent)
	}
	return out
}

// rule is a rule compiled for one table.
type rule struct {
	column   string
	src      string
	prog     *funcs.Program
	run      *funcs.Runner
	vars     []*binding
	paramVar map[string]string // catalog parameter name -> variable passed to it
	total    int               // 1: sums into tCO2, 2: into tCO2e, 3: into tCO2e as Scope 2 (scope2.go), 0: neither
	// optional are trailing optional arguments (capacity factor, lifetime
	// of a build plan) that a row may leave empty; variants[k] is the rule
	// with only the first k of them, so that the defaults apply.
	optional []*column
	variants []*rule
}

// binding says where a variable's value comes from.
type binding struct {
	name     string
	col      *column // the column holding it
	unitOf   *column // for <name>_unit: the column whose header unit it is
	constant string
	slot     int  // index of col in the table's stored columns
	days     bool // periodDaysIdent: the days of the row's period (flow.go)
}

// proposeRules writes rules for a table from its roles; scope2 are the
// calls of a wide table's purchased energy (scope2Terms).
func proposeRules(t *tableSpec, scope2 []string) []string {
	switch t.kind {
	case kindFuelLog:
		if t.headerErr != nil {
			return nil
		}
		unit := fuelLogUnit(t)
		if unit == "" {
			return nil
		}
		fuel, id := "\""+t.ctxFuel+"\"", t.ctxFuel
		if t.fuel != nil {
			fuel, id = t.fuel.ident, ""
		}
		co2, co2e := combustionCalls(t, fuel, id, scaled(t.qty), unit)
		return []string{"tCO2 = " + co2, "tCO2e = " + co2e}
	case kindWide:
		var co2, co2e []string
		for _, c := range t.wide {
			if c.hdr.UnitErr != nil || c.unitIdent == "" {
				continue
			}
			a, b := combustionCalls(t, "\""+c.fuelID+"\"", c.fuelID, scaled(c), c.unitIdent)
			co2, co2e = append(co2, a), append(co2e, b)
		}
		var out []string
		if len(co2) > 0 {
			out = []string{"tCO2 = " + strings.Join(co2, " + "), "tCO2e = " + strings.Join(co2e, " + ")}
		}
		if len(scope2) > 0 {
			out = append(out, scope2Column+" = "+strings.Join(scope2, " + "))
		}
		return out
	case kindPeriods:
		if t.headerErr != nil {
			return nil
		}
		var co2, co2e []string
		for _, c := range t.periods {
			unit := strconv.Quote(t.ctxUnit)
			if t.unit != nil {
				unit = t.unit.ident
			}
			args := t.fuel.ident + ", " + scaled(c) + ", " + unit
			co2 = append(co2, "fuel_co2("+args+")")
			co2e = append(co2e, "fuel_co2e("+args+")")
		}
		return []string{"tCO2 = " + strings.Join(co2, " + "), "tCO2e = " + strings.Join(co2e, " + ")}
	case kindRefrigerant:
		if r := refrigerantRule(t); r != "" && t.headerErr == nil {
			return []string{r}
		}
		return nil
	case kindDistance:
		if r := distanceRule(t); r != "" && t.headerErr == nil {
			return []string{r}
		}
		return nil
	case kindBuildPlan:
		if t.headerErr != nil {
			return nil
		}
		unit := ""
		switch {
		case t.unit != nil:
			unit = t.unit.ident
		case t.capacity.unitIdent != "":
			unit = t.capacity.unitIdent
		default:
			return nil
		}
		args := t.tech.ident + ", " + scaled(t.capacity) + ", " + unit
		if t.cf != nil {
			cf := t.cf.ident
			if t.cf.hdr.Percent {
				cf += " / 100"
			}
			args += ", " + cf
			if t.life != nil {
				args += ", " + t.life.ident
			}
		}
		return []string{"tCO2e = embodied(" + args + ")"}
	}
	return nil
}

// fuelLogUnit is the identifier giving a fuel log's unit: its unit column
// or the amount's header unit; "" when it has neither.
func fuelLogUnit(t *tableSpec) string {
	switch {
	case t.qty.unitIdent != "" && t.qty.hdr.UnitErr == nil && t.unit != nil && !unitColumnFor(t.unit, t.qty):
		// The amount's own header unit ("Total Fuel MMBtu") wins over a
		// unit column whose units are never it (gallons, Mcf: another
		// column's).
		return t.qty.unitIdent
	case t.unit != nil:
		return t.unit.ident
	}
	return t.qty.unitIdent
}

// scaled is a column's identifier, times its header's scale ("'000 L").
func scaled(c *column) string {
	s := c.ident
	switch c.hdr.Scale {
	case 0, 1:
	default:
		s += " * " + strconv.FormatFloat(c.hdr.Scale, 'f', -1, 64)
	}
	if c.hdr.Flow && c.hdr.FlowDays > 0 {
		// A flow per day, week or year over the days of the row's period.
		s += " * " + periodDaysIdent
		if c.hdr.FlowDays != 1 {
			s += " / " + strconv.FormatFloat(c.hdr.FlowDays, 'f', -1, 64)
		}
	}
	return s
}

// hasFlow reports a table with a flow column: its rules read the days of
// each row's period.
func hasFlow(t *tableSpec) bool {
	for _, c := range t.cols {
		if c.hdr.Flow && c.role != roleNone {
			return true
		}
	}
	return false
}

// compileRules compiles the rules for t (the user's, or proposed ones).
func (sc *scanCtx) compileRules(t *table) error {
	var srcs []string
	if len(sc.userRules) > 0 {
		for _, r := range sc.userRules {
			srcs = append(srcs, r.src)
		}
	} else {
		srcs = proposeRules(t.spec, sc.scope2Terms(t.spec))
	}
	idents := identList(t.spec)
	for _, src := range srcs {
		col, ex, _ := splitRule(src)
		opts := []funcs.CompileOption{funcs.WithVariables(idents...), sc.withGWPSet()}
		if len(sc.userRules) == 0 {
			// A proposed rule sums one call per column: its size follows the
			// table's width, not a person's typing.
			opts = append(opts, funcs.WithSizeLimit(len(ex)+1, 12*len(idents)+funcs.MaxExprNodes))
		}
		p, err := sc.e.Compile(ex, opts...)
		if err != nil {
			return &Error{Code: ErrRule, Path: sc.path, Err: err,
				Msg: "rule " + quoteText(src) + " for the table at " + t.spec.sheet + "!" + cellRef(t.spec.firstCol, t.spec.headerRow) + ": " + err.Error()}
		}
		r := &rule{column: col, src: ruleText(col, ex, p), prog: p, run: p.NewRunner(), paramVar: paramVars(sc.e, ex)}
		switch strings.ToLower(col) {
		case "tco2":
			r.total = 1
		case "tco2e":
			r.total = 2
		case strings.ToLower(scope2Column):
			r.total = 3
		}
		for _, v := range p.Variables() {
			r.vars = append(r.vars, t.bind(v))
		}
		if len(sc.userRules) == 0 && t.spec.kind == kindBuildPlan {
			if err := sc.buildPlanVariants(t, r); err != nil {
				return err
			}
		}
		t.rules = append(t.rules, r)
	}
	return sc.compileRowRules(t)
}

// buildPlanVariants compiles the build-plan rule without its trailing
// capacity factor and lifetime, for rows that leave them empty.
func (sc *scanCtx) buildPlanVariants(t *table, r *rule) error {
	spec := t.spec
	if spec.cf == nil {
		return nil
	}
	r.optional = []*column{spec.cf}
	if spec.life != nil {
		r.optional = append(r.optional, spec.life)
	}
	unit := spec.capacity.unitIdent
	if spec.unit != nil {
		unit = spec.unit.ident
	}
	base := "embodied(" + spec.tech.ident + ", " + scaled(spec.capacity) + ", " + unit
	cf := spec.cf.ident
	if spec.cf.hdr.Percent {
		cf += " / 100"
	}
	srcs := []string{base + ")", base + ", " + cf + ")"}
	for k := range r.optional {
		p, err := sc.e.Compile(srcs[k], funcs.WithVariables(identList(spec)...), sc.withGWPSet())
		if err != nil {
			return &Error{Code: ErrRule, Path: sc.path, Msg: "rule " + quoteText(srcs[k]) + ": " + err.Error(), Err: err}
		}
		v := &rule{column: r.column, src: ruleText(r.column, srcs[k], p), prog: p, run: p.NewRunner(), paramVar: paramVars(sc.e, srcs[k]), total: r.total}
		for _, name := range p.Variables() {
			v.vars = append(v.vars, t.bind(name))
		}
		r.variants = append(r.variants, v)
	}
	return nil
}

// paramVars maps the parameters of catalog calls in an expression to the
// variables passed to them, so that a failing parameter points at its cell.
func paramVars(e *funcs.Engine, src string) map[string]string {
	out := map[string]string{}
	tree, err := parser.Parse(src)
	if err != nil {
		return out
	}
	ast.Walk(&tree.Node, visitor(func(n ast.Node) {
		call, ok := n.(*ast.CallNode)
		if !ok {
			return
		}
		id, ok := call.Callee.(*ast.IdentifierNode)
		if !ok {
			return
		}
		f, ok := e.Function(id.Value)
		if !ok {
			return
		}
		for i, a := range call.Arguments {
			if i >= len(f.Params) {
				break
			}
			if v, ok := a.(*ast.IdentifierNode); ok {
				if _, dup := out[f.Params[i].Name]; !dup {
					out[f.Params[i].Name] = v.Value
				}
			}
		}
	}))
	return out
}

type visitor func(ast.Node)

func (v visitor) Visit(n *ast.Node) { v(*n) }

// unitColumnFor reports whether a unit column's sampled values include the
// unit written in the amount's header: the column then gives that amount's
// unit row by row.
func unitColumnFor(u, qty *column) bool {
	for text := range u.st.distinct {
		if pu, err := units.Lookup(text); err == nil && pu.Symbol == qty.hdr.Unit.Symbol {
			return true
		}
	}
	return len(u.st.distinct) == 0
}
