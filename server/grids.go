package server

import (
	"github.com/gin-gonic/gin"

	"github.com/fluecell/fluecell/funcs"
)

// gridsDoc is the answer of GET /v1/grids: every grid the Scope 2 functions accept, or one
// grid (read from a name as analysts write it) with its factor rows.
type gridsDoc struct {
	Grids   []funcs.GridInfo `json:"grids,omitempty"`
	Grid    *funcs.GridInfo  `json:"grid,omitempty"`
	Factors []*funcs.Factor  `json:"factors,omitempty"`
	Caution string           `json:"caution"`
}

// grids answers GET /v1/grids[?grid=]: the grids with their sets, years, methods and losses,
// or, with grid, that grid's rows ("Germany", "eGRID CAMX" and "us_camx" all work).
func (s *Server) grids(c *gin.Context) {
	q, e := queryValues(c.Request.URL.RawQuery, "grid")
	if e != nil {
		s.abort(c, e)
		return
	}
	doc := gridsDoc{Caution: caution}
	if name, ok := q["grid"]; ok {
		g, rows, err := s.engine.GridFactors(name)
		if err != nil {
			s.abort(c, fromFuncs(err, false))
			return
		}
		doc.Grid, doc.Factors = &g, rows
	} else {
		doc.Grids = s.engine.Grids()
	}
	b, err := marshalJSON(doc)
	if err != nil {
		s.abort(c, internalError(err))
		return
	}
	s.writePage(c, newPage(ctJSON, b))
}
