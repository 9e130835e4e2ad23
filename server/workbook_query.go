package server

import (
	"net/url"
	"strconv"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
)

// Routes of the workbook handler (AnnotateHandler), told apart by the request's path.
const (
	routeAnnotate = "/v1/annotate"
	routeInspect  = "/v1/inspect"
)

// Preview rows of POST /v1/inspect: the default and the most a request may ask for.
const (
	defaultPreviewRows = 20
	maxPreviewRows     = 200
)

// workbookRequest is what the query of POST /v1/annotate or /v1/inspect asks for.
type workbookRequest struct {
	opt    importer.Options
	report bool // annotate: answer the report instead of the workbook
	rows   int  // inspect: data rows previewed per table
}

// parseQuery checks the query of a workbook request against the handler's engine: rule
// (repeatable), sheet, pack, grid, gwp_set, name and uncertainty (seed, draws) on both routes, report=json on /v1/annotate,
// rows on /v1/inspect. Errors name the parameter.
func (h *annotateHandler) parseQuery(q url.Values, inspect bool) (workbookRequest, *apiError) {
	req := workbookRequest{rows: defaultPreviewRows}
	for k := range q {
		switch k {
		case "rule", "sheet", "pack", "grid", "gwp_set", "name", "token", "uncertainty", "seed", "draws":
		case "report":
			if !inspect {
				continue
			}
			return req, badRequest(k, "unknown parameter "+quoteText(k)+": /v1/inspect takes rule, sheet, pack, grid, gwp_set, name, uncertainty (with seed and draws) and rows (the report is in its answer)")
		case "rows":
			if inspect {
				continue
			}
			fallthrough
		default:
			if inspect {
				return req, badRequest(k, "unknown parameter "+quoteText(k)+": /v1/inspect takes rule, sheet, pack, grid, gwp_set, name, uncertainty (with seed and draws) and rows")
			}
			return req, badRequest(k, "unknown parameter "+quoteText(k)+": /v1/annotate takes rule, sheet, pack, grid, gwp_set, name, report=json and uncertainty=approach1|approach2 (with seed and draws)")
		}
	}
	switch v := q.Get("report"); v {
	case "":
	case "json":
		req.report = true
	default:
		return req, badRequest("report", "report="+quoteText(v)+": the only accepted value is json")
	}
	if v := q.Get("rows"); v != "" {
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 || n > maxPreviewRows {
			return req, badRequest("rows", "rows="+quoteText(v)+": give a whole number of rows from 1 to "+strconv.Itoa(maxPreviewRows))
		}
		req.rows = n
	}
	ivOpt, apiErr := intervalQuery(q)
	if apiErr != nil {
		return req, apiErr
	}
	opt := h.cfg.Options
	opt.Uncertainty = ivOpt
	opt.Rules = append(append([]string(nil), opt.Rules...), q["rule"]...)
	opt.Sheet = q.Get("sheet")
	if g := q.Get("grid"); g != "" {
		if _, err := importer.CheckGrid(h.e, g); err != nil {
			return req, badRequest("grid", err.Error())
		}
		opt.Grid = g
	}
	if g := q.Get("gwp_set"); g != "" {
		if _, err := h.e.ResolveGWPSet(g); err != nil {
			return req, badRequest("gwp_set", "gwp_set="+quoteText(g)+": "+gwpSetMessage(err))
		}
		opt.GWPSet = g
	}
	if p := q.Get("pack"); p != "" {
		if _, err := h.e.Factors(p, ""); err != nil {
			return req, fromFuncs(err, false)
		}
		opt.Pack = p
	}
	req.opt = opt
	return req, nil
}

// gwpSetMessage is the message of an unknown GWP set: the accepted sets.
func gwpSetMessage(err error) string {
	if fe, ok := funcs.AsError(err); ok {
		return fe.Msg
	}
	return err.Error()
}
