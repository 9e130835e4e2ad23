package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// gridFunc is the catalog function of purchased electricity (Scope 2,
// location-based); a workbook names a grid for its rows and columns.
const gridFunc = "electricity_co2e"

// CheckGrid checks a grid name as Options.Grid takes it (a country, a
// country code or a grid id: "DE", "Germany", "UK", "CAMX") and returns it
// trimmed. An error is an *Error of code ErrInput naming the option and
// what is accepted, or saying that the engine has no grid factors.
func CheckGrid(e *funcs.Engine, grid string) (string, error) {
	g := strings.TrimSpace(grid)
	if g == "" {
		return "", nil
	}
	if msg := gridProblem(e, g); msg != "" {
		return "", &Error{Code: ErrInput, Msg: "grid " + quoteText(g) + ": " + msg}
	}
	return g, nil
}

// gridProblem says why g is no grid the engine has a factor for; "" when
// it is one.
func gridProblem(e *funcs.Engine, g string) string {
	if _, ok := e.Function(gridFunc); !ok {
		return "this build of fluecell has no grid factors (no function " + gridFunc + ")"
	}
	if _, err := e.CallValues(gridFunc, 1.0, "kWh", g); err != nil {
		if fe, ok := funcs.AsError(err); ok {
			return fe.Msg
		}
		return err.Error()
	}
	return ""
}

// gridName reads a cell or title text as a grid, cached; ok is false when
// it names none (or the engine has no grid factors).
func (lx *lexicon) gridName(s string) bool {
	s = strings.TrimSpace(s)
	if s == "" || len(s) > 60 {
		return false
	}
	if ok, seen := lx.grids[s]; seen {
		return ok
	}
	_, has := lx.e.Function(gridFunc)
	ok := has && gridProblem(lx.e, s) == ""
	if len(lx.grids) < maxCache {
		lx.grids[s] = ok
	}
	return ok
}

// gridChoice is where a table's grid comes from: a column (row by row), or
// one grid for the table, and what said so (for the findings and the
// rule).
type gridChoice struct {
	col  *column // a column naming each row's grid; nil when none
	name string  // the one grid of the table, "" when none
	from string  // "--grid", "the mapping m.json", "the title ..."
}

// known reports whether rows of purchased electricity can be computed.
func (g gridChoice) known() bool { return g.col != nil || g.name != "" }

// arg is the grid argument of a rule: the column's identifier or the name
// quoted.
func (g gridChoice) arg() string {
	if g.col != nil {
		return g.col.ident
	}
	return quoteRuleString(g.name)
}

// quoteRuleString quotes s as a string literal of a rule.
func quoteRuleString(s string) string {
	return "\"" + strings.NewReplacer("\\", "\\\\", "\"", "\\\"").Replace(s) + "\""
}

// chooseGrid decides t's grid: a column of grid names first, then the
// mapping's table and workbook entries, then Options.Grid, then a grid
// named in the title rows.
func (d *detector) chooseGrid(t *tableSpec) {
	if t.gridCol != nil {
		t.grid = gridChoice{col: t.gridCol, from: "column " + quoteText(t.gridCol.hdr.Text)}
		return
	}
	if g, from := d.sc.mappedGrid(t); g != "" {
		t.grid = gridChoice{name: g, from: from}
		return
	}
	if g := strings.TrimSpace(d.sc.opt.Grid); g != "" {
		t.grid = gridChoice{name: g, from: "--grid"}
		return
	}
	if t.ctxGrid != "" {
		t.grid = gridChoice{name: t.ctxGrid, from: "the title " + quoteText(t.ctxGridFrom)}
	}
}

// gridUnknown records, once per scan, the finding at the first cell of
// purchased electricity that no grid covers, saying how to choose one.
// It returns the cell of that finding, for the reasons of the other rows.
func (sc *scanCtx) gridUnknown(sheet string, col, row int, what string) string {
	if sc.gridAt == "" {
		sc.gridAt = sheet + "!" + cellRef(col, row)
		sc.warn.add(sheet, col, row, SevWarning, CodeGridUnknown, what+" is purchased electricity (Scope 2): it needs the factor of its grid, and none is given. "+
			"Name one with --grid (e.g. --grid DE, --grid UK, --grid CAMX; server: ?grid=DE), with \"grid\" in a mapping (the workbook's or a table's), "+
			"or with a column of countries or grid regions beside the amounts; until then such rows and columns are not computed")
	}
	return sc.gridAt
}
