package server

import (
	"errors"
	"fmt"
	"net/url"
	"strconv"
	"strings"
)

// format is the answer format of GET /v1/fn.
type format uint8

const (
	formatText format = iota // text/plain: the number alone
	formatJSON               // application/json: {"value", "unit", "sources", "notes"}
	formatCSV                // text/csv: a header line and a value line
	formatXML                // application/xml: <result><value>…</value>…</result>
)

// Reserved query parameters of GET /v1/fn; no catalog parameter may use these names.
const (
	paramFormat = "format"
	paramErrors = "errors"
	paramToken  = "token"
)

// Query limits of GET /v1/fn.
const (
	maxQueryParams = 32
	maxValueLen    = 256
)

// fnQuery is a parsed GET /v1/fn query: the function's arguments by parameter name and the
// reserved parameters.
type fnQuery struct {
	args   map[string]string
	format format
	inline bool // errors=inline: answer 200 with "#ERROR: message"
}

// parseFnQuery reads a raw query string. It always returns the format and errors mode it
// could read, so that an error about another parameter is answered in the format asked for.
// Errors: a malformed %-escape, a parameter without a name or given twice, a value over
// maxValueLen, more than maxQueryParams parameters, and bad values of format or errors; each
// names the parameter and what is accepted. The token parameter is dropped (the token check
// reads it). Parameters are not checked against the function here: funcs.Engine.Call does that.
func parseFnQuery(raw string) (fnQuery, *apiError) {
	q := fnQuery{args: make(map[string]string, 4)}
	var first *apiError
	fail := func(e *apiError) {
		if first == nil {
			first = e
		}
	}
	seen := 0
	reserved := map[string]bool{}
	for raw != "" {
		var part string
		part, raw, _ = strings.Cut(raw, "&")
		if part == "" {
			continue
		}
		seen++
		rawKey, rawVal, _ := strings.Cut(part, "=")
		if seen > maxQueryParams {
			fail(badRequest("query", "more than "+strconv.Itoa(maxQueryParams)+" query parameters"))
			if rawKey != paramFormat && rawKey != paramErrors {
				continue // still read format and errors, to answer in the form asked for
			}
		}
		key, err := url.QueryUnescape(rawKey)
		if err != nil {
			fail(badRequest("query", "query parameter name "+quoteText(rawKey)+" has a malformed %-escape; write %XX with two hex digits (ENCODEURL in a sheet does this)"))
			continue
		}
		val, err := url.QueryUnescape(rawVal)
		if err != nil {
			fail(badRequest(key, "query parameter "+key+" has a malformed %-escape in "+quoteText(rawVal)+"; write spaces as %20 or +, and other characters as %XX (ENCODEURL in a sheet does this)"))
			continue
		}
		switch {
		case key == "":
			fail(badRequest("query", "query parameter without a name ("+quoteText(part)+"); write name=value"))
			continue
		case len(val) > maxValueLen:
			fail(badRequest(key, "query parameter "+key+" is "+strconv.Itoa(len(val))+" bytes long; the limit is "+strconv.Itoa(maxValueLen)))
			continue
		}
		switch key {
		case paramToken, paramFormat, paramErrors:
			if reserved[key] {
				fail(badRequest(key, "query parameter "+key+" is given more than once; give it once"))
				continue
			}
			reserved[key] = true
		}
		switch key {
		case paramToken:
			continue
		case paramFormat:
			f, ok := parseFormat(val)
			if !ok {
				fail(badRequest(paramFormat, "format "+quoteText(val)+" is not known: accepted are text (the default), json, csv, xml"))
				continue
			}
			q.format = f
			continue
		case paramErrors:
			switch strings.ToLower(strings.TrimSpace(val)) {
			case "inline":
				q.inline = true
			case "", "status":
				q.inline = false
			default:
				fail(badRequest(paramErrors, "errors "+quoteText(val)+" is not known: accepted are status (the default: an error is a 4xx answer) and inline (a 200 answer reading #ERROR: message)"))
			}
			continue
		}
		if _, dup := q.args[key]; dup {
			fail(badRequest(key, "query parameter "+key+" is given more than once; give it once"))
			continue
		}
		q.args[key] = val
	}
	return q, first
}

func parseFormat(s string) (format, bool) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "text":
		return formatText, true
	case "json":
		return formatJSON, true
	case "csv":
		return formatCSV, true
	case "xml":
		return formatXML, true
	}
	return formatText, false
}

// checkQuery parses a raw query and refuses any parameter not in accepted (token is always
// accepted). It returns the values of the accepted ones.
func checkQuery(raw string, accepted ...string) *apiError {
	_, e := queryValues(raw, accepted...)
	return e
}

// queryValues parses a raw query: each accepted parameter at most once, token ignored, any
// other parameter refused with a message listing the accepted ones.
func queryValues(raw string, accepted ...string) (map[string]string, *apiError) {
	vals, err := url.ParseQuery(raw)
	if err != nil {
		return nil, badRequest("query", "malformed query: "+queryErrorText(err)+"; write name=value pairs joined by &, with %XX escapes")
	}
	out := map[string]string{}
	for k, vs := range vals {
		if k == paramToken {
			continue
		}
		ok := false
		for _, a := range accepted {
			ok = ok || a == k
		}
		if !ok {
			msg := "unknown query parameter " + fmt.Sprintf("%q", k) + ": "
			if len(accepted) == 0 {
				msg += "this route takes none"
			} else {
				msg += "accepted are " + strings.Join(accepted, ", ")
			}
			return nil, badRequest(k, msg)
		}
		if len(vs) > 1 {
			return nil, badRequest(k, "query parameter "+k+" is given more than once; give it once")
		}
		out[k] = vs[0]
	}
	return out, nil
}

func queryErrorText(err error) string {
	var ee url.EscapeError
	if errors.As(err, &ee) {
		return "malformed %-escape " + fmt.Sprintf("%q", string(ee))
	}
	return err.Error()
}
