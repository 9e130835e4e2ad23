package server

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Content types of the answers.
const (
	ctText = "text/plain; charset=utf-8"
	ctJSON = "application/json; charset=utf-8"
	ctCSV  = "text/csv; charset=utf-8"
	ctXML  = "application/xml; charset=utf-8"
	ctYAML = "application/yaml; charset=utf-8"
)

// inlinePrefix starts the text of an error answered with errors=inline.
const inlinePrefix = "#ERROR: "

func (f format) contentType() string {
	switch f {
	case formatJSON:
		return ctJSON
	case formatCSV:
		return ctCSV
	case formatXML:
		return ctXML
	}
	return ctText
}

// renderResult writes a function's result in format f.
func (s *Server) renderResult(f format, r funcs.Result) ([]byte, error) {
	switch f {
	case formatJSON:
		return s.json.resultJSON(r)
	case formatCSV:
		var b bytes.Buffer
		w := csv.NewWriter(&b)
		_ = w.Write([]string{"value", "unit", "sources"})
		_ = w.Write([]string{funcs.FormatNumber(r.Value), r.Unit, strings.Join(r.FactorKeys(), " ")})
		w.Flush()
		return b.Bytes(), w.Error()
	case formatXML:
		type source struct {
			Factor   string `xml:"factor,attr"`
			Citation string `xml:",chardata"`
		}
		type result struct {
			XMLName xml.Name `xml:"result"`
			Value   string   `xml:"value"`
			Unit    string   `xml:"unit"`
			Sources []source `xml:"sources>source"`
			Notes   []string `xml:"notes>note"`
		}
		doc := result{Value: funcs.FormatNumber(r.Value), Unit: r.Unit, Notes: r.Notes}
		for _, s := range r.Sources {
			doc.Sources = append(doc.Sources, source{Factor: s.Key(), Citation: s.Citation()})
		}
		return marshalXML(doc)
	}
	return []byte(funcs.FormatNumber(r.Value)), nil
}

// renderError writes an error answer in format f; inline errors in text and CSV start with
// "#ERROR: " so that a sheet cell shows why.
func renderError(f format, e *apiError, inline bool) ([]byte, error) {
	switch f {
	case formatJSON:
		return marshalJSON(e.body())
	case formatCSV:
		msg := e.Msg
		if inline {
			msg = inlinePrefix + msg
		}
		var b bytes.Buffer
		w := csv.NewWriter(&b)
		_ = w.Write([]string{"error", "code"})
		_ = w.Write([]string{msg, e.Code})
		w.Flush()
		return b.Bytes(), w.Error()
	case formatXML:
		type errDoc struct {
			XMLName xml.Name `xml:"error"`
			Code    string   `xml:"code,attr"`
			Param   string   `xml:"param,attr,omitempty"`
			Msg     string   `xml:",chardata"`
		}
		return marshalXML(errDoc{Code: e.Code, Param: e.Param, Msg: e.Msg})
	}
	if inline {
		return []byte(inlinePrefix + e.Msg), nil
	}
	return []byte(e.Msg), nil
}

// marshalJSON is json.Marshal without HTML escaping (messages quote "<" and "&" as they are).
func marshalJSON(v any) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(b.Bytes(), []byte("\n")), nil
}

func marshalXML(v any) ([]byte, error) {
	out, err := xml.Marshal(v)
	if err != nil {
		return nil, err
	}
	return append([]byte(xml.Header), out...), nil
}
