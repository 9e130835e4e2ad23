package server

import (
	"net/http"
	"net/url"
	"strconv"
	"strings"

	"github.com/expr-lang/expr/ast"
	"github.com/expr-lang/expr/parser"
	"github.com/gin-gonic/gin"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// caution goes with every list of factors.
const caution = "Default factors are Tier 1 estimates (IPCC 2006 defaults, EPA Hub averages). " +
	"Regulated reporting follows the jurisdiction's rules and accredited verification."

// page is a pre-rendered answer that does not change while the server runs.
type page struct {
	contentType []string
	length      []string
	body        []byte
	etag        []string
}

func newPage(contentType string, body []byte) *page {
	return &page{contentType: []string{contentType}, length: []string{strconv.Itoa(len(body))}, body: body,
		etag: []string{etagOf(contentType, body)}}
}

// staticPages are the answers built once per server.
type staticPages struct {
	functions *page
	function  map[string]*page
	units     *page
	health    *page
	openapi   *page
}

// functionDoc is a catalog function as GET /v1/functions lists it: the declaration plus the
// URL of its example call.
type functionDoc struct {
	*funcs.Function
	ExampleURL string `json:"example_url"`
}

// unitDoc is one unit as GET /v1/units lists it.
type unitDoc struct {
	Symbol     string   `json:"symbol"`
	Name       string   `json:"name"`
	Dimension  string   `json:"dimension"`
	SIFactor   string   `json:"si_factor"` // exact decimal (a fraction n/d where none is finite): 1 unit = si_factor si_unit
	SIUnit     string   `json:"si_unit"`
	UsualBasis string   `json:"usual_basis,omitempty"`
	Spellings  []string `json:"spellings"`
	Source     string   `json:"source"`
}

// siUnit is the SI unit the factors of a dimension are stated in.
func siUnit(d units.Dimension) string {
	switch d {
	case units.Energy:
		return "J"
	case units.Mass:
		return "kg"
	case units.Volume:
		return "m3"
	case units.Power:
		return "W"
	case units.Time:
		return "s"
	case units.Length:
		return "m"
	case units.Area:
		return "m2"
	}
	return ""
}

func buildStatic(e *funcs.Engine, version string) (staticPages, error) {
	var sp staticPages
	var docs []functionDoc
	sp.function = map[string]*page{}
	for _, f := range e.Functions() {
		u, err := exampleURL(f)
		if err != nil {
			return sp, err
		}
		d := functionDoc{Function: f, ExampleURL: u}
		docs = append(docs, d)
		b, err := marshalJSON(d)
		if err != nil {
			return sp, err
		}
		sp.function[f.Name] = newPage(ctJSON, b)
	}
	b, err := marshalJSON(map[string]any{"functions": docs})
	if err != nil {
		return sp, err
	}
	sp.functions = newPage(ctJSON, b)

	var us []unitDoc
	for _, u := range e.Units() {
		sp := u.Spellings
		if sp == nil {
			sp = []string{}
		}
		us = append(us, unitDoc{Symbol: u.Symbol, Name: u.Name, Dimension: u.Dim.String(), SIFactor: u.Exact,
			SIUnit: siUnit(u.Dim), UsualBasis: u.Usual.String(), Spellings: sp, Source: u.Source})
	}
	b, err = marshalJSON(map[string]any{"units": us, "notes": []string{
		`An energy unit may carry a heating-value basis: "MMBtu HHV", "GJ NCV" (GCV = HHV, LHV = NCV).`,
		"A year is 365 days (8760 h), for TWyr and for capacity factors.",
		"Ambiguous spellings (ton, MT, MBtu, Mgal) are errors that name the alternatives.",
		"Case is ignored only where it cannot change an SI prefix or read another SI unit: mwh is MWh, but mWh (milliwatt hour), mJ and mW are refused.",
		"A bare gallon is the US gallon, with a note in results; imperial gallons are gal_imp (\"imperial gallons\", \"UK gal\").",
		"A gas volume in m3 is read at the ISO 13443 standard reference conditions (15 °C, 101.325 kPa), i.e. as Sm3; Nm3 (0 °C) = 288.15/273.15 Sm3 for an ideal gas.",
	}})
	if err != nil {
		return sp, err
	}
	sp.units = newPage(ctJSON, b)

	b, err = marshalJSON(map[string]any{"status": "ok", "version": version, "factors_version": e.Version(),
		"default_pack": e.DefaultPackName(), "packs": e.PackNames()})
	if err != nil {
		return sp, err
	}
	sp.health = newPage(ctJSON, b)
	sp.openapi = newPage(ctYAML, []byte(openapiYAML))
	return sp, nil
}

// exampleURL turns a function's example expression, a call with literal arguments, into the
// path and query of the same call over GET /v1/fn.
func exampleURL(f *funcs.Function) (string, error) {
	tree, err := parser.Parse(f.Example)
	if err != nil {
		return "", err
	}
	call, ok := tree.Node.(*ast.CallNode)
	if !ok || len(call.Arguments) > len(f.Params) {
		return "", &apiError{Msg: "example of " + f.Name + " is not a call with literal arguments: " + f.Example}
	}
	var q []string
	for i, a := range call.Arguments {
		var v string
		switch a := a.(type) {
		case *ast.StringNode:
			v = a.Value
		case *ast.IntegerNode:
			v = strconv.Itoa(a.Value)
		case *ast.FloatNode:
			v = funcs.FormatNumber(a.Value)
		case *ast.UnaryNode:
			if n, ok := a.Node.(*ast.IntegerNode); ok && a.Operator == "-" {
				v = "-" + strconv.Itoa(n.Value)
			} else if n, ok := a.Node.(*ast.FloatNode); ok && a.Operator == "-" {
				v = "-" + funcs.FormatNumber(n.Value)
			} else {
				return "", &apiError{Msg: "example of " + f.Name + " has a non-literal argument: " + f.Example}
			}
		default:
			return "", &apiError{Msg: "example of " + f.Name + " has a non-literal argument: " + f.Example}
		}
		q = append(q, url.QueryEscape(f.Params[i].Name)+"="+url.QueryEscape(v))
	}
	return "/v1/fn/" + f.Name + "?" + strings.Join(q, "&"), nil
}

// writePage sends a page with its ETag, or 304 when If-None-Match names it.
func (s *Server) writePage(c *gin.Context, p *page) {
	h := c.Writer.Header()
	h["Etag"] = p.etag
	h["Cache-Control"] = s.hdr.page
	if inm := c.Request.Header.Get("If-None-Match"); inm != "" && etagMatch(inm, p.etag[0]) {
		c.Writer.WriteHeader(http.StatusNotModified)
		c.Writer.WriteHeaderNow()
		return
	}
	h["Content-Type"] = p.contentType
	h["Content-Length"] = p.length
	c.Writer.WriteHeader(http.StatusOK)
	_, _ = c.Writer.Write(p.body)
}

func (s *Server) healthz(c *gin.Context) { s.writePage(c, s.static.health) }

func (s *Server) openapi(c *gin.Context) { s.writePage(c, s.static.openapi) }

func (s *Server) functions(c *gin.Context) {
	s.writePage(c, s.static.functions)
}

func (s *Server) function(c *gin.Context) {
	name := c.Param("name")
	p, ok := s.static.function[name]
	if !ok {
		_, err := s.engine.Call(name, nil) // the engine's message, with a suggestion
		s.abort(c, fromFuncs(err, true))
		return
	}
	s.writePage(c, p)
}

func (s *Server) units(c *gin.Context) {
	s.writePage(c, s.static.units)
}

// factorsDoc is the answer of GET /v1/factors.
type factorsDoc struct {
	Pack        string           `json:"pack"`
	DefaultPack string           `json:"default_pack"`
	Packs       []funcs.PackInfo `json:"packs"`
	Fuel        *funcs.Fuel      `json:"fuel,omitempty"`
	Factors     []*funcs.Factor  `json:"factors"`
	Fuels       []funcs.Fuel     `json:"fuels,omitempty"`
	Caution     string           `json:"caution"`
}

// factors answers GET /v1/factors[?pack=&fuel=]: the rows of a pack (and the common rows),
// for one fuel when fuel is given, with every pack's description.
func (s *Server) factors(c *gin.Context) {
	q, e := queryValues(c.Request.URL.RawQuery, "pack", "fuel")
	if e != nil {
		s.abort(c, e)
		return
	}
	rows, err := s.engine.Factors(q["pack"], q["fuel"])
	if err != nil {
		s.abort(c, fromFuncs(err, false))
		return
	}
	if rows == nil {
		rows = []*funcs.Factor{}
	}
	doc := factorsDoc{Pack: q["pack"], DefaultPack: s.engine.DefaultPackName(), Packs: s.engine.Packs(), Factors: rows, Caution: caution}
	if doc.Pack == "" {
		doc.Pack = doc.DefaultPack
	} else {
		doc.Pack = strings.ToLower(strings.TrimSpace(doc.Pack))
	}
	if fuel := q["fuel"]; fuel != "" {
		f, _, err := s.engine.ResolveFuel(fuel)
		if err != nil {
			s.abort(c, fromFuncs(err, false))
			return
		}
		doc.Fuel = &f
	} else {
		doc.Fuels = s.engine.Fuels()
	}
	b, err := marshalJSON(doc)
	if err != nil {
		s.abort(c, internalError(err))
		return
	}
	s.writePage(c, newPage(ctJSON, b))
}
