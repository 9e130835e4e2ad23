package server

import (
	"context"
	"errors"
	"io/fs"
	"net/http"
	"os"
	"strings"
	"syscall"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
)

// Codes of annotation failures on a client's workbook that the importer reports as its own
// (ErrInternal) or as a failure to write (ErrIO) although the workbook caused them.
const (
	codeWorkbookUnreadable = "workbook-unreadable" // a library failed on a part of the workbook
	codeWorkbookInvalid    = "workbook-invalid"    // the workbook holds what cannot be written back
)

// importerError maps an annotation failure to its answer. Everything the client's workbook
// causes is a 4xx: a library failing on it (importer.ErrInternal, a recovered panic) is 400
// with the details logged, a failure to write its content back (importer.ErrIO not caused by
// the file system) 400 with the library's message. Only a failing disk and errors of unknown
// kind are 5xx. The temporary paths are the server's business: messages leave dir out.
func importerError(err error, ctx context.Context, dir string) *apiError {
	var ie *importer.Error
	if !errors.As(err, &ie) {
		if fe, ok := funcs.AsError(err); ok {
			return fromFuncs(fe, false)
		}
		return internalError(err)
	}
	msg := ie.Msg
	if dir != "" {
		msg = strings.ReplaceAll(msg, dir+string(os.PathSeparator), "")
	}
	switch ie.Code {
	case importer.ErrTooLarge:
		return &apiError{Status: http.StatusRequestEntityTooLarge, Code: codeTooLarge, Msg: oneLine(msg)}
	case importer.ErrCancelled:
		if ctx.Err() == context.DeadlineExceeded {
			return &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout, Msg: "the annotation ran past the server's time limit"}
		}
		return &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout, Msg: "the request ended before the annotation did"}
	case importer.ErrInternal:
		return &apiError{Status: http.StatusBadRequest, Code: codeWorkbookUnreadable, cause: err,
			Msg: "the workbook could not be read: a part of it is malformed; check that it opens in a spreadsheet program and save it again"}
	case importer.ErrIO:
		if fileSystemFault(ie.Err) {
			return internalError(err)
		}
		return &apiError{Status: http.StatusBadRequest, Code: codeWorkbookInvalid,
			Msg: oneLine(cutText("the workbook cannot be annotated: "+msg, maxLoggedText) + "; check that it opens in a spreadsheet program and save it again")}
	}
	out := &apiError{Status: http.StatusBadRequest, Code: "workbook-" + ie.Code, Msg: oneLine(msg)}
	if first, _, multi := strings.Cut(msg, "\n"); multi {
		// a rule's compile error: the expression and a caret on lines of their own
		out.Msg, out.Detail = oneLine(first), strings.ToValidUTF8(msg, "\ufffd")
	}
	return out
}

// fileSystemFault reports whether err comes from the file system (a full or failing disk, a
// permission), not from the content being written.
func fileSystemFault(err error) bool {
	var pe *fs.PathError
	var le *os.LinkError
	var se *os.SyscallError
	var errno syscall.Errno
	return err != nil && (errors.As(err, &pe) || errors.As(err, &le) || errors.As(err, &se) || errors.As(err, &errno))
}

// outcomeKey is the request context key of an *annotateOutcome.
type outcomeKey struct{}

// annotateOutcome carries the error answer of the annotate handler back to the server, which
// logs it on the request's line (once, within the log's budget).
type annotateOutcome struct {
	err *apiError
}

// withOutcome returns r with a slot for the handler's error answer.
func withOutcome(r *http.Request) (*http.Request, *annotateOutcome) {
	o := &annotateOutcome{}
	return r.WithContext(context.WithValue(r.Context(), outcomeKey{}, o)), o
}

// reportOutcome hands e to the server when r has a slot for it; false when the handler runs
// on its own and must log itself.
func reportOutcome(r *http.Request, e *apiError) bool {
	o, ok := r.Context().Value(outcomeKey{}).(*annotateOutcome)
	if ok {
		o.err = e
	}
	return ok
}
