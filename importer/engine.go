package importer

import (
	"bytes"
	"encoding/csv"
	"errors"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/xuri/excelize/v2"
)

// deriveEngine returns e, or an engine built like it with another default
// pack and/or the workbook's own factor rows (sheet "Carbon factors", same
// columns as the pack CSV files) layered over the user files.
func deriveEngine(e *funcs.Engine, opt Options, factorCSV []byte, wbName string) (*funcs.Engine, error) {
	pack := strings.TrimSpace(opt.Pack)
	if pack == e.DefaultPackName() {
		pack = ""
	}
	if pack == "" && factorCSV == nil {
		return e, nil
	}
	files := opt.FactorFiles
	if files == nil {
		files = userFiles(e)
	}
	opts := []funcs.Option{funcs.WithFactorFiles(files...)}
	name := wbName + " sheet " + SheetFactors
	if factorCSV != nil {
		opts = append(opts, funcs.WithFactorData(name, factorCSV))
	}
	dp := e.DefaultPackName()
	if pack != "" {
		dp = pack
	}
	opts = append(opts, funcs.WithDefaultPack(dp))
	ne, err := funcs.New(opts...)
	if err == nil {
		return ne, nil
	}
	var pfe *funcs.PackFileError
	if errors.As(err, &pfe) && pfe.File == name {
		msg := "the workbook's \"" + SheetFactors + "\" sheet, row " + strconv.Itoa(pfe.Line)
		if pfe.Column != "" {
			msg += ", column " + pfe.Column
		}
		return nil, &Error{Code: ErrFactors, Msg: msg + ": " + pfe.Reason + " (the sheet takes the columns of a factor pack: pack, id, quantity, value, unit, low, high, basis, source, from_memory)", Err: err}
	}
	if fe, ok := funcs.AsError(err); ok && fe.Param == "pack" {
		return nil, &Error{Code: ErrInput, Msg: fe.Headline(), Err: err}
	}
	return nil, &Error{Code: ErrFactors, Msg: "cannot load the factor packs: " + err.Error(), Err: err}
}

// userFiles lists the user factor files e was built from, in the order the
// packs list them.
func userFiles(e *funcs.Engine) []string {
	var out []string
	seen := map[string]bool{}
	for _, p := range e.Packs() {
		for _, f := range p.Files {
			if strings.HasPrefix(f, "embedded:") || seen[f] || strings.HasSuffix(f, " sheet "+SheetFactors) {
				continue
			}
			seen[f] = true
			out = append(out, f)
		}
	}
	return out
}

// factorSheetCSV turns the workbook's "Carbon factors" sheet into pack CSV,
// one line per sheet row (so that line numbers in errors are row numbers).
func (b *book) factorSheetCSV(s sheetRef) ([]byte, error) {
	rd, err := b.openSheet(s)
	if err != nil {
		return nil, err
	}
	defer rd.close()
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	line := 1
	for {
		r, ok := rd.next()
		if !ok {
			break
		}
		if r.num > 100_000 {
			return nil, errors.New("sheet " + SheetFactors + " has more than 100 000 rows")
		}
		for ; line < r.num; line++ {
			w.Flush()
			buf.WriteByte('\n')
		}
		last := r.cells[len(r.cells)-1].col
		rec := make([]string, last)
		for _, c := range r.cells {
			switch c.kind {
			case kNumber:
				rec[c.col-1] = funcs.FormatNumber(c.num)
			case kBool:
				rec[c.col-1] = strings.ToLower(c.text)
			default:
				rec[c.col-1] = c.text
			}
		}
		if err := w.Write(rec); err != nil {
			return nil, err
		}
		line++
	}
	w.Flush()
	if rd.err != nil {
		return nil, rd.err
	}
	return buf.Bytes(), nil
}

// calcCell evaluates one formula cell; a panic inside the evaluator counts
// as "cannot evaluate".
func calcCell(f *excelize.File, sheet, ref string) (out string, ok bool) {
	defer func() {
		if recover() != nil {
			out, ok = "", false
		}
	}()
	v, err := f.CalcCellValue(sheet, ref, excelize.Options{RawCellValue: true})
	if err != nil || strings.HasPrefix(v, "#") {
		return "", false
	}
	return v, true
}
