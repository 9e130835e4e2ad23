package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Bare gallons ("gal", "Gallons") are US gallons unless the mapping says
// the workbook's are imperial ("gallons": "imperial"); either way one
// finding per table, at the cell that says gallons, tells how they were
// read.

// imperialGal is the unit a bare gallon becomes under "gallons": "imperial".
const imperialGal = "gal_imp"

// bareGallon reports a unit text that is a gallon without saying US or
// imperial ("gal", "gallons"); kgal and other multiples are not turned
// into imperial ones.
func bareGallon(s string) bool {
	if units.SpellingNote(s) != units.GallonNote {
		return false
	}
	u, err := units.Lookup(s)
	return err == nil && u.Symbol == "gal"
}

// imperialHeaders reads the bare gallons of t's headers as imperial when
// the mapping says so.
func (d *detector) imperialHeaders(t *tableSpec) {
	if d.sc.gallonsOf(t) != "imperial" {
		return
	}
	for _, c := range t.cols {
		if c.hdr.UnitErr == nil && bareGallon(c.hdr.UnitText) {
			c.gallonText = c.hdr.UnitText
			scale := c.hdr.Scale
			setHeaderUnit(c, imperialGal)
			c.hdr.Scale = scale
		}
	}
}

// gallonHeaders records the gallon finding at the header of each amount
// column whose unit is a bare gallon (or was one, read as imperial).
func (sc *scanCtx) gallonHeaders(t *table) {
	for _, c := range t.spec.cols {
		switch c.role {
		case roleQuantity, roleWideFuel, rolePeriod, roleCarrier:
		default:
			continue
		}
		if c.gallonText != "" || c.hdr.UnitErr == nil && bareGallon(c.hdr.UnitText) {
			sc.gallonFinding(t, c.col, t.spec.headerRow, c.hdr.Text)
		}
	}
}

// gallonUnit returns the unit a unit cell's text stands for: a bare gallon
// is imperial when the mapping says so; the first bare gallon of the table
// gets the finding.
func (sc *scanCtx) gallonUnit(t *table, col, row int, s string) string {
	if !bareGallon(s) {
		return s
	}
	sc.gallonFinding(t, col, row, s)
	if sc.gallonsOf(t.spec) == "imperial" {
		return imperialGal
	}
	return s
}

// gallonFinding records, once per table, how its bare gallons are read.
func (sc *scanCtx) gallonFinding(t *table, col, row int, text string) {
	spec := t.spec
	key := "gallons|" + spec.sheet + "|" + itoa(spec.headerRow)
	msg := quoteText(strings.TrimSpace(text)) + " says gallons without US or imperial: read as US gallons (3.785411784 L, NIST SP 811), here and in the rest of the table; " +
		"if they are imperial gallons (4.54609 L), write \"imperial gallons\" or give the mapping \"gallons\": \"imperial\""
	if sc.gallonsOf(spec) == "imperial" {
		msg = quoteText(strings.TrimSpace(text)) + " says gallons without US or imperial: read as imperial gallons (4.54609 L, UK Weights and Measures Act 1985), as the mapping says, here and in the rest of the table"
	}
	sc.warn.addOnce(key, spec.sheet, col, row, SevInfo, CodeReadAs, msg)
}
