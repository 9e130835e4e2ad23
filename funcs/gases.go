package funcs

import (
	"fmt"
	"path"
	"sort"
	"strings"
)

// The gas tables name what gwp and refrigerant_co2e accept: data/gases_table.csv lists the pure
// gases (id, name, kind, formula), data/refrigerant_blends_table.csv the blends as mass fractions
// of those gases, and data/gas_names.csv the other spellings records use, each with its source.
// The GWP-100 values themselves are factor rows (gwp100_<set>) of the common pack, so that a user
// pack can add or replace them; an id with such a row that no table lists is a gas of kind custom.

const (
	gasTableFile   = "gases_table.csv"
	gasNamesFile   = "gas_names.csv"
	blendTableFile = "refrigerant_blends_table.csv"
)

// GasInfo describes a gas or refrigerant blend that gwp and refrigerant_co2e accept.
type GasInfo struct {
	ID      string `json:"id"`                // as the factor rows name it: hfc_134a, sf6, r410a
	Name    string `json:"name"`              // as inventories print it: HFC-134a, SF6, R-410A
	Kind    string `json:"kind"`              // co2, ch4, n2o, hfc, pfc, sf6, nf3, hcfc, cfc, halon, hfo, hcfo, hc, nh3, blend or custom
	Formula string `json:"formula,omitempty"` // chemical formula of a pure gas
	// Components of a blend by mass, in the order of the standard's designation.
	Components []GasComponent `json:"components,omitempty"`
	Source     string         `json:"source,omitempty"` // where a blend's composition comes from
}

// GasComponent is one component of a blend.
type GasComponent struct {
	Gas          string  `json:"gas"`           // gas id
	Name         string  `json:"name"`          // its printed name
	MassFraction float64 `json:"mass_fraction"` // in (0, 1]; a blend's fractions sum to 1
}

// gasEntry is a gas with, for a blend, its parsed composition.
type gasEntry struct {
	info  GasInfo
	parts []blendPart // nil for a pure gas
}

// gasName is how a folded name maps to a gas, and the source of the mapping.
type gasName struct {
	gas    *gasEntry
	source string // "" for the gas's own id and name
}

// gasIndex resolves gas names. It is built once per Engine and never written afterwards.
type gasIndex struct {
	ordered []*gasEntry          // pure gases in table order, then blends, then custom gases
	byID    map[string]*gasEntry //
	byKey   map[string]*gasName  // gasKey of ids, names and vocabulary rows
	keys    []string             // sorted keys, for suggestions
	sets    []string             // the GWP sets of the loaded packs, sorted
}

// gasKey folds a gas name for matching: lower case, letters and digits only, subscript digits as
// digits. "R-410A", "R410a" and "r 410 a" are "r410a"; "HFO-1234ze(E)" is "hfo1234zee".
func gasKey(s string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(s) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		case r >= '₀' && r <= '₉':
			b.WriteRune('0' + (r - '₀'))
		}
	}
	return b.String()
}

// gasTables are the three table files, as bytes, with the names errors give them.
type gasTables struct {
	gases, blends, names         []byte
	gasFile, blendFile, nameFile string
}

// embeddedGasTables reads the embedded tables.
func embeddedGasTables() (gasTables, error) {
	t := gasTables{gasFile: "embedded:" + gasTableFile, blendFile: "embedded:" + blendTableFile, nameFile: "embedded:" + gasNamesFile}
	for _, f := range []struct {
		name string
		dst  *[]byte
	}{{gasTableFile, &t.gases}, {blendTableFile, &t.blends}, {gasNamesFile, &t.names}} {
		b, err := embeddedData.ReadFile(path.Join("data", f.name))
		if err != nil {
			return t, fmt.Errorf("embedded table: %w", err)
		}
		*f.dst = b
	}
	return t, nil
}

// newGasIndex reads the gas tables and adds, as kind custom, every id with a GWP-100 row in the
// loaded packs that the tables do not list. A malformed row fails with a *PackFileError.
func newGasIndex(ps *packSet, t gasTables) (*gasIndex, error) {
	ix := &gasIndex{byID: map[string]*gasEntry{}, byKey: map[string]*gasName{}, sets: gwpSetsOf(ps)}
	rows, lines, err := readTable(t.gases, t.gasFile, []string{"id", "name", "kind", "formula"})
	if err != nil {
		return nil, err
	}
	for i, rec := range rows {
		bad := func(col, format string, args ...any) error {
			return &PackFileError{File: t.gasFile, Line: lines[i], Column: col, Reason: fmt.Sprintf(format, args...)}
		}
		if !validIdent(rec[0]) {
			return nil, bad("id", "id %q must be lower-case letters, digits and underscores", rec[0])
		}
		if ix.byID[rec[0]] != nil {
			return nil, bad("id", "gas %s is listed twice", rec[0])
		}
		if !knownGasKind(rec[2]) {
			return nil, bad("kind", "kind %q: accepted are co2, ch4, n2o, hfc, pfc, sf6, nf3, hcfc, cfc, halon, hfo, hcfo, hc, nh3", rec[2])
		}
		ix.add(&gasEntry{info: GasInfo{ID: rec[0], Name: rec[1], Kind: rec[2], Formula: rec[3]}})
	}
	if err := ix.addBlends(t.blends, t.blendFile); err != nil {
		return nil, err
	}
	for _, g := range ix.ordered {
		for _, n := range []string{g.info.ID, g.info.Name} {
			if err := ix.addName(n, g, ""); err != nil {
				return nil, &PackFileError{File: t.gasFile, Reason: err.Error()}
			}
		}
	}
	names, lines, err := readTable(t.names, t.nameFile, []string{"name", "gas", "source", "from_memory"})
	if err != nil {
		return nil, err
	}
	for i, rec := range names {
		bad := func(col, format string, args ...any) error {
			return &PackFileError{File: t.nameFile, Line: lines[i], Column: col, Reason: fmt.Sprintf(format, args...)}
		}
		g := ix.byID[rec[1]]
		switch {
		case g == nil:
			return nil, bad("gas", "no gas %q in %s or %s", rec[1], gasTableFile, blendTableFile)
		case rec[2] == "":
			return nil, bad("source", "empty source: every name says where it comes from, or common practice")
		case rec[3] != "true" && rec[3] != "false":
			return nil, bad("from_memory", "from_memory %q: accepted are true or false", rec[3])
		case (rec[3] == "true") != strings.Contains(rec[2], "from memory"):
			return nil, bad("from_memory", "from_memory is %q: a source says \"from memory\" exactly when from_memory is true", rec[3])
		}
		if err := ix.addName(rec[0], g, rec[2]); err != nil {
			return nil, bad("name", "%s", err.Error())
		}
	}
	// custom gases last, so that an id reading as a known name is refused at its factor row
	custom := ix.addCustom(ps)
	for _, g := range ix.ordered {
		f := custom[g.info.ID]
		if f == nil {
			continue
		}
		id := g.info.ID
		if err := ix.addName(id, g, ""); err != nil {
			return nil, &PackFileError{File: f.File, Line: f.Line, Column: "id", Reason: "GWP-100 row for " + quote(id) + ": " + err.Error() +
				"; give that gas's id to replace its value, or choose another id"}
		}
	}
	for k := range ix.byKey {
		ix.keys = append(ix.keys, k)
	}
	sort.Strings(ix.keys)
	return ix, nil
}

func knownGasKind(k string) bool {
	switch k {
	case "co2", "ch4", "n2o", "hfc", "pfc", "sf6", "nf3", "hcfc", "cfc", "halon", "hfo", "hcfo", "hc", "nh3":
		return true
	}
	return false
}

func (ix *gasIndex) add(g *gasEntry) {
	ix.ordered = append(ix.ordered, g)
	ix.byID[g.info.ID] = g
}

// addCustom adds the ids of GWP-100 rows that no table lists, sorted; it returns a row of each.
func (ix *gasIndex) addCustom(ps *packSet) map[string]*Factor {
	var ids []string
	rows := map[string]*Factor{}
	for _, p := range ps.packs {
		for k, f := range p.rows {
			if strings.HasPrefix(k.quantity, "gwp100_") && ix.byID[k.id] == nil && rows[k.id] == nil {
				rows[k.id] = f
				ids = append(ids, k.id)
			}
		}
	}
	sort.Strings(ids)
	for _, id := range ids {
		ix.add(&gasEntry{info: GasInfo{ID: id, Name: id, Kind: "custom"}})
	}
	return rows
}

// addName maps the folded name to g. The same key for another gas is an error; for the same gas
// it is skipped when it is the gas's own id or name (a vocabulary row never repeats one).
func (ix *gasIndex) addName(name string, g *gasEntry, source string) error {
	k := gasKey(name)
	if k == "" {
		return fmt.Errorf("name %q has no letters or digits", name)
	}
	if prev := ix.byKey[k]; prev != nil {
		if prev.gas == g && source == "" {
			return nil
		}
		return fmt.Errorf("name %q is already a name of %s (id %s)", name, prev.gas.info.Name, prev.gas.info.ID)
	}
	ix.byKey[k] = &gasName{gas: g, source: source}
	return nil
}

// resolve maps a name to its gas. note says how a name other than the id or printed name was
// read. The error is an *Error of code CodeBadArgument for parameter gas, with the closest name
// when one is near.
func (ix *gasIndex) resolve(s string) (g *gasEntry, note string, err error) {
	k := gasKey(s)
	if len(s) <= maxLookupBytes && k != "" {
		if n := ix.byKey[k]; n != nil {
			return n.gas, readAs(s, n), nil
		}
		if k[0] >= '0' && k[0] <= '9' {
			if n := ix.byKey["r"+k]; n != nil {
				return n.gas, "gas " + quote(s) + " read as " + n.gas.info.Name + " (a bare number is read as an ASHRAE Standard 34 refrigerant number)", nil
			}
		}
		// a family prefix before a blend number is dropped: "HFC-410A" is R-410A
		for _, p := range [...]string{"hcfc", "hcfo", "hfc", "hfo", "cfc", "pfc"} {
			rest, ok := strings.CutPrefix(k, p)
			if !ok || rest == "" || rest[0] < '0' || rest[0] > '9' {
				continue
			}
			if n := ix.byKey["r"+rest]; n != nil && n.gas.parts != nil {
				return n.gas, "gas " + quote(s) + " read as the blend " + n.gas.info.Name, nil
			}
		}
	}
	msg := "unknown gas " + quote(s)
	if len(s) <= maxLookupBytes {
		if sug := ix.suggest(k); sug != "" {
			msg += " (did you mean " + sug + "?)"
		}
	}
	msg += ": accepted are IPCC names (HFC-134a, SF6, c-C4F8) and ASHRAE refrigerant numbers (R-134a, R-410A); " +
		"the doc of the gas parameter (fluecell functions gwp) lists every gas and blend"
	return nil, "", &Error{Code: CodeBadArgument, Param: "gas", Msg: msg}
}

// suggest names the gases whose names start with the folded key k ("R-410" is R-410A or
// R-410B), up to three; else the name closest by edit distance; else "".
func (ix *gasIndex) suggest(k string) string {
	if len(k) < 2 {
		return ""
	}
	var names []string
	seen := map[*gasEntry]bool{}
	if len(k) >= 3 {
		i := sort.SearchStrings(ix.keys, k)
		for ; i < len(ix.keys) && strings.HasPrefix(ix.keys[i], k); i++ {
			if g := ix.byKey[ix.keys[i]].gas; !seen[g] {
				seen[g] = true
				names = append(names, g.info.Name)
			}
		}
	}
	if len(names) > 0 && len(names) <= 3 {
		return strings.Join(names, " or ")
	}
	if sug := suggestFrom(k, ix.keys); sug != "" {
		return ix.byKey[sug].gas.info.Name
	}
	return ""
}

// readAs is the note for a name other than the gas's id or printed name.
func readAs(s string, n *gasName) string {
	info := n.gas.info
	if n.source == "" || gasKey(s) == gasKey(info.ID) || gasKey(s) == gasKey(info.Name) {
		return ""
	}
	return "gas " + quote(s) + " read as " + info.Name + " (" + n.source + ")"
}

// ResolveGas maps a gas or refrigerant name as records write it ("R-410A", "R410a", "HFC 134a",
// "SF6", "134a", "Freon 22") to the gas or blend it names. The error is an *Error of code
// CodeBadArgument for parameter gas, naming the closest known name when one is near.
func (e *Engine) ResolveGas(name string) (GasInfo, error) {
	g, _, err := e.gases.resolve(name)
	if err != nil {
		return GasInfo{}, err
	}
	return g.info.clone(), nil
}

// Gases lists every gas and blend: pure gases in table order, the blends, then the custom gases
// of user packs.
func (e *Engine) Gases() []GasInfo {
	out := make([]GasInfo, 0, len(e.gases.ordered))
	for _, g := range e.gases.ordered {
		out = append(out, g.info.clone())
	}
	return out
}

func (g GasInfo) clone() GasInfo {
	g.Components = append([]GasComponent(nil), g.Components...)
	return g
}
