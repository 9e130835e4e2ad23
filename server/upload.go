package server

import (
	"bufio"
	"io"
	"mime"
	"mime/multipart"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// upload is a workbook received and spooled into a request's folder, with the mapping file
// sent beside it.
type upload struct {
	name    string // the file name to answer with
	ext     string // .xlsx, .xlsm, .csv or .xls
	path    string // the spooled copy
	mapping []byte // the multipart part "mapping" (a mapping file, JSON); nil when none
}

// spoolName is the name of the spooled copy in the request's own folder: a CSV file keeps the
// client's name, which the importer gives its one sheet in findings and the report ("log.csv"
// rather than a name of the server's); a workbook is upload.EXT.
func (u upload) spoolName() string {
	if u.ext == ".csv" {
		if n := safeFileName(u.name); n != "" && n != "." && n != ".." && !strings.ContainsAny(n, "/\\") {
			return n
		}
	}
	return "upload" + u.ext
}

// maxMappingPart bounds the multipart part "mapping", in bytes.
const maxMappingPart = 4 << 20

// receiveUpload reads the workbook of a request into dir: the body itself, or the part "file"
// of a multipart form, whose part "mapping" may hold a mapping file (before or after the
// workbook); other parts of the form are read past. nameParam is the name= query parameter. The extension is taken from the name,
// else the Content-Type, else the first bytes (a zip is .xlsx, the OLE2 signature a legacy
// .xls, which the importer converts with LibreOffice where it is installed and refuses by
// name otherwise).
func receiveUpload(r *http.Request, nameParam, dir string) (upload, *apiError) {
	ct := r.Header.Get("Content-Type")
	mt, params, perr := mime.ParseMediaType(ct)
	if ct != "" && perr != nil {
		return upload{}, &apiError{Status: http.StatusUnsupportedMediaType, Code: codeMediaType, Msg: "unreadable Content-Type " + quoteText(ct)}
	}
	switch mt {
	case "multipart/form-data":
		return receiveForm(multipart.NewReader(r.Body, params["boundary"]), nameParam, dir)
	case typeXLSX, typeXLSMFolded, typeCSV, "application/vnd.ms-excel", "application/octet-stream", "":
	case "application/x-www-form-urlencoded":
		// what curl --data-binary sends by default: the body decides
		mt = ""
	default:
		return upload{}, &apiError{Status: http.StatusUnsupportedMediaType, Code: codeMediaType,
			Msg: "Content-Type " + quoteText(mt) + " is not a workbook: send " + typeXLSX + ", " + typeXLSM + ", text/csv or multipart/form-data with a part file"}
	}
	u, body, e := workbookKind(nameParam, mt, r.Body)
	if e != nil {
		return upload{}, e
	}
	u.path = filepath.Join(dir, u.spoolName())
	return u, spool(u.path, body)
}

// receiveForm reads the parts of a multipart form: "file" (the workbook) and "mapping".
func receiveForm(mr *multipart.Reader, nameParam, dir string) (upload, *apiError) {
	var u upload
	var mapping []byte
	got := false
	for {
		part, err := mr.NextPart()
		if err == io.EOF {
			break
		}
		if err != nil {
			return upload{}, uploadError(err, "the multipart form cannot be read: "+err.Error())
		}
		switch part.FormName() {
		case "file":
			if got {
				return upload{}, badRequest("file", "the multipart form has two parts named file: send one workbook per request")
			}
			name := nameParam
			if name == "" {
				name = part.FileName()
			}
			mt := ""
			if pt := part.Header.Get("Content-Type"); pt != "" && pt != "application/octet-stream" {
				mt, _, _ = mime.ParseMediaType(pt)
			}
			var body io.Reader
			var e *apiError
			if u, body, e = workbookKind(name, mt, part); e != nil {
				return upload{}, e
			}
			u.path = filepath.Join(dir, u.spoolName())
			if e := spool(u.path, body); e != nil {
				return upload{}, e
			}
			got = true
		case "mapping":
			b, err := io.ReadAll(io.LimitReader(part, maxMappingPart+1))
			if err != nil {
				return upload{}, uploadError(err, "the part mapping was cut off: "+err.Error())
			}
			if len(b) > maxMappingPart {
				return upload{}, &apiError{Status: http.StatusRequestEntityTooLarge, Code: codeTooLarge, Param: "mapping",
					Msg: "the part mapping is over " + strconv.Itoa(maxMappingPart>>20) + " MiB: a mapping file is a few kilobytes of JSON"}
			}
			mapping = b
		default:
			// another field of the form that sent the workbook: read past it
			if _, err := io.Copy(io.Discard, part); err != nil {
				return upload{}, uploadError(err, "the multipart form cannot be read: "+err.Error())
			}
		}
	}
	if !got {
		return upload{}, badRequest("file", "the multipart form has no part named file: send the workbook as file")
	}
	u.mapping = mapping
	return u, nil
}

// workbookKind decides the name and extension of a workbook from its name, media type mt
// ("" when none was given) and, failing both, its first bytes; body is returned for reading
// the whole workbook.
func workbookKind(name, mt string, body io.Reader) (upload, io.Reader, *apiError) {
	name = filepath.Base(strings.ReplaceAll(name, "\\", "/"))
	ext := strings.ToLower(filepath.Ext(name))
	switch ext {
	case ".xlsx", ".xlsm", ".csv", ".xls":
	default:
		switch mt {
		case typeXLSMFolded:
			ext = ".xlsm"
		case typeCSV:
			ext = ".csv"
		case "application/vnd.ms-excel":
			ext = ".xls"
		default:
			// Look at the first bytes: a zip is an OOXML workbook, the OLE2
			// signature a legacy .xls (refused with its own message).
			br := bufio.NewReader(body)
			head, _ := br.Peek(8)
			body = br
			switch {
			case len(head) >= 4 && string(head[:4]) == "PK\x03\x04":
				ext = ".xlsx"
			case len(head) >= 8 && string(head) == "\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1":
				ext = ".xls"
			default:
				return upload{}, nil, &apiError{Status: http.StatusUnsupportedMediaType, Code: codeMediaType,
					Msg: "the body is not an .xlsx or .xlsm workbook: send CSV with Content-Type text/csv or name=FILE.csv"}
			}
		}
	}
	if name == "." || name == "/" || name == "" || strings.ToLower(filepath.Ext(name)) != ext {
		name = "workbook" + ext
	}
	return upload{name: name, ext: ext}, body, nil
}

// spool copies the upload into path.
func spool(path string, body io.Reader) *apiError {
	f, err := os.Create(path)
	if err != nil {
		return internalError(err)
	}
	n, err := io.Copy(f, body)
	if cerr := f.Close(); err == nil && cerr != nil {
		return internalError(cerr)
	}
	if err != nil {
		return uploadError(err, "the upload was cut off: "+err.Error())
	}
	if n == 0 {
		return badRequest("body", "empty body: send the workbook (.xlsx, .xlsm or CSV) as the body or as the multipart part file")
	}
	return nil
}
