package importer

import (
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// The price per unit of a fuel log with a cost column. A row's cost divided
// by its amount is the unit price it paid; prices of one fuel in one unit
// stay within a factor of two or so over a year, while a slip in the amount
// (or in the cost) moves the row's price by the slip's factor. The price is
// tested by the robust test of the amounts (outliers.go).

// CodePriceOutlier marks a row whose cost divided by its amount is far from
// the unit price of the other rows of its fuel and unit: the amount or the
// cost is likely mistyped.
const CodePriceOutlier = "price-outlier"

// pricePrefix marks the sample groups of unit prices (cost / amount) among
// the amount groups collectSamples fills; the cost column's letter and the
// key of the amount group follow.
const pricePrefix = "\x01price|"

// costCells is the cost column of a fuel log and its value per stored row
// (NaN when the cell holds no number): one float64 per row, as the results.
type costCells struct {
	col *column
	v   *paged[float64] // per stored row: the cost, NaN for none
}

// costColumn finds the cost column of a fuel log: a numeric column with no
// role whose header speaks of money paid in total ("Cost (£)", "Amount paid",
// "Invoice EUR", "$"), not of a price per unit ("Price per litre", "€/L",
// "Unit cost") or a tax alone. nil when there is none.
func costColumn(spec *tableSpec) *costCells {
	if spec.kind != kindFuelLog || spec.qty == nil {
		return nil
	}
	for _, c := range spec.cols {
		if c.role == roleNone && c.numeric && costHeader(c.hdr.Text) {
			return &costCells{col: c}
		}
	}
	return nil
}

// costHeader reports a header of amounts of money paid in total.
func costHeader(text string) bool {
	ws := words(text)
	if strings.ContainsAny(text, "/%") || hasWord(ws, "per", "unit", "rate", "average", "avg", "mean", "factor", "efficiency", "index") {
		return false
	}
	if hasWord(ws, "cost", "costs", "spend", "spent", "invoice", "invoiced", "paid", "amt", "charged", "expenditure") ||
		hasWord(ws, "price") && hasWord(ws, "total") {
		return true
	}
	// A currency alone: "$", "EUR", "Amount (£)"; not "VAT (€)".
	cur := strings.ContainsAny(text, "€$£¥") || hasWord(ws, "usd", "eur", "gbp", "chf", "cad", "aud", "jpy", "dollars", "euros", "pounds")
	return cur && !hasWord(ws, "tax", "vat", "duty", "price", "prices")
}

// keepCost stores the cost of the row just added to t (table.add).
func (t *table) keepCost(r *row) {
	if t.cost == nil {
		return
	}
	v := math.NaN()
	for i := range r.cells {
		c := &r.cells[i]
		if c.col != t.cost.col.col || c.noCache {
			continue
		}
		switch c.kind {
		case kNumber:
			v = c.num
		case kText:
			if f, ok, amb := textNumber(c.text); ok && !amb {
				v = f
			}
		}
	}
	t.cost.v.push(v)
}

// priceSample adds row i's unit price under price key pk (-1: the table
// has no cost column).
func (t *table) priceSample(pk int32, i, rowNum int, q float64, samples *sampleSet) {
	if pk < 0 || t.cost == nil || i >= t.cost.v.len() {
		return
	}
	c := t.cost.v.at(i)
	if !(c > 0) || math.IsInf(c, 0) {
		return
	}
	samples.addAt(pk, rowNum, t.spec.qty.col, c/q, "", q)
}

// checkPrices flags unit prices (cost / quantity, grouped by cost column,
// fuel and unit) far from their group's median, by the same robust test.
// A row whose amount is already flagged gets the price in its finding; any
// other gets a finding of its own at the quantity cell.
func (sc *scanCtx) checkPrices(samples *sampleSet, found []*outlierFinding, at map[[2]int]*outlierFinding) []*outlierFinding {
	for _, k := range samples.sortedKeys() {
		if !strings.HasPrefix(k, pricePrefix) {
			continue
		}
		costCol, qk, _ := strings.Cut(strings.TrimPrefix(k, pricePrefix), "|")
		med, n, hits := samples.flagged(sampleGroup{key: samples.keyOf[k], word: -1}, false)
		for _, h := range hits {
			row, col, q := int(samples.row.at(h.i)), int(samples.col.at(h.i)), samples.q.at(h.i)
			cost := roundSig(h.v * q)
			price := "a unit price of " + funcs.FormatNumber(sig3(h.v)) + " (cost " + funcs.FormatNumber(cost) + " in " + costCol + itoa(row) +
				" / " + funcs.FormatNumber(q) + "), " + timesText(h.v/med) + " the median " + funcs.FormatNumber(sig3(med)) +
				" of the " + plural(n, "row") + " of " + groupName(qk)
			if f := at[[2]int{row, col}]; f != nil {
				f.msg += "; the row's cost gives " + price + ": the amount is the likely slip"
				continue
			}
			found = append(found, &outlierFinding{row: row, col: col, code: CodePriceOutlier,
				msg: "the amount " + funcs.FormatNumber(q) + " and its cost give " + price + " (" + priceSlip(q, cost, h.v/med) + ")"})
		}
	}
	return found
}

// priceSlip suggests the slip behind a unit price r times its median: near
// a factor of 10, the amount or the cost with its decimal point one place
// off, each with the figure that would fit.
func priceSlip(q, cost, r float64) string {
	switch math.Round(math.Log10(r)) {
	case 1:
		return "a digit missing from the amount or extra in the cost? " + funcs.FormatNumber(roundSig(q*10)) + " or " +
			funcs.FormatNumber(roundSig(cost/10)) + " would fit"
	case -1:
		return "an extra digit in the amount or one missing from the cost? " + funcs.FormatNumber(roundSig(q/10)) + " or " +
			funcs.FormatNumber(roundSig(cost*10)) + " would fit"
	}
	return "a unit slip or a typo in the amount or the cost?"
}

// sig3 rounds a price to 3 significant digits for messages.
func sig3(x float64) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	p := math.Pow(10, 2-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}
