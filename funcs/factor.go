package funcs

import (
	"fmt"
	"math"
	"math/big"
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Factor is one row of a factor pack: a published value with its unit, range,
// heating-value basis and source. Factors are immutable once loaded.
type Factor struct {
	Pack       string      `json:"pack"`
	ID         string      `json:"id"`       // fuel id, gas, technology, fuel family or "atmosphere"
	Quantity   string      `json:"quantity"` // ncv, gcv, density, co2_ef, ... (see quantitySpec)
	Value      float64     `json:"value"`
	Unit       string      `json:"unit"`
	Low        *float64    `json:"low,omitempty"`  // published range, 95 % interval where given
	High       *float64    `json:"high,omitempty"` // (min/max for life-cycle intensities)
	Basis      units.Basis `json:"-"`
	BasisName  string      `json:"basis,omitempty"` // "NCV", "HHV" or ""
	Source     string      `json:"source"`          // publication and table
	FromMemory bool        `json:"from_memory"`     // recalled, not read in the source
	File       string      `json:"file"`            // where the row was loaded from
	Line       int         `json:"line"`

	num, den factorSide
	text     string   // Value exactly as written, for exact arithmetic
	exact    *big.Rat // Value in SI units of num per SI unit of den, exact
	si       float64  // exact rounded once
}

// Key is the row's identity, "pack/id/quantity"; it names the factor in the
// sources of a result.
func (f *Factor) Key() string { return f.Pack + "/" + f.ID + "/" + f.Quantity }

// Citation is a one-line description of the row for notes and sheets, such as
// "56100 kg CO2/TJ (IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4)".
func (f *Factor) Citation() string {
	s := FormatNumber(f.Value)
	if f.Unit != "1" {
		s += " " + f.Unit
	}
	if f.BasisName != "" && !strings.Contains(f.Unit, f.BasisName) {
		s += " " + f.BasisName
	}
	s += " (" + f.Source
	if f.FromMemory && !strings.Contains(strings.ToLower(f.Source), "memory") {
		s += "; from memory"
	}
	return s + ")"
}

// denDim is the dimension of the denominator (0 when the factor has none).
func (f *Factor) denDim() units.Dimension { return f.den.unit.Dim }

// factorSide is one side of a factor unit such as "kg CO2" or "TJ".
type factorSide struct {
	unit    units.Unit // zero Unit when dimensionless or special
	species string     // CO2, CH4, N2O, C, CO2e or ""
	special string     // "ppm" or "mol" for the atmosphere and molar-mass rows
}

func (s factorSide) siExact() *big.Rat {
	if s.unit.Dim == 0 {
		return big.NewRat(1, 1)
	}
	return s.unit.SI()
}

// quantitySpec says what a quantity's unit must look like.
type quantitySpec struct {
	numDim    units.Dimension   // 0: dimensionless ("1")
	species   string            // required species on the numerator, "" for none
	den       []units.Dimension // allowed denominator dimensions; nil: no denominator
	special   string            // required special denominator ("ppm", "mol")
	basis     units.Basis       // forced basis (ncv, gcv)
	fraction  bool              // value must lie in (0, 1]
	perOutput bool              // per unit of electricity produced: no heating-value basis
	doc       string
}

func anyAmount() []units.Dimension { return []units.Dimension{units.Energy, units.Mass, units.Volume} }

// quantityFamilies are the quantities declared beside the functions that use
// them (each in its own file), after the core ones of coreQuantity.
func quantityFamilies() []map[string]quantitySpec {
	return []map[string]quantitySpec{buildoutQuantities(), sectorQuantities(), mobileQuantities(), fugitiveQuantities(), gridQuantities(), distanceQuantities()}
}

// specFor returns the spec of a quantity name: a core quantity, then one of
// a family. gwp100_<set> is open-ended so that a user pack can add a set.
func specFor(q string) (quantitySpec, bool) {
	if s, ok := coreQuantity(q); ok {
		return s, true
	}
	for _, fam := range quantityFamilies() {
		if s, ok := fam[q]; ok {
			return s, true
		}
	}
	return quantitySpec{}, false
}

func coreQuantity(q string) (quantitySpec, bool) {
	switch q {
	case "ncv":
		return quantitySpec{numDim: units.Energy, den: []units.Dimension{units.Mass, units.Volume}, basis: units.NCV, doc: "net calorific value, e.g. TJ/Gg"}, true
	case "gcv":
		return quantitySpec{numDim: units.Energy, den: []units.Dimension{units.Mass, units.Volume}, basis: units.HHV, doc: "gross calorific value (heat content), e.g. MMBtu/gal"}, true
	case "density":
		return quantitySpec{numDim: units.Mass, den: []units.Dimension{units.Volume}, doc: "density, e.g. kg/m3"}, true
	case "co2_ef":
		return quantitySpec{numDim: units.Mass, species: "CO2", den: anyAmount(), doc: "CO2 emission factor, e.g. kg CO2/TJ"}, true
	case "ch4_ef":
		return quantitySpec{numDim: units.Mass, species: "CH4", den: anyAmount(), doc: "CH4 emission factor, e.g. kg CH4/TJ"}, true
	case "n2o_ef":
		return quantitySpec{numDim: units.Mass, species: "N2O", den: anyAmount(), doc: "N2O emission factor, e.g. kg N2O/TJ"}, true
	case "carbon_content":
		return quantitySpec{numDim: units.Mass, species: "C", den: anyAmount(), doc: "carbon content, e.g. kg C/GJ"}, true
	case "ncv_per_gcv":
		return quantitySpec{fraction: true, doc: "ratio NCV/GCV (unit 1)"}, true
	case "biogenic_fraction":
		return quantitySpec{fraction: true, doc: "share of the CO2 that is biogenic (unit 1)"}, true
	case "capacity_factor":
		return quantitySpec{fraction: true, doc: "default capacity factor (unit 1)"}, true
	case "lifecycle", "direct":
		return quantitySpec{numDim: units.Mass, species: "CO2e", den: []units.Dimension{units.Energy}, perOutput: true, doc: "intensity, e.g. g CO2e/kWh"}, true
	case "lifetime":
		return quantitySpec{numDim: units.Time, doc: "default lifetime, e.g. yr"}, true
	case "gtc_per_ppm":
		return quantitySpec{numDim: units.Mass, species: "C", special: "ppm", doc: "Gt C/ppm"}, true
	case "molar_mass":
		return quantitySpec{numDim: units.Mass, special: "mol", doc: "g/mol"}, true
	}
	if strings.HasPrefix(q, "gwp100_") && len(q) > len("gwp100_") {
		return quantitySpec{doc: "GWP-100 of the gas in that set (unit 1)"}, true
	}
	return quantitySpec{}, false
}

func quantityNames() string {
	var extra []string
	for _, fam := range quantityFamilies() {
		for name := range fam {
			extra = append(extra, name)
		}
	}
	sort.Strings(extra)
	s := "ncv, gcv, density, co2_ef, ch4_ef, n2o_ef, carbon_content, ncv_per_gcv, biogenic_fraction, " +
		"capacity_factor, lifecycle, direct, lifetime, gtc_per_ppm, molar_mass, gwp100_<set>"
	if len(extra) > 0 {
		s += ", " + strings.Join(extra, ", ")
	}
	return s
}

// speciesOf maps a species token of a factor unit to its canonical spelling.
func speciesOf(tok string) (string, bool) {
	switch strings.ToLower(tok) {
	case "co2":
		return "CO2", true
	case "ch4":
		return "CH4", true
	case "n2o":
		return "N2O", true
	case "c":
		return "C", true
	case "co2e":
		return "CO2e", true
	}
	return "", false
}

// bind parses the row's unit against its quantity's spec and fills the parsed
// sides and the SI value. The returned error names what would be accepted.
func (f *Factor) bind() error {
	spec, ok := specFor(f.Quantity)
	if !ok {
		return fmt.Errorf("unknown quantity %q: accepted are %s", f.Quantity, quantityNames())
	}
	if math.IsNaN(f.Value) || math.IsInf(f.Value, 0) {
		return fmt.Errorf("value must be a finite number")
	}
	numStr, denStr, hasDen := strings.Cut(f.Unit, "/")
	numStr, denStr = strings.TrimSpace(numStr), strings.TrimSpace(denStr)
	want := spec.doc
	if spec.numDim == 0 {
		if strings.TrimSpace(f.Unit) != "1" {
			return fmt.Errorf("unit %q for %s: the quantity is dimensionless, write 1", f.Unit, f.Quantity)
		}
	} else {
		fields := strings.Fields(numStr)
		if len(fields) == 0 || len(fields) > 2 {
			return fmt.Errorf("unit %q for %s: expected %s", f.Unit, f.Quantity, want)
		}
		u, err := units.ParseAs(fields[0], spec.numDim)
		if err != nil {
			return fmt.Errorf("unit %q for %s: %w", f.Unit, f.Quantity, err)
		}
		f.num.unit = u
		if len(fields) == 2 {
			sp, ok := speciesOf(fields[1])
			if !ok {
				return fmt.Errorf("unit %q for %s: unknown species %q (accepted: CO2, CH4, N2O, C, CO2e)", f.Unit, f.Quantity, fields[1])
			}
			f.num.species = sp
		}
		if f.num.species != spec.species {
			return fmt.Errorf("unit %q for %s: expected %s", f.Unit, f.Quantity, want)
		}
		switch {
		case spec.special != "":
			if !hasDen || denStr != spec.special {
				return fmt.Errorf("unit %q for %s: expected %s", f.Unit, f.Quantity, want)
			}
			f.den.special = spec.special
		case spec.den == nil:
			if hasDen {
				return fmt.Errorf("unit %q for %s: expected %s", f.Unit, f.Quantity, want)
			}
		default:
			if !hasDen {
				return fmt.Errorf("unit %q for %s: expected %s", f.Unit, f.Quantity, want)
			}
			d, err := units.ParseAs(denStr, spec.den...)
			if err != nil {
				return fmt.Errorf("unit %q for %s: %w", f.Unit, f.Quantity, err)
			}
			f.den.unit = d
		}
	}
	if spec.basis != units.NoBasis {
		if f.Basis != units.NoBasis && f.Basis != spec.basis {
			return fmt.Errorf("basis %s contradicts quantity %s (always %s)", f.Basis, f.Quantity, spec.basis)
		}
		f.Basis = spec.basis
	}
	if f.den.unit.Dim == units.Energy && !spec.perOutput {
		if f.den.unit.Basis != units.NoBasis {
			if f.Basis != units.NoBasis && f.Basis != f.den.unit.Basis {
				return fmt.Errorf("basis column %s contradicts the unit %q", f.Basis, f.Unit)
			}
			f.Basis = f.den.unit.Basis
		}
		if f.Basis == units.NoBasis {
			return fmt.Errorf("%s per energy needs a basis: write NCV or HHV in the basis column", f.Quantity)
		}
	} else if f.Basis != units.NoBasis && spec.basis == units.NoBasis && f.num.unit.Dim != units.Energy {
		return fmt.Errorf("basis %s given, but %s in %q is not per unit of energy", f.Basis, f.Quantity, f.Unit)
	}
	f.BasisName = f.Basis.String()
	if spec.fraction && (f.Value <= 0 || f.Value > 1) {
		return fmt.Errorf("value %s for %s must lie in (0, 1]", FormatNumber(f.Value), f.Quantity)
	}
	if f.Value < 0 {
		return fmt.Errorf("value %s for %s must not be negative", FormatNumber(f.Value), f.Quantity)
	}
	if f.Low != nil && *f.Low > f.Value || f.High != nil && *f.High < f.Value {
		return fmt.Errorf("value %s lies outside its range low..high", FormatNumber(f.Value))
	}
	v, ok := new(big.Rat).SetString(f.text)
	if !ok {
		v = new(big.Rat)
		v.SetFloat64(f.Value)
	}
	v.Mul(v, f.num.siExact())
	v.Quo(v, f.den.siExact())
	f.exact = v
	f.si, _ = v.Float64()
	return nil
}
