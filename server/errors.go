package server

import (
	"errors"
	"net/http"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Error codes of the server itself; the others are the codes of package funcs.
const (
	codeBadRequest       = "bad-request"            // a malformed query, body or header
	codeUnauthorized     = "unauthorized"           // token missing or wrong
	codeNotFound         = "not-found"              // no such route
	codeMethod           = "method-not-allowed"     // route exists, method does not
	codeTooLarge         = "too-large"              // body or row count over the limit
	codeMediaType        = "unsupported-media-type" // a body of a type the route does not read
	codeTimeout          = "timeout"                // the evaluation ran past EvalTimeout
	codeInternal         = "internal"               // a fault of the server
	internalErrorMessage = "internal error; the server log has the details"
)

// apiError is an error answer: its status and what the client is told. Messages name the
// parameter and what would be accepted.
type apiError struct {
	Status   int
	Code     string
	Func     string
	Param    string
	Msg      string // one line
	Position int    // 1-based character position in an expression, 0 when none
	Detail   string // several lines (the expression with a caret under the position), or ""
	cause    error  // logged for 5xx, never sent
}

func (e *apiError) Error() string { return e.Msg }

// errorBody is the JSON form of an error, the Error schema of openapi.yaml.
type errorBody struct {
	Error    string `json:"error"`
	Code     string `json:"code"`
	Function string `json:"function,omitempty"`
	Param    string `json:"param,omitempty"`
	Position int    `json:"position,omitempty"`
	Detail   string `json:"detail,omitempty"`
}

func (e *apiError) body() errorBody {
	return errorBody{Error: e.Msg, Code: e.Code, Function: e.Func, Param: e.Param, Position: e.Position, Detail: e.Detail}
}

func badRequest(param, msg string) *apiError {
	return &apiError{Status: http.StatusBadRequest, Code: codeBadRequest, Param: oneLine(param), Msg: oneLine(msg)}
}

// oneLine makes a message safe for one line of text: invalid UTF-8 and control characters
// (which user input may bring into a message) become U+FFFD and spaces.
func oneLine(s string) string {
	clean := true
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c == 0x7f || c >= 0x80 {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	return strings.Map(func(r rune) rune {
		if r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) {
			return ' '
		}
		return r
	}, strings.ToValidUTF8(s, "\ufffd"))
}

// cutText cuts s to at most n bytes at a character boundary, marking the cut with "…"
// (which the n bytes include). Invalid UTF-8 is left to oneLine.
func cutText(s string, n int) string {
	if len(s) <= n {
		return s
	}
	const mark = "…"
	return cutBytes(s, max(n-len(mark), 0)) + mark
}

// maxQuotedText bounds a client's text quoted in a message.
const maxQuotedText = 64

// quoteText quotes a client's text (a parameter name, a value, a header) for a message: cut
// to maxQuotedText bytes between characters, in double quotes, with control characters and
// invalid UTF-8 escaped (a newline shows as \n).
func quoteText(s string) string {
	return strconv.Quote(cutText(s, maxQuotedText))
}

func internalError(cause error) *apiError {
	return &apiError{Status: http.StatusInternalServerError, Code: codeInternal, Msg: internalErrorMessage, cause: cause}
}

// fromFuncs maps an error of package funcs to its answer: every funcs code is a client
// mistake (400), except an unknown function called by name (404 when notFound is set: the
// route /v1/fn/{name} names a resource that does not exist). Anything that is not a
// *funcs.Error is a fault of the server.
func fromFuncs(err error, notFound bool) *apiError {
	var ae *apiError
	if errors.As(err, &ae) {
		return ae
	}
	fe, ok := funcs.AsError(err)
	if !ok {
		return internalError(err)
	}
	status := http.StatusBadRequest
	if notFound && fe.Code == funcs.CodeUnknownFunction {
		status = http.StatusNotFound
	}
	if fe.Code == funcs.CodePack {
		// packs are loaded at start-up; a pack error at request time is ours
		return internalError(err)
	}
	out := &apiError{Status: status, Code: fe.Code, Func: fe.Func, Param: oneLine(fe.Param), Position: fe.Position}
	if fe.Position > 0 {
		// the expression and a caret under the position, on lines of their own
		out.Msg = oneLine(fe.Headline())
		out.Detail = strings.ToValidUTF8(fe.Error(), "\ufffd")
	} else {
		out.Msg = oneLine(fe.Error())
	}
	return out
}
