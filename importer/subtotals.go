package importer

import (
	"math"
	"sort"
	"strings"
)

// Statistics tables put totals and subtotals beside their parts: "Total
// Consumption" = "Lease and Plant Fuel" + "Pipeline" + "Delivered to
// Consumers", which is itself "Residential" + ... + "Electric Power". A sum
// column is found from the values (on the rows where it and its parts are
// all given, it equals the sum of the columns right after it, within
// rounding) or from its header ("Total"). Each row then counts the highest
// column it gives and none of its parts: the total where the row has it,
// else the parts, down the tree. Nothing is added twice, and early years
// that give only the parts still count.

// sumNode is a per-fuel column with the columns it is the sum of.
type sumNode struct {
	col  *column
	slot int
	kids []*sumNode
	out  bool // a total whose parts are not known: never counted
}

// sumForest builds the sum trees of a wide table's per-fuel columns; nil
// when no column is a sum of others. Each relation found is said once at
// the sum's header.
func (sc *scanCtx) sumForest(t *table) []*sumNode {
	spec := t.spec
	if spec.kind != kindWide || len(spec.wide) < 2 {
		return nil
	}
	byFuel := map[string][]*column{}
	for _, c := range spec.wide {
		byFuel[c.fuelID] = append(byFuel[c.fuelID], c)
	}
	var roots []*sumNode
	found := false
	fuels := make([]string, 0, len(byFuel))
	for f := range byFuel {
		fuels = append(fuels, f)
	}
	sort.Strings(fuels)
	for _, f := range fuels {
		cols := byFuel[f]
		if len(cols) < 2 {
			continue
		}
		nodes := make([]*sumNode, len(cols))
		for i, c := range cols {
			nodes[i] = &sumNode{col: c, slot: t.slotOf[c.col]}
		}
		child := make([]bool, len(cols))
		// Value-based: the shortest run of columns right after a column
		// that adds up to it.
		for a := range cols {
			for k := a + 2; k <= len(cols); k++ {
				if !sameUnits(cols[a:k]) {
					break
				}
				if ok, _ := t.sumsTo(nodes[a], nodes[a+1:k]); ok {
					for _, n := range nodes[a+1 : k] {
						if !child[indexOf(nodes, n)] {
							nodes[a].kids = append(nodes[a].kids, n)
						}
					}
					for j := a + 1; j < k; j++ {
						child[j] = true
					}
					break
				}
			}
		}
		// A column headed "Total" after its parts: the run right before it.
		for a, n := range nodes {
			if len(n.kids) > 0 || child[a] || a < 2 || !hasWord(words(n.col.hdr.Base), "total", "all") {
				continue
			}
			for k := a - 2; k >= 0; k-- {
				if !sameUnits(cols[k : a+1]) {
					break
				}
				if ok, _ := t.sumsTo(n, nodes[k:a]); ok {
					n.kids = append(n.kids, nodes[k:a]...)
					for j := k; j < a; j++ {
						child[j] = true
					}
					break
				}
			}
		}
		// A column headed "Total" whose parts the values cannot show (too
		// few rows give them all), or that covers more than the other
		// columns of its fuel (sectors not shown), counts, and they are its
		// parts. Beside a share allocated to the reporting entity ("Computed
		// Proportional ... Use"), or when its values are below their sum, it
		// is left out and the other columns count.
		for a, n := range nodes {
			if len(n.kids) > 0 || child[a] || !hasWord(words(n.col.hdr.Base), "total", "all") {
				continue
			}
			var others []*sumNode
			for j, m := range nodes {
				if j != a && !child[j] && strings.EqualFold(m.col.hdr.UnitText, n.col.hdr.UnitText) {
					others = append(others, m)
				}
			}
			_, checked := t.sumsTo(n, others)
			if len(others) > 0 && !allocation(others) && (checked < 3 || t.covers(n, others)) {
				// Too few rows to check, or the parts are a subset of what
				// the total covers (sectors not shown): the total counts.
				n.kids = others
				for _, m := range others {
					child[indexOf(nodes, m)] = true
				}
				continue
			}
			n.out, child[a], found = true, true, true
			roots = append(roots, n)
			sc.warn.add(spec.sheet, n.col.col, spec.headerRow, SevInfo, CodeNotComputed, quoteText(n.col.hdr.Text)+
				" says total, and its values are not the sum of the other "+n.col.fuelID+" columns: it is left out and they are counted, so nothing is counted twice")
		}
		for a, n := range nodes {
			if len(n.kids) > 0 {
				found = true
				names := make([]string, len(n.kids))
				for j, k := range n.kids {
					names[j] = colName(k.col.col)
				}
				sc.warn.add(spec.sheet, n.col.col, spec.headerRow, SevInfo, CodeNotComputed, quoteText(n.col.hdr.Text)+" is the sum of "+
					strings.Join(names, ", ")+": each row counts it where it is given, else its parts, never both")
			}
			if !child[a] {
				roots = append(roots, n)
			}
		}
	}
	if !found {
		return nil
	}
	return roots
}

func indexOf(nodes []*sumNode, n *sumNode) int {
	for i, m := range nodes {
		if m == n {
			return i
		}
	}
	return -1
}

func sameUnits(cols []*column) bool {
	for _, c := range cols[1:] {
		if !strings.EqualFold(c.hdr.UnitText, cols[0].hdr.UnitText) || c.hdr.Scale != cols[0].hdr.Scale {
			return false
		}
	}
	return true
}

// sumsTo reports whether, on every row (at least three) where the column
// and all the parts are given, the column equals their sum within
// rounding (0.5 % or one unit per part); checked counts the rows looked at
// (a mismatch stops at the first).
func (t *table) sumsTo(total *sumNode, parts []*sumNode) (ok bool, checked int) {
	for i := range t.n() {
		x, ok := t.number(i, total.slot)
		if !ok {
			continue
		}
		sum, all := 0.0, true
		for _, p := range parts {
			v, ok := t.number(i, p.slot)
			if !ok {
				all = false
				break
			}
			sum += v
		}
		if !all {
			continue
		}
		if math.Abs(x-sum) > max(0.005*math.Abs(x), float64(len(parts))) {
			return false, checked + 1
		}
		checked++
	}
	return checked >= 3, checked
}

// number is the stored number of row i in slot s (a number, or a number
// stored as text); ok is false for an empty or other cell.
func (t *table) number(i, s int) (float64, bool) {
	v := t.val(i, s)
	switch v.kind {
	case kNumber:
		return v.num, true
	case kText:
		f, ok, _ := textNumber(v.text)
		return f, ok
	}
	return 0, false
}

// maskRow sets to zero, in a row's variables, every column below the
// highest column of its tree that the row gives.
func (t *table) maskRow(i int, roots []*sumNode, vars map[string]any) {
	var walk func(n *sumNode, covered bool)
	walk = func(n *sumNode, covered bool) {
		if covered || n.out {
			vars[n.col.ident] = 0.0
		}
		_, given := t.number(i, n.slot)
		for _, k := range n.kids {
			walk(k, covered || given)
		}
	}
	for _, r := range roots {
		walk(r, false)
	}
}

// covers reports whether, on every row where the total and all the parts
// are given, the total is at least their sum: the parts are a subset.
func (t *table) covers(total *sumNode, parts []*sumNode) bool {
	n := 0
	for i := range t.n() {
		x, ok := t.number(i, total.slot)
		if !ok {
			continue
		}
		sum := 0.0
		for _, p := range parts {
			v, ok := t.number(i, p.slot)
			if !ok {
				sum = math.NaN()
				break
			}
			sum += v
		}
		if math.IsNaN(sum) {
			continue
		}
		if x < sum*0.995 {
			return false
		}
		n++
	}
	return n > 0
}

// allocation reports a column that is an entity's share of a total:
// "Computed Proportional ... Use", "Allocated", "Share of".
func allocation(cols []*sumNode) bool {
	for _, c := range cols {
		if hasWord(words(c.col.hdr.Text), "proportional", "prop", "allocated", "apportioned", "attributed", "share", "allocation") {
			return true
		}
	}
	return false
}
