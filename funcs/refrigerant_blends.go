package funcs

import (
	"fmt"
	"math/big"
	"strings"
)

// blendPart is one component of a refrigerant blend: a pure gas and its mass fraction, exact as
// written in data/refrigerant_blends_table.csv.
type blendPart struct {
	gas  *gasEntry
	frac *big.Rat
	text string // the fraction as written, for notes
}

// addBlends reads the blend table: columns blend, name, component, mass_fraction, source,
// from_memory, one row per component, the rows of a blend together. A component must be a pure
// gas of the gas table; the fractions of a blend must lie in (0, 1] and sum to exactly 1. Any
// other row fails with a *PackFileError naming the line.
func (ix *gasIndex) addBlends(data []byte, file string) error {
	rows, lines, err := readTable(data, file, []string{"blend", "name", "component", "mass_fraction", "source", "from_memory"})
	if err != nil {
		return err
	}
	var cur *gasEntry
	var sum *big.Rat
	start := 0
	finish := func() error {
		if cur != nil && sum.Cmp(big.NewRat(1, 1)) != 0 {
			f, _ := sum.Float64()
			return &PackFileError{File: file, Line: start, Column: "mass_fraction",
				Reason: fmt.Sprintf("the mass fractions of %s sum to %s, not 1", cur.info.Name, FormatNumber(f))}
		}
		return nil
	}
	for i, rec := range rows {
		bad := func(col, format string, args ...any) error {
			return &PackFileError{File: file, Line: lines[i], Column: col, Reason: fmt.Sprintf(format, args...)}
		}
		id, name, comp, fracText, source, mem := rec[0], rec[1], rec[2], rec[3], rec[4], rec[5]
		if cur == nil || cur.info.ID != id {
			if err := finish(); err != nil {
				return err
			}
			switch {
			case !validIdent(id):
				return bad("blend", "blend %q must be lower-case letters, digits and underscores, such as r410a", id)
			case ix.byID[id] != nil:
				return bad("blend", "%s is listed twice or is also a gas id; the rows of a blend stay together", id)
			case name == "":
				return bad("name", "empty name")
			}
			cur = &gasEntry{info: GasInfo{ID: id, Name: name, Kind: "blend", Source: source}}
			ix.add(cur)
			sum, start = new(big.Rat), lines[i]
		}
		g := ix.byID[comp]
		frac, ok := new(big.Rat).SetString(fracText)
		switch {
		case name != cur.info.Name:
			return bad("name", "name %q differs from %q on the blend's first row", name, cur.info.Name)
		case source != cur.info.Source:
			return bad("source", "every row of a blend has the same source")
		case source == "":
			return bad("source", "empty source: every composition names its standard")
		case mem != "true" && mem != "false":
			return bad("from_memory", "from_memory %q: accepted are true or false", mem)
		case (mem == "true") != strings.Contains(source, "from memory"):
			return bad("from_memory", "from_memory is %q: a source says \"from memory\" exactly when from_memory is true", mem)
		case g == nil || g.parts != nil:
			return bad("component", "component %q is not a gas of %s", comp, gasTableFile)
		case !ok || frac.Sign() <= 0 || frac.Cmp(big.NewRat(1, 1)) > 0:
			return bad("mass_fraction", "mass_fraction %q must be a decimal in (0, 1]", fracText)
		}
		for _, p := range cur.parts {
			if p.gas == g {
				return bad("component", "%s appears twice in %s", comp, id)
			}
		}
		f, _ := frac.Float64()
		cur.parts = append(cur.parts, blendPart{gas: g, frac: frac, text: fracText})
		cur.info.Components = append(cur.info.Components, GasComponent{Gas: g.info.ID, Name: g.info.Name, MassFraction: f})
		sum.Add(sum, frac)
	}
	return finish()
}

// composition describes a blend for notes: "R-410A = 50 % HFC-32 + 50 % HFC-125 by mass (source)".
func (g *gasEntry) composition() string {
	parts := make([]string, len(g.parts))
	for i, p := range g.parts {
		parts[i] = p.percent() + " " + p.gas.info.Name
	}
	return g.info.Name + " = " + strings.Join(parts, " + ") + " by mass (" + g.info.Source + ")"
}

// percent is the mass fraction as a percentage: "68.9 %".
func (p blendPart) percent() string {
	f, _ := new(big.Rat).Mul(p.frac, big.NewRat(100, 1)).Float64()
	return FormatNumber(f) + " %"
}
