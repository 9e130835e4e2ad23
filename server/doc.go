// Package server is fluecell's HTTP API: the carbon functions of package funcs for any
// spreadsheet or notebook that can make an HTTP request.
//
// Routes (the contract is openapi.yaml at the repository root, served at /openapi.yaml):
//
//	GET  /v1/fn/{name}?param=value…   one catalog function; the number as text/plain so that
//	                                  a sheet can wrap WEBSERVICE in VALUE; format=json|csv|xml;
//	                                  errors=inline answers 200 with "#ERROR: message"
//	POST /v1/eval                     an expression, for one set of variables or many rows (JSON),
//	                                  or over a CSV table (?expr=…&as=COLUMN, text/csv body)
//	POST /v1/annotate                 workbook annotation, served when Config.Annotate is set
//	POST /v1/inspect                  how a workbook is read, with a preview and the reading as
//	                                  a mapping file (the multipart part "mapping" of both routes)
//	GET  /, /page/{file}              the web page (webpage/, embedded): open, it holds no data
//	GET  /v1/functions[/{name}], /v1/factors, /v1/units, /openapi.yaml, /healthz, /metrics
//
// Every client mistake is a 4xx whose message names the parameter and what is accepted; a 5xx
// means a fault of the server and is logged. Answers of /v1/fn are pure functions of the
// request and the loaded factor packs, so they are cached (bounded) and sent with an ETag and
// a Cache-Control max-age.
//
// A Server keeps no package-level state: its metrics registry, cache and logger are its own,
// so several servers can run in one process (tests do).
package server
