package server

import (
	"context"
	"net/http"

	"github.com/fluecell/fluecell/importer"
)

// inspection is the answer of POST /v1/inspect: how the workbook was read (importer.Inspect:
// its report, the texts of its fuel columns and how each was read, the cautions), the first
// rows of each table as they are in the file, the reading as a mapping file to check, edit
// and send back, and the role names a mapping accepts.
type inspection struct {
	*importer.Inspection
	Preview     []importer.TablePreview `json:"preview"`
	MappingFile importer.MappingFile    `json:"mapping_file"`
	Roles       []string                `json:"roles"`
}

// inspect answers POST /v1/inspect for the workbook spooled at up.path: it reads it with
// importer.Inspect and importer.Preview (rows data rows per table) and writes nothing.
func (h *annotateHandler) inspect(ctx context.Context, w http.ResponseWriter, r *http.Request, up upload, dir string, opt importer.Options, rows int) {
	ins, err := importer.Inspect(ctx, h.e, up.path, opt)
	if err != nil {
		h.fail(w, r, importerError(err, ctx, dir))
		return
	}
	prev, err := importer.Preview(ctx, up.path, ins.Report.Tables, rows, opt)
	if err != nil {
		h.fail(w, r, importerError(err, ctx, dir))
		return
	}
	ins.Path = up.name // not the server's spool path
	ins.Report.Output = ""
	ans := inspection{Inspection: ins, Preview: prev, MappingFile: ins.MappingFile(), Roles: importer.RoleNames()}
	h.writeJSON(w, r, "the inspection", ans)
}
