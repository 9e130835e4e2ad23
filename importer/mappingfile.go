package importer

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"github.com/fluecell/fluecell/importer/regfile"
	"io"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/atomicfile"
)

// MappingVersion is the version of the mapping file format, the value of
// its "fluecell_mapping" key.
const MappingVersion = 1

// ErrMapping is the *Error code of a mapping file that is malformed, or
// that does not fit the workbook it is applied to (a header moved, a sheet
// is missing).
const ErrMapping = "mapping"

// maxMappingBytes bounds the size of a mapping file.
const maxMappingBytes = 16 << 20

// MappingFile is the JSON document a person checks and edits: how the
// tables of a workbook are read, so that every workbook of the same
// template is read the same way. Write it with Write; read it with
// LoadMapping, which checks it.
//
//	{"fluecell_mapping": 1,
//	 "tables": [{"sheet": "Fuel log", "header_row": 4, "kind": "fuel-log",
//	             "columns": [{"column": "B", "header": "Fuel", "role": "fuel"},
//	                         {"column": "C", "header": "Litres", "role": "quantity", "unit": "L"}]}],
//	 "names": {"Unl 87": "motor_gasoline"},
//	 "grid": "DE", "gwp_set": "ar6"}
type MappingFile struct {
	Version int           `json:"fluecell_mapping"`
	Tables  []MappedTable `json:"tables"`
	// Grid is the electricity grid of the workbook's purchased electricity
	// (a country or grid id accepted by electricity_co2e); a table's own
	// "grid" wins over it.
	Grid string `json:"grid,omitempty"`
	// Gallons says which gallon a bare "gallons" means in the workbook:
	// "us" (the default) or "imperial"; a table's own entry wins.
	Gallons string `json:"gallons,omitempty"`
	// Names maps a fuel cell's exact text to a fuel id; it is consulted
	// before the engine's own names and aliases.
	Names map[string]string `json:"names"`
	// GWPSet is the IPCC assessment whose GWP-100 values weight CH4 and N2O
	// in every call naming no set (ar4, ar5, ar6); "" = funcs.DefaultGWPSet.
	GWPSet string `json:"gwp_set,omitempty"`
}

// MappedTable is one table of a mapping: where its header row is and what
// its columns mean.
type MappedTable struct {
	Sheet     string `json:"sheet"`
	HeaderRow int    `json:"header_row"`
	// Kind is checked against the kind the roles give (fuel-log, wide,
	// fuel-by-period, build-plan, custom); "" checks nothing.
	Kind string `json:"kind,omitempty"`
	// Fuel is the fuel of every row of a table without a fuel column.
	Fuel string `json:"fuel,omitempty"`
	// Unit is the unit of every amount whose header states none.
	Unit string `json:"unit,omitempty"`
	// Grid is the electricity grid of the table's purchased electricity.
	Grid string `json:"grid,omitempty"`
	// Sector is the sector of its stationary combustion (energy,
	// manufacturing, commercial, residential), for CH4 and N2O.
	Sector string `json:"sector,omitempty"`
	// Gallons is "us" or "imperial": the gallon of a bare "gallons".
	Gallons string `json:"gallons,omitempty"`
	// ActivityUncertainty is the 95 % half-width of the table's amounts in
	// per cent (5 for ±5 %), in place of the default of their kind of
	// record, for the intervals of the totals (uncertainty.go).
	ActivityUncertainty *float64       `json:"activity_uncertainty,omitempty"`
	Columns             []MappedColumn `json:"columns"`
}

// MappedColumn is one column of a mapped table.
type MappedColumn struct {
	Column string `json:"column"` // letter(s): "C"
	Header string `json:"header"` // the header as read; the workbook must still say so
	Role   string `json:"role"`   // a role name (fuel, quantity, unit, ...) or "none"
	Unit   string `json:"unit,omitempty"`
	Basis  string `json:"basis,omitempty"` // HHV (GCV) or NCV (LHV), for an energy unit
	Fuel   string `json:"fuel,omitempty"`  // the fuel of a fuel-column
}

// MappingRef names the mapping a report was made with.
type MappingRef struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

// Mapping is a checked mapping file, ready for Options.Mapping. It is not
// changed by use: one Mapping may serve many concurrent scans.
type Mapping struct {
	ref     MappingRef
	tables  []mapTable
	names   map[string]string // cell text -> fuel id
	grid    string            // the workbook's grid
	gallons string            // "us" or "imperial"; "" = us
	gwpSet  string            // canonical GWP set; "" = none named
}

type mapTable struct {
	at        string // JSON path, "tables[0]"
	sheet     string
	headerRow int
	kind      string
	fuel      string // fuel id
	unit      string
	grid      string
	sector    string
	gallons   string
	activity  *float64 // activity_uncertainty, %
	cols      []mapCol
}

type mapCol struct {
	at     string // JSON path, "tables[0].columns[2]"
	col    int
	header string
	role   role
	unit   string
	basis  units.Basis
	fuel   string // fuel id
}

// Ref returns the mapping's path and the SHA-256 of its bytes.
func (m *Mapping) Ref() MappingRef { return m.ref }

// LoadMapping reads and checks the mapping file at path. Fuel ids are
// checked through e. Errors are *Error of code ErrMapping (ErrIO when the
// file cannot be read) naming the file and the JSON path of the mistake,
// e.g. `mapping m.json: tables[0].columns[2].role: unknown role "amount"`.
func LoadMapping(e *funcs.Engine, path string) (*Mapping, error) {
	f, err := regfile.Open(path)
	if err != nil {
		return nil, &Error{Code: ErrIO, Path: path, Msg: "mapping " + path + ": cannot read it: " + err.Error(), Err: err}
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxMappingBytes+1))
	if err != nil {
		return nil, &Error{Code: ErrIO, Path: path, Msg: "mapping " + path + ": cannot read it: " + err.Error(), Err: err}
	}
	return ParseMapping(e, path, data)
}

// ParseMapping checks the mapping document data; name is its path for
// messages and for the report. Errors are as for LoadMapping.
func ParseMapping(e *funcs.Engine, name string, data []byte) (*Mapping, error) {
	fail := func(at, format string, args ...any) error {
		msg := "mapping " + name + ": "
		if at != "" {
			msg += at + ": "
		}
		return &Error{Code: ErrMapping, Path: name, Msg: msg + fmt.Sprintf(format, args...)}
	}
	if len(data) > maxMappingBytes {
		return nil, fail("", "larger than %d MB: a mapping is a small JSON file", maxMappingBytes>>20)
	}
	var doc any
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	if err := dec.Decode(&doc); err != nil {
		return nil, fail("", "not JSON: %v", jsonErr(data, err))
	}
	if dec.More() {
		return nil, fail("", "text after the JSON object: a mapping is one object")
	}
	sum := sha256.Sum256(data)
	m := &Mapping{ref: MappingRef{Path: name, SHA256: hex.EncodeToString(sum[:])}, names: map[string]string{}}
	p := &mapParser{e: e, fail: fail}
	root, err := p.object(doc, "", "fluecell_mapping", "tables", "names", "grid", "gallons", "gwp_set")
	if err != nil {
		return nil, err
	}
	v, ok := root["fluecell_mapping"]
	if !ok {
		return nil, fail("", `not a fluecell mapping: the key "fluecell_mapping": %d is missing`, MappingVersion)
	}
	if n, err := p.integer(v, "fluecell_mapping"); err != nil {
		return nil, err
	} else if n != MappingVersion {
		return nil, fail("fluecell_mapping", "version %d is not known: this fluecell reads version %d", n, MappingVersion)
	}
	if v, ok := root["tables"]; ok {
		list, ok := v.([]any)
		if !ok {
			return nil, fail("tables", "expected a list of tables, found %s", jsonKind(v))
		}
		seen := map[string]string{}
		for i, x := range list {
			t, err := p.table(x, "tables["+strconv.Itoa(i)+"]")
			if err != nil {
				return nil, err
			}
			key := t.sheet + "\x00" + strconv.Itoa(t.headerRow)
			if first, dup := seen[key]; dup {
				return nil, fail(t.at, "the same table as %s (sheet %q, header row %d): keep one", first, t.sheet, t.headerRow)
			}
			seen[key] = t.at
			m.tables = append(m.tables, t)
		}
	}
	if m.grid, err = p.grid(root, ""); err != nil {
		return nil, err
	}
	if m.gallons, err = p.gallons(root, ""); err != nil {
		return nil, err
	}
	if m.gwpSet, err = p.gwpSet(root, ""); err != nil {
		return nil, err
	}
	if v, ok := root["names"]; ok {
		obj, ok := v.(map[string]any)
		if !ok {
			return nil, fail("names", "expected an object of cell text to fuel id, found %s", jsonKind(v))
		}
		for _, text := range sortedKeys(obj) {
			at := "names[" + strconv.Quote(text) + "]"
			if strings.TrimSpace(text) == "" {
				return nil, fail(at, "an empty cell text: remove the entry")
			}
			id, err := p.str(obj[text], at)
			if err != nil {
				return nil, err
			}
			if strings.TrimSpace(id) == "" {
				return nil, fail(at, "no fuel id: write the fuel this text means, e.g. \"motor_gasoline\" (fluecell factors lists them), or remove the entry to leave such rows uncomputed")
			}
			if m.names[text], err = p.fuel(id, at); err != nil {
				return nil, err
			}
		}
	}
	return m, nil
}

// Write writes the mapping to path as indented JSON, one line per column,
// through a temporary file and a rename. Errors are *Error of code ErrIO.
func (f *MappingFile) Write(path string) error {
	var b bytes.Buffer
	f.encode(&b)
	if err := atomicfile.Write(path, func(w io.Writer) error { _, err := w.Write(b.Bytes()); return err }); err != nil {
		return &Error{Code: ErrIO, Path: path, Msg: "mapping " + path + ": cannot write it: " + err.Error(), Err: err}
	}
	return nil
}

// encode writes the document for a person to read: a table's keys on one
// line, each column on its own line.
func (f *MappingFile) encode(b *bytes.Buffer) {
	js := func(v any) string {
		var buf bytes.Buffer
		enc := json.NewEncoder(&buf)
		enc.SetEscapeHTML(false)
		_ = enc.Encode(v) // strings, numbers and flat structs always encode
		return strings.TrimSuffix(buf.String(), "\n")
	}
	fmt.Fprintf(b, "{\n  \"fluecell_mapping\": %d,\n  \"tables\": [", f.Version)
	for i, t := range f.Tables {
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(b, "\n    {\"sheet\": %s, \"header_row\": %d", js(t.Sheet), t.HeaderRow)
		for _, kv := range [][2]string{{"kind", t.Kind}, {"fuel", t.Fuel}, {"unit", t.Unit}, {"grid", t.Grid}, {"sector", t.Sector}, {"gallons", t.Gallons}} {
			if kv[1] != "" {
				fmt.Fprintf(b, ", %q: %s", kv[0], js(kv[1]))
			}
		}
		if t.ActivityUncertainty != nil {
			fmt.Fprintf(b, ", \"activity_uncertainty\": %s", js(*t.ActivityUncertainty))
		}
		b.WriteString(",\n     \"columns\": [")
		for j, c := range t.Columns {
			if j > 0 {
				b.WriteString(",")
			}
			parts := []string{`"column": ` + js(c.Column), `"header": ` + js(c.Header), `"role": ` + js(c.Role)}
			for _, kv := range [][2]string{{"unit", c.Unit}, {"basis", c.Basis}, {"fuel", c.Fuel}} {
				if kv[1] != "" {
					parts = append(parts, `"`+kv[0]+`": `+js(kv[1]))
				}
			}
			b.WriteString("\n       {" + strings.Join(parts, ", ") + "}")
		}
		b.WriteString("\n     ]}")
	}
	if len(f.Tables) > 0 {
		b.WriteString("\n  ")
	}
	b.WriteString("],\n  \"names\": {")
	keys := make([]string, 0, len(f.Names))
	for k := range f.Names {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for i, k := range keys {
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(b, "\n    %s: %s", js(k), js(f.Names[k]))
	}
	if len(keys) > 0 {
		b.WriteString("\n  ")
	}
	b.WriteString("}")
	for _, kv := range [][2]string{{"grid", f.Grid}, {"gallons", f.Gallons}, {"gwp_set", f.GWPSet}} {
		if kv[1] != "" {
			fmt.Fprintf(b, ",\n  %q: %s", kv[0], js(kv[1]))
		}
	}
	b.WriteString("\n}\n")
}
