package funcs

import (
	"crypto/sha256"
	"embed"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

//go:embed data/*.csv
var embeddedData embed.FS

// CommonPack holds the rows every pack falls back to: GWP sets, atmosphere
// constants, life-cycle intensities, technology defaults and NCV/GCV ratios.
const CommonPack = "common"

// DefaultPack is the pack used when a call names none.
const DefaultPack = "ipcc2006"

// PackInfo describes a loaded pack.
type PackInfo struct {
	Name    string   `json:"name"`
	Title   string   `json:"title"`
	Basis   string   `json:"basis,omitempty"` // the basis its energy factors are stated on
	Files   []string `json:"files"`           // the files its rows came from, in load order
	Version string   `json:"version"`         // hash of its rows, changes when any value changes
	Rows    int      `json:"rows"`
}

type rowKey struct{ id, quantity string }

type pack struct {
	name  string
	title string
	basis units.Basis
	rows  map[rowKey]*Factor
	files []string
}

// packSet is every loaded pack. It is built once by loadPacks and never
// modified afterwards.
type packSet struct {
	packs map[string]*pack
	names []string // selectable packs, sorted, without common
	hash  string   // of every row of every pack
}

// embeddedFuelNames reads the embedded fuel vocabulary.
func embeddedFuelNames() ([]fuelName, error) {
	b, err := embeddedData.ReadFile(path.Join("data", vocabularyFile))
	if err != nil {
		return nil, fmt.Errorf("embedded vocabulary: %w", err)
	}
	return parseFuelNames(b, "embedded:"+vocabularyFile)
}

// builtinPackTitle describes the embedded packs.
func builtinPackTitle(name string) (string, units.Basis) {
	switch name {
	case "ipcc2006":
		return "IPCC 2006 Guidelines for National Greenhouse Gas Inventories, Vol 2 (Tier 1 defaults, NCV basis)", units.NCV
	case "epa2025":
		return "US EPA GHG Emission Factors Hub 2025 (HHV basis)", units.HHV
	case CommonPack:
		return "values shared by every pack: GWP sets, atmosphere, life-cycle intensities, technology defaults", units.NoBasis
	}
	return "", units.NoBasis
}

// isPackFile reports whether an embedded data file holds factor rows. Files
// named *_names.csv are vocabularies and *_table.csv other lookup tables (blend
// compositions and the like), each read by its own loader.
func isPackFile(name string) bool {
	return strings.HasSuffix(name, ".csv") && !strings.HasSuffix(name, "_names.csv") && !strings.HasSuffix(name, "_table.csv")
}

// loadPacks reads the embedded packs, then each user file in order; a later
// row replaces an earlier one with the same pack, id and quantity. A row with
// an empty pack column applies to every pack. Nothing is half-loaded: any
// error fails the whole call.
func loadPacks(userFiles []string, readFile func(string) ([]byte, error)) (*packSet, error) {
	ps := &packSet{packs: map[string]*pack{}}
	entries, err := embeddedData.ReadDir("data")
	if err != nil {
		return nil, fmt.Errorf("embedded packs: %w", err)
	}
	for _, e := range entries {
		if !isPackFile(e.Name()) {
			continue // vocabularies and lookup tables, not factor packs
		}
		b, err := embeddedData.ReadFile(path.Join("data", e.Name()))
		if err != nil {
			return nil, fmt.Errorf("embedded packs: %w", err)
		}
		rows, err := parseFactorCSV(b, "embedded:"+e.Name(), "")
		if err != nil {
			return nil, err
		}
		ps.add(rows, "embedded:"+e.Name())
	}
	if readFile == nil {
		readFile = os.ReadFile
	}
	for _, f := range userFiles {
		b, err := readFile(f)
		if err != nil {
			return nil, &Error{Code: CodePack, Param: "factors", Msg: "cannot read factor file: " + err.Error(), Err: err}
		}
		rows, err := parseFactorCSV(b, f, "")
		if err != nil {
			return nil, err
		}
		ps.add(rows, f)
	}
	ps.finish()
	return ps, nil
}

// add merges rows into the set; rows with an empty pack go to every pack
// known at that point.
func (ps *packSet) add(rows []*Factor, file string) {
	touched := map[string]bool{}
	for _, r := range rows {
		targets := []string{r.Pack}
		if r.Pack == "" {
			targets = targets[:0]
			for name := range ps.packs {
				targets = append(targets, name)
			}
			sort.Strings(targets)
		}
		for _, name := range targets {
			p := ps.packs[name]
			if p == nil {
				title, basis := builtinPackTitle(name)
				if title == "" {
					title = "user pack " + name
				}
				p = &pack{name: name, title: title, basis: basis, rows: map[rowKey]*Factor{}}
				ps.packs[name] = p
			}
			row := r
			if r.Pack == "" {
				c := *r
				c.Pack = name
				row = &c
			}
			p.rows[rowKey{row.ID, row.Quantity}] = row
			if !touched[name] {
				touched[name] = true
				p.files = append(p.files, file)
			}
		}
	}
}

func (ps *packSet) finish() {
	ps.names = ps.names[:0]
	h := sha256.New()
	names := make([]string, 0, len(ps.packs))
	for name := range ps.packs {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		if name != CommonPack && !ps.packs[name].gridOnly() {
			ps.names = append(ps.names, name)
		}
		for _, f := range ps.packs[name].sorted() {
			fmt.Fprintf(h, "%s|%s|%s|%s|%s|%s|%s|%s|%t\n", f.Pack, f.ID, f.Quantity,
				strconv.FormatFloat(f.Value, 'g', -1, 64), f.Unit, optNum(f.Low), optNum(f.High), f.BasisName, f.FromMemory)
			fmt.Fprintf(h, "%s\n", f.Source)
		}
	}
	ps.hash = hex.EncodeToString(h.Sum(nil))[:16]
}

func optNum(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'g', -1, 64)
}

func (p *pack) sorted() []*Factor {
	out := make([]*Factor, 0, len(p.rows))
	for _, f := range p.rows {
		out = append(out, f)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].ID != out[j].ID {
			return out[i].ID < out[j].ID
		}
		return out[i].Quantity < out[j].Quantity
	})
	return out
}

func (p *pack) info() PackInfo {
	h := sha256.New()
	for _, f := range p.sorted() {
		fmt.Fprintf(h, "%s|%s|%s|%s|%s|%s\n", f.ID, f.Quantity, strconv.FormatFloat(f.Value, 'g', -1, 64), f.Unit, f.BasisName, f.Source)
	}
	return PackInfo{Name: p.name, Title: p.title, Basis: p.basis.String(), Files: append([]string(nil), p.files...),
		Version: hex.EncodeToString(h.Sum(nil))[:12], Rows: len(p.rows)}
}

// lookup finds a row in the pack, then in the common pack.
func (ps *packSet) lookup(packName, id, quantity string) *Factor {
	if p := ps.packs[packName]; p != nil {
		if f := p.rows[rowKey{id, quantity}]; f != nil {
			return f
		}
	}
	if c := ps.packs[CommonPack]; c != nil {
		return c.rows[rowKey{id, quantity}]
	}
	return nil
}

// has reports whether the pack itself (not common) has a row.
func (ps *packSet) has(packName, id, quantity string) bool {
	p := ps.packs[packName]
	return p != nil && p.rows[rowKey{id, quantity}] != nil
}

// packsWith lists the selectable packs that have a row for id and quantity.
func (ps *packSet) packsWith(id string, quantities ...string) []string {
	var out []string
	for _, name := range ps.names {
		for _, q := range quantities {
			if ps.has(name, id, q) {
				out = append(out, name)
				break
			}
		}
	}
	return out
}

// PackFileError is the error for a factor file that cannot be loaded: the
// file, the 1-based line and the reason.
type PackFileError struct {
	File   string
	Line   int
	Column string // the CSV column concerned, if any
	Reason string
}

func (e *PackFileError) Error() string {
	s := e.File + ":" + strconv.Itoa(e.Line) + ": "
	if e.Column != "" {
		s += "column " + e.Column + ": "
	}
	return s + e.Reason
}

// ParseFactors reads factor rows in the pack CSV format (see DEVELOPERS.md):
// a header row naming the columns pack, id, quantity, value, unit, low, high,
// basis, source, from_memory (id, quantity, value, unit and source are
// required; order is free), then one row per factor. name is used in error
// messages; defaultPack fills an empty pack column (use "" to keep rows that
// apply to every pack). Any malformed row fails the whole file with a
// *PackFileError naming file and line.
func ParseFactors(data []byte, name, defaultPack string) ([]*Factor, error) {
	return parseFactorCSV(data, name, defaultPack)
}

func parseFactorCSV(data []byte, file, defaultPack string) ([]*Factor, error) {
	r := csv.NewReader(strings.NewReader(strings.TrimPrefix(string(data), "\ufeff")))
	r.FieldsPerRecord = -1
	r.Comment = '#'
	r.ReuseRecord = false
	header, err := r.Read()
	if err == io.EOF {
		return nil, &PackFileError{File: file, Line: 1, Reason: "empty file: expected a header row with id, quantity, value, unit, source"}
	}
	if err != nil {
		return nil, csvErr(file, err)
	}
	col := map[string]int{}
	for i, h := range header {
		h = strings.ToLower(strings.TrimSpace(h))
		switch h {
		case "pack", "id", "quantity", "value", "unit", "low", "high", "basis", "source", "from_memory", "note":
		default:
			return nil, &PackFileError{File: file, Line: 1, Reason: fmt.Sprintf("unknown column %q: accepted are pack, id, quantity, value, unit, low, high, basis, source, from_memory, note", header[i])}
		}
		if _, dup := col[h]; dup {
			return nil, &PackFileError{File: file, Line: 1, Reason: fmt.Sprintf("column %q appears twice", h)}
		}
		col[h] = i
	}
	for _, req := range []string{"id", "quantity", "value", "unit", "source"} {
		if _, ok := col[req]; !ok {
			return nil, &PackFileError{File: file, Line: 1, Reason: "missing column " + req + " (required: id, quantity, value, unit, source)"}
		}
	}
	var rows []*Factor
	seen := map[string]int{}
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvErr(file, err)
		}
		line, _ := r.FieldPos(0)
		get := func(name string) string {
			i, ok := col[name]
			if !ok || i >= len(rec) {
				return ""
			}
			return strings.TrimSpace(rec[i])
		}
		if len(rec) > len(header) {
			return nil, &PackFileError{File: file, Line: line, Reason: fmt.Sprintf("%d fields, but the header has %d", len(rec), len(header))}
		}
		blank := true
		for _, v := range rec {
			if strings.TrimSpace(v) != "" {
				blank = false
			}
		}
		if blank {
			continue
		}
		f := &Factor{Pack: get("pack"), ID: get("id"), Quantity: get("quantity"), Unit: get("unit"), Source: get("source"), File: file, Line: line}
		if f.Pack == "" {
			f.Pack = defaultPack
		}
		bad := func(column, format string, args ...any) error {
			return &PackFileError{File: file, Line: line, Column: column, Reason: fmt.Sprintf(format, args...)}
		}
		if !validIdent(f.ID) {
			return nil, bad("id", "id %q must be lower-case letters, digits and underscores, such as natural_gas", f.ID)
		}
		if f.Pack != "" && !validIdent(f.Pack) {
			return nil, bad("pack", "pack %q must be lower-case letters, digits and underscores, such as ipcc2006", f.Pack)
		}
		if f.Source == "" {
			return nil, bad("source", "empty source: every row names its publication and table")
		}
		v, err := parseCell(get("value"))
		if err != nil || v == nil {
			return nil, bad("value", "value %q is not a number", get("value"))
		}
		f.Value = *v
		f.text = strings.ReplaceAll(get("value"), "_", "")
		if f.Low, err = parseCell(get("low")); err != nil {
			return nil, bad("low", "low %q is not a number (leave empty when unpublished)", get("low"))
		}
		if f.High, err = parseCell(get("high")); err != nil {
			return nil, bad("high", "high %q is not a number (leave empty when unpublished)", get("high"))
		}
		switch b := strings.ToUpper(get("basis")); b {
		case "":
		case "NCV", "LHV":
			f.Basis = units.NCV
		case "HHV", "GCV":
			f.Basis = units.HHV
		default:
			return nil, bad("basis", "basis %q: accepted are NCV (= LHV), HHV (= GCV) or empty", get("basis"))
		}
		switch m := strings.ToLower(get("from_memory")); m {
		case "", "false", "no", "0":
		case "true", "yes", "1":
			f.FromMemory = true
		default:
			return nil, bad("from_memory", "from_memory %q: accepted are true or false", get("from_memory"))
		}
		if err := f.bind(); err != nil {
			return nil, bad("", "%s", err.Error())
		}
		k := f.Pack + "/" + f.ID + "/" + f.Quantity
		if prev, dup := seen[k]; dup {
			return nil, bad("", "%s/%s is given twice in this file (also line %d)", f.ID, f.Quantity, prev)
		}
		seen[k] = line
		rows = append(rows, f)
	}
	if len(rows) == 0 {
		return nil, &PackFileError{File: file, Line: 1, Reason: "no factor rows below the header"}
	}
	return rows, nil
}

func csvErr(file string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &PackFileError{File: file, Line: pe.Line, Reason: pe.Err.Error()}
	}
	return &PackFileError{File: file, Line: 0, Reason: err.Error()}
}

func parseCell(s string) (*float64, error) {
	if s == "" {
		return nil, nil
	}
	v, err := strconv.ParseFloat(strings.ReplaceAll(s, "_", ""), 64)
	if err != nil {
		return nil, err
	}
	return &v, nil
}

func validIdent(s string) bool {
	if s == "" || len(s) > 64 {
		return false
	}
	for i, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r == '_':
		case r >= '0' && r <= '9' && i > 0:
		default:
			return false
		}
	}
	return true
}
