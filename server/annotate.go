package server

import (
	"github.com/gin-gonic/gin"
	"net/http"
)

// annotate serves POST /v1/annotate and POST /v1/inspect through Config.Annotate, the workbook importer's handler,
// with the upload limit applied: a body over MaxUploadBytes is refused with 413 before the
// handler runs when its length is declared, and cut off (reads fail with *http.MaxBytesError)
// when it is not.
func (s *Server) annotate(c *gin.Context) {
	if c.Request.ContentLength > s.cfg.MaxUploadBytes {
		s.abort(c, tooLarge(s.cfg.MaxUploadBytes))
		return
	}
	c.Request.Body = http.MaxBytesReader(c.Writer, c.Request.Body, s.cfg.MaxUploadBytes)
	r, outcome := withOutcome(c.Request)
	s.cfg.Annotate.ServeHTTP(c.Writer, r)
	if outcome.err != nil {
		c.Set(errKey, outcome.err) // logged on the request's line
	}
}
