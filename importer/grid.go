package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// gridFunc is the catalog function of purchased electricity (Scope 2,
// location-based); a workbook names a grid for its rows and columns.
const gridFunc = "electricity_co2e"

// CheckGrid checks a grid name as Options.Grid takes it (a country, a
// country code or a grid id: "DE", "Germany", "UK", "CAMX") and returns the
// grid's id. An error is an *Error of code ErrInput naming the option and
// what is accepted.
func CheckGrid(e *funcs.Engine, grid string) (string, error) {
	g := strings.TrimSpace(grid)
	if g == "" {
		return "", nil
	}
	info, err := e.ResolveGrid(g)
	if err != nil {
		return "", &Error{Code: ErrInput, Msg: "grid " + quoteText(g) + ": " + funcsMsg(err), Err: err}
	}
	return info.ID, nil
}

// funcsMsg is an engine error's message without its function prefix.
func funcsMsg(err error) string {
	if fe, ok := funcs.AsError(err); ok {
		return fe.Msg
	}
	return err.Error()
}

// gridName resolves a cell or title text as a grid, cached: the grid's
// id, or "" when the text names none.
func (lx *lexicon) gridName(s string) string {
	s = strings.TrimSpace(s)
	if s == "" || len(s) > 60 {
		return ""
	}
	if id, seen := lx.grids[s]; seen {
		return id
	}
	id := ""
	if info, err := lx.e.ResolveGrid(s); err == nil {
		id = info.ID
	}
	if len(lx.grids) < maxCache {
		lx.grids[s] = id
	}
	return id
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
	if g := d.lx.gridName(d.sc.opt.Grid); g != "" {
		t.grid = gridChoice{name: g, from: "--grid"}
		return
	}
	if t.ctxGrid != "" {
		t.grid = gridChoice{name: t.ctxGrid, from: t.ctxGridFrom}
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
