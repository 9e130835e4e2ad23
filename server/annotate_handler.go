package server

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"mime"
	"net/http"
	"os"
	"runtime"
	"strconv"
	"strings"
	"time"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
)

// Content types of workbooks.
const (
	typeXLSX = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
	typeXLSM = "application/vnd.ms-excel.sheet.macroEnabled.12"
	typeCSV  = "text/csv"
	// mime.ParseMediaType lower-cases media types (they are case-insensitive): requests are
	// matched against this form of typeXLSM.
	typeXLSMFolded = "application/vnd.ms-excel.sheet.macroenabled.12"
)

// AnnotateConfig configures AnnotateHandler.
type AnnotateConfig struct {
	// Options are the importer options every request starts from (user
	// factor files, limits); a request may add rules, a sheet and a pack.
	Options importer.Options
	// Concurrent is how many workbooks are annotated at once (default: the
	// number of CPUs); further requests wait for a turn until their
	// deadline.
	Concurrent int
	// Timeout bounds one annotation, upload and answer included (default 5
	// minutes); past it the answer is 503.
	Timeout time.Duration
	// TempDir holds the uploads and outputs while a request runs ("" = the
	// system's temporary folder), in TempDir/fluecell-spool/PID.START/; each
	// request's files are removed when it ends, and what a crashed or
	// stopped server left there is removed when AnnotateHandler is called.
	TempDir string
	// UploadGrace and MinUploadRate bound how slowly an upload may arrive:
	// the whole body must be in within UploadGrace plus one second per
	// MinUploadRate bytes received (defaults 30 s and 16 KiB/s), else the
	// answer is 408. An upload is read in full before it waits for a turn,
	// so slow clients hold no turn.
	UploadGrace   time.Duration
	MinUploadRate int64 // bytes per second
	// MaxUploads bounds the uploads being received at once (default 8 per
	// turn, at least 16): one more is refused with 503 before it is read,
	// which bounds the spool folder to MaxUploads times the upload limit.
	MaxUploads int
	Logger     *slog.Logger
}

// Defaults of AnnotateConfig's upload pace.
const (
	DefaultUploadGrace   = 30 * time.Second
	DefaultMinUploadRate = 16 << 10
)

// AnnotateHandler returns the handler of POST /v1/annotate and POST /v1/inspect
// (told apart by the path), to be set as Config.Annotate. The body is the
// workbook (.xlsx, .xlsm, .xls or CSV, by Content-Type or the name= query
// parameter), or a multipart form whose part "file" holds it and whose part
// "mapping" may hold a mapping file (JSON, importer.ParseMapping). Query
// parameters: rule (repeatable, "COLUMN = EXPR"), sheet, pack, grid, name,
// uncertainty (approach1 or approach2, with seed and draws) for the 95 %
// intervals of the totals; report=json (annotate) answers the report instead
// of the annotated workbook; rows (inspect) is how many data rows of each
// table are previewed.
// /v1/inspect answers how the workbook was read (importer.Inspect), the first
// rows of each table and the reading as a mapping file; it writes nothing.
// The upload is spooled to a temporary file and every file is removed at the end.
func AnnotateHandler(e *funcs.Engine, cfg AnnotateConfig) http.Handler {
	if cfg.Concurrent <= 0 {
		cfg.Concurrent = runtime.NumCPU()
	}
	if cfg.Timeout <= 0 {
		cfg.Timeout = 5 * time.Minute
	}
	if cfg.UploadGrace <= 0 {
		cfg.UploadGrace = DefaultUploadGrace
	}
	if cfg.MinUploadRate <= 0 {
		cfg.MinUploadRate = DefaultMinUploadRate
	}
	if cfg.Logger == nil {
		cfg.Logger = slog.New(slog.NewTextHandler(io.Discard, nil))
	}
	if cfg.MaxUploads <= 0 {
		cfg.MaxUploads = max(8*cfg.Concurrent, 16)
	}
	h := &annotateHandler{e: e, cfg: cfg, turns: make(chan struct{}, cfg.Concurrent), uploads: make(chan struct{}, cfg.MaxUploads)}
	spool, removed, err := newSpoolRoot(cfg.TempDir, 2*cfg.Timeout+time.Minute)
	if err != nil {
		cfg.Logger.Warn("annotate: uploads go straight into the temporary folder", "err", err)
	} else {
		h.spool = spool
	}
	if removed > 0 {
		cfg.Logger.Info("annotate: removed uploads left by servers no longer running", "folders", removed)
	}
	return h
}

type annotateHandler struct {
	e       *funcs.Engine
	cfg     AnnotateConfig
	turns   chan struct{}
	uploads chan struct{} // one per upload being received or annotated
	spool   *spoolRoot    // nil: folders are made in TempDir itself
}

// Close removes the handler's spool folder, with whatever requests still running have in it;
// the server calls it once it has stopped.
func (h *annotateHandler) Close() error {
	if h.spool == nil {
		return nil
	}
	return h.spool.close()
}

// requestDir makes the folder of one request's files.
func (h *annotateHandler) requestDir() (string, error) {
	if h.spool != nil {
		return h.spool.request()
	}
	return os.MkdirTemp(h.cfg.TempDir, legacySpoolPrefix)
}

func (h *annotateHandler) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	// A workbook takes longer than a function call: extend this request's
	// deadlines past the server's defaults, up to the annotation timeout.
	deadline := time.Now().Add(h.cfg.Timeout)
	rc := http.NewResponseController(w)
	_ = rc.SetReadDeadline(deadline)
	_ = rc.SetWriteDeadline(deadline.Add(30 * time.Second))
	ctx, cancel := context.WithDeadline(r.Context(), deadline)
	defer cancel()

	inspect := strings.HasSuffix(r.URL.Path, routeInspect)
	q := r.URL.Query()
	req, apiErr := h.parseQuery(q, inspect)
	if apiErr != nil {
		h.fail(w, r, apiErr)
		return
	}

	// The upload is read in full first, at a minimum pace; only then does it
	// wait for a turn: a slow client holds a connection, never a turn.
	select {
	case h.uploads <- struct{}{}:
		defer func() { <-h.uploads }()
	default:
		h.fail(w, r, &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout,
			Msg: "the server is receiving " + strconv.Itoa(h.cfg.MaxUploads) + " other workbooks; try again later"})
		return
	}
	dir, err := h.requestDir()
	if err != nil {
		h.fail(w, r, internalError(err))
		return
	}
	defer os.RemoveAll(dir)
	r.Body = &pacedBody{r: r.Body, rc: rc, start: time.Now(), grace: h.cfg.UploadGrace, rate: h.cfg.MinUploadRate, end: deadline}
	up, apiErr := receiveUpload(r, q.Get("name"), dir)
	if apiErr != nil {
		h.fail(w, r, apiErr)
		return
	}
	_ = rc.SetReadDeadline(time.Time{}) // the body is read; nothing more is expected
	opt := req.opt
	if up.mapping != nil {
		m, err := importer.ParseMapping(h.e, "mapping.json", up.mapping)
		if err != nil {
			h.fail(w, r, badRequest("mapping", err.Error()))
			return
		}
		opt.Mapping = m
	}

	select {
	case h.turns <- struct{}{}:
		defer func() { <-h.turns }()
	case <-ctx.Done():
		h.fail(w, r, &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout, Msg: "the server is busy annotating other workbooks; try again later"})
		return
	}
	if inspect {
		h.inspect(ctx, w, r, up, dir, opt, req.rows)
		return
	}
	in := up.path
	out := importer.DefaultOutput(in) // a legacy .xls comes back as .xlsx
	rep, err := importer.Annotate(ctx, h.e, in, out, opt)
	if err != nil {
		h.fail(w, r, importerError(err, ctx, dir))
		return
	}
	if req.report {
		h.writeReport(w, r, rep)
		return
	}
	f, err := os.Open(out)
	if err != nil {
		h.fail(w, r, internalError(err))
		return
	}
	defer f.Close()
	ctype := typeXLSX
	switch up.ext {
	case ".xlsm":
		ctype = typeXLSM
	case ".csv":
		ctype = typeCSV + "; charset=utf-8"
	}
	w.Header().Set("Content-Type", ctype)
	w.Header().Set("Cache-Control", "no-store")
	w.Header().Set("Content-Disposition", mime.FormatMediaType("attachment", map[string]string{"filename": safeFileName(importer.DefaultOutput(up.name))}))
	if fi, err := f.Stat(); err == nil {
		w.Header().Set("Content-Length", strconv.FormatInt(fi.Size(), 10))
	}
	// A client gone mid-answer shows on the request's line (its bytes); no line of its own,
	// which a crowd of such clients would turn into an unbounded log.
	_, _ = io.Copy(w, f)
}

// uploadError is 413 for a body over the limit, else 400 with msg.
func uploadError(err error, msg string) *apiError {
	var mbe *http.MaxBytesError
	if errors.As(err, &mbe) {
		return tooLarge(mbe.Limit)
	}
	var slow *slowUpload
	if errors.As(err, &slow) {
		return &apiError{Status: http.StatusRequestTimeout, Code: codeTimeout, Msg: slow.Error()}
	}
	if errors.Is(err, os.ErrDeadlineExceeded) || errors.Is(err, context.DeadlineExceeded) {
		return &apiError{Status: http.StatusServiceUnavailable, Code: codeTimeout, Msg: "the upload did not arrive within the server's time limit"}
	}
	return badRequest("body", msg)
}

// writeReport answers the report as JSON. It is encoded before anything is written: a report
// that cannot be encoded (a non-finite total) is a 500 with a JSON message, never a 200 with
// an empty body.
func (h *annotateHandler) writeReport(w http.ResponseWriter, r *http.Request, rep *importer.Report) {
	rep.Output = "" // a path on the server
	h.writeJSON(w, r, "the report", rep)
}

// writeJSON answers v as JSON (200, not cached), encoded before anything is
// written; what cannot be encoded is a 500 naming what, never an empty 200.
func (h *annotateHandler) writeJSON(w http.ResponseWriter, r *http.Request, what string, v any) {
	body, err := marshalJSON(v)
	if err != nil {
		h.fail(w, r, internalError(fmt.Errorf("encoding %s: %w", what, err)))
		return
	}
	body = append(body, '\n')
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	w.Header().Set("Content-Length", strconv.Itoa(len(body)))
	w.WriteHeader(http.StatusOK)
	_, _ = w.Write(body)
}

func (h *annotateHandler) fail(w http.ResponseWriter, r *http.Request, e *apiError) {
	if !reportOutcome(r, e) && e.cause != nil {
		h.cfg.Logger.Error("annotate", "status", e.Status, "err", cutText(e.cause.Error(), maxLoggedCause))
	}
	body, err := marshalJSON(e.body())
	if err != nil {
		body = []byte(`{"error":"` + internalErrorMessage + `","code":"internal"}`)
	}
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	w.Header().Set("Content-Length", strconv.Itoa(len(body)))
	w.WriteHeader(e.Status)
	_, _ = w.Write(body)
}
